"""Blends: worked examples, Log5 reduction, and properties that hold for any input."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import blend, linear_blend, odds_ratio_blend, two_stage_blend

K, BB, SINGLE = OUTCOMES.index("K"), OUTCOMES.index("BB"), OUTCOMES.index("1B")


def _with(**rates: float) -> np.ndarray:
    """A distribution with the given codes' rates and the rest spread over GB_OUT/AIR_OUT."""
    p = np.zeros(len(OUTCOMES))
    for code, value in rates.items():
        p[OUTCOMES.index(code.replace("S1", "1B"))] = value
    rest = 1.0 - p.sum()
    p[OUTCOMES.index("GB_OUT")] += rest / 2
    p[OUTCOMES.index("AIR_OUT")] += rest / 2
    return p


def test_linear_blend_even_weight_worked_example():
    # Common practice figures: batter singles 11%, strikeouts 16%; pitcher singles 6%,
    # strikeouts 32%; an even blend gives singles 8.5% and strikeouts 24% (hand sum).
    batter = _with(K=0.16, S1=0.11)
    pitcher = _with(K=0.32, S1=0.06)
    got = linear_blend(batter, pitcher, 0.5)
    assert_allclose(got[SINGLE], 0.085, rtol=1e-12)
    assert_allclose(got[K], 0.24, rtol=1e-12)


def _log5(p_a: float, p_b: float) -> float:
    """Log5 in its published team form: P(A beats B) = (A - A B) / (A + B - 2 A B)."""
    return (p_a - p_a * p_b) / (p_a + p_b - 2 * p_a * p_b)


def _two_outcome(p: float) -> np.ndarray:
    out = np.zeros(len(OUTCOMES))
    out[K], out[BB] = p, 1 - p
    return out


@pytest.mark.parametrize(
    ("p_a", "p_b", "published"),
    [
        # Log5 worked example: a .600 team against a .400 team wins .692 of the time
        # (B. James, 1981 Baseball Abstract; published figure, from memory).
        (0.600, 0.400, 0.692),
        # Published properties of Log5 (same source, from memory): a .500 team wins 1 - p_B
        # of the time; equal teams split .500; a 1.000 team always wins.
        (0.500, 0.300, 0.700),
        (0.550, 0.550, 0.500),
        (1.000, 0.400, 1.000),
    ],
)
def test_odds_ratio_blend_reproduces_published_log5(p_a, p_b, published):
    # Team A plays the batter role; team B's chance of *losing* plays the pitcher's
    # rate allowed; the league of teams is .500.
    got = odds_ratio_blend(_two_outcome(p_a), _two_outcome(1 - p_b), _two_outcome(0.5))
    assert_allclose(got[K], published, atol=5e-4)
    assert_allclose(got[K], _log5(p_a, p_b), rtol=1e-12)


@given(
    b=st.floats(0.01, 0.99),
    q=st.floats(0.01, 0.99),
    lg=st.floats(0.01, 0.99),
)
def test_odds_ratio_blend_is_log5_for_two_outcomes(b, q, lg):
    # Closed form of the odds-ratio (Log5) method for a rate against a league rate:
    # odds(p) = odds(b) * odds(q) / odds(l) (common practice).
    got = odds_ratio_blend(_two_outcome(b), _two_outcome(q), _two_outcome(lg))[K]
    odds = (b / (1 - b)) * (q / (1 - q)) / (lg / (1 - lg))
    assert_allclose(got, odds / (1 + odds), rtol=1e-10)


def test_odds_ratio_exponents_weight_the_sides():
    rng = np.random.default_rng(3)
    b, q, lg = rng.dirichlet(np.ones(9), size=3)
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=1, pitcher_exponent=0), b, rtol=1e-12)
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=0, pitcher_exponent=1), q, rtol=1e-12)
    # a = c = 0 gives the league; closed form b^a q^c / l^(a+c-1) normalised
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=0, pitcher_exponent=0), lg, rtol=1e-12)
    ref = b**2 * q**0.5 / lg**1.5
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=2, pitcher_exponent=0.5), ref / ref.sum(), rtol=1e-12)


def test_odds_ratio_blend_handles_zeros_without_nan():
    b = _with(K=0.2, BB=0.1)
    q = _with(K=0.3)  # never walks anyone
    lg = _with(K=0.25, BB=0.08)
    got = odds_ratio_blend(b, q, lg)
    assert np.all(np.isfinite(got))
    assert got[BB] == 0.0
    # sides with no outcome in common fall back to the even linear blend
    only_k, only_bb = _two_outcome(1.0), _two_outcome(0.0)
    got = odds_ratio_blend(only_k, only_bb, _two_outcome(0.5))
    assert_allclose(got, 0.5 * only_k + 0.5 * only_bb, rtol=1e-12)


def test_two_stage_blend_matches_hand_computation():
    b = np.array([0.2, 0.1, 0.0, 0.2, 0.0, 0.0, 0.1, 0.2, 0.2])
    q = np.array([0.4, 0.1, 0.0, 0.1, 0.0, 0.0, 0.1, 0.1, 0.2])
    got = two_stage_blend(b, q, first_weight=0.25, in_play_weight=0.5)
    # stage 1 (hand sum): K .25, BB .1, HBP 0, HR .1, ball in play .55
    # stage 2: batter in-play split 1/3, 0, 0, 1/3, 1/3; pitcher 1/4, 0, 0, 1/4, 1/2
    ref = np.array([0.25, 0.1, 0.0, 0.55 * (1 / 3 + 1 / 4) / 2, 0, 0, 0.1, 0.55 * (1 / 3 + 1 / 4) / 2,
                    0.55 * (1 / 3 + 1 / 2) / 2])
    assert_allclose(got, ref, rtol=1e-12)


def test_two_stage_side_without_balls_in_play_borrows_the_other_split():
    b = _two_outcome(0.5)  # only strikeouts and walks
    q = _with(K=0.2)
    got = two_stage_blend(b, q, first_weight=0.5, in_play_weight=0.0)
    assert np.all(np.isfinite(got))
    assert_allclose(got.sum(), 1.0, atol=1e-12)


def test_blend_dispatch_and_errors():
    rng = np.random.default_rng(4)
    b, q, lg = rng.dirichlet(np.ones(9), size=3)
    assert_allclose(blend("linear", b, q, lg, pitcher_weight=0.3), linear_blend(b, q, 0.3))
    assert_allclose(blend("odds-ratio", b, q, lg), odds_ratio_blend(b, q, lg))
    assert_allclose(
        blend("two-stage", b, q, pitcher_weight=0.3, in_play_weight=0.7),
        two_stage_blend(b, q, first_weight=0.3, in_play_weight=0.7),
    )
    with pytest.raises(ValueError, match="unknown blend method 'log5'"):
        blend("log5", b, q, lg)
    with pytest.raises(TypeError, match=r"unknown weight\(s\) \['weight'\]"):
        blend("linear", b, q, lg, weight=0.5)
    with pytest.raises(ValueError, match="pitcher_weight must lie in"):
        linear_blend(b, q, 1.5)
    with pytest.raises(ValueError, match="batter must hold probabilities summing to 1"):
        linear_blend(b * 2, q, 0.5)
    with pytest.raises(ValueError, match="last axis of length 9"):
        linear_blend(b[:8], q[:8], 0.5)


def test_blends_broadcast_over_leading_axes():
    rng = np.random.default_rng(5)
    b = rng.dirichlet(np.ones(9), size=(4, 3))
    q = rng.dirichlet(np.ones(9), size=3)
    lg = rng.dirichlet(np.ones(9))
    w = np.array([0.0, 0.5, 1.0])
    got = linear_blend(b, q, w)
    assert got.shape == (4, 3, 9)
    assert_allclose(got[:, 0], b[:, 0], rtol=1e-12)
    assert_allclose(got[:, 2], np.broadcast_to(q[2], (4, 9)), rtol=1e-12)
    assert odds_ratio_blend(b, q, lg, pitcher_exponent=w).shape == (4, 3, 9)
    assert two_stage_blend(b, q, first_weight=w, in_play_weight=0.2).shape == (4, 3, 9)


# ---- properties ------------------------------------------------------------------------

_dist = st.lists(st.floats(0.0, 1.0), min_size=9, max_size=9).filter(lambda v: sum(v) > 1e-3).map(
    lambda v: np.asarray(v) / np.sum(v)
)
_positive = st.lists(st.floats(1e-3, 1.0), min_size=9, max_size=9).map(lambda v: np.asarray(v) / np.sum(v))
_weight = st.floats(0.0, 1.0)


def _all_methods(b, q, lg, w1, w2):
    return {
        "linear": linear_blend(b, q, w1),
        "odds-ratio": odds_ratio_blend(b, q, lg, batter_exponent=2 * (1 - w1), pitcher_exponent=2 * w2),
        "two-stage": two_stage_blend(b, q, first_weight=w1, in_play_weight=w2),
    }


@settings(max_examples=200, deadline=None)
@given(b=_dist, q=_dist, lg=_positive, w1=_weight, w2=_weight)
def test_every_output_sums_to_one(b, q, lg, w1, w2):
    for method, got in _all_methods(b, q, lg, w1, w2).items():
        assert np.all(got >= 0), method
        assert abs(got.sum() - 1.0) <= 1e-12, method


@settings(max_examples=200, deadline=None)
@given(b=_dist, q=_dist, lg=_positive)
def test_weight_zero_returns_batter_and_one_returns_pitcher(b, q, lg):
    assert_allclose(linear_blend(b, q, 0.0), b, atol=1e-15)
    assert_allclose(linear_blend(b, q, 1.0), q, atol=1e-15)
    assert_allclose(two_stage_blend(b, q, first_weight=0, in_play_weight=0), b, atol=1e-12)
    assert_allclose(two_stage_blend(b, q, first_weight=1, in_play_weight=1), q, atol=1e-12)
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=1, pitcher_exponent=0), b, atol=1e-12)
    assert_allclose(odds_ratio_blend(b, q, lg, batter_exponent=0, pitcher_exponent=1), q, atol=1e-12)


@settings(max_examples=100, deadline=None)
@given(b=_dist, q=_dist, lg=_positive, w1=_weight, w2=_weight, order=st.permutations(list(OUTCOMES)))
def test_column_order_never_changes_a_result(b, q, lg, w1, w2, order):
    def frame(p):
        return pd.DataFrame([p], columns=list(OUTCOMES))[order]

    for method in ("linear", "odds-ratio", "two-stage"):
        weights = {"pitcher_weight": w1, "in_play_weight": w2, "pitcher_exponent": 1 + w2}
        ref = blend(method, b, q, lg, **weights)
        got = blend(method, frame(b), frame(q), frame(lg), **weights)
        assert list(got.columns) == list(OUTCOMES)
        assert_allclose(got.loc[0, list(OUTCOMES)].to_numpy(), ref, rtol=1e-12, atol=1e-15)
