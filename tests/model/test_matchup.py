"""MatchupModel: settings, fit once, predict by split, season filter, names, speed-friendly copies."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES, DataError, league_counts
from matchup_widgets.model import MatchupEstimate, MatchupModel, linear_blend, shrink

CODES = list(OUTCOMES)


def _invented_pas(seed: int = 0, n: int = 6000) -> pd.DataFrame:
    """A small invented league: 12 batters (every third a switch hitter), 8 pitchers, 3 seasons."""
    rng = np.random.default_rng(seed)
    n_bat, n_pit = 12, 8
    bat_side = np.array(["L", "R", "S"])[np.arange(n_bat) % 3]
    pit_hand = np.where(np.arange(n_pit) % 3 == 0, "L", "R")
    b = rng.integers(0, n_bat, n)
    p = rng.integers(0, n_pit, n)
    ph = pit_hand[p]
    bh = np.where(bat_side[b] == "S", np.where(ph == "L", "R", "L"), bat_side[b])
    base = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.24, 0.22])
    season = rng.integers(2031, 2034, n)
    return pd.DataFrame(
        {
            "game_id": [f"g{season[i]}-{i // 60}" for i in range(n)],
            "game_date": pd.to_datetime([f"{s}-05-01" for s in season]),
            "batter_id": [f"bat{i:02d}" for i in b],
            "pitcher_id": [f"pit{i:02d}" for i in p],
            "batter_name": [f"Quill Batterson {i}" for i in b],
            "pitcher_name": [f"Moss Pitchley {i}" for i in p],
            "batter_hand": bh,
            "pitcher_hand": ph,
            "outcome": np.array(OUTCOMES)[rng.choice(9, size=n, p=base)],
            "season": season,
        }
    )


@pytest.fixture(scope="module")
def pas() -> pd.DataFrame:
    return _invented_pas()


@pytest.fixture(scope="module")
def fitted(pas) -> MatchupModel:
    return MatchupModel().fit(pas)


def _split_counts(pas: pd.DataFrame, column: str, player: str, bh: str, ph: str, seasons=None) -> np.ndarray:
    """Hand count with pandas of one player's outcomes in one split (the reference)."""
    rows = pas[(pas[column] == player) & (pas["batter_hand"] == bh) & (pas["pitcher_hand"] == ph)]
    if seasons is not None:
        rows = rows[rows["season"].between(*seasons)]
    return rows["outcome"].value_counts().reindex(CODES, fill_value=0).to_numpy(dtype=float)


def test_init_stores_settings_unchanged_and_checks_them_at_fit(pas):
    model = MatchupModel(pitcher_weight=7, seasons=[2031, 2032])
    assert model.pitcher_weight == 7 and model.seasons == [2031, 2032]
    assert not hasattr(model, "batter_counts_")
    with pytest.raises(ValueError, match=r"pitcher_weight must be a number in \[0, 1\].*got 7"):
        model.fit(pas)
    with pytest.raises(TypeError, match=r"unknown MatchupModel setting\(s\) \['weight'\]"):
        MatchupModel().with_settings(weight=0.3)
    with pytest.raises(RuntimeError, match="not fitted yet"):
        MatchupModel().predict("bat00", "pit00")


@pytest.mark.parametrize("seed", [0.3, 1.5, float("inf"), b"1", -1, True, "7", None])
def test_a_seed_that_is_not_a_whole_number_is_our_error(fitted, seed):
    # numpy's SeedSequence raised its own TypeError for these; -1 gave a message without the name
    with pytest.raises(ValueError, match=r"seed must be a whole number >= 0 .*got"):
        fitted.with_settings(seed=seed)
    with pytest.raises(ValueError, match=r"seed must be a whole number >= 0"):
        fitted.with_settings(seed=3).set_params(seed=seed)


def test_league_counts_match_the_data_layer(fitted, pas):
    mask = fitted.batter_counts_.season_mask(None)
    cube = fitted.batter_counts_.league(mask).reshape(4, 9)
    ref = league_counts(pas)[CODES].to_numpy(dtype=float)
    assert_allclose(cube, ref, rtol=0)
    assert fitted.n_pa_ == len(pas)


def test_raw_rates_and_weight_zero_give_the_batter_split(fitted, pas):
    model = fitted.with_settings(batter_prior_pa=0, pitcher_prior_pa=0, pitcher_weight=0.0)
    est = model.predict("bat01", "pit01")  # batter bats R, pitcher throws R
    assert (est.batter_hand, est.pitcher_hand) == ("R", "R")
    ref = _split_counts(pas, "batter_id", "bat01", "R", "R")
    assert_allclose(est.probabilities.to_numpy(), ref / ref.sum(), rtol=1e-12)
    assert_allclose(est.counts.loc["batter", CODES].to_numpy(), ref, rtol=0)
    assert est.pa["batter"] == ref.sum()
    ref_p = _split_counts(pas, "pitcher_id", "pit01", "R", "R")
    assert_allclose(est.distributions.loc["pitcher_raw"].to_numpy(), ref_p / ref_p.sum(), rtol=1e-12)


def test_shrunk_sides_and_blend_follow_the_pure_functions(fitted, pas):
    est = fitted.with_settings(batter_prior_pa=150, pitcher_prior_pa=80, pitcher_weight=0.3).predict("bat01", "pit02")
    league = est.distributions.loc["league"].to_numpy()
    b = shrink(_split_counts(pas, "batter_id", "bat01", "R", "R"), league, 150)
    q = shrink(_split_counts(pas, "pitcher_id", "pit02", "R", "R"), league, 80)
    assert_allclose(est.probabilities.to_numpy(), linear_blend(b, q, 0.3), rtol=1e-12)
    assert abs(est.probabilities.sum() - 1) < 1e-12


def test_huge_prior_returns_the_split_league(fitted, pas):
    est = fitted.with_settings(batter_prior_pa=1e12, pitcher_prior_pa=1e12, method="odds-ratio").predict("bat00", "pit00")
    rows = pas[(pas["batter_hand"] == "L") & (pas["pitcher_hand"] == "L")]
    ref = rows["outcome"].value_counts(normalize=True).reindex(CODES, fill_value=0).to_numpy()
    assert_allclose(est.probabilities.to_numpy(), ref, atol=1e-8)
    assert est.summary.loc["matchup", "runs_per_pa"] == pytest.approx(0.0, abs=1e-8)


def test_switch_hitter_bats_opposite_the_pitcher_unless_overridden(fitted):
    vs_left = fitted.predict("bat02", "pit00")  # pit00 throws L
    vs_right = fitted.predict("bat02", "pit01")
    assert vs_left.switch_hitter and (vs_left.batter_hand, vs_left.pitcher_hand) == ("R", "L")
    assert (vs_right.batter_hand, vs_right.pitcher_hand) == ("L", "R")
    what_if = fitted.predict("bat02", "pit01", batter_hand="R")
    assert what_if.split == "R vs R"
    assert not fitted.predict("bat00", "pit01").switch_hitter


def test_season_range_filters_counts(fitted, pas):
    model = fitted.with_settings(seasons=(2032, 2033), batter_prior_pa=0, pitcher_prior_pa=0, pitcher_weight=0)
    est = model.predict("bat01", "pit01")
    ref = _split_counts(pas, "batter_id", "bat01", "R", "R", seasons=(2032, 2033))
    assert_allclose(est.counts.loc["batter", CODES].to_numpy(), ref, rtol=0)
    with pytest.raises(DataError, match=r"no plate appearances in seasons \(2040, 2041\)"):
        fitted.with_settings(seasons=(2040, 2041)).predict("bat01", "pit01")


def test_with_settings_shares_counts_and_leaves_the_original(fitted):
    other = fitted.with_settings(method="two-stage", in_play_weight=0.2)
    assert other.batter_counts_ is fitted.batter_counts_
    assert fitted.method == "linear" and other.method == "two-stage"
    same = fitted.with_settings()
    assert same.set_params(pitcher_weight=0.9) is same and same.pitcher_weight == 0.9
    assert fitted.pitcher_weight == 0.5


def test_names_resolve_and_unknown_names_list_matches(fitted):
    by_name = fitted.predict("Quill Batterson 4", "Moss Pitchley 3")
    assert (by_name.batter_id, by_name.pitcher_id) == ("bat04", "pit03")
    assert by_name.batter_name == "Quill Batterson 4"
    with pytest.raises(DataError, match=r"matches \d+ players"):
        fitted.predict("Quill", "pit03")
    with pytest.raises(DataError, match=r"No batter matches 'Quil Batterson 44'.*Closest names"):
        fitted.predict("Quil Batterson 44", "pit03")


def test_input_column_order_never_changes_the_estimate(fitted, pas):
    shuffled = pas[list(reversed(pas.columns))]
    ref = fitted.predict("bat05", "pit04")
    got = MatchupModel().fit(shuffled).predict("bat05", "pit04")
    assert_allclose(got.probabilities.to_numpy(), ref.probabilities.to_numpy(), rtol=0)
    assert_allclose(got.intervals.to_numpy(), ref.intervals.to_numpy(), rtol=0)


@pytest.mark.parametrize("method", ["linear", "odds-ratio", "two-stage"])
def test_estimate_is_complete_and_json_ready(fitted, method):
    est = fitted.with_settings(method=method).predict("bat03", "pit05")
    assert isinstance(est, MatchupEstimate)
    lo, hi = est.intervals["lo"].to_numpy(), est.intervals["hi"].to_numpy()
    p = est.probabilities.to_numpy()
    assert np.all((lo <= p) & (p <= hi))
    assert 0 < est.effective_pa
    d = json.loads(json.dumps(est.to_dict()))
    for key in ("probabilities", "intervals", "pa", "woba", "runs_per_pa", "settings"):
        assert key in d
    assert abs(sum(d["probabilities"].values()) - 1) < 1e-12
    assert d["settings"]["method"] == method
    assert est.k_rate == pytest.approx(p[0])
    assert est.on_base == pytest.approx(p[1:7].sum())


def test_repeatable_intervals(fitted):
    one = fitted.predict("bat03", "pit05").intervals
    two = fitted.with_settings().predict("bat03", "pit05").intervals
    pd.testing.assert_frame_equal(one, two)


def test_suggested_priors_are_reported(fitted):
    got = fitted.suggested_priors()
    assert list(got.columns) == ["batter", "pitcher"]
    assert list(got.index) == [*CODES, "all"]
    # The invented league gives every player the same talent: no real spread, so the
    # suggestions are large (or infinite) for the common outcomes.
    assert np.all(got.loc[["K", "GB_OUT"]].to_numpy() > 300)


def test_a_split_never_seen_gives_wide_intervals_not_false_precision(fitted):
    # bat00 always bats L; asking for R is a what-if with no PAs of the batter's own in that split.
    raw = fitted.with_settings(batter_prior_pa=0, pitcher_prior_pa=0, pitcher_weight=0.0)
    unseen = raw.predict("bat00", "pit01", batter_hand="R")
    seen = raw.predict("bat00", "pit01")
    assert unseen.pa["batter"] == 0 and seen.pa["batter"] > 100
    width_unseen = (unseen.intervals["hi"] - unseen.intervals["lo"]).to_numpy()
    width_seen = (seen.intervals["hi"] - seen.intervals["lo"]).to_numpy()
    common = [OUTCOMES.index(c) for c in ("K", "1B", "GB_OUT", "AIR_OUT")]
    assert np.all(width_unseen[common] > 0.15)
    assert np.all(width_unseen[common] > 3 * width_seen[common])
    assert unseen.effective_pa < 10
    # with no PAs and no prior the point estimate is the league of the split
    assert_allclose(unseen.probabilities.to_numpy(), unseen.distributions.loc["league"].to_numpy(), rtol=1e-12)


def test_side_intervals_hold_each_bar_and_match_the_posterior(fitted, pas):
    from scipy import stats

    from matchup_widgets.model import INTERVAL_FLOOR

    est = fitted.with_settings(n_draws=20_000).predict("bat03", "pit05")
    t = est.side_intervals
    assert list(t.index.get_level_values("side").unique()) == ["batter", "pitcher", "league"]
    assert list(t.columns) == CODES
    for side in ("batter", "pitcher", "league"):
        point = est.distributions.loc[side, CODES].to_numpy()
        assert np.all((t.loc[(side, "lo")].to_numpy() <= point) & (point <= t.loc[(side, "hi")].to_numpy()))
    # Reference: the Dirichlet marginal is a beta distribution (standard result), here the
    # league's own posterior Beta(n_i + 0.5, N - n_i + 8 * 0.5) from its split counts.
    lg = est.counts.loc["league", CODES].to_numpy() + INTERVAL_FLOOR
    assert_allclose(t.loc[("league", "hi")].to_numpy(), stats.beta.ppf(0.9, lg, lg.sum() - lg), rtol=0.02, atol=2e-4)
    d = json.loads(json.dumps(est.to_dict()))
    assert set(d["side_intervals"]) == {"batter", "pitcher", "league"}
    assert d["side_intervals"]["pitcher"]["K"] == [t.loc[("pitcher", "lo"), "K"], t.loc[("pitcher", "hi"), "K"]]
    # the matchup's own keys are unchanged
    assert set(d["intervals"]) == set(CODES)
