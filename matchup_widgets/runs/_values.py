"""Run values of outcomes (RE24 linear weights), wOBA weights, and base-out situations."""

from __future__ import annotations

from typing import Any

import numpy as np
import pandas as pd

from ._advancement import AdvancementTable
from ._chain import (
    _solve,
    _solve_re,
    _table,
    as_probs,
    runs_distribution_matrix,
    split_by_runs,
)
from ._states import N_TRANSIENT, _check_state, state_label

_START = np.zeros(N_TRANSIENT)
_START[0] = 1.0


def _weights(p: np.ndarray, table: AdvancementTable) -> np.ndarray:
    """RE24 value of each outcome relative to the average PA (array over outcomes)."""
    re, a = _solve_re(p, table)
    # Expected visits to each state in an inning from (0 outs, empty): row 0 of (I - Q)^-1.
    visits = _solve(a.T, _START)
    share = visits / visits.sum()
    re_full = np.append(re, 0.0)
    # value[o] = sum_s share[s] * (sum_t T[o,s,t] (RE[t] + R[o,s,t]) - RE[s])
    after = table.transitions[:, :N_TRANSIENT] @ re_full + table.expected_step_runs
    value = (after - re[None, :]) @ share
    return value - p @ value


def linear_weights(probs: Any, *, advancement: AdvancementTable | None = None) -> pd.Series:
    """Run value of each outcome by the RE24 method, relative to the average plate appearance.

    The value of an outcome is the mean, over the base-out states in which plate
    appearances happen (weighted by how often the chain visits them), of the change in run
    expectancy plus the runs that score; the outcome-weighted mean is subtracted, so an
    average PA is worth 0.

    Parameters
    ----------
    probs : array-like or mapping
        League (or context) outcome distribution, ``OUTCOMES`` order or ``{code: p}``.
    advancement : AdvancementTable, optional

    Returns
    -------
    Series
        Runs per outcome, indexed by outcome code.

    Examples
    --------
    >>> lw = linear_weights({"HR": 0.25, "K": 0.75})
    >>> round(float(lw["HR"] - lw["K"]), 6)  # one run, plus the third of a run an out costs
    1.333333
    >>> round(float(lw @ pd.Series({"HR": 0.25, "K": 0.75}).reindex(lw.index, fill_value=0)), 12)
    0.0
    """
    table = _table(advancement)
    p = as_probs(probs, table)
    return pd.Series(_weights(p, table), index=list(table.outcomes), name="runs")


def woba_weights(
    probs: Any, *, advancement: AdvancementTable | None = None
) -> tuple[pd.Series, float]:
    """wOBA weights for the on-base outcomes, scaled so league wOBA equals league OBP.

    Each on-base outcome's linear weight is taken relative to the average out (the
    probability-weighted mean of the out outcomes' weights) and multiplied by
    ``scale = OBP / sum_e p[e] (w[e] - w_out)``, where OBP is the total probability of
    the on-base outcomes (per plate appearance).

    Parameters
    ----------
    probs : array-like or mapping
        League outcome distribution.
    advancement : AdvancementTable, optional

    Returns
    -------
    weights : Series
        One weight per on-base outcome.
    scale : float
        The factor that turned runs above an out into the on-base scale.

    Raises
    ------
    ValueError
        If ``probs`` has no outs or no on-base outcomes (the scale is undefined).

    Examples
    --------
    >>> weights, scale = woba_weights({"HR": 0.25, "K": 0.75})
    >>> round(float(weights["HR"]), 12), round(scale, 12)  # only way on base; 4/3 runs above an out
    (1.0, 0.75)
    """
    table = _table(advancement)
    p = as_probs(probs, table)
    on = table.on_base_mask
    p_out = p[~on].sum()
    obp = p[on].sum()
    if p_out <= 0 or obp <= 0:
        msg = (
            f"woba_weights needs both outs and on-base outcomes with positive probability; "
            f"got P(out) = {p_out:g}, P(on base) = {obp:g}."
        )
        raise ValueError(msg)
    lw = _weights(p, table)
    above_out = lw - (p[~on] @ lw[~on]) / p_out
    scale = float(obp / (p[on] @ above_out[on]))
    names = [o for o, m in zip(table.outcomes, on) if m]
    return pd.Series(above_out[on] * scale, index=names, name="woba_weight"), scale


def situation(
    probs: Any,
    *,
    outs: int,
    bases: int,
    league: Any,
    advancement: AdvancementTable | None = None,
) -> dict[str, Any]:
    """Expected runs and the chance to score from one base-out state, beside the league's.

    Every batter for the rest of the inning is taken to follow ``probs`` (the matchup),
    and, for the comparison, ``league`` (the league-average hitter).

    Parameters
    ----------
    probs, league : array-like or mapping
        Outcome distributions (``OUTCOMES`` order or ``{code: p}``).
    outs, bases : int
        The base-out state (bases bitmask: 1 = first, 2 = second, 4 = third).
    advancement : AdvancementTable, optional

    Returns
    -------
    dict
        ``state`` (label), ``outs``, ``bases``, ``expected_runs``, ``p_score``
        (probability of at least one run), ``league_expected_runs``, ``league_p_score``.

    Examples
    --------
    >>> out = situation({"HR": 0.5, "K": 0.5}, outs=2, bases=0, league={"HR": 0.25, "K": 0.75})
    >>> out["expected_runs"], out["p_score"], out["league_p_score"]
    (1.0, 0.5, 0.25)
    """
    _check_state(outs, bases)
    table = _table(advancement)
    s = int(outs) * 8 + int(bases)
    result: dict[str, Any] = {"state": state_label(outs, bases), "outs": int(outs), "bases": int(bases)}
    for prefix, dist, name in (("", probs, "probs"), ("league_", league, "league")):
        p = as_probs(dist, table, name=name)
        re, _ = _solve_re(p, table)
        # P(no run) needs only the n = 0 column of the runs distribution.
        f0 = runs_distribution_matrix(split_by_runs(p, table), 1)[s, 0]
        result[f"{prefix}expected_runs"] = round(float(re[s]), 12)
        result[f"{prefix}p_score"] = round(float(1.0 - f0), 12)
    return result
