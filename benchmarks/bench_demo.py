"""Demo league generation and its oracle.

Goal: the full league (20 teams, 3 seasons, ~375k PAs) in seconds, not minutes.

- Generation. Baseline: the same game engine run one game at a time (lanes of width one,
  as a per-game Python loop would), timed on 60 games and scaled per plate appearance.
- Oracle (:func:`true_probabilities`). Baseline: a direct two-dimensional Gauss-Hermite
  tensor product (40 x 32 nodes) of ``f`` over exit velocity and launch angle, on a sample
  of rows and scaled per row.
"""

from __future__ import annotations

import time

import numpy as np


def main() -> None:
    import pandas as pd

    from matchup_widgets.data import demo as d
    from matchup_widgets.data._demo_sim import make_players, make_schedule, plan_games, play_games
    from matchup_widgets.data._demo_truth import EV_SD, LA_SD, _hermite_nodes, contact_means

    t0 = time.perf_counter()
    league = d.make_demo_league()
    t_gen = time.perf_counter() - t0
    n_pa = len(league.pas)
    print(f"make_demo_league (20 teams, 3 seasons): {t_gen:.2f} s for {n_pa:,} PAs ({t_gen / n_pa * 1e6:.2f} us/PA)")

    rngs = [np.random.default_rng(s) for s in np.random.SeedSequence(2026).spawn(4)]
    players, _ = make_players(20, rngs[0])
    sched = make_schedule(20, 1, 162)
    lineup, staff, leash = plan_games(sched, players, 20, rngs[1])
    n_one, pas_one = 60, 0
    t0 = time.perf_counter()
    for g in range(n_one):
        cols = play_games(lineup[g : g + 1], staff[g : g + 1], leash[g : g + 1], players, rngs[2])
        pas_one += len(cols["outcome"])
    t_one = (time.perf_counter() - t0) / pas_one
    print(
        f"baseline, one game at a time: {t_one * 1e6:.1f} us/PA -> {t_one * n_pa:.1f} s for the league; "
        f"lanes are {t_one / (t_gen / n_pa):.0f}x faster per PA"
    )

    pas = pd.read_parquet(d.demo_path())
    players_file = pd.read_parquet(d.demo_path().with_name("players.parquet"))
    t0 = time.perf_counter()
    d.true_probabilities(pas, players_file)
    t_orc = time.perf_counter() - t0
    print(f"true_probabilities on the committed file: {t_orc:.2f} s for {len(pas):,} rows ({t_orc / len(pas) * 1e6:.1f} us/row)")

    # Baseline: direct 2-D tensor-product quadrature of f on 3,000 rows.
    talents = players_file.set_index("player_id")
    sample = pas.sample(3000, random_state=0)
    b = talents.loc[sample["batter_id"]]
    q = talents.loc[sample["pitcher_id"]]
    hand = {"L": 0, "R": 1}
    bh = sample["batter_hand"].map(hand).to_numpy()
    ph = sample["pitcher_hand"].map(hand).to_numpy()
    mu_ev, mu_la = contact_means(
        b["talent_ev"].to_numpy(), q["talent_ev"].to_numpy(), b["talent_la"].to_numpy(), q["talent_la"].to_numpy(), bh, ph
    )
    x_ev, w_ev = _hermite_nodes(40)
    x_la, w_la = _hermite_nodes(32)
    wts = np.outer(w_ev, w_la).ravel()
    t0 = time.perf_counter()
    for start in range(0, len(sample), 500):
        ev = mu_ev[start : start + 500, None] + np.repeat(EV_SD * x_ev, 32)
        la = mu_la[start : start + 500, None] + np.tile(LA_SD * x_la, 40)
        np.einsum("knj,n->kj", d.batted_ball_probabilities(ev, la), wts)
    t_base = (time.perf_counter() - t0) / len(sample)
    print(
        f"baseline, 2-D Gauss-Hermite 40x32 per row: {t_base * 1e6:.1f} us/row -> {t_base * len(pas):.0f} s for the file; "
        f"factorised oracle is {t_base / (t_orc / len(pas)):.0f}x faster"
    )
