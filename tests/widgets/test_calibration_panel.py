"""The calibration panel: values set as the browser would, outputs against the core's own numbers."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import calibrate
from matchup_widgets.widgets.calibration import CalibrationLab

_FAST = {"priors": (0, 50, 200), "n_boot": 20}


class _Receiver:
    """Stands in for the explorer: records what the panel sends."""

    def __init__(self) -> None:
        self.received: list[dict] = []

    def apply_settings(self, **settings) -> None:
        self.received.append(settings)


@pytest.fixture(scope="module")
def pas(tilted_league):
    frame = tilted_league(seed=5, n_pa=8000, n_batters=10, n_pitchers=5, batter_sd=0.3, games_per_day=5)
    return load_pas(frame)


@pytest.fixture(scope="module")
def fitted(pas):
    receiver = _Receiver()
    lab = CalibrationLab(pas, explorer=receiver, progress=False, **_FAST)
    lab.holdout.value = 0.3  # as the browser would
    lab.seed.value = 4
    lab.fit_button.click()
    return lab, receiver


def test_fit_uses_the_panels_options_and_shows_the_core_result(pas, fitted):
    lab, _ = fitted
    assert lab.status.last_error is None, lab.status.widget.value
    ref = calibrate(pas, holdout_share=0.3, seed=4, progress=False, **_FAST)
    r = lab.result_
    assert r.pitcher_weight == pytest.approx(ref.pitcher_weight, rel=1e-12)
    assert (r.batter_prior_pa, r.pitcher_prior_pa) == (ref.batter_prior_pa, ref.pitcher_prior_pa)
    assert r.n_holdout_pa == ref.n_holdout_pa
    assert f"Pitcher weight {ref.pitcher_weight:.2f}" in lab.summary.value
    assert f"{ref.n_holdout_pa:,} plate appearances" in lab.summary.value


def test_heat_map_shows_the_core_surface_with_the_optimum(fitted):
    lab, _ = fitted
    r = lab.result_
    spec = lab.surface_chart.chart.to_dict()
    cells = pd.DataFrame(spec["datasets"][spec["layer"][0]["data"]["name"]])
    expected = r.surface[r.surface["pitcher_prior_pa"] == r.pitcher_prior_pa]
    assert len(cells) == len(expected)
    assert np.allclose(np.sort(cells["brier"].to_numpy()), np.sort(expected["brier"].to_numpy()), rtol=1e-12)
    ring = spec["datasets"][spec["layer"][2]["data"]["name"]][0]
    grid = np.sort(r.surface["pitcher_weight"].unique())
    assert ring["pitcher_weight"] == grid[np.abs(grid - r.pitcher_weight).argmin()]
    assert ring["batter_prior_pa"] == r.batter_prior_pa
    lab.surface_y.value = "Pitcher prior (PA)"
    spec = lab.surface_chart.chart.to_dict()
    assert spec["layer"][0]["encoding"]["y"]["field"] == "pitcher_prior_pa"


def test_skill_methods_and_reliability_tables_come_from_the_result(fitted):
    lab, _ = fitted
    r = lab.result_
    t = lab.tables()
    assert set(t) == {"settings", "brier_surface", "skill", "methods", "reliability"}
    assert np.allclose(t["skill"]["skill"], list(r.skill_scores.values()), rtol=1e-12)
    assert t["methods"]["method"].tolist() == ["linear", "odds-ratio", "two-stage"]
    assert np.allclose(t["methods"]["brier"], r.methods["brier"], rtol=1e-12)
    assert (t["methods"]["basis"] == "observed").all()
    rel = lab.reliability_chart.chart.to_dict()
    assert rel["facet"]["sort"] == list(OUTCOMES)


def test_apply_pushes_the_fitted_settings(fitted):
    lab, receiver = fitted
    lab.apply_button.click()
    assert lab.status.last_error is None, lab.status.widget.value
    r = lab.result_
    assert receiver.received[-1] == {
        "method": "linear",
        "pitcher_weight": r.pitcher_weight,
        "batter_prior_pa": r.batter_prior_pa,
        "pitcher_prior_pa": r.pitcher_prior_pa,
        "basis": "observed",
    }
    assert f"pitcher weight {r.pitcher_weight:.2f}" in lab.applied.value


def test_odds_ratio_choice_sends_that_methods_priors_to_connected_panels(pas, fitted):
    from matchup_widgets.model import MatchupModel
    from matchup_widgets.widgets import LineupPanel, OptionRanking

    lab, receiver = fitted
    model = MatchupModel().fit(pas)
    ranking = OptionRanking(pas, model=model, fixed="p1", candidates=["b0", "b2"])
    lineup = LineupPanel(pas, model=model, pitcher="p1", order=[f"b{i}" for i in range(9)])
    lab.connect(ranking, lineup)
    lab.send_method.value = "odds-ratio"
    lab.apply_button.click()
    assert lab.status.last_error is None, lab.status.widget.value
    row = lab.result_.methods.set_index("method").loc["odds-ratio"]
    sent = receiver.received[-1]
    assert sent["method"] == "odds-ratio"
    assert (sent["batter_prior_pa"], sent["pitcher_prior_pa"]) == (row["batter_prior_pa"], row["pitcher_prior_pa"])
    for panel in (ranking, lineup):
        params = panel.model.get_params()
        assert params["method"] == "odds-ratio"
        assert params["batter_prior_pa"] == row["batter_prior_pa"]
    assert "2 other panel(s)" in lab.applied.value
    lab.targets.clear()
    lab.send_method.value = "linear"


def test_apply_reaches_the_real_explorer(pas, fitted):
    from matchup_widgets.widgets._explorer import MatchupExplorer

    lab, _ = fitted
    explorer = MatchupExplorer(pas)
    lab.explorer = explorer
    explorer.controls["method"].value = "odds-ratio"
    lab.apply()
    assert "held-out Brier score" in explorer.status.widget.value
    r = lab.result_
    assert explorer.controls["method"].value == "linear"
    assert explorer.controls["pitcher_weight"].value == pytest.approx(r.pitcher_weight, abs=0.005)
    assert explorer.controls["batter_prior"].value == round(r.batter_prior_pa)
    assert explorer.current_settings()["pitcher_prior_pa"] == round(r.pitcher_prior_pa)
    assert explorer.status.last_error is None


def test_csv_export(fitted, tmp_path):
    lab, _ = fitted
    lab.csv_button.click()
    assert 'download="calibration_brier_surface.csv"' in lab.downloads.value
    paths = lab.write_csv(tmp_path)
    back = pd.read_csv(tmp_path / "calibration_settings.csv")
    assert back.loc[0, "pitcher_weight"] == pytest.approx(lab.result_.pitcher_weight, rel=1e-12)
    assert len(paths) == 5


def test_errors_show_in_the_panel_and_apply_needs_a_fit(pas):
    lab = CalibrationLab(pas, progress=False, priors=(-5, 10), n_boot=20)
    assert lab.apply_button.disabled
    lab.fit_button.click()  # a bad grid: the core's message appears, the panel stays usable
    assert lab.status.last_error is not None
    assert "Fit failed" in lab.status.widget.value
    assert not lab.fit_button.disabled
    with pytest.raises(RuntimeError, match="no fit yet"):
        lab.settings()


def test_caution_line_is_at_the_foot(fitted):
    from matchup_widgets.charts._theme import CAUTION

    lab, _ = fitted
    assert lab.widget.children[-1] is lab.caution and CAUTION in lab.caution.value


def test_before_a_fit_every_chart_says_what_will_fill_it(pas, fitted):
    # empty charts drew bare axes and orphan legends ("Basis", "PAs in bin") on screen
    fresh = CalibrationLab(pas, progress=False, **_FAST)
    charts = (fresh.surface_chart, fresh.skill_chart, fresh.methods_chart, fresh.reliability_chart)
    for chart in charts:
        spec = chart.chart.to_dict()
        assert spec["mark"]["type"] == "text" and "fit" in str(spec["datasets"]).lower()
    assert fresh.compare_bases.layout.width == "auto"  # its words read in full
    lab, _ = fitted
    assert lab.skill_chart.chart.to_dict()["layer"][0]["mark"]["type"] == "bar"  # a fit replaces them
    assert lab.reliability_chart.chart.to_dict()["facet"]["field"] == "outcome"


def test_a_receiver_that_fails_is_reported_here_too(pas, fitted):
    from matchup_widgets.widgets._common import StatusLine

    class Failing(_Receiver):
        def __init__(self) -> None:
            super().__init__()
            self.status = StatusLine()

        def apply_settings(self, **settings) -> None:
            super().apply_settings(**settings)
            self.status.error("Could not update", ValueError("no plate appearances in 2031"))

    lab, _ = fitted
    failing = Failing()
    lab.connect(failing)
    try:
        lab.apply()
        assert "Sent to" in lab.applied.value
        assert "1 receiving panel(s) could not update" in lab.status.widget.value
        assert "no plate appearances in 2031" in lab.status.widget.value
    finally:
        lab.targets.remove(failing)
        lab.status.clear()


def test_two_stage_choice_sets_both_sliders_and_the_method(pas, fitted):
    from matchup_widgets.widgets._explorer import MatchupExplorer

    lab, _ = fitted
    explorer = MatchupExplorer(pas)
    lab.explorer = explorer
    lab.send_method.value = "two-stage"  # as the browser would
    try:
        lab.apply_button.click()
    finally:
        lab.send_method.value = "linear"
    assert lab.status.last_error is None, lab.status.widget.value
    want = lab.result_.model_settings("two-stage")
    c = explorer.controls
    assert c["method"].value == "two-stage"
    assert c["first_weight"].value == pytest.approx(want["first_weight"], abs=0.0005)
    assert c["in_play_weight"].value == pytest.approx(want["in_play_weight"], abs=0.0005)
    assert explorer.current_settings()["batter_prior_pa"] == round(want["batter_prior_pa"])
    assert c["first_weight"].layout.display is None and c["pitcher_weight"].layout.display == "none"
    assert f"{lab.result_.two_stage['brier']:.4f}" in explorer.status.widget.value
    assert "first stage" in lab.applied.value
    assert explorer.status.last_error is None
    est = explorer.estimate
    assert (est.settings["first_weight"], est.settings["in_play_weight"]) == (
        pytest.approx(want["first_weight"]), pytest.approx(want["in_play_weight"]))
