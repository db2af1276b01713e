"""The matchup explorer without a browser: set control values as the browser would, then
check that the outputs changed and carry the model's own numbers.

The demo league is used for these smoke checks (it is invented data: no check value comes
from it; every expected number is recomputed with the core's public functions)."""

from __future__ import annotations

import numpy as np
import pytest

from matchup_widgets.data import OUTCOMES, DataError
from matchup_widgets.widgets import MatchupExplorer
from matchup_widgets.widgets._tables import SMALL_SAMPLE_PA


@pytest.fixture(scope="module")
def explorer():
    from matchup_widgets.data.demo import demo_path

    return MatchupExplorer.from_path(demo_path())


def _rows(ex, name):
    return ex.live[name].rows()


def _predict(ex):
    model, batter, pitcher, kwargs = ex.current_query()
    return model.predict(batter, pitcher, **kwargs)


def _matchup_rows(ex):
    rows = [r for r in _rows(ex, "outcomes") if r["side"] == "matchup"]
    return {r["outcome"]: r for r in rows}


def _assert_matches_model(ex):
    est = _predict(ex)
    rows = _matchup_rows(ex)
    got = np.array([rows[c]["probability"] for c in OUTCOMES])
    np.testing.assert_allclose(got, est.probabilities.loc[list(OUTCOMES)].to_numpy(), rtol=1e-12)
    np.testing.assert_allclose([rows[c]["low"] for c in OUTCOMES], est.intervals["lo"].to_numpy(), rtol=1e-12)
    np.testing.assert_allclose([rows[c]["high"] for c in OUTCOMES], est.intervals["hi"].to_numpy(), rtol=1e-12)
    batter = {r["outcome"]: r["probability"] for r in _rows(ex, "outcomes") if r["side"] == "batter"}
    np.testing.assert_allclose([batter[c] for c in OUTCOMES], est.distributions.loc["batter", list(OUTCOMES)].to_numpy(), rtol=1e-12)
    return est


def test_builds_with_every_output(explorer):
    ex = explorer
    assert ex.status.last_error is None, ex.status.widget.value
    assert set(ex.charts) == {"outcomes", "heatmap", "tiers", "runs"}
    est = _assert_matches_model(ex)
    assert est.batter_name in ex.headline.value and est.pitcher_name in ex.headline.value
    assert f"{100 * est.k_rate:.1f}%" in ex.headline.value  # K% shown as a percentage
    assert {r["side"] for r in _rows(ex, "outcomes")} == {"batter", "pitcher", "league", "matchup"}
    assert {r["side"] for r in _rows(ex, "heatmap")} == {"batter", "pitcher"}
    assert {r["side"] for r in _rows(ex, "tiers")} == {"batter", "pitcher", "league", "matchup"}


def test_weight_slider_updates_outputs_in_place(explorer):
    ex = explorer
    widgets_before = {k: id(v) for k, v in ex.charts.items()}
    ex.controls["pitcher_weight"].value = 0.2
    before = _matchup_rows(ex)
    headline = ex.headline.value
    runs_before = _rows(ex, "runs")
    tiers_before = _rows(ex, "tiers")
    builds = ex.live["outcomes"].n_builds
    ex.controls["pitcher_weight"].value = 0.8
    assert _matchup_rows(ex) != before
    assert ex.headline.value != headline
    assert _rows(ex, "runs") != runs_before
    assert _rows(ex, "tiers") != tiers_before  # the contact mix follows the weight
    assert ex.estimate.settings["pitcher_weight"] == 0.8
    _assert_matches_model(ex)
    # same widgets, rows swapped in the spec: no new chart, no new output area
    assert {k: id(v) for k, v in ex.charts.items()} == widgets_before
    assert ex.live["outcomes"].n_builds == builds


@pytest.mark.parametrize(
    ("control", "value", "setting", "expected"),
    [
        ("batter_prior", 600, "batter_prior_pa", 600.0),
        ("pitcher_prior", 30, "pitcher_prior_pa", 30.0),
        ("method", "odds-ratio", "method", "odds-ratio"),
        ("method", "two-stage", "method", "two-stage"),
        ("seasons", (2025, 2026), "seasons", [2025, 2026]),
    ],
)
def test_model_controls_reach_the_model(explorer, control, value, setting, expected):
    ex = explorer
    ex.controls[control].value = value
    assert ex.status.last_error is None, ex.status.widget.value
    assert ex.estimate.settings[setting] == expected
    _assert_matches_model(ex)


def test_contact_basis(explorer):
    ex = explorer
    ex.controls["basis"].value = "contact"
    assert ex.status.last_error is None, ex.status.widget.value
    assert ex.estimate.settings["basis"] == "contact"
    _assert_matches_model(ex)
    ex.controls["basis"].value = "observed"
    assert ex.estimate.settings["basis"] == "observed"


def test_platoon_what_if(explorer):
    ex = explorer
    ex.controls["platoon"].value = "L"
    assert ex.estimate.batter_hand == "L"
    assert "left-handed" in ex.headline.value
    _assert_matches_model(ex)
    ex.controls["platoon"].value = "R"
    assert ex.estimate.batter_hand == "R"
    ex.controls["platoon"].value = "auto"
    assert ex.current_query()[3] == {"batter_hand": None}


def test_search_lists_namesakes_with_ids(explorer):
    ex = explorer
    players = ex.pas.players
    batters = players[players["role"] == "batter"]
    dupes = batters[batters["name"].duplicated(keep=False)]
    assert len(dupes) >= 2, "the demo league is documented to have a namesake pair"
    name = dupes["name"].iloc[0]
    ex.controls["batter_search"].value = name
    options = ex.controls["batter"].options
    ids_listed = {v for label, v in options if label.startswith(name)}
    assert set(dupes.loc[dupes["name"] == name, "player_id"]) <= ids_listed
    assert all(f"({pid}," in label for label, pid in options)
    # choose the second namesake, as a click in the dropdown would
    other = sorted(ids_listed)[1]
    ex.controls["batter"].value = other
    assert ex.estimate.batter_id == other
    _assert_matches_model(ex)


def test_search_with_no_match_keeps_the_choice(explorer):
    ex = explorer
    chosen = ex.controls["pitcher"].value
    ex.controls["pitcher_search"].value = "zzzz-no-such-name"
    assert ex.controls["pitcher"].value == chosen
    assert "No pitcher matches" in ex.status.widget.value
    ex.controls["pitcher_search"].value = ""


def test_run_context_follows_the_state(explorer):
    from matchup_widgets.runs import situation, state_label

    ex = explorer
    ex.controls["state"].value = 2 * 8 + 7  # bases loaded, two outs
    est = ex.estimate
    want = situation(est.probabilities, outs=2, bases=7, league=est.distributions.loc["league"])
    rows = {r["side"]: r for r in _rows(ex, "runs")}
    assert rows["matchup"]["expected_runs"] == pytest.approx(want["expected_runs"], rel=1e-12)
    assert rows["league_hitter"]["scoring_chance"] == pytest.approx(want["league_p_score"], rel=1e-12)
    assert ex.charts["runs"].spec["title"] == f"Run context: {state_label(2, 7)}"


def test_one_refresh_per_change_and_none_reentrant(explorer, monkeypatch):
    ex = explorer
    calls = []
    inner = ex._coalescer._refresh
    monkeypatch.setattr(ex._coalescer, "_refresh", lambda: (calls.append(1), inner())[1])
    ex.controls["pitcher_weight"].value = 0.33
    assert len(calls) == 1
    # typing in the search box replaces the options, which moves the value once
    calls.clear()
    ex.controls["batter_search"].value = ex.controls["batter"].options[-1][0].split(" (")[0]
    assert len(calls) <= 1
    # an unchanged query does not recompute
    calls.clear()
    ex.controls["pitcher_weight"].value = 0.33
    assert calls == []


def test_error_in_a_callback_is_shown_and_controls_stay_usable(explorer, monkeypatch):
    ex = explorer
    model_type = type(ex.model)
    real = model_type.predict

    def broken(self, *args, **kwargs):
        msg = "batter 'b9999' has no plate appearances in seasons (2031, 2031). Widen the season range."
        raise DataError(msg)

    monkeypatch.setattr(model_type, "predict", broken)
    ex.controls["pitcher_weight"].value = 0.61
    assert isinstance(ex.status.last_error, DataError)
    assert "Widen the season range" in ex.status.widget.value
    assert "Could not update the matchup" in ex.status.widget.value
    monkeypatch.setattr(model_type, "predict", real)
    ex.controls["pitcher_weight"].value = 0.62  # the panel recovers on the next change
    assert ex.status.last_error is None
    assert ex.status.widget.value == ""
    assert ex.estimate.settings["pitcher_weight"] == 0.62


def test_apply_fitted_settings_in_one_update(explorer, monkeypatch):
    ex = explorer
    calls = []
    inner = ex._coalescer._refresh
    monkeypatch.setattr(ex._coalescer, "_refresh", lambda: (calls.append(1), inner())[1])
    ex.controls["method"].value = "odds-ratio"
    calls.clear()
    ex.calibration = {"pitcher_weight": 0.437, "batter_prior_pa": 400.0, "pitcher_prior_pa": 100.0, "brier": 0.0801}
    ex.controls["apply_fitted"].click()
    assert len(calls) == 1
    assert ex.controls["method"].value == "linear"
    assert ex.controls["pitcher_weight"].value == pytest.approx(0.437)
    assert (ex.controls["batter_prior"].value, ex.controls["pitcher_prior"].value) == (400, 100)
    assert "Fitted settings applied" in ex.status.widget.value
    _assert_matches_model(ex)


def test_small_sample_note(explorer):
    ex = explorer
    players = ex.pas.players
    fewest = players[players["role"] == "batter"].sort_values("pa").iloc[0]
    ex.controls["platoon"].value = "auto"
    ex.batter_picker.select(fewest["player_id"])
    assert ex.estimate.batter_id == fewest["player_id"]
    small = ex.estimate.pa["batter"] < SMALL_SAMPLE_PA
    assert ("Small sample" in ex.headline.value) == small


def test_fit_and_use_runs_calibration_once(explorer, monkeypatch):
    import matchup_widgets.model as model_module

    ex = explorer
    calls = []

    def fake_calibrate(pas, **kwargs):
        calls.append(kwargs)
        return {"pitcher_weight": 0.52, "batter_prior_pa": 200.0, "pitcher_prior_pa": 400.0}

    monkeypatch.setattr(model_module, "calibrate", fake_calibrate)
    ex.calibration = None
    ex.controls["apply_fitted"].click()
    ex.controls["apply_fitted"].click()
    assert len(calls) == 1  # fitted once, then reused
    assert ex.controls["apply_fitted"].description == "Use fitted settings"
    assert ex.controls["pitcher_weight"].value == pytest.approx(0.52)
    assert ex.estimate.settings["pitcher_prior_pa"] == 400.0


def _tree_html(widget):
    """Every HTML value in a widget tree (depth first)."""
    out = [widget.value] if hasattr(widget, "value") and isinstance(widget.value, str) else []
    for child in getattr(widget, "children", ()):
        out += _tree_html(child)
    return out


def test_every_side_carries_its_whiskers_from_the_estimate(explorer):
    ex = explorer
    ex.controls["pitcher_weight"].value = 0.35
    est = ex.estimate
    rows = _rows(ex, "outcomes")
    assert {r["side"] for r in rows} == {"batter", "pitcher", "league", "matchup"}
    # every drawn row has both ends, so the chart's whisker filter keeps all four sides
    assert all(r["low"] is not None and r["high"] is not None for r in rows)
    assert all(np.isfinite([r["low"], r["high"]]).all() for r in rows)
    for side in ("batter", "pitcher", "league"):
        got = {r["outcome"]: (r["low"], r["high"]) for r in rows if r["side"] == side}
        np.testing.assert_allclose([got[c][0] for c in OUTCOMES], est.side_intervals.loc[(side, "lo")].to_numpy(), rtol=1e-12)
        np.testing.assert_allclose([got[c][1] for c in OUTCOMES], est.side_intervals.loc[(side, "hi")].to_numpy(), rtol=1e-12)
    _assert_matches_model(ex)  # the matchup's whiskers are the estimate's intervals
    spec = ex.live["outcomes"].widget.chart.to_dict()
    whisker = spec["layer"][1]
    assert whisker["mark"]["type"] == "rule"
    assert whisker["encoding"]["y"]["field"] == "low" and whisker["encoding"]["y2"]["field"] == "high"


def test_caution_line_is_on_screen(explorer):
    from matchup_widgets.charts._theme import CAUTION

    assert any(CAUTION in v for v in _tree_html(explorer.widget))
    assert "not betting advice" in CAUTION


def test_season_readout_shows_the_whole_range(explorer):
    ex = explorer
    first, last = ex.seasons_all
    assert not ex.controls["seasons"].readout  # the slider's own box clipped the range
    lo, hi = ex.controls["seasons"].value
    assert (f"{lo} – {hi}" if lo != hi else f">{lo}<") in ex.seasons_readout.value
    ex.controls["seasons"].value = (last, last)
    assert f">{last}<" in ex.seasons_readout.value
    ex.controls["seasons"].value = (first, last)
    assert f"{first} – {last}" in ex.seasons_readout.value
    assert ex.status.last_error is None, ex.status.widget.value


def test_pitcher_weight_slider_is_off_where_the_blend_has_no_weight(explorer):
    # the odds-ratio blend (generalised Log5) takes no pitcher weight: moving the slider
    # there changed nothing on screen, so the slider is disabled and says why
    ex = explorer
    slider = ex.controls["pitcher_weight"]
    ex.controls["method"].value = "odds-ratio"
    assert slider.disabled and "no pitcher weight" in slider.tooltip
    before = _matchup_rows(ex)
    ex.apply_settings(pitcher_weight=0.9)  # the model indeed ignores it
    assert _matchup_rows(ex) == before
    for method in ("linear", "two-stage"):
        ex.controls["method"].value = method
        assert not slider.disabled
    assert ex.status.last_error is None, ex.status.widget.value


def test_league_runs_column_never_reads_minus_zero(explorer):
    from matchup_widgets.widgets._tables import _runs

    assert _runs(-1e-17) == "+0.000" and _runs(0.0) == "+0.000" and _runs(-0.0004) == "+0.000"
    assert _runs(-0.0123) == "-0.012" and _runs(float("nan")) == "–"
    assert "-0.000" not in explorer.headline.value


def test_a_failing_search_shows_in_the_panel(explorer, monkeypatch):
    ex = explorer
    chosen = ex.controls["batter"].value

    def broken(*args, **kwargs):
        msg = "the player table could not be read"
        raise OSError(msg)

    monkeypatch.setattr(ex.batter_picker, "_search_players", broken)
    ex.controls["batter_search"].value = "qu"
    assert isinstance(ex.status.last_error, OSError)
    assert "Could not search batters" in ex.status.widget.value
    assert ex.controls["batter"].value == chosen
    monkeypatch.undo()
    ex.controls["batter_search"].value = ""
    ex.controls["pitcher_weight"].value = 0.44  # the next change clears the message
    assert ex.status.last_error is None


def test_without_contact_columns_the_contact_basis_is_not_offered(tilted_league):
    # choosing it could only fail with "ContactModel.fit needs column(s) ..." in the status line
    from matchup_widgets.data import load_pas

    frame = tilted_league(seed=3, n_pa=3000, n_batters=6, n_pitchers=3, batter_sd=0.3)
    frame = frame.drop(columns=[c for c in ("exit_velo", "launch_angle") if c in frame.columns])
    ex = MatchupExplorer(load_pas(frame))
    assert not ex.has_contact
    assert [v for _, v in ex.controls["basis"].options] == ["observed"]
    assert "contact charts are off" in ex.contact_note.value
    assert ex.status.last_error is None and ex.estimate is not None, ex.status.widget.value


def test_whiskers_follow_the_side_labels_not_the_row_order(explorer):
    import dataclasses

    from matchup_widgets.widgets._tables import outcome_table

    est = explorer.estimate
    shuffled = dataclasses.replace(est, side_intervals=est.side_intervals.iloc[::-1])
    got = outcome_table(shuffled)
    want = outcome_table(est)
    np.testing.assert_array_equal(got[["low", "high"]].to_numpy(), want[["low", "high"]].to_numpy())
    pitcher = got[got["side"] == "pitcher"].set_index("outcome")
    np.testing.assert_allclose(pitcher.loc[list(OUTCOMES), "low"], est.side_intervals.loc[("pitcher", "lo"), list(OUTCOMES)])


def _two_stage_rows_match(ex, first, in_play):
    """The matchup bars against the model itself, built with explicit two-stage weights."""
    from matchup_widgets.model import MatchupModel

    s = ex.current_settings()
    assert (s["method"], s["first_weight"], s["in_play_weight"]) == ("two-stage", first, in_play)
    c = ex.controls
    model = MatchupModel(
        method="two-stage", first_weight=first, in_play_weight=in_play,
        batter_prior_pa=s["batter_prior_pa"], pitcher_prior_pa=s["pitcher_prior_pa"],
        basis=s["basis"], seasons=s["seasons"], contact_model=ex.model.contact_model,
    ).fit(ex.pas)
    side = c["platoon"].value
    est = model.predict(c["batter"].value, c["pitcher"].value, batter_hand=None if side == "auto" else side)
    rows = _matchup_rows(ex)
    got = np.array([rows[o]["probability"] for o in OUTCOMES])
    np.testing.assert_allclose(got, est.probabilities.loc[list(OUTCOMES)].to_numpy(), rtol=1e-12)


def test_two_stage_sliders_feed_the_model(explorer):
    ex = explorer
    c = ex.controls
    ex.apply_settings(basis="observed", seasons=ex.seasons_all)
    c["method"].value = "linear"
    # outside the two-stage blend its sliders are hidden and its weights are not settings
    assert c["first_weight"].layout.display == "none" and c["in_play_weight"].layout.display == "none"
    assert c["pitcher_weight"].layout.display is None
    assert ex.current_settings()["first_weight"] is None
    c["method"].value = "two-stage"  # as the browser would
    assert c["pitcher_weight"].layout.display == "none"
    assert c["first_weight"].layout.display is None and c["in_play_weight"].layout.display is None
    assert not c["first_weight"].continuous_update and not c["in_play_weight"].continuous_update
    c["first_weight"].value = 0.8
    assert ex.status.last_error is None, ex.status.widget.value
    _two_stage_rows_match(ex, 0.8, c["in_play_weight"].value)
    before = _matchup_rows(ex)
    c["in_play_weight"].value = 0.15
    assert ex.status.last_error is None, ex.status.widget.value
    assert _matchup_rows(ex) != before
    _two_stage_rows_match(ex, 0.8, 0.15)
    # the single weight no longer moves anything under this blend
    before = _matchup_rows(ex)
    ex.apply_settings(pitcher_weight=0.05)
    assert _matchup_rows(ex) == before
    assert ex.estimate.settings["first_weight"] == 0.8
    c["method"].value = "linear"


def test_two_stage_settings_round_trip_in_one_update(explorer, monkeypatch):
    ex = explorer
    calls = []
    inner = ex._coalescer._refresh
    monkeypatch.setattr(ex._coalescer, "_refresh", lambda: (calls.append(1), inner())[1])
    ex.controls["method"].value = "linear"
    calls.clear()
    ex.apply_calibration({"method": "two-stage", "first_weight": 0.3, "in_play_weight": 0.7,
                          "batter_prior_pa": 200.0, "pitcher_prior_pa": 50.0, "brier": 0.0812})
    assert len(calls) == 1
    settings = ex.current_settings()
    assert (settings["method"], settings["first_weight"], settings["in_play_weight"]) == ("two-stage", 0.3, 0.7)
    assert (settings["batter_prior_pa"], settings["pitcher_prior_pa"]) == (200.0, 50.0)
    assert "first stage" in ex.status.widget.value and "0.0812" in ex.status.widget.value
    _assert_matches_model(ex)
    calls.clear()
    ex.apply_settings(**settings)  # the explorer's own settings change nothing
    assert ex.current_settings() == settings
    with pytest.raises(ValueError, match="odds-ratio"):
        ex.apply_calibration({"method": "odds-ratio", "batter_prior_pa": 1.0, "pitcher_prior_pa": 1.0})
    ex.controls["method"].value = "linear"
