"""Contact tiers: run weights, cut points at league quantiles, tier tables."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose, assert_array_equal

from matchup_widgets.contact import (
    PUBLISHED_RUN_WEIGHTS,
    TIER_LABELS,
    ContactModel,
    assign_tiers,
    batted_run_weights,
    build_tiers,
    contact_tiers,
    expected_run_value,
    tier_cut_points,
    tier_shares,
)
from matchup_widgets.data import BATTED, OUTCOMES


def test_labels_are_five_plain_words_weakest_first():
    assert list(TIER_LABELS) == [1, 2, 3, 4, 5]
    assert len(set(TIER_LABELS.values())) == 5


@pytest.mark.parametrize("seed", [0, 1])
def test_cut_points_are_numpy_quantiles(seed):
    # reference: numpy.quantile (linear interpolation) of the finite values
    v = np.random.default_rng(seed).normal(size=1001)
    v[::50] = np.nan
    assert_allclose(tier_cut_points(v), np.quantile(v[np.isfinite(v)], [0.2, 0.4, 0.6, 0.8]), rtol=1e-12)
    with pytest.raises(ValueError, match="strictly increasing numbers inside"):
        tier_cut_points(v, quantiles=[0.5, 0.2])


def test_assign_tiers_matches_digitize():
    # reference: numpy.digitize (right=False): a value on a cut point goes up a tier
    v = np.linspace(-1, 1, 41)
    cuts = [-0.5, 0.0, 0.25, 0.5]
    assert_array_equal(assign_tiers(v, cuts), np.digitize(v, cuts) + 1)
    assert assign_tiers([np.nan], cuts).tolist() == [0]


def test_published_fallback_weights():
    # "The Hidden Game of Baseball" (1984) linear weights, from memory
    w, source = batted_run_weights()
    assert source == "published fallback"
    assert w.to_dict() == {"1B": 0.46, "2B": 0.80, "3B": 1.02, "HR": 1.40, "GB_OUT": -0.25, "AIR_OUT": -0.25}


def test_runs_layer_weights_when_league_is_given():
    league = pd.Series([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.24, 0.22], index=list(OUTCOMES))
    w, source = batted_run_weights(league)
    assert source == "runs layer linear weights"
    assert list(w.index) == list(BATTED)
    # common practice: HR > 3B > 2B > 1B > 0 > batted out in run value
    assert w["HR"] > w["3B"] > w["2B"] > w["1B"] > 0 > w["GB_OUT"]


def test_expected_run_value_is_the_dot_product():
    p = np.array([[0.2, 0.1, 0.0, 0.05, 0.4, 0.25]])
    w = pd.Series(PUBLISHED_RUN_WEIGHTS)
    expected = 0.2 * 0.46 + 0.1 * 0.80 + 0.05 * 1.40 - 0.65 * 0.25  # hand sum
    assert_allclose(expected_run_value(p, w), [expected], rtol=1e-12)


def test_build_tiers_table():
    rng = np.random.default_rng(5)
    p = rng.dirichlet(np.ones(6), size=5000)
    tiers = build_tiers(p, weights=pd.Series(PUBLISHED_RUN_WEIGHTS))
    t = tiers.table
    assert t["n"].sum() == 5000 and (t["n"] == 1000).all()
    assert (np.diff(t["mean_run_value"]) > 0).all()
    assert_allclose(tiers.outcome_given_tier.sum(axis=1), 1.0, rtol=1e-12)
    # each tier's mean modeled probabilities are the plain mean over its balls
    xrv = expected_run_value(p, tiers.weights)
    top = assign_tiers(xrv, tiers.cut_points) == 5
    assert_allclose(t.loc[5, list(BATTED)].to_numpy(float), p[top].mean(axis=0), rtol=1e-12)


def test_dataset_tiers_and_shares(synth_pas):
    model = ContactModel(kind="grid").fit(synth_pas)
    tiers = contact_tiers(synth_pas, model=model)
    assert tiers.weights_source == "runs layer linear weights"
    assert_allclose(tiers.table["share"], 0.2, atol=0.01)
    shares = tier_shares(synth_pas, role="batter", model=model)
    counts = shares[[f"n_tier_{t}" for t in range(1, 6)]].to_numpy()
    assert_array_equal(counts.sum(axis=1), shares["n_measured"])
    assert_allclose(counts.sum(axis=0) / counts.sum(), tiers.table["share"], rtol=1e-12)
    assert contact_tiers(synth_pas, model=model) is tiers  # kept per dataset
