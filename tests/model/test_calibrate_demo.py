"""The demo league against the oracle that knows each PA's true outcome probabilities.

Demo data is invented: nothing here is a check value. The test prints the held-out Brier of
league-only, of the fitted blend and of the oracle, and checks the ordering the issue asks
for (the fitted blend beats every baseline; nothing beats the oracle by more than noise).
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.data import load_pas
from matchup_widgets.data.demo import demo_path, true_probabilities
from matchup_widgets.model import brier_score, calibrate, split_games


@pytest.fixture(scope="module")
def demo():
    path = demo_path()
    pas = load_pas(path)
    result = calibrate(pas, n_boot=100, progress=False)
    frame = pas.frame
    held = frame.loc[split_games(frame["game_id"].to_numpy(), holdout_share=0.25, seed=0)]
    players = pd.read_parquet(path.parent / "players.parquet")
    oracle = brier_score(true_probabilities(held, players), held["outcome"].to_numpy())
    return result, oracle, len(held)


def test_demo_fit_beats_every_baseline_and_approaches_the_oracle(demo):
    result, oracle, n_held = demo
    league = result.brier_baselines["league"]
    share = (league - result.brier) / (league - oracle)
    print(
        f"\ndemo league, {n_held:,} held-out PAs: Brier league-only {league:.5f}, fitted blend "
        f"{result.brier:.5f} (w={result.pitcher_weight:.3f}, priors {result.batter_prior_pa:g}/"
        f"{result.pitcher_prior_pa:g}), oracle {oracle:.5f}; share of the league-to-oracle "
        f"improvement captured {share:.1%}"
    )
    # The demo's true rule is an odds ratio: the linear blend damps both sides' deviations
    # (its weights sum to 1), so its best priors sit at 0/0 while the odds-ratio blend, which
    # matches the rule, takes positive priors (see test_best_priors_follow_the_true_rule).
    for row in result.methods.itertuples():
        print(f"  {row.method:<10} Brier {row.brier:.5f}  priors {row.batter_prior_pa:g}/{row.pitcher_prior_pa:g}  {row.settings}")
    assert result.n_holdout_pa == n_held
    for name, value in result.brier_baselines.items():
        assert result.brier < value, name
    assert oracle < result.brier
    assert 0 < share < 1


def test_demo_fit_reports_interval_methods_and_reliability(demo):
    result, _, _ = demo
    lo, hi = result.weight_interval
    assert 0 <= lo <= result.pitcher_weight <= hi <= 1
    assert set(result.methods["method"]) == {"linear", "odds-ratio", "two-stage"}
    rel = result.reliability
    assert set(rel["outcome"]) >= {"K", "BB", "HR", "GB_OUT", "AIR_OUT"}
    assert np.allclose(rel.groupby("outcome")["n_pa"].sum(), result.n_holdout_pa)


def test_contact_basis_fits_on_contact_expected_counts():
    # Wiring check on a small invented league: the contact basis replaces balls in play by
    # their modelled outcome probabilities, so its scores differ from the observed basis.
    from matchup_widgets.data.demo import make_demo_league

    league = make_demo_league(seed=3, n_seasons=1, n_teams=4, n_games=30)
    pas = load_pas(league.pas)
    kw = {"priors": (0, 100), "n_boot": 10, "progress": False}
    observed, contact = calibrate(pas, **kw), calibrate(pas, basis="contact", **kw)
    assert contact.basis == "contact" and observed.basis == "observed"
    assert (contact.n_fit_pa, contact.n_holdout_pa) == (observed.n_fit_pa, observed.n_holdout_pa)
    assert np.isfinite(contact.brier) and contact.brier != observed.brier
    assert contact.brier_baselines["league"] == pytest.approx(observed.brier_baselines["league"], rel=1e-12)


def test_contact_basis_scores_the_estimators_own_predictions(cells_match_model):
    # What calibrate scores on the contact basis must be what MatchupModel(basis="contact")
    # predicts from the same fitting games: the same per-season contact counts and the same
    # shrink target (the league of the split on the contact basis), for every method.
    from matchup_widgets.data.demo import make_demo_league

    league = make_demo_league(seed=3, n_seasons=2, n_teams=4, n_games=30)
    pas = load_pas(league.pas)
    result = calibrate(pas, basis="contact", priors=(0, 100), n_boot=10, progress=False)
    cells_match_model(pas, result, basis="contact", n_cells=6, atol=1e-12)
