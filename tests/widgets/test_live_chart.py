"""LiveChart: rows swapped in place give the same spec a fresh build would."""

from __future__ import annotations

import json

import pandas as pd

from matchup_widgets.charts import outcome_bars_chart, run_context_chart
from matchup_widgets.widgets import LiveChart


def _normalised(spec: dict) -> str:
    """The spec as text with the dataset name (a hash of the rows) replaced."""
    (name,) = spec["datasets"]
    return json.dumps(spec, sort_keys=True).replace(name, "DATA")


def _bars(scale: float) -> pd.DataFrame:
    return pd.DataFrame({"outcome": ["K", "BB", "K", "BB"], "side": ["batter", "batter", "matchup", "matchup"],
                         "probability": [0.2 * scale, 0.1, 0.25 * scale, 0.08],
                         "low": [None, None, 0.2, 0.05], "high": [None, None, 0.3, 0.1]})


def test_swap_equals_a_fresh_build():
    live = LiveChart(outcome_bars_chart, _bars(1.0), css_class="x")
    widget = live.widget
    assert live.update(_bars(0.9))
    assert (live.n_builds, live.n_swaps) == (1, 1)
    assert live.widget is widget
    assert _normalised(live.widget.spec) == _normalised(outcome_bars_chart(_bars(0.9)).to_dict())
    assert not live.update(_bars(0.9))  # unchanged table: nothing sent


def test_new_layout_rebuilds():
    live = LiveChart(outcome_bars_chart, _bars(1.0))
    more = pd.concat([_bars(1.0), pd.DataFrame({"outcome": ["HR"], "side": ["league"], "probability": [0.03]})])
    live.update(more)
    assert (live.n_builds, live.n_swaps) == (2, 0)
    assert _normalised(live.widget.spec) == _normalised(outcome_bars_chart(more).to_dict())


def test_changed_option_rebuilds():
    runs = pd.DataFrame({"side": ["matchup", "league_hitter"], "expected_runs": [0.5, 0.48],
                         "scoring_chance": [0.27, 0.26]})
    live = LiveChart(run_context_chart, runs, state="Bases empty, 0 outs")
    live.update(runs, state="Bases loaded, 2 outs")
    assert live.n_builds == 2
    assert live.widget.spec["title"] == "Run context: Bases loaded, 2 outs"
