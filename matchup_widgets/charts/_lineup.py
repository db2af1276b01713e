"""Chart for the lineup panel: the distribution of runs scored in an inning."""

from __future__ import annotations

import altair as alt
import pandas as pd

from ._tables import require_columns
from ._theme import PERCENT_AXIS, PERCENT_TIP, SIDE_COLORS, style


def lineup_runs_chart(table: pd.DataFrame, *, width: int = 360, height: int = 200) -> alt.Chart:
    """Bars of the probability of scoring each number of runs in an inning, per lineup.

    Parameters
    ----------
    table : DataFrame
        One row per lineup x runs: ``lineup`` (name on screen, e.g. "Current order"),
        ``runs`` (label such as ``"0"``, ``"1"``, ..., ``"5+"``) and ``probability``.
        Lineups and runs are drawn in table order.
    width, height : int
        Size in pixels.

    Returns
    -------
    alt.Chart
        Grouped bars, one colour per lineup.

    Examples
    --------
    >>> t = pd.DataFrame({"lineup": ["Current"] * 3, "runs": ["0", "1", "2+"],
    ...                   "probability": [0.7, 0.15, 0.15]})
    >>> lineup_runs_chart(t).to_dict()["mark"]["type"]
    'bar'
    """
    require_columns(table, ["lineup", "runs", "probability"], where="lineup_runs_chart")
    rows = table[["lineup", "runs", "probability"]].reset_index(drop=True)
    rows["runs"] = rows["runs"].astype(str)
    lineups = list(pd.unique(rows["lineup"].to_numpy()))
    runs_order = list(pd.unique(rows["runs"].to_numpy()))
    colors = [SIDE_COLORS["matchup"], SIDE_COLORS["batter"], SIDE_COLORS["pitcher"], SIDE_COLORS["league"]]
    return style(
        alt.Chart(rows)
        .mark_bar()
        .encode(
            x=alt.X("runs:N", title="Runs in the inning", sort=runs_order, axis=alt.Axis(labelAngle=0)),
            xOffset=alt.XOffset("lineup:N", sort=lineups),
            y=alt.Y("probability:Q", title="Share of innings", axis=alt.Axis(format=PERCENT_AXIS)),
            color=alt.Color(
                "lineup:N",
                title=None,
                sort=lineups,
                scale=alt.Scale(domain=lineups, range=(colors * 3)[: len(lineups)]),
            ),
            tooltip=[
                alt.Tooltip("lineup:N", title="Lineup"),
                alt.Tooltip("runs:N", title="Runs"),
                alt.Tooltip("probability:Q", title="Share", format=PERCENT_TIP),
            ],
        )
        .properties(width=width, height=height, title="Runs per inning against this pitcher")
    )
