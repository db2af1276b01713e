"""The lineup panel: nine batters in order against one pitcher, runs per 9 innings exactly,
the runs-per-inning distribution, and what swapping one batter is worth.

Each slot's outcome distribution is :meth:`MatchupModel.predict` against the pitcher; the
runs come from :func:`matchup_widgets.runs.lineup_runs` (the exact Markov chain over base-out
state and lineup slot).
"""

from __future__ import annotations

import html
from typing import Any

import ipywidgets as W
import numpy as np
import pandas as pd

from matchup_widgets.charts import lineup_runs_chart
from matchup_widgets.export import csv_links_html, write_tables

from ._common import (
    Coalescer,
    DataPanel,
    StatusLine,
    guarded,
    live_chart,
    section,
    set_chart,
)
from ._picker import PlayerPicker, player_options
from ._tables import _runs, caution_html

#: Rule of thumb: about ten runs of run differential make one win (common practice).
RUNS_PER_WIN: float = 10.0
#: Games in a regular season (common practice for the major-league schedule).
GAMES_PER_SEASON: int = 162
#: Last bin of the runs-per-inning chart ("6+").
MAX_RUNS_SHOWN: int = 6


def wins_per_season(runs_per_game: float, *, games: int = GAMES_PER_SEASON, runs_per_win: float = RUNS_PER_WIN) -> float:
    """Turn a change in runs per game into wins per season by the ~10 runs per win rule of thumb.

    Examples
    --------
    >>> round(wins_per_season(0.05), 3)  # 0.05 runs a game over 162 games is 8.1 runs
    0.81
    """
    return float(runs_per_game) * games / runs_per_win


class LineupPanel(DataPanel):
    """Nine batters against one pitcher: exact runs per 9, runs per inning, and a swap.

    Parameters
    ----------
    pas : PlateAppearances
        Loaded plate appearances.
    model : MatchupModel, optional
        Fitted or not; its settings are used (change them with :meth:`apply_settings`).
    pitcher : str, optional
        The pitcher (id or name); default the one with the most plate appearances.
    order : list of 9 str, optional
        Batting order (ids or names); default the nine batters with the most PAs.
    """

    def __init__(self, pas: Any, *, model: Any = None, pitcher: str | None = None,
                 order: list[str] | None = None) -> None:
        from matchup_widgets.model import MatchupModel

        self.pas = pas
        model = MatchupModel() if model is None else model
        self.model = model if hasattr(model, "batter_counts_") else model.fit(pas)
        self.status = StatusLine()
        self.result: dict[str, Any] = {}
        self._estimates: dict[tuple[str, str], Any] = {}  # (batter, pitcher) -> estimate, current settings

        batters = pas.players[pas.players["role"] == "batter"].sort_values("pa", ascending=False, kind="stable")
        options = player_options(batters, role="batter")
        ids = [v for _, v in options]
        if order is None:
            order = ids[:9]
        if len(order) != 9:
            msg = f"order must name nine batters, one per lineup slot; got {len(order)}."
            raise ValueError(msg)
        from matchup_widgets.data import resolve_player

        order = [resolve_player(pas, q, role="batter") for q in order]
        self.pitcher_picker = PlayerPicker(pas, role="pitcher", status=self.status)
        if pitcher is not None:
            self.pitcher_picker.select(pitcher)
        self.slots = [
            W.Dropdown(options=options, value=bid, description=f"{i + 1}.", style={"description_width": "24px"},
                       layout=W.Layout(width="100%"))
            for i, bid in enumerate(order)
        ]
        for i, slot in enumerate(self.slots):
            slot.add_class(f"mw-slot-{i + 1}")
        bench = [b for b in ids if b not in order]
        # -1 means no swap (a None value would show as an empty dropdown in the browser)
        self.swap_slot = W.Dropdown(options=[("No swap", -1)] + [(f"Slot {i + 1}", i) for i in range(9)],
                                    value=-1, description="Swap out", style={"description_width": "80px"})
        self.swap_in = W.Dropdown(options=options, value=(bench or ids)[0], description="Bring in",
                                  style={"description_width": "80px"}, layout=W.Layout(width="100%"))
        self.headline = W.HTML()
        self.headline.add_class("mw-lineup-headline")
        self.slot_table = W.HTML()
        self.chart = live_chart(lineup_runs_chart(pd.DataFrame({"lineup": [], "runs": [], "probability": []})))
        self.chart.add_class("mw-lineup-runs")
        self.csv_button = W.Button(description="CSV of the numbers", layout=W.Layout(width="180px"))
        self.downloads = W.HTML()

        self._coalescer = Coalescer(guarded(self.status, "Could not compute the lineup")(self._refresh))
        for w in [*self.slots, self.swap_slot, self.swap_in, self.pitcher_picker.pick]:
            w.observe(self._coalescer.request, names="value")
        self.csv_button.on_click(guarded(self.status, "Could not prepare the CSV files")(self._on_csv))

        self.caution = W.HTML(caution_html())
        self.widget = W.VBox(
            [
                W.HBox(
                    [
                        W.VBox(
                            [
                                section("Pitcher", self.pitcher_picker.widget),
                                section("Batting order", *self.slots),
                                section("Swap one batter", self.swap_slot, self.swap_in),
                            ],
                            layout=W.Layout(width="360px", padding="0 16px 0 0"),
                        ),
                        W.VBox([self.status.widget, self.headline, self.chart, self.slot_table],
                               layout=W.Layout(width="560px")),
                    ]
                ),
                W.HBox([self.csv_button, self.downloads]),
                self.caution,
            ]
        )
        self.widget.add_class("mw-lineup")
        self._coalescer.request()

    # -- public ------------------------------------------------------------------------
    @property
    def order(self) -> list[str]:
        """Batter ids in batting order."""
        return [s.value for s in self.slots]

    @property
    def swapped_order(self) -> list[str] | None:
        """The order with the swap made, or None without a swap."""
        if self.swap_slot.value < 0:
            return None
        order = self.order
        order[self.swap_slot.value] = self.swap_in.value
        return order

    def apply_settings(self, **settings: Any) -> None:
        """Use other model settings (e.g. those the calibration panel fitted), then recompute."""
        self.model = self.model.with_settings(**settings)
        self._estimates.clear()
        self._coalescer.request()

    def evaluate(self, order: list[str]) -> dict[str, Any]:
        """Runs for ``order`` against the chosen pitcher.

        Returns
        -------
        dict
            ``estimates`` (one per slot), ``lineup`` (:class:`matchup_widgets.runs.LineupRuns`,
            last runs bin ``MAX_RUNS_SHOWN`` or more).
        """
        from matchup_widgets.runs import lineup_runs

        pitcher = self.pitcher_picker.value
        for b in order:  # a swap or a new slot predicts one batter; the others are kept
            if (b, pitcher) not in self._estimates:
                self._estimates[(b, pitcher)] = self.model.predict(b, pitcher)
        estimates = [self._estimates[(b, pitcher)] for b in order]
        probs = np.vstack([e.probabilities.to_numpy(dtype=float) for e in estimates])
        return {"estimates": estimates, "lineup": lineup_runs(probs, max_runs=MAX_RUNS_SHOWN)}

    def tables(self) -> dict[str, pd.DataFrame]:
        """The numbers behind the panel: slots, runs-per-inning distribution, and the summary."""
        if not self.result:
            return {}
        return {k: v.copy() for k, v in self.result["tables"].items()}

    def write_csv(self, folder: str) -> list:
        """Write :meth:`tables` as CSV files into ``folder``; return the paths."""
        return write_tables(self.tables(), folder, prefix="lineup_")

    # -- internals ----------------------------------------------------------------------
    def _on_csv(self, _button: Any = None) -> None:
        self.downloads.value = csv_links_html(self.tables(), prefix="lineup_")

    def _refresh(self, _change: Any = None) -> None:
        self.status.clear()
        current = self.evaluate(self.order)
        swapped_order = self.swapped_order
        swapped = self.evaluate(swapped_order) if swapped_order is not None else None
        r9 = current["lineup"].runs_per_9
        labels = [str(k) for k in range(MAX_RUNS_SHOWN)] + [f"{MAX_RUNS_SHOWN}+"]
        dist = [pd.DataFrame({"lineup": "Current order", "runs": labels,
                              "probability": current["lineup"].runs_distribution})]
        summary = {"pitcher_id": self.pitcher_picker.value, "runs_per_9": r9}
        words = [f"<b>{r9:.2f} runs per 9 innings</b> expected for this order against "
                 f"{html.escape(current['estimates'][0].pitcher_name)} (exact, base-out Markov chain)."]
        if swapped is not None:
            s9 = swapped["lineup"].runs_per_9
            change = s9 - r9
            wins = wins_per_season(change)
            slot = self.swap_slot.value
            out_name = current["estimates"][slot].batter_name
            in_name = swapped["estimates"][slot].batter_name
            dist.append(pd.DataFrame({"lineup": f"With {in_name} for {out_name}", "runs": labels,
                                      "probability": swapped["lineup"].runs_distribution}))
            summary |= {"swap_slot": slot + 1, "swap_out": out_name, "swap_in": in_name,
                        "swapped_runs_per_9": s9, "change_runs_per_game": change,
                        "change_wins_per_season": wins}
            words.append(
                f"Swapping in {html.escape(in_name)} for {html.escape(out_name)} (slot {slot + 1}): "
                f"<b>{s9:.2f}</b> runs per 9, a change of <b>{_runs(change)} runs per game</b>, about "
                f"<b>{wins:+.2f} wins per season</b> if every game were against this pitcher "
                f"(rule of thumb: ~{RUNS_PER_WIN:g} runs per win over {GAMES_PER_SEASON} games)."
            )
        slots = pd.DataFrame(
            {
                "slot": range(1, 10),
                "batter_id": self.order,
                "batter": [e.batter_name for e in current["estimates"]],
                "split": [e.split for e in current["estimates"]],
                "batter_pa": [e.pa["batter"] for e in current["estimates"]],
                "runs_per_pa": [e.runs_per_pa for e in current["estimates"]],
                "pa_per_9": current["lineup"].pa_by_slot,
            }
        )
        distribution = pd.concat(dist, ignore_index=True)
        self.result = {"current": current, "swapped": swapped,
                       "tables": {"slots": slots, "runs_per_inning": distribution,
                                  "summary": pd.DataFrame([summary])}}
        self.headline.value = "<div style='font-size:14px;line-height:1.5'>" + "<br>".join(words) + "</div>"
        set_chart(self.chart, lineup_runs_chart(distribution))
        self.slot_table.value = _slots_html(slots)


def _slots_html(slots: pd.DataFrame) -> str:
    # headers wrap (the table's nowrap cut "PA per 9 innings" off at the panel's edge); cells do not
    head = "".join(f"<th style='padding:2px 8px;text-align:left;white-space:normal;vertical-align:bottom'>{h}</th>"
                   for h in ("#", "Batter", "Split", "PA in split", "Runs per PA vs average", "PA per 9 innings"))
    rows = "".join(
        f"<tr><td style='padding:2px 8px'>{r.slot}</td><td style='padding:2px 8px'>{html.escape(r.batter)}</td>"
        f"<td style='padding:2px 8px'>{html.escape(r.split)}</td><td style='padding:2px 8px'>{r.batter_pa:,.0f}</td>"
        f"<td style='padding:2px 8px'>{_runs(r.runs_per_pa)}</td><td style='padding:2px 8px'>{r.pa_per_9:.2f}</td></tr>"
        for r in slots.itertuples(index=False)
    )
    return f"<table style='border-collapse:collapse;font-size:13px;white-space:nowrap'><tr>{head}</tr>{rows}</table>"
