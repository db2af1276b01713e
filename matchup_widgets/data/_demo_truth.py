"""The true matchup rule of the invented demo league, and its oracle.

Everything here is the generator's ground truth: the league-wide rates, the platoon
multipliers, the batted-ball function ``f(exit_velo, launch_angle)`` and the quadrature that
turns a plate appearance's talents into its exact outcome probabilities. The simulator in
:mod:`._demo_sim` draws from exactly these functions, so the oracle built on them
(:func:`matchup_widgets.data.true_probabilities`) is the best prediction any model could make.
"""

from __future__ import annotations

import numpy as np

# Targets the league is tuned to, all the recent major-league environment (common practice,
# from memory): strikeouts ~22% of PA, walks ~8-9%, hit by pitch ~1%, home runs ~3%,
# batting average on balls in play ~.290-.300, ~4.4-4.7 runs per team-game. The first three
# are set by LEAGUE_STAGE1, home runs and BABIP by the constants of ``f`` below, runs by
# those and the base-running chances in ``_demo_sim._advance``. tests/data/test_demo.py
# prints the realised rates and asserts them inside these ranges.

# ---------------------------------------------------------------------------------------
# Stage 1: strikeout, walk, hit by pitch or batted ball.
# ---------------------------------------------------------------------------------------
#: Stage-1 classes, in this order.
STAGE1: tuple[str, ...] = ("K", "BB", "HBP", "BAT")

#: League rates per plate appearance of the stage-1 classes (the ``l`` of the rule).
#: Targets: strikeouts ~22% of PA, walks ~8-9%, hit by pitch ~1% (common practice, from
#: memory: the recent major-league environment). The values are set a little apart from
#: the targets because lineup choice and platoon multipliers move the realised rates.
LEAGUE_STAGE1: np.ndarray = np.array([0.222, 0.071, 0.010, 0.697])

#: Platoon multipliers on the stage-1 classes, indexed [batter_hand, pitcher_hand] with
#: 0 = L, 1 = R. Same-hand matchups favour the pitcher (more strikeouts, fewer walks), and
#: left-handed batters have the larger split (common practice).
PLATOON_STAGE1: np.ndarray = np.array(
    [
        [[1.14, 0.90, 1.08, 1.0], [0.95, 1.04, 0.98, 1.0]],  # L batter vs L, vs R
        [[0.94, 1.06, 0.97, 1.0], [1.04, 0.96, 1.01, 1.0]],  # R batter vs L, vs R
    ]
)

# ---------------------------------------------------------------------------------------
# Stage 2: exit velocity and launch angle of a batted ball.
# ---------------------------------------------------------------------------------------
#: League mean and per-ball spread of exit velocity (mph) and launch angle (degrees).
#: Typical tracking values: mean exit velocity ~88-89 mph, mean launch angle ~12 degrees
#: (common practice, from memory); the spreads are this generator's choice.
EV_MEAN, EV_SD = 88.0, 14.0
LA_MEAN, LA_SD = 11.0, 26.0

#: Platoon shift of mean exit velocity (mph), indexed [batter_hand, pitcher_hand].
PLATOON_EV: np.ndarray = np.array([[-1.6, 0.6], [0.5, -0.7]])

# Batted-ball type boundaries (degrees) and their smoothness: ground ball below ~10,
# line drive 10-25, fly ball 25-50, pop up above ~50 (common practice).
_LA_EDGES = (10.0, 25.0, 50.0)
_LA_SOFT = 3.0
#: Batted-ball types of ``f`` and the non-home-run outcomes each can end in.
BALL_TYPES: tuple[str, ...] = ("ground ball", "line drive", "fly ball", "pop up")
_PARK_OUTCOMES: tuple[str, ...] = ("1B", "2B", "3B", "GB_OUT", "AIR_OUT")


def _sigmoid(x: np.ndarray) -> np.ndarray:
    return 0.5 * (1.0 + np.tanh(0.5 * x))


def _ev_parts(ev: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Exit-velocity factors of ``f``: home-run carry ``A`` and, per ball type (last axis,
    length 4), the hit probability of a ball kept in the park and its double and triple
    parts (``hit * share``)."""
    ev = np.clip(ev, 0.0, 130.0)
    carry = _sigmoid((ev - 101.3) / 3.5)
    hard = _sigmoid((ev - 95.0) / 5.0)
    hit = np.empty(ev.shape + (4,))
    hit[..., 0] = 0.135 + 0.45 * _sigmoid((ev - 97.0) / 6.0)  # ground ball
    hit[..., 1] = 0.37 + 0.42 * _sigmoid((ev - 84.0) / 7.0)  # line drive
    hit[..., 2] = 0.07 + 0.50 * _sigmoid((ev - 99.0) / 4.0)  # fly ball
    hit[..., 3] = 0.02  # pop up
    double = np.zeros(ev.shape + (4,))
    double[..., 0] = 0.06 + 0.12 * hard
    double[..., 1] = 0.20 + 0.30 * hard
    double[..., 2] = 0.25 + 0.50 * hard
    triple = np.zeros(ev.shape + (4,))
    triple[..., 0] = 0.004
    triple[..., 1] = 0.012 + 0.02 * hard
    triple[..., 2] = 0.04 + 0.09 * hard
    return carry, hit, hit * double, hit * triple


_GROUND = np.array([1.0, 0.0, 0.0, 0.0])


def _mix(base, hit, hit_double, hit_triple) -> np.ndarray:
    """Outcome mix (..., 4 types, 5 park outcomes) from the hit parts; linear in its inputs,
    so it maps expectations to expectations. ``base`` is 1 (or the carry factor)."""
    base = np.asarray(base)[..., None]
    out = base - hit
    return np.stack(
        [hit - hit_double - hit_triple, hit_double, hit_triple, out * _GROUND, out * (1.0 - _GROUND)],
        axis=-1,
    )


def _la_parts(la: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Launch-angle factors of ``f``: home-run window ``W`` and ball-type weights ``w``
    (shape ``la.shape + (4,)``, summing to 1)."""
    la = np.clip(la, -90.0, 90.0)
    window = np.exp(-0.5 * ((la - 28.0) / 7.5) ** 2)
    s1, s2, s3 = (_sigmoid((la - edge) / _LA_SOFT) for edge in _LA_EDGES)
    types = np.stack([1.0 - s1, s1 - s2, s2 - s3, s3], axis=-1)
    return window, types


def _combine(hr, mix, carried, types, types_window) -> np.ndarray:
    """Assemble f (or its expectation) from its factors.

    ``park_j = sum_t w_t H_tj - sum_t (w_t W) (A H_tj)`` for the five park outcomes and
    ``HR = A W``; returned in the order ``1B, 2B, 3B, HR, GB_OUT, AIR_OUT``.
    """
    park = np.einsum("...t,...tj->...j", types, mix) - np.einsum("...t,...tj->...j", types_window, carried)
    return np.concatenate([park[..., :3], hr[..., None], park[..., 3:]], axis=-1)


def batted_ball_probabilities(exit_velo: np.ndarray, launch_angle: np.ndarray) -> np.ndarray:
    """The fixed smooth function ``f``: outcome probabilities of a ball hit at (velo, angle).

    Parameters
    ----------
    exit_velo, launch_angle : array_like
        Exit velocity (mph) and launch angle (degrees), broadcastable; clipped to the
        physical ranges 0-130 mph and -90-90 degrees first.

    Returns
    -------
    numpy.ndarray
        Shape ``broadcast + (6,)``: probabilities of ``1B, 2B, 3B, HR, GB_OUT, AIR_OUT``.

    Notes
    -----
    ``f = A(ev) W(la)`` for a home run: ``A`` is a carry curve centred on 101.3 mph with a
    3.5 mph soft edge and ``W`` a launch-angle window peaking at 28 degrees, so home runs
    need high exit velocity at roughly 20-35 degrees and ground balls (below ~10 degrees)
    almost never leave the park. A ball kept in the park (probability ``1 - A W``) takes
    its batted-ball type from soft launch-angle edges at 10, 25 and 50 degrees; each type
    has its own hit probability rising with exit velocity (hard-hit balls, 95 mph and up,
    become hits far more often), its own mix of singles, doubles and triples, and makes
    ground-ball outs (ground balls) or air outs (line drives, fly balls, pop ups). Pop ups
    are almost always outs. Every term is a product of a function of exit velocity and a
    function of launch angle, which makes the oracle's integral exact to quadrature.
    """
    ev, la = np.broadcast_arrays(np.asarray(exit_velo, float), np.asarray(launch_angle, float))
    carry, hit, hit_double, hit_triple = _ev_parts(ev)
    window, types = _la_parts(la)
    mix = _mix(1.0, hit, hit_double, hit_triple)
    carried = mix * carry[..., None, None]
    return _combine(carry * window, mix, carried, types, types * window[..., None])


def stage1_probabilities(
    batter: np.ndarray, pitcher: np.ndarray, batter_hand: np.ndarray, pitcher_hand: np.ndarray
) -> np.ndarray:
    """Stage-1 probabilities ``p_i ∝ b_i q_i m_i / l_i`` over (K, BB, HBP, BAT).

    ``batter`` and ``pitcher`` are (n, 4) talent rates, hands are 0 (L) / 1 (R) arrays.
    """
    raw = batter * pitcher * PLATOON_STAGE1[batter_hand, pitcher_hand] / LEAGUE_STAGE1
    return raw / raw.sum(axis=-1, keepdims=True)


def contact_means(
    batter_ev: np.ndarray,
    pitcher_ev: np.ndarray,
    batter_la: np.ndarray,
    pitcher_la: np.ndarray,
    batter_hand: np.ndarray,
    pitcher_hand: np.ndarray,
) -> tuple[np.ndarray, np.ndarray]:
    """Mean exit velocity and launch angle of a PA's batted ball (talents add)."""
    mu_ev = EV_MEAN + batter_ev + pitcher_ev + PLATOON_EV[batter_hand, pitcher_hand]
    mu_la = LA_MEAN + batter_la + pitcher_la
    return mu_ev, mu_la


def _hermite_nodes(n: int) -> tuple[np.ndarray, np.ndarray]:
    """Nodes and weights for E[g(Z)], Z standard normal (probabilists' Gauss-Hermite)."""
    x, w = np.polynomial.hermite_e.hermegauss(n)
    return x, w / w.sum()


#: Gauss-Hermite nodes per axis.
QUAD_NODES = 160


def expected_batted(
    mu_ev: np.ndarray, mu_la: np.ndarray, *, n_nodes: int = QUAD_NODES, chunk: int = 4096
) -> np.ndarray:
    """E f(EV, LA) with EV ~ N(mu_ev, EV_SD^2) and LA ~ N(mu_la, LA_SD^2) independent.

    Every term of ``f`` is a product ``g(ev) h(la)``, so the expectation is a sum of
    products of one-dimensional Gauss-Hermite integrals, each computed once per distinct
    mean (in chunks, so memory stays bounded). Returns an (n, 6) array over
    ``1B, 2B, 3B, HR, GB_OUT, AIR_OUT``.
    """
    x, w = _hermite_nodes(n_nodes)

    def integrate(mu, sd, parts):
        """One-dimensional expectations of every factor, once per distinct mean."""
        uniq, inverse = np.unique(np.asarray(mu, float).ravel(), return_inverse=True)
        pieces = []
        for start in range(0, len(uniq), chunk):
            grid = uniq[start : start + chunk, None] + sd * x  # (k, n_nodes)
            pieces.append([np.einsum("kn...,n->k...", part, w) for part in parts(grid)])
        return [np.concatenate(p)[inverse] for p in zip(*pieces)]

    def ev_factors(grid):
        carry, hit, hd, ht = _ev_parts(grid)
        c = carry[..., None]
        return carry, hit, hd, ht, c * hit, c * hd, c * ht

    def la_factors(grid):
        window, types = _la_parts(grid)
        return window, types, types * window[..., None]

    e_a, e_hit, e_hd, e_ht, e_ahit, e_ahd, e_aht = integrate(mu_ev, EV_SD, ev_factors)
    e_w, e_t, e_tw = integrate(mu_la, LA_SD, la_factors)
    # f is linear in each factor, and EV and LA are independent: E f = f(E factors).
    mix = _mix(1.0, e_hit, e_hd, e_ht)
    carried = _mix(e_a, e_ahit, e_ahd, e_aht)
    return _combine(e_a * e_w, mix, carried, e_t, e_tw)
