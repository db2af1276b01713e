"""Brier surfaces of the blends over their weights and the shrinkage sizes, in closed form.

Notation, per scoring row ``r`` (a cell of held-out PAs sharing one prediction): ``n_r`` PAs,
outcome counts ``y_r``, shrunk batter and pitcher distributions ``b_r`` and ``q_r``. Summed over
the PAs of a row, the squared error of a prediction ``p`` is ``n ||p||^2 - 2 p.y + n`` because each
observed one-hot vector has unit length.

Linear blend, ``p(w) = b + w d`` with ``d = q - b``: the summed squared error is the quadratic
``A w^2 + B w + C`` with ``A = sum n ||d||^2``, ``B = 2 sum (n b.d - d.y)``,
``C = sum (n ||b||^2 - 2 b.y) + N``; its minimum over ``[0, 1]`` is at ``clip(-B / 2A, 0, 1)``.
All terms split into sums of ``b.b``, ``q.q``, ``b.q``, ``b.y`` and ``q.y``, so one matrix product
gives them for every pair of prior sizes at once.

Two-stage blend: the not-in-play part ``u(w1) = u0 + w1 u1``, the ball-in-play share
``s(w1) = s0 + w1 s1`` and the conditional in-play split ``r(w2) = r0 + w2 r1`` are linear in
their weights, so the summed error ``n (||u||^2 + s^2 ||r||^2) - 2 (u.y_out + s r.y_in) + N`` is
a polynomial of degree two in each weight: nine coefficients per prior pair.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..data import IN_PLAY, OUTCOMES
from ._shrink import shrink

__all__ = [
    "DEFAULT_PRIOR_GRID",
    "DEFAULT_WEIGHTS",
    "best_weight_closed_form",
    "linear_weight_surface",
    "quadratic_coefficients",
    "two_stage_surface",
    "weight_bootstrap",
]

#: Prior sizes (PAs of league average added to a player's counts) searched by default.
DEFAULT_PRIOR_GRID: tuple[int, ...] = (0, 25, 50, 100, 200, 400, 800)
#: Pitcher weights searched by default: 0 to 1 in steps of 0.01.
DEFAULT_WEIGHTS: np.ndarray = np.round(np.linspace(0.0, 1.0, 101), 2)

_IN = np.array([OUTCOMES.index(c) for c in IN_PLAY])
_OUT = np.array([i for i, c in enumerate(OUTCOMES) if c not in IN_PLAY])


def quadratic_coefficients(batter, pitcher, observed) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Coefficients of the linear blend's summed squared error as a quadratic in the weight.

    Parameters
    ----------
    batter, pitcher : array-like, shape (..., n_rows, n_outcomes)
        Distributions of each side per row; leading axes are kept (e.g. a grid of priors).
    observed : array-like, shape (n_rows, n_outcomes)
        Outcome counts per row (one-hot rows for single PAs).

    Returns
    -------
    A, B, C : numpy.ndarray, shape (...)
        ``sum over PAs ||b + w (q - b) - e_y||^2 = A w^2 + B w + C``.

    Examples
    --------
    >>> A, B, C = quadratic_coefficients([[1.0, 0.0]], [[0.0, 1.0]], [[3, 1]])
    >>> float(A), float(B), float(C)  # 4 (1 - w)^2 ... summed: 8w^2 - 4w + 2
    (8.0, -4.0, 2.0)
    """
    b = np.asarray(batter, dtype=float)
    q = np.asarray(pitcher, dtype=float)
    y = np.asarray(observed, dtype=float)
    n = y.sum(axis=-1)
    d = q - b
    a_ = np.einsum("...rk,...rk,r->...", d, d, n)
    b_ = 2.0 * (np.einsum("...rk,...rk,r->...", b, d, n) - np.einsum("...rk,rk->...", d, y))
    c_ = np.einsum("...rk,...rk,r->...", b, b, n) - 2.0 * np.einsum("...rk,rk->...", b, y) + n.sum()
    return a_, b_, c_


def _argmin_quadratic(a_: np.ndarray, b_: np.ndarray) -> np.ndarray:
    """Minimiser of ``a w^2 + b w`` over [0, 1]; 0.5 where the error does not depend on w."""
    flat = a_ <= 1e-12 * np.maximum(1.0, np.abs(b_))
    with np.errstate(divide="ignore", invalid="ignore"):
        w = np.where(flat, np.where(b_ < 0, 1.0, np.where(b_ > 0, 0.0, 0.5)), -b_ / (2.0 * a_))
    return np.clip(w, 0.0, 1.0)


def best_weight_closed_form(batter, pitcher, observed) -> np.ndarray:
    """Pitcher weight in [0, 1] that minimises the linear blend's Brier score, in closed form.

    Parameters
    ----------
    batter, pitcher : array-like, shape (..., n_rows, n_outcomes)
        Distributions of each side per row.
    observed : array-like, shape (n_rows, n_outcomes)
        Outcome counts per row.

    Returns
    -------
    numpy.ndarray, shape (...)
        ``clip(-B / 2A, 0, 1)`` from :func:`quadratic_coefficients` (0.5 if the two sides agree).

    Examples
    --------
    >>> float(best_weight_closed_form([[1.0, 0.0]], [[0.0, 1.0]], [[3, 1]]))
    0.25
    """
    a_, b_, _ = quadratic_coefficients(batter, pitcher, observed)
    return _argmin_quadratic(a_, b_)


def _shrunk_grid(counts: np.ndarray, league: np.ndarray, priors) -> np.ndarray:
    """Shrunk distributions for every prior size: shape (n_priors, n_rows, n_outcomes)."""
    pri = np.asarray(priors, dtype=float)
    return np.asarray(shrink(counts, league, pri[:, None]))


def _linear_coefficients(observed, batter_shrunk, pitcher_shrunk):
    """A, B, C of shape (n_batter_priors, n_pitcher_priors) and N, by matrix products."""
    y = np.asarray(observed, dtype=float)
    n = y.sum(axis=1)
    bs, qs = batter_shrunk, pitcher_shrunk
    nb, nq = bs.shape[0], qs.shape[0]
    bn = bs * n[:, None]
    s_bb = np.einsum("irk,irk->i", bn, bs)
    s_qq = np.einsum("jrk,jrk,r->j", qs, qs, n)
    s_bq = bn.reshape(nb, -1) @ qs.reshape(nq, -1).T
    t_b = bs.reshape(nb, -1) @ y.ravel()
    t_q = qs.reshape(nq, -1) @ y.ravel()
    total = n.sum()
    a_ = s_qq[None, :] - 2.0 * s_bq + s_bb[:, None]
    b_ = 2.0 * (s_bq - s_bb[:, None] - t_q[None, :] + t_b[:, None])
    c_ = np.broadcast_to((s_bb - 2.0 * t_b + total)[:, None], a_.shape).copy()
    return a_, b_, c_, total


def _check_grid(values, name: str, *, upper: float | None = None) -> np.ndarray:
    arr = np.atleast_1d(np.asarray(values, dtype=float))
    bad = arr[~np.isfinite(arr) | (arr < 0) | ((arr > upper) if upper is not None else False)]
    if arr.ndim != 1 or arr.size == 0 or bad.size:
        rng = f"[0, {upper:g}]" if upper is not None else ">= 0"
        msg = f"{name} must be a non-empty 1-D list of values {rng}; got bad value(s) {bad[:5].tolist()}."
        raise ValueError(msg)
    return arr


def linear_weight_surface(
    observed,
    batter_counts,
    pitcher_counts,
    league,
    *,
    batter_priors=DEFAULT_PRIOR_GRID,
    pitcher_priors=DEFAULT_PRIOR_GRID,
    weights=DEFAULT_WEIGHTS,
) -> pd.DataFrame:
    """Held-out Brier score of the linear blend over weight x batter prior x pitcher prior.

    Each row is a scoring cell: its held-out outcome counts, the batter's and the pitcher's
    fitting counts in the cell's platoon split, and the league distribution of that split.
    Shrinking either side by a prior size (:func:`~matchup_widgets.model.shrink`) and blending
    gives the prediction; the Brier score for every weight comes from the quadratic's
    coefficients, so no PA is visited per grid point.

    Parameters
    ----------
    observed, batter_counts, pitcher_counts : array-like, shape (n_cells, n_outcomes)
        Held-out outcome counts per cell, and each side's fitting counts for the cell.
    league : array-like, shape (n_cells, n_outcomes)
        League probabilities of the cell's platoon split.
    batter_priors, pitcher_priors : sequence of float, keyword-only
        Prior sizes in PAs.
    weights : sequence of float in [0, 1], keyword-only
        Pitcher weights.

    Returns
    -------
    pandas.DataFrame
        Columns ``pitcher_weight``, ``batter_prior_pa``, ``pitcher_prior_pa``, ``brier``;
        one row per grid point.

    Examples
    --------
    >>> import numpy as np
    >>> k, one = np.eye(9)[0], np.eye(9)[1]  # all strikeouts vs all walks
    >>> y = [3 * k + one]  # one cell: 3 strikeouts and a walk
    >>> s = linear_weight_surface(y, [k], [one], [np.full(9, 1 / 9)], batter_priors=[0],
    ...                           pitcher_priors=[0], weights=[0, 0.25, 1])
    >>> s["brier"].round(4).tolist()  # (8w^2 - 4w + 2) / 4 PAs
    [0.5, 0.375, 1.5]
    """
    bp = _check_grid(batter_priors, "batter_priors")
    pp = _check_grid(pitcher_priors, "pitcher_priors")
    w = _check_grid(weights, "weights", upper=1.0)
    lg = np.asarray(league, dtype=float)
    a_, b_, c_, total = _linear_coefficients(
        observed, _shrunk_grid(np.asarray(batter_counts, float), lg, bp), _shrunk_grid(np.asarray(pitcher_counts, float), lg, pp)
    )
    return _surface_frame(a_, b_, c_, total, bp, pp, w)


def _surface_frame(a_, b_, c_, total, bp, pp, w) -> pd.DataFrame:
    brier = (a_[..., None] * w**2 + b_[..., None] * w + c_[..., None]) / total  # (nb, np, nw)
    ib, ip, iw = np.meshgrid(np.arange(bp.size), np.arange(pp.size), np.arange(w.size), indexing="ij")
    return pd.DataFrame(
        {
            "pitcher_weight": w[iw.ravel()],
            "batter_prior_pa": bp[ib.ravel()],
            "pitcher_prior_pa": pp[ip.ravel()],
            "brier": brier.ravel(),
        }
    )


def _best_pairs(a_, b_, c_, total, bp, pp) -> pd.DataFrame:
    """Closed-form best weight and its Brier for each prior pair."""
    w = _argmin_quadratic(a_, b_)
    brier = (a_ * w**2 + b_ * w + c_) / total
    ib, ip = np.meshgrid(np.arange(bp.size), np.arange(pp.size), indexing="ij")
    return pd.DataFrame(
        {
            "batter_prior_pa": bp[ib.ravel()],
            "pitcher_prior_pa": pp[ip.ravel()],
            "pitcher_weight": w.ravel(),
            "brier": brier.ravel(),
        }
    )


def _stage_parts(p: np.ndarray):
    """Split distributions into not-in-play part, ball-in-play share and in-play split."""
    bip = p[..., _IN].sum(axis=-1)
    with np.errstate(invalid="ignore", divide="ignore"):
        cond = p[..., _IN] / bip[..., None]
    return p[..., _OUT], bip, cond


def _two_stage_coefficients(observed, batter_shrunk, pitcher_shrunk, *, progress: bool = False):
    """Coefficients K[i, j, a, c] of w1^a w2^c in the summed squared error, per prior pair."""
    from tqdm.auto import tqdm

    y = np.asarray(observed, dtype=float)
    n = y.sum(axis=1)
    y_out, y_in = y[:, _OUT], y[:, _IN]
    nb, nq = batter_shrunk.shape[0], pitcher_shrunk.shape[0]
    q_out, q_bip, q_cond = _stage_parts(pitcher_shrunk)  # (nq, R, .)
    uniform = np.full(_IN.size, 1.0 / _IN.size)
    coef = np.zeros((nb, nq, 3, 3))
    for i in tqdm(range(nb), desc="two-stage surface", disable=not progress, leave=False):
        b_out, b_bip, b_cond = _stage_parts(batter_shrunk[i])  # (R, .)
        # a side that never puts the ball in play borrows the other side's in-play split
        b_none, q_none = (b_bip == 0)[None, :, None], (q_bip == 0)[..., None]
        bc = np.where(b_none, np.where(q_none, uniform, q_cond), b_cond[None])  # (nq, R, 5)
        qc = np.where(q_none, bc, q_cond)
        u0, u1 = b_out, q_out - b_out  # (R, 4), (nq, R, 4)
        s0, s1 = b_bip, q_bip - b_bip  # (R,), (nq, R)
        r0, r1 = bc, qc - bc  # (nq, R, 5)
        s_pow = np.stack([np.broadcast_to(s0**2, s1.shape), 2 * s0 * s1, s1**2], axis=-1)  # (nq, R, 3)
        r_pow = np.stack(
            [np.einsum("jrk,jrk->jr", r0, r0), 2 * np.einsum("jrk,jrk->jr", r0, r1), np.einsum("jrk,jrk->jr", r1, r1)],
            axis=-1,
        )
        k = np.einsum("jra,jrc,r->jac", s_pow, r_pow, n)
        # -2 s r.y_in = -2 (s0 + w1 s1)(r0.y + w2 r1.y)
        r0y, r1y = np.einsum("jrk,rk->jr", r0, y_in), np.einsum("jrk,rk->jr", r1, y_in)
        k[:, 0, 0] -= 2 * np.einsum("r,jr->j", s0, r0y)
        k[:, 0, 1] -= 2 * np.einsum("r,jr->j", s0, r1y)
        k[:, 1, 0] -= 2 * np.einsum("jr,jr->j", s1, r0y)
        k[:, 1, 1] -= 2 * np.einsum("jr,jr->j", s1, r1y)
        # n ||u||^2 - 2 u.y_out with u = u0 + w1 u1
        k[:, 0, 0] += np.einsum("rk,rk,r->", u0, u0, n) - 2 * np.einsum("rk,rk->", u0, y_out)
        k[:, 1, 0] += 2 * np.einsum("rk,jrk,r->j", u0, u1, n) - 2 * np.einsum("jrk,rk->j", u1, y_out)
        k[:, 2, 0] += np.einsum("jrk,jrk,r->j", u1, u1, n)
        k[:, 0, 0] += n.sum()
        coef[i] = k
    return coef, n.sum()


def _two_stage_grid(coef, total, w1, w2) -> np.ndarray:
    """Brier on the (w1, w2) grid for every prior pair: shape (nb, nq, len(w1), len(w2))."""
    p1 = np.stack([np.ones_like(w1), w1, w1**2], axis=-1)
    p2 = np.stack([np.ones_like(w2), w2, w2**2], axis=-1)
    return np.einsum("ma,ijac,nc->ijmn", p1, coef, p2) / total


def two_stage_surface(
    observed,
    batter_counts,
    pitcher_counts,
    league,
    *,
    batter_priors=DEFAULT_PRIOR_GRID,
    pitcher_priors=DEFAULT_PRIOR_GRID,
    weights=DEFAULT_WEIGHTS,
) -> pd.DataFrame:
    """Held-out Brier score of the two-stage blend over both weights and both prior sizes.

    Same inputs as :func:`linear_weight_surface`; the grid of first-stage and in-play weights
    is ``weights x weights``.

    Returns
    -------
    pandas.DataFrame
        Columns ``first_weight``, ``in_play_weight``, ``batter_prior_pa``,
        ``pitcher_prior_pa``, ``brier``.

    Examples
    --------
    >>> import numpy as np
    >>> lg = np.full((1, 9), 1 / 9)
    >>> s = two_stage_surface(np.eye(9)[[0]], lg, lg, lg, batter_priors=[0],
    ...                       pitcher_priors=[0], weights=[0, 1])
    >>> s["brier"].round(4).tolist()  # 8/81 + (8/9)^2 whatever the weights
    [0.8889, 0.8889, 0.8889, 0.8889]
    """
    bp = _check_grid(batter_priors, "batter_priors")
    pp = _check_grid(pitcher_priors, "pitcher_priors")
    w = _check_grid(weights, "weights", upper=1.0)
    lg = np.asarray(league, dtype=float)
    coef, total = _two_stage_coefficients(
        observed, _shrunk_grid(np.asarray(batter_counts, float), lg, bp), _shrunk_grid(np.asarray(pitcher_counts, float), lg, pp)
    )
    grid = _two_stage_grid(coef, total, w, w)
    ib, ip, i1, i2 = np.meshgrid(*(np.arange(k) for k in grid.shape), indexing="ij")
    return pd.DataFrame(
        {
            "first_weight": w[i1.ravel()],
            "in_play_weight": w[i2.ravel()],
            "batter_prior_pa": bp[ib.ravel()],
            "pitcher_prior_pa": pp[ip.ravel()],
            "brier": grid.ravel(),
        }
    )


def weight_bootstrap(
    observed,
    batter_counts,
    pitcher_counts,
    league,
    groups,
    *,
    batter_priors=DEFAULT_PRIOR_GRID,
    pitcher_priors=DEFAULT_PRIOR_GRID,
    n_boot: int = 200,
    seed: int = 0,
    progress: bool = False,
) -> np.ndarray:
    """Refit the linear blend on bootstrap resamples of whole groups (games).

    Rows are scoring units that each lie in one group (e.g. batter x pitcher x split x game).
    Every replicate draws as many groups as there are, with replacement, and refits both
    prior sizes and the weight in closed form, so the spread includes the choice of priors.

    Parameters
    ----------
    observed, batter_counts, pitcher_counts, league : array-like, shape (n_rows, n_outcomes)
        As in :func:`linear_weight_surface`, one row per unit.
    groups : array-like, shape (n_rows,)
        Group (game) of each row.
    batter_priors, pitcher_priors : sequence of float, keyword-only
        Prior sizes searched in every replicate.
    n_boot : int, default 200
        Number of replicates.
    seed : int, default 0
        Seed of the resampling.
    progress : bool, default False
        Show a progress bar (tqdm.auto).

    Returns
    -------
    numpy.ndarray, shape (n_boot,)
        Fitted pitcher weight of each replicate.

    Examples
    --------
    >>> import numpy as np
    >>> k, one, lg = np.eye(9)[0], np.eye(9)[1], np.full(9, 1 / 9)
    >>> w = weight_bootstrap([k, k, one], [k] * 3, [one] * 3, [lg] * 3, ["g1", "g2", "g3"],
    ...                      batter_priors=[0], pitcher_priors=[0], n_boot=50)
    >>> bool(((w >= 0) & (w <= 1)).all()), w.shape
    (True, (50,))
    """
    bp = _check_grid(batter_priors, "batter_priors")
    pp = _check_grid(pitcher_priors, "pitcher_priors")
    if int(n_boot) < 1:
        msg = f"n_boot must be a positive number of replicates; got {n_boot}."
        raise ValueError(msg)
    lg = np.asarray(league, dtype=float)
    bs = _shrunk_grid(np.asarray(batter_counts, float), lg, bp)
    qs = _shrunk_grid(np.asarray(pitcher_counts, float), lg, pp)
    return _bootstrap_shrunk(observed, bs, qs, groups, n_boot=n_boot, seed=seed, progress=progress)


def _bootstrap_shrunk(observed, bs, qs, groups, *, n_boot: int, seed: int, progress: bool) -> np.ndarray:
    """weight_bootstrap on already shrunk grids bs (nb, R, 9) and qs (nq, R, 9)."""
    from tqdm.auto import tqdm

    y = np.asarray(observed, dtype=float)
    n = y.sum(axis=1)
    # per-unit terms of A, B, C for every prior pair (see the module notes)
    s_bb = np.einsum("irk,irk,r->ir", bs, bs, n)
    s_qq = np.einsum("jrk,jrk,r->jr", qs, qs, n)
    s_bq = np.einsum("irk,jrk,r->ijr", bs, qs, n)
    t_b = np.einsum("irk,rk->ir", bs, y)
    t_q = np.einsum("jrk,rk->jr", qs, y)
    a_u = s_qq[None] - 2 * s_bq + s_bb[:, None]
    b_u = 2 * (s_bq - s_bb[:, None] - t_q[None] + t_b[:, None])
    c_u = np.broadcast_to((s_bb - 2 * t_b)[:, None], a_u.shape)
    # sum the units of each group: sort by group, then add runs
    g, _ = pd.factorize(np.asarray(groups, dtype=object))
    order = np.argsort(g, kind="stable")
    starts = np.flatnonzero(np.r_[True, np.diff(g[order]) != 0])
    per_group = [np.add.reduceat(x[..., order], starts, axis=-1) for x in (a_u, b_u, c_u)]
    n_g = np.add.reduceat(n[order], starts)
    n_groups = n_g.size
    a_g, b_g, c_g = (x.reshape(-1, n_groups).T for x in per_group)  # (G, pairs)
    rng = np.random.default_rng(seed)
    out = np.empty(int(n_boot))
    chunk = 50
    for lo in tqdm(range(0, int(n_boot), chunk), desc="weight bootstrap", disable=not progress, leave=False):
        size = min(chunk, int(n_boot) - lo)
        draws = rng.multinomial(n_groups, np.full(n_groups, 1.0 / n_groups), size=size).astype(float)
        a_, b_, c_ = draws @ a_g, draws @ b_g, draws @ c_g + (draws @ n_g)[:, None]
        w = _argmin_quadratic(a_, b_)
        best = np.argmin(a_ * w**2 + b_ * w + c_, axis=1)
        out[lo : lo + size] = w[np.arange(size), best]
    return out
