"""The explorer's contact views share one contact model, and switching players reuses tables.

Smoke data: a seeded invented league (never a check value); the expected numbers come from
the contact layer's own public functions for the same fitted model.
"""

from __future__ import annotations

import pytest
from numpy.testing import assert_allclose

from matchup_widgets.contact import (
    ContactModel,
    contact_cache_info,
    contact_model_for,
    contact_outcome_counts,
)
from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import MatchupModel
from matchup_widgets.widgets import MatchupExplorer


@pytest.fixture(scope="module")
def pas(contact_league):
    return load_pas(contact_league(seed=21, n_pa=15_000, n_batters=24, n_pitchers=14))


@pytest.fixture(scope="module")
def explorer(pas):
    return MatchupExplorer(pas)


def test_contact_basis_and_tier_chart_use_one_model(explorer, pas):
    ex = explorer
    assert ex.contact_model is contact_model_for(pas, kind="grid")  # the tier chart's model
    assert ex.model.contact_model is ex.contact_model
    ex.controls["basis"].value = "contact"
    assert ex.status.last_error is None, ex.status.widget.value
    model = ex.current_query()[0]
    assert model.contact_model is ex.contact_model
    assert any(k[0] == "contact" and k[1] is ex.contact_model for k in ex.model.cache_)
    est = ex.estimate
    t = contact_outcome_counts(pas, role="batter", model=ex.contact_model)
    row = t[(t["player_id"] == est.batter_id) & (t["batter_hand"] == est.batter_hand)
            & (t["pitcher_hand"] == est.pitcher_hand)]
    assert_allclose(est.counts.loc["batter", list(OUTCOMES)].to_numpy(float),
                    row[list(OUTCOMES)].to_numpy(float).sum(axis=0), rtol=1e-12)
    ex.controls["basis"].value = "observed"


def test_switching_players_only_selects_cached_rows(explorer):
    ex = explorer
    options = [v for _, v in ex.controls["batter"].options if v not in (None, ex.controls["batter"].value)]
    ex.controls["batter"].value = options[0]  # make sure the tables of this season range exist
    before = contact_cache_info()
    for player in options[1:4]:
        ex.controls["batter"].value = player
        assert ex.status.last_error is None, ex.status.widget.value
        assert ex.contact_note.value == ""
    after = contact_cache_info()
    assert after["misses"].get("side_counts") == before["misses"].get("side_counts")
    assert after["hits"]["side_counts"] - before["hits"].get("side_counts", 0) == 2 * 3


def test_a_model_with_its_own_contact_model_keeps_it(pas):
    own = ContactModel(kind="grid", random_state=4).fit(pas)
    ex = MatchupExplorer(pas, model=MatchupModel(contact_model=own))
    assert ex.contact_model is own and ex.model.contact_model is own
    assert ex.contact_note.value == ""
