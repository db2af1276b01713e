"""Runs layer: base-out states, advancement tables, Markov run expectancy, run values, lineups.

Everything is exact linear algebra on the absorbing Markov chain over the 24 base-out
states; simulation (:func:`simulate_innings`, :func:`simulate_games`) is only a cross-check.
"""

from ._advancement import (
    MIN_COUNT,
    AdvancementTable,
    default_advancement,
    estimate_advancement,
    hit_row,
    identity_runs,
)
from ._chain import run_expectancy, runs_distribution, runs_per_9, runs_per_inning
from ._lineup import LineupRuns, lineup_runs, simulate_games, simulate_innings
from ._values import linear_weights, situation, woba_weights
from ._states import END, N_STATES, N_TRANSIENT, STATES, state_index, state_label

__all__ = [
    "AdvancementTable",
    "END",
    "LineupRuns",
    "MIN_COUNT",
    "N_STATES",
    "N_TRANSIENT",
    "STATES",
    "default_advancement",
    "estimate_advancement",
    "hit_row",
    "identity_runs",
    "linear_weights",
    "lineup_runs",
    "run_expectancy",
    "runs_distribution",
    "runs_per_9",
    "runs_per_inning",
    "simulate_games",
    "simulate_innings",
    "situation",
    "state_index",
    "state_label",
    "woba_weights",
]
