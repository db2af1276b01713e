"""Properties that hold for any input, and the layer rule."""

from __future__ import annotations

import subprocess
import sys

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from matchup_widgets.contact import assign_tiers, bucket_index, shrink_shares

_floats = st.one_of(st.floats(min_value=-200, max_value=200), st.just(float("nan")))


@settings(max_examples=60, deadline=None)
@given(arrays(np.float64, 30, elements=_floats), arrays(np.float64, 30, elements=_floats))
def test_bucket_index_is_in_range_and_unmeasured_is_minus_one(ev, la):
    idx = bucket_index(ev, la, ev_edges=[80, 95], la_edges=[10, 25, 50])
    missing = np.isnan(ev) | np.isnan(la)
    assert (idx[missing] == -1).all()
    assert ((idx[~missing] >= 0) & (idx[~missing] < 12)).all()


@settings(max_examples=60, deadline=None)
@given(arrays(np.float64, 40, elements=_floats))
def test_tiers_are_monotone_in_run_value(values):
    tiers = assign_tiers(values, [-1.0, 0.0, 1.0, 2.0])
    ok = np.isfinite(values)
    order = np.argsort(values[ok], kind="stable")
    assert (np.diff(tiers[ok][order]) >= 0).all()
    assert set(np.unique(tiers[ok])) <= {1, 2, 3, 4, 5}


@settings(max_examples=60, deadline=None)
@given(
    arrays(np.float64, 5, elements=st.floats(0, 1000)),
    st.floats(0, 1e4),
)
def test_shrunk_shares_sum_to_one_and_lie_between_raw_and_league(counts, prior):
    league = np.array([0.1, 0.2, 0.3, 0.25, 0.15])
    out = shrink_shares(counts, league, prior)
    assert np.isclose(out.sum(), 1.0)
    if counts.sum() > 0:
        raw = counts / counts.sum()
        lo, hi = np.minimum(raw, league), np.maximum(raw, league)
        assert ((out >= lo - 1e-12) & (out <= hi + 1e-12)).all()


def test_contact_layer_imports_no_chart_or_widget_stack():
    code = "import sys, matchup_widgets.contact; print(sorted(m for m in ('altair', 'ipywidgets') if m in sys.modules))"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"
