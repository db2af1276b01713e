"""The blend command on the invented demo league: documented JSON keys, names, errors."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from matchup_widgets.cli import main
from matchup_widgets.data import OUTCOMES

DOCUMENTED_KEYS = {"probabilities", "intervals", "pa", "woba", "runs_per_pa", "settings"}


@pytest.fixture(scope="module")
def demo(repo_root):
    path = repo_root / "demo_data" / "plate_appearances.parquet"
    if not path.exists():
        pytest.skip("demo league not generated (make demo)")
    return str(path)


def _run(capsys, *argv: str) -> tuple[int, str]:
    code = main(["blend", *argv])
    return code, capsys.readouterr().out


def test_blend_json_prints_the_documented_keys(demo):
    cmd = [sys.executable, "-m", "matchup_widgets", "blend", "--data", demo, "--batter", "b0003",
           "--pitcher", "p0001", "--json"]
    done = subprocess.run(cmd, capture_output=True, text=True, timeout=300, check=False)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.strip().splitlines()
    assert len(lines) == 1  # exactly one JSON object
    payload = json.loads(lines[0])
    assert DOCUMENTED_KEYS <= set(payload)
    assert list(payload["probabilities"]) == list(OUTCOMES)
    assert abs(sum(payload["probabilities"].values()) - 1) < 1e-12
    for code, (lo, hi) in payload["intervals"].items():
        assert lo <= payload["probabilities"][code] <= hi
    assert set(payload["pa"]) == {"batter", "pitcher"}
    assert payload["pa"]["batter"] > 0 and payload["pa"]["pitcher"] > 0
    assert payload["settings"]["method"] == "linear"


def test_blend_options_reach_the_model(demo, capsys):
    code, out = _run(
        capsys, "--data", demo, "--batter", "b0003", "--pitcher", "p0001", "--method", "two-stage",
        "--pitcher-weight", "0.3", "--batter-prior", "0", "--pitcher-prior", "50",
        "--seasons", "2025", "2026", "--batter-hand", "R", "--json",
    )
    assert code == 0
    payload = json.loads(out)
    s = payload["settings"]
    assert (s["method"], s["pitcher_weight"], s["batter_prior_pa"], s["pitcher_prior_pa"]) == (
        "two-stage", 0.3, 0.0, 50.0)
    assert s["seasons"] == [2025, 2026]
    assert payload["split"].startswith("R vs ")


def test_blend_by_name_and_readable_text(demo, capsys):
    code, out = _run(capsys, "--data", demo, "--batter", "Yarton Zolstovard", "--pitcher", "Tamlio Ubkahurst")
    assert code == 0
    assert "Yarton Zolstovard (b0003" in out and "80% interval" in out and "wOBA" in out


def test_ambiguous_and_unknown_names_fail_with_matches(demo, capsys):
    code, out = _run(capsys, "--data", demo, "--batter", "b0003", "--pitcher", "Tamlio", "--json")
    assert code == 2
    message = json.loads(out)["error"]
    assert "matches 2 players" in message and "p0001" in message
    code, out = _run(capsys, "--data", demo, "--batter", "Yarton Zolstovrd", "--pitcher", "p0001", "--json")
    assert code == 2
    assert "Closest names" in json.loads(out)["error"]


def test_bad_weight_is_refused_by_the_parser(demo):
    with pytest.raises(SystemExit):
        main(["blend", "--data", demo, "--batter", "b1", "--pitcher", "p1", "--pitcher-weight", "2"])
