"""Runs layer: exact Markov run expectancy + linear weights vs. a plain-Python simulation.

Baseline: a per-PA simulation in plain Python (one inning at a time, ``random.random``
draws), started from each of the 24 base-out states until every state's run expectancy
has a standard error of at most 0.02 runs, with linear weights averaged over the RE24
values of the simulated plays. Goals: exact matrix + weights under 10 ms, lineup under
100 ms, at least 50x faster than the baseline.
"""

from __future__ import annotations

import bisect
import random
import time

import numpy as np

from matchup_widgets.runs import (
    default_advancement,
    lineup_runs,
    linear_weights,
    run_expectancy,
    simulate_games,
    woba_weights,
)

# Invented league line for timing only.
_P = np.array([0.22, 0.085, 0.01, 0.14, 0.045, 0.004, 0.034, 0.22, 0.242])
_TARGET_SE = 0.02


def _best_of(fn, repeat: int = 5, number: int = 20) -> float:
    best = float("inf")
    for _ in range(repeat):
        start = time.perf_counter()
        for _ in range(number):
            fn()
        best = min(best, (time.perf_counter() - start) / number)
    return best


def _exact() -> None:
    run_expectancy(_P)
    linear_weights(_P)
    woba_weights(_P)


def _python_simulation(n_per_state: int, seed: int = 0) -> tuple[list[float], list[float], list[float]]:
    """Plain-Python per-PA simulation: RE by state (exploring starts), its SE, and weights."""
    rng = random.Random(seed)
    table = default_advancement()
    cum_p = list(np.cumsum(_P))
    moves = []  # moves[o][s] = (cumulative probabilities, to-states, runs)
    for o in range(9):
        rows = []
        for s in range(24):
            (to,) = np.nonzero(table.transitions[o, s])
            rows.append((list(np.cumsum(table.transitions[o, s, to])), list(to), list(table.runs[o, s, to])))
        moves.append(rows)
    sums, squares = [0.0] * 24, [0.0] * 24
    plays: list[tuple[int, int, int, float]] = []
    for start in range(24):
        for _ in range(n_per_state):
            s, total = start, 0.0
            while s != 24:
                o = min(bisect.bisect_right(cum_p, rng.random()), 8)
                cum, to, runs = moves[o][s]
                k = min(bisect.bisect_right(cum, rng.random()), len(to) - 1)
                if start == 0:
                    plays.append((s, o, int(to[k]), runs[k]))
                total += runs[k]
                s = int(to[k])
            sums[start] += total
            squares[start] += total * total
    re = [x / n_per_state for x in sums]
    se = [((q / n_per_state - m * m) / n_per_state) ** 0.5 for q, m in zip(squares, re)]
    re_full = re + [0.0]
    value, count = [0.0] * 9, [0] * 9
    for s, o, t, r in plays:
        value[o] += re_full[t] - re_full[s] + r
        count[o] += 1
    mean = [v / max(c, 1) for v, c in zip(value, count)]
    avg = sum(m * p for m, p in zip(mean, _P))
    return re, se, [m - avg for m in mean]


def main() -> None:
    exact_s = _best_of(_exact)
    order = np.random.default_rng(1).dirichlet(_P * 400, size=9)
    lineup_s = _best_of(lambda: lineup_runs(order), repeat=3, number=5)

    # Innings per state for a 0.02-run standard error at the most variable state
    # (sd of runs is about 1.7 from bases loaded, no outs): (1.7 / 0.02)^2 ~ 7200 -> 8000.
    n_per_state = 8000
    start = time.perf_counter()
    re_sim, se_sim, lw_sim = _python_simulation(n_per_state)
    sim_s = time.perf_counter() - start

    re = run_expectancy(_P).ravel()
    lw = linear_weights(_P).to_numpy()
    print(f"exact run expectancy + linear weights + wOBA weights: {exact_s * 1e3:.3f} ms (goal < 10 ms)")
    print(f"exact lineup (216-state chain, nine innings):        {lineup_s * 1e3:.2f} ms (goal < 100 ms)")
    print(f"baseline plain-Python simulation, {n_per_state} innings x 24 states: {sim_s:.2f} s")
    print(f"  its largest standard error {max(se_sim):.4f} runs (target {_TARGET_SE}); "
          f"largest |sim - exact| RE {np.max(np.abs(np.array(re_sim) - re)):.4f}, "
          f"weights {np.max(np.abs(np.array(lw_sim) - lw)):.4f}")
    print(f"ratio baseline / exact: {sim_s / exact_s:,.0f}x (goal >= 50x)")

    start = time.perf_counter()
    games = simulate_games(order, n_games=22_223, seed=2)
    vec_s = time.perf_counter() - start
    exact_9 = lineup_runs(order).runs_per_9
    se = games.sum(axis=1).std(ddof=1) / np.sqrt(games.shape[0])
    print(f"vectorised numpy lineup simulation, {games.size:,} innings: {vec_s:.2f} s; "
          f"runs per 9 {games.sum(axis=1).mean():.3f} +- {se:.3f} vs exact {exact_9:.3f}; "
          f"ratio simulation / exact lineup {vec_s / lineup_s:,.0f}x")


if __name__ == "__main__":  # pragma: no cover
    main()
