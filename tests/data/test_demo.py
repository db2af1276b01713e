"""The invented demo league: rates, the runs identity, the oracle, determinism, names, command.

Rate checks read the committed files under demo_data/ (generated once, not here). The
league is invented: its numbers are checked against the stated target ranges of the
modern game (common practice), never used as check values for a statistic.
"""

from __future__ import annotations

import io
import json
import re
from contextlib import redirect_stdout
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import (
    BATTED,
    IN_PLAY,
    OUTCOMES,
    DataError,
    demo_path,
    make_demo_league,
    true_probabilities,
    write_demo_league,
)
from matchup_widgets.data import demo as demo_module
from matchup_widgets.data._demo_truth import (
    EV_SD,
    LA_SD,
    LEAGUE_STAGE1,
    PLATOON_STAGE1,
    expected_batted,
    stage1_probabilities,
)

DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_data"

CONTRACT_COLUMNS = [
    "game_id", "game_date", "season", "batter_id", "pitcher_id", "batter_name", "pitcher_name",
    "batter_hand", "pitcher_hand", "outcome", "exit_velo", "launch_angle", "inning",
    "outs_before", "bases_before", "outs_after", "bases_after", "runs_on_play",
]  # fmt: skip


@pytest.fixture(scope="module")
def pas() -> pd.DataFrame:
    return pd.read_parquet(DEMO_DIR / "plate_appearances.parquet")


@pytest.fixture(scope="module")
def players() -> pd.DataFrame:
    return pd.read_parquet(DEMO_DIR / "players.parquet")


@pytest.fixture(scope="module")
def oracle(pas, players) -> np.ndarray:
    return true_probabilities(pas, players)


def _runners(bases: pd.Series) -> np.ndarray:
    b = bases.to_numpy()
    return (b & 1 > 0).astype(int) + (b & 2 > 0) + (b & 4 > 0)


# --------------------------------------------------------------------------- rates


def test_league_rates_are_in_the_target_ranges(pas):
    n = len(pas)
    share = pas["outcome"].value_counts() / n
    in_play = pas["outcome"].isin(IN_PLAY)
    babip = pas["outcome"].isin(("1B", "2B", "3B")).sum() / in_play.sum()
    runs = pas.groupby("game_id")["runs_on_play"].sum().mean() / 2
    rates = {
        "PA": n,
        "K%": share["K"],
        "BB%": share["BB"],
        "HBP%": share["HBP"],
        "HR%": share["HR"],
        "BABIP": babip,
        "runs per team-game": runs,
    }
    print("\nDemo league rates:", "  ".join(f"{k} {v:.4f}" if isinstance(v, float) else f"{k} {v:,}" for k, v in rates.items()))
    assert 300_000 <= n <= 550_000  # league size asked for (~300-550k PAs)
    # Targets: the recent major-league run environment (common practice, from memory).
    assert 0.21 <= share["K"] <= 0.23  # strikeouts ~22% of PA
    assert 0.08 <= share["BB"] <= 0.09  # walks ~8-9% of PA
    assert 0.007 <= share["HBP"] <= 0.014  # hit by pitch ~1% of PA
    assert 0.027 <= share["HR"] <= 0.033  # home runs ~3% of PA
    # BABIP here is hits in play over balls in play (sacrifice flies count as air outs).
    assert 0.290 <= babip <= 0.300  # batting average on balls in play ~.290-.300
    assert 4.4 <= runs <= 4.7  # ~4.4-4.7 runs per team-game


def test_platoon_and_contact_shape(pas):
    # Same-hand matchups favour the pitcher (common practice): more strikeouts, fewer walks.
    same = pas["batter_hand"] == pas["pitcher_hand"]
    k = pas["outcome"] == "K"
    bb = pas["outcome"] == "BB"
    assert k[same].mean() > k[~same].mean()
    assert bb[same].mean() < bb[~same].mean()
    # Hard-hit balls (95 mph and up) are hits far more often (common practice).
    batted = pas[pas["exit_velo"].notna()]
    hit = batted["outcome"].isin(("1B", "2B", "3B", "HR"))
    hard = batted["exit_velo"] >= 95
    print(f"\nhit rate of batted balls: hard-hit {hit[hard].mean():.3f}, others {hit[~hard].mean():.3f}")
    assert hit[hard].mean() > 2 * hit[~hard].mean()
    # Ground balls (below 10 degrees) rarely leave the park.
    ground = batted["launch_angle"] < 10
    assert (batted.loc[ground, "outcome"] == "HR").mean() < 0.002


# --------------------------------------------------------------------------- contract


def test_columns_types_and_ranges(pas):
    assert set(CONTRACT_COLUMNS) <= set(pas.columns)
    assert pas["exit_velo"].dtype == np.float32 and pas["launch_angle"].dtype == np.float32
    assert set(pas["outcome"].unique()) == set(OUTCOMES)
    assert set(pas["batter_hand"].unique()) == {"L", "R"} and set(pas["pitcher_hand"].unique()) == {"L", "R"}
    assert pas["outs_before"].between(0, 2).all() and pas["outs_after"].between(0, 3).all()
    assert pas["bases_before"].between(0, 7).all() and pas["bases_after"].between(0, 7).all()
    assert (pas["outs_after"] >= pas["outs_before"]).all()
    assert (pas["season"] == pd.to_datetime(pas["game_date"]).dt.year).all()
    # Tracking values only on batted balls; about 2% of those missing, as with real gaps.
    batted = pas["outcome"].isin(BATTED)
    assert pas.loc[~batted, "exit_velo"].isna().all() and pas.loc[~batted, "launch_angle"].isna().all()
    gap = pas.loc[batted, "exit_velo"].isna()
    assert (gap == pas.loc[batted, "launch_angle"].isna()).all()
    assert 0.01 <= gap.mean() <= 0.03
    assert pas["exit_velo"].dropna().between(0, 130).all()
    assert pas["launch_angle"].dropna().between(-90, 90).all()


def test_runs_scored_identity_holds_on_every_row(pas):
    # runs = (runners_before + outs_before + 1) - (runners_after + outs_after) (common practice)
    expect = _runners(pas["bases_before"]) + pas["outs_before"] + 1 - _runners(pas["bases_after"]) - pas["outs_after"]
    bad = pas["runs_on_play"].to_numpy() != expect.to_numpy()
    assert not bad.any(), pas.loc[bad].head()


def test_rows_are_sorted_by_game_then_order_and_innings_chain(pas):
    game = pas["game_id"].to_numpy()
    assert (game[1:] >= game[:-1]).all()
    same = game[1:] == game[:-1]
    inning, half = pas["inning"].to_numpy(), (pas["half"] == "bottom").to_numpy()
    step = inning * 2 + half
    assert (step[1:][same] >= step[:-1][same]).all()
    # Within a half inning, the state after one PA is the state before the next.
    cont = same & (step[1:] == step[:-1])
    assert (pas["outs_before"].to_numpy()[1:][cont] == pas["outs_after"].to_numpy()[:-1][cont]).all()
    assert (pas["bases_before"].to_numpy()[1:][cont] == pas["bases_after"].to_numpy()[:-1][cont]).all()
    # A half inning starts empty with none out.
    start = np.r_[True, ~cont]
    assert (pas["outs_before"].to_numpy()[start] == 0).all() and (pas["bases_before"].to_numpy()[start] == 0).all()


def test_games_are_decided_like_games(pas):
    runs = pas.pivot_table(index="game_id", columns="half", values="runs_on_play", aggfunc="sum")
    last = pas.groupby("game_id").agg(inning=("inning", "max"), half=("half", "last"))
    assert (last["inning"] >= 9).all()
    assert (runs["bottom"] != runs["top"]).all()  # no ties
    # The bottom of the last inning is skipped only when the home team leads.
    skipped = last["half"] == "top"
    assert (runs.loc[skipped, "bottom"] > runs.loc[skipped, "top"]).all()
    # Nine batters, once each, in slots 1-9 for every team in every game.
    slots = pas.groupby(["game_id", "team_batting", "lineup_slot"])["batter_id"].nunique()
    assert (slots == 1).all()
    assert (pas.groupby(["game_id", "team_batting"])["lineup_slot"].nunique() == 9).all()
    # Starters face about 22-27 batters, then relievers come in.
    first = pas.groupby(["game_id", "team_fielding"])["pitcher_id"].transform("first")
    faced = pas[pas["pitcher_id"] == first].groupby(["game_id", "team_fielding"]).size()
    print(f"\nstarter batters faced: mean {faced.mean():.1f}")
    assert 22 <= faced.mean() <= 27


# --------------------------------------------------------------------------- players and names


def test_names_ids_hands_and_the_namesake_pair(pas, players):
    assert players["player_id"].is_unique
    assert players["player_id"].str.fullmatch(r"[bp]\d{4}").all()
    dup = players[players["name"].duplicated(keep=False)]
    assert len(dup) == 2 and dup["player_id"].nunique() == 2  # the one deliberate namesake pair
    assert (dup["role"] == "batter").all()
    assert dup["team_id"].nunique() == 2
    # Both namesakes bat in the league, under one name and two ids.
    used = pas[pas["batter_id"].isin(dup["player_id"])]
    assert used["batter_id"].nunique() == 2 and used["batter_name"].nunique() == 1
    # Names are two invented words; display names in the PAs agree with the players table.
    assert players["name"].str.fullmatch(r"[A-Z][a-z]+ [A-Z][a-z]+").all()
    names = players.set_index("player_id")["name"]
    assert (pas["batter_name"].to_numpy() == names.loc[pas["batter_id"]].to_numpy()).all()
    # Switch hitters exist and always bat from the side opposite the pitcher.
    switch = players.loc[players["hand"] == "S", "player_id"]
    rows = pas[pas["batter_id"].isin(switch)]
    assert len(switch) > 0 and len(rows) > 0
    assert (rows["batter_hand"] != rows["pitcher_hand"]).all()
    assert set(players["role"]) == {"batter", "starter", "reliever"}
    talents = players[["talent_k", "talent_bb", "talent_hbp", "talent_bat"]].to_numpy()
    assert_allclose(talents.sum(axis=1), 1.0, rtol=1e-12)


def test_true_talent_spread_is_realistic(players):
    batters = players[players["role"] == "batter"]
    sd_k = batters["talent_k"].std()
    print(f"\ntrue-talent K% sd among batters: {sd_k:.3f}")
    assert 0.035 <= sd_k <= 0.065  # ~5 points (common practice, from memory)


# --------------------------------------------------------------------------- the oracle


def test_stage_one_is_the_odds_ratio_rule():
    rng = np.random.default_rng(0)
    b = rng.dirichlet(np.full(4, 20.0), 50)
    q = rng.dirichlet(np.full(4, 20.0), 50)
    bh, ph = rng.integers(0, 2, 50), rng.integers(0, 2, 50)
    p = stage1_probabilities(b, q, bh, ph)
    assert_allclose(p.sum(axis=1), 1.0, rtol=1e-12)
    # Odds between any two classes multiply: p_i / p_j = (b_i q_i m_i / l_i) / (b_j q_j m_j / l_j).
    m = PLATOON_STAGE1[bh, ph]
    ratio = (b * q * m / LEAGUE_STAGE1)[:, :3] / (b * q * m / LEAGUE_STAGE1)[:, 3:]
    assert_allclose(p[:, :3] / p[:, 3:], ratio, rtol=1e-12)
    # A league-average batter leaves the pitcher's own rates, moved only by the platoon split.
    avg = np.broadcast_to(LEAGUE_STAGE1, q.shape)
    expect = q * m / (q * m).sum(axis=1, keepdims=True)
    assert_allclose(stage1_probabilities(avg, q, bh, ph), expect, rtol=1e-12)


def test_batted_ball_expectation_matches_monte_carlo_and_converges():
    mu_ev, mu_la = np.array([88.0, 96.0, 80.0]), np.array([11.0, 22.0, -4.0])
    quad = expected_batted(mu_ev, mu_la)
    assert_allclose(quad.sum(axis=1), 1.0, rtol=1e-12)
    # More nodes change nothing that matters: the quadrature has converged.
    assert_allclose(expected_batted(mu_ev, mu_la, n_nodes=320), quad, atol=1e-4)
    # Monte Carlo reference: the mean of f over normal draws, within 5 standard errors.
    rng = np.random.default_rng(1)
    n = 400_000
    for k in range(len(mu_ev)):
        draws = demo_module.batted_ball_probabilities(
            mu_ev[k] + EV_SD * rng.standard_normal(n), mu_la[k] + LA_SD * rng.standard_normal(n)
        )
        se = draws.std(axis=0) / np.sqrt(n)
        assert (np.abs(draws.mean(axis=0) - quad[k]) <= 5 * se + 1e-6).all()


def test_batted_ball_function_has_the_stated_shape():
    f = demo_module.batted_ball_probabilities
    hr = OUTCOMES[3:].index("HR")
    assert f(110.0, 28.0)[hr] > 0.8  # crushed at a home-run angle
    assert f(110.0, 0.0)[hr] < 0.005  # hard ground ball
    assert f(85.0, 28.0)[hr] < 0.01  # soft fly ball
    assert f(90.0, 65.0)[[0, 1, 2, 3]].sum() < 0.03  # pop ups are outs
    assert f(105.0, 15.0)[:4].sum() > f(75.0, 15.0)[:4].sum() + 0.2  # hard-hit line drives
    grid = f(np.linspace(40, 125, 30)[:, None], np.linspace(-60, 80, 30)[None, :])
    assert grid.shape == (30, 30, 6) and (grid >= 0).all()
    assert_allclose(grid.sum(axis=-1), 1.0, rtol=1e-12)


def test_oracle_rows_sum_to_one_and_agree_with_outcomes(pas, oracle):
    assert oracle.shape == (len(pas), len(OUTCOMES))
    assert (oracle >= 0).all()
    assert_allclose(oracle.sum(axis=1), 1.0, rtol=1e-12)
    y = np.eye(len(OUTCOMES))[pas["outcome"].map({c: i for i, c in enumerate(OUTCOMES)}).to_numpy()]
    # Calibration smoke check: in deciles of the oracle's probability, the observed share
    # agrees with the mean oracle probability within sampling error.
    worst = {}
    for j, code in enumerate(OUTCOMES):
        edges = np.quantile(oracle[:, j], np.linspace(0, 1, 11)[1:-1])
        b = np.searchsorted(edges, oracle[:, j], side="right")
        n = np.bincount(b, minlength=10)
        pred = np.bincount(b, oracle[:, j], minlength=10) / n
        seen = np.bincount(b, y[:, j], minlength=10) / n
        z = (seen - pred) / np.sqrt(pred * (1 - pred) / n)
        worst[code] = float(np.abs(z).max())
    print("\nlargest |z| over oracle deciles:", {k: round(v, 2) for k, v in worst.items()})
    assert max(worst.values()) < 4.5
    # The oracle beats the constant league-rate forecast on Brier score.
    brier_oracle = ((oracle - y) ** 2).sum(axis=1).mean()
    brier_league = ((y.mean(axis=0) - y) ** 2).sum(axis=1).mean()
    print(f"Brier score: oracle {brier_oracle:.4f}, league rates {brier_league:.4f}")
    assert brier_oracle < brier_league


def test_oracle_rejects_unknown_players(pas, players):
    with pytest.raises(DataError, match=r"column 'pitcher_id' has 1 row\(s\) whose id is not among the players"):
        true_probabilities(pas.head(3).assign(pitcher_id=["p0001", "p0001", "zz9"]), players)
    with pytest.raises(DataError, match="needs columns"):
        true_probabilities(pas[["batter_id"]], players)
    # a hand outside L/R used to fail as a numpy IndexError
    with pytest.raises(DataError, match=r"column 'batter_hand' is not L or R in 1 row\(s\) \(e.g. 'S'\)"):
        true_probabilities(pas.head(3).assign(batter_hand=["L", "S", "R"]), players)


# --------------------------------------------------------------------------- generation


def test_same_seed_same_league_and_bytes(tmp_path):
    kw = dict(n_seasons=1, n_teams=4, n_games=20)
    a = make_demo_league(seed=11, **kw)
    b = make_demo_league(seed=11, **kw)
    pd.testing.assert_frame_equal(a.pas, b.pas)
    pd.testing.assert_frame_equal(a.players, b.players)
    c = make_demo_league(seed=12, **kw)
    assert not a.pas["outcome"].equals(c.pas["outcome"])
    assert a.pas["game_id"].nunique() == 4 * 20 // 2
    first = write_demo_league(tmp_path / "one", seed=11, **kw)
    second = write_demo_league(tmp_path / "two", seed=11, **kw)
    for x, y in zip(first, second):
        assert x.read_bytes() == y.read_bytes()
    # The file holds the same rows as the frame.
    back = pd.read_parquet(first[0])
    assert list(back.columns) == list(a.pas.columns)
    assert (back["outcome"].to_numpy() == a.pas["outcome"].to_numpy()).all()


def test_a_tiny_league_keeps_the_runs_identity():
    league = make_demo_league(seed=3, n_seasons=1, n_teams=2, n_games=6)
    pas = league.pas
    expect = _runners(pas["bases_before"]) + pas["outs_before"] + 1 - _runners(pas["bases_after"]) - pas["outs_after"]
    assert (pas["runs_on_play"].to_numpy() == expect.to_numpy()).all()


@pytest.mark.parametrize(
    ("kw", "match"),
    [
        ({"n_teams": 3}, "n_teams must be an even number of at least 2, got 3"),
        ({"n_games": 0}, "n_games must be at least 1, got 0"),
    ],
)
def test_bad_league_sizes_are_refused(kw, match):
    with pytest.raises(ValueError, match=match):
        make_demo_league(**kw)


def test_command_writes_the_files(tmp_path):
    from matchup_widgets.cli import main

    out = tmp_path / "league"
    buf = io.StringIO()
    with redirect_stdout(buf):
        code = main(["demo-data", "--out", str(out), "--seed", "5", "--teams", "2", "--seasons", "1", "--games", "3", "--json"])
    assert code == 0
    lines = buf.getvalue().splitlines()
    assert len(lines) == 1
    payload = json.loads(lines[0])
    assert set(payload) == {"out", "files", "n_pa", "seed"}
    assert payload["seed"] == 5 and Path(payload["out"]) == out
    assert [Path(f).name for f in payload["files"]] == list(demo_module.DEMO_FILES)
    assert all(Path(f).is_file() for f in payload["files"])
    assert payload["n_pa"] == len(pd.read_parquet(out / "plate_appearances.parquet"))


def test_command_reports_a_bad_size_as_json(tmp_path):
    from matchup_widgets.cli import main

    buf = io.StringIO()
    with redirect_stdout(buf):
        code = main(["demo-data", "--out", str(tmp_path), "--teams", "3", "--json"])
    assert code == 2
    assert re.search("n_teams must be an even number", json.loads(buf.getvalue())["error"])


def test_demo_path_points_at_the_committed_file():
    path = demo_path()
    assert path == DEMO_DIR / "plate_appearances.parquet" and path.is_file()


def test_demo_path_generates_into_the_cache_when_no_committed_file(tmp_path, monkeypatch):
    monkeypatch.setattr(demo_module, "_COMMITTED_DIR", tmp_path / "absent")
    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path / "cache"))
    calls = []

    def tiny(out_dir, *, seed):
        calls.append(seed)
        return write_demo_league(out_dir, seed=seed, n_seasons=1, n_teams=2, n_games=1)

    monkeypatch.setattr(demo_module, "write_demo_league", tiny)
    path = demo_path()
    assert path == tmp_path / "cache" / "matchup-widgets" / "demo-2026" / "plate_appearances.parquet"
    assert path.is_file() and calls == [2026]
    assert demo_path() == path and calls == [2026]  # generated once, then reused
