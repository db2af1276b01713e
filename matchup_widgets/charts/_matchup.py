"""Chart builders for the matchup explorer: small long-form tables in, altair charts out.

Each builder copies its table, adds the words shown on screen, and returns a chart; none
computes a statistic. Colours and formats come from :mod:`._theme`.
"""

from __future__ import annotations

import altair as alt
import pandas as pd

from matchup_widgets.data import OUTCOME_LABELS, OUTCOMES

from ._tables import ordered_unique, require_columns
from ._theme import (
    INK,
    PERCENT_AXIS,
    PERCENT_TIP,
    RUNS_FORMAT,
    SHARE_RAMP,
    SIDES,
    side_label,
    side_scale,
    style,
)


#: Vega expression that breaks a multi-word axis label at its last space: "Ground-ball out"
#: and "Home run" are wider than their band once nine outcomes share 600 px, and ran together.
TWO_LINE_LABEL = (
    "indexof(datum.label, ' ') < 0 ? datum.label : "
    "[slice(datum.label, 0, lastindexof(datum.label, ' ')), slice(datum.label, lastindexof(datum.label, ' ') + 1)]"
)


def _with_side_labels(table: pd.DataFrame, order: tuple[str, ...] = SIDES) -> tuple[pd.DataFrame, list[str]]:
    """Copy ``table`` with a ``side_label`` column; return it and the sides present, in order."""
    out = table.copy()
    out["side"] = out["side"].astype(str)
    present = set(out["side"])
    sides = [s for s in order if s in present] + [s for s in ordered_unique(out["side"]) if s not in order]
    out["side_label"] = [side_label(s) for s in out["side"]]
    return out, sides


def _outcome_bars_data(table: pd.DataFrame) -> tuple[pd.DataFrame, tuple]:
    """The rows drawn by :func:`outcome_bars_chart` and the layout they imply."""
    require_columns(table, ["outcome", "side", "probability"], where="outcome_bars_chart")
    data, sides = _with_side_labels(table)
    if "low" not in data.columns:
        data["low"] = float("nan")
    if "high" not in data.columns:
        data["high"] = float("nan")
    data["outcome"] = data["outcome"].astype(str)
    data["outcome_label"] = [OUTCOME_LABELS.get(c, c) for c in data["outcome"]]
    codes = [c for c in OUTCOMES if c in set(data["outcome"])] + [
        c for c in ordered_unique(data["outcome"]) if c not in OUTCOMES
    ]
    label_order = tuple(OUTCOME_LABELS.get(c, c) for c in codes)
    data = data[["outcome", "outcome_label", "side", "side_label", "probability", "low", "high"]]
    return data, (label_order, tuple(sides))


def outcome_bars_chart(
    table: pd.DataFrame,
    *,
    width: int = 640,
    height: int = 260,
    title: str | None = "Outcome shares per plate appearance",
) -> alt.LayerChart:
    """Grouped bars of outcome probabilities per side, with interval whiskers.

    Parameters
    ----------
    table : DataFrame
        Long form, one row per (outcome, side): ``outcome`` (code from ``OUTCOMES``),
        ``side`` (``batter``, ``pitcher``, ``league``, ``matchup``), ``probability``,
        and optionally ``low`` and ``high`` (interval ends; missing values draw no whisker).
    width, height : int
        Size in pixels (fixed, so the chart renders inside hidden tabs).
    title : str or None
        Chart title.

    Returns
    -------
    alt.LayerChart
        Bars coloured by side plus whisker rules, styled with the project theme.

    Examples
    --------
    >>> t = pd.DataFrame({"outcome": ["K", "K"], "side": ["batter", "matchup"],
    ...                   "probability": [0.2, 0.25], "low": [None, 0.2], "high": [None, 0.3]})
    >>> spec = outcome_bars_chart(t).to_dict()
    >>> spec["layer"][0]["encoding"]["y"]["axis"]["format"]
    '.0%'
    """
    data, (label_order, sides) = _outcome_bars_data(table)
    side_order = [side_label(s) for s in sides]
    base = alt.Chart(data).encode(
        x=alt.X(
            "outcome_label:N", sort=list(label_order), title="Outcome",
            axis=alt.Axis(labelAngle=0, labelExpr=TWO_LINE_LABEL),
        ),
        xOffset=alt.XOffset("side_label:N", sort=side_order),
    )
    bars = base.mark_bar().encode(
        y=alt.Y(
            "probability:Q",
            title="Share of plate appearances",
            axis=alt.Axis(format=PERCENT_AXIS),
        ),
        color=alt.Color("side_label:N", scale=side_scale(list(sides)), sort=side_order, title=None),
        tooltip=[
            alt.Tooltip("side_label:N", title="Side"),
            alt.Tooltip("outcome_label:N", title="Outcome"),
            alt.Tooltip("probability:Q", title="Share", format=PERCENT_TIP),
            alt.Tooltip("low:Q", title="Interval low", format=PERCENT_TIP),
            alt.Tooltip("high:Q", title="Interval high", format=PERCENT_TIP),
        ],
    )
    whiskers = (
        base.transform_filter("isValid(datum.low) && isValid(datum.high)")
        .mark_rule(color=INK, strokeWidth=1.5, opacity=0.85)
        .encode(y="low:Q", y2="high:Q")
    )
    chart = alt.layer(bars, whiskers).properties(width=width, height=height)
    if title:
        chart = chart.properties(title=title)
    return style(chart)


def _heatmap_data(table: pd.DataFrame) -> tuple[pd.DataFrame, tuple]:
    """The rows drawn by :func:`contact_heatmap_chart` and the layout they imply."""
    require_columns(
        table, ["side", "exit_velo_bin", "launch_angle_bin", "share"], where="contact_heatmap_chart"
    )
    data, sides = _with_side_labels(table)
    data["exit_velo_bin"] = data["exit_velo_bin"].astype(str)
    data["launch_angle_bin"] = data["launch_angle_bin"].astype(str)
    if "n" not in data.columns:
        data["n"] = float("nan")
    ev_order = tuple(ordered_unique(data["exit_velo_bin"]))
    la_order = tuple(ordered_unique(data["launch_angle_bin"])[::-1])  # steepest band on top
    data = data[["side", "side_label", "exit_velo_bin", "launch_angle_bin", "share", "n"]]
    return data, (tuple(sides), ev_order, la_order)


def contact_heatmap_chart(
    table: pd.DataFrame,
    *,
    cell_width: int = 250,
    cell_height: int = 190,
    title: str | None = "Where the contact lands: exit velocity by launch angle",
) -> alt.FacetChart:
    """Heat maps of batted-ball shares by exit-velocity and launch-angle band, one per side.

    Parameters
    ----------
    table : DataFrame
        Long form: ``side``, ``exit_velo_bin`` and ``launch_angle_bin`` (band labels, rows in
        low-to-high band order), ``share`` (share of that side's batted balls), optionally
        ``n`` (batted balls in the cell).
    cell_width, cell_height : int
        Size of each side's panel in pixels.
    title : str or None
        Chart title.

    Returns
    -------
    alt.FacetChart

    Examples
    --------
    >>> t = pd.DataFrame({"side": ["batter", "pitcher"], "exit_velo_bin": ["<90", "<90"],
    ...                   "launch_angle_bin": ["<10", "<10"], "share": [1.0, 1.0]})
    >>> contact_heatmap_chart(t).to_dict()["spec"]["encoding"]["x"]["title"]
    'Exit velocity (mph)'
    """
    data, (sides, ev_order, la_order) = _heatmap_data(table)
    chart = (
        alt.Chart(data)
        .mark_rect(stroke="white", strokeWidth=1)
        .encode(
            x=alt.X("exit_velo_bin:O", sort=list(ev_order), title="Exit velocity (mph)", axis=alt.Axis(labelAngle=0)),
            y=alt.Y("launch_angle_bin:O", sort=list(la_order), title="Launch angle (degrees)"),
            color=alt.Color(
                "share:Q",
                title="Share of batted balls",
                scale=alt.Scale(range=list(SHARE_RAMP), domainMin=0),
                legend=alt.Legend(format=PERCENT_AXIS, orient="right"),
            ),
            tooltip=[
                alt.Tooltip("side_label:N", title="Side"),
                alt.Tooltip("exit_velo_bin:O", title="Exit velocity (mph)"),
                alt.Tooltip("launch_angle_bin:O", title="Launch angle (degrees)"),
                alt.Tooltip("share:Q", title="Share", format=PERCENT_TIP),
                alt.Tooltip("n:Q", title="Batted balls", format=",.0f"),
            ],
        )
        .properties(width=cell_width, height=cell_height)
        .facet(
            column=alt.Column(
                "side_label:N",
                sort=[side_label(s) for s in sides],
                title=None,
                header=alt.Header(labelFontSize=12, labelColor=INK, labelFontWeight="bold"),
            )
        )
    )
    if title:
        chart = chart.properties(title=title)
    return style(chart)


def _tier_data(table: pd.DataFrame) -> tuple[pd.DataFrame, tuple]:
    """The rows drawn by :func:`tier_shares_chart` and the layout they imply."""
    require_columns(table, ["side", "tier", "share"], where="tier_shares_chart")
    data, sides = _with_side_labels(table)
    data["tier"] = data["tier"].astype(str)
    tiers = tuple(ordered_unique(data["tier"]))
    data = data[["side", "side_label", "tier", "share"]]
    return data, (tuple(sides), tiers)


def tier_shares_chart(
    table: pd.DataFrame,
    *,
    width: int = 420,
    height: int = 200,
    title: str | None = "Contact quality: share of batted balls in each tier",
) -> alt.Chart:
    """Grouped bars of contact-tier shares per side (e.g. batter, pitcher, matchup mix).

    Parameters
    ----------
    table : DataFrame
        Long form: ``side``, ``tier`` (tier names, rows in weakest-to-hardest order), ``share``.
    width, height : int
        Size in pixels.
    title : str or None
        Chart title.

    Returns
    -------
    alt.Chart

    Examples
    --------
    >>> t = pd.DataFrame({"side": ["matchup", "matchup"], "tier": ["soft", "hard"],
    ...                   "share": [0.6, 0.4]})
    >>> tier_shares_chart(t).to_dict()["encoding"]["x"]["sort"]
    ['soft', 'hard']
    """
    data, (sides, tiers) = _tier_data(table)
    side_order = [side_label(s) for s in sides]
    chart = (
        alt.Chart(data)
        .mark_bar()
        .encode(
            x=alt.X("tier:N", sort=list(tiers), title="Contact tier", axis=alt.Axis(labelAngle=0)),
            xOffset=alt.XOffset("side_label:N", sort=side_order),
            y=alt.Y("share:Q", title="Share of batted balls", axis=alt.Axis(format=PERCENT_AXIS)),
            color=alt.Color("side_label:N", scale=side_scale(list(sides)), sort=side_order, title=None),
            tooltip=[
                alt.Tooltip("side_label:N", title="Side"),
                alt.Tooltip("tier:N", title="Tier"),
                alt.Tooltip("share:Q", title="Share", format=PERCENT_TIP),
            ],
        )
        .properties(width=width, height=height)
    )
    if title:
        chart = chart.properties(title=title)
    return style(chart)


def _run_data(table: pd.DataFrame) -> tuple[pd.DataFrame, tuple]:
    """The rows drawn by :func:`run_context_chart` and the layout they imply."""
    require_columns(table, ["side", "expected_runs", "scoring_chance"], where="run_context_chart")
    data, sides = _with_side_labels(table, order=("matchup", "league_hitter", "batter", "pitcher", "league"))
    data = data[["side", "side_label", "expected_runs", "scoring_chance"]]
    return data, (tuple(sides),)


def run_context_chart(
    table: pd.DataFrame,
    *,
    state: str | None = None,
    width: int = 250,
    height: int = 80,
) -> alt.HConcatChart:
    """Expected runs and chance of scoring in one base-out state, side by side per hitter.

    Parameters
    ----------
    table : DataFrame
        One row per side (e.g. ``matchup`` and ``league_hitter``): ``side``,
        ``expected_runs`` (runs to the end of the inning), ``scoring_chance`` (chance of
        at least one run).
    state : str or None
        Words for the base-out state, shown in the title.
    width, height : int
        Size of each of the two panels in pixels.

    Returns
    -------
    alt.HConcatChart

    Examples
    --------
    >>> t = pd.DataFrame({"side": ["matchup", "league_hitter"],
    ...                   "expected_runs": [0.5, 0.48], "scoring_chance": [0.27, 0.26]})
    >>> spec = run_context_chart(t, state="Nobody on, 0 out").to_dict()
    >>> spec["hconcat"][1]["encoding"]["x"]["axis"]["format"]
    '.0%'
    """
    data, (sides,) = _run_data(table)
    side_order = [side_label(s) for s in sides]
    color = alt.Color("side_label:N", scale=side_scale(list(sides)), sort=side_order, legend=None)
    y = alt.Y("side_label:N", sort=side_order, title=None)
    base = alt.Chart(data).properties(width=width, height=height)
    runs = base.mark_bar().encode(
        x=alt.X("expected_runs:Q", title="Expected runs to end of inning", axis=alt.Axis(format=".2f")),
        y=y,
        color=color,
        tooltip=[
            alt.Tooltip("side_label:N", title="Hitter"),
            alt.Tooltip("expected_runs:Q", title="Expected runs", format=RUNS_FORMAT),
        ],
    )
    chance = base.mark_bar().encode(
        x=alt.X(
            "scoring_chance:Q",
            title="Chance of scoring at least one run",
            axis=alt.Axis(format=PERCENT_AXIS),
            scale=alt.Scale(domain=[0, 1]),
        ),
        y=alt.Y("side_label:N", sort=side_order, title=None, axis=None),
        color=color,
        tooltip=[
            alt.Tooltip("side_label:N", title="Hitter"),
            alt.Tooltip("scoring_chance:Q", title="Chance of scoring", format=PERCENT_TIP),
        ],
    )
    title = f"Run context: {state}" if state else "Run context"
    return style(alt.hconcat(runs, chance, spacing=24).properties(title=title))


#: For each builder, the function that gives the rows it draws and a key of everything
#: else its layout depends on. A live chart whose key has not changed can swap the rows in
#: the finished spec instead of rebuilding the chart (see ``chart_rows``).
_PREPARE = {
    outcome_bars_chart: _outcome_bars_data,
    contact_heatmap_chart: _heatmap_data,
    tier_shares_chart: _tier_data,
    run_context_chart: _run_data,
}


def chart_rows(builder, table: pd.DataFrame) -> tuple[list[dict], tuple] | None:
    """The JSON rows ``builder(table)`` would embed and its layout key, or None if unknown.

    Two tables with the same layout key give specs that differ only in their rows, so a
    live chart can update by replacing the rows of its spec.

    Examples
    --------
    >>> t = pd.DataFrame({"side": ["matchup"], "tier": ["soft"], "share": [0.5]})
    >>> rows, key = chart_rows(tier_shares_chart, t)
    >>> rows[0]["share"], key
    (0.5, (('matchup',), ('soft',)))
    """
    prepare = _PREPARE.get(builder)
    if prepare is None:
        return None
    data, key = prepare(table)
    return _records(data), key


def _records(data: pd.DataFrame) -> list[dict]:
    """JSON-ready rows: Python scalars, missing values as None (as altair embeds them)."""
    plain = data.astype(object)
    return plain.where(data.notna().to_numpy(), None).to_dict("records")
