"""Loading from every supported source, column mappings, and the never-write guarantee."""

from __future__ import annotations

import hashlib
import json
import os

import duckdb
import ibis
import pandas as pd
import pyarrow.parquet as pq
import pytest

from matchup_widgets.data import DataError, PlateAppearances, demo_path, load_pas


def _frame() -> pd.DataFrame:
    """Six plate appearances of invented players; ids with leading zeros on purpose."""
    return pd.DataFrame(
        {
            "game_id": ["g1", "g1", "g1", "g2", "g2", "g2"],
            "game_date": ["2031-04-02"] * 3 + ["2032-06-01"] * 3,
            "batter_id": ["007", "008", "007", "008", "007", "009"],
            "pitcher_id": ["p1", "p1", "p2", "p2", "p1", "p1"],
            "batter_name": ["Ada Quill", "Bo Reed", "Ada Quill", "Bo Reed", "Ada Quill", "Cal Fenn"],
            "pitcher_name": ["Cy Moss", "Cy Moss", "Di Lark", "Di Lark", "Cy Moss", "Cy Moss"],
            "batter_hand": ["L", "R", "L", "R", "L", "R"],
            "pitcher_hand": ["R", "R", "L", "L", "R", "R"],
            "outcome": ["K", "1B", "HR", "GB_OUT", "BB", "AIR_OUT"],
            "exit_velo": [None, 92.5, 104.0, 80.1, None, 70.0],
            "launch_angle": [None, 8.0, 27.0, -5.0, None, 55.0],
        }
    )


def _fingerprint(path) -> tuple[str, int]:
    data = open(path, "rb").read()
    return hashlib.sha256(data).hexdigest(), os.stat(path).st_mtime_ns


def _expect_frame(pas: PlateAppearances) -> None:
    assert isinstance(pas, PlateAppearances)
    assert pas.report.n_read == 6 and pas.report.n_kept == 6
    assert sorted(pas.frame["batter_id"].unique()) == ["007", "008", "009"]
    assert pas.seasons == [2031, 2032]


def test_csv_keeps_leading_zeros_and_is_not_written(tmp_path):
    path = tmp_path / "pas.csv"
    _frame().to_csv(path, index=False)
    before = _fingerprint(path)
    pas = load_pas(path)
    _expect_frame(pas)
    assert pas.report.source == "CSV file pas.csv"
    _ = pas.frame, pas.players
    assert _fingerprint(path) == before


def test_parquet_is_read_in_place_and_not_written(tmp_path):
    path = tmp_path / "pas.parquet"
    _frame().to_parquet(path)
    before = _fingerprint(path)
    pas = load_pas(str(path))
    _expect_frame(pas)
    _ = pas.frame, pas.players
    assert _fingerprint(path) == before


def test_parquet_folders_parts_or_the_demo_layout(tmp_path):
    df = _frame()
    parts = tmp_path / "parts"
    parts.mkdir()
    df.iloc[:3].to_parquet(parts / "a.parquet")
    df.iloc[3:].to_parquet(parts / "b.parquet")
    _expect_frame(load_pas(parts))  # parts of one table are read together
    # the layout demo-data writes: plate appearances beside tables of other columns
    league = tmp_path / "league"
    league.mkdir()
    df.to_parquet(league / "plate_appearances.parquet")
    df[["batter_id", "batter_name"]].to_parquet(league / "players.parquet")
    _expect_frame(load_pas(league))
    (league / "plate_appearances.parquet").rename(league / "pas.parquet")
    with pytest.raises(DataError, match=r"do not share one set of columns.*Give the path of the file"):
        load_pas(league)


def test_duckdb_file_is_attached_read_only(tmp_path):
    path = tmp_path / "league.duckdb"
    con = duckdb.connect(str(path))
    con.register("df", _frame())
    con.execute("create table pas as select * from df")
    con.close()
    before = _fingerprint(path)
    pas = load_pas(path)
    _expect_frame(pas)
    _ = pas.frame, pas.players
    del pas
    assert _fingerprint(path) == before


def test_duckdb_file_with_several_tables_needs_a_name(tmp_path):
    path = tmp_path / "league.duckdb"
    con = duckdb.connect(str(path))
    con.register("df", _frame())
    con.execute("create table pas as select * from df")
    con.execute("create table teams as select 1 as team_id")
    con.close()
    with pytest.raises(DataError, match=r"holds 2 tables \(pas, teams\); say which one with table=NAME"):
        load_pas(path)
    _expect_frame(load_pas(path, table="pas"))
    with pytest.raises(DataError, match=r"has no table 'games'; it has pas, teams"):
        load_pas(path, table="games")


def test_dataframe_and_ibis_sources():
    _expect_frame(load_pas(_frame()))
    con = ibis.duckdb.connect()
    t = con.create_table("pas", ibis.memtable(_frame()))
    _expect_frame(load_pas(t))
    _expect_frame(load_pas(con, table="pas"))


def test_polars_backend_source():
    con = ibis.polars.connect()
    t = con.create_table("pas", ibis.memtable(_frame()))
    pas = load_pas(t)
    _expect_frame(pas)
    assert pas.table.get_backend().name == "polars"


def test_input_dataframe_is_not_changed():
    df = _frame()
    df.loc[0, "batter_hand"] = "l"
    copy = df.copy()
    load_pas(df)
    pd.testing.assert_frame_equal(df, copy)


def test_mapping_dict_and_json_file(tmp_path):
    theirs = _frame().rename(columns={"batter_hand": "bats", "pitcher_hand": "throws", "outcome": "result"})
    mapping = {"bats": "batter_hand", "throws": "pitcher_hand", "result": "outcome"}
    _expect_frame(load_pas(theirs, mapping=mapping))
    path = tmp_path / "map.json"
    path.write_text(json.dumps(mapping))
    _expect_frame(load_pas(theirs, mapping=path))


@pytest.mark.parametrize(
    ("mapping", "pattern"),
    [
        ({"hits": "batter_hand"}, r"names column\(s\) 'hits' that the table does not have"),
        ({"outcome": "result_code"}, r"renames onto 'result_code', which are not columns of the plate-appearance"),
        ({"batter_name": "pitcher_name"}, r"'pitcher_name' appear twice"),
        ({"outcome": 3}, r"must be a dict \{their_name: our_name\} of strings"),
    ],
)
def test_bad_mappings_are_errors(mapping, pattern):
    with pytest.raises(DataError, match=pattern):
        load_pas(_frame(), mapping=mapping)


def test_mapping_file_problems(tmp_path):
    with pytest.raises(DataError, match=r"Mapping file .* does not exist"):
        load_pas(_frame(), mapping=tmp_path / "nope.json")
    bad = tmp_path / "bad.json"
    bad.write_text("{not json")
    with pytest.raises(DataError, match=r"is not readable JSON"):
        load_pas(_frame(), mapping=bad)


@pytest.mark.parametrize("content", ["", "game_id,game_date,batter_id,pitcher_id,batter_name,pitcher_name,"
                                         "batter_hand,pitcher_hand,outcome\n"])
def test_empty_csv_files_are_errors(tmp_path, content):
    path = tmp_path / "empty.csv"
    path.write_text(content)
    with pytest.raises(DataError, match=r"(is empty \(0 bytes\)|has no rows)"):
        load_pas(path)


def test_unreadable_sources_are_errors(tmp_path):
    with pytest.raises(DataError, match=r"does not exist"):
        load_pas(tmp_path / "missing.parquet")
    weird = tmp_path / "pas.xlsx"
    weird.write_text("x")
    with pytest.raises(DataError, match=r"Cannot tell the format"):
        load_pas(weird)
    broken = tmp_path / "broken.parquet"
    broken.write_bytes(b"PAR1 not really parquet")
    with pytest.raises(DataError, match=r"Could not read"):
        load_pas(broken)
    with pytest.raises(DataError, match=r"Cannot load plate appearances from a list"):
        load_pas([1, 2, 3])
    with pytest.raises(DataError, match=r"needs table=NAME"):
        load_pas(ibis.duckdb.connect())


def test_frame_is_cached_and_players_listed():
    pas = load_pas(_frame())
    assert pas.frame is pas.frame
    players = pas.players
    assert list(players.columns) == ["player_id", "name", "role", "hands", "pa"]
    assert players["pa"][players["role"] == "batter"].sum() == 6
    assert "6 rows" in repr(pas)


@pytest.mark.skipif(not demo_path().exists(), reason="demo league not generated")
def test_demo_league_loads_whole():
    pas = load_pas(demo_path())
    # pyarrow's own row count of the same file is the reference
    assert pas.report.n_read == pq.ParquetFile(demo_path()).metadata.num_rows
    assert pas.report.n_kept == pas.report.n_read
    assert pas.report.has_contact and pas.report.has_base_out
