"""Analyst panels: how long a click or a control change takes, on the demo league.

- Lineup swap: a swap predicts the new batter and solves the exact lineup chain for both
  orders (estimates of batters already seen are kept). Baseline: the
  runs layer's Monte Carlo (``simulate_games``) with enough games for a standard error of
  0.02 runs per 9 on the same order. Goal: under 0.5 s and at least 5x faster.
- Option ranking: five candidates ranked by run value per PA with intervals (and from a
  base-out state). Goal: under 1 s per re-rank.
- Calibration click: the fit the calibration panel runs (default grid, observed basis).
  Goal: under 15 s on two shared cores.
- Card: the matchup card rendered as SVG and PNG with vl-convert. Goal: under 5 s each.
"""

from __future__ import annotations

import time

import numpy as np


def _best_of(fn, repeat: int = 3) -> float:
    best = float("inf")
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - start)
    return best


def main() -> None:
    from matchup_widgets.data import load_pas
    from matchup_widgets.data.demo import demo_path
    from matchup_widgets.export import matchup_card, render_card
    from matchup_widgets.model import MatchupModel
    from matchup_widgets.runs import simulate_games
    from matchup_widgets.widgets import CalibrationLab, LineupPanel, OptionRanking

    pas = load_pas(demo_path())
    model = MatchupModel().fit(pas)

    lineup = LineupPanel(pas, model=model)
    slots = iter(range(10**6))

    def swap() -> None:
        lineup.swap_slot.value = next(slots) % 9

    t_swap = _best_of(swap)
    probs = np.vstack([e.probabilities.to_numpy() for e in lineup.result["current"]["estimates"]])
    sims = simulate_games(probs, n_games=2000, seed=0).sum(axis=1)
    n_games = int(np.ceil((sims.std() / 0.02) ** 2))
    start = time.perf_counter()
    simulate_games(probs, n_games=n_games, seed=1)
    t_mc = time.perf_counter() - start
    print(f"lineup swap (kept estimates + exact chain, both orders): {t_swap * 1000:.0f} ms")
    print(f"  baseline Monte Carlo, {n_games:,} games for s.e. 0.02 runs/9: {t_mc * 1000:.0f} ms "
          f"-> {t_mc / t_swap:.1f}x faster (goal >= 5x, < 500 ms)")

    ranking = OptionRanking(pas, model=model)
    batters = pas.players.query("role == 'batter'").sort_values("pa", ascending=False)["player_id"].tolist()[:5]

    def rerank() -> None:
        ranking.set_candidates(batters)
        ranking.rank()

    t_rank = _best_of(rerank)
    ranking.state.value = 1 * 8 + 3  # state index 8 * outs + bases
    t_state = _best_of(ranking.rank)
    print(f"option ranking, 5 candidates, runs per PA: {t_rank * 1000:.0f} ms; "
          f"expected runs from 1 out, first and second: {t_state * 1000:.0f} ms (goal < 1000 ms)")

    lab = CalibrationLab(pas, progress=False)
    start = time.perf_counter()
    lab.fit()
    print(f"calibration click (default grid, observed basis): {time.perf_counter() - start:.1f} s (goal < 15 s)")

    est = model.predict(batters[0], ranking.pickers["pitcher"].value)
    chart, tables = matchup_card(est)
    for fmt in ("svg", "png"):
        start = time.perf_counter()
        render_card(chart, fmt, tables=tables)
        print(f"card as {fmt.upper()}: {time.perf_counter() - start:.2f} s (goal < 5 s)")
