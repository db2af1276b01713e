"""Chart builders: assert on ``chart.to_dict()``; no browser, no statistics."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.charts import (
    SIDE_COLORS,
    contact_heatmap_chart,
    outcome_bars_chart,
    run_context_chart,
    side_scale,
    tier_shares_chart,
)
from matchup_widgets.data import OUTCOME_LABELS, OUTCOMES, DataError

SIDES = ("batter", "pitcher", "league", "matchup")


def _bars_table(seed: int = 0) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    rows = []
    for side in SIDES:
        p = rng.dirichlet(np.ones(len(OUTCOMES)))
        for code, v in zip(OUTCOMES, p, strict=True):
            lo, hi = (np.nan, np.nan) if side == "league" else (v * 0.8, v * 1.2)
            rows.append({"outcome": code, "side": side, "probability": v, "low": lo, "high": hi})
    return pd.DataFrame(rows)


def _values(spec: dict) -> list[dict]:
    (name, values), = spec["datasets"].items()
    return values


def test_outcome_bars_encode_every_outcome_and_side_with_fixed_colours():
    table = _bars_table()
    before = table.copy()
    spec = outcome_bars_chart(table).to_dict()
    pd.testing.assert_frame_equal(table, before)  # the input is not changed
    values = _values(spec)
    assert len(values) == len(OUTCOMES) * len(SIDES)
    bars = spec["layer"][0]["encoding"]
    assert bars["x"]["sort"] == [OUTCOME_LABELS[c] for c in OUTCOMES]
    assert bars["x"]["title"] == "Outcome"
    assert bars["y"]["axis"]["format"] == ".0%"
    assert bars["color"]["scale"]["range"] == [SIDE_COLORS[s] for s in SIDES]
    # probabilities pass through untouched
    got = {(v["side"], v["outcome"]): v["probability"] for v in values}
    want = {(r.side, r.outcome): r.probability for r in table.itertuples()}
    assert got == pytest.approx(want, rel=1e-12)
    # whiskers skip rows without an interval
    assert "isValid(datum.low)" in spec["layer"][1]["transform"][0]["filter"]
    assert spec["layer"][1]["encoding"]["y2"]["field"] == "high"


def test_outcome_bars_without_interval_columns():
    table = _bars_table().drop(columns=["low", "high"])
    values = _values(outcome_bars_chart(table).to_dict())
    assert all(v["low"] is None for v in values)


def test_side_colour_is_the_same_in_every_chart():
    heat = pd.DataFrame({"side": ["pitcher", "batter"], "exit_velo_bin": ["a", "a"],
                         "launch_angle_bin": ["b", "b"], "share": [1.0, 1.0]})
    tiers = pd.DataFrame({"side": ["matchup", "batter"], "tier": ["x", "x"], "share": [0.5, 0.5]})
    runs = pd.DataFrame({"side": ["league_hitter", "matchup"], "expected_runs": [0.4, 0.5],
                         "scoring_chance": [0.2, 0.3]})
    tier_spec = tier_shares_chart(tiers).to_dict()
    assert tier_spec["encoding"]["color"]["scale"]["range"] == [SIDE_COLORS["batter"], SIDE_COLORS["matchup"]]
    run_spec = run_context_chart(runs, state="Bases empty, 0 out").to_dict()
    assert run_spec["hconcat"][0]["encoding"]["color"]["scale"]["range"] == [
        SIDE_COLORS["matchup"], SIDE_COLORS["league_hitter"]]
    assert run_spec["title"] == "Run context: Bases empty, 0 out"
    heat_spec = contact_heatmap_chart(heat).to_dict()
    assert heat_spec["facet"]["column"]["sort"] == ["Batter", "Pitcher"]


def test_palette_sides_are_distinct():
    colours = [SIDE_COLORS[s] for s in SIDES]
    assert len(set(colours)) == len(colours)
    assert side_scale(["league", "batter"]).to_dict()["domain"] == ["League (same split)", "Batter"]


def test_heatmap_keeps_band_order_and_formats_shares_as_percent():
    ev = ["<85", "85-95", "95+"]
    la = ["<10", "10-30", "30+"]
    rows = [{"side": s, "exit_velo_bin": e, "launch_angle_bin": a, "share": 1 / 9}
            for s in ("batter", "pitcher") for a in la for e in ev]
    spec = contact_heatmap_chart(pd.DataFrame(rows)).to_dict()
    enc = spec["spec"]["encoding"]
    assert enc["x"]["sort"] == ev
    assert enc["y"]["sort"] == la[::-1]
    assert enc["y"]["title"] == "Launch angle (degrees)"
    assert enc["color"]["legend"]["format"] == ".0%"


def test_run_context_axes_in_words():
    runs = pd.DataFrame({"side": ["matchup", "league_hitter"], "expected_runs": [0.9, 0.8],
                         "scoring_chance": [0.4, 0.38]})
    spec = run_context_chart(runs).to_dict()
    assert spec["hconcat"][0]["encoding"]["x"]["title"] == "Expected runs to end of inning"
    assert spec["hconcat"][1]["encoding"]["x"]["title"] == "Chance of scoring at least one run"


@pytest.mark.parametrize(
    ("builder", "table", "missing"),
    [
        (outcome_bars_chart, pd.DataFrame({"outcome": ["K"], "side": ["batter"]}), "'probability'"),
        (tier_shares_chart, pd.DataFrame({"side": ["batter"], "share": [1.0]}), "'tier'"),
        (run_context_chart, pd.DataFrame({"side": ["matchup"]}), "'expected_runs', 'scoring_chance'"),
        (contact_heatmap_chart, pd.DataFrame({"side": ["batter"]}), "'exit_velo_bin'"),
    ],
)
def test_missing_columns_are_named(builder, table, missing):
    with pytest.raises(DataError, match=f"lacks column\\(s\\) {missing}"):
        builder(table)


def test_chart_renders_offline_to_svg():
    vlc = pytest.importorskip("vl_convert")
    svg = vlc.vegalite_to_svg(outcome_bars_chart(_bars_table()).to_dict())
    assert "Share of plate appearances" in svg
    assert "Strikeout" in svg


def _tables_for_every_builder():
    heat = pd.DataFrame([{"side": s, "exit_velo_bin": e, "launch_angle_bin": a, "share": 0.25, "n": 3}
                         for s in ("batter", "pitcher") for a in ("<10", "10+") for e in ("<95", "95+")])
    tiers = pd.DataFrame({"side": ["batter", "matchup"] * 2, "tier": ["soft", "soft", "hard", "hard"],
                          "share": [0.5, 0.6, 0.5, 0.4]})
    runs = pd.DataFrame({"side": ["matchup", "league_hitter"], "expected_runs": [0.5, 0.48],
                         "scoring_chance": [0.27, 0.26]})
    return [(outcome_bars_chart, _bars_table()), (contact_heatmap_chart, heat),
            (tier_shares_chart, tiers), (run_context_chart, runs)]


@pytest.mark.parametrize(("builder", "table"), _tables_for_every_builder(),
                         ids=lambda x: getattr(x, "__name__", "table"))
def test_chart_rows_are_the_rows_the_builder_embeds(builder, table):
    from matchup_widgets.charts import chart_rows

    rows, key = chart_rows(builder, table)
    (embedded,) = builder(table).to_dict()["datasets"].values()
    assert rows == embedded
    # a table with other numbers but the same categories keeps the layout key
    other = table.copy()
    num = [c for c in other.columns if c in ("probability", "share", "expected_runs")][0]
    other[num] = other[num] * 0.5
    assert chart_rows(builder, other)[1] == key
    assert chart_rows(builder, other)[0] != rows


def test_multi_word_outcome_labels_break_onto_two_lines():
    # at the card's 580 px, "Home run" and "Ground-ball out" ran into each other on one line
    import re

    import vl_convert as vlc

    spec = outcome_bars_chart(_bars_table(), width=580).to_dict()
    svg = vlc.vegalite_to_svg(spec)
    assert "<tspan>Ground-ball</tspan><tspan" in svg and ">out</tspan>" in svg
    assert "<tspan>Home</tspan><tspan" in svg
    one_line = re.findall(r'opacity="1">(Strikeout|Walk|Single)</text>', svg)
    assert sorted(set(one_line)) == ["Single", "Strikeout", "Walk"]  # one-word labels stay whole
