"""The contact model: probabilities, choice by held-out log loss, the per-dataset cache."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose
from sklearn.metrics import log_loss

from matchup_widgets.contact import ContactModel, contact_model_for, multiclass_log_loss
from matchup_widgets.contact._model import _BucketLookup, _gauss_matrix, _SmoothedGrid
from matchup_widgets.data import BATTED, DataError


@pytest.fixture(scope="module")
def fitted(synth_pas):
    return ContactModel(random_state=0).fit(synth_pas)


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_log_loss_matches_sklearn(seed):
    # reference: sklearn.metrics.log_loss (natural log, mean over rows)
    rng = np.random.default_rng(seed)
    p = rng.dirichlet(np.ones(6), size=200)
    y = rng.integers(0, 6, 200)
    assert_allclose(multiclass_log_loss(p, y), log_loss(y, p, labels=range(6)), rtol=1e-12)


def test_fit_reports_both_candidates_and_keeps_the_better(fitted):
    assert set(fitted.scores_) == {"boosting", "grid", "bucket_baseline"}
    assert fitted.kind_ == min(("boosting", "grid"), key=fitted.scores_.get)
    assert fitted.classes_ == BATTED
    assert fitted.n_fit_ > fitted.n_holdout_ > 0
    assert fitted.n_unmeasured_ > 0


def test_predictions_are_distributions_with_nan_for_unmeasured(fitted):
    rng = np.random.default_rng(3)
    ev, la = rng.uniform(30, 125, 300), rng.uniform(-80, 85, 300)
    ev[:5] = np.nan
    p = fitted.predict_proba(ev, la)
    assert p.shape == (300, 6)
    assert np.isnan(p[:5]).all()
    assert_allclose(p[5:].sum(axis=1), 1.0, rtol=1e-9)
    assert (p[5:] >= 0).all()


def test_init_stores_arguments_unchanged():
    model = ContactModel(kind="grid", holdout_share=0.3, ev_edges=[90])
    assert (model.kind, model.holdout_share, model.ev_edges) == ("grid", 0.3, [90])
    assert not hasattr(model, "kind_")


def test_errors_are_explained(synth_pas):
    with pytest.raises(ValueError, match="kind must be 'auto', 'boosting' or 'grid'"):
        ContactModel(kind="magic").fit(synth_pas)
    with pytest.raises(ValueError, match="holdout_share must lie strictly between 0 and 1"):
        ContactModel(holdout_share=1.0).fit(synth_pas)
    with pytest.raises(DataError, match=r"at least 200 batted balls .* got 50"):
        ContactModel().fit(synth_pas[synth_pas.outcome.isin(BATTED) & synth_pas.exit_velo.notna()].head(50))
    with pytest.raises(RuntimeError, match="not fitted yet"):
        ContactModel().predict_proba([90.0], [10.0])
    model = ContactModel(kind="grid").fit(synth_pas)
    with pytest.raises(ValueError, match="1-D and of equal length"):
        model.predict_proba([90.0, 91.0], [10.0])


def test_bucket_lookup_without_prior_is_the_cell_frequency():
    # closed form: alpha = 0 leaves the observed outcome share of each bucket
    ev = np.array([80.0, 80.0, 80.0, 100.0])
    la = np.array([5.0, 5.0, 5.0, 30.0])
    y = np.array([0, 4, 4, 3])
    table = _BucketLookup([95.0], [10.0], alpha=0.0).fit(ev, la, y)
    assert_allclose(table.predict_proba(np.array([81.0]), np.array([0.0]))[0], [1 / 3, 0, 0, 0, 2 / 3, 0])
    assert_allclose(table.predict_proba(np.array([99.0]), np.array([40.0]))[0], [0, 0, 0, 1, 0, 0])


def test_gaussian_smoothing_keeps_counts_and_narrow_kernel_is_identity():
    # row-normalised kernel: smoothing moves counts between cells, never creates or drops them
    s = _gauss_matrix(7, 1.5)
    assert_allclose(s.sum(axis=1), 1.0, rtol=1e-12)
    assert_allclose(_gauss_matrix(5, 0.05), np.eye(5), atol=1e-12)
    rng = np.random.default_rng(0)
    ev, la = rng.uniform(60, 110, 3000), rng.uniform(-20, 60, 3000)
    y = (la > 20).astype(int) * 5
    grid = _SmoothedGrid(sigma=0.05, alpha=0.0).fit(ev, la, y)
    # narrow kernel + no prior: a cell holding only AIR_OUT balls predicts AIR_OUT surely
    assert_allclose(grid.predict_proba(np.array([80.1]), np.array([50.1]))[0], [0, 0, 0, 0, 0, 1], atol=1e-9)


def test_cache_reuses_one_fit(synth_pas):
    a = contact_model_for(synth_pas, kind="grid")
    b = contact_model_for(synth_pas.copy(), kind="grid")  # same balls, another object
    c = contact_model_for(synth_pas, kind="grid", holdout_share=0.3)
    assert a is b
    assert c is not a


def test_seeded_fit_is_deterministic(synth_pas):
    small = synth_pas.head(8000)
    p1 = ContactModel(kind="boosting", random_state=4).fit(small).predict_proba([100.0], [28.0])
    p2 = ContactModel(kind="boosting", random_state=4).fit(small).predict_proba([100.0], [28.0])
    assert_allclose(p1, p2, rtol=0, atol=0)


def test_boosting_lookup_equals_direct_prediction(synth_pas):
    # reference: scikit-learn's own predict_proba on the same balls (the lookup must be exact)
    model = ContactModel(kind="boosting").fit(synth_pas)
    est = model._estimator
    assert est.edges_ is not None
    rng = np.random.default_rng(9)
    ev = np.concatenate([rng.uniform(20, 130, 3000), est.edges_[0][:50]])  # include values on the edges
    la = np.concatenate([rng.uniform(-90, 90, 3000), est.edges_[1][:50]])
    assert_allclose(est.predict_proba(ev, la), est._direct(ev, la), rtol=1e-12, atol=1e-15)


def test_small_table_with_a_lone_outcome_still_fits(make_synth):
    # a triple seen once cannot be split for early stopping; the fit must still work
    df = make_synth(600, seed=1)
    batted = df[df.outcome.isin(BATTED)]
    assert (batted.outcome == "3B").sum() <= 2
    model = ContactModel(random_state=1).fit(df)
    assert set(model.scores_) == {"boosting", "grid", "bucket_baseline"}
    assert_allclose(model.predict_proba([95.0], [20.0]).sum(), 1.0, rtol=1e-9)
