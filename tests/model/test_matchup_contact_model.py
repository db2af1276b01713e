"""The contact model behind MatchupModel's contact basis: one setting, counts kept per model.

Smoke data: a seeded invented league (never a check value). Each check compares the
estimator's contact-basis counts with the contact layer's own ``contact_outcome_counts``
for the same fitted model (that function is checked against hand sums in tests/contact).
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.contact import (
    ContactModel,
    clear_contact_cache,
    contact_model_for,
    contact_outcome_counts,
)
from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import MatchupModel, calibrate


@pytest.fixture(scope="module")
def pas(contact_league):
    return load_pas(contact_league(seed=5, n_pa=12_000, n_batters=20, n_pitchers=12))


@pytest.fixture(scope="module")
def fitted(pas):
    return MatchupModel(basis="contact", contact_model="grid").fit(pas)


def _contact_row(pas, model, role, pid, hands):
    t = contact_outcome_counts(pas, role=role, model=model)
    row = t[(t["player_id"].astype(str) == pid) & (t["batter_hand"] == hands[0]) & (t["pitcher_hand"] == hands[1])]
    return row[list(OUTCOMES)].to_numpy(float).sum(axis=0)


def test_the_given_model_drives_the_contact_counts(pas, fitted):
    grid = contact_model_for(pas, kind="grid")
    other = ContactModel(kind="grid", random_state=3).fit(pas)  # another fitted object
    by_kind = fitted.predict("b01", "p01")
    by_object = fitted.with_settings(contact_model=grid).predict("b01", "p01")
    hands = (by_kind.batter_hand, by_kind.pitcher_hand)
    assert_allclose(by_kind.counts.loc["batter", list(OUTCOMES)].to_numpy(float),
                    _contact_row(pas, grid, "batter", "b01", hands), rtol=1e-12)
    assert_allclose(by_object.probabilities.to_numpy(), by_kind.probabilities.to_numpy(), rtol=1e-12)
    mine = fitted.with_settings(contact_model=other).predict("b01", "p01")
    assert_allclose(mine.counts.loc["pitcher", list(OUTCOMES)].to_numpy(float),
                    _contact_row(pas, other, "pitcher", "p01", hands), rtol=1e-12)
    # counts are kept per contact model, in the cache that copies share
    keys = [k for k in fitted.cache_ if k[0] == "contact"]
    assert any(k[1] is other for k in keys) and any(k[1] == "grid" for k in keys)


def test_setting_round_trips_and_estimates_stay_json(fitted):
    assert fitted.get_params()["contact_model"] == "grid"
    assert fitted.with_settings(pitcher_weight=0.3).contact_model == "grid"
    model = contact_model_for(fitted.pas_, kind="grid")
    est = fitted.with_settings(contact_model=model).predict("b02", "p03")
    assert est.settings["contact_model"] == "grid"  # a fitted model is named by its kind
    json.dumps(est.to_dict())
    assert MatchupModel().get_params()["contact_model"] is None


@pytest.mark.parametrize("bad", ["gradient", 3, ContactModel(kind="grid")])
def test_bad_contact_model_says_what_to_give(bad):
    with pytest.raises(ValueError, match="contact_model must be None .* or a fitted"):
        MatchupModel(contact_model=bad).with_settings(method="linear")


def test_calibrating_on_the_contact_basis_leaves_the_dataset_cache_alone(contact_league):
    # calibrate refits the contact model on the fitting games only (honest); that model must
    # not become the dataset's own, which dashboards use for the same loaded data
    from matchup_widgets.contact import _cache

    clear_contact_cache()
    frame = contact_league(seed=8, n_pa=6_000, n_batters=20, n_pitchers=12)
    pas = load_pas(frame)
    result = calibrate(pas, basis="contact", priors=(0, 100), n_boot=5, progress=False)
    assert np.isfinite(result.brier)
    assert pas not in _cache._by_object  # nothing was stored under the loaded dataset
    own = contact_model_for(pas, kind="grid")
    loaded = pas.frame  # loading may blank implausible measurements
    measured = int((loaded["exit_velo"].notna() & loaded["launch_angle"].notna()).sum())
    assert own.n_fit_ + own.n_holdout_ == measured  # fitted on every ball, not the fitting games
