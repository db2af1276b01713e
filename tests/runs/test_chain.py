from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose
from scipy import stats

from matchup_widgets.data import OUTCOMES
from matchup_widgets.runs import (
    STATES,
    run_expectancy,
    runs_distribution,
    runs_per_9,
    runs_per_inning,
    simulate_innings,
)

# Run expectancy by [outs][bases bitmask] from the 2015 major-league play-by-play
# (Retrosheet), as published by J. Albert: repository bayesball/ShinyBaseball, file
# data/twentyyears_RE.txt (column Mean, rows Season 2015; its Bases code "103" is runners on
# first and third). Published to two decimals, so each cell is good to 0.005.
PUBLISHED_2015 = np.array([
    # empty  1st   2nd   1st-2nd 3rd  1st-3rd 2nd-3rd loaded
    [0.47, 0.85, 1.11, 1.48, 1.40, 1.72, 2.04, 2.32],  # 0 outs
    [0.25, 0.50, 0.66, 0.88, 0.96, 1.12, 1.36, 1.59],  # 1 out
    [0.10, 0.22, 0.30, 0.43, 0.36, 0.45, 0.56, 0.78],  # 2 outs
])

# Run expectancy 1969-1992 (0.477 runs per inning), as published by T. Tango, "Run
# Expectancy Matrix - 2011 is 1969-1992", 6 May 2011,
# http://www.insidethebook.com/ee/index.php/site/article/run_expectancy_matrix_2011_is_1969_1992/
# Printed beside the 2015 table for reading (another run environment), not checked.
PUBLISHED_1969_1992 = np.array([
    [0.477, 0.853, 1.102, 1.476, 1.340, 1.715, 1.967, 2.343],  # 0 outs
    [0.252, 0.504, 0.678, 0.902, 0.943, 1.149, 1.380, 1.545],  # 1 out
    [0.094, 0.216, 0.325, 0.435, 0.373, 0.484, 0.594, 0.752],  # 2 outs
])

SEASONS = [2015, 2016, 2017, 2018, 2019, 2021, 2022, 2023, 2024]  # 2020 left out (60 games)


@pytest.mark.parametrize("q", [0.05, 0.25, 0.5, 0.9])
def test_home_run_or_out_closed_form(q):
    # Homers before the third out ~ negative binomial: mean 3q/(1-q), one run each.
    # From fewer outs left, (3 - outs) q / (1 - q); any runners on base score on the first homer.
    re = run_expectancy({"HR": q, "K": 1 - q})
    assert_allclose(re[0, 0], 3 * q / (1 - q), rtol=1e-12)
    assert_allclose(re[:, 0], [(3 - k) * q / (1 - q) for k in range(3)], rtol=1e-12)
    assert_allclose(re[2, 7], 3 * q + q / (1 - q), rtol=1e-12)  # P(homer next) * 3 runners + rest
    assert_allclose(runs_per_inning({"HR": 0.25, "K": 0.75}), 1.0, rtol=1e-12)


def test_walk_or_out_closed_form():
    # Walks before 3 outs W ~ NegBin(3, 1/2); runs = max(W - 3, 0) forced in: mean 0.9375
    # (hand sum: E[W] - 3 + P(W=0)*3 + P(W=1)*2 + P(W=2)*1 = 3 - 3 + 3/8 + 6/16 + 6/32).
    assert runs_per_inning({"BB": 0.5, "K": 0.5}) == pytest.approx(0.9375, abs=1e-12)
    dist = runs_distribution({"BB": 0.5, "K": 0.5}, max_runs=40)
    pmf = stats.nbinom.pmf(np.arange(4, 44), 3, 0.5)  # scipy reference: P(W = n + 3)
    assert_allclose(dist[1:40], pmf[:39], rtol=1e-10)
    assert_allclose(dist[0], stats.nbinom.cdf(3, 3, 0.5), rtol=1e-12)


def test_runs_distribution_mean_and_total_match_run_expectancy(league_rates):
    p = league_rates(2019)
    re = run_expectancy(p)
    for outs, bases in [(0, 0), (1, 3), (2, 7), (0, 4)]:
        dist = runs_distribution(p, outs=outs, bases=bases, max_runs=30)
        assert_allclose(dist.sum(), 1.0, atol=1e-12)
        assert_allclose(dist @ np.arange(31), re[outs, bases], rtol=1e-9)


def test_simulation_agrees_with_exact_run_expectancy(league_rates):
    p = league_rates(2019)
    exact = run_expectancy(p)[1, 3]
    runs = simulate_innings(p, n_innings=60_000, outs=1, bases=3, seed=11)
    se = runs.std() / np.sqrt(runs.size)
    assert abs(runs.mean() - exact) < 3 * se
    dist = runs_distribution(p, outs=1, bases=3, max_runs=3)
    sim = np.bincount(np.minimum(runs.astype(int), 3), minlength=4) / runs.size
    assert_allclose(sim, dist, atol=3 * np.sqrt(dist * (1 - dist) / runs.size).max())


def test_2015_matrix_against_the_published_one(league_rates):
    re = run_expectancy(league_rates(2015))
    diff = re - PUBLISHED_2015
    print("\n2015 run expectancy: model - published")
    for s, label in enumerate(STATES[:24]):
        o, b = divmod(s, 8)
        print(f"  {label:<32} model {re[o, b]:.3f}  published 2015 {PUBLISHED_2015[o, b]:.2f}  "
              f"diff {diff[o, b]:+.3f}  (1969-1992: {PUBLISHED_1969_1992[o, b]:.3f})")
    print(f"  mean absolute difference {np.abs(diff).mean():.3f}, largest {np.abs(diff).max():.3f}")
    assert np.abs(diff).mean() <= 0.03
    assert np.abs(diff).max() <= 0.10


def test_runs_per_9_by_season_against_lahman(league_rates, runs_per_team_game):
    errors = []
    print("\nruns per 9: model vs actual runs per team-game (Lahman Teams)")
    for season in SEASONS:
        model = runs_per_9(league_rates(season))
        actual = runs_per_team_game(season)
        errors.append(model / actual - 1)
        print(f"  {season}: model {model:.3f} actual {actual:.3f} ({errors[-1]:+.1%})")
    print(f"  mean absolute error {np.mean(np.abs(errors)):.1%}")
    assert max(abs(e) for e in errors) <= 0.07


def test_double_plays_implied_by_the_table_match_lahman(league_rates, lahman):
    # Extra check of the default double-play share: expected double plays per 9 innings from
    # the chain's visits to double-play states vs. grounded-into-double-play per 9 innings
    # pitched (Batting GIDP / Teams IPouts) in 2019.
    from matchup_widgets.runs import default_advancement
    from matchup_widgets.runs._chain import _step
    from matchup_widgets.runs._default_table import GROUND_DOUBLE_PLAY

    teams, batting = lahman
    p = league_rates(2019)
    trans, _ = _step(p, default_advancement())
    visits = np.linalg.solve((np.eye(24) - trans[:, :24]).T, np.eye(24)[0])
    dp_states = [s for s in range(16) if s & 1]  # runner on first, fewer than two outs
    model = 9 * visits[dp_states].sum() * p[OUTCOMES.index("GB_OUT")] * GROUND_DOUBLE_PLAY
    innings = teams.loc[teams.yearID == 2019, "IPouts"].sum() / 3
    actual = 9 * batting.loc[batting.yearID == 2019, "GIDP"].sum() / innings
    assert model == pytest.approx(float(actual), rel=0.15)


@pytest.mark.parametrize(
    ("probs", "match"),
    [
        ({"K": 0.5, "HR": 0.4}, r"must sum to 1"),
        ({"K": 1.5, "HR": -0.5}, r"negative"),
        ({"K": 0.5, "XX": 0.5}, r"unknown outcome code\(s\) \['XX'\]"),
        (np.full(8, 1 / 8), r"has 8 value\(s\) on its last axis; expected 9"),
        (np.full((2, 9), 1 / 9), r"one distribution"),
    ],
)
def test_bad_distributions_are_refused(probs, match):
    with pytest.raises(ValueError, match=match):
        run_expectancy(probs)


def test_series_array_and_dict_agree():
    p = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.22, 0.24])
    series = pd.Series(p, index=list(OUTCOMES))
    assert_allclose(run_expectancy(series), run_expectancy(p))
    assert_allclose(run_expectancy(dict(zip(OUTCOMES, p))), run_expectancy(p))


def test_run_expectancy_grows_with_runners_and_falls_with_outs(league_rates):
    re = run_expectancy(league_rates(2019))
    assert (np.diff(re, axis=0) < 0).all()
    assert (re[:, 7] > re[:, 0]).all()


@pytest.mark.parametrize("transpose", [False, True])
def test_block_solver_matches_a_dense_solve(transpose):
    from matchup_widgets.runs._chain import solve_by_outs

    rng = np.random.default_rng(4)
    q = rng.random((24, 24)) / 30
    q[8:, :8] = 0.0
    q[16:, 8:16] = 0.0  # outs never go down: block upper triangular
    a = np.eye(24) - q
    b = rng.random((24, 3))
    ref = np.linalg.solve(a.T if transpose else a, b)  # numpy reference
    assert_allclose(solve_by_outs(a, b, transpose=transpose), ref, rtol=1e-12)
    a[20, 3] = -0.01  # a move that takes an out back: dense fallback
    ref = np.linalg.solve(a.T if transpose else a, b)
    assert_allclose(solve_by_outs(a, b, transpose=transpose), ref, rtol=1e-12)


@pytest.mark.parametrize(
    "call",
    [
        lambda: run_expectancy({"HR": 1.0}),
        lambda: runs_per_9({"BB": 0.5, "HR": 0.5}),
    ],
)
def test_a_chain_that_never_ends_says_why(call):
    # Without any out the inning never ends: I - Q is singular (closed form: every row of Q
    # sums to 1). The user gets a plain reason instead of numpy's "Singular matrix".
    with pytest.raises(ValueError, match="never ends the inning"):
        call()
