"""Intervals: Dirichlet marginals against scipy, coverage by simulation, honest tiny samples."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import stats

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import INTERVAL_FLOOR, blend, matchup_draws, matchup_interval, posterior_draws

BATTER_TRUTH = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.24, 0.22])
PITCHER_TRUTH = np.array([0.26, 0.07, 0.01, 0.14, 0.04, 0.004, 0.026, 0.25, 0.2])
LEAGUE = (BATTER_TRUTH + PITCHER_TRUTH) / 2


def test_posterior_draws_match_beta_marginals():
    # Reference: each marginal of Dirichlet(alpha) is Beta(alpha_i, A - alpha_i) (scipy.stats.beta).
    counts = np.array([40, 12, 2, 30, 9, 1, 6, 55, 45])
    alpha = counts + np.maximum(50 * LEAGUE, INTERVAL_FLOOR)
    draws = posterior_draws(counts, LEAGUE, 50, n_draws=40_000, seed=11)
    lo, hi = np.quantile(draws, [0.1, 0.9], axis=0)
    ref_lo = stats.beta.ppf(0.1, alpha, alpha.sum() - alpha)
    ref_hi = stats.beta.ppf(0.9, alpha, alpha.sum() - alpha)
    assert_allclose(lo, ref_lo, rtol=0.03, atol=2e-4)
    assert_allclose(hi, ref_hi, rtol=0.03, atol=2e-4)


@pytest.mark.parametrize(
    ("method", "weights"),
    [
        ("linear", {"pitcher_weight": 0.5}),
        ("odds-ratio", {}),
        ("two-stage", {"first_weight": 0.6, "in_play_weight": 0.3}),
    ],
)
def test_eighty_percent_interval_covers_truth_about_eighty_percent(method, weights):
    # Draw counts from known distributions 2,000 times; the 80% interval of each blended
    # probability should cover the true blend 75-85% of the time (nominal 80%).
    rng = np.random.default_rng(2024)
    n_rep, n_pa = 2000, 300
    truth = blend(method, BATTER_TRUTH, PITCHER_TRUTH, LEAGUE, **weights)
    cb = rng.multinomial(n_pa, BATTER_TRUTH, size=n_rep)
    cq = rng.multinomial(n_pa, PITCHER_TRUTH, size=n_rep)
    out = matchup_interval(
        method, cb, cq, LEAGUE, batter_prior_pa=0, pitcher_prior_pa=0, n_draws=500, seed=7, **weights
    )
    covered = (out["lo"] <= truth) & (truth <= out["hi"])
    per_outcome = covered.mean(axis=0)
    assert 0.75 <= covered.mean() <= 0.85, per_outcome
    common = [OUTCOMES.index(c) for c in ("K", "BB", "1B", "GB_OUT", "AIR_OUT")]
    assert np.all((per_outcome[common] >= 0.75) & (per_outcome[common] <= 0.85)), per_outcome


def test_tiny_samples_give_wide_intervals():
    none = np.zeros(9)
    tiny = np.array([1, 0, 0, 1, 0, 0, 0, 1, 0])
    big = tiny * 300
    widths = {}
    for name, counts in {"none": none, "tiny": tiny, "big": big}.items():
        out = matchup_interval(
            "linear", counts, counts, LEAGUE, batter_prior_pa=0, pitcher_prior_pa=0, pitcher_weight=0.5
        )
        widths[name] = out["hi"] - out["lo"]
        assert np.all(out["lo"] <= out["hi"])
    # an outcome never seen in 3 PA still gets an upper bound well above zero
    assert widths["tiny"][OUTCOMES.index("BB")] > 0.05
    assert np.all(widths["none"][[0, 3, 7, 8]] > 0.1)
    assert np.all(widths["big"][[0, 3, 7]] < widths["tiny"][[0, 3, 7]] / 5)


def test_effective_sample_size():
    # Dirichlet(alpha) has Var p_i = p_i (1 - p_i) / (A + 1), so our pooled ESS estimates
    # A = n + prior (closed form). An even linear blend of two equal, independent sides has
    # half the variance: ESS = 2 (A + 1) - 1.
    counts = np.round(BATTER_TRUTH * 400)
    out = matchup_interval(
        "linear", counts, counts, LEAGUE, batter_prior_pa=100, pitcher_prior_pa=100,
        pitcher_weight=0.0, n_draws=20_000,
    )
    a = counts.sum() + 100
    assert_allclose(out["effective_pa"], a, rtol=0.05)
    out = matchup_interval(
        "linear", counts, counts, LEAGUE, batter_prior_pa=100, pitcher_prior_pa=100,
        pitcher_weight=0.5, n_draws=20_000,
    )
    assert_allclose(out["effective_pa"], 2 * (a + 1) - 1, rtol=0.05)


def test_interval_contains_point_and_is_repeatable():
    counts = np.array([3, 0, 0, 2, 0, 0, 0, 4, 1])
    point = counts / counts.sum()
    one = matchup_interval("linear", counts, counts, LEAGUE, batter_prior_pa=0, pitcher_prior_pa=0,
                           pitcher_weight=0.5, point=point)
    two = matchup_interval("linear", counts, counts, LEAGUE, batter_prior_pa=0, pitcher_prior_pa=0,
                           pitcher_weight=0.5, point=point)
    assert np.all((one["lo"] <= point) & (point <= one["hi"]))
    assert_allclose(one["lo"], two["lo"], rtol=0)
    with pytest.raises(ValueError, match="interval must lie strictly between 0 and 1"):
        matchup_interval("linear", counts, counts, LEAGUE, batter_prior_pa=0, pitcher_prior_pa=0,
                         pitcher_weight=0.5, interval=80)


def test_side_intervals_are_the_beta_quantiles_of_each_sides_posterior():
    # Reference: each marginal of Dirichlet(alpha) is Beta(alpha_i, A - alpha_i), a standard
    # result; quantiles from scipy.stats.beta.ppf. Batter and pitcher alphas are counts +
    # prior x league (floored at INTERVAL_FLOOR); the league's are its counts + the floor only.
    b_counts = np.array([40, 12, 2, 30, 9, 1, 6, 55, 45])
    p_counts = np.array([70, 15, 3, 38, 11, 1, 7, 70, 65])
    lg_counts = np.round(LEAGUE * 5000)
    league = lg_counts / lg_counts.sum()
    out = matchup_interval(
        "linear", b_counts, p_counts, league, batter_prior_pa=50, pitcher_prior_pa=120,
        pitcher_weight=0.5, n_draws=40_000, seed=3, league_counts=lg_counts,
    )
    alphas = {
        "batter": b_counts + np.maximum(50 * league, INTERVAL_FLOOR),
        "pitcher": p_counts + np.maximum(120 * league, INTERVAL_FLOOR),
        "league": lg_counts + INTERVAL_FLOOR,
    }
    assert sorted(out["side_lo"]) == ["batter", "league", "pitcher"]
    for side, alpha in alphas.items():
        ref_lo = stats.beta.ppf(0.1, alpha, alpha.sum() - alpha)
        ref_hi = stats.beta.ppf(0.9, alpha, alpha.sum() - alpha)
        # Monte Carlo tolerance for 40,000 draws
        assert_allclose(out["side_lo"][side], ref_lo, rtol=0.03, atol=2e-4, err_msg=side)
        assert_allclose(out["side_hi"][side], ref_hi, rtol=0.03, atol=2e-4, err_msg=side)


def test_side_draws_are_the_ones_behind_the_matchup_interval():
    # One sampler: the matchup draws (and so its interval) do not change when the league
    # interval is asked for, and the side draws returned are those the blend used.
    counts = np.array([40, 12, 2, 30, 9, 1, 6, 55, 45])
    kw = {"batter_prior_pa": 30, "pitcher_prior_pa": 60, "pitcher_weight": 0.4, "n_draws": 300, "seed": 5}
    plain = matchup_interval("linear", counts, counts[::-1], LEAGUE, **kw)
    with_league = matchup_interval("linear", counts, counts[::-1], LEAGUE, league_counts=counts * 50, **kw)
    assert_allclose(plain["lo"], with_league["lo"], rtol=0)
    assert_allclose(plain["side_hi"]["pitcher"], with_league["side_hi"]["pitcher"], rtol=0)
    draws, sides = matchup_draws("linear", counts, counts[::-1], LEAGUE, return_sides=True, **kw)
    assert_allclose(draws, matchup_draws("linear", counts, counts[::-1], LEAGUE, **kw), rtol=0)
    assert_allclose(draws, blend("linear", sides["batter"], sides["pitcher"], LEAGUE, pitcher_weight=0.4), rtol=1e-12)
    assert_allclose(plain["side_lo"]["batter"], np.quantile(sides["batter"], 0.1, axis=0), rtol=1e-12)
