"""Runs for a batting order: the exact chain over (base-out state, lineup slot), and a
vectorised Monte Carlo cross-check."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from ._advancement import AdvancementTable
from ._chain import _step, _table, as_probs, runs_distribution_matrix, solve_by_outs, split_by_runs
from ._states import END, N_TRANSIENT, _check_state

_N_SLOTS = 9


@dataclass(frozen=True)
class LineupRuns:
    """Exact run expectations for a nine-man batting order.

    Attributes
    ----------
    runs_per_9 : float
        Expected runs in nine innings, the first led off by slot 1.
    runs_by_inning : ndarray, shape (9,)
        Expected runs in each of the nine innings.
    leadoff : ndarray, shape (9, 9)
        ``leadoff[i, j]``: probability that slot ``j`` leads off inning ``i``.
    runs_by_leadoff : ndarray, shape (9,)
        Expected runs in an inning led off by each slot.
    pa_by_slot : ndarray, shape (9,)
        Expected plate appearances of each slot in nine innings.
    runs_distribution : ndarray, shape (max_runs + 1,)
        Distribution of runs in one inning, averaged over the nine innings (last entry:
        ``max_runs`` or more).
    """

    runs_per_9: float
    runs_by_inning: np.ndarray
    leadoff: np.ndarray
    runs_by_leadoff: np.ndarray
    pa_by_slot: np.ndarray
    runs_distribution: np.ndarray


def _order(order_probs: Any, table: AdvancementTable) -> np.ndarray:
    # Labelled rows (dicts, Series, a DataFrame with code columns) are read by their labels,
    # as run_expectancy reads them, never by position.
    if isinstance(order_probs, pd.DataFrame):
        order_probs = [row for _, row in order_probs.iterrows()]  # nine rows
    if (
        isinstance(order_probs, (list, tuple))
        and order_probs
        and all(isinstance(row, (dict, pd.Series)) for row in order_probs)
    ):
        rows = [as_probs(row, table, name=f"order_probs[{i}]") for i, row in enumerate(order_probs)]
        p = np.stack(rows)
    else:
        p = as_probs(order_probs, table, name="order_probs")
    if p.ndim != 2 or p.shape[0] != _N_SLOTS:
        msg = (
            f"order_probs must hold nine outcome distributions (one per lineup slot), shape "
            f"(9, {len(table.outcomes)}); got shape {p.shape}."
        )
        raise ValueError(msg)
    return p


def lineup_runs(
    order_probs: Any,
    *,
    max_runs: int = 15,
    advancement: AdvancementTable | None = None,
) -> LineupRuns:
    """Expected runs per nine innings for a batting order against one pitcher, exactly.

    The chain runs over (base-out state, lineup slot): 24 x 9 transient states. Solving
    it gives, for each leadoff slot, the expected runs in the inning and the probability
    of each slot leading off the next inning; nine innings are then chained from slot 1.

    Parameters
    ----------
    order_probs : array-like, shape (9, n_outcomes), list of nine {code: p} or Series, or DataFrame
        Each slot's outcome distribution against this pitcher, in batting order; labelled
        rows (mappings, Series, DataFrame columns) are read by their outcome codes.
    max_runs : int, default 15
        Last bin of ``runs_distribution``.
    advancement : AdvancementTable, optional

    Returns
    -------
    LineupRuns

    Examples
    --------
    Nine batters who homer a quarter of the time and strike out otherwise score one run
    an inning.

    >>> res = lineup_runs([{"HR": 0.25, "K": 0.75}] * 9)
    >>> round(res.runs_per_9, 9), round(float(res.pa_by_slot.sum()), 9)
    (9.0, 36.0)
    """
    _check_count(max_runs, "max_runs")
    table = _table(advancement)
    p = _order(order_probs, table)
    n = N_TRANSIENT * _N_SLOTS
    # Order the 216 states by outs, then slot, then bases, so I - Q is block upper
    # triangular (outs never go down) and solve_by_outs can work on 72-state blocks.
    states = np.arange(N_TRANSIENT)
    pos = (states // 8) * (8 * _N_SLOTS) + np.arange(_N_SLOTS)[:, None] * 8 + states % 8  # [slot, s]
    q = np.zeros((n, n))
    exits = np.zeros((n, _N_SLOTS))
    step_runs = np.zeros(n)
    splits = [split_by_runs(p[j], table) for j in range(_N_SLOTS)]
    k_max = max(m.shape[0] for m in splits) - 1
    big_m = np.zeros((k_max + 1, n, n + 1))
    for j in range(_N_SLOTS):
        rows, nxt = pos[j], (j + 1) % _N_SLOTS
        block = np.ix_(rows, pos[nxt])
        trans, runs = _step(p[j], table)
        q[block] = trans[:, :N_TRANSIENT]
        exits[rows, nxt] = trans[:, END]
        step_runs[rows] = runs
        m = splits[j]
        for k in range(m.shape[0]):
            big_m[k][block] = m[k, :, :N_TRANSIENT]
            big_m[k, rows, n] = m[k, :, END]
    a = np.eye(n) - q
    solved = solve_by_outs(a, np.column_stack([step_runs, exits]))
    starts = pos[:, 0]  # (slot j, bases empty, 0 outs)
    runs_by_leadoff = solved[starts, 0]
    next_leadoff = solved[starts, 1:]
    # Expected visits from each start: columns of (I - Q)^-T at the start states.
    rhs = np.zeros((n, _N_SLOTS))
    rhs[starts, np.arange(_N_SLOTS)] = 1.0
    visits = solve_by_outs(a, rhs, transpose=True)  # visits[state, start]
    pa_from_start = visits[pos].sum(axis=1).T  # [start, slot]

    leadoff = np.zeros((_N_SLOTS, _N_SLOTS))
    leadoff[0, 0] = 1.0
    for i in range(1, _N_SLOTS):
        leadoff[i] = leadoff[i - 1] @ next_leadoff
    runs_by_inning = leadoff @ runs_by_leadoff
    dist = runs_distribution_matrix(big_m, int(max_runs))[starts]  # [start, runs]
    return LineupRuns(
        runs_per_9=float(runs_by_inning.sum()),
        runs_by_inning=runs_by_inning,
        leadoff=leadoff,
        runs_by_leadoff=runs_by_leadoff,
        pa_by_slot=leadoff.sum(axis=0) @ pa_from_start,
        runs_distribution=leadoff.mean(axis=0) @ dist,
    )


def _check_count(value: Any, name: str) -> None:
    if not (isinstance(value, (int, np.integer)) and not isinstance(value, bool) and value >= 1):
        msg = f"{name} must be a whole number >= 1; got {value!r}."
        raise ValueError(msg)


def _pick(u: np.ndarray, cum: np.ndarray) -> np.ndarray:
    """Inverse-CDF draw per row: index of the first cumulative value above ``u``."""
    idx = (u[:, None] >= cum).sum(axis=1)
    return np.minimum(idx, cum.shape[1] - 1)


def _simulate(
    p: np.ndarray,
    table: AdvancementTable,
    slots: np.ndarray,
    state: int,
    rng: np.random.Generator,
) -> tuple[np.ndarray, np.ndarray]:
    """Play one half-inning for each row in parallel; return runs and the next slot."""
    # Dividing by the row total makes the last non-zero cumulative value exactly 1, so a
    # draw never lands on a zero-probability column through rounding.
    cum_p = np.cumsum(p, axis=1)
    cum_p /= cum_p[:, -1:]
    cum_t = np.cumsum(table.transitions, axis=2)
    cum_t /= cum_t[:, :, -1:]
    floor_r = np.floor(table.runs)
    frac_r = table.runs - floor_r
    n = len(slots)
    runs = np.zeros(n)
    cur = np.full(n, state)
    slot = slots.copy()
    live = np.arange(n)
    while live.size:
        s = cur[live]
        o = _pick(rng.random(live.size), cum_p[slot[live]])
        t = _pick(rng.random(live.size), cum_t[o, s])
        runs[live] += floor_r[o, s, t] + (rng.random(live.size) < frac_r[o, s, t])
        cur[live] = t
        slot[live] = (slot[live] + 1) % p.shape[0]
        live = live[t != END]
    return runs, slot


def simulate_innings(
    probs: Any,
    *,
    n_innings: int,
    outs: int = 0,
    bases: int = 0,
    advancement: AdvancementTable | None = None,
    seed: int | None = None,
) -> np.ndarray:
    """Monte Carlo runs in ``n_innings`` independent innings from one base-out state.

    A cross-check for :func:`run_expectancy` and :func:`runs_distribution`; all innings
    are played in parallel with numpy.

    Parameters
    ----------
    probs : array-like or mapping
        Outcome distribution of every batter.
    n_innings : int
        Number of innings to play.
    outs, bases : int
        Starting base-out state.
    advancement : AdvancementTable, optional
    seed : int, optional
        Seed of the random generator.

    Returns
    -------
    ndarray of float, shape (n_innings,)
        Runs scored in each inning.

    Examples
    --------
    >>> runs = simulate_innings({"HR": 0.25, "K": 0.75}, n_innings=20_000, seed=1)
    >>> bool(abs(runs.mean() - 1.0) < 0.05)
    True
    """
    _check_state(outs, bases)
    _check_count(n_innings, "n_innings")
    table = _table(advancement)
    p = as_probs(probs, table)
    if p.ndim != 1:
        msg = f"probs must be one distribution (1-D); got shape {p.shape}. Use simulate_games for nine."
        raise ValueError(msg)
    rng = np.random.default_rng(seed)
    runs, _ = _simulate(p[None, :], table, np.zeros(int(n_innings), dtype=int), outs * 8 + bases, rng)
    return runs


def simulate_games(
    order_probs: Any,
    *,
    n_games: int,
    innings: int = 9,
    advancement: AdvancementTable | None = None,
    seed: int | None = None,
) -> np.ndarray:
    """Monte Carlo runs per inning for a batting order, carrying the lineup across innings.

    Parameters
    ----------
    order_probs : array-like, shape (9, n_outcomes), list of nine {code: p} or Series, or DataFrame
        Each slot's outcome distribution, in batting order (labelled rows read by code).
    n_games : int
        Games played in parallel.
    innings : int, default 9
    advancement : AdvancementTable, optional
    seed : int, optional
        Seed of the random generator.

    Returns
    -------
    ndarray of float, shape (n_games, innings)

    Examples
    --------
    >>> runs = simulate_games([{"HR": 0.25, "K": 0.75}] * 9, n_games=2_000, seed=1)
    >>> runs.shape, bool(abs(runs.sum(axis=1).mean() - 9.0) < 0.5)
    ((2000, 9), True)
    """
    _check_count(n_games, "n_games")
    _check_count(innings, "innings")
    table = _table(advancement)
    p = _order(order_probs, table)
    rng = np.random.default_rng(seed)
    slots = np.zeros(int(n_games), dtype=int)
    out = np.zeros((int(n_games), int(innings)))
    for i in range(int(innings)):
        out[:, i], slots = _simulate(p, table, slots, 0, rng)
    return out

