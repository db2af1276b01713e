"""The ``fit`` command: one JSON object with the contract's keys, readable errors."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.cli import main
from matchup_widgets.data import OUTCOMES, load_pas

# Invented league line for simulation only.
_LEAGUE = np.array([0.22, 0.08, 0.01, 0.14, 0.045, 0.004, 0.03, 0.21, 0.261])


def _frame(seed: int, n_games: int = 300, per_game: int = 40, season: int = 2031) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    lg = _LEAGUE / _LEAGUE.sum()
    batters, pitchers = rng.dirichlet(40 * lg, 60), rng.dirichlet(40 * lg, 40)
    n = n_games * per_game
    ib, iq = rng.integers(0, 60, n), rng.integers(0, 40, n)
    p = 0.6 * batters[ib] + 0.4 * pitchers[iq]
    out = np.minimum((rng.random(n)[:, None] > p.cumsum(axis=1)).sum(axis=1), 8)
    game = np.repeat(np.arange(n_games), per_game)
    return pd.DataFrame(
        {
            "game_id": [f"s{season}g{g}" for g in game],
            "game_date": pd.Timestamp(f"{season}-04-01") + pd.to_timedelta(game % 150, unit="D"),
            "batter_id": [f"b{i}" for i in ib],
            "pitcher_id": [f"p{i}" for i in iq],
            "batter_name": [f"Batter {i}" for i in ib],
            "pitcher_name": [f"Pitcher {i}" for i in iq],
            "batter_hand": np.where(ib % 3 == 0, "L", "R"),
            "pitcher_hand": np.where(iq % 4 == 0, "L", "R"),
            "outcome": np.array(OUTCOMES)[out],
        }
    )


@pytest.fixture(scope="module")
def data_path(tmp_path_factory):
    path = tmp_path_factory.mktemp("fit") / "pas.parquet"
    pd.concat([_frame(0), _frame(0, season=2032)], ignore_index=True).to_parquet(path)
    return path


@pytest.fixture(scope="module")
def n_rows(data_path):
    """Rows kept at load (the invented table has no per-PA key, so repeated rows are kept)."""
    return load_pas(data_path).report.n_kept


def _run_json(capsys, *args) -> tuple[int, dict]:
    code = main(["fit", *map(str, args), "--json", "--quiet"])
    out = capsys.readouterr().out
    assert out.count("\n") == 1  # exactly one JSON object on one line
    return code, json.loads(out)


def test_fit_json_has_the_contract_keys(capsys, data_path, n_rows):
    code, d = _run_json(capsys, "--data", data_path, "--priors", "0,100", "--n-boot", "20")
    assert code == 0
    for key in ("pitcher_weight", "batter_prior_pa", "pitcher_prior_pa", "brier", "log_loss",
                "brier_baselines", "n_fit_pa", "n_holdout_pa", "surface"):
        assert key in d, key
    assert set(d["brier_baselines"]) == {"league", "batter_only", "pitcher_only", "even_blend"}
    assert len(d["surface"]) == 101 * 2 * 2
    assert set(d["surface"][0]) == {"pitcher_weight", "batter_prior_pa", "pitcher_prior_pa", "brier"}
    assert 0 <= d["pitcher_weight"] <= 1 and d["batter_prior_pa"] in (0, 100)
    assert d["n_fit_pa"] + d["n_holdout_pa"] == n_rows
    assert d["split"] == "games"


def test_fit_season_forward_and_method_filter(capsys, data_path, n_rows):
    code, d = _run_json(capsys, "--data", data_path, "--season-forward", "--priors", "50",
                        "--n-boot", "10", "--method", "linear", "--method", "two-stage")
    assert code == 0
    assert d["split"] == "season-forward" and d["n_holdout_pa"] == n_rows // 2
    assert [m["method"] for m in d["methods"]] == ["linear", "two-stage"]


def test_fit_scores_a_separate_table(capsys, data_path, n_rows, tmp_path):
    other = tmp_path / "other.csv"
    _frame(1, n_games=50, season=2033).to_csv(other, index=False)
    code, d = _run_json(capsys, "--data", data_path, "--score", other, "--priors", "0,50", "--n-boot", "10")
    assert code == 0
    assert (d["n_fit_pa"], d["n_holdout_pa"], d["split"]) == (n_rows, load_pas(other).report.n_kept, "separate")


def test_fit_reports_unusable_input_as_json_error(capsys, tmp_path):
    code, d = _run_json(capsys, "--data", tmp_path / "missing.parquet")
    assert code == 2
    assert "does not exist" in d["error"]


@pytest.mark.parametrize("n_boot", ["0", "-3", "many"])
def test_fit_refuses_a_bootstrap_without_replicates(capsys, data_path, n_boot):
    # zero or negative replicates used to crash inside numpy's quantile with a traceback
    with pytest.raises(SystemExit):
        main(["fit", "--data", str(data_path), "--n-boot", n_boot, "--json"])
    assert "--n-boot takes a whole number of bootstrap replicates >= 1" in capsys.readouterr().err


def test_fit_text_output_is_readable(capsys, data_path):
    assert main(["fit", "--data", str(data_path), "--priors", "0", "--n-boot", "10", "--quiet"]) == 0
    out = capsys.readouterr().out
    assert "Pitcher weight" in out and "Baselines" in out and "league" in out
