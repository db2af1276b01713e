"""Contact layer speed on the demo league.

Goals (issue 5): fitting the contact model on the demo league under 20 s on this machine;
predicting one player's batted balls under 50 ms. Baselines named beside each figure: the
coarse bucket lookup for the fit, ball-by-ball prediction for the one-player prediction,
a cold fit for the per-dataset cache. Issue 7: switching to another batter-pitcher pair in
the tier view, against recomputing every player's tier shares on each switch (the path
before the per-dataset side tables).
"""

from __future__ import annotations

import statistics
import time
from pathlib import Path

import numpy as np

_DEMO = Path(__file__).resolve().parents[1] / "demo_data" / "plate_appearances.parquet"


def _timed(fn, repeat: int = 1) -> tuple[float, object]:
    times, out = [], None
    for _ in range(repeat):
        start = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times), out


def _demo():
    from matchup_widgets.data import load_pas

    if _DEMO.exists():
        return load_pas(_DEMO), str(_DEMO.relative_to(_DEMO.parents[1]))
    from matchup_widgets.data.demo import make_demo_league

    return load_pas(make_demo_league().pas), "make_demo_league() (default seed)"


def main() -> None:
    from matchup_widgets.contact import (
        ContactModel,
        clear_contact_cache,
        contact_model_for,
        contact_outcome_counts,
        contact_tiers,
    )
    from matchup_widgets.contact._frames import batted_rows, outcome_index
    from matchup_widgets.contact._model import _BucketLookup

    pas, source = _demo()
    frame = pas.frame
    batted = batted_rows(frame, purpose="benchmark")
    ok = batted["exit_velo"].notna() & batted["launch_angle"].notna()
    print(f"demo league: {source}: {len(frame):,} plate appearances, {len(batted):,} batted balls "
          f"({int((~ok).sum()):,} unmeasured)")

    ev, la = batted.loc[ok, "exit_velo"].to_numpy(), batted.loc[ok, "launch_angle"].to_numpy()
    y = outcome_index(batted.loc[ok, "outcome"].to_numpy())
    t_base, _ = _timed(lambda: _BucketLookup([80, 90, 95, 100, 105], [0, 10, 25, 35, 50]).fit(ev, la, y), 3)
    t_fit, model = _timed(lambda: ContactModel().fit(pas))
    print(f"fit ContactModel (both candidates + baseline, chose {model.kind_}): {t_fit:.2f} s "
          f"(goal < 20 s: {t_fit / 20:.2f} of the budget); baseline bucket-lookup fit {t_base * 1000:.1f} ms "
          f"(ratio {t_fit / t_base:.0f}x)")
    print("held-out log loss:", {k: round(v, 4) for k, v in model.scores_.items()})
    t_grid, _ = _timed(lambda: ContactModel(kind="grid").fit(pas))
    print(f"fit ContactModel(kind='grid') alone: {t_grid:.2f} s")

    counts = batted.loc[ok, "batter_id"].value_counts()
    player = counts.index[0]
    one = batted.loc[ok & (batted["batter_id"] == player)]
    pev, pla = one["exit_velo"].to_numpy(), one["launch_angle"].to_numpy()
    t_pred, _ = _timed(lambda: model.predict_proba(pev, pla), 21)
    n_loop = min(len(pev), 50)
    t_loop, _ = _timed(lambda: [model.predict_proba(pev[i:i + 1], pla[i:i + 1]) for i in range(n_loop)], 3)
    t_loop_all = t_loop * len(pev) / n_loop
    print(f"predict one batter's {len(pev)} balls: {t_pred * 1000:.1f} ms median of 21 "
          f"(goal < 50 ms: {t_pred / 0.05:.2f} of the budget); baseline ball by ball "
          f"~{t_loop_all * 1000:.0f} ms (ratio {t_loop_all / t_pred:.0f}x slower)")

    clear_contact_cache()
    t_cold, m = _timed(lambda: contact_model_for(pas))
    t_warm, m2 = _timed(lambda: contact_model_for(pas), 21)
    assert m is m2
    print(f"contact_model_for: cold {t_cold:.2f} s, cached {t_warm * 1e6:.0f} us (ratio {t_cold / t_warm:,.0f}x)")
    t_tiers_cold, _ = _timed(lambda: contact_tiers(pas))
    t_tiers_warm, _ = _timed(lambda: contact_tiers(pas), 21)
    print(f"contact_tiers (predict every ball + cut): cold {t_tiers_cold:.2f} s, cached {t_tiers_warm * 1e6:.0f} us")
    t_counts, out = _timed(lambda: contact_outcome_counts(pas, role="batter"), 3)
    print(f"contact_outcome_counts(role='batter') with the cached model: {t_counts * 1000:.0f} ms "
          f"for {len(out):,} player-split rows; {out.attrs['contact_basis']}")
    _player_switch(pas)
    print(f"(load average now {np.round(__import__('os').getloadavg(), 2).tolist()} on "
          f"{__import__('os').cpu_count()} cores)")


def _player_switch(pas) -> None:
    """Median time of a tier-view player switch: cached side tables vs recomputing tier shares."""
    from matchup_widgets.contact import (
        contact_cache_info,
        contact_model_for,
        contact_tiers,
        matchup_contact,
    )
    from matchup_widgets.contact._dataset import _tier_shares

    model = contact_model_for(pas, kind="grid")  # the explorer's contact model
    tiers = contact_tiers(pas, model=model)
    frame = pas.frame
    rr = frame[(frame["batter_hand"] == "R") & (frame["pitcher_hand"] == "R")]
    pairs = list(rr[["batter_id", "pitcher_id"]].drop_duplicates().head(21).itertuples(index=False, name=None))
    blend = {"pitcher_weight": 0.5, "batter_prior_pa": 200.0, "pitcher_prior_pa": 200.0}
    n_cols = [f"n_tier_{t}" for t in tiers.table.index]

    def before(batter, pitcher):
        # what each switch did before: every player's tier shares for both roles, then masks
        out = []
        for role, pid in (("batter", batter), ("pitcher", pitcher)):
            t = _tier_shares(pas, f"{role}_id", tiers, model, None)
            sel = (t["player_id"].astype(str) == pid) & (t["batter_hand"] == "R") & (t["pitcher_hand"] == "R")
            out.append(t.loc[sel, n_cols].to_numpy(float).sum(axis=0))
        return out

    def after(batter, pitcher):
        return matchup_contact(pas, batter_id=batter, pitcher_id=pitcher, batter_hand="R", pitcher_hand="R",
                               kind="tier", model=model, **blend)

    t_build = _timed(lambda: after(*pairs[0]))[0]  # the first pair of a session builds the side tables
    hits0 = contact_cache_info()["hits"].get("side_counts", 0)
    t_after = statistics.median(_timed(lambda p=p: after(*p))[0] for p in pairs[1:])
    hits = contact_cache_info()["hits"].get("side_counts", 0) - hits0
    t_before = statistics.median(_timed(lambda p=p: before(*p))[0] for p in pairs[1:11])
    # the baseline leaves out the blend and the output table, so the ratio understates the gain
    print(f"tier-view player switch (matchup_contact, {len(pairs) - 1} pairs): median {t_after * 1000:.1f} ms "
          f"with the per-dataset side tables ({hits} cache hits; first pair, building them, "
          f"{t_build * 1000:.0f} ms); baseline recomputing every player's tier shares per switch "
          f"{t_before * 1000:.1f} ms (ratio {t_before / t_after:.0f}x)")


if __name__ == "__main__":  # pragma: no cover
    main()
