"""Uncertainty: Dirichlet posteriors of each side, propagated through a blend by sampling."""

from __future__ import annotations

from typing import Any

import numpy as np

from ._arrays import as_outcome_array, as_probabilities
from ._blend import blend

#: Smallest prior concentration per outcome used for intervals (half a count, as in the
#: Jeffreys prior), so an outcome never seen in a tiny sample still gets a wide upper bound
#: instead of a falsely precise interval at zero.
INTERVAL_FLOOR: float = 0.5


def posterior_draws(
    counts: Any,
    league: Any,
    prior_pa: Any,
    *,
    n_draws: int = 2000,
    seed: int | np.random.Generator | None = 0,
) -> np.ndarray:
    """Draw outcome distributions from the Dirichlet posterior of counts plus a league prior.

    The posterior is ``Dirichlet(counts + max(prior_pa * league, INTERVAL_FLOOR))``; its
    mean matches :func:`shrink` up to the floor, which only matters for outcomes with a
    prior weight below half a count.

    Parameters
    ----------
    counts : array-like, shape (..., 9)
        Outcome counts (may be fractional), last axis in ``OUTCOMES`` order.
    league : array-like, shape (..., 9)
        League probabilities of the same platoon split.
    prior_pa : float or array-like
        Prior size in plate appearances (>= 0), broadcastable to the leading axes.
    n_draws : int, keyword-only
        Number of draws.
    seed : int, Generator or None, keyword-only
        Seed for a fixed, repeatable result.

    Returns
    -------
    numpy.ndarray, shape (n_draws, ..., 9)
        Draws, each summing to 1.

    Examples
    --------
    >>> import numpy as np
    >>> d = posterior_draws(np.array([50, 10, 1, 25, 5, 1, 3, 55, 50]), np.full(9, 1 / 9), 0, n_draws=10)
    >>> d.shape, bool(np.allclose(d.sum(axis=-1), 1))
    ((10, 9), True)
    """
    c = as_outcome_array(counts, "counts")
    lg = as_probabilities(league, "league")
    prior = np.asarray(prior_pa, dtype=float)
    if not np.all(np.isfinite(prior)) or np.any(prior < 0):
        msg = f"prior_pa must be a finite number >= 0 for intervals; got {np.atleast_1d(prior).ravel()[:5].tolist()}."
        raise ValueError(msg)
    if int(n_draws) < 10:
        msg = f"n_draws must be at least 10 for a usable interval; got {n_draws}."
        raise ValueError(msg)
    alpha = c + np.maximum(prior[..., None] * lg, INTERVAL_FLOOR)
    rng = np.random.default_rng(seed)
    # Dirichlet draws as normalised independent gammas (vectorised over every axis)
    g = rng.standard_gamma(np.broadcast_to(alpha, (int(n_draws),) + alpha.shape))
    total = g.sum(axis=-1, keepdims=True)
    # very small shapes can underflow every gamma of a row to 0: fall back to the mean there
    mean = alpha / alpha.sum(axis=-1, keepdims=True)
    with np.errstate(invalid="ignore", divide="ignore"):
        out = np.where(total > 0, g / total, mean)
    return out


#: The sides whose own intervals :func:`matchup_interval` reports beside the matchup's.
_SIDE_ROWS: tuple[str, ...] = ("batter", "pitcher", "league")


def matchup_interval(
    method: str,
    batter_counts: Any,
    pitcher_counts: Any,
    league: Any,
    *,
    batter_prior_pa: Any,
    pitcher_prior_pa: Any,
    interval: float = 0.8,
    n_draws: int = 2000,
    seed: int | None = 0,
    point: Any = None,
    league_counts: Any = None,
    **weights: Any,
) -> dict[str, Any]:
    """Credible interval of each blended probability and of each side, and the effective sample size.

    Draws each side from its Dirichlet posterior (:func:`posterior_draws`), blends every
    pair of draws with the same method and weights, and takes the central ``interval``
    quantiles of each outcome. The same side draws give the interval of each side's shrunk
    distribution; no second set is drawn.

    Parameters
    ----------
    method : {"linear", "odds-ratio", "two-stage"}
        Blend method, as in :func:`blend`.
    batter_counts, pitcher_counts : array-like, shape (..., 9)
        Raw outcome counts of each side in the platoon split.
    league : array-like, shape (..., 9)
        League probabilities of the split.
    batter_prior_pa, pitcher_prior_pa : float, keyword-only
        Prior sizes in plate appearances.
    interval : float, keyword-only
        Central probability of the interval, in (0, 1).
    n_draws, seed : keyword-only
        Number of draws and the seed (fixed by default so results repeat).
    point : array-like, optional, keyword-only
        Point estimate; when given, each matchup interval is widened to contain it.
    league_counts : array-like, shape (..., 9), optional, keyword-only
        League outcome counts of the split. When given, the league distribution gets its
        own interval too: its Dirichlet posterior from these counts with no league prior
        (only the half-count floor every interval uses), drawn after both sides from the
        same generator, so the matchup draws stay those of :func:`matchup_draws`.
    **weights
        Blend weights, as in :func:`blend`.

    Returns
    -------
    dict
        ``lo`` and ``hi`` (shape (..., 9)) of the matchup; ``effective_pa`` (shape (...)):
        the number of plate appearances of a single Dirichlet with the same total variance,
        ``sum p(1 - p) / sum var - 1``; ``side_lo`` and ``side_hi``: dicts from side
        (``batter``, ``pitcher`` and, with ``league_counts``, ``league``) to arrays of
        shape (..., 9), the central intervals of each side's posterior.

    Examples
    --------
    >>> import numpy as np
    >>> c = np.array([50, 10, 1, 25, 5, 1, 3, 55, 50])
    >>> out = matchup_interval("linear", c, c, c / c.sum(), batter_prior_pa=0,
    ...                        pitcher_prior_pa=0, pitcher_weight=0.5, n_draws=500)
    >>> bool(np.all(out["lo"] <= out["hi"])), 350 < float(out["effective_pa"]) < 450
    (True, True)
    >>> sorted(out["side_lo"]), bool(np.all(out["side_lo"]["batter"] <= out["side_hi"]["batter"]))
    (['batter', 'pitcher'], True)
    """
    if not 0.0 < float(interval) < 1.0:
        msg = f"interval must lie strictly between 0 and 1 (e.g. 0.8 for an 80% interval); got {interval}."
        raise ValueError(msg)
    draws, sides = matchup_draws(
        method, batter_counts, pitcher_counts, league,
        batter_prior_pa=batter_prior_pa, pitcher_prior_pa=pitcher_prior_pa,
        n_draws=n_draws, seed=seed, return_sides=True, **weights,
    )
    if league_counts is not None:
        # no prior beyond the floor: the league of the split is its own sample
        sides["league"] = posterior_draws(league_counts, league, 0.0, n_draws=n_draws, seed=sides.pop("rng"))
    sides.pop("rng", None)
    names = [s for s in _SIDE_ROWS if s in sides]
    tail = (1.0 - float(interval)) / 2.0
    # one quantile pass over the matchup and every side (axis 1 holds them)
    stacked = np.stack([draws, *(sides[s] for s in names)], axis=1)
    lo_all, hi_all = np.quantile(stacked, [tail, 1.0 - tail], axis=0)
    lo, hi = lo_all[0], hi_all[0]
    if point is not None:
        p = as_probabilities(point, "point")
        lo, hi = np.minimum(lo, p), np.maximum(hi, p)
    mean = draws.mean(axis=0)
    var = draws.var(axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        ess = (mean * (1 - mean)).sum(axis=-1) / var.sum(axis=-1) - 1.0
    return {
        "lo": lo,
        "hi": hi,
        "effective_pa": ess,
        "side_lo": {s: lo_all[i + 1] for i, s in enumerate(names)},
        "side_hi": {s: hi_all[i + 1] for i, s in enumerate(names)},
    }


def matchup_draws(
    method: str,
    batter_counts: Any,
    pitcher_counts: Any,
    league: Any,
    *,
    batter_prior_pa: Any,
    pitcher_prior_pa: Any,
    n_draws: int = 2000,
    seed: int | None = 0,
    return_sides: bool = False,
    **weights: Any,
) -> Any:
    """Posterior draws of a blended matchup distribution: the draws behind its intervals.

    Each side is drawn from its Dirichlet posterior (:func:`posterior_draws`; batter first,
    then pitcher, from one generator seeded with ``seed``) and every pair of draws is
    blended with the same method and weights. :func:`matchup_interval` takes quantiles of
    these draws; run values carry them through linear weights or the base-out chain.

    Parameters
    ----------
    return_sides : bool, keyword-only
        Also return the side draws the blend used, so callers never draw them again.

    Returns
    -------
    numpy.ndarray, shape (n_draws, ..., 9)
        The blended draws; with ``return_sides`` a pair ``(draws, sides)`` where ``sides``
        maps ``batter`` and ``pitcher`` to their draws and ``rng`` to the generator, ready
        for further draws that keep these unchanged.

    Examples
    --------
    >>> import numpy as np
    >>> c = np.array([50, 10, 1, 25, 5, 1, 3, 55, 50])
    >>> d = matchup_draws("linear", c, c, c / c.sum(), batter_prior_pa=0,
    ...                   pitcher_prior_pa=0, pitcher_weight=0.5, n_draws=100)
    >>> d.shape, bool(np.allclose(d.sum(axis=-1), 1.0))
    ((100, 9), True)
    """
    rng = np.random.default_rng(seed)
    b = posterior_draws(batter_counts, league, batter_prior_pa, n_draws=n_draws, seed=rng)
    q = posterior_draws(pitcher_counts, league, pitcher_prior_pa, n_draws=n_draws, seed=rng)
    lg = as_probabilities(league, "league")
    draws = np.asarray(blend(method, b, q, lg, **weights))
    if return_sides:
        return draws, {"batter": b, "pitcher": q, "rng": rng}
    return draws
