"""Closed-form weight, Brier surfaces and the weight bootstrap against brute force."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.model import (
    best_weight_closed_form,
    brier_score,
    linear_blend,
    linear_weight_surface,
    odds_ratio_blend,
    quadratic_coefficients,
    shrink,
    two_stage_blend,
    two_stage_surface,
    weight_bootstrap,
)

# A plausible league line in OUTCOMES order (K, BB, HBP, 1B, 2B, 3B, HR, GB_OUT, AIR_OUT),
# invented for simulation only (never a check value).
_LEAGUE = np.array([0.22, 0.08, 0.01, 0.14, 0.045, 0.004, 0.03, 0.21, 0.261])
_LEAGUE = _LEAGUE / _LEAGUE.sum()


def _players(rng, n, concentration=60.0):
    return rng.dirichlet(concentration * _LEAGUE, size=n)


def _draw(rng, p):
    """One outcome index per row of p (inverse CDF)."""
    u = rng.random(p.shape[0])
    return np.minimum((u[:, None] > p.cumsum(axis=1)).sum(axis=1), p.shape[1] - 1)


def _cells(rng, n_cells=60, pa_range=(1, 8)):
    """Cells with fitting counts for each side and held-out outcome counts."""
    n_fit_b = rng.integers(0, 300, size=n_cells)
    n_fit_q = rng.integers(0, 300, size=n_cells)
    b_true, q_true = _players(rng, n_cells), _players(rng, n_cells)
    bc = np.array([rng.multinomial(n, p) for n, p in zip(n_fit_b, b_true)], dtype=float)
    qc = np.array([rng.multinomial(n, p) for n, p in zip(n_fit_q, q_true)], dtype=float)
    n_held = rng.integers(*pa_range, size=n_cells)
    y = np.array([rng.multinomial(n, 0.6 * b + 0.4 * q) for n, b, q in zip(n_held, b_true, q_true)], dtype=float)
    league = np.broadcast_to(_LEAGUE, y.shape)
    return y, bc, qc, league


def test_quadratic_coefficients_reproduce_brier_at_any_weight():
    # Reference: brier_score of the explicitly blended forecasts, PA by PA.
    rng = np.random.default_rng(0)
    y, bc, qc, lg = _cells(rng)
    b, q = shrink(bc, lg, 50), shrink(qc, lg, 100)
    a_, b_, c_ = quadratic_coefficients(b, q, y)
    for w in (0.0, 0.13, 0.5, 0.91, 1.0):
        direct = brier_score(linear_blend(b, q, w), y)
        assert_allclose((a_ * w**2 + b_ * w + c_) / y.sum(), direct, rtol=1e-12)


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_closed_form_weight_matches_brute_force_grid(seed):
    # Reference: a brute-force search over w = 0, 0.001, ..., 1 scoring every blend with
    # brier_score; the closed form must agree to 0.01 (the requirement).
    rng = np.random.default_rng(seed)
    y, bc, qc, lg = _cells(rng)
    b, q = shrink(bc, lg, 25), shrink(qc, lg, 200)
    grid = np.linspace(0, 1, 1001)
    brute = grid[np.argmin([brier_score(linear_blend(b, q, w), y) for w in grid])]
    assert abs(float(best_weight_closed_form(b, q, y)) - brute) <= 0.01


def test_surface_equals_brute_force_and_minimum_is_where_brute_force_finds_it():
    rng = np.random.default_rng(3)
    y, bc, qc, lg = _cells(rng)
    priors, weights = [0, 50, 400], np.round(np.linspace(0, 1, 21), 2)
    surf = linear_weight_surface(y, bc, qc, lg, batter_priors=priors, pitcher_priors=priors, weights=weights)
    assert len(surf) == 3 * 3 * 21
    brute = []
    for pb in priors:
        for pq in priors:
            b, q = shrink(bc, lg, pb), shrink(qc, lg, pq)
            for w in weights:
                brute.append((w, pb, pq, brier_score(linear_blend(b, q, w), y)))
    brute = np.array(brute)
    got = surf.sort_values(["batter_prior_pa", "pitcher_prior_pa", "pitcher_weight"]).to_numpy(float)
    ref = brute[np.lexsort((brute[:, 0], brute[:, 2], brute[:, 1]))]
    assert_allclose(got, ref, rtol=1e-11)
    best = surf.loc[surf["brier"].idxmin()]
    ref_best = ref[np.argmin(ref[:, 3])]
    assert (best["pitcher_weight"], best["batter_prior_pa"], best["pitcher_prior_pa"]) == tuple(ref_best[:3])


def test_two_stage_surface_equals_explicit_two_stage_blend():
    # Reference: brier_score of two_stage_blend (the model's own blend) at each grid point.
    rng = np.random.default_rng(4)
    y, bc, qc, lg = _cells(rng)
    bc[0, [3, 4, 5, 7, 8]] = 0  # a batter who never put the ball in play, unshrunk at prior 0
    weights = [0.0, 0.3, 1.0]
    surf = two_stage_surface(y, bc, qc, lg, batter_priors=[0, 100], pitcher_priors=[25], weights=weights)
    for row in surf.itertuples():
        b, q = shrink(bc, lg, row.batter_prior_pa), shrink(qc, lg, row.pitcher_prior_pa)
        p = two_stage_blend(b, q, first_weight=row.first_weight, in_play_weight=row.in_play_weight)
        assert_allclose(row.brier, brier_score(p, y), rtol=1e-11)


@pytest.mark.parametrize("true_weight", [0.15, 0.4, 0.6, 0.85])
def test_recovers_a_known_weight_from_known_distributions(true_weight):
    # Outcomes of 40,000 held-out PAs drawn from w * pitcher + (1 - w) * batter with the true
    # distributions given as inputs (prior 0 on exact rates): the fitted weight is within 0.03.
    rng = np.random.default_rng(int(true_weight * 100))
    batters, pitchers = _players(rng, 300, 25.0), _players(rng, 300, 25.0)
    ib, iq = rng.integers(0, 300, size=40_000), rng.integers(0, 300, size=40_000)
    outcome = _draw(rng, (1 - true_weight) * batters[ib] + true_weight * pitchers[iq])
    # collapse into unique (batter, pitcher) cells
    cell, inverse = np.unique(ib * 300 + iq, return_inverse=True)
    y = np.zeros((cell.size, 9))
    np.add.at(y, (inverse, outcome), 1)
    b, q = batters[cell // 300], pitchers[cell % 300]
    assert abs(float(best_weight_closed_form(b, q, y)) - true_weight) <= 0.03
    # the same through the surface: exact rates as "counts", prior 0
    surf = linear_weight_surface(y, b, q, np.broadcast_to(_LEAGUE, b.shape), batter_priors=[0], pitcher_priors=[0])
    assert abs(surf.loc[surf["brier"].idxmin(), "pitcher_weight"] - true_weight) <= 0.03


def test_bootstrap_spread_matches_repeated_samples():
    # The bootstrap's standard deviation of the fitted weight should match the spread of the
    # weight over independent repeated samples (bootstrap consistency, common practice; Efron & Tibshirani 1993,
    # ch. 6, from memory). We allow a factor of 1.6 either way for 200 replicates vs 30 repeats.
    rng = np.random.default_rng(7)
    batters, pitchers = _players(rng, 200, 25.0), _players(rng, 200, 25.0)
    w_true, n_games, per_game = 0.4, 400, 25

    def sample():
        ib, iq = rng.integers(0, 200, size=n_games * per_game), rng.integers(0, 200, size=n_games * per_game)
        out = _draw(rng, (1 - w_true) * batters[ib] + w_true * pitchers[iq])
        return ib, iq, out

    repeats = []
    for _ in range(30):
        ib, iq, out = sample()
        repeats.append(float(best_weight_closed_form(batters[ib], pitchers[iq], np.eye(9)[out])))
    ib, iq, out = sample()
    games = np.repeat(np.arange(n_games), per_game)
    boot = weight_bootstrap(
        np.eye(9)[out], batters[ib], pitchers[iq], np.broadcast_to(_LEAGUE, (ib.size, 9)), games,
        batter_priors=[0], pitcher_priors=[0], n_boot=200, seed=1,
    )
    ratio = boot.std() / np.std(repeats, ddof=1)
    assert 1 / 1.6 < ratio < 1.6
    assert abs(boot.mean() - w_true) < 4 * np.std(repeats, ddof=1)


def test_surface_rejects_bad_grids():
    y = np.eye(9)[[0]]
    lg = np.full((1, 9), 1 / 9)
    with pytest.raises(ValueError, match=r"weights must be a non-empty 1-D list of values \[0, 1\]; got bad value\(s\) \[1\.5\]"):
        linear_weight_surface(y, y, y, lg, weights=[0, 1.5])
    with pytest.raises(ValueError, match="batter_priors must be .* >= 0"):
        linear_weight_surface(y, y, y, lg, batter_priors=[-5])


@pytest.mark.parametrize(("truth", "n_fit", "best_prior"), [("linear", 50, 100.0), ("odds-ratio", 1000, 0.0)])
def test_best_priors_follow_the_true_rule(truth, n_fit, best_prior):
    # Talents drawn from Dirichlet(100 * league), each side's fitting counts from n_fit PAs.
    # Linear truth: the best prediction of each side is its posterior mean, which is shrink
    # with prior 100 (Dirichlet-multinomial conjugacy, closed form), so the surface picks
    # 100/100. Odds-ratio truth (each side's deviation from the league counts in full) with
    # well-measured sides: a linear blend's two weights sum to 1, so it already damps both
    # deviations and any shrinkage only damps them further; the surface picks 0/0 (as the
    # demo league, whose true rule is an odds ratio, does). Priors are not stuck at 0.
    rng = np.random.default_rng(0)
    n_cells = 30_000
    b, q = _players(rng, n_cells, 100.0), _players(rng, n_cells, 100.0)
    p = 0.5 * b + 0.5 * q if truth == "linear" else odds_ratio_blend(b, q, _LEAGUE)
    bc, qc = rng.multinomial(n_fit, b).astype(float), rng.multinomial(n_fit, q).astype(float)
    y = rng.multinomial(1, p).astype(float)
    priors = [0, 25, 100, 400]
    surf = linear_weight_surface(y, bc, qc, np.broadcast_to(_LEAGUE, y.shape), batter_priors=priors,
                                 pitcher_priors=priors)
    best = surf.loc[surf["brier"].idxmin()]
    assert (best["batter_prior_pa"], best["pitcher_prior_pa"]) == (best_prior, best_prior)
    assert abs(best["pitcher_weight"] - 0.5) <= 0.08
