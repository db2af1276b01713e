"""The calibration panel: fit the blend's settings on held-out games and push them to the explorer.

The fit itself is :func:`matchup_widgets.model.calibrate`; this panel only collects its
options, runs it on a button click (with tqdm's notebook bar), and draws what it returns.
"""

from __future__ import annotations

import html
from typing import Any

import ipywidgets as W
import pandas as pd

from matchup_widgets.charts import (
    brier_surface_chart,
    method_comparison_chart,
    reliability_chart,
    skill_chart,
)
from matchup_widgets.charts._calibration import pending_chart
from matchup_widgets.export import csv_links_html, write_tables

from ._common import (
    DataPanel,
    StatusLine,
    guarded,
    label_style,
    live_chart,
    section,
    set_chart,
)
from ._tables import caution_html

#: Words on screen for the calibration baselines.
BASELINE_LABELS: dict[str, str] = {
    "league": "League (same split)",
    "batter_only": "Batter only",
    "pitcher_only": "Pitcher only",
    "even_blend": "Even blend (0.5)",
}

_SURFACE_Y = {"Batter prior (PA)": "batter_prior_pa", "Pitcher prior (PA)": "pitcher_prior_pa"}


class CalibrationLab(DataPanel):
    """Fit pitcher weight and prior sizes on held-out games; show the evidence; apply them.

    Parameters
    ----------
    pas : PlateAppearances
        The loaded table (``matchup_widgets.data.load_pas``).
    explorer : MatchupExplorer, optional
        Receives the chosen settings through its ``apply_calibration`` method (or any
        object with ``apply_settings(**settings)``).
    holdout_share : float, default 0.25
        Initial share of whole games held out for scoring.
    seed : int, default 0
        Initial seed of the game split.
    progress : bool, default True
        Show tqdm's bar while fitting (off in tests).
    **calibrate_options
        Passed to :func:`matchup_widgets.model.calibrate` unchanged (``priors``,
        ``weights``, ``n_boot``, ...), e.g. a smaller grid for a quick notebook.

    Attributes
    ----------
    result_ : CalibrationResult or None
        The last fit on the selected basis.
    results_ : dict of str to CalibrationResult
        Every basis fitted by the last click (the selected one first).
    """

    def __init__(
        self,
        pas: Any,
        *,
        explorer: Any = None,
        holdout_share: float = 0.25,
        seed: int = 0,
        progress: bool = True,
        **calibrate_options: Any,
    ) -> None:
        self.pas = pas
        self.explorer = explorer
        self.progress = progress
        self.calibrate_options = dict(calibrate_options)
        self.result_ = None
        self.results_: dict[str, Any] = {}
        self.targets: list[Any] = []  # other panels with apply_settings(**settings)
        has_contact = "exit_velo" in getattr(pas, "frame", pd.DataFrame()).columns

        self.status = StatusLine()
        self.holdout = W.FloatSlider(
            value=holdout_share, min=0.1, max=0.5, step=0.05, description="Held-out share",
            continuous_update=False, style=label_style(), readout_format=".0%",
        )
        self.seed = W.BoundedIntText(value=seed, min=0, max=10_000, description="Split seed", style=label_style())
        self.basis = W.Dropdown(
            options=[("Observed outcomes", "observed")] + ([("Contact-expected", "contact")] if has_contact else []),
            value="observed", description="Basis", style=label_style(),
        )
        self.compare_bases = W.Checkbox(
            value=False, description="Also fit the other basis for the method comparison (slower: 10-30 s)",
            disabled=not has_contact,
            indent=False,
            layout=W.Layout(width="auto"),  # the default width cut the words off mid-sentence
        )
        self.fit_button = W.Button(description="Fit on held-out games", button_style="primary",
                                   layout=W.Layout(width="220px"))
        self.fit_button.add_class("mw-fit")
        self.progress_out = W.Output()
        self.summary = W.HTML()
        self.summary.add_class("mw-fit-summary")
        self.surface_y = W.ToggleButtons(options=list(_SURFACE_Y), value="Batter prior (PA)", description="Rows")
        self.send_method = W.Dropdown(
            options=[("Weighted mix of rates (fitted weight and priors)", "linear"),
                     ("Two-stage (fitted weight per stage and priors)", "two-stage"),
                     ("Odds ratio (fitted priors)", "odds-ratio")],
            value="linear", description="Send", style=label_style(), layout=W.Layout(width="420px"),
        )
        self.apply_button = W.Button(description="Use these settings in the explorer", disabled=True,
                                     layout=W.Layout(width="280px"))
        self.apply_button.add_class("mw-apply-settings")
        self.applied = W.HTML()
        self.applied.add_class("mw-applied")
        self.downloads = W.HTML()
        self.csv_button = W.Button(description="CSV of the numbers", disabled=True, layout=W.Layout(width="180px"))
        self.csv_button.on_click(guarded(self.status, "Could not prepare the CSV files")(self._on_csv))

        # before the first fit each chart says what will fill it, instead of empty axes and legends
        self.surface_chart = live_chart(pending_chart("Click 'Fit on held-out games' to draw the Brier surface."))
        self.surface_chart.add_class("mw-brier-surface")
        self.skill_chart = live_chart(pending_chart("The skill over each simple forecast shows here after a fit."))
        self.methods_chart = live_chart(pending_chart("The blend methods' held-out Brier scores show here after a fit."))
        self.reliability_chart = live_chart(pending_chart("Forecast against observed share, per outcome, after a fit."))

        self.fit_button.on_click(guarded(self.status, "Fit failed")(self._on_fit))
        self.apply_button.on_click(guarded(self.status, "Could not apply the settings")(self._on_apply))
        self.surface_y.observe(guarded(self.status, "Could not redraw")(self._redraw_surface), names="value")

        self.caution = W.HTML(caution_html())
        self.widget = W.VBox(
            [
                section(
                    "Fit settings on held-out games",
                    W.HBox([self.holdout, self.seed]),
                    W.HBox([self.basis, self.compare_bases]),
                    self.fit_button,
                    self.progress_out,
                    note="Whole games are held out, the blend is fitted on the rest, and each setting is "
                    "scored by its Brier score on the held-out plate appearances.",
                ),
                self.status.widget,
                self.summary,
                section("Brier surface", self.surface_y, self.surface_chart),
                section("Skill over simple forecasts", self.skill_chart),
                section("Blend methods compared", self.methods_chart),
                section("Reliability per outcome", self.reliability_chart),
                section("Use the fitted settings", self.send_method, W.HBox([self.apply_button, self.applied]),
                        note="The weighted mix is fitted in closed form; the two-stage blend fits one weight per "
                        "stage; the odds-ratio blend has no weight, only its best prior sizes. "
                        "Compare their Brier scores above."),
                W.HBox([self.csv_button, self.downloads]),
                self.caution,
            ]
        )
        self.widget.add_class("mw-calibration-lab")

    # -- actions ------------------------------------------------------------------------
    def fit(self) -> Any:
        """Run the calibration with the panel's options, update every chart, return the result."""
        from matchup_widgets.model import calibrate

        selected = self.basis.value
        bases = [selected]
        if self.compare_bases.value and not self.compare_bases.disabled:
            bases += [b for b in ("observed", "contact") if b != selected]
        self.status.clear()
        self.fit_button.disabled = True
        try:
            results = {}
            self.progress_out.clear_output()
            with self.progress_out:
                for basis in bases:
                    results[basis] = calibrate(
                        self.pas,
                        holdout_share=float(self.holdout.value),
                        seed=int(self.seed.value),
                        basis=basis,
                        progress=self.progress,
                        **self.calibrate_options,
                    )
        finally:
            self.fit_button.disabled = False
        self.results_ = results
        self.result_ = results[selected]
        self._show_result()
        return self.result_

    def settings(self, method: str | None = None) -> dict[str, Any]:
        """The settings the last fit chose for ``method`` (default: the "Send" choice).

        ``linear``: the fitted pitcher weight and prior sizes; ``two-stage``: that blend's
        fitted ``first_weight``, ``in_play_weight`` and prior sizes
        (``CalibrationResult.model_settings("two-stage")``); ``odds-ratio``: that method's
        best prior sizes from the method comparison. The linear weight is kept for reference.
        """
        if self.result_ is None:
            msg = "no fit yet: click 'Fit on held-out games' (or call fit()) first."
            raise RuntimeError(msg)
        r = self.result_
        method = self.send_method.value if method is None else method
        out = {
            "method": "linear",
            "pitcher_weight": float(r.pitcher_weight),
            "batter_prior_pa": float(r.batter_prior_pa),
            "pitcher_prior_pa": float(r.pitcher_prior_pa),
            "basis": r.basis,
        }
        if method == "odds-ratio":
            row = r.methods.set_index("method").loc["odds-ratio"]
            out |= {"method": "odds-ratio", "batter_prior_pa": float(row["batter_prior_pa"]),
                    "pitcher_prior_pa": float(row["pitcher_prior_pa"])}
        elif method == "two-stage":
            fitted = r.model_settings("two-stage")
            out |= {k: fitted[k] for k in ("method", "first_weight", "in_play_weight",
                                           "batter_prior_pa", "pitcher_prior_pa")}
        elif method != "linear":
            msg = f"method must be 'linear', 'two-stage' or 'odds-ratio' to send; got {method!r}."
            raise ValueError(msg)
        return out

    def connect(self, *panels: Any) -> None:
        """Also send the fitted settings to ``panels`` (objects with ``apply_settings(**settings)``)."""
        self.targets.extend(panels)
        if self.result_ is not None:
            self.apply_button.disabled = False

    def apply(self) -> dict[str, Any]:
        """Push the chosen fitted settings into the explorer and connected panels; return them."""
        if self.explorer is None and not self.targets:
            msg = ("this panel has nowhere to send settings; build it with CalibrationLab(pas, explorer=...) "
                   "or connect(panel).")
            raise RuntimeError(msg)
        sent = self.settings()
        if self.explorer is not None:
            if sent["method"] in ("linear", "two-stage") and hasattr(self.explorer, "apply_calibration"):
                # the explorer sets blend, weight(s) and priors in one update and notes the Brier score
                brier = self.result_.two_stage["brier"] if sent["method"] == "two-stage" else self.result_.brier
                self.explorer.apply_calibration(sent | {"brier": brier})
            else:
                self.explorer.apply_settings(**sent)
        for panel in self.targets:
            panel.apply_settings(**sent)
        where = "the explorer" if self.explorer is not None else ""
        if self.targets:
            where += (" and " if where else "") + f"{len(self.targets)} other panel(s)"
        weight = ""
        if sent["method"] == "linear":
            weight = f"pitcher weight {sent['pitcher_weight']:.2f}, "
        elif sent["method"] == "two-stage":
            weight = (f"pitcher weight {sent['first_weight']:.2f} first stage and "
                      f"{sent['in_play_weight']:.2f} on balls in play, ")
        self.applied.value = (
            f"Sent to {where}: {html.escape(sent['method'])} blend, {weight}"
            f"batter prior {sent['batter_prior_pa']:g} PA, pitcher prior {sent['pitcher_prior_pa']:g} PA, "
            f"{html.escape(sent['basis'])} basis."
        )
        # a receiving panel shows its own errors, possibly far down the page: say so here too
        failed = [p for p in (self.explorer, *self.targets)
                  if getattr(getattr(p, "status", None), "last_error", None) is not None]
        if failed:
            first = failed[0].status.last_error
            self.status.warn(
                f"{len(failed)} receiving panel(s) could not update with these settings: {first} "
                "(see that panel's status line)."
            )
        return sent

    def tables(self) -> dict[str, pd.DataFrame]:
        """The numbers behind every chart of the panel (empty before a fit)."""
        if self.result_ is None:
            return {}
        r = self.result_
        return {
            "settings": pd.DataFrame([self.settings() | {"brier": r.brier, "log_loss": r.log_loss,
                                                          "weight_low": r.weight_interval[0],
                                                          "weight_high": r.weight_interval[1],
                                                          "interval_level": r.interval_level,
                                                          "n_fit_pa": r.n_fit_pa, "n_holdout_pa": r.n_holdout_pa,
                                                          "split": r.split}]),
            "brier_surface": r.surface.copy(),
            "skill": self._skill_table(),
            "methods": self._methods_table(),
            "reliability": r.reliability.copy(),
        }

    def write_csv(self, folder: str) -> list:
        """Write :meth:`tables` as CSV files into ``folder``; return the paths."""
        return write_tables(self.tables(), folder, prefix="calibration_")

    # -- internals ----------------------------------------------------------------------
    def _on_fit(self, _button: Any = None) -> None:
        self.fit()

    def _on_apply(self, _button: Any = None) -> None:
        self.apply()

    def _on_csv(self, _button: Any = None) -> None:
        # built on request: the surface alone is thousands of rows, too big to resend per fit
        self.downloads.value = csv_links_html(self.tables(), prefix="calibration_")

    def _skill_table(self) -> pd.DataFrame:
        r = self.result_
        return pd.DataFrame(
            {
                "baseline": [BASELINE_LABELS.get(k, k) for k in r.skill_scores],
                "baseline_brier": [r.brier_baselines[k] for k in r.skill_scores],
                "skill": list(r.skill_scores.values()),
            }
        )

    def _methods_table(self) -> pd.DataFrame:
        parts = [res.methods.assign(basis=basis) for basis, res in self.results_.items()]
        return pd.concat(parts, ignore_index=True)[["method", "basis", "brier", "log_loss",
                                                    "batter_prior_pa", "pitcher_prior_pa", "settings"]]

    def _redraw_surface(self, _change: Any = None) -> None:
        if self.result_ is None:
            return
        r = self.result_
        best = {"pitcher_weight": r.pitcher_weight, "batter_prior_pa": r.batter_prior_pa,
                "pitcher_prior_pa": r.pitcher_prior_pa}
        set_chart(self.surface_chart, brier_surface_chart(r.surface, best=best, y=_SURFACE_Y[self.surface_y.value]))

    def _show_result(self) -> None:
        r = self.result_
        lo, hi = r.weight_interval
        self.summary.value = (
            f'<div style="font-size:14px;line-height:1.5">'
            f"<b>Pitcher weight {r.pitcher_weight:.2f}</b> "
            f"({r.interval_level:.0%} interval {lo:.2f} to {hi:.2f}), "
            f"<b>batter prior {r.batter_prior_pa:g} PA</b>, <b>pitcher prior {r.pitcher_prior_pa:g} PA</b> "
            f"({html.escape(r.basis)} basis).<br>"
            f"Held-out Brier score {r.brier:.5f} on {r.n_holdout_pa:,} plate appearances "
            f"(fitted on {r.n_fit_pa:,}; split: {html.escape(r.split)})."
            "</div>"
        )
        self._redraw_surface()
        set_chart(self.skill_chart, skill_chart(self._skill_table()))
        set_chart(self.methods_chart, method_comparison_chart(self._methods_table()))
        set_chart(self.reliability_chart, reliability_chart(r.reliability))
        self.apply_button.disabled = self.explorer is None and not self.targets
        self.csv_button.disabled = False
        self.downloads.value = ""

