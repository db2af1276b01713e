"""Explorer responsiveness: in-kernel time from a control's value change to all outputs updated.

Builds the matchup explorer on the demo league, then sets control values as the browser
would (50 changes cycling through pitcher weight, priors, blend method, base-out state,
platoon side and season range) and times each change until every chart and figure has
been updated. The goal is a median under 150 ms.
Baseline: the model's own ``predict`` for the same matchup, so the ratio shows what the
panel adds on top of the core. Picking another batter is timed apart (a new pair also
fetches its contact tiers from the core).
"""

from __future__ import annotations

import statistics
import time

GOAL_MS = 150.0
N_CHANGES = 50


def _changes(explorer, n: int):
    """(name, control, value) for n changes cycling through the model and context controls."""
    c = explorer.controls
    first, last = explorer.seasons_all
    cycle = [
        ("pitcher weight", "pitcher_weight", [0.3, 0.45, 0.6, 0.75, 0.5, 0.35, 0.65]),
        ("batter prior", "batter_prior", [100, 300, 500, 200]),
        ("pitcher weight", "pitcher_weight", [0.4, 0.55, 0.7]),
        ("pitcher prior", "pitcher_prior", [50, 250, 400, 200]),
        ("blend method", "method", ["odds-ratio", "two-stage", "linear"]),
        ("base-out state", "state", [1, 9, 23, 0, 12]),
        ("platoon side", "platoon", ["L", "R", "auto"]),
        ("season range", "seasons", [(max(first, last - 1), last), (first, last)]),
    ]
    for i in range(n):
        name, key, values = cycle[i % len(cycle)]
        yield name, c[key], values[(i // len(cycle)) % len(values)]


def main() -> None:
    from matchup_widgets.data.demo import demo_path
    from matchup_widgets.widgets import MatchupExplorer

    start = time.perf_counter()
    explorer = MatchupExplorer.from_path(demo_path())
    print(f"explorer built on the demo league in {(time.perf_counter() - start) * 1e3:.0f} ms")

    times: dict[str, list[float]] = {}
    allt: list[float] = []
    for name, control, value in _changes(explorer, N_CHANGES):
        if control.value == value:
            continue
        t0 = time.perf_counter()
        control.value = value  # observers run synchronously, as for a browser message
        dt = (time.perf_counter() - t0) * 1e3
        times.setdefault(name, []).append(dt)
        allt.append(dt)
        if explorer.status.last_error is not None:
            raise RuntimeError(f"update failed: {explorer.status.last_error}")

    # picking another batter: a new pair also fetches its contact tiers from the core
    picks = [v for _, v in explorer.controls["batter"].options[1:11]]
    pick_times = []
    for player_id in picks:
        t0 = time.perf_counter()
        explorer.controls["batter"].value = player_id
        pick_times.append((time.perf_counter() - t0) * 1e3)

    model, batter, pitcher, kw = explorer.current_query()
    base = []
    for _ in range(20):
        t0 = time.perf_counter()
        model.predict(batter, pitcher, **kw)
        base.append((time.perf_counter() - t0) * 1e3)

    med = statistics.median(allt)
    base_med = statistics.median(base)
    for name, ts in times.items():
        print(f"  {name:15s} n={len(ts):2d} median {statistics.median(ts):6.1f} ms  max {max(ts):6.1f} ms")
    print(f"value change -> all outputs updated: median {med:.1f} ms over {len(allt)} changes "
          f"(p90 {sorted(allt)[int(0.9 * (len(allt) - 1))]:.1f} ms)")
    print(f"baseline model.predict alone: median {base_med:.1f} ms; ratio explorer/predict {med / base_med:.1f}x")
    print(f"picking another batter (not in the median): median {statistics.median(pick_times):.1f} ms "
          f"over {len(pick_times)} picks, max {max(pick_times):.1f} ms")
    print(f"goal {GOAL_MS:.0f} ms: ratio median/goal {med / GOAL_MS:.2f} ({'met' if med < GOAL_MS else 'NOT met'})")


if __name__ == "__main__":
    main()
