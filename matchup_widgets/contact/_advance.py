"""Tiered hits for the runs layer: singles and doubles split by contact tier.

A softly hit single moves runners less than a hard one. Where the table has base-out
columns, the singles and doubles of the lower tiers and of the upper tiers get their own
advancement rows (``1B_weak``/``1B_strong``, ``2B_weak``/``2B_strong``), estimated with
the runs layer's :func:`~matchup_widgets.runs.estimate_advancement` on each subset; a
base-out state with too few plays keeps the row estimated from all hits of that code.
The rows are added with :meth:`AdvancementTable.with_extra_rows`. Without base-out
columns tiered hits are not offered.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BASE_OUT_COLUMNS, BATTED, OUTCOMES, DataError

from ._dataset import ball_tiers, contact_predictions, contact_tiers
from ._frames import frame_of
from ._model import ContactModel
from ._tiers import ContactTiers

#: Hit codes that get tiered rows by default.
TIERED_CODES: tuple[str, ...] = ("1B", "2B")


def tiered_hits_available(pas: Any) -> bool:
    """True when the table has every base-out column, so tiered hits can be estimated."""
    return all(c in frame_of(pas).columns for c in BASE_OUT_COLUMNS)


@dataclass(frozen=True, eq=False)
class TieredHits:
    """An advancement table with tiered hit rows, and how the hits split.

    Attributes
    ----------
    table : AdvancementTable
        The data-estimated table plus rows ``<code>_weak`` and ``<code>_strong``.
    strong_from : int
        Lowest tier counted as strong.
    weak_share : dict
        League share of each code's measured balls that fall in the weak tiers.
    counts : pandas.DataFrame
        Plays behind each new row per starting state (rows: new names; columns 0..23).
    from_data : pandas.DataFrame
        Which of those (row, state) cells use the subset rather than the all-hits row.
    """

    table: Any
    strong_from: int
    weak_share: dict[str, float]
    counts: pd.DataFrame
    from_data: pd.DataFrame


def tiered_advancement(
    pas: Any,
    *,
    codes: Sequence[str] = TIERED_CODES,
    strong_from: int = 4,
    tiers: ContactTiers | None = None,
    model: ContactModel | None = None,
    min_count: int | None = None,
) -> TieredHits:
    """Advancement rows for weak and strong singles and doubles, estimated from the data.

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
        Needs the base-out columns (``outs_before``, ``bases_before``, ``outs_after``,
        ``bases_after``, ``runs_on_play``) and contact measurements.
    codes : sequence of str
        Hit codes to split (default singles and doubles).
    strong_from : int
        Tiers ``>= strong_from`` are strong, the others weak (default 4 of 5).
    tiers, model : optional
        The tier scale and contact model; by default the dataset's own.
    min_count : int, optional
        Plays needed in a (row, state) cell to use the subset; the runs layer's default.

    Returns
    -------
    TieredHits

    Raises
    ------
    DataError
        When the base-out columns are missing (tiered hits are not offered then).
    """
    from matchup_widgets.runs import MIN_COUNT, estimate_advancement

    frame = frame_of(pas)
    missing = [c for c in BASE_OUT_COLUMNS if c not in frame.columns]
    if missing:
        msg = (
            f"tiered hits need the base-out columns {missing}, which the table lacks; "
            f"without them tiered hits are not offered (use the plain advancement table)."
        )
        raise DataError(msg)
    bad = [c for c in codes if c not in BATTED or c in ("GB_OUT", "AIR_OUT")]
    if bad:
        msg = f"codes must be hit codes among {list(BATTED[:4])}, got {bad}."
        raise ValueError(msg)
    min_count = MIN_COUNT if min_count is None else int(min_count)
    tiers = contact_tiers(pas, model=model) if tiers is None else tiers
    n_tiers = len(tiers.cut_points) + 1
    if not 2 <= strong_from <= n_tiers:
        msg = f"strong_from must be a tier from 2 to {n_tiers}, got {strong_from!r}."
        raise ValueError(msg)

    full = estimate_advancement(frame, min_count=min_count)
    pred = contact_predictions(pas, model=model)
    tier = ball_tiers(pred, tiers)
    outcome = pred["outcome"].to_numpy()
    rows, counts, used, weak_share = {}, {}, {}, {}
    for code in codes:
        i = OUTCOMES.index(code)
        t_all, r_all = full.row(code)
        is_code = (outcome == code) & (tier > 0)
        weak = is_code & (tier < strong_from)
        weak_share[code] = float(weak.sum() / max(is_code.sum(), 1))
        for part, mask in (("weak", weak), ("strong", is_code & ~weak)):
            name = f"{code}_{part}"
            sub = estimate_advancement(pred.loc[mask], min_count=min_count)
            use = sub.from_data[i]
            t, r = t_all.copy(), r_all.copy()
            t[: len(use)][use] = sub.transitions[i][: len(use)][use]
            r[: len(use)][use] = sub.runs[i][: len(use)][use]
            rows[name] = (t, r)
            counts[name] = sub.counts[i]
            used[name] = use
    on_base = [n for n in rows]
    table = full.with_extra_rows(rows, on_base=on_base)
    return TieredHits(
        table=table,
        strong_from=int(strong_from),
        weak_share=weak_share,
        counts=pd.DataFrame(counts).T,
        from_data=pd.DataFrame(used).T,
    )


def tiered_probabilities(probs: Mapping[str, float] | pd.Series, weak_share: Mapping[str, float]) -> dict[str, float]:
    """Split each tiered hit code's probability into its weak and strong rows.

    ``p[code_weak] = p[code] * weak_share[code]``, ``p[code_strong] = p[code] * (1 - share)``
    and ``p[code] = 0``; the other codes are unchanged, so the total stays 1. Pass the
    result to the runs layer together with :attr:`TieredHits.table`.

    Examples
    --------
    >>> p = {"K": 0.3, "1B": 0.2, "GB_OUT": 0.5}
    >>> tiered_probabilities(p, {"1B": 0.5})
    {'K': 0.3, '1B': 0.0, 'GB_OUT': 0.5, '1B_weak': 0.1, '1B_strong': 0.1}
    """
    out = {str(k): float(v) for k, v in dict(probs).items()}
    for code, share in weak_share.items():
        if not 0.0 <= share <= 1.0:
            msg = f"weak_share[{code!r}] must lie in [0, 1], got {share!r}."
            raise ValueError(msg)
        p = out.get(code, 0.0)
        out[code] = 0.0
        out[f"{code}_weak"] = p * share
        out[f"{code}_strong"] = p * (1.0 - share)
    return out


def weak_shares_from_mix(
    mix: pd.Series, outcome_given: pd.DataFrame, *, strong_from: int = 4, codes: Sequence[str] = TIERED_CODES
) -> dict[str, float]:
    """Share of each hit code coming from the weak tiers under a tier mix.

    ``sum_{t < strong_from} mix[t] P(code | t) / sum_t mix[t] P(code | t)``, for a matchup
    tier mix from :func:`matchup_contact_mix` and ``ContactTiers.outcome_given_tier``.

    Examples
    --------
    >>> given = pd.DataFrame({"1B": [0.1, 0.3]}, index=[1, 2])
    >>> weak_shares_from_mix(pd.Series([0.5, 0.5], index=[1, 2]), given, strong_from=2, codes=["1B"])
    {'1B': 0.25}
    """
    weak = np.asarray(mix.index) < strong_from
    out = {}
    for code in codes:
        contrib = mix.to_numpy(float) * outcome_given.loc[mix.index, code].to_numpy(float)
        total = contrib.sum()
        out[code] = float(contrib[weak].sum() / total) if total > 0 else 0.0
    return out
