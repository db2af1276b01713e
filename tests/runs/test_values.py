from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.runs import (
    default_advancement,
    linear_weights,
    run_expectancy,
    runs_distribution,
    situation,
    woba_weights,
)

# 2019 wOBA constants, widely published season constants (walk = unintentional walk).
PUBLISHED_2019 = {"BB": 0.690, "HBP": 0.719, "1B": 0.870, "2B": 1.217, "3B": 1.529, "HR": 1.940}
PUBLISHED_2019_SCALE = 1.157


def test_woba_weights_2019_against_published_constants(league_rates):
    weights, scale = woba_weights(league_rates(2019))
    print("\n2019 wOBA weights: model vs published")
    for code, ref in PUBLISHED_2019.items():
        print(f"  {code:>3}: model {weights[code]:.3f} published {ref:.3f} diff {weights[code] - ref:+.3f}")
    print(f"  scale: model {scale:.3f} published {PUBLISHED_2019_SCALE:.3f}")
    for code, ref in PUBLISHED_2019.items():
        assert weights[code] == pytest.approx(ref, abs=0.10), code
    assert scale == pytest.approx(PUBLISHED_2019_SCALE, abs=0.10)
    # Same order. Walks and hit-by-pitches move runners alike in the chain, so they tie; the
    # published gap between them comes from intentional walks, which the chain does not know.
    assert weights["BB"] == pytest.approx(weights["HBP"], abs=1e-12)
    chain = [weights[c] for c in ("HBP", "1B", "2B", "3B", "HR")]
    assert chain == sorted(chain) and len(set(chain)) == len(chain)


def test_woba_of_the_league_is_its_on_base_percentage(league_rates):
    p = league_rates(2019)
    weights, _ = woba_weights(p)
    on = [OUTCOMES.index(c) for c in weights.index]
    assert_allclose(p[on] @ weights.to_numpy(), p[on].sum(), rtol=1e-12)


def test_linear_weights_average_zero_and_order(league_rates):
    p = league_rates(2019)
    lw = linear_weights(p)
    assert list(lw.index) == list(OUTCOMES)
    assert_allclose(p @ lw.to_numpy(), 0.0, atol=1e-12)
    assert lw["HR"] > lw["3B"] > lw["2B"] > lw["1B"] > lw["BB"] > 0 > lw["K"]


def test_linear_weights_closed_form():
    # Homer (q) or strikeout: RE(outs) = (3 - outs) q/(1-q) with q = 1/4 -> 1, 2/3, 1/3.
    # A homer from any state with empty bases: +1 run, no RE change; a strikeout: -1/3.
    # Average PA: 1/4 * 1 - 3/4 * 1/3 = 0, so the weights are already relative to it.
    lw = linear_weights({"HR": 0.25, "K": 0.75})
    assert_allclose(lw[["HR", "K"]], [1.0, -1 / 3], atol=1e-12)


def test_linear_weights_equal_mean_re24_over_simulated_plays(league_rates):
    # RE24 by hand over plays sampled from the chain: mean of RE(after) - RE(before) + runs.
    p = league_rates(2019)
    table = default_advancement()
    re = np.append(run_expectancy(p).ravel(), 0.0)
    rng = np.random.default_rng(5)
    n = 400_000
    # States visited by PAs, sampled in proportion to expected visits from (0 outs, empty).
    trans = np.tensordot(p, table.transitions[:, :24], axes=1)
    visits = np.linalg.solve((np.eye(24) - trans[:, :24]).T, np.eye(24)[0])
    s = rng.choice(24, size=n, p=visits / visits.sum())
    o = rng.choice(9, size=n, p=p)
    cum = np.cumsum(table.transitions[o, s], axis=1)
    t = np.minimum((rng.random(n)[:, None] >= cum / cum[:, -1:]).sum(axis=1), 24)
    value = re[t] - re[s] + table.runs[o, s, t]
    by_code = np.bincount(o, weights=value, minlength=9) / np.bincount(o, minlength=9)
    lw = linear_weights(p)
    assert_allclose(by_code - p @ by_code, lw.to_numpy(), atol=0.01)


def test_situation_next_to_the_league(league_rates):
    league = league_rates(2019)
    strong = league.copy()
    strong[OUTCOMES.index("HR")] += 0.03
    strong[OUTCOMES.index("K")] -= 0.03
    out = situation(strong, outs=1, bases=2, league=league)
    assert out["state"] == "Runner on 2nd, 1 out"
    assert out["expected_runs"] > out["league_expected_runs"]
    assert out["league_expected_runs"] == pytest.approx(run_expectancy(league)[1, 2], abs=1e-12)
    p0 = runs_distribution(league, outs=1, bases=2)[0]
    assert out["league_p_score"] == pytest.approx(1 - p0, abs=1e-12)
    assert 0 < out["league_p_score"] < 1


def test_situation_closed_form():
    # Homer (1/2) or out, two outs, runner on third: scores iff the next batter homers.
    out = situation({"HR": 0.5, "K": 0.5}, outs=2, bases=4, league={"HR": 0.25, "K": 0.75})
    assert out["p_score"] == pytest.approx(0.5)
    assert out["expected_runs"] == pytest.approx(2 * 0.5 + 0.5 * 1.0)  # 2 now, then 1 per homer left
    with pytest.raises(ValueError, match="outs must be"):
        situation({"HR": 1.0}, outs=3, bases=0, league={"HR": 1.0})


def test_woba_needs_outs_and_on_base():
    with pytest.raises(ValueError, match="needs both outs and on-base"):
        woba_weights({"K": 1.0})
    # all walks: the chain never ends, but the reason given is the missing outs
    with pytest.raises(ValueError, match=r"needs both outs and on-base.*P\(out\) = 0"):
        woba_weights({"BB": 1.0})
    with pytest.raises(ValueError, match="never ends the inning"):
        linear_weights({"HR": 1.0})
