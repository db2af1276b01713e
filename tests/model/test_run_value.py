"""Run value of a matchup with its interval (model/_run_value.py)."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import MatchupModel
from matchup_widgets.model._run_value import estimate_draws, run_value_interval
from matchup_widgets.model._summary import run_weights
from matchup_widgets.runs import run_expectancy


@pytest.fixture(scope="module")
def model(tilted_league) -> MatchupModel:
    frame = tilted_league(seed=3, n_pa=6000, n_batters=8, n_pitchers=4, batter_sd=0.25, pa_per_game=60)
    return MatchupModel(n_draws=4000).fit(load_pas(frame))


def test_draws_are_the_ones_behind_the_estimates_intervals(model):
    est = model.predict("b1", "p0")
    draws = estimate_draws(est)
    lo, hi = np.quantile(draws, [0.1, 0.9], axis=0)  # the default 80% interval
    p = est.probabilities.to_numpy()
    assert_allclose(np.minimum(lo, p), est.intervals["lo"].to_numpy(), rtol=1e-12)
    assert_allclose(np.maximum(hi, p), est.intervals["hi"].to_numpy(), rtol=1e-12)


def test_runs_per_pa_matches_summary_and_contains_it(model):
    est = model.with_settings(method="odds-ratio").predict("b2", "p3")
    out = run_value_interval(est)
    assert out["measure"] == "runs_per_pa"
    assert out["value"] == pytest.approx(est.runs_per_pa, abs=1e-12)
    assert out["lo"] <= out["value"] <= out["hi"]


def test_batter_only_draws_follow_dirichlet_moments(model):
    # pitcher weight 0, prior 0: the draws are Dirichlet(counts + 0.5) (the interval floor).
    # Mean and variance of a linear function w.X of a Dirichlet(alpha), alpha0 = sum alpha,
    # m = alpha / alpha0: E = w.m, Var = (sum w^2 m - (w.m)^2) / (alpha0 + 1)
    # (standard Dirichlet moments; from memory).
    est = model.with_settings(pitcher_weight=0.0, batter_prior_pa=0.0, n_draws=40_000).predict("b4", "p1")
    alpha = est.counts.loc["batter", list(OUTCOMES)].to_numpy(dtype=float) + 0.5
    a0 = alpha.sum()
    m = alpha / a0
    w = run_weights(est.distributions.loc["league", list(OUTCOMES)].to_numpy(dtype=float))["linear"]
    mean_ref = w @ m
    var_ref = (w**2 @ m - mean_ref**2) / (a0 + 1)
    draws = run_value_interval(est)["draws"]
    assert draws.mean() == pytest.approx(mean_ref, abs=4 * np.sqrt(var_ref / draws.size))
    assert draws.var() == pytest.approx(var_ref, rel=0.03)


def test_expected_runs_from_a_state(model):
    est = model.predict("b0", "p2")
    out = run_value_interval(est, outs=1, bases=3, n_draws=200)
    p = est.probabilities.to_numpy()
    assert out["value"] == pytest.approx(run_expectancy(p / p.sum())[1, 3], rel=1e-12)
    assert out["measure"] == "expected_runs" and out["draws"].shape == (200,)
    assert out["lo"] <= out["value"] <= out["hi"]
    # with enormous priors both sides are the league: the interval closes on the league's figure
    tight = run_value_interval(model.with_settings(batter_prior_pa=1e9, pitcher_prior_pa=1e9).predict("b0", "p2"),
                               outs=0, bases=0, n_draws=50)
    league = est.distributions.loc["league", list(OUTCOMES)].to_numpy(dtype=float)
    assert tight["hi"] - tight["lo"] < 1e-3
    assert tight["value"] == pytest.approx(run_expectancy(league / league.sum())[0, 0], abs=1e-4)


def test_state_needs_both_outs_and_bases(model):
    with pytest.raises(ValueError, match="give both outs and bases"):
        run_value_interval(model.predict("b0", "p2"), outs=1)
