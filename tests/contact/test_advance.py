"""Tiered hits: weak and strong singles and doubles with their own advancement rows."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.contact import (
    ContactModel,
    contact_predictions,
    contact_tiers,
    tiered_advancement,
    tiered_hits_available,
    tiered_probabilities,
    weak_shares_from_mix,
)
from matchup_widgets.contact._dataset import ball_tiers
from matchup_widgets.data import DataError
from matchup_widgets.runs import run_expectancy


@pytest.fixture(scope="module")
def with_base_out(make_synth):
    """Synthetic plays where a hard single sends the runner from first to third more often."""
    df = make_synth(60_000, seed=21)
    rng = np.random.default_rng(22)
    n = len(df)
    outs = rng.integers(0, 3, n)
    bases = np.where(rng.random(n) < 0.5, 1, 0)  # empty or runner on first
    df["outs_before"], df["bases_before"] = outs, bases
    is_out = df.outcome.isin(["K", "GB_OUT", "AIR_OUT"]).to_numpy()
    hard = np.nan_to_num(df.exit_velo.to_numpy()) >= 95
    to_third = rng.random(n) < np.where(hard, 0.7, 0.1)
    after = np.where(bases == 1, np.where(to_third, 5, 3), 1)  # single: 1st&3rd or 1st&2nd
    after = np.where(df.outcome.eq("1B"), after, np.where(is_out, bases, 1))
    df["outs_after"] = outs + is_out
    df["bases_after"] = np.where(df["outs_after"] >= 3, 0, after)
    df["runs_on_play"] = 0
    return df


def test_rows_are_the_observed_shares_of_each_tier_group(with_base_out):
    model = ContactModel(kind="grid").fit(with_base_out)
    hits = tiered_advancement(with_base_out, model=model, min_count=30)
    table = hits.table
    assert table.outcomes[-4:] == ("1B_weak", "1B_strong", "2B_weak", "2B_strong")
    # reference: hand count of the next state among strong singles from runner on 1st, 0 outs
    pred = contact_predictions(with_base_out, model=model)
    tier = ball_tiers(pred, contact_tiers(with_base_out, model=model))
    sub = pred[(pred.outcome == "1B") & (tier >= 4) & (pred.outs_before == 0) & (pred.bases_before == 1)]
    share_13 = float((sub.bases_after == 5).mean())
    t, _ = table.row("1B_strong")
    assert_allclose(t[1, 5], share_13, rtol=1e-12)
    weak_t, _ = table.row("1B_weak")
    assert t[1, 5] > weak_t[1, 5] + 0.2  # hard singles move the runner further
    assert hits.counts.loc["1B_strong", 1] == len(sub)
    assert 0 < hits.weak_share["1B"] < 1


def test_run_expectancy_with_tiered_rows(with_base_out):
    hits = tiered_advancement(with_base_out, model=ContactModel(kind="grid").fit(with_base_out))
    p = {"K": 0.25, "BB": 0.08, "1B": 0.17, "2B": 0.05, "HR": 0.03, "GB_OUT": 0.22, "AIR_OUT": 0.20}
    split = tiered_probabilities(p, hits.weak_share)
    assert_allclose(sum(split.values()), 1.0, rtol=1e-12)
    # all-weak singles score fewer runs than all-strong ones
    weak = run_expectancy(tiered_probabilities(p, {"1B": 1.0}), advancement=hits.table)[0, 0]
    strong = run_expectancy(tiered_probabilities(p, {"1B": 0.0}), advancement=hits.table)[0, 0]
    assert weak < strong


def test_not_offered_without_base_out(synth_pas):
    assert not tiered_hits_available(synth_pas)
    with pytest.raises(DataError, match="tiered hits are not offered"):
        tiered_advancement(synth_pas)


def test_weak_shares_from_mix_closed_form():
    given = pd.DataFrame({"1B": [0.2, 0.1, 0.3], "2B": [0.0, 0.1, 0.1]}, index=[1, 2, 3])
    mix = pd.Series([0.5, 0.25, 0.25], index=[1, 2, 3])
    got = weak_shares_from_mix(mix, given, strong_from=3)
    # hand sums: 1B (0.1 + 0.025) / (0.1 + 0.025 + 0.075); 2B 0.025 / 0.05
    assert_allclose([got["1B"], got["2B"]], [0.625, 0.5], rtol=1e-12)
