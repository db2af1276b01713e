"""Specs of the analyst-panel charts: calibration, option ranking, lineup runs.

Charts compute nothing, so the checks are on what reaches the picture: the right rows,
the optimum where the table puts it, axes and titles in words, and named missing columns.
Every table here is invented in the test; none is a check value for a statistic.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
import vl_convert as vlc

from matchup_widgets.charts import (
    brier_surface_chart,
    lineup_runs_chart,
    method_comparison_chart,
    option_ranking_chart,
    reliability_chart,
    skill_chart,
)
from matchup_widgets.data import DataError


@pytest.fixture
def surface() -> pd.DataFrame:
    grid = pd.MultiIndex.from_product(
        [[0.3, 0.5, 0.7], [100, 200, 400], [150, 300]],
        names=["pitcher_weight", "batter_prior_pa", "pitcher_prior_pa"],
    ).to_frame(index=False)
    # a bowl with its bottom at (0.5, 200, 300)
    grid["brier"] = (
        0.70
        + (grid["pitcher_weight"] - 0.5) ** 2
        + 1e-7 * (grid["batter_prior_pa"] - 200) ** 2
        + 1e-7 * (grid["pitcher_prior_pa"] - 300) ** 2
    )
    return grid


def _layer_values(spec: dict, i: int) -> list[dict]:
    """Rows of layer ``i`` (altair moves inline data into named datasets)."""
    data = spec["layer"][i]["data"]
    return spec["datasets"][data["name"]] if "name" in data else data["values"]


def test_surface_holds_third_setting_at_optimum_and_marks_it(surface):
    spec = brier_surface_chart(surface).to_dict()
    cells = _layer_values(spec, 0)
    assert len(cells) == 9  # 3 x 3 grid at pitcher prior 300 only
    assert {round(c["brier"], 9) for c in cells} == {
        round(v, 9) for v in surface.loc[surface.pitcher_prior_pa == 300, "brier"]
    }
    ring = _layer_values(spec, 2)
    assert ring == [{"pitcher_weight": 0.5, "batter_prior_pa": 200}]
    assert "Pitcher prior (PA) 300 held at the optimum" in spec["title"]["subtitle"]
    assert spec["layer"][0]["encoding"]["color"]["field"] == "brier"


def test_surface_uses_given_best_and_nearest_slice(surface):
    best = {"pitcher_weight": 0.7, "batter_prior_pa": 100, "pitcher_prior_pa": 160.0}
    spec = brier_surface_chart(surface, best=best | {"pitcher_weight": 0.66}).to_dict()
    cells = _layer_values(spec, 0)
    assert len(cells) == 9
    assert "Pitcher prior (PA) 150 held" in spec["title"]["subtitle"]
    assert "(Pitcher weight 0.66, Batter prior (PA) 100)" in spec["title"]["subtitle"]
    assert _layer_values(spec, 2) == [{"pitcher_weight": 0.7, "batter_prior_pa": 100}]


def test_surface_labels_at_most_eleven_grid_values():
    grid = pd.MultiIndex.from_product([np.linspace(0, 1, 101), [0, 50]], names=["pitcher_weight", "batter_prior_pa"])
    s = grid.to_frame(index=False).assign(brier=0.7)
    spec = brier_surface_chart(s).to_dict()
    assert len(spec["layer"][0]["encoding"]["x"]["axis"]["values"]) == 11
    assert len(_layer_values(spec, 0)) == 202


def test_surface_other_axes(surface):
    spec = brier_surface_chart(surface, x="batter_prior_pa", y="pitcher_prior_pa").to_dict()
    assert spec["layer"][0]["encoding"]["x"]["title"] == "Batter prior (PA)"
    assert len(_layer_values(spec, 0)) == 6


def test_surface_names_missing_column(surface):
    with pytest.raises(DataError, match=r"brier_surface_chart: table lacks column\(s\) 'brier'"):
        brier_surface_chart(surface.drop(columns="brier"))


def test_reliability_facets_each_outcome_with_diagonal():
    t = pd.DataFrame(
        {
            "outcome": ["K"] * 3 + ["HR"] * 3,
            "mean_predicted": [0.1, 0.2, 0.3, 0.01, 0.02, 0.03],
            "observed_rate": [0.12, 0.19, 0.31, 0.012, 0.02, 0.028],
            "n_pa": [10, 20, 30, 5, 6, 7],
        }
    )
    spec = reliability_chart(t).to_dict()
    assert spec["facet"]["sort"] == ["K", "HR"]
    diagonal = spec["spec"]["layer"][0]
    assert diagonal["encoding"]["x"]["field"] == diagonal["encoding"]["y"]["field"] == "predicted"
    assert diagonal["mark"]["strokeDash"] == [4, 3]
    assert spec["resolve"]["scale"] == {"x": "independent", "y": "independent"}


def test_method_and_skill_charts():
    methods = pd.DataFrame(
        {
            "method": ["linear", "odds-ratio", "two-stage"] * 2,
            "basis": ["observed"] * 3 + ["contact"] * 3,
            "brier": np.linspace(0.70, 0.69, 6),
        }
    )
    spec = method_comparison_chart(methods).to_dict()
    assert spec["encoding"]["x"]["scale"] == {"zero": False}
    assert spec["encoding"]["color"]["scale"]["domain"] == ["observed", "contact"]
    sk = skill_chart(pd.DataFrame({"baseline": ["league", "even blend"], "skill": [0.01, -0.001]})).to_dict()
    assert sk["layer"][0]["encoding"]["x"]["axis"]["format"] == ".1%"


def test_option_ranking_keeps_table_order_and_intervals():
    t = pd.DataFrame(
        {"name": ["Cal Dormer", "Ike Varnes", "Tully Brisco"], "value": [0.04, 0.035, -0.01],
         "lo": [0.0, -0.005, -0.05], "hi": [0.08, 0.075, 0.03], "pa": [400, 120, 60]}
    )
    spec = option_ranking_chart(t, value="expected_runs", side="pitcher").to_dict()
    bars = spec["layer"][0]
    assert bars["encoding"]["y"]["sort"] == ["Cal Dormer", "Ike Varnes", "Tully Brisco"]
    assert bars["encoding"]["x"]["field"] == "lo" and bars["encoding"]["x2"]["field"] == "hi"
    assert bars["encoding"]["x"]["title"].startswith("Expected runs")
    assert bars["mark"]["color"] == "#e3932d"  # the pitcher's fixed colour from the theme
    assert len(spec["layer"]) == 3
    assert len(option_ranking_chart(t, reference=None).to_dict()["layer"]) == 2


def test_lineup_runs_chart_groups_lineups():
    t = pd.DataFrame(
        {"lineup": ["Current order"] * 3 + ["With swap"] * 3, "runs": [0, 1, "2+"] * 2,
         "probability": [0.7, 0.15, 0.15, 0.68, 0.16, 0.16]}
    )
    spec = lineup_runs_chart(t).to_dict()
    assert spec["encoding"]["x"]["sort"] == ["0", "1", "2+"]
    assert spec["encoding"]["color"]["scale"]["domain"] == ["Current order", "With swap"]
    assert spec["encoding"]["y"]["axis"]["format"] == ".0%"


def test_panel_charts_render_offline(surface):
    """Every builder's spec renders to SVG with vl-convert (no browser, no network)."""
    charts = [
        brier_surface_chart(surface),
        reliability_chart(pd.DataFrame({"outcome": ["K"], "mean_predicted": [0.2], "observed_rate": [0.21], "n_pa": [9]})),
        option_ranking_chart(pd.DataFrame({"name": ["A"], "value": [0.0], "lo": [-0.1], "hi": [0.1]})),
        lineup_runs_chart(pd.DataFrame({"lineup": ["a"], "runs": ["0"], "probability": [1.0]})),
    ]
    for chart in charts:
        assert vlc.vegalite_to_svg(chart.to_dict()).startswith("<svg")


def test_reliability_panels_are_titled_in_words():
    # the facet headers showed raw codes (GB_OUT, AIR_OUT, 1B) where every other chart says words
    t = pd.DataFrame(
        {
            "outcome": ["K", "K", "GB_OUT", "GB_OUT", "odd'code", "odd'code"],
            "mean_predicted": [0.1, 0.2, 0.2, 0.3, 0.1, 0.2],
            "observed_rate": [0.1, 0.2, 0.2, 0.3, 0.1, 0.2],
            "n_pa": [5, 6, 7, 8, 9, 10],
        }
    )
    svg = vlc.vegalite_to_svg(reliability_chart(t).to_dict())
    for words in ("Strikeout", "Ground-ball out", "odd'code"):  # an unknown code shows as it is
        assert f">{words}</text>" in svg, words
    assert ">GB_OUT</text>" not in svg and ">K</text>" not in svg
