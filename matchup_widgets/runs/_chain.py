"""Markov-chain run expectancy: the absorbing chain over base-out states, solved exactly.

For an outcome distribution ``p`` and an advancement table ``(T, R)`` the one-PA
transition matrix is ``P = sum_o p[o] T[o]`` and the expected runs on the next play from
state ``s`` is ``r[s] = sum_o p[o] sum_t T[o, s, t] R[o, s, t]``. With ``Q`` the transient
block of ``P``, run expectancy solves ``(I - Q) RE = r`` (first-step analysis).
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pandas as pd

from ._advancement import AdvancementTable, default_advancement
from ._states import END, N_TRANSIENT, _check_state

_EYE = np.eye(N_TRANSIENT)


def as_probs(probs: Any, table: AdvancementTable, *, name: str = "probs") -> np.ndarray:
    """Validate an outcome distribution and return it as an array over ``table.outcomes``.

    Accepts a mapping or Series ``{code: p}`` (missing codes count as 0) or an array whose
    last axis follows ``table.outcomes`` (or the first nine, ``OUTCOMES``, when the table
    has extra rows; those get probability 0).

    Raises
    ------
    ValueError
        Unknown codes, wrong length, negative or non-finite values, or a sum other than 1.
    """
    outcomes = table.outcomes
    if isinstance(probs, (dict, pd.Series)):
        keys = [str(k) for k in probs.keys()]
        unknown = [k for k in keys if k not in outcomes]
        if unknown:
            msg = (
                f"{name} has unknown outcome code(s) {unknown[:5]}; expected codes among "
                f"{list(outcomes)}."
            )
            raise ValueError(msg)
        arr = np.zeros(len(outcomes))
        for key, value in zip(keys, probs.values() if isinstance(probs, dict) else probs.to_numpy()):
            arr[outcomes.index(key)] = float(value)
    else:
        arr = np.asarray(probs, dtype=float)
        if arr.ndim == 0:
            msg = f"{name} must be an array over outcome codes or a {{code: p}} mapping; got a scalar."
            raise ValueError(msg)
        if arr.shape[-1] == 9 and len(outcomes) > 9:
            pad = np.zeros(arr.shape[:-1] + (len(outcomes) - 9,))
            arr = np.concatenate([arr, pad], axis=-1)
        if arr.shape[-1] != len(outcomes):
            msg = (
                f"{name} has {arr.shape[-1]} value(s) on its last axis; expected "
                f"{len(outcomes)}, one per outcome in the order {list(outcomes)}."
            )
            raise ValueError(msg)
    if not np.isfinite(arr).all() or (arr < 0).any():
        msg = f"{name} has negative or non-finite probabilities; every value must be >= 0."
        raise ValueError(msg)
    total = arr.sum(axis=-1)
    bad = np.abs(total - 1.0) > 1e-9
    if np.any(bad):
        shown = np.atleast_1d(total)[np.atleast_1d(bad)][:5]
        msg = (
            f"{name} must sum to 1 (within 1e-9) over outcomes; got sum(s) "
            f"{[round(float(t), 12) for t in shown]}. Normalise the distribution first."
        )
        raise ValueError(msg)
    return arr


def _table(advancement: AdvancementTable | None) -> AdvancementTable:
    if advancement is None:
        return default_advancement()
    if not isinstance(advancement, AdvancementTable):
        msg = (
            f"advancement must be an AdvancementTable (default_advancement() or "
            f"estimate_advancement(...)); got {type(advancement).__name__}."
        )
        raise TypeError(msg)
    return advancement


def _step(p: np.ndarray, table: AdvancementTable) -> tuple[np.ndarray, np.ndarray]:
    """Transient rows of the one-PA matrix ``P`` (24 x 25) and expected runs per step."""
    trans = np.tensordot(p, table.transitions[:, :N_TRANSIENT], axes=1)
    runs = np.tensordot(p, table.expected_step_runs, axes=1)
    return trans, runs


#: Why ``I - Q`` can be singular: some state is never left for the end of the inning.
NEVER_ENDS = (
    "the outcome distribution never ends the inning from some base-out state (no outcome "
    "with positive probability leads toward a third out there), so the expected runs are "
    "infinite; give every batter a positive probability of an out (K, GB_OUT or AIR_OUT)."
)


def _solve(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """``np.linalg.solve`` that says in plain words why the chain has no solution."""
    try:
        return np.linalg.solve(a, b)
    except np.linalg.LinAlgError:
        raise ValueError(NEVER_ENDS) from None


def _solve_re(p: np.ndarray, table: AdvancementTable) -> tuple[np.ndarray, np.ndarray]:
    """Run expectancy of the 24 transient states and the transient block ``I - Q``."""
    trans, runs = _step(p, table)
    a = _EYE - trans[:, :N_TRANSIENT]
    return _solve(a, runs), a


def run_expectancy(probs: Any, *, advancement: AdvancementTable | None = None) -> np.ndarray:
    """Expected runs for the rest of the inning from each base-out state.

    Parameters
    ----------
    probs : array-like or mapping
        Outcome distribution of every batter (last axis in ``OUTCOMES`` order, or
        ``{code: p}``), summing to 1.
    advancement : AdvancementTable, optional
        Defaults to :func:`default_advancement`.

    Returns
    -------
    ndarray, shape (3, 8)
        ``[outs, bases]`` with bases a bitmask (1 = first, 2 = second, 4 = third).

    Examples
    --------
    Half home runs, half strikeouts: 3 * q / (1 - q) = 3 runs from empty bases.

    >>> re = run_expectancy({"HR": 0.5, "K": 0.5})
    >>> round(float(re[0, 0]), 12)
    3.0
    """
    table = _table(advancement)
    p = as_probs(probs, table)
    if p.ndim != 1:
        msg = f"probs must be one distribution (1-D); got shape {p.shape}. Use lineup_runs for nine."
        raise ValueError(msg)
    re, _ = _solve_re(p, table)
    return re.reshape(3, 8)


def runs_per_inning(probs: Any, *, advancement: AdvancementTable | None = None) -> float:
    """Expected runs in an inning started with bases empty and no outs.

    Parameters
    ----------
    probs : array-like or mapping
        Outcome distribution (``OUTCOMES`` order or ``{code: p}``), summing to 1.
    advancement : AdvancementTable, optional

    Returns
    -------
    float

    Examples
    --------
    >>> runs_per_inning({"BB": 0.5, "K": 0.5})
    0.9375
    """
    return float(run_expectancy(probs, advancement=advancement)[0, 0])


def runs_per_9(probs: Any, *, advancement: AdvancementTable | None = None) -> float:
    """Expected runs in nine innings when every batter follows ``probs``.

    Parameters
    ----------
    probs : array-like or mapping
        Outcome distribution (``OUTCOMES`` order or ``{code: p}``), summing to 1.
    advancement : AdvancementTable, optional

    Returns
    -------
    float
        ``9 * runs_per_inning(probs)``.

    Examples
    --------
    >>> round(runs_per_9({"HR": 0.25, "K": 0.75}), 12)
    9.0
    """
    return 9.0 * runs_per_inning(probs, advancement=advancement)


def split_by_runs(p: np.ndarray, table: AdvancementTable) -> np.ndarray:
    """One-PA matrices by runs scored: ``M[k, s, t]`` = P(move s -> t scoring k runs).

    Fractional mean runs (estimated tables) split their mass between the two nearest
    whole numbers so the expectation is kept. Shape ``(k_max + 1, 24, 25)``.
    """
    trans = table.transitions[:, :N_TRANSIENT]
    runs = table.runs[:, :N_TRANSIENT]
    low = np.floor(runs)
    frac = runs - low
    k_max = int(np.ceil(runs[trans > 0].max())) if (trans > 0).any() else 0
    weighted = p[:, None, None] * trans
    out = np.zeros((k_max + 1, N_TRANSIENT, END + 1))
    for k in range(k_max + 1):
        w = np.where(low == k, 1.0 - frac, 0.0) + np.where((low == k - 1) & (frac > 0), frac, 0.0)
        out[k] = (weighted * w).sum(axis=0)
    return out


def solve_by_outs(a: np.ndarray, b: np.ndarray, *, transpose: bool = False) -> np.ndarray:
    """Solve ``a x = b`` (or ``a.T x = b``) for ``a = I - Q`` ordered by outs (0, 1, 2).

    Outs never go down within an inning, so ``a`` is block upper triangular with three
    equal blocks and the system is solved by block back-substitution: three solves of a
    third of the size (much faster than one large solve, and small enough that the BLAS
    does not spread them over threads). Falls back to a dense solve if a table lets outs
    go down.
    """
    n = a.shape[0]
    m = n // 3
    blk = [slice(0, m), slice(m, 2 * m), slice(2 * m, n)]
    if n % 3 or a[m:, :m].any() or a[2 * m :, m : 2 * m].any():
        return _solve(a.T if transpose else a, b)
    x = [None, None, None]
    order = (0, 1, 2) if transpose else (2, 1, 0)
    for i in order:
        rhs = b[blk[i]].copy()
        for j in range(3):
            if x[j] is not None:
                # Upper blocks a[i, j] (j > i), or for a.T the transposed a[j, i] (j < i).
                rhs -= (a[blk[j], blk[i]].T if transpose else a[blk[i], blk[j]]) @ x[j]
        x[i] = _solve(a[blk[i], blk[i]].T if transpose else a[blk[i], blk[i]], rhs)
    return np.concatenate(x)


def runs_distribution_matrix(m: np.ndarray, max_runs: int) -> np.ndarray:
    """Runs-in-the-rest-of-the-inning distribution for every transient state.

    Dynamic programming over runs: with ``A = I - M0`` (moves that score nothing),
    ``A f_n = sum_{k>=1} M_k f_{n-k} + M_n[:, end]`` where ``f_n[s]`` = P(n runs | s).
    The last column is the tail, ``max_runs`` or more. ``m`` may hold any number of
    transient states ordered by outs, with the absorbing state as the last column.
    """
    n_t = m.shape[1]
    a = np.eye(n_t) - m[0, :, :n_t]
    k_max = m.shape[0] - 1
    f = np.zeros((n_t, max_runs + 1))
    for n in range(max_runs):
        rhs = m[n, :, n_t].copy() if n <= k_max else np.zeros(n_t)
        for k in range(1, min(n, k_max) + 1):
            rhs += m[k, :, :n_t] @ f[:, n - k]
        f[:, n] = solve_by_outs(a, rhs)
    f[:, max_runs] = np.clip(1.0 - f[:, :max_runs].sum(axis=1), 0.0, None)
    return f


def runs_distribution(
    probs: Any,
    *,
    outs: int = 0,
    bases: int = 0,
    max_runs: int = 15,
    advancement: AdvancementTable | None = None,
) -> np.ndarray:
    """Probability of scoring 0, 1, ..., ``max_runs`` or more runs in the rest of the inning.

    Parameters
    ----------
    probs : array-like or mapping
        Outcome distribution (``OUTCOMES`` order or ``{code: p}``), summing to 1.
    outs, bases : int
        Starting base-out state (bases bitmask: 1 = first, 2 = second, 4 = third).
    max_runs : int, default 15
        The last entry holds ``max_runs`` or more.
    advancement : AdvancementTable, optional

    Returns
    -------
    ndarray, shape (max_runs + 1,)
        Sums to 1.

    Examples
    --------
    Walk or strikeout with even odds: no run unless four walks come before three outs.

    >>> dist = runs_distribution({"BB": 0.5, "K": 0.5}, max_runs=3)
    >>> [round(float(x), 6) for x in dist]
    [0.65625, 0.117188, 0.082031, 0.144531]
    """
    _check_state(outs, bases)
    if not (isinstance(max_runs, (int, np.integer)) and max_runs >= 1):
        msg = f"max_runs must be a whole number >= 1; got {max_runs!r}."
        raise ValueError(msg)
    table = _table(advancement)
    p = as_probs(probs, table)
    f = runs_distribution_matrix(split_by_runs(p, table), int(max_runs))
    return f[outs * 8 + bases]
