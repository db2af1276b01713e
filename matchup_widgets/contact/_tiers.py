"""Contact tiers: five bands of contact quality, cut at league quantiles of run value.

Every measured batted ball gets a contact-expected run value: its modeled outcome
probabilities (:class:`ContactModel`) times the run value of each batted-ball outcome.
The run values are the runs layer's linear weights for the league's own outcome mix when
that layer is available, else the published fallback below. Balls are then cut at fixed
league quantiles (by default the quintiles), tier 1 being the weakest contact and tier 5
the strongest; the cut points are computed from the data and kept on the result.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BATTED, OUTCOMES

#: Plain labels of the five tiers, weakest first (this project's own wording).
TIER_LABELS: dict[int, str] = {
    1: "Harmless",
    2: "Light",
    3: "Middling",
    4: "Dangerous",
    5: "Damaging",
}
#: League quantiles at which the tiers are cut (the quintiles).
TIER_QUANTILES: tuple[float, float, float, float] = (0.2, 0.4, 0.6, 0.8)

#: Fallback run values of the batted-ball outcomes (runs relative to an average plate
#: appearance), used when the runs layer cannot give linear weights. Source: the
#: linear-weights table of "The Hidden Game of Baseball" (1984) -- single 0.46, double
#: 0.80, triple 1.02, home run 1.40, batted out -0.25 -- from memory.
PUBLISHED_RUN_WEIGHTS: dict[str, float] = {
    "1B": 0.46,
    "2B": 0.80,
    "3B": 1.02,
    "HR": 1.40,
    "GB_OUT": -0.25,
    "AIR_OUT": -0.25,
}


def batted_run_weights(league_probs: Any = None, *, advancement: Any = None) -> tuple[pd.Series, str]:
    """Run value of each batted-ball outcome, and where it came from.

    Parameters
    ----------
    league_probs : mapping or array over OUTCOMES, optional
        The league outcome distribution. When given and the runs layer offers
        ``linear_weights``, its RE24 linear weights for this mix are used.
    advancement : AdvancementTable, optional
        Passed to ``linear_weights`` (for instance one estimated from the same data).

    Returns
    -------
    (pandas.Series, str)
        Runs indexed by ``BATTED``, and ``"runs layer linear weights"`` or
        ``"published fallback"``.

    Examples
    --------
    >>> w, source = batted_run_weights()
    >>> source, float(w["HR"])
    ('published fallback', 1.4)
    """
    if league_probs is not None:
        try:
            from matchup_widgets.runs import linear_weights
        except ImportError:  # runs layer not installed in this build
            linear_weights = None
        if linear_weights is not None:
            lw = linear_weights(league_probs, advancement=advancement)
            source = "runs layer linear weights" + ("" if advancement is None else ", data's own advancement")
            return lw.reindex(list(BATTED)).astype(float), source
    return pd.Series(PUBLISHED_RUN_WEIGHTS, dtype=float).reindex(list(BATTED)), "published fallback"


def expected_run_value(probs: np.ndarray, weights: pd.Series | Sequence[float]) -> np.ndarray:
    """Contact-expected run value of each ball: ``probs @ weights`` (NaN rows stay NaN).

    Examples
    --------
    >>> w = pd.Series(PUBLISHED_RUN_WEIGHTS)
    >>> expected_run_value(np.array([[0.5, 0, 0, 0, 0.5, 0]]), w).round(3).tolist()
    [0.105]
    """
    w = weights.reindex(list(BATTED)).to_numpy(float) if isinstance(weights, pd.Series) else np.asarray(weights, float)
    return np.asarray(probs, dtype=float) @ w


def tier_cut_points(values: Any, *, quantiles: Sequence[float] = TIER_QUANTILES) -> np.ndarray:
    """League quantiles of the contact-expected run values (missing values ignored).

    Examples
    --------
    >>> tier_cut_points(np.arange(101.0)).tolist()
    [20.0, 40.0, 60.0, 80.0]
    """
    q = np.asarray(quantiles, dtype=float)
    if q.ndim != 1 or q.size == 0 or np.any(np.diff(q) <= 0) or q[0] <= 0 or q[-1] >= 1:
        msg = f"quantiles must be strictly increasing numbers inside (0, 1), got {list(np.atleast_1d(quantiles))}."
        raise ValueError(msg)
    v = np.asarray(values, dtype=float)
    v = v[np.isfinite(v)]
    if v.size == 0:
        msg = "tier_cut_points got no finite run values; fit on balls with exit velocity and launch angle."
        raise ValueError(msg)
    return np.quantile(v, q)


def assign_tiers(values: Any, cut_points: Sequence[float]) -> np.ndarray:
    """Tier of each value: 1 below the first cut point, ..., ``len(cut_points) + 1`` above the last.

    A value equal to a cut point goes to the higher tier; missing values get tier 0.

    Examples
    --------
    >>> assign_tiers([0.05, 0.2, 0.31, float("nan")], [0.1, 0.2, 0.3, 0.4]).tolist()
    [1, 3, 4, 0]
    """
    v = np.asarray(values, dtype=float)
    cuts = np.asarray(cut_points, dtype=float)
    tiers = np.searchsorted(cuts, np.where(np.isfinite(v), v, 0.0), side="right") + 1
    return np.where(np.isfinite(v), tiers, 0)


@dataclass(frozen=True, eq=False)
class ContactTiers:
    """The league's tier scale: cut points, run weights and what each tier implies.

    Attributes
    ----------
    cut_points : ndarray, shape (4,)
        Contact-expected run values at :attr:`quantiles` of the league's measured balls.
    quantiles : tuple of float
    weights : pandas.Series
        Run value of each ``BATTED`` outcome used to rank the balls.
    weights_source : str
    table : pandas.DataFrame
        One row per tier (index 1..5): ``label``, ``n`` (league balls), ``share``,
        ``mean_run_value``, ``low``/``high`` run-value bounds, and one column per ``BATTED``
        code holding the mean modeled outcome probabilities of the tier's balls.
    labels : dict
    """

    cut_points: np.ndarray
    quantiles: tuple[float, ...]
    weights: pd.Series
    weights_source: str
    table: pd.DataFrame
    labels: dict[int, str] = field(default_factory=lambda: dict(TIER_LABELS))

    @property
    def outcome_given_tier(self) -> pd.DataFrame:
        """Mean modeled outcome probabilities per tier (rows 1..5, columns ``BATTED``)."""
        return self.table[list(BATTED)]


def build_tiers(
    probs: np.ndarray,
    *,
    weights: pd.Series,
    weights_source: str = "given",
    quantiles: Sequence[float] = TIER_QUANTILES,
    labels: Mapping[int, str] | None = None,
) -> ContactTiers:
    """Build the tier scale from the modeled probabilities of the league's balls.

    Parameters
    ----------
    probs : ndarray, shape (n, 6)
        Modeled probabilities over ``BATTED`` for every league ball (NaN rows ignored).
    weights : pandas.Series
        Run value of each ``BATTED`` outcome.

    Examples
    --------
    >>> rng = np.random.default_rng(0)
    >>> p = rng.dirichlet(np.ones(6), size=1000)
    >>> tiers = build_tiers(p, weights=pd.Series(PUBLISHED_RUN_WEIGHTS))
    >>> tiers.table["n"].tolist()
    [200, 200, 200, 200, 200]
    """
    labels = dict(TIER_LABELS if labels is None else labels)
    probs = np.asarray(probs, dtype=float)
    xrv = expected_run_value(probs, weights)
    cuts = tier_cut_points(xrv, quantiles=quantiles)
    n_tiers = len(cuts) + 1
    if sorted(labels) != list(range(1, n_tiers + 1)):
        msg = f"labels must name tiers 1..{n_tiers}, got keys {sorted(labels)}."
        raise ValueError(msg)
    tier = assign_tiers(xrv, cuts)
    ok = tier > 0
    n = np.bincount(tier[ok], minlength=n_tiers + 1)[1:]
    sums = np.zeros((n_tiers + 1, len(BATTED)))
    np.add.at(sums, tier[ok], probs[ok])
    with np.errstate(invalid="ignore", divide="ignore"):
        mean_probs = sums[1:] / n[:, None]
        mean_rv = np.bincount(tier[ok], weights=xrv[ok], minlength=n_tiers + 1)[1:] / n
    edges = np.concatenate([[np.nanmin(xrv)], cuts, [np.nanmax(xrv)]])
    table = pd.DataFrame(
        {
            "label": [labels[t] for t in range(1, n_tiers + 1)],
            "n": n,
            "share": n / max(n.sum(), 1),
            "mean_run_value": mean_rv,
            "low": edges[:-1],
            "high": edges[1:],
        },
        index=pd.RangeIndex(1, n_tiers + 1, name="tier"),
    )
    for j, code in enumerate(BATTED):
        table[code] = mean_probs[:, j]
    return ContactTiers(
        cut_points=cuts,
        quantiles=tuple(float(x) for x in quantiles),
        weights=weights.reindex(list(BATTED)).astype(float),
        weights_source=weights_source,
        table=table,
        labels=labels,
    )


def league_outcome_probs(outcomes: pd.Series | np.ndarray) -> pd.Series:
    """Share of each outcome code among plate appearances, indexed by ``OUTCOMES``."""
    codes = pd.Categorical(np.asarray(outcomes, dtype=object), categories=list(OUTCOMES))
    counts = np.bincount(codes.codes[codes.codes >= 0], minlength=len(OUTCOMES))
    return pd.Series(counts / max(counts.sum(), 1), index=list(OUTCOMES))

