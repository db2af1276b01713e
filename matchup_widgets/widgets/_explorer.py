"""The matchup explorer: pick a batter and a pitcher, move the model's settings, and see
outcome bars, contact, headline figures and run context update in place."""

from __future__ import annotations

import html
from collections import OrderedDict
from collections.abc import Callable
from typing import Any

import ipywidgets as W
import pandas as pd

from matchup_widgets.charts import (
    contact_heatmap_chart,
    outcome_bars_chart,
    run_context_chart,
    tier_shares_chart,
)
from matchup_widgets.charts._theme import INK, MUTED

from ._common import Coalescer, DataPanel, LiveChart, StatusLine, guarded, log, section
from ._picker import PlayerPicker
from ._tables import (
    caution_html,
    headline_html,
    heatmap_table,
    outcome_table,
    run_table,
    tier_table,
)

#: Environment variable naming the plate-appearance file (set by ``matchup-widgets dashboard``).

_METHOD_WORDS = {
    "linear": "Weighted mix of rates",
    "odds-ratio": "Odds ratio (Log5)",
    "two-stage": "Two-stage (ball in play first)",
}
# short enough to read in full in the 336 px dropdown
_PLATOON = (
    ("Automatic (from the hands)", "auto"),
    ("What if: bats left-handed", "L"),
    ("What if: bats right-handed", "R"),
)
#: Blend methods that have no pitcher weight (the odds-ratio blend counts both sides fully).
_NO_WEIGHT = frozenset({"odds-ratio"})
#: The blend with two pitcher weights (first stage, balls in play) instead of one.
_TWO_STAGE = "two-stage"
_BASIS = (("Observed", "observed"), ("Contact-based", "contact"))
_STYLE = {"description_width": "110px"}
# the two-stage sliders' labels are longer; at 110 px they were cut to "Pitcher weight, f..."
_WIDE_LABEL = {"description_width": "180px"}
_CACHE_SIZE = 24
_CONTROL_WIDTH = "336px"


class MatchupExplorer(DataPanel):
    """The screen an analyst opens first: one batter against one pitcher.

    Controls (``controls``): searchable batter and pitcher pickers, the platoon side
    (automatic or a what-if), season range, blend method, pitcher weight (under the two-stage
    blend two of them: first stage and balls in play), batter and pitcher prior sizes, observed or contact-expected basis, a button that applies fitted settings,
    and the base-out state of the run context. Outputs (``charts``, ``headline``) update in
    place whenever a control moves; errors appear in ``status`` and never stop the panel.

    Parameters
    ----------
    pas : PlateAppearances
        Loaded plate appearances (:func:`matchup_widgets.data.load_pas`).
    model : MatchupModel, optional
        A model (fitted on ``pas`` or not); its settings are the starting values.
    calibration : CalibrationResult or mapping, optional
        Fitted settings (``pitcher_weight``, ``batter_prior_pa``, ``pitcher_prior_pa``, or a
        ``model_settings("two-stage")`` mapping) the "use fitted settings" button applies; without it the button fits them on held-out
        games first.
    batter, pitcher : str, optional
        Starting players (id or name); by default those with the most plate appearances.
    contact_kind : {"grid", "boosting", "auto"}
        Contact model of the session (``grid`` fits in seconds), used by both the tier
        chart and the contact basis; a ``model`` whose ``contact_model`` is already set
        keeps its own, and the tier chart then uses that one.

    Attributes
    ----------
    widget : ipywidgets.Box
        The whole panel.
    estimate : MatchupEstimate or None
        The estimate on screen.
    tables : dict of DataFrame
        The tables behind each chart, as last drawn.
    """

    def __init__(
        self,
        pas: Any,
        *,
        model: Any = None,
        calibration: Any = None,
        batter: str | None = None,
        pitcher: str | None = None,
        contact_kind: str = "grid",
    ) -> None:
        from matchup_widgets.model import METHODS, MatchupModel

        self.pas = pas
        model = MatchupModel() if model is None else model
        self.model = model if hasattr(model, "batter_counts_") else model.fit(pas)
        self.calibration = calibration
        self.contact_kind = contact_kind
        self.status = StatusLine()
        self.estimate: Any = None
        self.tables: dict[str, pd.DataFrame] = {}
        self._cache: OrderedDict[Any, Any] = OrderedDict()
        self._last_key: Any = None
        self._contact_basis_used = False
        self.has_contact = {"exit_velo", "launch_angle"} <= set(pas.table.columns)
        # one contact model per dataset in a session: the contact basis and the tier chart share it
        self.contact_model: Any = None
        if self.has_contact:
            from matchup_widgets import contact

            chosen = self.model.contact_model
            if chosen is None or isinstance(chosen, str):
                chosen = contact.contact_model_for(pas, kind=chosen or contact_kind)
                self.model = self.model.with_settings(contact_model=chosen)
            self.contact_model = chosen

        start = self.model.get_params()
        seasons = list(self.model.seasons_)
        self.seasons_all = (min(seasons), max(seasons))
        self.batter_picker = PlayerPicker(pas, role="batter", status=self.status)
        self.pitcher_picker = PlayerPicker(pas, role="pitcher", status=self.status)
        c: dict[str, W.Widget] = {
            "batter_search": self.batter_picker.search,
            "batter": self.batter_picker.pick,
            "pitcher_search": self.pitcher_picker.search,
            "pitcher": self.pitcher_picker.pick,
            "platoon": W.Dropdown(options=_PLATOON, value="auto", description="Platoon side", style=_STYLE),
            "seasons": W.IntRangeSlider(
                value=tuple(start["seasons"] or self.seasons_all),
                min=self.seasons_all[0],
                max=self.seasons_all[1],
                step=1,
                description="Seasons",
                continuous_update=False,
                disabled=self.seasons_all[0] == self.seasons_all[1],
                readout=False,  # the slider's own readout box clips "2024 – 2026"; ours sits beside it
                layout=W.Layout(width="250px"),
                style=_STYLE,
            ),
            "method": W.Dropdown(
                options=[(_METHOD_WORDS.get(m, m), m) for m in METHODS],
                value=start["method"],
                description="Blend",
                style=_STYLE,
            ),
            "pitcher_weight": W.FloatSlider(
                value=float(start["pitcher_weight"]), min=0.0, max=1.0, step=0.01,
                description="Pitcher weight", readout_format=".2f", continuous_update=False, style=_STYLE,
            ),
            # the two-stage blend's own weights: shown instead of the single one under that blend
            "first_weight": W.FloatSlider(
                value=_weight_start(start, "first_weight"), min=0.0, max=1.0, step=0.01,
                description="Pitcher weight, first stage", readout_format=".2f", continuous_update=False,
                tooltip="Pitcher's share in strikeout, walk, HBP, home run and ball in play (0 = batter only, 1 = pitcher only)",
                style=_WIDE_LABEL,
            ),
            "in_play_weight": W.FloatSlider(
                value=_weight_start(start, "in_play_weight"), min=0.0, max=1.0, step=0.01,
                description="Pitcher weight, balls in play", readout_format=".2f", continuous_update=False,
                tooltip="Pitcher's share in what balls in play become (0 = batter only, 1 = pitcher only)",
                style=_WIDE_LABEL,
            ),
            "batter_prior": W.IntSlider(
                value=int(round(start["batter_prior_pa"])), min=0, max=1500, step=10,
                description="Batter prior (PA)", continuous_update=False, style=_STYLE,
            ),
            "pitcher_prior": W.IntSlider(
                value=int(round(start["pitcher_prior_pa"])), min=0, max=1500, step=10,
                description="Pitcher prior (PA)", continuous_update=False, style=_STYLE,
            ),
            # without exit velocity and launch angle the contact basis can only fail: not offered
            "basis": W.ToggleButtons(
                options=_BASIS if self.has_contact else _BASIS[:1],
                value=start["basis"] if self.has_contact else "observed",
                description="Outcomes from",
                tooltips=["Counted outcomes", "Balls in play replaced by what their exit velocity and launch angle usually give"][
                    : 2 if self.has_contact else 1
                ],
                style={"description_width": "110px", "button_width": "108px"},
            ),
            "apply_fitted": W.Button(
                description="Use fitted settings" if calibration is not None else "Fit and use settings",
                tooltip="Set the blend, pitcher weight and both priors to the values fitted on held-out games (Brier score)",
                layout=W.Layout(width="220px", margin="6px 0 0 114px"),
            ),
            "state": W.Dropdown(options=self._state_options(), value=0, description="Base-out state", style=_STYLE),
        }
        for name, widget in c.items():
            widget.add_class(f"mw-{name.replace('_', '-')}")
            if isinstance(widget, (W.FloatSlider, W.IntSlider, W.Dropdown)):
                widget.layout.width = _CONTROL_WIDTH
        self.controls = c
        self.seasons_readout = W.HTML(value=_season_words(c["seasons"].value), layout=W.Layout(width="86px"))
        self.seasons_readout.add_class("mw-seasons-readout")
        c["seasons"].observe(self._on_seasons_readout, names="value")
        c["method"].observe(self._on_method_weight, names="value")
        self._on_method_weight({"new": c["method"].value})
        if batter is not None:
            self.batter_picker.select(batter)
        if pitcher is not None:
            self.pitcher_picker.select(pitcher)

        # outputs: long-lived widgets whose values/charts are replaced in place
        self.headline = W.HTML(value="")
        self.headline.add_class("mw-headline")
        self.contact_note = W.HTML(value="")
        self.live: dict[str, LiveChart] = {
            "outcomes": LiveChart(
                outcome_bars_chart, pd.DataFrame({"outcome": [], "side": [], "probability": []}),
                css_class="mw-outcome-bars",
            ),
        }
        if self.has_contact:
            self.live["heatmap"] = LiveChart(
                contact_heatmap_chart,
                pd.DataFrame({"side": [], "exit_velo_bin": [], "launch_angle_bin": [], "share": []}),
                css_class="mw-contact-heatmap",
            )
            self.live["tiers"] = LiveChart(
                tier_shares_chart, pd.DataFrame({"side": [], "tier": [], "share": []}), css_class="mw-tier-shares"
            )
        self.live["runs"] = LiveChart(
            run_context_chart, pd.DataFrame({"side": [], "expected_runs": [], "scoring_chance": []}),
            css_class="mw-run-context", state=None,
        )
        self.charts = {name: live.widget for name, live in self.live.items()}

        self._refresh_guarded = guarded(self.status, "Could not update the matchup")(self._refresh)
        self._coalescer = Coalescer(self._refresh_guarded)
        for name, widget in c.items():
            if name not in ("apply_fitted", "batter_search", "pitcher_search"):
                widget.observe(self._coalescer.request, names="value")
        c["apply_fitted"].on_click(guarded(self.status, "Could not apply the fitted settings")(self._on_apply_fitted))
        self.widget = self._layout()
        self._coalescer.request()

    # ---- construction helpers ------------------------------------------------------------
    @staticmethod
    def _state_options() -> list[tuple[str, int]]:
        from matchup_widgets.runs import STATES

        return [(label, i) for i, label in enumerate(STATES[:24])]

    def _layout(self) -> W.Box:
        c = self.controls
        title = W.HTML(
            f'<div style="color:{INK};font-size:20px;font-weight:700">Matchup explorer</div>'
            f'<div style="color:{MUTED};font-size:12px">{html.escape(self._data_words())}</div>'
        )
        self.caution = W.HTML(caution_html())
        left = W.VBox(
            [
                section("Who is batting", self.batter_picker.widget, note="Type part of a name; ids tell namesakes apart."),
                section("Who is pitching", self.pitcher_picker.widget),
                section("Platoon", c["platoon"]),
                section("Model", W.HBox([c["seasons"], self.seasons_readout]), c["method"], c["pitcher_weight"], c["first_weight"], c["in_play_weight"], c["batter_prior"], c["pitcher_prior"], c["basis"], c["apply_fitted"]),
                section("Run context", c["state"], note="Every hitter for the rest of the inning is this matchup."),
            ],
            layout=W.Layout(width="356px", min_width="356px", padding="0 16px 0 0", overflow="hidden"),
        )
        right_parts = [self.status.widget, self.headline, self.charts["outcomes"]]
        if self.has_contact:
            right_parts += [self.charts["heatmap"], self.contact_note, self.charts["tiers"]]
        else:
            self.contact_note.value = f'<div style="color:{MUTED}">No exit velocity or launch angle in this data: contact charts are off.</div>'
            right_parts.append(self.contact_note)
        right_parts.append(self.charts["runs"])
        right = W.VBox(right_parts, layout=W.Layout(width="800px"))
        box = W.VBox([title, self.caution, W.HBox([left, right])], layout=W.Layout(padding="8px"))
        box.add_class("mw-explorer")
        return box

    def _data_words(self) -> str:
        n = int(self.model.n_pa_)
        first, last = self.seasons_all
        seasons = f"season {first}" if first == last else f"seasons {first}-{last}"
        return f"{n:,} plate appearances, {seasons}. Pick a batter and a pitcher; everything below follows the controls."

    # ---- public --------------------------------------------------------------------------
    def current_settings(self) -> dict[str, Any]:
        """The model settings the controls describe."""
        c = self.controls
        seasons = tuple(int(s) for s in c["seasons"].value)
        two_stage = c["method"].value == _TWO_STAGE
        return {
            "method": c["method"].value,
            "pitcher_weight": float(c["pitcher_weight"].value),
            # only the two-stage blend reads these; None elsewhere keeps other blends' keys unchanged
            "first_weight": float(c["first_weight"].value) if two_stage else None,
            "in_play_weight": float(c["in_play_weight"].value) if two_stage else None,
            "batter_prior_pa": float(c["batter_prior"].value),
            "pitcher_prior_pa": float(c["pitcher_prior"].value),
            "basis": c["basis"].value,
            "seasons": None if seasons == self.seasons_all else seasons,
        }

    def current_query(self) -> tuple[Any, str, str, dict[str, Any]]:
        """``(model, batter_id, pitcher_id, predict_kwargs)`` for the controls' values."""
        c = self.controls
        model = self.model.with_settings(**self.current_settings())
        side = c["platoon"].value
        return model, c["batter"].value, c["pitcher"].value, {"batter_hand": None if side == "auto" else side}

    def apply_settings(
        self,
        *,
        method: str | None = None,
        pitcher_weight: float | None = None,
        first_weight: float | None = None,
        in_play_weight: float | None = None,
        batter_prior_pa: float | None = None,
        pitcher_prior_pa: float | None = None,
        basis: str | None = None,
        seasons: tuple[int, int] | None = None,
    ) -> None:
        """Move several controls at once; the outputs update once at the end.

        ``first_weight`` and ``in_play_weight`` set the two-stage blend's two sliders.
        """
        c = self.controls
        with self._coalescer.paused():
            if method is not None:
                c["method"].value = method
            for name, weight in (("pitcher_weight", pitcher_weight), ("first_weight", first_weight),
                                 ("in_play_weight", in_play_weight)):
                if weight is not None:
                    c[name].value = round(min(max(float(weight), 0.0), 1.0), 3)
            if batter_prior_pa is not None:
                c["batter_prior"].value = int(round(min(float(batter_prior_pa), c["batter_prior"].max)))
            if pitcher_prior_pa is not None:
                c["pitcher_prior"].value = int(round(min(float(pitcher_prior_pa), c["pitcher_prior"].max)))
            if basis is not None:
                c["basis"].value = basis
            if seasons is not None:
                c["seasons"].value = tuple(int(s) for s in seasons)

    def apply_calibration(self, result: Any) -> None:
        """Use fitted settings: blend, the fitted weight(s) and priors (and basis), in one update.

        ``result`` is a :class:`~matchup_widgets.model.CalibrationResult` (its linear fit) or
        a mapping with ``pitcher_weight``, ``batter_prior_pa``, ``pitcher_prior_pa``
        (``basis`` and ``brier`` optional). A mapping with ``method="two-stage"`` (as
        ``CalibrationResult.model_settings("two-stage")`` gives) carries ``first_weight``
        and ``in_play_weight`` instead of ``pitcher_weight``.
        """
        get = result.get if isinstance(result, dict) else lambda k, default=None: getattr(result, k, default)
        method = get("method", None) or "linear"
        if method not in ("linear", _TWO_STAGE):
            msg = (f"apply_calibration got method {method!r}; it applies 'linear' or 'two-stage' fits. "
                   "Use apply_settings(...) for other blends.")
            raise ValueError(msg)
        b_prior, p_prior = float(get("batter_prior_pa")), float(get("pitcher_prior_pa"))
        if method == _TWO_STAGE:
            first, in_play = float(get("first_weight")), float(get("in_play_weight"))
            weights = {"first_weight": first, "in_play_weight": in_play}
            words = f"two-stage blend, pitcher weight {first:.2f} first stage and {in_play:.2f} on balls in play"
        else:
            weight = float(get("pitcher_weight"))
            weights = {"pitcher_weight": weight}
            words = f"pitcher weight {weight:.2f}"
        self.apply_settings(
            method=method, **weights, batter_prior_pa=b_prior, pitcher_prior_pa=p_prior, basis=get("basis", None),
        )
        brier = get("brier", None)
        extra = f"; held-out Brier score {float(brier):.4f}" if brier is not None else ""
        if self.status.last_error is None:
            self.status.note(
                f"Fitted settings applied: {words}, batter prior {b_prior:,.0f} PA, "
                f"pitcher prior {p_prior:,.0f} PA{extra}."
            )

    # ---- callbacks -----------------------------------------------------------------------
    def _on_seasons_readout(self, change: Any) -> None:
        self.seasons_readout.value = _season_words(change["new"])

    def _on_method_weight(self, change: Any) -> None:
        # the two-stage blend has a weight per stage: its two sliders replace the single one
        two_stage = change["new"] == _TWO_STAGE
        self.controls["pitcher_weight"].layout.display = "none" if two_stage else None
        for name in ("first_weight", "in_play_weight"):
            self.controls[name].layout.display = None if two_stage else "none"
        # the odds-ratio blend ignores the pitcher weight: a live slider there would move nothing
        slider = self.controls["pitcher_weight"]
        slider.disabled = change["new"] in _NO_WEIGHT
        slider.tooltip = (
            "The odds-ratio blend has no pitcher weight: both sides count fully (Log5)"
            if slider.disabled else "Share of the pitcher's side in the blend (0 = batter only, 1 = pitcher only)"
        )

    def _on_apply_fitted(self, _button: Any = None) -> None:
        if self.calibration is None:
            from matchup_widgets.model import calibrate

            self.status.note("Fitting pitcher weight and priors on held-out games...")
            self.calibration = calibrate(self.pas, progress=False)
            self.controls["apply_fitted"].description = "Use fitted settings"
        self.apply_calibration(self.calibration)

    def _cached(self, key: Any, make: Callable[[], Any]) -> Any:
        if key in self._cache:
            self._cache.move_to_end(key)
            return self._cache[key]
        value = self._cache[key] = make()
        while len(self._cache) > _CACHE_SIZE:
            self._cache.popitem(last=False)
        return value

    def _draw(self, name: str, table: pd.DataFrame, **options: Any) -> None:
        """Show ``table`` in chart ``name`` in place (rows swapped when the layout holds)."""
        self.tables[name] = table
        self.live[name].update(table, **options)

    def _refresh(self) -> None:
        from matchup_widgets.runs import situation

        settings = self.current_settings()
        model, batter, pitcher, kwargs = self.current_query()
        state = int(self.controls["state"].value)
        key = (tuple(sorted((k, repr(v)) for k, v in settings.items())), batter, pitcher, kwargs["batter_hand"], state)
        if key == self._last_key:
            return
        if batter is None or pitcher is None:
            self.status.warn("Pick a batter and a pitcher.")
            return
        if settings["basis"] == "contact" and not self._contact_basis_used:
            # the first contact-based fit takes seconds; say so while it runs
            self.status.note("Building contact-based counts for the whole league (first use takes several seconds)...")
            self._contact_basis_used = True
        est = model.predict(batter, pitcher, **kwargs)
        self._draw("outcomes", outcome_table(est))
        self.headline.value = headline_html(est)
        outs, bases = divmod(state, 8)
        sit = situation(est.probabilities, outs=outs, bases=bases, league=est.distributions.loc["league"])
        self._draw("runs", run_table(sit), state=sit["state"])
        self.estimate = est
        self._last_key = key
        self.status.clear()
        if self.has_contact:
            try:
                self._refresh_contact(est, settings)
                self.contact_note.value = ""
            except Exception as exc:  # contact is optional: say why it is missing, keep the rest
                log.exception("contact charts")
                self.contact_note.value = (
                    f'<div style="color:{MUTED}">Contact charts not updated: {html.escape(str(exc))}</div>'
                )

    def _refresh_contact(self, est: Any, settings: dict[str, Any]) -> None:
        from matchup_widgets import contact

        seasons = settings["seasons"]
        buckets = self._cached(
            ("buckets", seasons),
            lambda: {r: contact.bucket_shares(self.pas, role=r, seasons=seasons) for r in ("batter", "pitcher")},
        )
        split = {"batter_hand": est.batter_hand, "pitcher_hand": est.pitcher_hand}
        heat = self._cached(
            ("heat", est.batter_id, est.pitcher_id, est.batter_hand, est.pitcher_hand, seasons),
            lambda: heatmap_table(buckets, batter_id=est.batter_id, pitcher_id=est.pitcher_id, **split),
        )
        self._draw("heatmap", heat)

        cmodel = self.contact_model  # the model behind the contact basis too
        # the tier mix is within balls in play: the two-stage blend's second-stage weight
        in_play = settings["in_play_weight"]
        blend = {
            "pitcher_weight": settings["pitcher_weight"] if in_play is None else in_play,
            "batter_prior_pa": settings["batter_prior_pa"],
            "pitcher_prior_pa": settings["pitcher_prior_pa"],
        }
        sides, by_side = self._cached(
            ("tiers", est.batter_id, est.pitcher_id, est.batter_hand, est.pitcher_hand, seasons),
            lambda: _tier_sides(
                contact.matchup_contact(
                    self.pas, batter_id=est.batter_id, pitcher_id=est.pitcher_id, kind="tier",
                    seasons=seasons, model=cmodel, **split, **blend,
                )[0]
            ),
        )
        given = self._cached(("given", id(cmodel)), lambda: contact.contact_tiers(self.pas, model=cmodel).outcome_given_tier)
        mix, _ = contact.matchup_contact_mix(
            by_side["batter"]["n"], by_side["pitcher"]["n"], by_side["league"]["share"],
            outcome_given=given, **blend,
        )
        self._draw("tiers", tier_table(sides, mix))


def _weight_start(start: dict[str, Any], name: str) -> float:
    """Starting value of a two-stage slider: the model's own, else its pitcher weight."""
    value = start.get(name)
    return float(start["pitcher_weight"] if value is None else value)


def _season_words(seasons: Any) -> str:
    """The season range as shown beside its slider, e.g. ``2024 – 2026`` (one year once)."""
    first, last = (int(s) for s in seasons)
    text = f"{first}" if first == last else f"{first} – {last}"
    return f'<div style="color:{INK};font-size:13px;line-height:28px;white-space:nowrap">{text}</div>'


def _tier_sides(sides: pd.DataFrame) -> tuple[pd.DataFrame, dict[str, pd.DataFrame]]:
    """The contact layer's side table and its batter, pitcher and league rows by tier."""
    return sides, {s: sides[sides["side"] == s].set_index("category") for s in ("batter", "pitcher", "league")}
