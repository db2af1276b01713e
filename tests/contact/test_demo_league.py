"""The contact layer on the invented demo league: the figures the issue asks to show.

Run with ``-s`` to see the printed figures. The demo league is invented: its numbers are
shown, never used as check values; the checks are facts of the trade (marked common
practice) and comparisons between our own models.
"""

from __future__ import annotations

import numpy as np
import pytest

from matchup_widgets.contact import (
    BATTED_BALL_TYPE_CUTS,
    HARD_HIT_MPH,
    contact_model_for,
    contact_outcome_counts,
    contact_predictions,
    contact_tiers,
    is_hard_hit,
)
from matchup_widgets.contact._dataset import prob_matrix
from matchup_widgets.data import BATTED, HITS, load_pas

_HIT_COLS = [BATTED.index(c) for c in HITS]
_HR = BATTED.index("HR")


@pytest.fixture(scope="module")
def demo_pas():
    from matchup_widgets.data.demo import make_demo_league

    return load_pas(make_demo_league(seed=2026, n_seasons=1).pas)


@pytest.fixture(scope="module")
def demo_model(demo_pas):
    return contact_model_for(demo_pas)


def test_contact_model_beats_the_bucket_baseline(demo_model):
    s = demo_model.scores_
    print(
        f"\nheld-out log loss on the demo league ({demo_model.n_fit_} fit / {demo_model.n_holdout_} held-out "
        f"balls, {demo_model.n_unmeasured_} unmeasured): boosting {s['boosting']:.4f}, smoothed grid "
        f"{s['grid']:.4f}, bucket-lookup baseline {s['bucket_baseline']:.4f}; chosen: {demo_model.kind_}"
    )
    assert s[demo_model.kind_] < s["bucket_baseline"]
    # Whether the choice holds on games not used to make it: test_held_out.py.


def test_home_run_chance_rises_with_exit_velocity_at_25_to_30_degrees(demo_model):
    # common practice: at launch angles of 25-30 degrees, harder contact leaves the park more
    ev = np.arange(90.0, 112.0, 2.0)
    p_hr = np.mean([demo_model.predict_proba(ev, np.full_like(ev, la))[:, _HR] for la in (25.0, 27.5, 30.0)], axis=0)
    print("\nP(HR) at 25-30 degrees by exit velocity:", dict(zip(ev.tolist(), p_hr.round(3).tolist())))
    assert p_hr[-1] > p_hr[0] + 0.2
    assert np.corrcoef(ev, p_hr)[0, 1] > 0.9
    assert np.all(np.diff(p_hr) > -0.02)  # no real dip along the way


def test_ground_balls_almost_never_leave_the_park(demo_pas, demo_model):
    # common practice: balls hit below 10 degrees are almost never home runs
    pred = contact_predictions(demo_pas, model=demo_model)
    low = (pred["launch_angle"] < BATTED_BALL_TYPE_CUTS[0]).to_numpy()
    modeled = float(np.nanmean(prob_matrix(pred)[low, _HR]))
    observed = float((pred.loc[low, "outcome"] == "HR").mean())
    print(f"\nbelow 10 degrees: modeled P(HR) {modeled:.5f}, observed HR share {observed:.5f}")
    assert modeled < 0.005 and observed < 0.005


def test_hard_hit_balls_fall_for_hits_far_more_often(demo_pas, demo_model):
    # common practice: hard-hit balls (>= 95 mph) carry a far higher hit rate than the rest
    pred = contact_predictions(demo_pas, model=demo_model)
    measured = pred["measured"].to_numpy()
    hard = is_hard_hit(pred["exit_velo"]) & measured
    soft = measured & ~hard
    p_hit = prob_matrix(pred)[:, _HIT_COLS].sum(axis=1)
    is_hit = pred["outcome"].isin(HITS).to_numpy()
    print(
        f"\nhit rate, hard-hit (>= {HARD_HIT_MPH:g} mph) vs the rest: modeled {p_hit[hard].mean():.3f} vs "
        f"{p_hit[soft].mean():.3f}; observed {is_hit[hard].mean():.3f} vs {is_hit[soft].mean():.3f}"
    )
    assert p_hit[hard].mean() > 1.5 * p_hit[soft].mean()
    assert is_hit[hard].mean() > 1.5 * is_hit[soft].mean()


def test_tier_cut_points_are_reported(demo_pas, demo_model):
    tiers = contact_tiers(demo_pas, model=demo_model)
    print(f"\ntier cut points (run value per ball, {tiers.weights_source}):", tiers.cut_points.round(4).tolist())
    print(tiers.table[["label", "n", "share", "mean_run_value", "HR", "1B", "GB_OUT"]].round(3).to_string())
    assert np.all(np.diff(tiers.cut_points) > 0)
    # The tiers' run value ordered on games not used to cut them: test_held_out.py.


def test_contact_basis_counts_fallback(demo_pas, demo_model):
    out = contact_outcome_counts(demo_pas, role="batter", model=demo_model)
    info = out.attrs["contact_basis"]
    print(f"\ncontact basis: {info}")
    assert info["n_fallback"] == demo_model.n_unmeasured_
    assert info["n_modeled"] + info["n_fallback"] == info["n_batted"]


def test_calibration_fit_on_both_bases(demo_pas):
    from matchup_widgets.model import calibrate

    kw = dict(holdout_share=0.25, seed=0, priors=(0, 100, 400), n_boot=10, progress=False)
    observed = calibrate(demo_pas, basis="observed", **kw)
    contact = calibrate(demo_pas, basis="contact", **kw)
    print(
        f"\nheld-out Brier on the demo league: observed basis {observed.brier:.6f} "
        f"(w {observed.pitcher_weight:.2f}, priors {observed.batter_prior_pa:g}/{observed.pitcher_prior_pa:g}); "
        f"contact basis {contact.brier:.6f} (w {contact.pitcher_weight:.2f}, priors "
        f"{contact.batter_prior_pa:g}/{contact.pitcher_prior_pa:g}); league baseline "
        f"{observed.brier_baselines['league']:.6f}"
    )
    assert contact.basis == "contact" and observed.basis == "observed"
    assert contact.n_holdout_pa == observed.n_holdout_pa
    assert 0 < contact.brier < 1 and 0 < observed.brier < 1


def test_tiered_singles_on_the_demo_league(demo_pas, demo_model):
    from matchup_widgets.contact import tiered_advancement, tiered_probabilities
    from matchup_widgets.runs import run_expectancy

    hits = tiered_advancement(demo_pas, model=demo_model)
    runner_on_first = 1  # state index: 0 outs, runner on 1st
    shown = {}
    for name in ("1B_weak", "1B_strong", "2B_weak", "2B_strong"):
        t, r = hits.table.row(name)
        shown[name] = (round(float(t[runner_on_first, 5]), 3), round(float((t * r)[runner_on_first].sum()), 3))
    league = demo_pas.frame["outcome"].value_counts(normalize=True).to_dict()
    re_weak = run_expectancy(tiered_probabilities(league, {"1B": 1.0, "2B": 1.0}), advancement=hits.table)[0, 0]
    re_strong = run_expectancy(tiered_probabilities(league, {"1B": 0.0, "2B": 0.0}), advancement=hits.table)[0, 0]
    print(
        f"\ntiered hits (strong = tiers {hits.strong_from}-5), from runner on 1st with 0 outs, "
        f"(P(runners on 1st & 3rd), runs on the play): {shown}; weak share {hits.weak_share}; "
        f"runs per inning if every single/double were weak {re_weak:.3f}, strong {re_strong:.3f}"
    )
    assert hits.table.outcomes[-4:] == ("1B_weak", "1B_strong", "2B_weak", "2B_strong")
    assert hits.from_data.loc["1B_weak", runner_on_first] and hits.from_data.loc["1B_strong", runner_on_first]
