"""The matchup model: platoon-split distributions, shrinkage, blends, intervals, summaries."""

from ._blend import METHODS, blend, linear_blend, odds_ratio_blend, two_stage_blend
from ._empirical_bayes import empirical_bayes_prior
from ._intervals import INTERVAL_FLOOR, matchup_interval, posterior_draws
from ._shrink import shrink
from ._summary import (
    FALLBACK_WOBA_SCALE,
    FALLBACK_WOBA_WEIGHTS,
    SUMMARY_COLUMNS,
    run_weights,
    summarize,
)

__all__ = [
    "FALLBACK_WOBA_SCALE",
    "FALLBACK_WOBA_WEIGHTS",
    "INTERVAL_FLOOR",
    "METHODS",
    "SUMMARY_COLUMNS",
    "blend",
    "empirical_bayes_prior",
    "linear_blend",
    "matchup_interval",
    "odds_ratio_blend",
    "posterior_draws",
    "run_weights",
    "shrink",
    "summarize",
    "two_stage_blend",
]
