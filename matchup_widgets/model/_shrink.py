"""Shrinkage of outcome counts toward the league distribution of the same platoon split."""

from __future__ import annotations

from typing import Any

import numpy as np

from ._arrays import as_outcome_array, as_probabilities, relabel


def shrink(counts: Any, league: Any, prior_pa: Any) -> Any:
    """Pull observed outcome counts toward a league distribution.

    Adds ``prior_pa`` plate appearances distributed like ``league`` to the counts
    (a Dirichlet prior with concentration ``prior_pa * league``) and returns the
    posterior mean ``(counts + prior_pa * league) / (n + prior_pa)``.

    Parameters
    ----------
    counts : array-like or pandas object, shape (..., 9)
        Outcome counts (may be fractional) with the last axis in ``OUTCOMES`` order,
        or a DataFrame/Series labelled by the outcome codes in any order.
    league : array-like or pandas object, shape (..., 9)
        League outcome probabilities, broadcastable against ``counts``.
    prior_pa : float or array-like
        Prior size in plate appearances, >= 0, broadcastable to the leading axes of
        ``counts``. 0 returns the raw rates.

    Returns
    -------
    numpy.ndarray or pandas object
        Shrunk probabilities summing to 1 over the last axis. Where ``n + prior_pa``
        is 0 (no plate appearances and no prior), the league distribution is returned.

    Raises
    ------
    ValueError
        If counts are negative, ``league`` does not sum to 1, or ``prior_pa`` < 0.

    Examples
    --------
    >>> import numpy as np
    >>> league = np.full(9, 1 / 9)
    >>> counts = np.array([9, 0, 0, 0, 0, 0, 0, 0, 0])
    >>> shrink(counts, league, 9).round(4).tolist()
    [0.5556, 0.0556, 0.0556, 0.0556, 0.0556, 0.0556, 0.0556, 0.0556, 0.0556]
    """
    c = as_outcome_array(counts, "counts")
    lg = as_probabilities(league, "league")
    prior = np.asarray(prior_pa, dtype=float)
    if not np.all(np.isfinite(prior) | np.isposinf(prior)) or np.any(prior < 0):
        bad = np.atleast_1d(prior).ravel()
        bad = bad[~(bad >= 0)][:5].tolist()
        msg = f"prior_pa must be >= 0 plate appearances; got {bad}. Use 0 for raw rates."
        raise ValueError(msg)
    n = c.sum(axis=-1)
    shape = np.broadcast_shapes(c.shape, lg.shape, prior.shape + (1,))
    c, lg = np.broadcast_to(c, shape), np.broadcast_to(lg, shape)
    prior = np.broadcast_to(prior[..., None], shape)
    n = np.broadcast_to(n[..., None], shape)
    # Written as a weighted average of the raw rates and the league, with the prior's share
    # prior / (n + prior), so that neither a tiny (even subnormal) prior nor an infinite
    # one loses precision: n = 0 gives the league, an infinite prior gives the league.
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        prior_share = np.where(np.isinf(prior), 1.0, prior / (n + prior))
        rates = np.where(n > 0, c / n, lg)
    prior_share = np.where(n > 0, prior_share, 1.0)
    out = (1.0 - prior_share) * rates + prior_share * lg
    out = out / out.sum(axis=-1, keepdims=True)
    return relabel(out, counts)
