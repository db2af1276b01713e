"""Summaries: rates, on-base, wOBA with the run-values layer or the published fallback."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import FALLBACK_WOBA_WEIGHTS, run_weights, summarize
from matchup_widgets.model import _summary

LEAGUE = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.24, 0.22])


def _dist(**rates: float) -> np.ndarray:
    p = np.zeros(9)
    for code, value in rates.items():
        p[OUTCOMES.index({"S": "1B", "D": "2B"}.get(code, code))] = value
    p[OUTCOMES.index("GB_OUT")] = 1 - p.sum()
    return p


def test_rates_and_on_base_are_hand_sums():
    p = _dist(K=0.2, BB=0.1, HBP=0.01, S=0.15, D=0.05, HR=0.04)
    got = summarize(p).iloc[0]
    assert got["k_rate"] == pytest.approx(0.2)
    assert got["bb_rate"] == pytest.approx(0.1)
    assert got["hr_rate"] == pytest.approx(0.04)
    # on base per PA = BB + HBP + hits (hand sum): .10 + .01 + .15 + .05 + .04
    assert got["on_base"] == pytest.approx(0.35)


def test_fallback_woba_uses_the_published_2019_constants():
    # 2019 published wOBA constants (walk .690, single .870, home run 1.940; from memory):
    # BB .10, 1B .20, HR .05 gives .069 + .174 + .097 = .340 (hand sum).
    p = _dist(BB=0.10, S=0.20, HR=0.05)
    got = summarize(p, weights=run_weights()).iloc[0]
    assert got["woba"] == pytest.approx(0.340, abs=1e-12)
    assert np.isnan(got["runs_per_pa"])  # no league given
    assert FALLBACK_WOBA_WEIGHTS["HBP"] == 0.719


def test_fallback_runs_per_pa_is_woba_above_league_over_scale(monkeypatch):
    # Runs above average per PA = (wOBA - league wOBA) / wOBA scale (common practice),
    # with the 2019 scale 1.157 (from memory).
    import matchup_widgets.runs as runs

    monkeypatch.delattr(runs, "woba_weights")
    _summary._run_weights_cached.cache_clear()
    try:
        p = _dist(BB=0.10, S=0.20, HR=0.05)
        league_woba = float(LEAGUE @ np.array([FALLBACK_WOBA_WEIGHTS[c] for c in OUTCOMES]))
        got = summarize(p, league=LEAGUE).iloc[0]
        assert got["runs_per_pa"] == pytest.approx((0.340 - league_woba) / 1.157, rel=1e-12)
        assert run_weights(LEAGUE)["source"] == "2019 published wOBA constants"
    finally:
        _summary._run_weights_cached.cache_clear()


def test_runs_layer_weights_make_the_league_average_zero_and_woba_its_obp():
    # With the run-values layer: an average PA is worth 0 runs relative to the league, and
    # wOBA is scaled so the league wOBA equals the league on-base probability (common practice).
    got = summarize(LEAGUE, league=LEAGUE).iloc[0]
    assert got["runs_per_pa"] == pytest.approx(0.0, abs=1e-10)
    assert got["woba"] == pytest.approx(got["on_base"], rel=1e-9)
    better = summarize(_dist(K=0.1, BB=0.1, S=0.2, HR=0.06), league=LEAGUE).iloc[0]
    assert better["runs_per_pa"] > 0


def test_summaries_keep_labels_and_broadcast():
    frame = pd.DataFrame([LEAGUE, _dist(K=0.3)], columns=list(OUTCOMES), index=["lg", "ace"])
    got = summarize(frame[list(reversed(OUTCOMES))], league=LEAGUE)
    assert list(got.index) == ["lg", "ace"]
    assert_allclose(got.loc["ace", "k_rate"], 0.3)
