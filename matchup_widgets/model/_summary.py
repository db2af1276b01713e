"""One-line summaries of an outcome distribution: rates, on-base probability, wOBA, runs per PA."""

from __future__ import annotations

import functools
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import ON_BASE, OUTCOMES

from ._arrays import as_probabilities

#: Fallback wOBA weights per plate-appearance outcome: the widely published 2019 season
#: constants (walk .690, hit by pitch .719, single .870, double 1.217, triple 1.529,
#: home run 1.940; outs 0), with their wOBA scale 1.157. Source: the 2019 season's published
#: wOBA constants table (common practice; values from memory). Used only when the runs layer
#: cannot supply weights.
FALLBACK_WOBA_WEIGHTS: dict[str, float] = {
    "K": 0.0,
    "BB": 0.690,
    "HBP": 0.719,
    "1B": 0.870,
    "2B": 1.217,
    "3B": 1.529,
    "HR": 1.940,
    "GB_OUT": 0.0,
    "AIR_OUT": 0.0,
}
#: wOBA scale of the same 2019 table: runs above average per PA = (wOBA - league wOBA) / scale.
FALLBACK_WOBA_SCALE: float = 1.157

#: Columns of :func:`summarize` in order.
SUMMARY_COLUMNS: tuple[str, ...] = ("k_rate", "bb_rate", "hr_rate", "on_base", "woba", "runs_per_pa")

_ON_BASE_IDX = np.array([OUTCOMES.index(c) for c in ON_BASE])
_K, _BB, _HR = OUTCOMES.index("K"), OUTCOMES.index("BB"), OUTCOMES.index("HR")


def run_weights(league: Any = None) -> dict[str, Any]:
    """Return the wOBA weights and linear weights used to summarise distributions.

    Uses the runs layer (``matchup_widgets.runs.woba_weights`` and ``linear_weights`` on
    the league distribution) when it is available, else the published 2019 constants
    (:data:`FALLBACK_WOBA_WEIGHTS`), turning them into run values relative to the league
    average PA with the 2019 wOBA scale.

    Parameters
    ----------
    league : array-like, shape (9,), optional
        League outcome probabilities. Without it the fallback linear weights are relative
        to an average PA of the fallback table's own scale (a league at wOBA 0).

    Returns
    -------
    dict
        ``woba`` (array of 9 weights), ``linear`` (array of 9 run values relative to an
        average PA, or None without a league) and ``source`` (a short text).

    Examples
    --------
    >>> w = run_weights()
    >>> float(w["woba"][6])  # home run, 2019 constant, when the runs layer is absent
    1.94
    """
    key = None if league is None else tuple(np.round(as_probabilities(league, "league"), 12).tolist())
    return _run_weights_cached(key)


@functools.lru_cache(maxsize=64)
def _run_weights_cached(league: tuple[float, ...] | None) -> dict[str, Any]:
    runs_weights = _runs_layer_weights(league)
    if runs_weights is not None:
        return runs_weights
    woba = np.array([FALLBACK_WOBA_WEIGHTS[c] for c in OUTCOMES])
    linear = None
    if league is not None:
        lg = np.asarray(league)
        # runs above average per PA: (w_i - league wOBA) / scale (common practice)
        linear = (woba - float(lg @ woba)) / FALLBACK_WOBA_SCALE
    return {"woba": woba, "linear": linear, "source": "2019 published wOBA constants"}


def _runs_layer_weights(league: tuple[float, ...] | None) -> dict[str, Any] | None:
    """Weights from the runs layer, or None when it does not provide them yet."""
    if league is None:
        return None
    try:
        from matchup_widgets import runs
    except ImportError:
        return None
    woba_fn = getattr(runs, "woba_weights", None)
    linear_fn = getattr(runs, "linear_weights", None)
    if woba_fn is None or linear_fn is None:
        return None
    probs = pd.Series(league, index=list(OUTCOMES))
    try:
        woba = woba_fn(probs)
        linear = linear_fn(probs)
    except ValueError:
        return None  # e.g. a league without outs: the published constants still apply
    if isinstance(woba, tuple):  # (weights, scale)
        woba = woba[0]
    woba = _as_weight_vector(woba, "woba_weights")
    linear = _as_weight_vector(linear, "linear_weights")
    return {"woba": woba, "linear": linear, "source": "run values from the runs layer"}


def _as_weight_vector(value: Any, name: str) -> np.ndarray:
    """Accept a mapping/Series code -> weight (missing codes weigh 0) or a 9-vector."""
    if isinstance(value, (dict, pd.Series)):
        mapping = dict(value.items()) if isinstance(value, pd.Series) else value
        return np.array([float(mapping.get(c, 0.0)) for c in OUTCOMES])
    arr = np.asarray(value, dtype=float)
    if arr.shape != (len(OUTCOMES),):
        msg = f"runs.{name} returned shape {arr.shape}; expected a mapping by outcome code."
        raise TypeError(msg)
    return arr


def summarize(probs: Any, *, league: Any = None, weights: dict[str, Any] | None = None) -> pd.DataFrame:
    """Summarise outcome distributions: K%, BB%, HR%, on-base probability, wOBA, runs per PA.

    Parameters
    ----------
    probs : array-like or pandas object, shape (..., 9)
        Outcome probabilities (last axis in ``OUTCOMES`` order, or labelled by the codes).
    league : array-like, shape (9,), optional, keyword-only
        League distribution; needed for ``runs_per_pa`` (runs relative to an average
        league PA). Without it ``runs_per_pa`` is NaN.
    weights : dict, optional, keyword-only
        ``{"woba": 9 weights, "linear": 9 run values}``; defaults to :func:`run_weights`.

    Returns
    -------
    pandas.DataFrame
        One row per distribution (the leading axes flattened, or the input's index),
        columns :data:`SUMMARY_COLUMNS`. On-base probability counts walks, hit-by-pitch
        and hits per PA.

    Examples
    --------
    >>> p = [0.2, 0.1, 0.0, 0.15, 0.05, 0.0, 0.05, 0.25, 0.2]
    >>> summarize(p).loc[0, ["k_rate", "on_base"]].round(3).tolist()
    [0.2, 0.35]
    """
    arr = as_probabilities(probs, "probs")
    if weights is None:
        weights = run_weights(league)
    woba_w = np.asarray(weights["woba"], dtype=float)
    linear = weights.get("linear") if league is not None else None
    index = None
    if isinstance(probs, pd.DataFrame):
        index = probs.index
    elif isinstance(probs, pd.Series) and probs.name is not None:
        index = [probs.name]
    return pd.DataFrame(summary_array(arr, woba_w, linear), index=index, columns=_SUMMARY_INDEX)


_SUMMARY_INDEX = pd.Index(list(SUMMARY_COLUMNS))


def summary_array(probs: np.ndarray, woba: np.ndarray, linear: np.ndarray | None) -> np.ndarray:
    """The summary numbers (rows, 6) of checked probabilities (..., 9), in SUMMARY_COLUMNS order."""
    flat = probs.reshape(-1, len(OUTCOMES))
    runs = np.full(len(flat), np.nan) if linear is None else flat @ np.asarray(linear, dtype=float)
    return np.column_stack(
        [
            flat[:, _K],
            flat[:, _BB],
            flat[:, _HR],
            flat[:, _ON_BASE_IDX].sum(axis=1),
            flat @ np.asarray(woba, dtype=float),
            runs,
        ]
    )
