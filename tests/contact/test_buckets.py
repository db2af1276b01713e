"""Buckets, batted-ball types and the hard-hit flag."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose, assert_array_equal

from matchup_widgets.contact import (
    BATTED_BALL_TYPE_CUTS,
    HARD_HIT_MPH,
    band_labels,
    batted_ball_profile,
    batted_ball_type,
    bucket_index,
    bucket_labels,
    bucket_shares,
    is_hard_hit,
)
from matchup_widgets.data import BATTED, DataError


def test_type_cut_points_are_the_usual_ones():
    # common practice: ground ball < 10 deg, line drive 10-25, fly ball 25-50, pop up > 50
    assert BATTED_BALL_TYPE_CUTS == (10.0, 25.0, 50.0)
    got = list(batted_ball_type([-30.0, 9.99, 10.0, 24.99, 25.0, 50.0, 50.01, 89.0]))
    assert got == ["ground ball", "ground ball", "line drive", "line drive", "fly ball", "fly ball", "pop up", "pop up"]


def test_type_of_missing_angle_is_missing():
    got = batted_ball_type([np.nan, 15.0])
    assert pd.isna(got[0]) and got[1] == "line drive"


def test_hard_hit_threshold():
    # common practice: hard-hit is an exit velocity of 95 mph or more
    assert HARD_HIT_MPH == 95.0
    assert_array_equal(is_hard_hit([94.99, 95.0, 120.0, np.nan]), [False, True, True, False])


def test_band_labels_and_bad_edges():
    assert band_labels([0, 10.5]) == ["<0", "0-10.5", "10.5+"]
    with pytest.raises(ValueError, match="strictly increasing"):
        band_labels([10, 5])


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_bucket_index_matches_numpy_digitize(seed):
    # reference: numpy.digitize with right=False gives the same left-closed bands
    rng = np.random.default_rng(seed)
    ev, la = rng.normal(90, 15, 500), rng.normal(10, 30, 500)
    ev_edges, la_edges = [80, 90, 95, 100, 105], [0, 10, 25, 35, 50]
    expected = np.digitize(ev, ev_edges) * 6 + np.digitize(la, la_edges)
    assert_array_equal(bucket_index(ev, la, ev_edges=ev_edges, la_edges=la_edges), expected)


def test_bucket_shares_match_histogram2d(synth_pas):
    # reference: numpy.histogram2d over the same (outer-closed) edges, per player and split
    ev_edges, la_edges = [85.0, 95.0], [10.0, 25.0]
    out = bucket_shares(synth_pas, role="batter", ev_edges=ev_edges, la_edges=la_edges)
    row = synth_pas.iloc[0]
    one = out[(out.player_id == row.batter_id) & (out.batter_hand == row.batter_hand)
              & (out.pitcher_hand == row.pitcher_hand)]
    sub = synth_pas[(synth_pas.batter_id == row.batter_id) & (synth_pas.batter_hand == row.batter_hand)
                    & (synth_pas.pitcher_hand == row.pitcher_hand) & synth_pas.outcome.isin(BATTED)
                    & synth_pas.exit_velo.notna()]
    hist, _, _ = np.histogram2d(sub.exit_velo, sub.launch_angle,
                                bins=[[-1e9, *ev_edges, 1e9], [-1e9, *la_edges, 1e9]])
    assert_array_equal(one["n"].to_numpy(), hist.ravel().astype(int))
    assert_allclose(one["share"].sum(), 1.0, rtol=1e-12)
    assert one["bucket"].tolist() == bucket_labels(ev_edges=ev_edges, la_edges=la_edges)["bucket"].tolist()
    assert set(out.columns) >= {"player_id", "batter_hand", "pitcher_hand", "exit_velo_bin", "launch_angle_bin", "n", "share"}


def test_profile_counts_by_hand(synth_pas):
    prof = batted_ball_profile(synth_pas, role="pitcher")
    batted = synth_pas[synth_pas.outcome.isin(BATTED)]
    assert prof["n_batted"].sum() == len(batted)
    assert prof["n_unmeasured"].sum() == int(batted.exit_velo.isna().sum())
    types = ["n_ground_ball", "n_line_drive", "n_fly_ball", "n_pop_up"]
    assert_array_equal(prof[types].sum(axis=1), prof["n_measured"])
    hard = (batted.exit_velo >= 95).sum()
    assert prof["n_hard_hit"].sum() == hard


def test_season_filter_is_an_inclusive_pair(synth_pas):
    first = bucket_shares(synth_pas, role="batter", seasons=(2031, 2031))["n"].sum()
    both = bucket_shares(synth_pas, role="batter", seasons=(2031, 2032))["n"].sum()
    measured = synth_pas.outcome.isin(BATTED) & synth_pas.exit_velo.notna()
    assert first == int((measured & (synth_pas.season == 2031)).sum())
    assert both == int(measured.sum())
    with pytest.raises(ValueError, match=r"\(first, last\) pair"):
        bucket_shares(synth_pas, role="batter", seasons=2031)


def test_missing_column_and_bad_role():
    df = pd.DataFrame({"batter_id": ["b"], "pitcher_id": ["p"], "batter_hand": ["L"],
                       "pitcher_hand": ["R"], "outcome": ["1B"]})
    with pytest.raises(DataError, match=r"needs column\(s\) \['exit_velo', 'launch_angle'\]"):
        bucket_shares(df, role="batter")
    with pytest.raises(ValueError, match="role must be 'batter' or 'pitcher'"):
        bucket_shares(df, role="catcher")
    with pytest.raises(TypeError, match="load_pas"):
        bucket_shares([1, 2], role="batter")
