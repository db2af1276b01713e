"""The project's palette, number formats and chart defaults, defined once.

Every chart and panel takes its colours from here, so a colour always means the same
thing: the batter is blue, the pitcher amber, the league grey and the matchup ink.
The four side colours differ in lightness as well as hue, so they stay apart under the
common forms of colour-vision deficiency and in greyscale print.
"""

from __future__ import annotations

import altair as alt

#: The sides a chart can show, in the order they appear in legends and groups.
SIDES: tuple[str, ...] = ("batter", "pitcher", "league", "matchup")

#: Words on screen for each side.
SIDE_LABELS: dict[str, str] = {
    "batter": "Batter",
    "pitcher": "Pitcher",
    "league": "League (same split)",
    "matchup": "Matchup",
    "league_hitter": "League-average hitter",
}

#: One fixed colour per side (hex). Lightness order: league > pitcher > batter > matchup.
SIDE_COLORS: dict[str, str] = {
    "batter": "#2f6db5",
    "pitcher": "#e3932d",
    "league": "#a9a9a4",
    "matchup": "#252b36",
    "league_hitter": "#a9a9a4",
}

#: A light-to-dark ramp for shares in heat maps; it runs in lightness only, so it reads
#: the same for every viewer and never borrows a side colour.
SHARE_RAMP: tuple[str, ...] = ("#f6f3ea", "#d8d2bf", "#a7a592", "#6c7473", "#3b4650", "#17202b")

#: Colours for text and rules in panels.
INK = "#252b36"
MUTED = "#6b6f76"
WARNING = "#9a4d00"
ERROR = "#9b1c1c"

#: Number formats (d3-format) for axes and tooltips.
PERCENT_AXIS = ".0%"
PERCENT_TIP = ".1%"
RUNS_FORMAT = ".3f"

#: Font for charts; a generic family so nothing is fetched from the internet.
FONT = "sans-serif"

#: The one caution shown at the foot of every panel and card: what the numbers are and are not.
CAUTION = (
    "Estimates from samples of plate appearances, shown with their intervals; "
    "not certainties, and not betting advice."
)


def side_label(side: str) -> str:
    """Return the words on screen for a side key.

    Examples
    --------
    >>> side_label("league")
    'League (same split)'
    """
    return SIDE_LABELS.get(side, side.replace("_", " ").capitalize())


def side_scale(sides: list[str] | tuple[str, ...]) -> alt.Scale:
    """Return a colour scale that maps the labels of ``sides`` to their fixed colours.

    Examples
    --------
    >>> side_scale(["batter", "matchup"]).to_dict()["range"]
    ['#2f6db5', '#252b36']
    """
    return alt.Scale(
        domain=[side_label(s) for s in sides],
        range=[SIDE_COLORS.get(s, MUTED) for s in sides],
    )


def style(chart: alt.TopLevelMixin) -> alt.TopLevelMixin:
    """Apply the project's look (fonts, quiet axes, no frame) to a top-level chart.

    Examples
    --------
    >>> c = style(alt.Chart().mark_point())
    >>> c.to_dict()["config"]["view"]["stroke"] is None
    True
    """
    return (
        chart.configure(font=FONT, background="white")
        .configure_view(stroke=None)
        .configure_axis(
            labelColor=INK,
            titleColor=INK,
            labelFontSize=11,
            titleFontSize=12,
            titleFontWeight="normal",
            gridColor="#ebe8df",
            domainColor="#c9c5ba",
            tickColor="#c9c5ba",
        )
        .configure_legend(labelColor=INK, titleColor=INK, labelFontSize=11, titleFontSize=12, orient="bottom")
        .configure_title(color=INK, fontSize=13, anchor="start", fontWeight="bold")
    )
