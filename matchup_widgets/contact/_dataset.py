"""Contact results for a whole dataset: per-ball predictions, the tier scale, tier shares.

Per-ball predictions and the tier scale are kept per dataset (see ``_cache``), so the
player tables a dashboard asks for on each click are only group sums.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BASE_OUT_COLUMNS, BATTED

from ._buckets import EV_EDGES, LA_EDGES, bucket_index, bucket_labels, group_codes
from ._cache import dataset_cache, remembered
from ._frames import batted_rows, check_role, frame_of, measured_mask, season_mask, seasons_of
from ._model import ContactModel, contact_model_for
from ._tiers import (
    TIER_QUANTILES,
    ContactTiers,
    assign_tiers,
    batted_run_weights,
    build_tiers,
    expected_run_value,
    league_outcome_probs,
)

#: Prefix of the modeled-probability columns of :func:`contact_predictions`.
PROB_PREFIX = "p_"
_KEEP = (
    "game_id", "batter_id", "pitcher_id", "batter_hand", "pitcher_hand", "outcome",
    "exit_velo", "launch_angle", *BASE_OUT_COLUMNS,
)


def _model(pas: Any, model: ContactModel | None) -> ContactModel:
    return contact_model_for(pas) if model is None else model


def contact_predictions(pas: Any, *, model: ContactModel | None = None) -> pd.DataFrame:
    """Every batted ball of ``pas`` with its modeled outcome probabilities.

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
    model : ContactModel, optional
        A fitted model; by default the dataset's own (:func:`contact_model_for`).

    Returns
    -------
    pandas.DataFrame
        The batted-ball rows (ids, hands, ``season``, ``outcome``, ``exit_velo``,
        ``launch_angle``, base-out columns when present), ``measured`` (both measurements
        present) and one column ``p_<code>`` per ``BATTED`` code (NaN when unmeasured).
        Kept per dataset and model: do not modify it.

    Examples
    --------
    >>> rng = np.random.default_rng(2)
    >>> df = pd.DataFrame({"exit_velo": rng.normal(88, 12, 400), "season": 2030,
    ...     "launch_angle": rng.normal(12, 25, 400), "outcome": ["1B", "GB_OUT"] * 200})
    >>> pred = contact_predictions(df, model=ContactModel(kind="grid").fit(df))
    >>> len(pred), round(float(pred.filter(like="p_").sum(axis=1).min()), 6)
    (400, 1.0)
    """
    model = _model(pas, model)
    cache = dataset_cache(pas)
    key = ("predictions", id(model))
    hit = cache.get(key)
    if hit is not None and hit[0] is model:
        return hit[1]
    frame = frame_of(pas)
    batted = batted_rows(frame, purpose="contact_predictions")
    out = batted[[c for c in _KEEP if c in batted.columns]].reset_index(drop=True)
    out["season"] = seasons_of(batted).to_numpy()
    ev, la = out["exit_velo"].to_numpy(), out["launch_angle"].to_numpy()
    out["measured"] = measured_mask(ev, la)
    probs = model.predict_proba(ev, la)
    for j, code in enumerate(BATTED):
        out[PROB_PREFIX + code] = probs[:, j]
    cache[key] = (model, out)
    return out


def prob_matrix(pred: pd.DataFrame) -> np.ndarray:
    """The ``(n, 6)`` modeled-probability matrix of a :func:`contact_predictions` table."""
    return pred[[PROB_PREFIX + c for c in BATTED]].to_numpy(dtype=float)


def contact_tiers(
    pas: Any,
    *,
    model: ContactModel | None = None,
    quantiles: Sequence[float] = TIER_QUANTILES,
    weights: pd.Series | None = None,
) -> ContactTiers:
    """The league's contact-tier scale for a dataset.

    Each measured batted ball is valued by its modeled outcome probabilities times the run
    value of each batted-ball outcome (the runs layer's linear weights for the dataset's
    own outcome mix, with advancement estimated from the data when it has base-out
    columns, unless ``weights`` is given) and the tiers are cut at the league
    ``quantiles`` of that value (tier 1 weakest, tier 5 strongest).

    Returns
    -------
    ContactTiers
        ``cut_points``, ``weights``, ``weights_source`` and a per-tier ``table``.

    Examples
    --------
    >>> rng = np.random.default_rng(3)
    >>> ev, la = rng.normal(88, 12, 1000), rng.normal(12, 25, 1000)
    >>> df = pd.DataFrame({"exit_velo": ev, "launch_angle": la, "season": 2030,
    ...     "outcome": np.where(ev > 95, "2B", "GB_OUT")})
    >>> tiers = contact_tiers(df, model=ContactModel(kind="grid").fit(df))
    >>> tiers.table["label"].tolist()
    ['Harmless', 'Light', 'Middling', 'Dangerous', 'Damaging']
    """
    model = _model(pas, model)
    key = ("tiers", id(model), tuple(quantiles), None if weights is None else tuple(weights.items()))
    cache = dataset_cache(pas)
    hit = cache.get(key)
    if hit is not None and hit[0] is model:
        return hit[1]
    pred = contact_predictions(pas, model=model)
    if weights is None:
        frame = frame_of(pas)
        advancement = None
        if all(c in frame.columns for c in BASE_OUT_COLUMNS):  # the data's own advancement
            from matchup_widgets.runs import estimate_advancement

            advancement = estimate_advancement(frame)
        weights, source = batted_run_weights(league_outcome_probs(frame["outcome"]), advancement=advancement)
    else:
        source = "given"
    tiers = build_tiers(prob_matrix(pred), weights=weights, weights_source=source, quantiles=quantiles)
    cache[key] = (model, tiers)
    return tiers


def ball_tiers(pred: pd.DataFrame, tiers: ContactTiers) -> np.ndarray:
    """Tier (1..5) of each row of a :func:`contact_predictions` table; 0 when unmeasured."""
    return assign_tiers(expected_run_value(prob_matrix(pred), tiers.weights), tiers.cut_points)


def _select(pred: pd.DataFrame, seasons: tuple[int, int] | None) -> pd.DataFrame:
    if seasons is None:
        return pred
    return pred[season_mask(pred["season"].to_numpy(), seasons)]


def tier_shares(
    pas: Any,
    *,
    role: str,
    tiers: ContactTiers | None = None,
    model: ContactModel | None = None,
    seasons: tuple[int, int] | None = None,
) -> pd.DataFrame:
    """Counts and shares of each contact tier per player and platoon split.

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
    role : {"batter", "pitcher"}
    tiers : ContactTiers, optional
        The tier scale; by default the dataset's own (:func:`contact_tiers`).
    model : ContactModel, optional
    seasons : (int, int), optional
        Inclusive (first, last) seasons; all seasons when None.

    Returns
    -------
    pandas.DataFrame
        ``player_id``, ``batter_hand``, ``pitcher_hand``, ``n_batted``, ``n_measured``,
        ``n_tier_1`` .. ``n_tier_5`` and ``share_tier_1`` .. ``share_tier_5`` (over
        measured balls). Computed once per dataset, role, seasons, model and tier scale,
        then reused.

    Examples
    --------
    >>> rng = np.random.default_rng(4)
    >>> ev, la = rng.normal(88, 12, 800), rng.normal(12, 25, 800)
    >>> df = pd.DataFrame({"exit_velo": ev, "launch_angle": la, "season": 2030,
    ...     "batter_id": np.repeat(["b1", "b2"], 400), "pitcher_id": "p1",
    ...     "batter_hand": "R", "pitcher_hand": "L", "outcome": np.where(ev > 95, "2B", "GB_OUT")})
    >>> out = tier_shares(df, role="batter", model=ContactModel(kind="grid").fit(df))
    >>> out["n_measured"].tolist(), bool(np.allclose(out.filter(like="share_").sum(axis=1), 1))
    ([400, 400], True)
    """
    key_col = check_role(role)
    model = _model(pas, model)
    tiers = contact_tiers(pas, model=model) if tiers is None else tiers
    seasons = None if seasons is None else (int(seasons[0]), int(seasons[1]))
    key = ("tier_shares", role, id(model), id(tiers), seasons)
    out = remembered(pas, key, lambda: _tier_shares(pas, key_col, tiers, model, seasons), owners=(model, tiers))
    return out.copy(deep=False)  # a shallow copy: under copy-on-write the stored table stays as it was


def _tier_shares(
    pas: Any, key_col: str, tiers: ContactTiers, model: ContactModel, seasons: tuple[int, int] | None
) -> pd.DataFrame:
    pred = _select(contact_predictions(pas, model=model), seasons)
    tier = ball_tiers(pred, tiers)
    keys = [key_col, "batter_hand", "pitcher_hand"]
    codes, key_frame = group_codes(pred, keys)
    n_groups, n_tiers = len(key_frame), len(tiers.cut_points) + 1
    counts = np.bincount(codes * (n_tiers + 1) + tier, minlength=n_groups * (n_tiers + 1))
    counts = counts.reshape(n_groups, n_tiers + 1)
    out = key_frame.rename(columns={key_col: "player_id"})
    out["n_batted"] = counts.sum(axis=1)
    out["n_measured"] = counts[:, 1:].sum(axis=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        for t in range(1, n_tiers + 1):
            out[f"n_tier_{t}"] = counts[:, t]
        for t in range(1, n_tiers + 1):
            out[f"share_tier_{t}"] = counts[:, t] / out["n_measured"].to_numpy(dtype=float)
    return out


def league_bucket_table(
    pas: Any,
    *,
    model: ContactModel | None = None,
    ev_edges: Sequence[float] = EV_EDGES,
    la_edges: Sequence[float] = LA_EDGES,
) -> pd.DataFrame:
    """League balls per exit-velocity x launch-angle bucket and their mean modeled outcomes.

    Returns
    -------
    pandas.DataFrame
        One row per bucket in grid order: ``exit_velo_bin``, ``launch_angle_bin``, ``bucket``, ``n``,
        ``share`` and one column per ``BATTED`` code (mean modeled probability; the
        league's batted-ball mix for empty buckets). Computed once per dataset, model and
        edges, then reused.

    Examples
    --------
    >>> rng = np.random.default_rng(5)
    >>> ev, la = rng.normal(88, 12, 5000), rng.normal(12, 25, 5000)
    >>> df = pd.DataFrame({"exit_velo": ev, "launch_angle": la, "season": 2030,
    ...     "outcome": np.where(la < 10, "GB_OUT", "AIR_OUT")})
    >>> table = league_bucket_table(df, model=ContactModel(kind="grid").fit(df), ev_edges=[95], la_edges=[10])
    >>> int(table["n"].sum()), (table["GB_OUT"] > 0.5).tolist()
    (5000, [True, False, True, False])
    """
    model = _model(pas, model)
    key = ("league_buckets", id(model), tuple(map(float, ev_edges)), tuple(map(float, la_edges)))
    table = remembered(pas, key, lambda: _league_bucket_table(pas, model, ev_edges, la_edges), owners=(model,))
    return table.copy(deep=False)


def _league_bucket_table(
    pas: Any, model: ContactModel, ev_edges: Sequence[float], la_edges: Sequence[float]
) -> pd.DataFrame:
    pred = contact_predictions(pas, model=model)
    cells = bucket_index(pred["exit_velo"], pred["launch_angle"], ev_edges=ev_edges, la_edges=la_edges)
    table = bucket_labels(ev_edges=ev_edges, la_edges=la_edges)
    ok = cells >= 0
    n = np.bincount(cells[ok], minlength=len(table))
    probs = prob_matrix(pred)[ok]
    sums = np.zeros((len(table), len(BATTED)))
    np.add.at(sums, cells[ok], probs)
    overall = probs.mean(axis=0)
    table["n"] = n
    table["share"] = n / max(n.sum(), 1)
    with np.errstate(invalid="ignore", divide="ignore"):
        mean = np.where(n[:, None] > 0, sums / np.maximum(n, 1)[:, None], overall)
    for j, code in enumerate(BATTED):
        table[code] = mean[:, j]
    return table
