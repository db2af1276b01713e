"""Game-level hold-out, season-forward split and the cell collapse."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.data import OUTCOMES, DataError
from matchup_widgets.model import collapse_cells, split_games, split_last_season


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_split_holds_out_whole_games_in_the_asked_share(seed):
    rng = np.random.default_rng(seed)
    games = rng.integers(0, 400, size=20_000).astype(str)
    held = split_games(games, holdout_share=0.25, seed=seed)
    per_game = pd.Series(held).groupby(games).agg(["min", "max"])
    assert (per_game["min"] == per_game["max"]).all()  # never part of a game
    assert per_game["min"].sum() == round(0.25 * per_game.shape[0])
    # same seed, same split; another seed, another split
    assert (split_games(games, holdout_share=0.25, seed=seed) == held).all()
    assert (split_games(games, holdout_share=0.25, seed=seed + 10) != held).any()


def test_split_does_not_depend_on_row_order():
    games = np.array([f"g{i % 50}" for i in range(1000)])
    order = np.random.default_rng(3).permutation(1000)
    held = split_games(games, seed=4)
    assert (split_games(games[order], seed=4) == held[order]).all()


def test_split_errors_say_what_to_do():
    with pytest.raises(ValueError, match="holdout_share must lie strictly between 0 and 1; got 1.0"):
        split_games(["a", "b"], holdout_share=1.0)
    with pytest.raises(ValueError, match="at least 2 games; the table has 1"):
        split_games(["a", "a"])
    with pytest.raises(ValueError, match="at least 2 seasons; the table has 1 \\(2031\\)"):
        split_last_season([2031, 2031])


def test_last_season_is_held_out():
    assert split_last_season(np.array([2032, 2031, 2033, 2033])).tolist() == [False, False, True, True]


def test_collapse_matches_pandas_crosstab():
    # Reference: pandas.crosstab of the same rows (an independent count).
    rng = np.random.default_rng(5)
    n = 5000
    frame = pd.DataFrame(
        {
            "batter_id": rng.choice([f"b{i}" for i in range(30)], n),
            "pitcher_id": rng.choice([f"p{i}" for i in range(20)], n),
            "batter_hand": rng.choice(["L", "R"], n),
            "pitcher_hand": rng.choice(["L", "R"], n),
            "outcome": rng.choice(list(OUTCOMES), n),
        }
    )
    cells, inverse = collapse_cells(frame, return_inverse=True)
    keys = ["batter_id", "pitcher_id", "batter_hand", "pitcher_hand"]
    ref = pd.crosstab([frame[k] for k in keys], frame["outcome"]).reindex(columns=list(OUTCOMES), fill_value=0)
    got = cells.set_index(keys)[list(OUTCOMES)]
    pd.testing.assert_frame_equal(got, ref, check_names=False, check_dtype=False)
    assert (cells["pa"].to_numpy() == ref.sum(axis=1).to_numpy()).all()
    # every row points at its own cell
    assert (cells.loc[inverse, keys].to_numpy() == frame[keys].to_numpy()).all()


def test_collapse_rejects_unknown_codes():
    frame = pd.DataFrame(
        {"batter_id": ["b"] * 3, "pitcher_id": ["p"] * 3, "batter_hand": ["L"] * 3,
         "pitcher_hand": ["R"] * 3, "outcome": ["K", "SAC", "E"]}
    )
    with pytest.raises(DataError, match="column 'outcome' has 2 row\\(s\\) with codes outside OUTCOMES \\(e.g. 'SAC', 'E'\\)"):
        collapse_cells(frame)
    with pytest.raises(DataError, match="needs column\\(s\\) \\['pitcher_id'\\]"):
        collapse_cells(frame.drop(columns="pitcher_id"))
