"""Charts for the calibration panel: the Brier surface, skill over baselines, reliability, methods.

Each builder takes a small table (as the calibration result hands it over) and returns an
altair chart; none computes a statistic beyond picking rows to show.
"""

from __future__ import annotations

from collections.abc import Mapping

import altair as alt
import pandas as pd

from ._tables import require_columns
from ._theme import MUTED, SHARE_RAMP, SIDE_COLORS, WARNING, style

#: The fitted settings a Brier surface is laid out over, with the words on screen.
SURFACE_AXES: dict[str, str] = {
    "pitcher_weight": "Pitcher weight",
    "batter_prior_pa": "Batter prior (PA)",
    "pitcher_prior_pa": "Pitcher prior (PA)",
}


def _nearest(values: pd.Series, value: float) -> float:
    """The grid value in ``values`` closest to ``value``."""
    return values.iloc[(values - value).abs().to_numpy().argmin()]


def _slice_surface(surface: pd.DataFrame, x: str, y: str, best: Mapping[str, float]) -> tuple[pd.DataFrame, str]:
    """Keep the rows of ``surface`` whose other settings equal the best ones; say which."""
    rows = surface
    held = []
    for col in SURFACE_AXES:
        if col in (x, y) or col not in rows.columns or rows[col].nunique() <= 1:
            continue
        value = best[col]
        # nearest grid value, so a best setting found off the grid still selects a slice
        nearest = _nearest(rows[col], value)
        rows = rows[rows[col] == nearest]
        held.append(f"{SURFACE_AXES[col]} {nearest:g}")
    return rows, ", ".join(held)


def _ticks(values: pd.Series, most: int = 11) -> list[float]:
    """At most ``most`` evenly spaced grid values to label (a 101-step weight grid has 101)."""
    grid = sorted(pd.unique(values.to_numpy()).tolist())
    step = -(-len(grid) // most)
    return grid[::step]


def brier_surface_chart(
    surface: pd.DataFrame,
    *,
    best: Mapping[str, float] | None = None,
    x: str = "pitcher_weight",
    y: str = "batter_prior_pa",
    width: int = 320,
    height: int = 220,
) -> alt.LayerChart:
    """Heat map of the held-out Brier score over two fitted settings, the optimum marked.

    Parameters
    ----------
    surface : DataFrame
        One row per grid point: columns ``x``, ``y``, ``brier`` and any other fitted
        settings (``pitcher_weight``, ``batter_prior_pa``, ``pitcher_prior_pa``).
    best : mapping, optional
        The chosen settings (column -> value). Settings other than ``x`` and ``y`` are held
        at these values (nearest grid point); the optimum is marked at ``best[x], best[y]``.
        Default: the grid row with the lowest Brier score.
    x, y : str
        The settings on the horizontal and vertical axes.
    width, height : int
        Size in pixels (fixed, so the chart renders inside a hidden tab).

    Returns
    -------
    alt.LayerChart
        A ``rect`` layer (darker = lower Brier score, i.e. better) and a ring (on a white
        halo) at the optimum; the subtitle states the optimum and the settings held fixed.

    Examples
    --------
    >>> s = pd.DataFrame({"pitcher_weight": [0.4, 0.4, 0.6, 0.6],
    ...                   "batter_prior_pa": [100, 200, 100, 200],
    ...                   "brier": [0.70, 0.69, 0.68, 0.685]})
    >>> spec = brier_surface_chart(s).to_dict()
    >>> [layer["mark"]["type"] for layer in spec["layer"]]
    ['rect', 'point', 'point']
    """
    require_columns(surface, [x, y, "brier"], where="brier_surface_chart")
    if best is None:
        best = surface.loc[surface["brier"].idxmin()].to_dict()
    rows, held = _slice_surface(surface, x, y, best)
    rows = rows[[x, y, "brier"]].reset_index(drop=True)
    x_ticks, y_ticks = _ticks(rows[x]), _ticks(rows[y])
    # the ring sits on the grid cell nearest the optimum (a closed-form weight lies between cells)
    marker = pd.DataFrame({x: [_nearest(rows[x], best[x])], y: [_nearest(rows[y], best[y])]})
    x_title, y_title = SURFACE_AXES.get(x, x), SURFACE_AXES.get(y, y)
    title = "Brier score on held-out plate appearances (lower is better)"
    subtitle = f"Ring: the optimum ({x_title} {best[x]:.3g}, {y_title} {best[y]:.3g})"
    if held:
        subtitle += f"; {held} held at the optimum"
    # ordinal axes: the grid is the set of values tried, shown as even cells
    heat = (
        alt.Chart(rows)
        .mark_rect()
        .encode(
            x=alt.X(f"{x}:O", title=x_title, axis=alt.Axis(format="~g", labelAngle=0, values=x_ticks, grid=False)),
            y=alt.Y(f"{y}:O", title=y_title, sort="descending", axis=alt.Axis(format="~g", values=y_ticks, grid=False)),
            color=alt.Color(
                "brier:Q",
                title="Brier score",
                scale=alt.Scale(range=list(reversed(SHARE_RAMP)), zero=False),
                legend=alt.Legend(format=".4f", orient="right"),
            ),
            tooltip=[
                alt.Tooltip(f"{x}:Q", title=x_title, format="~g"),
                alt.Tooltip(f"{y}:Q", title=y_title, format="~g"),
                alt.Tooltip("brier:Q", title="Brier score", format=".5f"),
            ],
        )
    )
    ring = (
        alt.Chart(marker)
        .mark_point(shape="circle", size=260, strokeWidth=3, color=WARNING, filled=False)
        .encode(x=alt.X(f"{x}:O"), y=alt.Y(f"{y}:O", sort="descending"))
    )
    # a white halo under the ring keeps it visible on the darkest cells
    halo = (
        alt.Chart(marker)
        .mark_point(shape="circle", size=260, strokeWidth=6, color="white", filled=False)
        .encode(x=alt.X(f"{x}:O"), y=alt.Y(f"{y}:O", sort="descending"))
    )
    chart = alt.layer(heat, halo, ring).properties(
        width=width, height=height, title=alt.Title(title, subtitle=subtitle, subtitleColor=MUTED)
    )
    return style(chart)


def pending_chart(message: str, *, width: int = 320, height: int = 60) -> alt.Chart:
    """A chart that only says what to do first (shown before a panel has results).

    Examples
    --------
    >>> pending_chart("Click fit.").to_dict()["mark"]["type"]
    'text'
    """
    return style(
        alt.Chart(pd.DataFrame({"message": [message]}))
        .mark_text(align="left", x=0, y=height / 2, color=MUTED, fontSize=13)
        .encode(text="message:N")
        .properties(width=width, height=height)
    )


def skill_chart(skill: pd.DataFrame, *, width: int = 320) -> alt.LayerChart:
    """Bars of the Brier skill score of the fitted blend over each baseline forecast.

    Parameters
    ----------
    skill : DataFrame
        Columns ``baseline`` (name on screen) and ``skill`` (1 - Brier / Brier of the
        baseline: above 0 means the fitted blend beats that baseline).
    width : int
        Width in pixels.

    Returns
    -------
    alt.LayerChart

    Examples
    --------
    >>> t = pd.DataFrame({"baseline": ["league", "batter only"], "skill": [0.004, 0.01]})
    >>> skill_chart(t).to_dict()["layer"][0]["mark"]["type"]
    'bar'
    """
    require_columns(skill, ["baseline", "skill"], where="skill_chart")
    rows = skill[["baseline", "skill"]].reset_index(drop=True)
    bars = (
        alt.Chart(rows)
        .mark_bar(color=SIDE_COLORS["matchup"], height=16)
        .encode(
            x=alt.X("skill:Q", title="Brier skill over the baseline", axis=alt.Axis(format=".1%")),
            y=alt.Y("baseline:N", title=None, sort=None),
            tooltip=[alt.Tooltip("baseline:N", title="Baseline"), alt.Tooltip("skill:Q", title="Skill", format=".2%")],
        )
    )
    zero = alt.Chart(pd.DataFrame({"skill": [0.0]})).mark_rule(color=MUTED).encode(x="skill:Q")
    return style(alt.layer(bars, zero).properties(width=width, title="Skill of the fitted blend over each baseline"))


def reliability_chart(table: pd.DataFrame, *, columns: int = 3, size: int = 130) -> alt.FacetChart:
    """Reliability diagram per outcome: mean forecast against observed share, by forecast bin.

    Parameters
    ----------
    table : DataFrame
        One row per outcome x bin, as :func:`matchup_widgets.model.reliability_table` returns
        it: ``outcome``, ``mean_predicted`` (mean forecast in the bin), ``observed_rate``
        (share of held-out PAs with that outcome) and ``n_pa`` (PAs in the bin).
    columns : int
        Panels per row.
    size : int
        Width and height of each panel in pixels.

    Returns
    -------
    alt.FacetChart
        One panel per outcome; the dashed diagonal is perfect calibration.

    Examples
    --------
    >>> t = pd.DataFrame({"outcome": ["K", "K"], "mean_predicted": [0.2, 0.3],
    ...                   "observed_rate": [0.21, 0.28], "n_pa": [50, 40]})
    >>> spec = reliability_chart(t).to_dict()
    >>> spec["facet"]["field"], len(spec["spec"]["layer"])
    ('outcome', 3)
    """
    cols = ["outcome", "mean_predicted", "observed_rate", "n_pa"]
    require_columns(table, cols, where="reliability_chart")
    rows = table[cols].rename(columns={"mean_predicted": "predicted", "observed_rate": "observed", "n_pa": "n"})
    rows = rows.reset_index(drop=True)
    rows["outcome"] = rows["outcome"].astype(str)
    order = list(pd.unique(rows["outcome"].to_numpy()))
    base = alt.Chart().encode(x=alt.X("predicted:Q", title="Forecast", axis=alt.Axis(format=".1~%", tickCount=4)))
    diagonal = base.mark_line(color=MUTED, strokeDash=[4, 3]).encode(y=alt.Y("predicted:Q"))
    line = base.mark_line(color=SIDE_COLORS["matchup"], strokeWidth=1.2).encode(
        y=alt.Y("observed:Q", title="Observed", axis=alt.Axis(format=".1~%", tickCount=4))
    )
    points = base.mark_circle(color=SIDE_COLORS["matchup"], opacity=0.9).encode(
        y=alt.Y("observed:Q"),
        size=alt.Size("n:Q", title="PAs in bin", legend=alt.Legend(orient="bottom")),
        tooltip=[
            alt.Tooltip("outcome:N", title="Outcome"),
            alt.Tooltip("predicted:Q", title="Forecast", format=".1%"),
            alt.Tooltip("observed:Q", title="Observed", format=".1%"),
            alt.Tooltip("n:Q", title="PAs"),
        ],
    )
    return style(
        alt.layer(diagonal, line, points, data=rows)
        .properties(width=size, height=size)
        .facet(facet=alt.Facet("outcome:N", title=None, sort=order, header=alt.Header(labelExpr=_outcome_words(order))),
               columns=columns)
        .resolve_scale(x="independent", y="independent")
        .properties(title="Reliability on held-out plate appearances (dashed: forecast = observed)")
    )


def _outcome_words(codes: list[str]) -> str:
    """A Vega expression that shows each outcome code as its words ("GB_OUT" -> "Ground-ball out").

    Examples
    --------
    >>> _outcome_words(["K"])
    "datum.value === 'K' ? 'Strikeout' : datum.value"
    """
    from matchup_widgets.data import OUTCOME_LABELS

    expr = "datum.value"
    for code in reversed(codes):
        word, key = (str(t).replace("\\", "\\\\").replace("'", "\\'") for t in (OUTCOME_LABELS.get(code, code), code))
        expr = f"datum.value === '{key}' ? '{word}' : {expr}"
    return expr


def method_comparison_chart(table: pd.DataFrame, *, value: str = "brier", width: int = 320) -> alt.Chart:
    """Dot plot of a held-out score for each blend method and basis.

    Parameters
    ----------
    table : DataFrame
        Columns ``method``, ``basis`` and ``value`` (default ``brier``; lower is better).
    value : str
        The score column to plot.
    width : int
        Width in pixels.

    Returns
    -------
    alt.Chart
        The x scale does not start at zero, so small differences between methods show.

    Examples
    --------
    >>> t = pd.DataFrame({"method": ["linear", "odds-ratio"], "basis": ["observed"] * 2,
    ...                   "brier": [0.70, 0.69]})
    >>> method_comparison_chart(t).to_dict()["mark"]["type"]
    'point'
    """
    require_columns(table, ["method", "basis", value], where="method_comparison_chart")
    rows = table[["method", "basis", value]].reset_index(drop=True)
    bases = list(pd.unique(rows["basis"].to_numpy()))
    colors = [SIDE_COLORS["matchup"], SIDE_COLORS["batter"], SIDE_COLORS["pitcher"]]
    return style(
        alt.Chart(rows)
        .mark_point(filled=True, size=90)
        .encode(
            x=alt.X(f"{value}:Q", title="Held-out Brier score (lower is better)" if value == "brier" else value,
                    scale=alt.Scale(zero=False), axis=alt.Axis(format=".4f", tickCount=5)),
            y=alt.Y("method:N", title="Blend method", sort=None),
            color=alt.Color("basis:N", title="Basis", scale=alt.Scale(domain=bases, range=colors[: len(bases)])),
            shape=alt.Shape("basis:N", title="Basis", scale=alt.Scale(domain=bases)),
            tooltip=[
                alt.Tooltip("method:N", title="Method"),
                alt.Tooltip("basis:N", title="Basis"),
                alt.Tooltip(f"{value}:Q", title=value, format=".5f"),
            ],
        )
        .properties(width=width, title="Blend methods compared on the same held-out games")
    )
