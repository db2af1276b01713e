"""The matchup estimator: settings given once, a fit that aggregates counts, a fast predict."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import HANDS, OUTCOMES, DataError

from ._blend import blend
from ._distributions import CountCube, split_label
from ._empirical_bayes import prior_from_counts
from ._intervals import matchup_interval
from ._settings import BASES, SETTING_DEFAULTS, SETTING_NAMES, BlendSettings, follow_pitcher_weight
from ._shrink import shrink
from ._summary import SUMMARY_COLUMNS, run_weights, summary_array

_CONTACT_KINDS: tuple[str, ...] = ("auto", "boosting", "grid")

_CODES = pd.Index(list(OUTCOMES))
_COUNT_COLS = pd.Index([*OUTCOMES, "pa"])
_LO_HI = pd.Index(["lo", "hi"])
_DIST_ROWS = pd.Index(["batter_raw", "batter", "pitcher_raw", "pitcher", "league", "matchup"])
_COUNT_ROWS = pd.Index(["batter", "pitcher", "league"])
_SIDE_INTERVAL_ROWS = pd.MultiIndex.from_product([_COUNT_ROWS, _LO_HI], names=["side", "bound"])
_SUMMARY_ROWS = pd.Index(["matchup", "batter", "pitcher", "league"])
_SUMMARY_COLS = pd.Index(list(SUMMARY_COLUMNS))

@dataclass(frozen=True, eq=False)
class MatchupEstimate:
    """One batter-versus-pitcher estimate with its intervals, inputs and summaries.

    Attributes
    ----------
    batter_id, pitcher_id, batter_name, pitcher_name : str
    batter_hand, pitcher_hand : str
        The platoon split used: the side the batter hits from and the pitcher's hand.
    switch_hitter : bool
        Whether the batter was seen batting from both sides.
    probabilities : pandas.Series
        Blended outcome probabilities by code (sum to 1).
    intervals : pandas.DataFrame
        ``lo`` and ``hi`` per code (central ``interval`` credible interval).
    side_intervals : pandas.DataFrame
        The same central interval for each side on its own: rows a (``side``, ``bound``)
        index over ``batter, pitcher, league`` x ``lo, hi``, columns the codes. A player's
        side is its shrunk distribution's Dirichlet posterior (counts + prior x league,
        the draws behind the matchup interval); the league's is its own posterior from
        the split's league counts, no prior beyond the half-count floor. Each contains its
        row of ``distributions``.
    distributions : pandas.DataFrame
        Rows ``batter_raw, batter, pitcher_raw, pitcher, league, matchup`` (shrunk rows
        carry the side's name without suffix); columns the codes.
    counts : pandas.DataFrame
        Rows ``batter, pitcher, league``: outcome counts in the split, and ``pa``.
    pa : dict
        ``{"batter": n, "pitcher": n}`` plate appearances in the split.
    effective_pa : float
        Plate appearances of a single sample as precise as the blended estimate.
    summary : pandas.DataFrame
        Rows ``matchup, batter, pitcher, league``; columns ``SUMMARY_COLUMNS``.
    suggested_prior_pa : pandas.DataFrame
        Empirical-Bayes prior sizes per outcome (rows) for ``batter`` and ``pitcher``.
    settings : dict
        The model settings that produced the estimate (JSON-ready: the blend settings, then
        ``contact_model``, ``n_draws``, ``seed``).
    blend_settings : BlendSettings
        The same blend settings as one value (``describe()`` gives the sentence cards print).
    weights_source : str
        Where the wOBA and run weights came from.
    """

    batter_id: str
    pitcher_id: str
    batter_name: str
    pitcher_name: str
    batter_hand: str
    pitcher_hand: str
    switch_hitter: bool
    probabilities: pd.Series
    intervals: pd.DataFrame
    distributions: pd.DataFrame
    counts: pd.DataFrame
    pa: dict[str, float]
    effective_pa: float
    summary: pd.DataFrame
    suggested_prior_pa: pd.DataFrame
    settings: dict[str, Any] = field(default_factory=dict)
    weights_source: str = ""
    side_intervals: pd.DataFrame | None = None
    blend_settings: BlendSettings | None = None

    @property
    def split(self) -> str:
        """The platoon split, e.g. ``"L vs R"``."""
        return split_label(self.batter_hand, self.pitcher_hand)

    @property
    def k_rate(self) -> float:
        return float(self.summary.loc["matchup", "k_rate"])

    @property
    def bb_rate(self) -> float:
        return float(self.summary.loc["matchup", "bb_rate"])

    @property
    def hr_rate(self) -> float:
        return float(self.summary.loc["matchup", "hr_rate"])

    @property
    def on_base(self) -> float:
        return float(self.summary.loc["matchup", "on_base"])

    @property
    def woba(self) -> float:
        return float(self.summary.loc["matchup", "woba"])

    @property
    def runs_per_pa(self) -> float:
        """Runs per PA relative to the league average PA of the split."""
        return float(self.summary.loc["matchup", "runs_per_pa"])

    def to_dict(self) -> dict[str, Any]:
        """Plain-Python form for JSON (the ``blend`` command prints it)."""
        probs = {c: float(v) for c, v in self.probabilities.items()}
        return {
            "batter": {"id": self.batter_id, "name": self.batter_name, "hand": self.batter_hand,
                       "switch_hitter": self.switch_hitter},
            "pitcher": {"id": self.pitcher_id, "name": self.pitcher_name, "hand": self.pitcher_hand},
            "split": self.split,
            "probabilities": probs,
            "intervals": {c: [float(lo), float(hi)] for c, lo, hi in
                          zip(self.intervals.index, self.intervals["lo"], self.intervals["hi"])},
            "pa": {k: _number(round(float(v), 6)) for k, v in self.pa.items()},
            "effective_pa": float(self.effective_pa),
            "woba": self.woba,
            "runs_per_pa": self.runs_per_pa,
            "k_rate": self.k_rate,
            "bb_rate": self.bb_rate,
            "hr_rate": self.hr_rate,
            "on_base": self.on_base,
            "summary": {row: {c: _finite(v) for c, v in vals.items()}
                        for row, vals in self.summary.to_dict("index").items()},
            "league": {c: float(v) for c, v in self.distributions.loc["league"].items()},
            "side_intervals": self._side_intervals_dict(),
            "suggested_prior_pa": {side: {c: _finite(v) for c, v in self.suggested_prior_pa[side].items()}
                                   for side in self.suggested_prior_pa.columns},
            "weights_source": self.weights_source,
            "settings": dict(self.settings),
        }

    def _side_intervals_dict(self) -> dict[str, dict[str, list[float]]] | None:
        if self.side_intervals is None:
            return None
        t = self.side_intervals
        return {
            side: {c: [float(lo), float(hi)] for c, lo, hi in zip(t.columns, t.loc[(side, "lo")], t.loc[(side, "hi")])}
            for side in t.index.get_level_values("side").unique()
        }


def _finite(value: Any) -> float | None:
    value = float(value)
    return value if math.isfinite(value) else None


def _number(value: Any) -> float | int:
    value = float(value)
    return int(value) if value.is_integer() else value


class _Setting:
    """A model setting read as an attribute (``model.pitcher_weight``); assigning goes through set_params."""

    def __set_name__(self, owner: type, name: str) -> None:
        self.name = name

    def __get__(self, obj: Any, owner: type | None = None) -> Any:
        return self if obj is None else obj._params[self.name]

    def __set__(self, obj: Any, value: Any) -> None:
        obj.set_params(**{self.name: value})


class MatchupModel:
    """Estimate batter-versus-pitcher outcome probabilities from platoon-split counts.

    The blend's settings are one :class:`BlendSettings` value (:attr:`settings`); the keyword
    arguments are a convenience that builds it. They are stored unchanged and checked when the
    model is used (scikit-learn's convention), so :meth:`get_params` returns what was given.
    :meth:`fit` aggregates the plate appearances once into count arrays by player, season and
    split; :meth:`predict` shrinks each side toward the league of the split, blends, and
    samples intervals, in a few milliseconds. :meth:`with_settings` returns a model with other
    settings sharing the fitted counts.

    Parameters
    ----------
    settings : BlendSettings or mapping, optional
        The blend's settings (e.g. ``CalibrationResult.best_settings("two-stage")`` or
        :func:`read_settings` of a ``fit --json`` file). Keyword settings given with it
        change it (:meth:`BlendSettings.replace`).
    contact_model : ContactModel, {"auto", "boosting", "grid"} or None
        The contact model behind ``basis="contact"``. None uses the dataset's own
        (:func:`matchup_widgets.contact.contact_model_for`, fitted once per dataset); a
        kind uses the dataset's own model of that kind; a fitted ``ContactModel`` is used
        as given (a dashboard passes the one its contact charts use, so both agree).
        Contact-basis counts are kept per contact model.
    n_draws : int
        Posterior draws for the intervals.
    seed : int
        Seed of the interval draws (fixed so the same settings give the same intervals).
    **blend_settings
        Any field of :class:`BlendSettings` (``method``, ``pitcher_weight``, ``first_weight``,
        ``in_play_weight``, ``batter_exponent``, ``pitcher_exponent``, ``batter_prior_pa``,
        ``pitcher_prior_pa``, ``basis``, ``seasons``, ``interval``); the defaults are
        BlendSettings' own.

    Examples
    --------
    >>> model = MatchupModel(pitcher_weight=0.4)
    >>> model.get_params()["pitcher_weight"], model.with_settings(method="odds-ratio").method
    (0.4, 'odds-ratio')
    >>> model.settings.describe()
    'linear blend, pitcher weight 0.40; priors batter 200 PA, pitcher 200 PA; observed basis; all seasons; 80% intervals'
    """

    method = _Setting()
    pitcher_weight = _Setting()
    first_weight = _Setting()
    in_play_weight = _Setting()
    batter_exponent = _Setting()
    pitcher_exponent = _Setting()
    batter_prior_pa = _Setting()
    pitcher_prior_pa = _Setting()
    basis = _Setting()
    seasons = _Setting()
    interval = _Setting()
    model_error = _Setting()
    contact_model = _Setting()
    n_draws = _Setting()
    seed = _Setting()

    def __init__(
        self,
        settings: BlendSettings | Mapping[str, Any] | None = None,
        *,
        contact_model: Any = None,
        n_draws: int = 2000,
        seed: int = 0,
        **blend_settings: Any,
    ) -> None:
        _check_names(blend_settings)
        if settings is None:
            blend = {**SETTING_DEFAULTS, **blend_settings}
        else:  # a given settings value is validated now; keywords change it as replace() does
            given = BlendSettings.from_dict(settings)
            blend = _settings_dict(given.replace(**blend_settings) if blend_settings else given)
        self._params = {**blend, "contact_model": contact_model, "n_draws": n_draws, "seed": seed}

    # ---- settings -------------------------------------------------------------------
    @property
    def settings(self) -> BlendSettings:
        """The blend's settings as one validated value (raises ValueError on a bad setting)."""
        return BlendSettings(**{name: self._params[name] for name in SETTING_NAMES})

    def get_params(self) -> dict[str, Any]:
        """The settings as a dict (blend settings as given, then contact model, draws, seed)."""
        return dict(self._params)

    def set_params(self, **params: Any) -> MatchupModel:
        """Change settings in place (fitted counts are kept); returns ``self``."""
        _check_names(params)
        merged = {**self._params, **follow_pitcher_weight(self._params, params)}
        _check_settings(merged)
        self._params = merged
        return self

    def with_settings(self, settings: BlendSettings | Mapping[str, Any] | None = None, **params: Any) -> MatchupModel:
        """A new model with other settings, sharing this model's fitted counts.

        Parameters
        ----------
        settings : BlendSettings or mapping, optional
            New blend settings in full (the contact model, draws and seed are kept).
        **params
            Settings to change (any of :meth:`get_params`' names).
        """
        _check_names(params)
        base = dict(self._params)
        if settings is not None:
            base.update(_settings_dict(BlendSettings.from_dict(settings)))
        new = type(self).__new__(type(self))
        new._params = {**base, **follow_pitcher_weight(base, params)}
        _check_settings(new._params)
        for name, value in vars(self).items():
            if name.endswith("_") and not name.startswith("__"):
                setattr(new, name, value)  # fitted state is read-only and shared
        return new

    def __repr__(self) -> str:
        defaults = {**SETTING_DEFAULTS, **_EXTRA_DEFAULTS}
        changed = {k: v for k, v in self._params.items() if v != defaults[k]}
        inner = ", ".join(f"{k}={v!r}" for k, v in changed.items())
        return f"MatchupModel({inner})"

    # ---- fit ------------------------------------------------------------------------
    def fit(self, pas: Any) -> MatchupModel:
        """Aggregate plate appearances into counts by player, season and platoon split.

        Parameters
        ----------
        pas : PlateAppearances (or ibis table / pandas DataFrame with the contract's columns)
            Loaded plate appearances (:func:`matchup_widgets.data.load_pas`).

        Returns
        -------
        MatchupModel
            ``self``, with ``batter_counts_``, ``pitcher_counts_`` (count cubes),
            ``players_`` (id, name, role, hands, pa), ``names_``, ``seasons_`` and ``n_pa_``.
        """
        from matchup_widgets.data import PlateAppearances, outcome_counts, player_table

        _check_settings(self._params)
        self.pas_ = pas
        self.batter_counts_ = CountCube.from_table(outcome_counts(pas, role="batter", by_season=True))
        self.pitcher_counts_ = CountCube.from_table(outcome_counts(pas, role="pitcher", by_season=True))
        self.players_ = pas.players if isinstance(pas, PlateAppearances) else player_table(pas)
        self.names_ = {
            (str(role), str(pid)): str(name)
            for role, pid, name in zip(self.players_["role"], self.players_["player_id"], self.players_["name"])
        }
        self.seasons_ = [int(s) for s in self.batter_counts_.seasons]
        self.n_pa_ = int(self.batter_counts_.counts.sum())
        self.cache_ = {}  # derived tables (contact basis, prior suggestions), shared by copies
        return self

    def _check_fitted(self) -> None:
        if not hasattr(self, "batter_counts_"):
            msg = "This MatchupModel is not fitted yet; call fit(pas) with loaded plate appearances first."
            raise RuntimeError(msg)

    # ---- predict --------------------------------------------------------------------
    def predict(self, batter: str, pitcher: str, *, batter_hand: str | None = None) -> MatchupEstimate:
        """Estimate the outcome distribution of ``batter`` facing ``pitcher``.

        Parameters
        ----------
        batter, pitcher : str
            Player ids, or names (resolved with :func:`matchup_widgets.data.resolve_player`).
        batter_hand : {"L", "R"} or None, keyword-only
            The side the batter hits from; by default the usual side (a switch hitter
            bats opposite the pitcher's hand). Give it to ask a what-if.

        Returns
        -------
        MatchupEstimate

        Raises
        ------
        DataError
            For an unknown or ambiguous name (the closest matches are listed), or a player
            without plate appearances in the selected seasons.
        """
        self._check_fitted()
        settings, extra = _check_settings(self._params)  # from here on the settings are trusted
        bcube, pcube = self._cubes(settings, extra["contact_model"])
        batter_id = self._resolve(batter, "batter", bcube)
        pitcher_id = self._resolve(pitcher, "pitcher", pcube)
        if batter_hand is not None and batter_hand not in HANDS:
            msg = f"batter_hand must be 'L', 'R' or None (automatic); got {batter_hand!r}."
            raise ValueError(msg)
        # the pitcher's hand: the hand of most of the pitcher's PAs; the batter's side follows from it
        p_hands = pcube.hand_totals(pitcher_id).sum(axis=0)
        ph = int(np.argmax(p_hands))
        b_sides = bcube.hand_totals(batter_id).sum(axis=1)
        switch = bool(np.all(b_sides > 0))
        if batter_hand is not None:
            bh = HANDS.index(batter_hand)
        elif switch:
            bh = 1 - ph
        else:
            bh = int(np.argmax(b_sides))
        seasons = settings.seasons
        mask_b, mask_p = bcube.season_mask(seasons), pcube.season_mask(seasons)
        b_all = bcube.player(batter_id, mask_b)
        p_all = pcube.player(pitcher_id, mask_p)
        for role, pid, counts in (("batter", batter_id, b_all), ("pitcher", pitcher_id, p_all)):
            if counts.sum() == 0:
                msg = (
                    f"{role} {pid!r} has no plate appearances in seasons {seasons} "
                    f"(data has seasons {self.seasons_}). Widen the season range."
                )
                raise DataError(msg)
        lg_counts = bcube.league(mask_b)[bh, ph]
        if lg_counts.sum() <= 0:
            msg = (
                f"the league has no plate appearances in split {split_label(HANDS[bh], HANDS[ph])} "
                f"for seasons {seasons}; shrinkage needs a league baseline. Widen the season range."
            )
            raise DataError(msg)
        league = lg_counts / lg_counts.sum()
        b_counts, p_counts = b_all[bh, ph], p_all[bh, ph]
        b_shrunk = shrink(b_counts, league, settings.batter_prior_pa)
        p_shrunk = shrink(p_counts, league, settings.pitcher_prior_pa)
        weights = settings.blend_weights()
        point = blend(settings.method, b_shrunk, p_shrunk, league, **weights)
        spread = matchup_interval(
            settings.method, b_counts, p_counts, league,
            batter_prior_pa=settings.batter_prior_pa, pitcher_prior_pa=settings.pitcher_prior_pa,
            interval=settings.interval, n_draws=extra["n_draws"], seed=extra["seed"], point=point,
            league_counts=lg_counts, **weights,
        )
        # each side's interval is widened to contain its bar (the shrunk point), as the matchup's is
        side_points = np.vstack([b_shrunk, p_shrunk, league])
        side_lo = np.minimum(np.vstack([spread["side_lo"][s] for s in _COUNT_ROWS]), side_points)
        side_hi = np.maximum(np.vstack([spread["side_hi"][s] for s in _COUNT_ROWS]), side_points)
        with np.errstate(invalid="ignore", divide="ignore"):
            b_raw = b_counts / b_counts.sum() if b_counts.sum() > 0 else np.full(9, np.nan)
            p_raw = p_counts / p_counts.sum() if p_counts.sum() > 0 else np.full(9, np.nan)
        # pandas objects are built straight from arrays with prebuilt labels (slider-move speed)
        distributions = pd.DataFrame(
            np.vstack([b_raw, b_shrunk, p_raw, p_shrunk, league, point]), index=_DIST_ROWS, columns=_CODES
        )
        count_rows = np.vstack([b_counts, p_counts, lg_counts])
        counts = pd.DataFrame(
            np.column_stack([count_rows, count_rows.sum(axis=1)]), index=_COUNT_ROWS, columns=_COUNT_COLS
        )
        run_w = run_weights(league)
        summary = pd.DataFrame(
            summary_array(np.vstack([point, b_shrunk, p_shrunk, league]), run_w["woba"], run_w["linear"]),
            index=_SUMMARY_ROWS,
            columns=_SUMMARY_COLS,
        )
        return MatchupEstimate(
            batter_id=batter_id,
            pitcher_id=pitcher_id,
            batter_name=self._name(batter_id, "batter"),
            pitcher_name=self._name(pitcher_id, "pitcher"),
            batter_hand=HANDS[bh],
            pitcher_hand=HANDS[ph],
            switch_hitter=switch,
            probabilities=pd.Series(point, index=_CODES, name="p"),
            intervals=pd.DataFrame(np.column_stack([spread["lo"], spread["hi"]]), index=_CODES, columns=_LO_HI),
            distributions=distributions,
            counts=counts,
            pa={"batter": float(b_counts.sum()), "pitcher": float(p_counts.sum())},
            effective_pa=float(spread["effective_pa"]),
            summary=summary,
            suggested_prior_pa=self.suggested_priors(),
            settings=_plain_settings(settings, extra),
            blend_settings=settings,
            weights_source=run_w["source"],
            side_intervals=pd.DataFrame(
                np.stack([side_lo, side_hi], axis=1).reshape(-1, len(OUTCOMES)),
                index=_SIDE_INTERVAL_ROWS,
                columns=_CODES,
            ),
        )

    def suggested_priors(self, *, min_pa: int = 30) -> pd.DataFrame:
        """Empirical-Bayes prior sizes per outcome for batters and pitchers (current seasons, basis).

        Splits are strata (each player-split is one unit, compared with its split's mean).

        Returns
        -------
        pandas.DataFrame
            Index: outcome codes and ``"all"``; columns ``batter``, ``pitcher`` (plate
            appearances; ``inf`` when players differ no more than chance allows).
        """
        self._check_fitted()
        settings, extra = _check_settings(self._params)
        contact = _contact_key(extra["contact_model"]) if settings.basis == "contact" else None
        key = ("priors", settings.basis, contact, settings.seasons, min_pa)
        if key not in self.cache_:
            cols = {}
            for role, cube in zip(("batter", "pitcher"), self._cubes(settings, extra["contact_model"])):
                mask = cube.season_mask(settings.seasons)
                units = cube.counts[:, mask].sum(axis=1).reshape(-1, len(OUTCOMES))  # (player * 4 splits, 9)
                strata = np.tile(np.arange(len(HANDS) ** 2), len(cube.ids))
                try:
                    cols[role] = prior_from_counts(units, strata, role=role, min_pa=min_pa)["prior_pa"]
                except DataError:
                    cols[role] = pd.Series(np.nan, index=[*OUTCOMES, "all"])
            self.cache_[key] = pd.DataFrame(cols)
        return self.cache_[key]

    # ---- helpers --------------------------------------------------------------------
    def _cubes(self, settings: BlendSettings, contact_model: Any) -> tuple[CountCube, CountCube]:
        if settings.basis == "observed":
            return self.batter_counts_, self.pitcher_counts_
        key = ("contact", _contact_key(contact_model))
        if key not in self.cache_:
            self.cache_[key] = tuple(
                CountCube.from_table(_contact_counts(self.pas_, role=role, contact_model=contact_model))
                for role in ("batter", "pitcher")
            )
        return self.cache_[key]

    def _resolve(self, query: str, role: str, cube: CountCube) -> str:
        text = str(query).strip()
        if text in cube.index:
            return text
        from matchup_widgets.data import resolve_player

        player_id = resolve_player(self.pas_, text, role=role)
        if player_id not in cube.index:
            msg = f"{role} {text!r} ({player_id}) has no plate appearances as a {role} in the fitted data."
            raise DataError(msg)
        return player_id

    def _name(self, player_id: str, role: str) -> str:
        return self.names_.get((role, player_id), player_id)


# ---- the contact basis (the only place that reaches into the contact layer) ----------------
def _contact_key(contact_model: Any) -> Any:
    """Cache key of a contact-model setting: a kind, the dataset default, or the fitted object."""
    return "dataset default" if contact_model is None else contact_model


def _contact_counts(pas: Any, *, role: str, contact_model: Any = None) -> pd.DataFrame:
    """Contact-basis counts per player, split and season (the seasons are selected later)."""
    from matchup_widgets import contact

    if contact_model is None:
        model = contact.contact_model_for(pas)  # the per-dataset default, fitted once
    elif isinstance(contact_model, str):
        model = contact.contact_model_for(pas, kind=contact_model)
    else:
        model = contact_model
    return contact.contact_outcome_counts(pas, role=role, by_season=True, model=model)


# ---- settings checks ------------------------------------------------------------------------
_EXTRA_DEFAULTS: dict[str, Any] = {"contact_model": None, "n_draws": 2000, "seed": 0}
_NAMES: tuple[str, ...] = (*SETTING_NAMES, *_EXTRA_DEFAULTS)


def _check_names(params: Mapping[str, Any]) -> None:
    unknown = sorted(set(params) - set(_NAMES))
    if unknown:
        msg = f"unknown MatchupModel setting(s) {unknown}; valid settings: {sorted(_NAMES)}."
        raise TypeError(msg)


def _check_settings(params: Mapping[str, Any]) -> tuple[BlendSettings, dict[str, Any]]:
    """The blend settings as one validated value, and the model's own settings checked."""
    settings = BlendSettings(**{name: params[name] for name in SETTING_NAMES})
    if settings.has_group_priors:
        msg = (
            "MatchupModel shrinks each side with one prior size for every outcome; give "
            "batter_prior_pa and pitcher_prior_pa as numbers (per-group priors are a BlendSettings "
            "form the model does not read yet)."
        )
        raise ValueError(msg)
    cm = params["contact_model"]
    if not (
        cm is None
        or (isinstance(cm, str) and cm in _CONTACT_KINDS)
        or (hasattr(cm, "predict_proba") and hasattr(cm, "kind_"))
    ):
        msg = (
            f"contact_model must be None (the dataset's own), one of {list(_CONTACT_KINDS)} or a fitted "
            f"matchup_widgets.contact.ContactModel; got {cm!r}. Fit it first: ContactModel(kind=...).fit(pas)."
        )
        raise ValueError(msg)
    n_draws = params["n_draws"]
    if not (isinstance(n_draws, (int, np.integer)) and not isinstance(n_draws, bool) and n_draws >= 10):
        msg = f"n_draws must be a whole number >= 10; got {n_draws!r}."
        raise ValueError(msg)
    seed = params["seed"]
    if not (isinstance(seed, (int, np.integer)) and not isinstance(seed, bool) and seed >= 0):
        msg = f"seed must be a whole number >= 0 (it fixes the interval draws); got {seed!r}."
        raise ValueError(msg)
    return settings, {"contact_model": cm, "n_draws": int(n_draws), "seed": int(seed)}


def _settings_dict(settings: BlendSettings) -> dict[str, Any]:
    """A BlendSettings' fields as stored model params (tuples and mappings as they are)."""
    return {name: getattr(settings, name) for name in SETTING_NAMES}


def _plain_settings(settings: BlendSettings, extra: Mapping[str, Any]) -> dict[str, Any]:
    """JSON-ready settings of an estimate: the blend's, then the contact model, draws and seed."""
    cm = extra["contact_model"]
    if cm is not None and not isinstance(cm, str):  # a fitted model is named by its kind (JSON-ready)
        cm = str(getattr(cm, "kind_", "fitted"))
    return {**settings.to_dict(), "contact_model": cm, "n_draws": extra["n_draws"], "seed": extra["seed"]}
