"""The contact basis: outcome counts with batted balls replaced by modeled outcomes."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose, assert_array_equal

from matchup_widgets.contact import ContactModel, contact_outcome_counts
from matchup_widgets.data import BATTED, OUTCOMES, load_pas, outcome_counts


class _StepModel(ContactModel):
    """A stand-in model with a known answer: ground-ball out below 10 degrees, else air out."""

    def __init__(self):
        super().__init__(kind="grid")
        self._estimator = True

    def predict_proba(self, exit_velo, launch_angle):
        ev = np.asarray(exit_velo, float)
        la = np.asarray(launch_angle, float)
        out = np.zeros((len(la), 6))
        out[:, 4] = la < 10
        out[:, 5] = la >= 10
        out[~(np.isfinite(ev) & np.isfinite(la))] = np.nan
        return out


def _tiny() -> pd.DataFrame:
    rows = [
        # batter, hand, outcome, ev, la, season
        ("b1", "L", "1B", 90.0, 5.0, 2031),
        ("b1", "L", "2B", 100.0, 20.0, 2031),
        ("b1", "R", "HR", np.nan, np.nan, 2032),
        ("b1", "R", "K", np.nan, np.nan, 2032),
        ("b2", "R", "GB_OUT", 70.0, -10.0, 2031),
        ("b2", "R", "BB", np.nan, np.nan, 2031),
    ]
    df = pd.DataFrame(rows, columns=["batter_id", "batter_hand", "outcome", "exit_velo", "launch_angle", "season"])
    df["pitcher_id"] = "p1"
    df["pitcher_hand"] = "R"
    return df


def test_hand_computed_tiny_table():
    out = contact_outcome_counts(_tiny(), role="batter", model=_StepModel())
    assert list(out.columns) == ["player_id", "batter_hand", "pitcher_hand", *OUTCOMES, "pa"]
    b1_l = out[(out.player_id == "b1") & (out.batter_hand == "L")].iloc[0]
    b1_r = out[(out.player_id == "b1") & (out.batter_hand == "R")].iloc[0]
    # hand sums: modeled balls give GB_OUT 1 (5 deg) and AIR_OUT 1 (20 deg)
    assert_allclose(b1_l[list(BATTED)].to_numpy(float), [0, 0, 0, 0, 1, 1])
    # the unmeasured home run takes b1's observed batted mix: 1B, 2B, HR a third each
    assert_allclose(b1_r[list(BATTED)].to_numpy(float), [1 / 3, 1 / 3, 0, 1 / 3, 0, 0], rtol=1e-12)
    assert b1_r["K"] == 1 and b1_r["pa"] == 2
    assert out.attrs["contact_basis"] == {"n_batted": 4, "n_modeled": 3, "n_fallback": 1}


def test_by_season_fallback_uses_the_same_season():
    out = contact_outcome_counts(_tiny(), role="batter", by_season=True, model=_StepModel())
    row = out[(out.player_id == "b1") & (out.season == 2032)].iloc[0]
    # in 2032 b1's only batted ball is the unmeasured home run: its own mix is all HR
    assert_allclose(row[list(BATTED)].to_numpy(float), [0, 0, 0, 1, 0, 0])


@pytest.mark.parametrize("role", ["batter", "pitcher"])
@pytest.mark.parametrize("by_season", [False, True])
def test_same_shape_as_observed_counts(synth_pas, role, by_season):
    model = ContactModel(kind="grid").fit(synth_pas)
    got = contact_outcome_counts(synth_pas, role=role, by_season=by_season, model=model)
    ref = outcome_counts(synth_pas, role=role, by_season=by_season)
    assert list(got.columns) == list(ref.columns) and len(got) == len(ref)
    keys = [c for c in ref.columns if c not in OUTCOMES and c != "pa"]
    assert_array_equal(got[keys].astype(str).to_numpy(), ref[keys].astype(str).to_numpy())
    for code in ("K", "BB", "HBP", "pa"):
        assert_array_equal(got[code], ref[code])
    # each row keeps its number of batted balls; only their split over BATTED moves
    assert_allclose(got[list(BATTED)].sum(axis=1), ref[list(BATTED)].sum(axis=1), rtol=1e-9)
    n_missing = int((synth_pas.outcome.isin(BATTED) & synth_pas.exit_velo.isna()).sum())
    assert got.attrs["contact_basis"]["n_fallback"] == n_missing


def test_loaded_table_and_season_range(synth_pas):
    pas = load_pas(synth_pas.drop(columns=["season"]))
    got = contact_outcome_counts(pas, role="batter", seasons=(2031, 2031), model=ContactModel(kind="grid").fit(pas))
    ref = outcome_counts(pas, role="batter", seasons=(2031, 2031))
    assert len(got) == len(ref)
    assert_allclose(got[list(BATTED)].to_numpy(float).sum(), ref[list(BATTED)].to_numpy().sum(), rtol=1e-9)
