"""Calibration speed: the default Brier surface on the demo league, closed form vs a per-PA loop.

Fast path: split the demo league (25% of games held out), count both sides on the engine,
collapse the held-out PAs into batter x pitcher x split cells, shrink each player row for
each prior size and evaluate the linear blend's Brier on the whole default grid
(101 weights x 7 batter priors x 7 pitcher priors) from the quadratic's coefficients.
Goal: under 2 s, and at least 100x faster than the baseline.

Baseline (named): the per-PA grid search an analyst would write first. Same count tables,
same held-out PAs, same grid: for each prior pair build dicts of shrunk distributions, then
for each weight loop over the held-out PAs and add up the squared errors. The full loop grid
takes over an hour here, so by default it runs the ``BASELINE_PAIRS`` prior pair(s) (all 101
weights, all held-out PAs), checks that they give the same Brier values and best weight as
the fast surface, and scales the time to the 49 pairs (the loop's cost is the same for every
pair). Set ``MATCHUP_BENCH_FULL=1`` to run the whole loop grid instead. The machine is
shared, so both wall-clock and process CPU times are printed; the ratio uses each.

Also prints the demo-league figures the calibration issue asks for: held-out Brier of
league-only, of the fitted blend and of the oracle, and the share of the league-to-oracle
improvement the fitted blend captures.
"""

from __future__ import annotations

import os
import statistics
import time

import numpy as np

GOAL_SECONDS = 2.0
GOAL_RATIO = 100.0
BASELINE_PAIRS = ((100.0, 200.0),)


def _fast_surface(pas):
    """The default surface and closed-form best settings, from loaded plate appearances."""
    from matchup_widgets.model import DEFAULT_PRIOR_GRID, DEFAULT_WEIGHTS
    from matchup_widgets.model._calibrate import _prepare, _shrunk_cells
    from matchup_widgets.model._calibrate_surface import _best_pairs, _linear_coefficients, _surface_frame

    priors = np.asarray(DEFAULT_PRIOR_GRID, dtype=float)
    prep = _prepare(pas, None, holdout_share=0.25, seed=0, season_forward=False, basis="observed")
    bs, qs = _shrunk_cells(prep, "batter", priors), _shrunk_cells(prep, "pitcher", priors)
    a_, b_, c_, total = _linear_coefficients(prep.y, bs, qs)
    surface = _surface_frame(a_, b_, c_, total, priors, priors, DEFAULT_WEIGHTS)
    return prep, surface, _best_pairs(a_, b_, c_, total, priors, priors)


def _loop_inputs(pas):
    """Plain Python inputs for the analyst's loop: count dicts and held-out rows."""
    from matchup_widgets.data import OUTCOMES, league_counts, outcome_counts
    from matchup_widgets.model import split_games
    from matchup_widgets.model._calibrate import _fit_source

    frame = pas.frame
    held_mask = split_games(frame["game_id"].to_numpy(), holdout_share=0.25, seed=0)
    held = frame.loc[held_mask]
    fit = _fit_source(pas, held["game_id"].astype(str).unique(), "observed")
    codes = list(OUTCOMES)

    def as_dict(counts):
        keys = zip(counts["player_id"], counts["batter_hand"], counts["pitcher_hand"])
        return dict(zip(keys, counts[codes].to_numpy(dtype=float).tolist()))

    lg = league_counts(fit)
    league = {
        (bh, ph): [v / sum(c) for v in c]
        for bh, ph, c in zip(lg["batter_hand"], lg["pitcher_hand"], lg[codes].to_numpy(dtype=float).tolist())
    }
    rows = list(
        zip(held["batter_id"], held["pitcher_id"], held["batter_hand"], held["pitcher_hand"],
            held["outcome"].map({c: k for k, c in enumerate(codes)}))
    )
    return as_dict(outcome_counts(fit, role="batter")), as_dict(outcome_counts(fit, role="pitcher")), league, rows


def _loop_grid(batters, pitchers, league, rows, pairs, weights):
    """The straightforward grid search: shrink per player, then loop over every held-out PA."""

    def shrink_one(counts, lg, prior):
        n = sum(counts)
        if n + prior == 0:
            return lg
        return [(c + prior * l) / (n + prior) for c, l in zip(counts, lg)]

    out = []
    for pb, pq in pairs:
        bdist = {key: shrink_one(c, league[key[1:]], pb) for key, c in batters.items()}
        qdist = {key: shrink_one(c, league[key[1:]], pq) for key, c in pitchers.items()}
        for w in weights:
            total = 0.0
            for bid, pid, bh, ph, k in rows:
                lg = league[(bh, ph)]
                b = bdist.get((bid, bh, ph), lg)
                q = qdist.get((pid, bh, ph), lg)
                for j in range(9):
                    d = (1.0 - w) * b[j] + w * q[j] - (1.0 if j == k else 0.0)
                    total += d * d
            out.append((float(w), pb, pq, total / len(rows)))
    return out


def _oracle_figures(pas, prep, best) -> None:
    import pandas as pd

    from matchup_widgets.data.demo import demo_path, true_probabilities
    from matchup_widgets.model import brier_score

    players = pd.read_parquet(demo_path().parent / "players.parquet")
    held = prep.held
    oracle = brier_score(true_probabilities(held, players), held["outcome"].to_numpy())
    league = brier_score(prep.league, prep.y)
    fitted = float(best["brier"])
    print(
        f"demo league, {len(held):,} held-out PAs: Brier league-only {league:.5f}, fitted blend {fitted:.5f} "
        f"(w={best['pitcher_weight']:.3f}, priors {best['batter_prior_pa']:g}/{best['pitcher_prior_pa']:g}), "
        f"oracle {oracle:.5f}; the fitted blend captures {(league - fitted) / (league - oracle):.1%} of the "
        "league-to-oracle improvement"
    )


def main() -> None:
    from matchup_widgets.data import load_pas
    from matchup_widgets.data.demo import demo_path
    from matchup_widgets.model import DEFAULT_PRIOR_GRID, DEFAULT_WEIGHTS

    pas = load_pas(demo_path())
    pas.frame  # materialise once, outside the timings (both methods start from it)
    fast_times, fast_cpu = [], []
    for _ in range(3):
        t0, c0 = time.perf_counter(), time.process_time()
        prep, surface, best_pairs = _fast_surface(pas)
        fast_times.append(time.perf_counter() - t0)
        fast_cpu.append(time.process_time() - c0)
    fast, fast_c = statistics.median(fast_times), statistics.median(fast_cpu)
    best = best_pairs.loc[best_pairs["brier"].idxmin()]
    print(
        f"fast surface ({len(surface):,} grid points, {len(prep.held):,} held-out PAs in {len(prep.cells):,} cells, "
        f"split + engine counts included): median {fast:.3f} s wall, {fast_c:.3f} s CPU of {len(fast_times)} runs "
        f"(goal < {GOAL_SECONDS:g} s: {'met' if fast < GOAL_SECONDS else 'NOT met'})"
    )
    _oracle_figures(pas, prep, best)

    priors = [float(p) for p in DEFAULT_PRIOR_GRID]
    all_pairs = [(b, q) for b in priors for q in priors]
    full = os.environ.get("MATCHUP_BENCH_FULL") == "1"
    pairs = all_pairs if full else list(BASELINE_PAIRS)
    t0, c0 = time.perf_counter(), time.process_time()
    batters, pitchers, league, rows = _loop_inputs(pas)
    loop = _loop_grid(batters, pitchers, league, rows, pairs, DEFAULT_WEIGHTS)
    measured, measured_c = time.perf_counter() - t0, time.process_time() - c0
    scale = len(all_pairs) / len(pairs)
    loop_full, loop_full_c = measured * scale, measured_c * scale

    # same grid, same answer: Brier values and each pair's best grid weight agree
    got = surface.set_index(["pitcher_weight", "batter_prior_pa", "pitcher_prior_pa"])["brier"]
    diff = max(abs(got.loc[(w, pb, pq)] - v) for w, pb, pq, v in loop)
    for pb, pq in pairs:
        mine = [r for r in loop if r[1] == pb and r[2] == pq]
        w_loop = min(mine, key=lambda r: r[3])[0]
        sub = surface[(surface["batter_prior_pa"] == pb) & (surface["pitcher_prior_pa"] == pq)]
        w_fast = float(sub.loc[sub["brier"].idxmin(), "pitcher_weight"])
        assert w_loop == w_fast, (pb, pq, w_loop, w_fast)
    assert diff < 1e-9, diff
    label = "full grid" if full else f"{len(pairs)} of {len(all_pairs)} prior pairs x {len(DEFAULT_WEIGHTS)} weights, scaled to the full grid"
    ratio, ratio_c = loop_full / fast, loop_full_c / fast_c
    print(
        f"baseline per-PA loop grid search ({label}): measured {measured:.1f} s wall / {measured_c:.1f} s CPU, "
        f"full grid {loop_full:.0f} s wall / {loop_full_c:.0f} s CPU; same values (max |diff| {diff:.1e}) "
        "and same best weight per pair"
    )
    met = "met" if min(ratio, ratio_c) >= GOAL_RATIO else "NOT met"
    print(f"ratio baseline / fast: {ratio:,.0f}x wall, {ratio_c:,.0f}x CPU (goal >= {GOAL_RATIO:g}x: {met})")
