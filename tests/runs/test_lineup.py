from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.runs import lineup_runs, runs_distribution, runs_per_9, simulate_games


def _order(league: np.ndarray, seed: int) -> np.ndarray:
    """Nine different batters around a league distribution (seeded Dirichlet draws)."""
    return np.random.default_rng(seed).dirichlet(league * 400, size=9)


def test_identical_batters_give_the_single_batter_figure(league_rates):
    p = league_rates(2019)
    res = lineup_runs(np.tile(p, (9, 1)))
    assert_allclose(res.runs_per_9, runs_per_9(p), rtol=1e-12)
    assert_allclose(res.runs_distribution, runs_distribution(p), atol=1e-12)
    assert_allclose(res.leadoff.sum(axis=1), 1.0, atol=1e-12)


def test_closed_form_lineup():
    # Each batter homers with q = 1/4 or strikes out: an inning lasts 3 / (1 - q) = 4 PAs on
    # average and scores 3q / (1 - q) = 1 run (negative binomial means), so nine innings give
    # 36 PAs and 9 runs whatever the slot order.
    res = lineup_runs([{"HR": 0.25, "K": 0.75}] * 9)
    assert_allclose(res.runs_per_9, 9.0, rtol=1e-12)
    assert_allclose(res.pa_by_slot.sum(), 36.0, rtol=1e-12)
    assert (np.diff(res.pa_by_slot) <= 1e-12).all()  # top of the order bats most


def test_a_strong_hitter_helps_more_near_the_top(league_rates):
    league = league_rates(2019)
    strong = league.copy()
    strong[OUTCOMES.index("HR")] += 0.04
    strong[OUTCOMES.index("K")] -= 0.04
    top = np.tile(league, (9, 1))
    top[0] = strong
    bottom = np.tile(league, (9, 1))
    bottom[8] = strong
    assert lineup_runs(top).runs_per_9 > lineup_runs(bottom).runs_per_9


def test_exact_lineup_runs_agree_with_200k_simulated_innings(league_rates):
    order = _order(league_rates(2019), seed=21)
    exact = lineup_runs(order)
    games = simulate_games(order, n_games=22_223, seed=8)  # 200,007 innings
    totals = games.sum(axis=1)
    se = totals.std(ddof=1) / np.sqrt(totals.size)
    print(f"\nlineup runs per 9: exact {exact.runs_per_9:.4f}, simulated {totals.mean():.4f} +- {se:.4f}")
    assert abs(totals.mean() - exact.runs_per_9) < 3 * se
    by_inning_se = games.std(axis=0, ddof=1) / np.sqrt(games.shape[0])
    assert (np.abs(games.mean(axis=0) - exact.runs_by_inning) < 4 * by_inning_se).all()


@pytest.mark.parametrize("shape", [(8, 9), (9, 8), (9,)])
def test_lineup_needs_nine_distributions(shape):
    with pytest.raises(ValueError, match="order_probs"):
        lineup_runs(np.full(shape, 1 / shape[-1]))


def test_lineup_that_never_makes_an_out_and_bad_max_runs_are_refused():
    with pytest.raises(ValueError, match="never ends the inning"):
        lineup_runs([{"BB": 1.0}] * 9)
    with pytest.raises(ValueError, match="max_runs must be a whole number >= 1"):
        lineup_runs([{"HR": 0.25, "K": 0.75}] * 9, max_runs=-1)


def test_labelled_rows_are_read_by_their_codes(league_rates):
    # A Series or DataFrame in another column order must give the same figure as the
    # single-batter chain (reference: runs_per_9, which reads labels).
    import pandas as pd

    p = pd.Series(league_rates(2019), index=list(OUTCOMES))
    shuffled = p[::-1]
    ref = runs_per_9(p)
    assert_allclose(lineup_runs([shuffled] * 9).runs_per_9, ref, rtol=1e-12)
    assert_allclose(lineup_runs(pd.DataFrame([shuffled] * 9)).runs_per_9, ref, rtol=1e-12)
    assert_allclose(simulate_games([shuffled] * 9, n_games=10, seed=1).shape, (10, 9))
