"""``matchup-widgets check``: exit 0 on usable data, 2 with a one-paragraph reason otherwise."""

from __future__ import annotations

import json
import os
import subprocess
import sys

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.cli import main
from matchup_widgets.data import demo_path


def _frame(n: int = 8) -> pd.DataFrame:
    codes = ["K", "BB", "1B", "GB_OUT", "AIR_OUT", "HR", "2B", "HBP"]
    batted = [c in ("1B", "GB_OUT", "AIR_OUT", "HR", "2B") for c in (codes[i % 8] for i in range(n))]
    return pd.DataFrame(
        {
            "game_id": [f"g{i // 4}" for i in range(n)],
            "game_date": ["2031-04-02"] * n,
            "batter_id": ["b1" if i % 2 else "b2" for i in range(n)],
            "pitcher_id": ["p1"] * n,
            "batter_name": ["Ada Quill" if i % 2 else "Bo Reed" for i in range(n)],
            "pitcher_name": ["Cy Moss"] * n,
            "batter_hand": ["L" if i % 2 else "R" for i in range(n)],
            "pitcher_hand": ["R"] * n,
            "outcome": [codes[i % 8] for i in range(n)],
            "exit_velo": [90.0 + i if b else np.nan for i, b in enumerate(batted)],
            "launch_angle": [5.0 + i if b else np.nan for i, b in enumerate(batted)],
            "outs_before": [i % 3 for i in range(n)],
            "bases_before": [i % 8 for i in range(n)],
        }
    )


def _write(df: pd.DataFrame, path) -> str:
    df.to_csv(path, index=False)
    return str(path)


def _run(capsys, *args: str) -> tuple[int, str, str]:
    code = main(["check", *args])
    out, err = capsys.readouterr()
    return code, out, err


def _bad_cases(tmp_path):
    """(name, path) for each bad-input case of the data contract."""
    cases = {}
    df = _frame().drop(columns=["pitcher_hand"])
    cases["missing column"] = (_write(df, tmp_path / "missing.csv"), r"no required column 'pitcher_hand'")
    df = _frame()
    df.loc[0, "outcome"] = "SAC"
    cases["unknown code"] = (_write(df, tmp_path / "code.csv"), r"'SAC' \(1 row\)")
    df = _frame()
    df.loc[1, "batter_hand"] = "S"
    cases["hand"] = (_write(df, tmp_path / "hand.csv"), r"'batter_hand' is not L or R in 1 row: 'S'")
    df = _frame()
    df.loc[2, "outs_before"] = 3
    cases["outs"] = (_write(df, tmp_path / "outs.csv"), r"'outs_before' is not a whole number from 0 to 2")
    df = _frame()
    df.loc[3, "bases_before"] = 9
    cases["bases"] = (_write(df, tmp_path / "bases.csv"), r"'bases_before' is not a whole number from 0 to 7")
    empty = tmp_path / "empty.csv"
    empty.write_text("")
    cases["empty file"] = (str(empty), r"is empty \(0 bytes\)")
    header = tmp_path / "header.csv"
    _frame().iloc[:0].to_csv(header, index=False)
    cases["header only"] = (str(header), r"has no rows")
    return cases


@pytest.mark.parametrize(
    "case", ["missing column", "unknown code", "hand", "outs", "bases", "empty file", "header only"]
)
def test_each_bad_input_exits_2_with_one_paragraph(tmp_path, capsys, case):
    import re

    path, pattern = _bad_cases(tmp_path)[case]
    code, out, err = _run(capsys, path)
    assert code == 2
    assert out == ""
    assert err.startswith("error: ") and err.count("\n") == 1  # one paragraph
    assert re.search(pattern, err), err
    code, out, _ = _run(capsys, path, "--json")
    assert code == 2
    assert re.search(pattern, json.loads(out)["error"])


def test_out_of_range_contact_and_duplicates_are_usable_with_counts(tmp_path, capsys):
    df = _frame()
    df.loc[2, "exit_velo"] = 140.0
    df.loc[3, "launch_angle"] = -95.0
    df.loc[4, "exit_velo"] = np.nan
    df = pd.concat([df, df.iloc[[0]]], ignore_index=True)
    code, out, _ = _run(capsys, _write(df, tmp_path / "fixable.csv"), "--json")
    assert code == 0
    report = json.loads(out)
    assert report["usable"] is True
    assert report["n_read"] == 9 and report["n_kept"] == 8
    assert report["dropped"] == {"duplicate row": 1}
    assert report["set_missing"] == {"exit_velo outside 0..130": 1, "launch_angle outside -90..90": 1}
    assert report["n_batted_without_exit_velo"] == 2  # the one set missing and the one left blank


def test_repeated_rows_without_a_key_are_kept_unless_asked(tmp_path, capsys):
    # no inning/outs/bases column: a repeated row may be a real repeated plate appearance
    df = _frame().drop(columns=["outs_before", "bases_before"])
    path = _write(pd.concat([df, df.iloc[[0, 5]]], ignore_index=True), tmp_path / "keyless.csv")
    code, out, _ = _run(capsys, path, "--json")
    report = json.loads(out)
    assert code == 0 and (report["n_kept"], report["n_repeated_rows"], report["dropped"]) == (10, 2, {})
    code, out, _ = _run(capsys, path, "--duplicates", "drop", "--json")
    assert code == 0 and json.loads(out)["dropped"] == {"duplicate row": 2}
    code, out, _ = _run(capsys, path, "--duplicates", "keep", "--json")
    assert code == 0 and json.loads(out)["n_repeated_rows"] == 0 and json.loads(out)["n_kept"] == 10


def test_zero_pa_in_a_requested_split_exits_2(tmp_path, capsys):
    path = _write(_frame(), tmp_path / "pas.csv")
    code, out, _ = _run(capsys, path, "--batter", "Ada Quill", "--split", "L-R")
    assert code == 0 and "PA in the L-R split" in out
    code, _, err = _run(capsys, path, "--batter", "b1", "--split", "L-L")
    assert code == 2
    assert "batter 'b1' has no plate appearances batting L against a left-handed pitcher" in err
    assert "Splits with plate appearances: L vs R (4 PA)" in err
    code, _, err = _run(capsys, path, "--pitcher", "Nobody Here")
    assert code == 2 and "No pitcher matches 'Nobody Here'" in err
    # a split with no player to check used to be ignored silently
    code, _, err = _run(capsys, path, "--split", "L-R")
    assert code == 2 and "give --batter or --pitcher with it" in err
    code, _, err = _run(capsys, path, "--batter", "b1", "--split", "sideways")
    assert code == 2 and "is not a platoon split" in err


def test_mapping_and_outcome_map_files(tmp_path, capsys):
    df = _frame().rename(columns={"outcome": "result"})
    df.loc[0, "result"] = "SAC"
    path = _write(df, tmp_path / "theirs.csv")
    mapping = tmp_path / "map.json"
    mapping.write_text(json.dumps({"result": "outcome"}))
    codes = tmp_path / "codes.json"
    codes.write_text(json.dumps({"SAC": None}))
    code, out, _ = _run(capsys, path, "--mapping", str(mapping), "--outcome-map", str(codes), "--json")
    assert code == 0
    assert json.loads(out)["dropped"] == {"outcome SAC mapped to None": 1}
    code, _, err = _run(capsys, path, "--mapping", str(mapping), "--strict", "--outcome-map", str(codes))
    assert code == 2 and "strict=True" in err


@pytest.mark.skipif(not demo_path().exists(), reason="demo league not generated")
def test_demo_league_is_usable(capsys):
    code, out, _ = _run(capsys, str(demo_path()))
    assert code == 0
    assert out.startswith("Read ") and "Usable: yes." in out
    code, out, _ = _run(capsys, str(demo_path()), "--json")
    payload = json.loads(out)
    assert code == 0 and payload["usable"] and payload["seasons"]


def test_module_entry_point_in_a_subprocess(tmp_path):
    bad_df = _frame()
    bad_df.loc[0, "pitcher_hand"] = "X"
    bad = _write(bad_df, tmp_path / "bad.csv")
    env = {**os.environ, "PYTHONWARNINGS": "ignore"}
    fail = subprocess.run([sys.executable, "-m", "matchup_widgets", "check", bad, "--json"],
                          capture_output=True, text=True, timeout=120, env=env)
    assert fail.returncode == 2
    assert "'pitcher_hand' is not L or R in 1 row: 'X'" in json.loads(fail.stdout)["error"]
