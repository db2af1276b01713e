"""The option-ranking panel: rankings equal the core's figures, intervals included."""

from __future__ import annotations

import pandas as pd
import pytest

from matchup_widgets.data import load_pas
from matchup_widgets.model import MatchupModel, run_value_interval
from matchup_widgets.widgets.options import OptionRanking


@pytest.fixture(scope="module")
def pas(tilted_league):
    return load_pas(tilted_league(seed=7, n_pa=6000, n_batters=8, n_pitchers=4, batter_sd=0.35))


@pytest.fixture(scope="module")
def model(pas):
    return MatchupModel(method="odds-ratio", batter_prior_pa=100, pitcher_prior_pa=300).fit(pas)


def test_bench_against_one_pitcher_ranked_by_core_run_values(pas, model):
    panel = OptionRanking(pas, model=model, fixed="p2", candidates=["b0", "b3", "b5", "b6"])
    assert panel.status.last_error is None, panel.status.widget.value
    table = panel.ranking
    assert sorted(table["player_id"]) == ["b0", "b3", "b5", "b6"]
    for row in table.itertuples():
        ref = run_value_interval(model.predict(row.player_id, "p2"))
        assert row.value == pytest.approx(ref["value"], rel=1e-12)
        assert (row.lo, row.hi) == pytest.approx((ref["lo"], ref["hi"]), rel=1e-12)
        assert row.value == pytest.approx(model.predict(row.player_id, "p2").runs_per_pa, rel=1e-12)
    assert table["value"].is_monotonic_decreasing  # batters: more runs first
    assert table["rank"].tolist() == [1, 2, 3, 4]
    assert table["name"].iloc[0] in panel.table.value
    spec = panel.chart.chart.to_dict()
    assert spec["layer"][0]["encoding"]["y"]["sort"] == table["name"].tolist()


def test_relievers_against_one_batter_by_expected_runs_in_a_state(pas, model):
    panel = OptionRanking(pas, model=model, mode="batter", fixed="b1")
    panel.candidates.value = ("p0", "p1", "p3")  # as the browser would
    panel.state.value = 2 * 8 + 3  # two outs, runners on first and second (state index 8 * outs + bases)
    assert panel.status.last_error is None, panel.status.widget.value
    table = panel.ranking
    assert table["value"].is_monotonic_increasing  # pitchers: fewest runs first
    assert set(table["measure"]) == {"expected_runs"}
    for row in table.itertuples():
        ref = run_value_interval(model.predict("b1", row.player_id), outs=2, bases=3)
        assert row.value == pytest.approx(ref["value"], rel=1e-12)
    assert "expected runs" in panel.table.value


def test_overlap_flags_options_not_clear_of_the_best(pas, model):
    panel = OptionRanking(pas, model=model, fixed="p0", candidates=["b0", "b1", "b2", "b4", "b7"])
    t = panel.ranking
    best = t.iloc[0]
    for row in t.itertuples():
        assert row.overlaps_best == (row.hi >= best.lo and row.lo <= best.hi)


def test_settings_from_outside_rerank(pas, model, tmp_path):
    panel = OptionRanking(pas, model=model, fixed="p2", candidates=["b0", "b3"])
    panel.apply_settings(method="linear", pitcher_weight=0.3, batter_prior_pa=0.0)
    ref = run_value_interval(model.with_settings(method="linear", pitcher_weight=0.3, batter_prior_pa=0.0).predict("b3", "p2"))
    row = panel.ranking.set_index("player_id").loc["b3"]
    assert row["value"] == pytest.approx(ref["value"], rel=1e-12)
    assert "pitcher weight 0.30" in panel.settings_note.value
    panel.write_csv(tmp_path)
    assert len(pd.read_csv(tmp_path / "options_ranking.csv")) == 2


def test_mode_switch_and_empty_choice(pas, model):
    panel = OptionRanking(pas, model=model)
    panel.mode.value = "batter"
    assert set(panel.candidates.value) <= {"p0", "p1", "p2", "p3"}
    assert panel.ranking["player_id"].str.startswith("p").all()
    panel.candidates.value = ()
    assert panel.ranking.empty and "Choose" in panel.table.value
    with pytest.raises(ValueError, match="mode must be"):
        OptionRanking(pas, model=model, mode="catcher")


def test_caution_line_is_at_the_foot(pas, model):
    from matchup_widgets.charts._theme import CAUTION

    panel = OptionRanking(pas, model=model, fixed="p2", candidates=["b0", "b3"])
    assert panel.widget.children[-1] is panel.caution and CAUTION in panel.caution.value


def test_emptied_choice_clears_the_chart_and_settings_name_the_methods_own_weights(pas, model):
    panel = OptionRanking(pas, model=model, fixed="p2", candidates=["b0", "b3"])
    # the model is an odds-ratio blend: it has exponents, not a pitcher weight
    assert "odds-ratio blend, exponents batter 1, pitcher 1" in panel.settings_note.value
    assert "pitcher weight" not in panel.settings_note.value
    panel.candidates.value = ()
    spec = panel.chart.chart.to_dict()
    assert spec["mark"]["type"] == "text" and "Choose" in str(spec["datasets"])  # not the stale ranking
    panel.candidates.value = ("b0",)
    assert panel.chart.chart.to_dict()["layer"][0]["encoding"]["y"]["sort"] == panel.ranking["name"].tolist()
