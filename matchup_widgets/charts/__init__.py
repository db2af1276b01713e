"""Chart builders: small tables in, altair charts out (no widgets, no I/O, no statistics)."""

from ._calibration import brier_surface_chart, method_comparison_chart, reliability_chart, skill_chart
from ._card import matchup_card_chart
from ._lineup import lineup_runs_chart
from ._matchup import (
    chart_rows,
    contact_heatmap_chart,
    outcome_bars_chart,
    run_context_chart,
    tier_shares_chart,
)
from ._options import option_ranking_chart
from ._tables import require_columns
from ._theme import SIDE_COLORS, SIDE_LABELS, SIDES, side_label, side_scale, style

__all__ = [
    "SIDES",
    "SIDE_COLORS",
    "SIDE_LABELS",
    "brier_surface_chart",
    "chart_rows",
    "contact_heatmap_chart",
    "lineup_runs_chart",
    "matchup_card_chart",
    "method_comparison_chart",
    "option_ranking_chart",
    "outcome_bars_chart",
    "reliability_chart",
    "require_columns",
    "run_context_chart",
    "side_label",
    "side_scale",
    "skill_chart",
    "style",
    "tier_shares_chart",
]
