"""Matchup model speed: a slider move (new settings, predict with intervals) on the demo league.

Baseline: re-aggregating the counts through the engine for every slider move (fit + predict),
which is what a dashboard would do without ``with_settings``. Goal: a slider move in a few ms.
"""

from __future__ import annotations

import time
from pathlib import Path

DEMO = Path(__file__).resolve().parents[1] / "demo_data" / "plate_appearances.parquet"


def _best(fn, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    from matchup_widgets.data import load_pas
    from matchup_widgets.model import MatchupModel

    if not DEMO.exists():
        print(f"demo league missing at {DEMO}; run `make demo` first")
        return
    pas = load_pas(DEMO)
    _ = pas.players
    start = time.perf_counter()
    model = MatchupModel().fit(pas)
    fit_s = time.perf_counter() - start
    batter, pitcher = "b0003", "p0001"
    model.predict(batter, pitcher)  # warm caches (run weights, prior suggestions)
    print(f"fit (engine aggregation of {model.n_pa_:,} PAs): {fit_s * 1000:8.1f} ms")
    for method in ("linear", "odds-ratio", "two-stage"):
        weights = iter([0.1 * i for i in range(1, 10)] * 10)

        def move(method=method, weights=weights):
            model.with_settings(method=method, pitcher_weight=next(weights)).predict(batter, pitcher)

        t = _best(move, 15)
        print(f"slider move, {method:<10} (with_settings + predict, 2000 draws): {t * 1000:7.2f} ms")
    season = _best(lambda: model.with_settings(seasons=(2025, 2026)).predict(batter, pitcher), 10)
    print(f"season range change (no re-aggregation):                  {season * 1000:7.2f} ms")
    refit = _best(lambda: MatchupModel(pitcher_weight=0.3).fit(pas).predict(batter, pitcher), 2)
    linear = _best(lambda: model.with_settings(pitcher_weight=0.3).predict(batter, pitcher), 15)
    print(f"baseline: refit + predict per move:                        {refit * 1000:7.1f} ms")
    print(f"ratio baseline / slider move (linear): {refit / linear:,.0f}x")
