"""The blend command on the invented demo league: documented JSON keys, names, errors."""

from __future__ import annotations

import json
import subprocess
import sys

import pandas as pd
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


def _side(player: str, other: str, role: str, counts: dict[str, int]) -> pd.DataFrame:
    """100 plate appearances of ``player`` (in ``role``) against ``other``, with these outcome counts."""
    outcomes = [code for code, n in counts.items() for _ in range(n)]
    n = len(outcomes)
    batter, pitcher = (player, other) if role == "batter" else (other, player)
    return pd.DataFrame({
        "game_id": [f"{player}-g{i // 4}" for i in range(n)], "game_date": ["2031-05-01"] * n,
        "batter_id": [batter] * n, "pitcher_id": [pitcher] * n,
        "batter_name": [f"Name {batter}"] * n, "pitcher_name": [f"Name {pitcher}"] * n,
        "batter_hand": ["R"] * n, "pitcher_hand": ["R"] * n, "outcome": outcomes,
    })


def test_raw_linear_blend_gives_the_worked_example(tmp_path, capsys):
    # Linear blend at w = 0.5 of a batter with singles 11% and strikeouts 16% and a pitcher
    # with singles 6% and strikeouts 32%: singles 8.5%, strikeouts 24% (common practice figures).
    # The table has only the contract's required columns, so its many identical rows are
    # real plate appearances and must all count.
    table = pd.concat([
        _side("b1", "p9", "batter", {"1B": 11, "K": 16, "GB_OUT": 73}),
        _side("p1", "b9", "pitcher", {"1B": 6, "K": 32, "GB_OUT": 62}),
    ])
    path = tmp_path / "pas.csv"
    table.to_csv(path, index=False)
    code, out = _run(capsys, "--data", str(path), "--batter", "b1", "--pitcher", "p1", "--batter-prior", "0",
                     "--pitcher-prior", "0", "--pitcher-weight", "0.5", "--json")
    assert code == 0
    d = json.loads(out)
    assert d["pa"] == {"batter": 100, "pitcher": 100}
    assert d["probabilities"]["1B"] == pytest.approx(0.085, abs=1e-12)
    assert d["probabilities"]["K"] == pytest.approx(0.24, abs=1e-12)


def test_bad_weight_is_refused_by_the_parser(demo):
    with pytest.raises(SystemExit):
        main(["blend", "--data", demo, "--batter", "b1", "--pitcher", "p1", "--pitcher-weight", "2"])
