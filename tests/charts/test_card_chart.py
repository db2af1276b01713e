"""The matchup card's layout: long facts wrap at the card's width, and a small sample is
said on the card as it is in the explorer. Tables are invented; nothing here is a check value."""

from __future__ import annotations

import re

import pandas as pd
import vl_convert as vlc

from matchup_widgets.charts import matchup_card_chart
from matchup_widgets.charts._theme import WARNING


def _svg_lines(svg: str) -> list[str]:
    return re.findall(r"<text[^>]*>([^<]*)</text>", svg)


def test_long_facts_wrap_at_the_card_width_and_notes_show_in_the_warning_colour():
    table = pd.DataFrame({"outcome": ["K", "BB"], "side": ["matchup"] * 2, "probability": [0.2, 0.1]})
    long = "Settings: " + ", ".join(f"setting {i} has the value {i}" for i in range(12))
    note = "Small sample: Ada Quill has only 3 PA in the L vs R split, so the league average carries much of it."
    spec = matchup_card_chart(table, title="A vs B", lines=[long], notes=[note], caution="Estimates.", width=640)
    svg = vlc.vegalite_to_svg(spec.to_dict())
    width = float(re.search(r'<svg[^>]* width="([\d.]+)"', svg).group(1))
    # 640 px of text, 2 x 24 px padding and the bars' axis gutter the text blocks align to
    assert width < 800, width  # unwrapped, the settings line stretched the card to ~1,300 px
    lines = _svg_lines(svg)
    assert long not in lines and long in " ".join(lines)  # wrapped at spaces, nothing lost
    note_text = " ".join(t for t in lines if "Small sample" in t or "league average" in t)
    assert note_text.startswith("Small sample: Ada Quill")
    assert re.search(rf'fill="{WARNING}"[^>]*>Small sample', svg)
    assert len(spec.to_dict()["vconcat"]) == 4  # facts, notes, bars, caution


def test_card_of_a_tiny_sample_says_so():
    from matchup_widgets.data import load_pas
    from matchup_widgets.export import matchup_card
    from matchup_widgets.model import MatchupModel

    df = pd.DataFrame({
        "game_id": ["g1"] * 6, "game_date": ["2031-04-02"] * 6,
        "batter_id": ["b1"] * 3 + ["b2"] * 3, "pitcher_id": ["p1"] * 6,
        "batter_name": ["Ada Quill"] * 3 + ["Bo Reed"] * 3, "pitcher_name": ["Cy Moss"] * 6,
        "batter_hand": ["L"] * 3 + ["R"] * 3, "pitcher_hand": ["R"] * 6,
        "outcome": ["K", "1B", "HR", "BB", "GB_OUT", "AIR_OUT"],
    })
    est = MatchupModel(n_draws=200).fit(load_pas(df)).predict("b1", "p1")
    chart, _ = matchup_card(est)
    words = " ".join(_svg_lines(vlc.vegalite_to_svg(chart.to_dict())))
    assert "Small sample: Ada Quill has only 3 PA" in words
    assert "Small sample: Cy Moss has only 3 PA" in words
