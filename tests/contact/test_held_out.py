"""Checks on games not used to fit, cut or choose: they can fail.

The demo league is invented; its figures are printed, never used as check values. What is
checked is an ordering on independent held-out games: tiers cut on one half of the games
must order the realised run value of the balls in the other half, and the chosen contact
model must beat the bucket lookup on games not used to choose it.
"""

from __future__ import annotations

import numpy as np
import pytest

from matchup_widgets.contact import ContactModel, contact_predictions, contact_tiers
from matchup_widgets.contact._dataset import ball_tiers
from matchup_widgets.contact._frames import measured_mask, outcome_index
from matchup_widgets.contact._model import EV_EDGES, LA_EDGES, _BucketLookup, multiclass_log_loss
from matchup_widgets.data import BATTED, load_pas

#: Top tier's mean realised run value must exceed the bottom tier's by at least this many
#: runs per ball on the held-out games (common practice: a home run is worth about 1.4 runs
#: and an out about -0.27, so the hardest-hit fifth of balls is worth several tenths of a run
#: more than the weakest fifth).
TOP_OVER_BOTTOM_RUNS = 0.2


@pytest.fixture(scope="module")
def halves():
    from matchup_widgets.data.demo import make_demo_league

    frame = make_demo_league(seed=2027, n_seasons=1).pas
    games = frame["game_id"].unique()
    rng = np.random.default_rng(11)
    first = set(rng.choice(games, size=len(games) // 2, replace=False))
    in_first = frame["game_id"].isin(first).to_numpy()
    fit = load_pas(frame[in_first].reset_index(drop=True))
    test = load_pas(frame[~in_first].reset_index(drop=True))
    model = ContactModel().fit(fit)  # chooses its kind on a held-out part of the fit games
    return fit, test, model


def _batted(pas):
    f = pas.frame
    f = f[f["outcome"].isin(BATTED)]
    ev, la = f["exit_velo"].to_numpy(float), f["launch_angle"].to_numpy(float)
    ok = measured_mask(ev, la)
    return f[ok], ev[ok], la[ok], outcome_index(f["outcome"].to_numpy()[ok])


def test_tiers_order_realised_run_value_on_held_out_games(halves):
    fit, test, model = halves
    tiers = contact_tiers(fit, model=model)  # cut on the first half of the games only
    pred = contact_predictions(test, model=model)
    tier = ball_tiers(pred, tiers)
    measured = tier > 0
    realised = tiers.weights.reindex(pred["outcome"]).to_numpy(float)  # run value of what happened
    means = np.array([realised[measured & (tier == t)].mean() for t in range(1, 6)])
    counts = [int((measured & (tier == t)).sum()) for t in range(1, 6)]
    print(f"\nrealised run value per ball by tier on {int(measured.sum())} held-out balls: "
          f"{np.round(means, 3).tolist()} (n {counts})")
    assert np.all(np.diff(means) > 0)
    assert means[-1] - means[0] >= TOP_OVER_BOTTOM_RUNS


def test_chosen_contact_model_beats_the_bucket_lookup_on_unseen_games(halves):
    fit, test, model = halves
    _, ev_f, la_f, y_f = _batted(fit)
    _, ev_t, la_t, y_t = _batted(test)
    bucket = _BucketLookup(EV_EDGES, LA_EDGES).fit(ev_f, la_f, y_f)
    chosen = multiclass_log_loss(model.predict_proba(ev_t, la_t), y_t)
    baseline = multiclass_log_loss(bucket.predict_proba(ev_t, la_t), y_t)
    print(f"\nlog loss on {len(y_t)} balls of unseen games: chosen ({model.kind_}) {chosen:.4f}, "
          f"bucket lookup {baseline:.4f}")
    assert chosen < baseline
