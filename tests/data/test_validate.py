"""Validation policy: each bad-input case of the data contract, and a property test.

Every table here is built in the test from invented players; the expected numbers are
hand counts of the rows written down in the test (the reference is the table itself).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from matchup_widgets.data import OUTCOMES, DataError, ValidationReport, load_pas


def _frame(n: int = 8, *, contact: bool = True, base_out: bool = False) -> pd.DataFrame:
    """n distinct plate appearances of invented players (two batters, two pitchers)."""
    codes = ["K", "BB", "1B", "GB_OUT", "AIR_OUT", "HR", "2B", "HBP"]
    df = pd.DataFrame(
        {
            "game_id": [f"g{i // 4}" for i in range(n)],
            "game_date": ["2031-04-02" if i < 4 else "2032-05-09" for i in range(n)],
            "batter_id": ["b1" if i % 2 else "b2" for i in range(n)],
            "pitcher_id": ["p1" if i % 3 else "p2" for i in range(n)],
            "batter_name": ["Ada Quill" if i % 2 else "Bo Reed" for i in range(n)],
            "pitcher_name": ["Cy Moss" if i % 3 else "Di Lark" for i in range(n)],
            "batter_hand": ["L" if i % 2 else "R" for i in range(n)],
            "pitcher_hand": ["R" if i % 3 else "L" for i in range(n)],
            "outcome": [codes[i % len(codes)] for i in range(n)],
            "inning": [1 + i for i in range(n)],
        }
    )
    if contact:
        batted = df["outcome"].isin(["1B", "2B", "3B", "HR", "GB_OUT", "AIR_OUT"])
        df["exit_velo"] = np.where(batted, 80.0 + np.arange(n), np.nan)
        df["launch_angle"] = np.where(batted, 10.0 + np.arange(n), np.nan)
    if base_out:
        df["outs_before"] = [i % 3 for i in range(n)]
        df["bases_before"] = [i % 8 for i in range(n)]
        df["outs_after"] = [min(i % 3 + 1, 3) for i in range(n)]
        df["bases_after"] = [0] * n
        df["runs_on_play"] = [0] * n
    return df


def test_clean_table_is_kept_whole():
    pas = load_pas(_frame(base_out=True))
    r = pas.report
    assert (r.n_read, r.n_kept, r.dropped, r.set_missing) == (8, 8, {}, {})
    assert r.has_contact and r.has_base_out
    assert pas.seasons == [2031, 2032]  # from the years of game_date
    assert json.loads(json.dumps(r.to_dict()))["n_kept"] == 8


def test_missing_required_column_names_it_and_suggests_a_mapping():
    df = _frame().rename(columns={"batter_hand": "BatterHand"})
    with pytest.raises(DataError, match=r"no required column 'batter_hand'.*'BatterHand': 'batter_hand'"):
        load_pas(df)


def test_missing_column_hint_never_points_at_another_contract_column():
    df = _frame().drop(columns=["pitcher_hand"])
    with pytest.raises(DataError) as info:
        load_pas(df)
    assert "'pitcher_id': 'pitcher_hand'" not in str(info.value)
    assert "Rename yours with a mapping" in str(info.value)


def test_unknown_outcome_codes_are_an_error_listing_codes_and_counts():
    df = _frame()
    df.loc[[0, 1, 2], "outcome"] = ["SAC", "SAC", "E"]
    with pytest.raises(DataError, match=r"outcome.* in 3 rows: 'SAC' \(2 rows\), 'E' \(1 row\).*outcome_map"):
        load_pas(df)


def test_outcome_map_maps_and_drops_with_a_count():
    df = _frame()
    df.loc[[0, 1, 2], "outcome"] = ["SAC", "sac", "E"]
    pas = load_pas(df, outcome_map={"SAC": None, "E": "GB_OUT"})
    assert pas.report.dropped == {"outcome SAC mapped to None": 2}
    assert pas.report.n_kept == 6
    assert (pas.frame["outcome"] == "GB_OUT").sum() == (_frame()["outcome"].iloc[3:] == "GB_OUT").sum() + 1


def test_outcome_map_to_a_non_code_is_an_error():
    with pytest.raises(DataError, match=r"outcome_map sends codes to values that are not outcome codes: 'E': 'ERR'"):
        load_pas(_frame(), outcome_map={"E": "ERR"})


def test_at_most_five_example_values_are_shown():
    df = _frame(12)
    df.loc[range(7), "outcome"] = ["X1", "X2", "X3", "X4", "X5", "X6", "X7"]
    with pytest.raises(DataError) as info:
        load_pas(df)
    shown = [c for c in ["X1", "X2", "X3", "X4", "X5", "X6", "X7"] if f"'{c}'" in str(info.value)]
    assert len(shown) == 5
    assert "in 7 rows" in str(info.value)


@pytest.mark.parametrize("bad", ["S", "B", None, ""])
def test_hand_not_l_or_r_is_an_error(bad):
    df = _frame()
    df.loc[3, "pitcher_hand"] = bad
    with pytest.raises(DataError, match=r"Column 'pitcher_hand' is not L or R in 1 row: ('S'|'B'|missing|'')"):
        load_pas(df)


def test_hands_and_codes_are_normalised_for_case_and_blanks():
    df = _frame()
    df.loc[0, "batter_hand"] = " r"
    df.loc[1, "outcome"] = "bb "
    pas = load_pas(df)
    assert pas.frame.loc[0, "batter_hand"] == "R"
    assert pas.frame["outcome"].isin(OUTCOMES).all()


def test_exit_velocity_and_launch_angle_out_of_range_are_set_missing_with_a_warning():
    df = _frame()
    df.loc[2, "exit_velo"] = 131.0  # just above 130 mph
    df.loc[3, "exit_velo"] = -1.0
    df.loc[4, "launch_angle"] = 90.5
    pas = load_pas(df)
    r = pas.report
    assert r.n_kept == 8  # the plate appearances stay
    assert r.set_missing == {"exit_velo outside 0..130": 2, "launch_angle outside -90..90": 1}
    assert any("2 values of exit_velo outside 0..130 mph" in w for w in r.warnings)
    assert pas.frame["exit_velo"].isna().sum() == 2 + (~_frame()["outcome"].isin(["1B", "2B", "HR", "GB_OUT", "AIR_OUT"])).sum()


def test_boundary_values_are_accepted():
    df = _frame()
    df.loc[2, "exit_velo"], df.loc[3, "exit_velo"] = 0.0, 130.0
    df.loc[2, "launch_angle"], df.loc[3, "launch_angle"] = -90.0, 90.0
    assert load_pas(df).report.set_missing == {}


def test_contact_outcome_without_exit_velocity_is_allowed_and_counted():
    df = _frame()
    batted = df.index[df["outcome"].isin(["1B", "GB_OUT", "AIR_OUT"])]
    df.loc[batted, "exit_velo"] = np.nan
    r = load_pas(df).report
    assert r.n_kept == 8
    assert r.n_batted_without_exit_velo == len(batted) == 3
    assert any("3 batted balls without exit velocity" in w for w in r.warnings)


@pytest.mark.parametrize(
    ("column", "value", "pattern"),
    [
        ("outs_before", 3, r"'outs_before' is not a whole number from 0 to 2 in 1 row: '3(\.0)?'"),
        ("outs_after", -1, r"'outs_after' is not a whole number from 0 to 3"),
        ("bases_before", 8, r"'bases_before' is not a whole number from 0 to 7"),
        ("bases_after", 1.5, r"'bases_after' is not a whole number from 0 to 7 in 1 row: '1.5'"),
        ("inning", 0, r"'inning' is not a whole number from 1 to 99"),
    ],
)
def test_outs_and_bases_out_of_range_are_an_error(column, value, pattern):
    df = _frame(base_out=True)
    df[column] = df[column].astype("float64")
    df.loc[5, column] = value
    with pytest.raises(DataError, match=pattern):
        load_pas(df)


def test_exact_duplicate_rows_are_dropped_with_a_count():
    df = _frame()
    doubled = pd.concat([df, df.iloc[[1, 1, 4]]], ignore_index=True)
    pas = load_pas(doubled)
    assert pas.report.n_read == 11
    assert pas.report.dropped == {"duplicate row": 3}
    assert pas.report.n_kept == 8
    assert any("add such a column" in w for w in pas.report.warnings)
    assert load_pas(doubled, drop_duplicates=False).report.n_kept == 11


def test_repeats_in_a_table_with_no_plate_appearance_key_are_kept_and_counted():
    # Only the contract's required columns: a batter who grounds out twice against the same
    # pitcher in one game writes two identical rows, so they are plate appearances, not copies.
    import ibis

    df = _frame(contact=False).drop(columns="inning")
    repeated = pd.concat([df, df.iloc[[3, 3, 6]]], ignore_index=True)  # 11 rows, 3 repeats
    on_duckdb = load_pas(repeated)
    on_polars = load_pas(ibis.polars.connect().create_table("pas", ibis.memtable(repeated)))
    for pas in (on_duckdb, on_polars):
        r = pas.report
        assert (r.n_read, r.n_kept, r.dropped, r.n_repeated_rows) == (11, 11, {}, 3)
        assert any("3 rows repeat an earlier row exactly and are kept" in w for w in r.warnings)
        # every row counts: the outcome shares are the input's own (hand count: pandas value_counts)
        got = pas.frame["outcome"].value_counts().sort_index()
        pd.testing.assert_series_equal(got, repeated["outcome"].value_counts().sort_index(), check_dtype=False)
    # asked for, the copies go with a count; with a key column the default drops them
    assert load_pas(repeated, drop_duplicates=True).report.dropped == {"duplicate row": 3}
    assert load_pas(repeated.assign(inning=1)).report.dropped == {"duplicate row": 3}
    assert load_pas(df).report.n_repeated_rows == 0


def test_duplicates_are_judged_on_the_rows_as_read():
    # rows 8 and 9 repeat row 1 once normalised (hand "l", code "bb "), but not as written;
    # only row 10, an exact copy, is a duplicate (hand count)
    df = _frame()
    copies = df.iloc[[1, 1, 1]].copy()
    copies.iloc[0, df.columns.get_loc("batter_hand")] = "l"
    copies.iloc[1, df.columns.get_loc("outcome")] = copies.iloc[1]["outcome"].lower() + " "
    pas = load_pas(pd.concat([df, copies], ignore_index=True))
    assert (pas.report.n_read, pas.report.n_kept, pas.report.dropped) == (11, 10, {"duplicate row": 1})


def test_rows_differing_in_an_extra_column_are_not_duplicates():
    df = pd.concat([_frame(), _frame().iloc[[1]]], ignore_index=True)
    df["event_no"] = range(len(df))  # a per-plate-appearance key the contract does not name
    assert load_pas(df).report.dropped == {}


def test_empty_table_is_an_error():
    with pytest.raises(DataError, match=r"The table has no rows"):
        load_pas(_frame().iloc[:0])


def test_rows_missing_keys_are_dropped_with_reasons():
    df = _frame()
    df.loc[0, "batter_id"] = None
    df.loc[1, "game_id"] = ""
    df.loc[2, "outcome"] = None
    r = load_pas(df).report
    assert r.dropped == {"missing game_id": 1, "missing batter_id": 1, "missing outcome": 1}
    assert r.n_kept == 5


def test_every_row_dropped_is_an_error():
    df = _frame()
    df["pitcher_id"] = None
    with pytest.raises(DataError, match=r"Every row was dropped \(missing pitcher_id: 8\)"):
        load_pas(df)


def test_missing_names_are_filled_from_ids():
    df = _frame()
    df.loc[0, "batter_name"] = None
    pas = load_pas(df)
    assert pas.report.set_missing == {"batter_name filled from batter_id": 1}
    assert pas.frame.loc[0, "batter_name"] == pas.frame.loc[0, "batter_id"]


def test_strict_turns_drops_and_repairs_into_errors():
    df = _frame()
    df.loc[2, "exit_velo"] = 500.0
    with pytest.raises(DataError, match=r"strict=True.*exit_velo outside 0..130: 1"):
        load_pas(df, strict=True)
    with pytest.raises(DataError, match=r"strict=True and the table has 1 exact duplicate row"):
        load_pas(pd.concat([_frame(), _frame().iloc[[0]]]), strict=True)


def test_unparseable_dates_and_bad_seasons_are_errors():
    df = _frame()
    df.loc[1, "game_date"] = "April 2nd"
    with pytest.raises(DataError, match=r"'game_date' is not a date in 1 row: 'April 2nd'.*YYYY-MM-DD"):
        load_pas(df)
    df = _frame()
    df["season"] = ["2031"] * 8
    df.loc[2, "season"] = "twenty"
    with pytest.raises(DataError, match=r"'season' is not a whole year between 1800 and 2300 in 1 row: 'twenty'"):
        load_pas(df)


def test_season_column_wins_over_the_date_year():
    df = _frame()
    df["season"] = 2040
    assert load_pas(df).seasons == [2040]


def test_wrong_column_types_are_errors():
    df = _frame()
    df["game_date"] = 20310402
    with pytest.raises(DataError, match=r"Column 'game_date' has type int64, which cannot hold dates"):
        load_pas(df)
    df = _frame()
    df["exit_velo"] = True
    with pytest.raises(DataError, match=r"Column 'exit_velo' has type boolean"):
        load_pas(df)


def test_mixed_value_types_in_a_dataframe_column_are_an_error():
    df = _frame()
    df["batter_id"] = pd.Series(["b1", 2, "b3", 4.5, "b5", "b6", "b7", "b8"], dtype=object)
    with pytest.raises(DataError, match=r"Column 'batter_id' mixes value types"):
        load_pas(df)


def test_numeric_ids_become_text_keys():
    df = _frame()
    df["batter_id"] = np.where(df["batter_id"] == "b1", 1001, 1002)
    assert set(load_pas(df).frame["batter_id"]) == {"1001", "1002"}


def test_report_summary_reads_as_text():
    r = ValidationReport(n_read=10, n_kept=9, dropped={"duplicate row": 1}, warnings=["x"], has_contact=True)
    text = r.summary()
    assert text.startswith("Read 10 plate appearances, kept 9, dropped 1 (duplicate row: 1).")
    assert "Warning: x" in text


# ---- property test: malformed tables raise only DataError ---------------------------

_COLUMNS = list(_frame(base_out=True).columns) + ["season"]
_junk_values = st.one_of(
    st.none(),
    st.integers(-5, 2100),
    st.floats(allow_nan=True, allow_infinity=True),
    st.text(max_size=6),
    st.sampled_from(["K", "BB", "L", "R", "l", "SAC", "2031-04-02", "", " ", "nan"]),
    st.booleans(),
)


@st.composite
def _malformed(draw):
    n = draw(st.integers(0, 12))
    df = _frame(max(n, 1), base_out=True).iloc[:n].copy()
    df["season"] = 2031
    for _ in range(draw(st.integers(0, 4))):
        action = draw(st.sampled_from(["drop", "column", "cell", "dtype", "duplicate"]))
        if not len(df.columns):
            break
        col = draw(st.sampled_from(list(df.columns)))
        if action == "drop":
            df = df.drop(columns=[col])
        elif action == "column" and len(df):
            values = draw(st.lists(_junk_values, min_size=len(df), max_size=len(df)))
            kinds = {type(v) for v in values if v is not None}
            df[col] = pd.Series(values, dtype=object if len(kinds) > 1 else None, index=df.index)
        elif action == "cell" and len(df):
            i = draw(st.integers(0, len(df) - 1))
            value = draw(_junk_values)
            df[col] = df[col].astype(object)
            df.iloc[i, df.columns.get_loc(col)] = value
        elif action == "dtype":
            df[col] = draw(st.sampled_from([1.5, 7, "x", None, True, pd.Timestamp("2031-01-01")]))
        elif action == "duplicate" and len(df):
            df = pd.concat([df, df.iloc[[0]]], ignore_index=True)
    return df


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_malformed(), st.booleans())
def test_malformed_tables_raise_only_data_error(df, strict):
    try:
        pas = load_pas(df, strict=strict)
    except DataError as exc:
        assert str(exc) and "\n" not in str(exc)  # one paragraph
        return
    r = pas.report
    assert r.n_kept + sum(r.dropped.values()) == r.n_read
    frame = pas.frame
    assert len(frame) == r.n_kept
    assert frame["outcome"].isin(OUTCOMES).all()
    assert frame["batter_hand"].isin(["L", "R"]).all() and frame["pitcher_hand"].isin(["L", "R"]).all()
    if "exit_velo" in frame:
        ev = frame["exit_velo"].dropna()
        assert ((ev >= 0) & (ev <= 130)).all() and all(math.isfinite(v) for v in ev)


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(_malformed())
def test_malformed_csv_files_raise_only_data_error(df):
    import tempfile
    from pathlib import Path

    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "pas.csv"
        df.to_csv(path, index=False)
        try:
            pas = load_pas(path)
        except DataError as exc:
            assert str(exc) and "\n" not in str(exc)
            return
        assert pas.report.n_kept + sum(pas.report.dropped.values()) == pas.report.n_read
        assert pas.frame["outcome"].isin(OUTCOMES).all()
