"""The contact model behind MatchupModel's contact basis: one setting, counts kept per model.

Smoke data: a seeded invented league (never a check value). Each check compares the
estimator's contact-basis counts with the contact layer's own ``contact_outcome_counts``
for the same fitted model (that function is checked against hand sums in tests/contact).
"""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
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


def _league(seed: int = 5, n_pa: int = 12_000) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    codes = np.asarray(OUTCOMES)
    probs = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.22, 0.23])
    outcome = codes[rng.choice(9, n_pa, p=probs / probs.sum())]
    batted = np.isin(outcome, ["1B", "2B", "3B", "HR", "GB_OUT", "AIR_OUT"])
    b, p = rng.integers(0, 20, n_pa), rng.integers(0, 12, n_pa)
    game = np.arange(n_pa) // 60
    return pd.DataFrame({
        "game_id": [f"g{g:04d}" for g in game],
        "game_date": pd.Timestamp("2031-04-01") + pd.to_timedelta(game // 3, unit="D"),
        "batter_id": [f"b{i:02d}" for i in b], "pitcher_id": [f"p{i:02d}" for i in p],
        "batter_name": [f"Batter Number{i}" for i in b], "pitcher_name": [f"Pitcher Number{i}" for i in p],
        "batter_hand": np.where(b % 3 == 0, "L", "R"), "pitcher_hand": np.where(p % 2 == 0, "L", "R"),
        "outcome": outcome,
        "exit_velo": np.where(batted, rng.normal(88, 13, n_pa), np.nan),
        "launch_angle": np.where(batted, rng.normal(12, 26, n_pa), np.nan),
    })


@pytest.fixture(scope="module")
def pas():
    return load_pas(_league())


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


def test_calibrating_on_the_contact_basis_leaves_the_dataset_cache_alone():
    # calibrate refits the contact model on the fitting games only (honest); that model must
    # not become the dataset's own, which dashboards use for the same loaded data
    from matchup_widgets.contact import _cache

    clear_contact_cache()
    frame = _league(seed=8, n_pa=6_000)
    pas = load_pas(frame)
    result = calibrate(pas, basis="contact", priors=(0, 100), n_boot=5, progress=False)
    assert np.isfinite(result.brier)
    assert pas not in _cache._by_object  # nothing was stored under the loaded dataset
    own = contact_model_for(pas, kind="grid")
    loaded = pas.frame  # loading may blank implausible measurements
    measured = int((loaded["exit_velo"].notna() & loaded["launch_angle"].notna()).sum())
    assert own.n_fit_ + own.n_holdout_ == measured  # fitted on every ball, not the fitting games
