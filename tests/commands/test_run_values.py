"""The ``run-values`` command: one JSON object with the contract's keys, readable errors."""

from __future__ import annotations

import json
import subprocess
import sys

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.cli import main
from matchup_widgets.data import OUTCOMES
from matchup_widgets.runs import (
    END,
    default_advancement,
    linear_weights,
    run_expectancy,
    runs_per_9,
    woba_weights,
)
from matchup_widgets.runs._states import STATE_BASES, STATE_OUTS

# Invented league line, for smoke tests only (check values come from the core functions).
_RATES = dict(zip(OUTCOMES, [0.22, 0.085, 0.01, 0.14, 0.045, 0.004, 0.034, 0.22, 0.242]))
_KEYS = {"run_expectancy", "linear_weights", "woba_weights", "runs_per_inning", "runs_per_9"}


def _run_json(capsys, *args) -> tuple[int, dict]:
    code = main(["run-values", *map(str, args), "--json"])
    out = capsys.readouterr().out
    assert out.count("\n") == 1  # exactly one JSON object on one line
    return code, json.loads(out)


@pytest.fixture
def rates_file(tmp_path):
    path = tmp_path / "rates.json"
    path.write_text(json.dumps(_RATES))
    return path


def test_rates_file_gives_the_contract_keys(capsys, rates_file):
    code, d = _run_json(capsys, "--rates", rates_file)
    assert code == 0 and _KEYS <= set(d)
    assert np.array(d["run_expectancy"]).shape == (3, 8)
    assert_allclose(d["run_expectancy"], run_expectancy(_RATES), atol=1e-6)
    assert d["linear_weights"].keys() == set(OUTCOMES)
    assert_allclose(list(d["linear_weights"].values()), linear_weights(_RATES).to_numpy(), atol=1e-6)
    weights, scale = woba_weights(_RATES)
    assert list(d["woba_weights"]) == list(weights.index)
    assert d["woba_scale"] == pytest.approx(scale, abs=1e-6)
    assert d["runs_per_9"] == pytest.approx(runs_per_9(_RATES), abs=1e-6)
    assert d["advancement"]["source"] == "default"


def test_walk_or_out_batter_scores_the_closed_form(capsys, tmp_path):
    # A batter who walks with probability 1/2 and otherwise strikes out scores 0.9375 runs
    # per inning from empty bases, none out (closed form of the chain, stated in the runs issue).
    path = tmp_path / "half.json"
    path.write_text(json.dumps({"K": 0.5, "BB": 0.5}))
    code, d = _run_json(capsys, "--rates", path)
    assert code == 0
    assert d["run_expectancy"][0][0] == pytest.approx(0.9375, abs=1e-6)
    assert d["runs_per_inning"] == pytest.approx(0.9375, abs=1e-6)
    code, d = _run_json(capsys, "--rates", path, "--seasons", 2031, 2031)
    assert code == 2 and "a rates file has none" in d["error"]


def test_json_keeps_full_precision_for_an_exact_closed_form(capsys, tmp_path):
    # Walk 1/4, strike out 3/4: walks before the third out W ~ NegBin(3, 3/4), runs forced in
    # max(W - 3, 0), mean E[W] - 3 + 3 P(W=0) + 2 P(W=1) + P(W=2)
    # = 1 - 3 + 81/64 + 162/256 + 162/1024 = 29/512 = 0.056640625 (hand sum, exact in binary).
    # Rounded to 6 decimals it would print 0.056641, 3.75e-7 off.
    path = tmp_path / "quarter.json"
    path.write_text(json.dumps({"K": 0.75, "BB": 0.25}))
    code, d = _run_json(capsys, "--rates", path)
    assert code == 0
    assert d["runs_per_inning"] == pytest.approx(29 / 512, abs=1e-14)
    assert d["run_expectancy"][0][0] == pytest.approx(29 / 512, abs=1e-14)
    assert d["runs_per_9"] == pytest.approx(9 * 29 / 512, abs=1e-13)


def test_text_output_for_people(capsys, rates_file):
    assert main(["run-values", "--rates", str(rates_file)]) == 0
    out = capsys.readouterr().out
    assert "Bases loaded, 2 outs" in out and "wOBA weights" in out


@pytest.mark.parametrize(
    ("content", "match"),
    [
        ('{"K": 0.5}', "must sum to 1"),
        ('{"K": 0.5, "XX": 0.5}', "unknown outcome code"),
        ("[0.5, 0.5]", "expected a JSON object"),
        ("{K: 1}", "not valid JSON"),
        ('{"K": "half", "HR": 0.5}', "values must be numbers"),
    ],
)
def test_bad_rates_files_fail_readably(capsys, tmp_path, content, match):
    path = tmp_path / "bad.json"
    path.write_text(content)
    code, d = _run_json(capsys, "--rates", path)
    assert code == 2
    assert match in d["error"] and str(path) in d["error"]


def test_normalize_rescales_rounded_rates(capsys, tmp_path):
    path = tmp_path / "rounded.json"
    path.write_text(json.dumps({k: round(v * 2, 3) for k, v in _RATES.items()}))
    code, d = _run_json(capsys, "--rates", path, "--normalize")
    assert code == 0
    assert_allclose(d["run_expectancy"], run_expectancy(_RATES), atol=1e-6)


def test_missing_rates_file(capsys, tmp_path):
    code, d = _run_json(capsys, "--rates", tmp_path / "nope.json")
    assert code == 2 and "nope.json" in d["error"]
    assert "cannot read the file (No such file or directory)" in d["error"]


def _plays(n: int, seed: int, *, base_out: bool = True) -> pd.DataFrame:
    """Invented plate appearances whose base-out moves are drawn from the default table."""
    rng = np.random.default_rng(seed)
    table = default_advancement()
    p = np.array(list(_RATES.values()))
    o = rng.choice(9, size=n, p=p)
    s = rng.integers(0, 24, n)
    cum = np.cumsum(table.transitions[o, s], axis=1)
    t = np.minimum((rng.random(n)[:, None] >= cum / cum[:, -1:]).sum(axis=1), END)
    ids = rng.integers(0, 30, n)
    frame = pd.DataFrame({
        "game_id": [f"g{i // 40}" for i in range(n)],
        "game_date": pd.Timestamp("2031-04-01") + pd.to_timedelta(np.arange(n) // 400, unit="D"),
        "batter_id": [f"b{i}" for i in ids], "pitcher_id": [f"p{i % 7}" for i in ids],
        "batter_name": [f"Batter {i}" for i in ids], "pitcher_name": [f"Pitcher {i % 7}" for i in ids],
        "batter_hand": np.where(ids % 3 == 0, "L", "R"), "pitcher_hand": np.where(ids % 2 == 0, "L", "R"),
        "outcome": np.array(OUTCOMES)[o],
        "pa_seq": np.arange(n),  # keeps every row distinct
    })
    if base_out:
        frame = frame.assign(
            outs_before=STATE_OUTS[s], bases_before=STATE_BASES[s],
            outs_after=np.where(t == END, 3, STATE_OUTS[t]),
            bases_after=np.where(t == END, 0, STATE_BASES[t]),
            runs_on_play=table.runs[o, s, t].astype(int),
        )
    return frame


def test_data_file_uses_league_totals_and_estimates_advancement(capsys, tmp_path):
    plays = _plays(6000, seed=4)
    path = tmp_path / "pas.parquet"
    plays.to_parquet(path)
    code, d = _run_json(capsys, "--data", path, "--min-count", 20)
    assert code == 0 and _KEYS <= set(d)
    shares = plays["outcome"].value_counts(normalize=True).reindex(list(OUTCOMES), fill_value=0)
    assert_allclose(list(d["rates"].values()), shares.to_numpy(), atol=1e-8)
    adv = d["advancement"]
    assert adv["source"] == "data" and adv["n_pa"] == 6000 and adv["pa_with_base_out"] == 6000
    assert 0 < adv["cells_from_data"] < adv["cells"]
    # Drawn from the default table, so the estimate stays near it.
    assert_allclose(d["run_expectancy"], run_expectancy(d["rates"]), atol=0.1)
    code, d2 = _run_json(capsys, "--data", path, "--advancement", "default")
    assert d2["advancement"]["source"] == "default"
    assert_allclose(d2["run_expectancy"], run_expectancy(d["rates"]), atol=1e-6)


def test_data_without_base_out_columns(capsys, tmp_path):
    path = tmp_path / "plain.parquet"
    _plays(500, seed=5, base_out=False).to_parquet(path)
    code, d = _run_json(capsys, "--data", path)
    assert code == 0 and d["advancement"]["source"] == "default"
    code, d = _run_json(capsys, "--data", path, "--advancement", "data")
    assert code == 2 and "base-out columns" in d["error"]


def test_one_json_object_from_the_console(rates_file):
    out = subprocess.run(
        [sys.executable, "-m", "matchup_widgets", "run-values", "--rates", str(rates_file), "--json"],
        capture_output=True, text=True, check=True, timeout=120,
    ).stdout
    assert out.count("\n") == 1 and _KEYS <= set(json.loads(out))


def test_seasons_limit_rates_and_advancement(capsys, tmp_path):
    first, second = _plays(1200, seed=6), _plays(800, seed=7)
    second["game_id"] = "n" + second["game_id"]
    second["game_date"] = second["game_date"] + pd.DateOffset(years=1)
    path = tmp_path / "two.parquet"
    pd.concat([first, second], ignore_index=True).to_parquet(path)
    code, d = _run_json(capsys, "--data", path, "--seasons", 2032, 2032)
    assert code == 0
    assert d["advancement"]["n_pa"] == 800 and d["advancement"]["pa_with_base_out"] == 800
