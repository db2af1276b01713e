"""Chart for the option-ranking panel: candidates ranked by a run value, with interval bars."""

from __future__ import annotations

import altair as alt
import pandas as pd

from ._tables import require_columns
from ._theme import MUTED, SIDE_COLORS, style

_VALUE_TITLES: dict[str, str] = {
    "runs_per_pa": "Run value per PA (runs relative to an average PA)",
    "expected_runs": "Expected runs to the end of the inning",
}


def option_ranking_chart(
    table: pd.DataFrame,
    *,
    value: str = "runs_per_pa",
    side: str = "batter",
    reference: float | None = 0.0,
    width: int = 360,
) -> alt.LayerChart:
    """Candidates ranked by a value, each with its interval, best at the top.

    Two options whose bars overlap heavily are not clearly different on this sample.

    Parameters
    ----------
    table : DataFrame
        One row per candidate: ``name``, ``value``, ``lo``, ``hi`` (interval ends) and
        optionally ``pa`` (the candidate's plate appearances). Rows are drawn in table
        order, so rank them first.
    value : str
        What the value is (``runs_per_pa`` or ``expected_runs``); sets the axis title.
    side : str
        Whose options these are (``batter`` or ``pitcher``); sets the colour.
    reference : float or None
        Draw a rule at this value (0 = an average PA); ``None`` for no rule.
    width : int
        Width in pixels.

    Returns
    -------
    alt.LayerChart

    Examples
    --------
    >>> t = pd.DataFrame({"name": ["A", "B"], "value": [0.03, 0.01],
    ...                   "lo": [0.0, -0.02], "hi": [0.06, 0.04]})
    >>> [layer["mark"]["type"] for layer in option_ranking_chart(t).to_dict()["layer"]]
    ['rule', 'point', 'rule']
    """
    require_columns(table, ["name", "value", "lo", "hi"], where="option_ranking_chart")
    cols = ["name", "value", "lo", "hi"] + (["pa"] if "pa" in table.columns else [])
    rows = table[cols].reset_index(drop=True)
    order = rows["name"].astype(str).tolist()
    color = SIDE_COLORS.get(side, SIDE_COLORS["matchup"])
    title = _VALUE_TITLES.get(value, value)
    y = alt.Y("name:N", title=None, sort=order)
    tips = [
        alt.Tooltip("name:N", title="Option"),
        alt.Tooltip("value:Q", title="Estimate", format="+.3f"),
        alt.Tooltip("lo:Q", title="Interval low", format="+.3f"),
        alt.Tooltip("hi:Q", title="Interval high", format="+.3f"),
    ] + ([alt.Tooltip("pa:Q", title="PA")] if "pa" in rows.columns else [])
    bars = alt.Chart(rows).mark_rule(color=color, strokeWidth=3, opacity=0.55).encode(
        x=alt.X("lo:Q", title=title, scale=alt.Scale(zero=False), axis=alt.Axis(tickCount=6)), x2="hi:Q", y=y, tooltip=tips
    )
    dots = alt.Chart(rows).mark_point(filled=True, size=80, color=color).encode(
        x=alt.X("value:Q"), y=y, tooltip=tips
    )
    layers = [bars, dots]
    if reference is not None:
        layers.append(
            alt.Chart(pd.DataFrame({"ref": [reference]})).mark_rule(color=MUTED, strokeDash=[4, 3]).encode(x="ref:Q")
        )
    chart = alt.layer(*layers).properties(
        width=width, height=max(60, 26 * len(rows)), title="Options ranked (bars: interval)"
    )
    return style(chart)
