"""Private helpers: turn probability/count inputs into arrays whose last axis follows OUTCOMES.

Public model functions accept either numpy arrays (last axis already in ``OUTCOMES`` order)
or pandas objects labelled by the outcome codes in any order; pandas inputs are reordered
here so the column order of a table can never change a result.
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import OUTCOMES

_N = len(OUTCOMES)
_INDEX = {code: i for i, code in enumerate(OUTCOMES)}


def _labels_of(value: Any) -> list[str] | None:
    if isinstance(value, pd.DataFrame):
        return [str(c) for c in value.columns]
    if isinstance(value, pd.Series):
        return [str(c) for c in value.index]
    return None


def as_outcome_array(value: Any, name: str) -> np.ndarray:
    """Return ``value`` as a float array with last axis of length 9 in ``OUTCOMES`` order.

    Pandas inputs are reordered by their outcome labels (extra labels such as ``pa`` are
    ignored); arrays must already follow ``OUTCOMES``.
    """
    labels = _labels_of(value)
    if labels is not None:
        missing = [c for c in OUTCOMES if c not in labels]
        if missing:
            msg = (
                f"{name} lacks outcome column(s) {missing[:5]}; it must be labelled by all of "
                f"{list(OUTCOMES)} (got {labels[:12]}). Rename or add those columns."
            )
            raise ValueError(msg)
        if isinstance(value, pd.DataFrame):
            arr = value.loc[:, list(OUTCOMES)].to_numpy(dtype=float)
        else:
            arr = value.loc[list(OUTCOMES)].to_numpy(dtype=float)
    else:
        arr = np.asarray(value, dtype=float)
    if arr.ndim == 0 or arr.shape[-1] != _N:
        msg = (
            f"{name} must have a last axis of length {_N} (one entry per outcome code "
            f"{list(OUTCOMES)}); got shape {arr.shape}. Pass a pandas object labelled by the "
            "codes, or an array whose last axis follows OUTCOMES."
        )
        raise ValueError(msg)
    if not np.all(np.isfinite(arr)):
        bad = np.argwhere(~np.isfinite(arr))[:5].tolist()
        msg = f"{name} has non-finite value(s) at index {bad}; fill or drop them first."
        raise ValueError(msg)
    if np.any(arr < 0):
        bad = np.argwhere(arr < 0)[:5].tolist()
        n_bad = int(np.sum(arr < 0))
        msg = f"{name} has {n_bad} negative value(s) (at index {bad}); counts and probabilities must be >= 0."
        raise ValueError(msg)
    return arr


def as_probabilities(value: Any, name: str, *, atol: float = 1e-6) -> np.ndarray:
    """Like :func:`as_outcome_array`, and check each vector sums to 1 (then renormalise exactly)."""
    arr = as_outcome_array(value, name)
    total = arr.sum(axis=-1)
    off = np.abs(total - 1.0) > atol
    if np.any(off):
        where = np.argwhere(np.atleast_1d(off))[:5].tolist()
        examples = np.atleast_1d(total)[np.atleast_1d(off)][:5].round(6).tolist()
        msg = (
            f"{name} must hold probabilities summing to 1 over the outcome codes; "
            f"{int(np.sum(off))} vector(s) do not (at {where}, sums {examples}). "
            "Divide counts by their total first (or use shrink)."
        )
        raise ValueError(msg)
    return arr / total[..., None]


def as_weight(value: Any, name: str) -> np.ndarray:
    """Return a weight (scalar or array over leading axes) checked to lie in [0, 1]."""
    arr = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(arr)) or np.any((arr < 0) | (arr > 1)):
        flat = np.atleast_1d(arr).ravel()
        bad = flat[~np.isfinite(flat) | (flat < 0) | (flat > 1)][:5].tolist()
        msg = f"{name} must lie in [0, 1]; got {bad}. Use 0 for all batter, 1 for all pitcher."
        raise ValueError(msg)
    return arr


def normalise(p: np.ndarray) -> np.ndarray:
    """Divide by the sum over the last axis so every vector sums to 1 to rounding."""
    return p / p.sum(axis=-1, keepdims=True)


def relabel(result: np.ndarray, like: Any) -> Any:
    """Label ``result`` by ``OUTCOMES`` with the row index of ``like`` when ``like`` was pandas."""
    if isinstance(like, pd.DataFrame) and result.ndim == 2:
        return pd.DataFrame(result, index=like.index, columns=list(OUTCOMES))
    if isinstance(like, pd.Series) and result.ndim == 1:
        return pd.Series(result, index=list(OUTCOMES), name=like.name)
    return result
