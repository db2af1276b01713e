"""Per-dataset reuse of the player tables behind the matchup contact mix.

Switching players in a dashboard must only select rows: every player's tier or bucket
counts are computed once per dataset, role, seasons and contact model. The reference for
each number is the uncached computation it replaces (group sums over ``tier_shares`` /
``bucket_shares``, tested against hand counts in test_tiers.py and test_buckets.py).
"""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.contact import (
    ContactModel,
    bucket_shares,
    clear_contact_cache,
    contact_cache_info,
    matchup_contact,
    tier_shares,
)
from matchup_widgets.data import load_pas

_BLEND = {"pitcher_weight": 0.4, "batter_prior_pa": 30.0, "pitcher_prior_pa": 20.0}


@pytest.fixture(scope="module")
def loaded(synth_pas):
    return load_pas(synth_pas)


@pytest.fixture(scope="module")
def grid(synth_pas):
    return ContactModel(kind="grid").fit(synth_pas)


def _pairs(frame, n):
    rows = frame[(frame["batter_hand"] == "R") & (frame["pitcher_hand"] == "R")]
    pairs = rows[["batter_id", "pitcher_id"]].drop_duplicates().head(n)
    return list(pairs.itertuples(index=False, name=None))


def _hand_sides(pas, model, batter, pitcher, seasons):
    """Batter, pitcher and league tier counts in the R/R split straight from tier_shares."""
    cols = [f"n_tier_{t}" for t in range(1, 6)]
    out = {}
    for role, pid in (("batter", batter), ("pitcher", pitcher)):
        t = tier_shares(pas, role=role, model=model, seasons=seasons)
        split = t[(t["batter_hand"] == "R") & (t["pitcher_hand"] == "R")]
        out[role] = split.loc[split["player_id"].astype(str) == pid, cols].to_numpy(float).sum(axis=0)
        if role == "batter":
            out["league"] = split[cols].to_numpy(float).sum(axis=0)
    return out


def test_switching_players_reuses_the_side_tables(loaded, grid):
    clear_contact_cache()
    pairs = _pairs(loaded.frame, 4)
    for i, (batter, pitcher) in enumerate(pairs):
        sides, _ = matchup_contact(loaded, batter_id=batter, pitcher_id=pitcher, batter_hand="R",
                                   pitcher_hand="R", model=grid, **_BLEND)
        info = contact_cache_info()
        assert info["misses"]["side_counts"] == 2  # batter and pitcher tables, built once
        assert info["hits"].get("side_counts", 0) == 2 * i
        want = _hand_sides(loaded, grid, batter, pitcher, None)
        for side in ("batter", "pitcher", "league"):
            got = sides.loc[sides["side"] == side, "n"].to_numpy(float)
            assert_allclose(got, want[side], rtol=0, atol=0)


def test_seasons_and_models_get_their_own_tables(loaded, grid):
    clear_contact_cache()
    (batter, pitcher), = _pairs(loaded.frame, 1)
    kw = {"batter_id": batter, "pitcher_id": pitcher, "batter_hand": "R", "pitcher_hand": "R", **_BLEND}
    matchup_contact(loaded, model=grid, **kw)
    first, _ = matchup_contact(loaded, model=grid, seasons=(2031, 2031), **kw)
    other = ContactModel(kind="grid", random_state=1).fit(loaded.frame)
    matchup_contact(loaded, model=other, **kw)
    assert contact_cache_info()["misses"]["side_counts"] == 6  # 3 settings x 2 roles
    want = _hand_sides(loaded, grid, batter, pitcher, (2031, 2031))
    assert_allclose(first.loc[first["side"] == "batter", "n"].to_numpy(float), want["batter"])


def test_bucket_kind_is_reused_and_matches_bucket_shares(loaded, grid):
    clear_contact_cache()
    pairs = _pairs(loaded.frame, 3)
    for batter, pitcher in pairs:
        sides, implied = matchup_contact(loaded, batter_id=batter, pitcher_id=pitcher, batter_hand="R",
                                         pitcher_hand="R", kind="bucket", model=grid, **_BLEND)
        long = bucket_shares(loaded, role="batter")
        own = long[(long["player_id"].astype(str) == batter) & (long["batter_hand"] == "R")
                   & (long["pitcher_hand"] == "R")]
        got = sides[sides["side"] == "batter"].set_index("category")["n"]
        assert_allclose(got.to_numpy(float), own.set_index("bucket").loc[got.index, "n"].to_numpy(float))
        assert implied.sum() == pytest.approx(1.0, abs=1e-12)
    info = contact_cache_info()
    assert info["misses"]["side_counts"] == 2 and info["hits"]["side_counts"] == 4
    assert info["misses"]["league_buckets"] == 1 and info["hits"]["league_buckets"] == 2


def test_returned_tables_are_copies(loaded, grid):
    clear_contact_cache()
    first = tier_shares(loaded, role="batter", model=grid)
    first["n_measured"] = -1
    first["extra"] = 1.0
    again = tier_shares(loaded, role="batter", model=grid)
    assert contact_cache_info()["hits"]["tier_shares"] == 1
    assert "extra" not in again.columns and bool((again["n_measured"] >= 0).all())
    assert np.allclose(again.filter(like="share_").sum(axis=1).dropna(), 1.0)


def test_frames_that_differ_only_in_base_out_columns_are_not_mixed_up(make_synth):
    # The per-ball table keeps the base-out columns (tiered hits read them), so two
    # DataFrames that differ only there must not share it.
    from matchup_widgets.contact import contact_predictions

    df = make_synth(3000, seed=5, base_out=True)
    df["outs_after"], df["bases_after"], df["runs_on_play"] = df["outs_before"], df["bases_before"], 0
    model = ContactModel(kind="grid").fit(df)
    first = contact_predictions(df, model=model)
    other = df.assign(runs_on_play=1)
    second = contact_predictions(other, model=model)
    assert second is not first
    assert set(second["runs_on_play"]) == {1}
    assert contact_predictions(df.copy(), model=model) is first  # same data: still reused
