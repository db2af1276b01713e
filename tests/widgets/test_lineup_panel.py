"""The lineup panel: runs per 9 from the runs layer's exact chain, and the sign of a swap."""

from __future__ import annotations

import re

import numpy as np
import pytest

from matchup_widgets.data import load_pas
from matchup_widgets.model import MatchupModel
from matchup_widgets.runs import lineup_runs, simulate_games
from matchup_widgets.widgets.lineup import LineupPanel, wins_per_season


@pytest.fixture(scope="module")
def pas(tilted_league):
    frame = tilted_league(
        seed=9, n_pa=9000, n_batters=12, n_pitchers=3, batter_sd=0.35, pitcher_sd=0.2,
        pa_per_game=60, games_per_day=3, batter_id="b{i:02d}",
        left_pitcher=lambda i: i == 1,
    )
    return load_pas(frame)


@pytest.fixture(scope="module")
def model(pas):
    return MatchupModel(batter_prior_pa=50, pitcher_prior_pa=200, pitcher_weight=0.4).fit(pas)


ORDER = [f"b{i:02d}" for i in range(9)]


@pytest.fixture(scope="module")
def panel(pas, model):
    return LineupPanel(pas, model=model, pitcher="p0", order=ORDER)


def test_runs_per_9_is_the_runs_layers_exact_figure(panel, model):
    assert panel.status.last_error is None, panel.status.widget.value
    probs = np.vstack([model.predict(b, "p0").probabilities.to_numpy() for b in ORDER])
    ref = lineup_runs(probs)
    got = panel.result["current"]["lineup"]
    assert got.runs_per_9 == pytest.approx(ref.runs_per_9, rel=1e-12)
    assert panel.tables()["summary"].loc[0, "runs_per_9"] == pytest.approx(ref.runs_per_9, rel=1e-12)
    assert f"{ref.runs_per_9:.2f} runs per 9 innings" in panel.headline.value
    # the runs-per-inning distribution drawn is the chain's (last bin: 6 or more)
    dist = panel.tables()["runs_per_inning"]
    assert dist["runs"].tolist() == ["0", "1", "2", "3", "4", "5", "6+"]
    assert dist["probability"].sum() == pytest.approx(1.0, abs=1e-9)
    assert dist["probability"].iloc[0] == pytest.approx(ref.runs_distribution[0], rel=1e-9)
    # cross-check by simulation (runs layer's Monte Carlo, 4000 games: s.e. about 0.05 runs)
    sims = simulate_games(probs, n_games=4000, seed=2).sum(axis=1)
    assert abs(sims.mean() - got.runs_per_9) < 4 * sims.std() / np.sqrt(sims.size)


def _runs_per_pa(model, batters):
    return {b: model.predict(b, "p0").runs_per_pa for b in batters}


def test_a_swap_moves_runs_the_way_the_model_implies(pas, model):
    bench = ["b09", "b10", "b11"]
    rv = _runs_per_pa(model, ORDER + bench)
    weakest = min(ORDER, key=rv.get)
    best_bench = max(bench, key=rv.get)
    worst_bench = min(bench, key=rv.get)
    strongest = max(ORDER, key=rv.get)
    panel = LineupPanel(pas, model=model, pitcher="p0", order=ORDER)

    panel.swap_in.value = best_bench  # as the browser would
    panel.swap_slot.value = ORDER.index(weakest)
    s = panel.tables()["summary"].iloc[0]
    expected_sign = np.sign(rv[best_bench] - rv[weakest])
    assert np.sign(s["change_runs_per_game"]) == expected_sign
    assert s["change_runs_per_game"] == pytest.approx(s["swapped_runs_per_9"] - s["runs_per_9"], rel=1e-12)
    assert s["change_wins_per_season"] == pytest.approx(s["change_runs_per_game"] * 162 / 10, rel=1e-12)
    assert "rule of thumb" in panel.headline.value

    panel.swap_in.value = worst_bench
    panel.swap_slot.value = ORDER.index(strongest)
    s = panel.tables()["summary"].iloc[0]
    assert np.sign(s["change_runs_per_game"]) == np.sign(rv[worst_bench] - rv[strongest])
    # the swapped lineup's figure is the runs layer's for that order
    order = list(ORDER)
    order[ORDER.index(strongest)] = worst_bench
    probs = np.vstack([model.predict(b, "p0").probabilities.to_numpy() for b in order])
    assert s["swapped_runs_per_9"] == pytest.approx(lineup_runs(probs).runs_per_9, rel=1e-12)


def test_wins_rule_of_thumb():
    # ~10 runs per win (common practice): one run per game over 162 games is 16.2 wins
    assert wins_per_season(1.0) == pytest.approx(16.2)
    assert wins_per_season(-0.1, games=100, runs_per_win=9.0) == pytest.approx(-10 / 9)


def test_slot_change_settings_and_csv(pas, model, panel, tmp_path):
    panel.slots[0].value = "b10"
    assert panel.tables()["slots"].loc[0, "batter_id"] == "b10"
    panel.apply_settings(method="odds-ratio")
    assert panel.status.last_error is None, panel.status.widget.value
    probs = np.vstack([model.with_settings(method="odds-ratio").predict(b, "p0").probabilities.to_numpy()
                       for b in ["b10", *ORDER[1:]]])
    assert panel.result["current"]["lineup"].runs_per_9 == pytest.approx(lineup_runs(probs).runs_per_9, rel=1e-12)
    paths = panel.write_csv(tmp_path)
    assert {p.name for p in paths} == {"lineup_slots.csv", "lineup_runs_per_inning.csv", "lineup_summary.csv"}
    with pytest.raises(ValueError, match="nine batters"):
        LineupPanel(pas, model=model, order=ORDER[:8])


def test_caution_line_is_at_the_foot(panel):
    from matchup_widgets.charts._theme import CAUTION

    assert panel.widget.children[-1] is panel.caution and CAUTION in panel.caution.value


def test_slot_table_headers_wrap_inside_the_panel(panel):
    # the whole table was nowrap, so the last header ran past the 560 px column and was cut
    heads = re.findall(r"<th style='([^']*)'>([^<]*)</th>", panel.slot_table.value)
    assert [h for _, h in heads][-1] == "PA per 9 innings"
    assert all("white-space:normal" in style for style, _ in heads)
    assert "white-space:nowrap" in panel.slot_table.value  # the cells stay on one line


def test_swapping_a_batter_for_the_same_one_reads_as_no_change(pas, model):
    # the same order solved twice can differ in the last bit; it must not read "-0.000 runs per game"
    lineup = LineupPanel(pas, model=model, pitcher="p0", order=ORDER)
    lineup.swap_in.value = ORDER[2]
    lineup.swap_slot.value = 2
    assert lineup.status.last_error is None, lineup.status.widget.value
    assert lineup.tables()["summary"].loc[0, "change_runs_per_game"] == pytest.approx(0.0, abs=1e-12)
    assert "a change of <b>+0.000 runs per game</b>" in lineup.headline.value
    assert "-0.000" not in lineup.headline.value + lineup.slot_table.value
