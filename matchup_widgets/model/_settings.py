"""The blend's settings as one frozen value, validated once, described once, read and written as JSON.

:class:`BlendSettings` is what the model, calibration, the card, the panels and every command
pass around. It is checked at construction; code that receives one trusts it.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from matchup_widgets.data import OUTCOMES, season_range

#: Blend methods, in the order every option list shows them.
METHODS: tuple[str, ...] = ("linear", "odds-ratio", "two-stage")
#: Where the counts come from: observed outcomes, or balls in play replaced by their
#: contact-expected outcome probabilities (the contact layer's model).
BASES: tuple[str, ...] = ("observed", "contact")
#: The weights each method reads (what its settings sentence and the commands' text output name).
METHOD_WEIGHTS: dict[str, tuple[str, ...]] = {
    "linear": ("pitcher_weight",),
    "odds-ratio": ("batter_exponent", "pitcher_exponent"),
    "two-stage": ("first_weight", "in_play_weight"),
}
#: Outcome groups a prior may be given for (walk = BB + HBP; in_play = every ball in play).
PRIOR_GROUPS: tuple[str, ...] = ("strikeout", "walk", "home_run", "in_play")

_FIELDS = (
    "method", "pitcher_weight", "first_weight", "in_play_weight", "batter_exponent", "pitcher_exponent",
    "batter_prior_pa", "pitcher_prior_pa", "basis", "seasons", "interval", "model_error",
)


def _unit(value: Any, name: str) -> float:
    try:
        out = float(value)
    except (TypeError, ValueError):
        out = float("nan")
    if isinstance(value, bool) or not 0.0 <= out <= 1.0:
        msg = f"{name} must be a number in [0, 1] (0 = all batter, 1 = all pitcher); got {value!r}."
        raise ValueError(msg)
    return out


def _nonnegative(value: Any, name: str) -> float:
    try:
        out = float(value)
    except (TypeError, ValueError):
        out = float("nan")
    if isinstance(value, bool) or not (math.isfinite(out) and out >= 0):
        msg = f"{name} must be a finite number >= 0; got {value!r}."
        raise ValueError(msg)
    return out


def _prior(value: Any, name: str) -> float | dict[str, float]:
    """A prior size in PAs, or a mapping from outcome group to PAs (every group given)."""
    if isinstance(value, Mapping):
        keys = set(value)
        unknown, missing = sorted(keys - set(PRIOR_GROUPS)), [g for g in PRIOR_GROUPS if g not in keys]
        if unknown or missing:
            msg = (
                f"{name} as a mapping needs exactly the outcome groups {list(PRIOR_GROUPS)}; "
                f"unknown {unknown}, missing {missing}. Give a number to use one prior for every group."
            )
            raise ValueError(msg)
        return {g: _nonnegative(value[g], f"{name}[{g!r}]") for g in PRIOR_GROUPS}
    return _nonnegative(value, name)


def _model_error(value: Any) -> dict[str, float] | None:
    if value is None:
        return None
    if not isinstance(value, Mapping):
        msg = f"model_error must be None or a mapping from outcome code to a number >= 0; got {value!r}."
        raise ValueError(msg)
    unknown = sorted(set(value) - set(OUTCOMES))
    if unknown:
        msg = f"model_error has unknown outcome code(s) {unknown}; codes are {list(OUTCOMES)}."
        raise ValueError(msg)
    return {c: _nonnegative(value[c], f"model_error[{c!r}]") for c in OUTCOMES if c in value}


def _prior_words(value: float | Mapping[str, float]) -> str:
    if isinstance(value, Mapping):
        return "(" + ", ".join(f"{g.replace('_', ' ')} {v:g}" for g, v in value.items()) + ") PA"
    return f"{value:g} PA"


@dataclass(frozen=True)
class BlendSettings:
    """The blend's settings: one frozen value, validated at construction.

    Parameters
    ----------
    method : {"linear", "odds-ratio", "two-stage"}
        Blend method (:data:`METHODS`).
    pitcher_weight : float in [0, 1]
        Pitcher weight of the linear blend.
    first_weight, in_play_weight : float in [0, 1] or None
        The two-stage blend's pitcher weights (first stage: strikeout, walk, HBP, home run,
        ball in play; second: what balls in play become). None takes ``pitcher_weight``;
        that default is resolved here, once, so the stored value is always a number.
    batter_exponent, pitcher_exponent : float >= 0
        Odds-ratio exponents (1, 1 is the generalised Log5).
    batter_prior_pa, pitcher_prior_pa : float >= 0, or mapping
        League plate appearances of the same split added to each side (0 = raw rates); or a
        mapping from each outcome group of :data:`PRIOR_GROUPS` to its own prior.
    basis : {"observed", "contact"}
        Count observed outcomes, or replace balls in play by contact-expected outcomes.
    seasons : (int, int) or None
        Inclusive season range; all seasons when None.
    interval : float in (0, 1)
        Central probability of the intervals.
    model_error : mapping of outcome code to float >= 0, or None
        The blend's own held-out error per outcome, to widen intervals (kept, not used yet).

    Examples
    --------
    >>> s = BlendSettings(method="two-stage", pitcher_weight=0.4)
    >>> s.first_weight, s.in_play_weight
    (0.4, 0.4)
    >>> BlendSettings.from_dict(s.to_dict()) == s
    True
    >>> s.replace(method="linear").describe()
    'linear blend, pitcher weight 0.40; priors batter 200 PA, pitcher 200 PA; observed basis; all seasons; 80% intervals'
    """

    method: str = "linear"
    pitcher_weight: float = 0.5
    first_weight: float | None = None
    in_play_weight: float | None = None
    batter_exponent: float = 1.0
    pitcher_exponent: float = 1.0
    batter_prior_pa: float | Mapping[str, float] = 200.0
    pitcher_prior_pa: float | Mapping[str, float] = 200.0
    basis: str = "observed"
    seasons: tuple[int, int] | None = None
    interval: float = 0.8
    model_error: Mapping[str, float] | None = None

    def __post_init__(self) -> None:
        if self.method not in METHODS:
            msg = f"method must be one of {list(METHODS)}; got {self.method!r}."
            raise ValueError(msg)
        if self.basis not in BASES:
            msg = f"basis must be one of {list(BASES)}; got {self.basis!r}."
            raise ValueError(msg)
        put = object.__setattr__  # frozen: normalised values are set once, here
        weight = _unit(self.pitcher_weight, "pitcher_weight")
        put(self, "pitcher_weight", weight)
        # the one place the two-stage weights default to the pitcher weight
        for name in ("first_weight", "in_play_weight"):
            value = getattr(self, name)
            put(self, name, weight if value is None else _unit(value, name))
        for name in ("batter_exponent", "pitcher_exponent"):
            put(self, name, _nonnegative(getattr(self, name), name))
        for name in ("batter_prior_pa", "pitcher_prior_pa"):
            put(self, name, _prior(getattr(self, name), name))
        interval = self.interval
        if isinstance(interval, bool) or not (isinstance(interval, (int, float)) and 0.0 < float(interval) < 1.0):
            msg = f"interval must lie strictly between 0 and 1 (e.g. 0.8); got {interval!r}."
            raise ValueError(msg)
        put(self, "interval", float(interval))
        put(self, "seasons", season_range(self.seasons))
        put(self, "model_error", _model_error(self.model_error))

    # ---- derived --------------------------------------------------------------------------
    def blend_weights(self) -> dict[str, float]:
        """The keyword weights of :func:`matchup_widgets.model.blend` for this method."""
        return {
            "pitcher_weight": self.pitcher_weight,
            "first_weight": self.first_weight,
            "in_play_weight": self.in_play_weight,
            "batter_exponent": self.batter_exponent,
            "pitcher_exponent": self.pitcher_exponent,
        }

    def method_weights(self) -> dict[str, float]:
        """Only the weights this method reads, by name (:data:`METHOD_WEIGHTS`)."""
        return {name: getattr(self, name) for name in METHOD_WEIGHTS[self.method]}

    @property
    def has_group_priors(self) -> bool:
        """Whether either prior is given per outcome group."""
        return isinstance(self.batter_prior_pa, Mapping) or isinstance(self.pitcher_prior_pa, Mapping)

    def describe(self) -> str:
        """The settings in one sentence, naming the weights the chosen method uses."""
        if self.method == "two-stage":
            weights = (f"pitcher weights {self.first_weight:.2f} (strikeout, walk, home run) and "
                       f"{self.in_play_weight:.2f} (in play)")
        elif self.method == "odds-ratio":
            weights = f"exponents batter {self.batter_exponent:g}, pitcher {self.pitcher_exponent:g}"
        else:
            weights = f"pitcher weight {self.pitcher_weight:.2f}"
        seasons = "all seasons" if self.seasons is None else f"seasons {self.seasons[0]}-{self.seasons[1]}"
        return (
            f"{self.method} blend, {weights}; priors batter {_prior_words(self.batter_prior_pa)}, "
            f"pitcher {_prior_words(self.pitcher_prior_pa)}; {self.basis} basis; {seasons}; "
            f"{self.interval:.0%} intervals"
        )

    # ---- JSON -----------------------------------------------------------------------------
    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready dict; :meth:`from_dict` reads it back to an equal value."""
        out: dict[str, Any] = {}
        for name in _FIELDS:
            value = getattr(self, name)
            if isinstance(value, Mapping):
                value = dict(value)
            elif isinstance(value, tuple):
                value = list(value)
            out[name] = value
        return out

    @classmethod
    def from_dict(cls, data: Mapping[str, Any]) -> BlendSettings:
        """Settings from a dict as :meth:`to_dict` writes it (missing keys take the defaults).

        Raises
        ------
        ValueError
            For a key that is not a setting, or a bad value (the message names the setting).
        """
        if isinstance(data, BlendSettings):
            return data
        if not isinstance(data, Mapping):
            msg = f"settings must be a JSON object (a dict of setting -> value); got {type(data).__name__}."
            raise ValueError(msg)
        unknown = sorted(set(data) - set(_FIELDS))
        if unknown:
            msg = f"unknown setting(s) {unknown} in the settings; valid settings: {list(_FIELDS)}."
            raise ValueError(msg)
        return cls(**dict(data))

    def replace(self, **changes: Any) -> BlendSettings:
        """A copy with some settings changed (validated again).

        Changing ``pitcher_weight`` alone moves two-stage weights that followed it.
        """
        unknown = sorted(set(changes) - set(_FIELDS))
        if unknown:
            msg = f"unknown setting(s) {unknown}; valid settings: {list(_FIELDS)}."
            raise TypeError(msg)
        return dataclasses.replace(self, **follow_pitcher_weight(self, changes))

    def __getitem__(self, name: str) -> Any:
        """Read a setting by name, as in the dict :meth:`to_dict` writes."""
        if name not in _FIELDS:
            raise KeyError(name)
        return getattr(self, name)

    def __hash__(self) -> int:
        return hash(tuple(_hashable(getattr(self, n)) for n in _FIELDS))


def follow_pitcher_weight(current: Any, changes: Mapping[str, Any]) -> dict[str, Any]:
    """``changes`` with two-stage weights that followed the pitcher weight set to follow it again.

    When ``changes`` moves ``pitcher_weight`` but not a two-stage weight that equals the current
    pitcher weight (the default, or resolved from it), that weight becomes None so it takes the
    new pitcher weight. ``current`` is a :class:`BlendSettings` or a mapping of settings.
    """
    out = dict(changes)
    if "pitcher_weight" not in out:
        return out
    get = current.__getitem__
    for name in ("first_weight", "in_play_weight"):
        if name not in out and get(name) is not None and get(name) == get("pitcher_weight"):
            out[name] = None
    return out


def _hashable(value: Any) -> Any:
    return tuple(sorted(value.items())) if isinstance(value, Mapping) else value


#: Every setting name, in the order of :meth:`BlendSettings.to_dict`.
SETTING_NAMES: tuple[str, ...] = _FIELDS
#: The default of every setting, as given to :class:`BlendSettings` (two-stage weights None).
SETTING_DEFAULTS: dict[str, Any] = {f.name: f.default for f in dataclasses.fields(BlendSettings)}


def read_settings(data: Any, *, method: str | None = None) -> BlendSettings:
    """Settings from JSON: one settings object, or the ``fit`` command's output.

    Parameters
    ----------
    data : BlendSettings, mapping, or str / path of a JSON file
        Either a settings mapping as :meth:`BlendSettings.to_dict` writes it, or the ``fit``
        command's ``--json`` output (or :meth:`CalibrationResult.to_dict`), whose
        ``"settings"`` holds one fitted settings object per method and the ``"best"`` one.
    method : str, optional
        With the ``fit`` output: which method's fitted settings to take; its best by held-out
        Brier score when None. With one settings object: must match its method if given.

    Raises
    ------
    ValueError
        For a file that is neither shape, a method the file has no settings for, or a bad value.
    """
    if isinstance(data, BlendSettings):
        found = data
    else:
        if not isinstance(data, Mapping):
            data = _read_json(data)
        fitted = data.get("settings") if isinstance(data, Mapping) else None
        if isinstance(fitted, Mapping) and isinstance(fitted.get("best"), str):
            chosen = fitted["best"] if method is None else method
            if chosen not in fitted or chosen == "best":
                msg = (
                    f"the fitted settings have no method {chosen!r}; they hold "
                    f"{[m for m in fitted if m != 'best']}. Fit that method, or choose one of those."
                )
                raise ValueError(msg)
            return BlendSettings.from_dict(fitted[chosen])
        found = BlendSettings.from_dict(data)
    if method is not None and found.method != method:
        msg = (
            f"the settings are for the {found.method} blend, not {method!r}; drop the method, "
            "or use settings fitted for it."
        )
        raise ValueError(msg)
    return found


def _read_json(path: Any) -> Any:
    import json
    from pathlib import Path

    file = Path(path)
    try:
        return json.loads(file.read_text(encoding="utf-8"))
    except FileNotFoundError:
        msg = f"settings file {str(file)!r} does not exist; write one with `fit --json > FILE.json`."
        raise ValueError(msg) from None
    except (OSError, UnicodeDecodeError, json.JSONDecodeError) as exc:
        msg = f"settings file {str(file)!r} is not readable JSON ({exc}); write one with `fit --json > FILE.json`."
        raise ValueError(msg) from None
