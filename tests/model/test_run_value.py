"""Run value of a matchup with its interval (model/_run_value.py)."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import MatchupModel
from matchup_widgets.model._run_value import estimate_draws, run_value_interval
from matchup_widgets.model._summary import run_weights
from matchup_widgets.runs import run_expectancy

_BASE = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.22, 0.23])


def _league(seed: int = 3, n_pa: int = 6000) -> pd.DataFrame:
    """A small invented league: 8 batters, 4 pitchers, outcome shares tilted per player."""
    rng = np.random.default_rng(seed)
    b = rng.integers(0, 8, n_pa)
    p = rng.integers(0, 4, n_pa)
    tilt = np.exp(rng.normal(0, 0.25, (8, 9)))[b] * np.exp(rng.normal(0, 0.25, (4, 9)))[p]
    probs = _BASE * tilt
    probs /= probs.sum(axis=1, keepdims=True)
    u = rng.random(n_pa)[:, None]
    outcome = np.minimum((u > probs.cumsum(axis=1)).sum(axis=1), 8)
    game = np.arange(n_pa) // 60
    return pd.DataFrame(
        {
            "game_id": [f"g{g:04d}" for g in game],
            "game_date": pd.Timestamp("2031-04-01") + pd.to_timedelta(game // 4, unit="D"),
            "batter_id": [f"b{i}" for i in b],
            "pitcher_id": [f"p{i}" for i in p],
            "batter_name": [f"Batter Number{i}" for i in b],
            "pitcher_name": [f"Pitcher Number{i}" for i in p],
            "batter_hand": np.where(b % 3 == 0, "L", "R"),
            "pitcher_hand": np.where(p % 2 == 0, "R", "L"),
            "outcome": np.asarray(OUTCOMES)[outcome],
        }
    )


@pytest.fixture(scope="module")
def model() -> MatchupModel:
    return MatchupModel(n_draws=4000).fit(load_pas(_league()))


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
