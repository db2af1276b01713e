"""The matchup model: platoon-split distributions, shrinkage, blends, intervals, summaries."""

from ._blend import blend, linear_blend, odds_ratio_blend, two_stage_blend
from ._calibrate import CalibrationResult, FittedSettings, calibrate
from ._calibrate_split import CELL_KEYS, collapse_cells, split_games, split_last_season
from ._calibrate_surface import (
    DEFAULT_PRIOR_GRID,
    DEFAULT_WEIGHTS,
    best_weight_closed_form,
    linear_weight_surface,
    quadratic_coefficients,
    two_stage_surface,
    weight_bootstrap,
)
from ._distributions import league_distributions, outcome_distributions, split_label, with_rates
from ._empirical_bayes import empirical_bayes_prior
from ._intervals import INTERVAL_FLOOR, matchup_draws, matchup_interval, posterior_draws
from ._scores import brier_score, log_loss, reliability_table
from ._run_value import estimate_draws, run_value_interval
from ._matchup import MatchupEstimate, MatchupModel
from ._settings import (
    BASES,
    METHOD_WEIGHTS,
    METHODS,
    PRIOR_GROUPS,
    SETTING_NAMES,
    BlendSettings,
    read_settings,
)
from ._shrink import shrink
from ._summary import (
    FALLBACK_WOBA_SCALE,
    FALLBACK_WOBA_WEIGHTS,
    SUMMARY_COLUMNS,
    run_weights,
    summarize,
)

__all__ = [
    "BASES",
    "METHOD_WEIGHTS",
    "PRIOR_GROUPS",
    "SETTING_NAMES",
    "BlendSettings",
    "FittedSettings",
    "read_settings",
    "MatchupEstimate",
    "MatchupModel",
    "estimate_draws",
    "run_value_interval",
    "league_distributions",
    "outcome_distributions",
    "split_label",
    "with_rates",
    "CalibrationResult",
    "calibrate",
    "CELL_KEYS",
    "DEFAULT_PRIOR_GRID",
    "DEFAULT_WEIGHTS",
    "best_weight_closed_form",
    "brier_score",
    "collapse_cells",
    "linear_weight_surface",
    "log_loss",
    "quadratic_coefficients",
    "reliability_table",
    "split_games",
    "split_last_season",
    "two_stage_surface",
    "weight_bootstrap",
    "FALLBACK_WOBA_SCALE",
    "FALLBACK_WOBA_WEIGHTS",
    "INTERVAL_FLOOR",
    "METHODS",
    "SUMMARY_COLUMNS",
    "blend",
    "empirical_bayes_prior",
    "linear_blend",
    "matchup_draws",
    "matchup_interval",
    "odds_ratio_blend",
    "posterior_draws",
    "run_weights",
    "shrink",
    "summarize",
    "two_stage_blend",
]
