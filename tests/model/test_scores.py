"""Brier score, log loss and the reliability table against outside references."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose
from sklearn.metrics import brier_score_loss
from sklearn.metrics import log_loss as sk_log_loss

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import brier_score, log_loss, reliability_table


def _random_forecasts(seed: int, n: int = 500, k: int = 9):
    rng = np.random.default_rng(seed)
    p = rng.dirichlet(np.ones(k), size=n)
    y = rng.integers(0, k, size=n)
    return p, y


@pytest.mark.parametrize("seed", [0, 1, 2, 3])
def test_brier_equals_scikit_learn_multiclass(seed):
    # Reference: scikit-learn's brier_score_loss, multiclass form; scale_by_half=False keeps
    # the [0, 2] range of Brier (1950), which is what we report.
    p, y = _random_forecasts(seed)
    ref = brier_score_loss(y, p, labels=np.arange(9), scale_by_half=False)
    assert_allclose(brier_score(p, y), ref, rtol=1e-12)


def test_brier_worked_case_three_equal_chances():
    # Hand sum (Brier 1950 definition): (1/3)^2 + (1 - 1/3)^2 + (1/3)^2 = 6/9 = 2/3.
    assert_allclose(brier_score([[1 / 3, 1 / 3, 1 / 3]], [1]), 2 / 3, rtol=1e-12)


def test_brier_accepts_codes_and_counts_like_single_pas():
    p, y = _random_forecasts(5, n=200)
    codes = np.array(OUTCOMES)[y]
    assert_allclose(brier_score(p, codes), brier_score(p, y), rtol=1e-12)
    # a cell of PAs sharing one prediction scores like those PAs one by one
    rows = np.repeat(p[:20], 3, axis=0)
    outs = np.random.default_rng(6).integers(0, 9, size=60)
    counts = np.zeros((20, 9))
    np.add.at(counts, (np.repeat(np.arange(20), 3), outs), 1)
    assert_allclose(brier_score(p[:20], counts), brier_score(rows, outs), rtol=1e-12)


@pytest.mark.parametrize("seed", [0, 1])
def test_log_loss_equals_scikit_learn(seed):
    # Reference: scikit-learn's log_loss (natural log, mean over samples).
    p, y = _random_forecasts(seed)
    assert_allclose(log_loss(p, y), sk_log_loss(y, p, labels=np.arange(9)), rtol=1e-12)


def test_log_loss_floors_zero_probability():
    # -ln(1e-15) = 34.5388 (closed form): the floor keeps a certain-but-wrong forecast finite.
    assert_allclose(log_loss([[1.0, 0.0]], [1]), -np.log(1e-15), rtol=1e-12)


def test_score_errors_say_what_and_where():
    with pytest.raises(ValueError, match="unknown outcome code.*'XX'"):
        brier_score(np.full((2, 9), 1 / 9), ["K", "XX"])
    with pytest.raises(ValueError, match="probabilities have 2 rows but observed has 3"):
        brier_score(np.full((2, 9), 1 / 9), [0, 1, 2])
    with pytest.raises(ValueError, match=r"outside 0\.\.8 \(rows 1\)"):
        log_loss(np.full((2, 9), 1 / 9), [0, 9])


def test_reliability_single_bin_is_overall_mean():
    # With one bin the table is the PA-weighted mean forecast and the observed frequency
    # (hand computation with numpy).
    p, y = _random_forecasts(8, n=300)
    t = reliability_table(p, y, n_bins=1)
    assert t["outcome"].tolist() == list(OUTCOMES)
    assert_allclose(t["mean_predicted"], p.mean(axis=0), rtol=1e-12)
    assert_allclose(t["observed_rate"], np.bincount(y, minlength=9) / 300, rtol=1e-12)


def test_reliability_of_a_calibrated_forecast():
    # Outcomes drawn from the forecast itself: every bin's observed rate lies within
    # 4 binomial standard errors of its mean forecast.
    rng = np.random.default_rng(11)
    p = rng.dirichlet(np.full(9, 2.0), size=20_000)
    y = (rng.random(20_000)[:, None] > p.cumsum(axis=1)).sum(axis=1)
    t = reliability_table(p, y, n_bins=10)
    assert len(t) == 90
    assert_allclose(t.groupby("outcome")["n_pa"].sum(), 20_000)
    se = np.sqrt(t["mean_predicted"] * (1 - t["mean_predicted"]) / t["n_pa"])
    assert (np.abs(t["observed_rate"] - t["mean_predicted"]) < 4 * se).all()
    assert (t["predicted_low"] <= t["mean_predicted"]).all()
    assert (t["mean_predicted"] <= t["predicted_high"]).all()
