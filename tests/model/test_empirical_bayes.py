"""Empirical-Bayes prior sizes: a hand-computed case, recovery of known prior sizes, strata."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose
from scipy import stats

from matchup_widgets.data import OUTCOMES, DataError
from matchup_widgets.model import empirical_bayes_prior

K = OUTCOMES.index("K")
GB = OUTCOMES.index("GB_OUT")


def _two_column(k: np.ndarray, n: np.ndarray) -> np.ndarray:
    counts = np.zeros((len(k), len(OUTCOMES)))
    counts[:, K] = k
    counts[:, GB] = n - k
    return counts


def test_hand_computed_method_of_moments():
    # Hand computation of the beta-binomial moment estimator (closed form): two players with
    # 100 PA, 20 and 40 strikeouts. mu = 0.3, mu(1 - mu) = 0.21,
    # S = sum n (x/n - mu)^2 = 100 * 0.01 * 2 = 2, J - 1 = 1,
    # D = sum (n - 1) - sum n (n - 1) / N = 198 - 99 = 99,
    # rho = (S / 0.21 - 1) / 99 = 0.0860990..., prior = (1 - rho) / rho = 10.6145...
    got = empirical_bayes_prior(_two_column(np.array([20, 40]), np.array([100, 100])))
    rho = (2 / 0.21 - 1) / 99
    assert_allclose(got.loc["K", "rho"], rho, rtol=1e-12)
    assert_allclose(got.loc["K", "prior_pa"], (1 - rho) / rho, rtol=1e-12)
    assert got.loc["K", "mean"] == pytest.approx(0.3)


@pytest.mark.parametrize("prior_pa", [40.0, 150.0, 600.0])
def test_recovers_a_known_beta_binomial_prior(prior_pa):
    # Reference generator: scipy.stats.betabinom with a + b = prior_pa (the prior size).
    rng = np.random.default_rng(17)
    n = rng.integers(150, 700, size=3000)
    mu = 0.22
    k = stats.betabinom.rvs(n, mu * prior_pa, (1 - mu) * prior_pa, random_state=rng)
    got = empirical_bayes_prior(_two_column(k, n)).loc["K", "prior_pa"]
    assert got == pytest.approx(prior_pa, rel=0.2)


def test_recovers_a_known_dirichlet_multinomial_prior():
    # Dirichlet-multinomial with concentration 200 * league: every outcome and the pooled
    # "all" row should find a prior size near 200.
    rng = np.random.default_rng(5)
    league = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.24, 0.22])
    talent = rng.dirichlet(200 * league, size=4000)
    n = rng.integers(200, 700, size=4000)
    counts = rng.multinomial(n, talent)
    got = empirical_bayes_prior(counts, min_pa=1)
    assert got.loc["all", "prior_pa"] == pytest.approx(200, rel=0.1)
    for code in ("K", "BB", "1B", "GB_OUT", "AIR_OUT"):
        assert got.loc[code, "prior_pa"] == pytest.approx(200, rel=0.25), code


def test_outcomes_stabilise_at_different_sample_sizes():
    # Strikeout talent spread wide (small prior), hit-on-ball-in-play talent narrow (large).
    rng = np.random.default_rng(8)
    n = rng.integers(300, 700, size=3000)
    k = stats.betabinom.rvs(n, 0.22 * 60, 0.78 * 60, random_state=rng)
    hits = stats.betabinom.rvs(n - k, 0.30 * 900, 0.70 * 900, random_state=rng)
    counts = np.zeros((3000, 9))
    counts[:, K], counts[:, OUTCOMES.index("1B")], counts[:, GB] = k, hits, n - k - hits
    got = empirical_bayes_prior(counts)["prior_pa"]
    # hits per PA also move with the strikeout rate, so their prior is smaller than 900
    assert got["K"] < 100 < 300 < got["1B"]


def test_platoon_splits_are_strata():
    # Every player has the same talent within a split, but the splits differ: pooled
    # across splits the spread looks like talent; as strata it does not.
    rng = np.random.default_rng(9)
    rows = []
    for bh, ph, rate in (("L", "L", 0.30), ("L", "R", 0.18), ("R", "L", 0.17), ("R", "R", 0.26)):
        n = rng.integers(200, 600, size=300)
        k = rng.binomial(n, rate)
        frame = pd.DataFrame(_two_column(k, n), columns=list(OUTCOMES))
        frame.insert(0, "player_id", [f"{bh}{ph}{i}" for i in range(300)])  # one side each
        frame.insert(1, "batter_hand", bh)
        frame.insert(2, "pitcher_hand", ph)
        rows.append(frame)
    table = pd.concat(rows, ignore_index=True)
    stratified = empirical_bayes_prior(table, role="batter").loc["K", "prior_pa"]
    pooled = empirical_bayes_prior(table, role="batter", by_split=False).loc["K", "prior_pa"]
    assert stratified > 2000 or np.isinf(stratified)
    assert pooled < 200


def test_spread_beyond_the_model_suggests_no_pooling_not_a_negative_prior():
    # Hand computation (closed form above): 0 and 100 strikeouts in 100 PA each. mu = 0.5,
    # S / (mu (1 - mu)) = 100 * 0.25 * 2 / 0.25 = 200, J - 1 = 1, D = 99, rho = 199 / 99 > 1;
    # (1 - rho) / rho would be -0.5025 PA, which is not a prior size: the answer is 0.
    got = empirical_bayes_prior(_two_column(np.array([0, 100]), np.array([100, 100])))
    assert_allclose(got.loc["K", "rho"], 199 / 99, rtol=1e-12)
    assert got.loc["K", "prior_pa"] == 0.0


def test_too_few_players_is_a_data_error():
    with pytest.raises(DataError, match=r"at least two batters with >= 10 plate appearances"):
        empirical_bayes_prior(_two_column(np.array([2, 3]), np.array([5, 50])))
