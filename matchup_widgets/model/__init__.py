"""The matchup model: platoon-split distributions, shrinkage, blends, intervals, summaries."""

from ._blend import METHODS, blend, linear_blend, odds_ratio_blend, two_stage_blend
from ._shrink import shrink

__all__ = [
    "METHODS",
    "blend",
    "linear_blend",
    "odds_ratio_blend",
    "shrink",
    "two_stage_blend",
]
