"""Engine-side outcome counts against hand counts and pandas, on DuckDB and polars."""

from __future__ import annotations

import ibis
import numpy as np
import pandas as pd
import pytest

from matchup_widgets.data import (
    OUTCOMES,
    SPLITS,
    DataError,
    league_counts,
    load_pas,
    outcome_counts,
    require_split,
)


def _random_pas(n: int = 3000, seed: int = 7) -> pd.DataFrame:
    """Seeded random plate appearances of invented players, in the contract's columns."""
    rng = np.random.default_rng(seed)
    batter = rng.integers(0, 25, n)
    pitcher = rng.integers(0, 15, n)
    switch = batter % 7 == 0
    pitcher_hand = np.where(pitcher % 3 == 0, "L", "R")
    own_side = np.where(batter % 2 == 0, "L", "R")
    # a switch hitter bats from the side opposite the pitcher's hand
    batter_hand = np.where(switch, np.where(pitcher_hand == "L", "R", "L"), own_side)
    return pd.DataFrame(
        {
            "game_id": [f"g{i // 70:04d}" for i in range(n)],
            "game_date": pd.Timestamp("2030-04-01") + pd.to_timedelta(rng.integers(0, 900, n), "D"),
            "batter_id": [f"b{i:02d}" for i in batter],
            "pitcher_id": [f"p{i:02d}" for i in pitcher],
            "batter_name": [f"Batter {i}" for i in batter],
            "pitcher_name": [f"Pitcher {i}" for i in pitcher],
            "batter_hand": batter_hand,
            "pitcher_hand": pitcher_hand,
            "outcome": np.array(OUTCOMES)[rng.integers(0, len(OUTCOMES), n)],
            "inning": rng.integers(1, 10, n),
            "outs_before": rng.integers(0, 3, n),
        }
    )


def _pandas_reference(df: pd.DataFrame, keys: list[str]) -> pd.DataFrame:
    """The same counts by pandas.crosstab, an independent implementation."""
    ref = pd.crosstab([df[k] for k in keys], df["outcome"])
    ref = ref.reindex(columns=list(OUTCOMES), fill_value=0)
    ref["pa"] = ref.sum(axis=1)
    return ref.reset_index().astype({c: np.int64 for c in [*OUTCOMES, "pa"]})


@pytest.fixture(scope="module")
def pas():
    return load_pas(_random_pas(), drop_duplicates=False)


def test_hand_counted_example():
    df = pd.DataFrame(
        {
            "batter_id": ["b1", "b1", "b1", "b2"], "pitcher_id": ["p1", "p1", "p2", "p1"],
            "batter_hand": ["L", "L", "L", "R"], "pitcher_hand": ["R", "R", "L", "R"],
            "outcome": ["K", "K", "HR", "BB"], "season": [2031] * 4,
        }
    )
    got = outcome_counts(df, role="batter")
    # hand count: b1 L-R: two strikeouts; b1 L-L: one home run; b2 R-R: one walk
    assert got[["player_id", "batter_hand", "pitcher_hand", "K", "HR", "BB", "pa"]].values.tolist() == [
        ["b1", "L", "L", 0, 1, 0, 1],
        ["b1", "L", "R", 2, 0, 0, 2],
        ["b2", "R", "R", 0, 0, 1, 1],
    ]
    assert list(got.columns) == ["player_id", "batter_hand", "pitcher_hand", *OUTCOMES, "pa"]


@pytest.mark.parametrize("role", ["batter", "pitcher"])
def test_outcome_counts_match_pandas_crosstab(pas, role):
    df = _random_pas()
    df["player_id"] = df[f"{role}_id"]
    ref = _pandas_reference(df, ["player_id", "batter_hand", "pitcher_hand"])
    got = outcome_counts(pas, role=role)
    pd.testing.assert_frame_equal(got, ref, check_dtype=False, check_names=False)
    assert (got[list(OUTCOMES)].dtypes == np.int64).all()


def test_by_season_and_season_filter(pas):
    df = _random_pas()
    df["season"] = df["game_date"].dt.year
    df["player_id"] = df["batter_id"]
    ref = _pandas_reference(df, ["player_id", "batter_hand", "pitcher_hand", "season"])
    got = outcome_counts(pas, role="batter", by_season=True)
    pd.testing.assert_frame_equal(got, ref, check_dtype=False, check_names=False)
    one = outcome_counts(pas, role="batter", seasons=(2031, 2031))
    assert one["pa"].sum() == (df["season"] == 2031).sum()
    assert outcome_counts(pas, role="batter", seasons=(1990, 1991)).empty


def test_bad_parameters():
    with pytest.raises(ValueError, match=r"role must be 'batter' or 'pitcher', got 'umpire'"):
        outcome_counts(_random_pas(20), role="umpire")
    with pytest.raises(ValueError, match=r"first season is after the last"):
        outcome_counts(_random_pas(20), role="batter", seasons=(2032, 2030))
    with pytest.raises(ValueError, match=r"inclusive \(first, last\) pair"):
        league_counts(_random_pas(20), seasons=2031)
    bare = _random_pas(20).drop(columns=["game_date"])
    with pytest.raises(DataError, match=r"needs column\(s\) 'season' \(or game_date, to derive it\)"):
        outcome_counts(bare, role="batter", by_season=True)
    with pytest.raises(DataError, match=r"needs column\(s\) 'outcome'"):
        league_counts(bare.drop(columns=["outcome"]))


def test_league_counts_have_all_four_splits_and_sum_to_the_rows(pas):
    df = _random_pas()
    got = league_counts(pas)
    assert list(zip(got["batter_hand"], got["pitcher_hand"])) == list(SPLITS)
    ref = _pandas_reference(df, ["batter_hand", "pitcher_hand"])
    pd.testing.assert_frame_equal(got, ref, check_dtype=False, check_names=False)
    assert got["pa"].sum() == len(df)


def test_league_counts_fill_absent_splits_with_zeros():
    df = _random_pas(200)
    df = df[df["pitcher_hand"] == "R"]
    got = league_counts(df)
    assert got.loc[got["pitcher_hand"] == "L", [*OUTCOMES, "pa"]].to_numpy().sum() == 0
    assert got["pa"].sum() == len(df)


def test_duckdb_and_polars_give_the_same_counts(pas):
    frame = pas.frame
    polars_table = ibis.polars.connect().create_table("pas", ibis.memtable(frame))
    assert polars_table.get_backend().name == "polars"
    assert pas.table.get_backend().name == "duckdb"
    for role in ("batter", "pitcher"):
        on_duckdb = outcome_counts(pas, role=role, by_season=True)
        on_polars = outcome_counts(polars_table, role=role, by_season=True)
        pd.testing.assert_frame_equal(on_duckdb, on_polars)
    pd.testing.assert_frame_equal(league_counts(pas, seasons=(2031, 2032)),
                                  league_counts(polars_table, seasons=(2031, 2032)))


def test_loaded_on_polars_counts_like_duckdb():
    df = _random_pas(500)
    con = ibis.polars.connect()
    on_polars = load_pas(con.create_table("pas", ibis.memtable(df)), drop_duplicates=False)
    on_duckdb = load_pas(df, drop_duplicates=False)
    pd.testing.assert_frame_equal(outcome_counts(on_polars, role="pitcher"), outcome_counts(on_duckdb, role="pitcher"))


def test_require_split_returns_counts_or_explains(pas):
    counts = outcome_counts(pas, role="batter", by_season=True)
    row = require_split(counts, "b01", "R", "R")
    df = _random_pas()
    mine = df[(df["batter_id"] == "b01") & (df["pitcher_hand"] == "R")]
    assert row["pa"] == len(mine)
    assert row["K"] == (mine["outcome"] == "K").sum()
    # b01 bats right only (odd ids, not a switch hitter), so the L-R split is empty
    with pytest.raises(DataError, match=r"batter 'b01' \(Batter 1\) has no plate appearances batting L against "
                                        r"a right-handed pitcher .*Splits with plate appearances: R vs L \(\d+ PA\), "
                                        r"R vs R \(\d+ PA\)"):
        require_split(counts, "b01", "L", "R", role="batter", name="Batter 1")
    with pytest.raises(DataError, match=r"none at all in the selected seasons"):
        require_split(counts, "nobody", "L", "R", role="batter")


def test_totals_on_the_demo_league_are_consistent():
    from matchup_widgets.data import demo_path

    if not demo_path().exists():
        pytest.skip("demo league not generated")
    pas = load_pas(demo_path())
    n = pas.report.n_kept
    for role in ("batter", "pitcher"):
        counts = outcome_counts(pas, role=role)
        assert counts["pa"].sum() == n
        assert (counts[list(OUTCOMES)].sum(axis=1) == counts["pa"]).all()
    assert league_counts(pas)["pa"].sum() == n
