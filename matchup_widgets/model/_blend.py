"""Blends: combine a batter's and a pitcher's outcome distributions into one matchup estimate.

All blends broadcast over leading axes; the last axis follows ``OUTCOMES`` (or inputs are
pandas objects labelled by the codes, in any order). Every output sums to 1 over the codes.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from matchup_widgets.data import IN_PLAY, OUTCOMES

from ._arrays import as_probabilities, as_weight, normalise, relabel
from ._settings import METHODS

_IN_PLAY_IDX = np.array([OUTCOMES.index(c) for c in IN_PLAY])
_NOT_IN_PLAY_IDX = np.array([i for i, c in enumerate(OUTCOMES) if c not in IN_PLAY])


def linear_blend(batter: Any, pitcher: Any, pitcher_weight: Any) -> Any:
    """Mix the two sides: ``p = w * pitcher + (1 - w) * batter``.

    Parameters
    ----------
    batter, pitcher : array-like or pandas object, shape (..., 9)
        Outcome probabilities of each side.
    pitcher_weight : float or array-like in [0, 1]
        Weight ``w`` of the pitcher, broadcastable to the leading axes.

    Returns
    -------
    numpy.ndarray or pandas object
        Blended probabilities summing to 1.

    Examples
    --------
    >>> import numpy as np
    >>> b = np.array([.16, .08, .01, .11, .05, .005, .03, .30, .255])
    >>> q = np.array([.32, .08, .01, .06, .04, .005, .025, .23, .23])
    >>> linear_blend(b, q, 0.5)[[0, 3]].round(3).tolist()
    [0.24, 0.085]
    """
    b = as_probabilities(batter, "batter")
    q = as_probabilities(pitcher, "pitcher")
    w = as_weight(pitcher_weight, "pitcher_weight")[..., None]
    return relabel(normalise(w * q + (1.0 - w) * b), batter)


def odds_ratio_blend(
    batter: Any,
    pitcher: Any,
    league: Any,
    *,
    batter_exponent: Any = 1.0,
    pitcher_exponent: Any = 1.0,
) -> Any:
    """Multinomial odds-ratio blend (generalised Log5).

    ``p_i`` is proportional to ``b_i**a * q_i**c / l_i**(a + c - 1)`` with ``a`` the
    batter exponent and ``c`` the pitcher exponent. With ``a = c = 1`` this is
    ``b_i q_i / l_i``, which for two outcomes is the Log5 formula. Raising one exponent
    gives that side more say; ``a = 1, c = 0`` returns the batter.

    Zeros are handled without NaN: a factor with exponent 0 is 1 (``0**0 = 1``); an
    outcome that a side with a positive exponent never shows gets probability 0, as does
    an outcome missing from the league when the league exponent ``a + c - 1`` is not 0.
    If that leaves no outcome possible (the two sides share no outcome), the result falls
    back to the linear blend with pitcher weight ``c / (a + c)``.

    Parameters
    ----------
    batter, pitcher, league : array-like or pandas object, shape (..., 9)
        Outcome probabilities; the league baseline should be that of the same platoon split.
    batter_exponent, pitcher_exponent : float or array-like, keyword-only
        Exponents ``a`` and ``c`` (>= 0), broadcastable to the leading axes.

    Returns
    -------
    numpy.ndarray or pandas object
        Blended probabilities summing to 1.

    Examples
    --------
    >>> import numpy as np
    >>> league = np.full(9, 1 / 9)
    >>> odds_ratio_blend(league, league, league).round(4).tolist() == league.round(4).tolist()
    True
    """
    b = as_probabilities(batter, "batter")
    q = as_probabilities(pitcher, "pitcher")
    lg = as_probabilities(league, "league")
    a = np.asarray(batter_exponent, dtype=float)
    c = np.asarray(pitcher_exponent, dtype=float)
    for name, e in (("batter_exponent", a), ("pitcher_exponent", c)):
        if not np.all(np.isfinite(e)) or np.any(e < 0):
            msg = f"{name} must be a finite number >= 0; got {np.atleast_1d(e).ravel()[:5].tolist()}."
            raise ValueError(msg)
    a, c = a[..., None], c[..., None]
    lg_exp = a + c - 1.0
    shape = np.broadcast_shapes(b.shape, q.shape, lg.shape, a.shape, c.shape)
    score = (
        _xlogy(a, b, shape)
        + _xlogy(c, q, shape)
        - _xlogy(lg_exp, lg, shape, zero_is=np.inf)
    )
    # score is -inf for impossible outcomes; subtract the row maximum for stable exp()
    finite = np.isfinite(score)
    top = np.max(np.where(finite, score, -np.inf), axis=-1, keepdims=True)
    any_possible = np.isfinite(top)
    with np.errstate(invalid="ignore", over="ignore"):
        raw = np.where(finite, np.exp(score - np.where(any_possible, top, 0.0)), 0.0)
    total = raw.sum(axis=-1, keepdims=True)
    with np.errstate(invalid="ignore", divide="ignore"):
        out = raw / total
    if not np.all(any_possible):
        both = np.broadcast_to(a + c, shape)
        with np.errstate(invalid="ignore", divide="ignore"):
            w = np.where(both > 0, np.broadcast_to(c, shape) / both, 0.5)
        fallback = w * np.broadcast_to(q, shape) + (1.0 - w) * np.broadcast_to(b, shape)
        out = np.where(any_possible, out, fallback)
    return relabel(normalise(out), batter)


def _xlogy(e: np.ndarray, x: np.ndarray, shape: tuple[int, ...], *, zero_is: float = -np.inf) -> np.ndarray:
    """``e * log(x)`` with ``0 * log(0) = 0``; where x == 0 and e > 0 the term is ``zero_is``-signed."""
    e = np.broadcast_to(e, shape)
    x = np.broadcast_to(x, shape)
    with np.errstate(divide="ignore", invalid="ignore"):
        logx = np.log(x)
        term = e * logx
    # exponent 0: the factor is 1 whatever x is
    term = np.where(e == 0, 0.0, term)
    # x == 0 with a nonzero exponent: the outcome is impossible (negative exponent on the league
    # gives +inf in the denominator's place, which we treat the same way: impossible)
    impossible = (x == 0) & (e != 0)
    if zero_is == np.inf:
        # league term is subtracted: make the subtraction yield -inf
        return np.where(impossible, np.inf, term)
    return np.where(impossible, -np.inf, term)


def two_stage_blend(batter: Any, pitcher: Any, *, first_weight: Any, in_play_weight: Any) -> Any:
    """Blend in two stages: outcomes decided without a ball in play, then balls in play.

    Stage 1 blends the split between strikeout, walk, hit-by-pitch, home run and ball in
    play (the sum of ``IN_PLAY``) linearly with pitcher weight ``first_weight``. Stage 2
    blends the distributions *within* balls in play (each side's in-play outcomes divided
    by its ball-in-play share) with pitcher weight ``in_play_weight``. The result is stage 1
    with its ball-in-play share spread by stage 2.

    Parameters
    ----------
    batter, pitcher : array-like or pandas object, shape (..., 9)
        Outcome probabilities of each side.
    first_weight, in_play_weight : float or array-like in [0, 1], keyword-only
        Pitcher weights of the two stages, broadcastable to the leading axes.

    Returns
    -------
    numpy.ndarray or pandas object
        Blended probabilities summing to 1. If one side never puts the ball in play, the
        other side's in-play split is used.

    Examples
    --------
    >>> import numpy as np
    >>> b = np.array([.2, .1, 0, .2, 0, 0, .1, .2, .2])
    >>> q = np.array([.4, .1, 0, .1, 0, 0, .1, .1, .2])
    >>> two_stage_blend(b, q, first_weight=0.5, in_play_weight=0.0).round(4).tolist()
    [0.3, 0.1, 0.0, 0.1667, 0.0, 0.0, 0.1, 0.1667, 0.1667]
    """
    b = as_probabilities(batter, "batter")
    q = as_probabilities(pitcher, "pitcher")
    w1 = as_weight(first_weight, "first_weight")[..., None]
    w2 = as_weight(in_play_weight, "in_play_weight")[..., None]
    shape = np.broadcast_shapes(b.shape, q.shape, w1.shape, w2.shape)
    b, q = np.broadcast_to(b, shape), np.broadcast_to(q, shape)
    b_bip = b[..., _IN_PLAY_IDX].sum(axis=-1, keepdims=True)
    q_bip = q[..., _IN_PLAY_IDX].sum(axis=-1, keepdims=True)
    # stage 1: the not-in-play codes and the ball-in-play share blend linearly
    out = np.empty(shape)
    out[..., _NOT_IN_PLAY_IDX] = w1 * q[..., _NOT_IN_PLAY_IDX] + (1 - w1) * b[..., _NOT_IN_PLAY_IDX]
    bip = w1 * q_bip + (1 - w1) * b_bip
    # stage 2: conditional in-play splits; a side without balls in play borrows the other's
    with np.errstate(invalid="ignore", divide="ignore"):
        b_cond = b[..., _IN_PLAY_IDX] / b_bip
        q_cond = q[..., _IN_PLAY_IDX] / q_bip
    uniform = np.full(len(_IN_PLAY_IDX), 1.0 / len(_IN_PLAY_IDX))
    b_none, q_none = b_bip == 0, q_bip == 0
    b_cond = np.where(b_none, np.where(q_none, uniform, q_cond), b_cond)
    q_cond = np.where(q_none, b_cond, q_cond)
    out[..., _IN_PLAY_IDX] = bip * (w2 * q_cond + (1 - w2) * b_cond)
    return relabel(normalise(out), batter)


_WEIGHT_KEYS = ("pitcher_weight", "first_weight", "in_play_weight", "batter_exponent", "pitcher_exponent")


def blend(method: str, batter: Any, pitcher: Any, league: Any = None, **weights: Any) -> Any:
    """Blend two distributions by the named method.

    Parameters
    ----------
    method : {"linear", "odds-ratio", "two-stage"}
        Which blend to use.
    batter, pitcher, league : array-like or pandas object, shape (..., 9)
        Outcome probabilities; ``league`` is needed only by ``"odds-ratio"``.
    **weights
        ``pitcher_weight`` (linear; also the default of both two-stage weights),
        ``first_weight`` and ``in_play_weight`` (two-stage), ``batter_exponent`` and
        ``pitcher_exponent`` (odds-ratio). Keys that the method does not use are ignored,
        so one settings dict can drive every method; unknown keys raise.

    Returns
    -------
    numpy.ndarray or pandas object
        Blended probabilities summing to 1.

    Examples
    --------
    >>> import numpy as np
    >>> b = np.array([.16, .08, .01, .11, .05, .005, .03, .30, .255])
    >>> q = np.array([.32, .08, .01, .06, .04, .005, .025, .23, .23])
    >>> round(float(blend("linear", b, q, pitcher_weight=0.5)[0]), 6)
    0.24
    """
    unknown = sorted(set(weights) - set(_WEIGHT_KEYS))
    if unknown:
        msg = f"blend() got unknown weight(s) {unknown}; accepted: {list(_WEIGHT_KEYS)}."
        raise TypeError(msg)
    pitcher_weight = weights.get("pitcher_weight")
    if method == "linear":
        if pitcher_weight is None:
            msg = "method 'linear' needs pitcher_weight (0 = all batter, 1 = all pitcher)."
            raise ValueError(msg)
        return linear_blend(batter, pitcher, pitcher_weight)
    if method == "odds-ratio":
        if league is None:
            msg = "method 'odds-ratio' needs the league distribution of the same platoon split."
            raise ValueError(msg)
        return odds_ratio_blend(
            batter,
            pitcher,
            league,
            batter_exponent=_default(weights.get("batter_exponent"), 1.0),
            pitcher_exponent=_default(weights.get("pitcher_exponent"), 1.0),
        )
    if method == "two-stage":
        first = _default(weights.get("first_weight"), pitcher_weight)
        in_play = _default(weights.get("in_play_weight"), pitcher_weight)
        if first is None or in_play is None:
            msg = "method 'two-stage' needs first_weight and in_play_weight (or pitcher_weight for both)."
            raise ValueError(msg)
        return two_stage_blend(batter, pitcher, first_weight=first, in_play_weight=in_play)
    msg = f"unknown blend method {method!r}; choose one of {list(METHODS)}."
    raise ValueError(msg)


def _default(value: Any, fallback: Any) -> Any:
    return fallback if value is None else value
