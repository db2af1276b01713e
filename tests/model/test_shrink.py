"""Shrinkage toward the league: closed form, limits, zero-sample cases."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import shrink


def test_shrink_is_the_dirichlet_posterior_mean():
    # Closed form of the Dirichlet-multinomial posterior mean (common practice):
    # (x_i + M l_i) / (n + M). Hand sum: 30 strikeouts in 100 PA, league 20%, M = 100
    # gives (30 + 20) / 200 = 0.25.
    league = np.array([0.20, 0.08, 0.01, 0.15, 0.05, 0.005, 0.03, 0.245, 0.23])
    counts = np.array([30, 8, 1, 15, 5, 0, 3, 20, 18])
    got = shrink(counts, league, 100)
    assert_allclose(got[0], 0.25, rtol=1e-12)
    assert_allclose(got, (counts + 100 * league) / 200, rtol=1e-12)


def test_zero_prior_gives_raw_rates_and_empty_sample_gives_league():
    league = np.full(9, 1 / 9)
    counts = np.array([[3, 1, 0, 2, 0, 0, 1, 2, 1], [0] * 9])
    got = shrink(counts, league, 0)
    assert_allclose(got[0], counts[0] / 10, rtol=1e-12)
    assert_allclose(got[1], league, rtol=1e-12)
    assert not np.any(np.isnan(got))


def test_prior_broadcasts_over_players_and_accepts_fractional_counts():
    league = np.full(9, 1 / 9)
    counts = np.array([[2.5, 0, 0, 0, 0, 0, 0, 0, 0.5], [1, 1, 1, 1, 1, 1, 1, 1, 1]])
    got = shrink(counts, league, np.array([0.0, 9.0]))
    assert_allclose(got[0, 0], 2.5 / 3, rtol=1e-12)
    assert_allclose(got[1], league, rtol=1e-12)


def test_labelled_counts_in_any_order():
    league = pd.Series(np.full(9, 1 / 9), index=list(OUTCOMES))
    counts = pd.DataFrame([np.arange(9)], columns=list(OUTCOMES))
    ref = shrink(counts.to_numpy(), league.to_numpy(), 20)
    got = shrink(counts[list(reversed(OUTCOMES))], league[list(reversed(OUTCOMES))], 20)
    assert_allclose(got[list(OUTCOMES)].to_numpy(), ref, rtol=1e-12)


def test_bad_inputs_say_what_to_do():
    league = np.full(9, 1 / 9)
    with pytest.raises(ValueError, match=r"prior_pa must be >= 0"):
        shrink(np.ones(9), league, -1)
    with pytest.raises(ValueError, match=r"counts has 1 negative value"):
        shrink(np.r_[-1, np.ones(8)], league, 1)
    with pytest.raises(ValueError, match=r"league must hold probabilities summing to 1"):
        shrink(np.ones(9), league * 2, 1)


_counts = st.lists(st.integers(0, 500), min_size=9, max_size=9).map(np.asarray)
_league = st.lists(st.floats(1e-3, 1.0), min_size=9, max_size=9).map(lambda v: np.asarray(v) / np.sum(v))


@settings(max_examples=200, deadline=None)
@given(counts=_counts, league=_league, prior=st.floats(0, 1e4))
def test_shrink_sums_to_one(counts, league, prior):
    got = shrink(counts, league, prior)
    assert abs(got.sum() - 1) <= 1e-12
    assert np.all(got >= 0)


@settings(max_examples=100, deadline=None)
@given(counts=_counts, league=_league)
def test_infinite_prior_returns_the_league(counts, league):
    assert_allclose(shrink(counts, league, np.inf), league, rtol=1e-12)
    # and a huge finite prior approaches it at rate n / (n + M)
    assert_allclose(shrink(counts, league, 1e12), league, atol=counts.sum() / 1e12 + 1e-15)
