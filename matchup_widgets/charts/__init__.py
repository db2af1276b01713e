"""Chart builders: small tables in, altair charts out (no widgets, no I/O, no statistics)."""

from ._matchup import contact_heatmap_chart, outcome_bars_chart, run_context_chart, tier_shares_chart
from ._tables import require_columns
from ._theme import SIDE_COLORS, SIDE_LABELS, SIDES, side_label, side_scale, style

__all__ = [
    "SIDES",
    "SIDE_COLORS",
    "SIDE_LABELS",
    "contact_heatmap_chart",
    "outcome_bars_chart",
    "require_columns",
    "run_context_chart",
    "side_label",
    "side_scale",
    "style",
    "tier_shares_chart",
]
