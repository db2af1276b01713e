"""Count tables with rates, by player and platoon split."""

from __future__ import annotations

import numpy as np
import pandas as pd
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES
from matchup_widgets.model import league_distributions, outcome_distributions, with_rates


def _pas() -> pd.DataFrame:
    rng = np.random.default_rng(1)
    n = 500
    return pd.DataFrame(
        {
            "batter_id": rng.choice(["b1", "b2", "b3"], n),
            "pitcher_id": rng.choice(["p1", "p2"], n),
            "batter_hand": rng.choice(["L", "R"], n),
            "pitcher_hand": rng.choice(["L", "R"], n),
            "outcome": rng.choice(list(OUTCOMES), n),
            "season": rng.choice([2031, 2032], n),
        }
    )


def test_rates_sit_beside_counts_and_match_a_groupby():
    pas = _pas()
    got = outcome_distributions(pas, role="pitcher", seasons=(2032, 2032))
    assert list(got.columns[3:7]) == ["K", "K_rate", "BB", "BB_rate"]
    rows = pas[pas["season"] == 2032]
    ref = rows.groupby(["pitcher_id", "batter_hand", "pitcher_hand"])["outcome"].value_counts(normalize=True)
    ref = ref.unstack(fill_value=0.0).reindex(columns=list(OUTCOMES), fill_value=0.0)
    assert_allclose(got[[f"{c}_rate" for c in OUTCOMES]].to_numpy(), ref.to_numpy(), rtol=1e-12)
    assert_allclose(got[[f"{c}_rate" for c in OUTCOMES]].sum(axis=1), 1.0, rtol=1e-12)


def test_league_has_four_splits_and_empty_split_has_nan_rates():
    pas = _pas()
    pas = pas[~((pas["batter_hand"] == "L") & (pas["pitcher_hand"] == "L"))]
    got = league_distributions(pas)
    assert got[["batter_hand", "pitcher_hand"]].apply(tuple, axis=1).tolist() == [
        ("L", "L"), ("L", "R"), ("R", "L"), ("R", "R")
    ]
    assert got.loc[0, "pa"] == 0 and np.isnan(got.loc[0, "K_rate"])
    assert got["pa"].sum() == len(pas)


def test_with_rates_adds_pa_when_missing():
    counts = pd.DataFrame([[2.5] + [0.0] * 7 + [2.5]], columns=list(OUTCOMES))
    got = with_rates(counts)
    assert got.loc[0, "pa"] == 5.0 and got.loc[0, "K_rate"] == 0.5
