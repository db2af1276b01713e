"""The matchup contact mix."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.contact import ContactModel, matchup_contact, matchup_contact_mix, shrink_shares
from matchup_widgets.data import BATTED
from matchup_widgets.model import linear_blend, shrink


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_shrink_shares_equals_the_model_shrink_on_nine_categories(seed):
    # reference: matchup_widgets.model.shrink, the same posterior mean over outcome codes
    rng = np.random.default_rng(seed)
    counts = rng.integers(0, 40, 9).astype(float)
    league = rng.dirichlet(np.ones(9))
    for prior in (0.0, 5.0, 250.0):
        assert_allclose(shrink_shares(counts, league, prior), shrink(counts, league, prior), rtol=1e-12)


def test_mix_matches_model_shrink_and_linear_blend_on_nine_categories():
    # reference: model.shrink then model.linear_blend, when the categories number nine
    rng = np.random.default_rng(7)
    cats = [f"c{i}" for i in range(9)]
    b, q = rng.integers(0, 30, 9).astype(float), rng.integers(0, 30, 9).astype(float)
    league = rng.dirichlet(np.ones(9))
    given = pd.DataFrame(rng.dirichlet(np.ones(6), size=9), index=cats, columns=list(BATTED))
    mix, implied = matchup_contact_mix(
        pd.Series(b, cats), pd.Series(q, cats), pd.Series(league, cats), outcome_given=given,
        pitcher_weight=0.35, batter_prior_pa=40, pitcher_prior_pa=80,
    )
    ref = linear_blend(shrink(b, league, 40), shrink(q, league, 80), 0.35)
    assert_allclose(mix.to_numpy(), ref, rtol=1e-12)
    assert_allclose(implied.to_numpy(), ref @ given.to_numpy(), rtol=1e-12)
    assert_allclose(implied.sum(), 1.0, rtol=1e-12)


def test_mix_edge_weights_and_errors():
    cats = [1, 2, 3]
    given = pd.DataFrame(np.eye(3, 6), index=cats, columns=list(BATTED))
    kw = dict(outcome_given=given, batter_prior_pa=0, pitcher_prior_pa=0)
    league = pd.Series([1 / 3] * 3, cats)
    mix, _ = matchup_contact_mix(pd.Series([2, 0, 2], cats), pd.Series([0, 4, 0], cats), league, pitcher_weight=0, **kw)
    assert mix.tolist() == [0.5, 0.0, 0.5]
    with pytest.raises(ValueError, match=r"pitcher_weight must lie in \[0, 1\]"):
        matchup_contact_mix(pd.Series([1, 1, 1], cats), pd.Series([1, 1, 1], cats), league, pitcher_weight=2, **kw)
    with pytest.raises(ValueError, match="prior size must be a finite number >= 0"):
        shrink_shares([1, 2], [0.5, 0.5], -1)


@pytest.mark.parametrize("kind", ["tier", "bucket"])
def test_matchup_contact_table(synth_pas, kind):
    model = ContactModel(kind="grid").fit(synth_pas)
    row = synth_pas.iloc[3]
    shares, implied = matchup_contact(
        synth_pas, batter_id=row.batter_id, pitcher_id=row.pitcher_id, batter_hand=row.batter_hand,
        pitcher_hand=row.pitcher_hand, pitcher_weight=0.5, batter_prior_pa=60, pitcher_prior_pa=60,
        kind=kind, model=model,
    )
    assert set(shares["side"]) == {"batter", "pitcher", "league", "matchup"}
    assert_allclose(shares.groupby("side")["share"].sum().to_numpy(), 1.0, rtol=1e-9)
    assert list(implied.index) == list(BATTED)
    assert_allclose(implied.sum(), 1.0, rtol=1e-12)
    if kind == "bucket":
        assert {"exit_velo_bin", "launch_angle_bin"} <= set(shares.columns)
