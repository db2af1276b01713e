"""The option-ranking panel: one pitcher against a bench of batters, or one batter against
candidate relievers, ranked by run value with intervals.

Every figure comes from :meth:`MatchupModel.predict` and
:func:`matchup_widgets.model.run_value_interval`; the panel sorts and draws.
"""

from __future__ import annotations

import html
from typing import Any

import ipywidgets as W
import pandas as pd

from matchup_widgets.charts import option_ranking_chart
from matchup_widgets.charts._calibration import pending_chart
from matchup_widgets.export import _settings_line, csv_links_html, write_tables

from ._common import (
    Coalescer,
    DataPanel,
    StatusLine,
    guarded,
    label_style,
    live_chart,
    section,
    set_chart,
)
from ._picker import PlayerPicker, player_options
from ._tables import _runs, caution_html

#: The two ways to compare: (words on screen, role of the fixed player).
MODES: tuple[tuple[str, str], ...] = (
    ("Batters against one pitcher (bench)", "pitcher"),
    ("Pitchers against one batter (relievers)", "batter"),
)
_OTHER = {"pitcher": "batter", "batter": "pitcher"}


#: Value of the "Rank by" control meaning run value per PA (the others index the 24 states).
PER_PA = -1


def _state_choices() -> list[tuple[str, int]]:
    from matchup_widgets.runs import STATES

    # a None value would show as an empty dropdown in the browser: -1 stands for "per PA"
    return [("Per plate appearance (run value)", PER_PA)] + [
        (f"From {label}: expected runs", i) for i, label in enumerate(STATES[:24])
    ]


class OptionRanking(DataPanel):
    """Rank candidate batters against one pitcher (or pitchers against one batter) by run value.

    Parameters
    ----------
    pas : PlateAppearances
        Loaded plate appearances.
    model : MatchupModel, optional
        Fitted or not; its settings are used (change them with :meth:`apply_settings`).
    mode : {"pitcher", "batter"}
        Whose side is fixed: ``"pitcher"`` ranks batters against one pitcher.
    fixed : str, optional
        The fixed player (id or name); default the one with the most plate appearances.
    candidates : list of str, optional
        Candidate ids or names; default the four with the most plate appearances.
    """

    def __init__(
        self,
        pas: Any,
        *,
        model: Any = None,
        mode: str = "pitcher",
        fixed: str | None = None,
        candidates: list[str] | None = None,
    ) -> None:
        from matchup_widgets.model import MatchupModel

        if mode not in _OTHER:
            msg = f"mode must be 'pitcher' (rank batters against one pitcher) or 'batter'; got {mode!r}."
            raise ValueError(msg)
        self.pas = pas
        model = MatchupModel() if model is None else model
        self.model = model if hasattr(model, "batter_counts_") else model.fit(pas)
        self.ranking: pd.DataFrame = pd.DataFrame()
        self.status = StatusLine()

        self.mode = W.ToggleButtons(options=MODES, value=mode, description="Compare",
                                    style={"description_width": "110px", "button_width": "260px"})
        self.pickers = {role: PlayerPicker(pas, role=role, status=self.status) for role in ("pitcher", "batter")}
        self.fixed_box = W.VBox([self.pickers[mode].widget])
        self.candidates = W.SelectMultiple(options=[], rows=10, description="Candidates", style=label_style(),
                                           layout=W.Layout(width="100%"))
        self.candidates.add_class("mw-candidates")
        self.state = W.Dropdown(options=_state_choices(), value=PER_PA, description="Rank by", style=label_style(),
                                layout=W.Layout(width="100%"))
        self.settings_note = W.HTML()
        self.table = W.HTML()
        self.table.add_class("mw-option-table")
        self.chart = live_chart(option_ranking_chart(pd.DataFrame({"name": [], "value": [], "lo": [], "hi": []})))
        self.chart.add_class("mw-option-chart")
        self.csv_button = W.Button(description="CSV of the numbers", layout=W.Layout(width="180px"))
        self.downloads = W.HTML()

        self._fill_candidates(_OTHER[mode], candidates)
        if fixed is not None:
            self.pickers[mode].select(fixed)

        self._refresh_guarded = guarded(self.status, "Could not rank the options")(self._refresh)
        self._coalescer = Coalescer(self._refresh_guarded)
        self.mode.observe(guarded(self.status, "Could not switch")(self._on_mode), names="value")
        for widget in (self.candidates, self.state, self.pickers["pitcher"].pick, self.pickers["batter"].pick):
            widget.observe(self._coalescer.request, names="value")
        self.csv_button.on_click(guarded(self.status, "Could not prepare the CSV files")(self._on_csv))

        self.caution = W.HTML(caution_html())
        self.widget = W.VBox(
            [
                section("Who is fixed", self.mode, self.fixed_box),
                section("Options to compare", self.candidates,
                        note="Hold Ctrl (Cmd on a Mac) or Shift to choose several."),
                section("Measure", self.state),
                self.status.widget,
                self.settings_note,
                self.chart,
                self.table,
                W.HBox([self.csv_button, self.downloads]),
                self.caution,
            ],
            layout=W.Layout(width="760px"),
        )
        self.widget.add_class("mw-option-ranking")
        self._coalescer.request()

    # -- public ------------------------------------------------------------------------
    @property
    def fixed_role(self) -> str:
        return self.mode.value

    def apply_settings(self, **settings: Any) -> None:
        """Use other model settings (e.g. those the calibration panel fitted), then re-rank."""
        self.model = self.model.with_settings(**settings)
        self._coalescer.request()

    def set_candidates(self, players: list[str]) -> None:
        """Choose the candidates by id or name."""
        from matchup_widgets.data import resolve_player

        role = _OTHER[self.fixed_role]
        ids = [resolve_player(self.pas, q, role=role) for q in players]
        self._fill_candidates(role, ids)

    def rank(self) -> pd.DataFrame:
        """Rank the chosen candidates; one row each, best first.

        Returns
        -------
        DataFrame
            ``rank``, ``player_id``, ``name``, ``split``, ``pa`` (the candidate's PAs in the
            split), ``value``, ``lo``, ``hi`` (interval), ``measure``, ``state``,
            ``overlaps_best`` (the interval reaches the best option's: not clearly worse).
        """
        from matchup_widgets.model import run_value_interval

        fixed = self.pickers[self.fixed_role].value
        ids = list(self.candidates.value)
        if fixed is None or not ids:
            return pd.DataFrame()
        state = int(self.state.value)
        outs, bases = (None, None) if state == PER_PA else divmod(state, 8)  # index = 8 * outs + bases
        rows = []
        for cid in ids:  # a handful of candidates, each one predict
            batter, pitcher = (cid, fixed) if self.fixed_role == "pitcher" else (fixed, cid)
            est = self.model.predict(batter, pitcher)
            rv = run_value_interval(est, outs=outs, bases=bases)
            rows.append(
                {
                    "player_id": cid,
                    "name": est.batter_name if self.fixed_role == "pitcher" else est.pitcher_name,
                    "split": est.split,
                    "pa": est.pa["batter" if self.fixed_role == "pitcher" else "pitcher"],
                    "value": rv["value"],
                    "lo": rv["lo"],
                    "hi": rv["hi"],
                    "interval": rv["interval"],
                    "measure": rv["measure"],
                    "state": rv["state"],
                }
            )
        table = pd.DataFrame(rows)
        # a batter is better with more runs; a pitcher is better with fewer
        table = table.sort_values("value", ascending=self.fixed_role == "batter", kind="stable").reset_index(drop=True)
        best = table.iloc[0]
        table["overlaps_best"] = (table["hi"] >= best["lo"]) & (table["lo"] <= best["hi"])
        table.insert(0, "rank", range(1, len(table) + 1))
        return table

    def tables(self) -> dict[str, pd.DataFrame]:
        """The numbers behind the chart (the ranking as last drawn)."""
        return {"ranking": self.ranking.copy()}

    def write_csv(self, folder: str) -> list:
        """Write :meth:`tables` as CSV files into ``folder``; return the paths."""
        return write_tables(self.tables(), folder, prefix="options_")

    # -- internals ----------------------------------------------------------------------
    def _fill_candidates(self, role: str, chosen: list[str] | None) -> None:
        players = self.pas.players
        rows = players[players["role"] == role].sort_values("pa", ascending=False, kind="stable")
        options = player_options(rows, role=role)
        ids = [v for _, v in options]
        if chosen is None:
            chosen = ids[:4]
        else:
            from matchup_widgets.data import resolve_player

            chosen = [resolve_player(self.pas, q, role=role) for q in chosen]
        with self._paused():
            self.candidates.options = options
            self.candidates.value = tuple(c for c in chosen if c in ids)

    def _paused(self):
        coalescer = getattr(self, "_coalescer", None)
        if coalescer is None:
            import contextlib

            return contextlib.nullcontext()
        return coalescer.paused()

    def _on_mode(self, change: dict) -> None:
        role = change["new"]
        with self._paused():
            self.fixed_box.children = [self.pickers[role].widget]
            self._fill_candidates(_OTHER[role], None)

    def _on_csv(self, _button: Any = None) -> None:
        self.downloads.value = csv_links_html(self.tables(), prefix="options_")

    def _refresh(self, _change: Any = None) -> None:
        self.status.clear()
        table = self.rank()
        self.ranking = table
        s = self.model.get_params()
        # the same words as the card: each method with the weights it really uses
        self.settings_note.value = (
            f'<div style="font-size:12px">{html.escape(_settings_line(s))}; bars show '
            f'{s["interval"]:.0%} intervals.</div>'
        )
        if table.empty:
            message = "Choose a fixed player and at least one option."
            self.table.value = f"<i>{message}</i>"
            set_chart(self.chart, pending_chart(message))  # not the last ranking, which no longer holds
            return
        side = _OTHER[self.fixed_role]
        measure = table["measure"].iloc[0]
        set_chart(
            self.chart,
            option_ranking_chart(table, value=measure, side=side, reference=0.0 if measure == "runs_per_pa" else None),
        )
        self.table.value = _ranking_html(table, side=side)


def _ranking_html(table: pd.DataFrame, *, side: str) -> str:
    """The ranking as a small HTML table with a plain-words reading of the overlaps."""
    unit = "runs per PA vs average" if table["measure"].iloc[0] == "runs_per_pa" else f"expected runs ({table['state'].iloc[0]})"
    head = "".join(f"<th style='padding:2px 8px;text-align:left'>{h}</th>"
                   for h in ("#", side.capitalize(), "Split", "PA", unit, "Interval", "Clear of the best?"))
    body = []
    for r in table.itertuples(index=False):
        clear = "best" if r.rank == 1 else ("no: intervals overlap" if r.overlaps_best else "yes")
        body.append(
            "<tr>"
            f"<td style='padding:2px 8px'>{r.rank}</td><td style='padding:2px 8px'>{html.escape(str(r.name))}</td>"
            f"<td style='padding:2px 8px'>{html.escape(str(r.split))}</td><td style='padding:2px 8px'>{r.pa:,.0f}</td>"
            f"<td style='padding:2px 8px'>{_runs(r.value)}</td>"
            f"<td style='padding:2px 8px'>{_runs(r.lo)} to {_runs(r.hi)}</td><td style='padding:2px 8px'>{clear}</td>"
            "</tr>"
        )
    n_close = int(table["overlaps_best"].sum()) - 1
    note = (
        f"{n_close} option(s) cannot be told apart from the best on this sample (their intervals overlap)."
        if n_close > 0
        else "The best option's interval is clear of every other option's."
    )
    return (
        f"<table style='border-collapse:collapse;font-size:13px'><tr>{head}</tr>{''.join(body)}</table>"
        f"<div style='font-size:12px;margin-top:4px'>{html.escape(note)}</div>"
    )
