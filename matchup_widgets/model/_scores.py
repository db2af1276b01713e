"""Proper scores for outcome distributions: multiclass Brier score and log loss.

Both accept the observed outcomes in two forms, so the same function scores single plate
appearances and collapsed cells (many PAs sharing one prediction):

* a 1-D array of outcome indices (positions in ``OUTCOMES``) or outcome codes, one per PA;
* a 2-D array of outcome counts with the same shape as the probabilities, one row per cell.
  A cell with ``n`` PAs counts ``n`` times in the mean.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ..data import OUTCOMES

if TYPE_CHECKING:  # pandas is imported where the table is built
    import pandas as pd

__all__ = ["brier_score", "log_loss", "observed_counts", "reliability_table"]

#: Probabilities below this are raised to it before taking logs (a zero would give inf).
_LOG_FLOOR = 1e-15


def observed_counts(observed, n_outcomes: int = len(OUTCOMES)) -> np.ndarray:
    """Return observed outcomes as a 2-D count array (one-hot rows for single PAs).

    Parameters
    ----------
    observed : array-like
        1-D outcome indices (0 .. n_outcomes - 1) or outcome codes from ``OUTCOMES``,
        or a 2-D array of non-negative counts with ``n_outcomes`` columns.
    n_outcomes : int, default len(OUTCOMES)
        Number of outcome categories.

    Returns
    -------
    numpy.ndarray of float, shape (n_rows, n_outcomes)

    Raises
    ------
    ValueError
        If codes are unknown, indices out of range or counts negative.

    Examples
    --------
    >>> observed_counts([2, 0], n_outcomes=3)
    array([[0., 0., 1.],
           [1., 0., 0.]])
    """
    obs = np.asarray(observed)
    if obs.ndim == 2:
        if obs.shape[1] != n_outcomes:
            msg = (
                f"observed counts have {obs.shape[1]} columns but there are {n_outcomes} "
                "outcomes; pass one column per outcome in OUTCOMES order."
            )
            raise ValueError(msg)
        counts = obs.astype(float)
        bad = np.flatnonzero(~np.isfinite(counts).all(axis=1) | (counts < 0).any(axis=1))
        if bad.size:
            msg = (
                f"observed counts have {bad.size} row(s) with negative or missing counts "
                f"(rows {', '.join(map(str, bad[:5]))}); counts must be finite and >= 0."
            )
            raise ValueError(msg)
        return counts
    if obs.ndim != 1:
        msg = f"observed must be 1-D (one outcome per PA) or 2-D (counts per row); got {obs.ndim}-D."
        raise ValueError(msg)
    if obs.dtype.kind in "iu":
        index = obs.astype(np.intp)
    else:
        codes = np.asarray(obs, dtype=object).astype(str)
        lookup = {code: i for i, code in enumerate(OUTCOMES)}
        # look up each distinct code once, then spread back to the rows
        uniq, inverse = np.unique(codes, return_inverse=True)
        index = np.array([lookup.get(c, -1) for c in uniq], dtype=np.intp)
        unknown = uniq[index < 0]
        if unknown.size:
            msg = (
                f"observed has {unknown.size} unknown outcome code(s) "
                f"({', '.join(map(repr, unknown[:5]))}); use codes from OUTCOMES: "
                f"{', '.join(OUTCOMES)}."
            )
            raise ValueError(msg)
        index = index[inverse]
    bad = np.flatnonzero((index < 0) | (index >= n_outcomes))
    if bad.size:
        msg = (
            f"observed has {bad.size} outcome index(es) outside 0..{n_outcomes - 1} "
            f"(rows {', '.join(map(str, bad[:5]))}); pass positions in OUTCOMES order."
        )
        raise ValueError(msg)
    counts = np.zeros((index.size, n_outcomes))
    counts[np.arange(index.size), index] = 1.0
    return counts


def _check(probabilities, observed) -> tuple[np.ndarray, np.ndarray]:
    p = np.asarray(probabilities, dtype=float)
    if p.ndim != 2:
        msg = (
            f"probabilities must be 2-D (rows x outcomes); got shape {p.shape}. "
            "Reshape a single distribution with p.reshape(1, -1)."
        )
        raise ValueError(msg)
    y = observed_counts(observed, p.shape[1])
    if y.shape[0] != p.shape[0]:
        msg = (
            f"probabilities have {p.shape[0]} rows but observed has {y.shape[0]}; "
            "pass one observed outcome (or count row) per probability row."
        )
        raise ValueError(msg)
    bad = np.flatnonzero(~np.isfinite(p).all(axis=1))
    if bad.size:
        msg = (
            f"probabilities have {bad.size} row(s) with missing or infinite values "
            f"(rows {', '.join(map(str, bad[:5]))}); fill or drop them first."
        )
        raise ValueError(msg)
    if y.sum() <= 0:
        msg = "observed holds no plate appearances (all counts are zero); nothing to score."
        raise ValueError(msg)
    return p, y


def brier_score(probabilities, observed) -> float:
    """Multiclass Brier score: mean over PAs of the summed squared error over outcomes.

    Brier (1950): ``mean_i sum_k (p_ik - y_ik)^2`` with ``y`` the one-hot observed
    outcome; it lies in [0, 2], lower is better. For a cell of ``n`` PAs sharing the
    prediction ``p`` with outcome counts ``y`` the PAs contribute
    ``n * ||p||^2 - 2 p . y + n`` (each one-hot vector has unit length).

    Parameters
    ----------
    probabilities : array-like, shape (n_rows, n_outcomes)
        Predicted distributions, one row per PA or per cell.
    observed : array-like
        Outcome index/code per PA (1-D) or outcome counts per row (2-D); see
        :func:`observed_counts`.

    Returns
    -------
    float

    Examples
    --------
    >>> round(brier_score([[1/3, 1/3, 1/3]], [1]), 12)  # three equal chances, middle happens
    0.666666666667
    >>> brier_score([[0.5, 0.5]], [[3, 1]])  # one cell of four PAs
    0.5
    """
    p, y = _check(probabilities, observed)
    n = y.sum(axis=1)
    total = np.sum(n * np.einsum("ij,ij->i", p, p)) - 2.0 * np.sum(p * y) + n.sum()
    return float(total / n.sum())


def log_loss(probabilities, observed) -> float:
    """Mean negative log probability of the observed outcome (natural log).

    Probabilities are floored at 1e-15 so an outcome given zero chance costs about 34.5
    instead of infinity; lower is better.

    Parameters
    ----------
    probabilities : array-like, shape (n_rows, n_outcomes)
        Predicted distributions, one row per PA or per cell.
    observed : array-like
        Outcome index/code per PA (1-D) or outcome counts per row (2-D).

    Returns
    -------
    float

    Examples
    --------
    >>> round(log_loss([[0.25, 0.75]], [1]), 6)  # -ln 0.75
    0.287682
    """
    p, y = _check(probabilities, observed)
    logp = np.log(np.maximum(p, _LOG_FLOOR))
    return float(-np.sum(y * logp) / y.sum())


def reliability_table(probabilities, observed, *, n_bins: int = 10) -> pd.DataFrame:
    """Predicted probability against observed frequency, per outcome, in equal-count bins.

    For each outcome the rows (PAs or cells) are sorted by their predicted probability and cut
    into ``n_bins`` bins holding about the same number of PAs (a cell of ``n`` PAs weighs
    ``n``). A well-calibrated forecast has ``mean_predicted`` close to ``observed_rate`` in
    every bin.

    Parameters
    ----------
    probabilities : array-like, shape (n_rows, n_outcomes)
        Predicted distributions, last axis in ``OUTCOMES`` order.
    observed : array-like
        Outcome index/code per PA (1-D) or outcome counts per row (2-D).
    n_bins : int, default 10
        Bins per outcome.

    Returns
    -------
    pandas.DataFrame
        Columns ``outcome`` (the code, or the column position when there are not nine
        outcomes), ``bin`` (0-based), ``predicted_low``, ``predicted_high``,
        ``mean_predicted``, ``observed_rate``, ``n_pa``; empty bins are left out.

    Examples
    --------
    >>> t = reliability_table([[0.2, 0.8], [0.6, 0.4]], [[1, 4], [3, 2]], n_bins=2)
    >>> t[["outcome", "mean_predicted", "observed_rate", "n_pa"]].to_numpy().tolist()
    [['0', 0.2, 0.2, 5.0], ['0', 0.6, 0.6, 5.0], ['1', 0.4, 0.4, 5.0], ['1', 0.8, 0.8, 5.0]]
    """
    import pandas as pd

    p, y = _check(probabilities, observed)
    if int(n_bins) < 1:
        msg = f"n_bins must be a positive number of bins; got {n_bins}."
        raise ValueError(msg)
    n_bins = int(n_bins)
    n = y.sum(axis=1)
    total = n.sum()
    codes = list(OUTCOMES) if p.shape[1] == len(OUTCOMES) else [str(k) for k in range(p.shape[1])]
    parts = []
    for k, code in enumerate(codes):  # one pass per outcome; the rows are handled vectorised
        order = np.argsort(p[:, k], kind="stable")
        before = np.cumsum(n[order]) - n[order]  # PAs ahead of each row in sorted order
        bins = np.minimum((before / total * n_bins).astype(int), n_bins - 1)
        w = np.bincount(bins, weights=n[order], minlength=n_bins)
        pred = np.bincount(bins, weights=n[order] * p[order, k], minlength=n_bins)
        hits = np.bincount(bins, weights=y[order, k], minlength=n_bins)
        low = np.full(n_bins, np.inf)
        high = np.full(n_bins, -np.inf)
        np.minimum.at(low, bins, p[order, k])
        np.maximum.at(high, bins, p[order, k])
        used = w > 0
        parts.append(
            pd.DataFrame(
                {
                    "outcome": code,
                    "bin": np.arange(n_bins)[used],
                    "predicted_low": low[used],
                    "predicted_high": high[used],
                    "mean_predicted": pred[used] / w[used],
                    "observed_rate": hits[used] / w[used],
                    "n_pa": w[used],
                }
            )
        )
    return pd.concat(parts, ignore_index=True)
