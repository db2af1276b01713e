"""The contact basis: outcome counts with each batted ball replaced by its modeled outcomes.

Strikeouts, walks and hit-by-pitch stay as observed. Each batted ball with both exit
velocity and launch angle contributes its modeled probabilities over ``BATTED`` (so the
counts become fractional); a batted ball without a measurement contributes its player's
observed batted-ball mix (over the same seasons, and the same season when ``by_season``).
Each row's batted-ball total and ``pa`` are unchanged, only their split over the batted
outcomes moves.
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BATTED

from ._buckets import group_codes
from ._dataset import _select, contact_predictions, prob_matrix
from ._frames import check_role, outcome_index
from ._model import ContactModel


def contact_outcome_counts(
    pas: Any,
    *,
    role: str,
    seasons: tuple[int, int] | None = None,
    by_season: bool = False,
    model: ContactModel | None = None,
) -> pd.DataFrame:
    """Outcome counts per player and platoon split on the contact basis.

    Same arguments, columns, row order and shape as
    :func:`matchup_widgets.data.outcome_counts`; the ``BATTED`` columns become float
    (fractional counts).

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
        Plate appearances with ``exit_velo`` and ``launch_angle``.
    role : {"batter", "pitcher"}
    seasons : (int, int), optional
        Inclusive (first, last) seasons; all seasons when None.
    by_season : bool, default False
        Add ``season`` to the grouping.
    model : ContactModel, optional
        A fitted model; by default the dataset's own (fitted once, then reused).

    Returns
    -------
    pandas.DataFrame
        ``player_id, batter_hand, pitcher_hand, [season]``, one column per outcome code,
        ``pa``. ``.attrs["contact_basis"]`` holds ``n_batted``, ``n_modeled`` (balls
        replaced by the model) and ``n_fallback`` (unmeasured balls given their player's
        observed mix).

    Examples
    --------
    >>> rng = np.random.default_rng(6)
    >>> ev, la = rng.normal(88, 12, 1000), rng.normal(12, 25, 1000)
    >>> df = pd.DataFrame({"batter_id": "b1", "pitcher_id": "p1", "batter_hand": "L",
    ...     "pitcher_hand": "R", "season": 2030, "exit_velo": ev, "launch_angle": la,
    ...     "outcome": np.where(la < 10, "GB_OUT", "AIR_OUT")})
    >>> df.loc[:99, "outcome"] = "K"
    >>> out = contact_outcome_counts(df, role="batter", model=ContactModel(kind="grid").fit(df))
    >>> int(out["K"].iloc[0]), round(float(out[list(BATTED)].sum(axis=1).iloc[0]), 6), int(out["pa"].iloc[0])
    (100, 900.0, 1000)
    """
    from matchup_widgets.data import outcome_counts

    key_col = check_role(role)
    base = outcome_counts(pas, role=role, seasons=seasons, by_season=by_season)
    pred = _select(contact_predictions(pas, model=model), seasons)
    measured = pred["measured"].to_numpy()
    y = outcome_index(pred["outcome"].to_numpy())
    observed = np.zeros((len(pred), len(BATTED)))
    observed[np.arange(len(pred)), y] = 1.0

    # the player's observed batted-ball mix, the fallback of an unmeasured ball
    player_keys = [key_col, "season"] if by_season else [key_col]
    p_codes, p_frame = group_codes(pred, player_keys)
    p_sums = np.zeros((len(p_frame), len(BATTED)))
    np.add.at(p_sums, p_codes, observed)
    p_mix = p_sums / p_sums.sum(axis=1, keepdims=True)
    contrib = np.where(measured[:, None], np.nan_to_num(prob_matrix(pred)), p_mix[p_codes])

    keys = [key_col, "batter_hand", "pitcher_hand", *(["season"] if by_season else [])]
    g_codes, g_frame = group_codes(pred, keys)
    g_sums = np.zeros((len(g_frame), len(BATTED)))
    np.add.at(g_sums, g_codes, contrib)

    out_keys = ["player_id", *keys[1:]]
    sums = g_frame.rename(columns={key_col: "player_id"})
    sums = _key_strings(sums, out_keys)
    sums[list(BATTED)] = g_sums
    left = _key_strings(base[out_keys].copy(), out_keys)
    filled = left.merge(sums, on=out_keys, how="left", validate="one_to_one")
    out = base.copy()
    for code in BATTED:
        out[code] = filled[code].fillna(0.0).to_numpy(dtype=float)
    out.attrs["contact_basis"] = {
        "n_batted": int(len(pred)),
        "n_modeled": int(measured.sum()),
        "n_fallback": int((~measured).sum()),
    }
    return out


def _key_strings(frame: pd.DataFrame, keys: list[str]) -> pd.DataFrame:
    """Key columns as plain strings / int64 so tables from ibis and pandas merge alike."""
    for k in keys:
        frame[k] = frame[k].astype(np.int64) if k == "season" else frame[k].astype(str)
    return frame
