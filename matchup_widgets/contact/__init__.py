"""Contact layer: how hard each side hits the ball, and what that contact is worth.

Exit-velocity x launch-angle buckets, batted-ball types and the hard-hit flag; a model of
P(outcome | exit velocity, launch angle) over batted balls; five contact tiers cut at
league quantiles of contact-expected run value; the contact basis for outcome counts;
the matchup contact mix; tiered hits for the runs layer.
"""

from ._buckets import (
    BATTED_BALL_TYPE_CUTS,
    BATTED_BALL_TYPES,
    EV_EDGES,
    HARD_HIT_MPH,
    LA_EDGES,
    band_labels,
    batted_ball_profile,
    batted_ball_type,
    bucket_index,
    bucket_labels,
    bucket_shares,
    is_hard_hit,
)
from ._advance import (
    TIERED_CODES,
    TieredHits,
    tiered_advancement,
    tiered_hits_available,
    tiered_probabilities,
    weak_shares_from_mix,
)
from ._basis import contact_outcome_counts
from ._cache import clear_contact_cache, contact_cache_info
from ._dataset import (
    contact_predictions,
    contact_tiers,
    league_bucket_table,
    tier_shares,
)
from ._model import ContactModel, contact_model_for, multiclass_log_loss
from ._mix import matchup_contact, matchup_contact_mix, shrink_shares
from ._tiers import (
    PUBLISHED_RUN_WEIGHTS,
    TIER_LABELS,
    TIER_QUANTILES,
    ContactTiers,
    assign_tiers,
    batted_run_weights,
    build_tiers,
    expected_run_value,
    tier_cut_points,
)

__all__ = [
    "BATTED_BALL_TYPES",
    "BATTED_BALL_TYPE_CUTS",
    "ContactModel",
    "ContactTiers",
    "EV_EDGES",
    "HARD_HIT_MPH",
    "LA_EDGES",
    "PUBLISHED_RUN_WEIGHTS",
    "TIERED_CODES",
    "TIER_LABELS",
    "TIER_QUANTILES",
    "TieredHits",
    "assign_tiers",
    "band_labels",
    "batted_ball_profile",
    "batted_ball_type",
    "batted_run_weights",
    "bucket_index",
    "bucket_labels",
    "bucket_shares",
    "build_tiers",
    "clear_contact_cache",
    "contact_cache_info",
    "contact_model_for",
    "contact_outcome_counts",
    "contact_predictions",
    "contact_tiers",
    "expected_run_value",
    "is_hard_hit",
    "league_bucket_table",
    "matchup_contact",
    "matchup_contact_mix",
    "multiclass_log_loss",
    "shrink_shares",
    "tier_cut_points",
    "tier_shares",
    "tiered_advancement",
    "tiered_hits_available",
    "tiered_probabilities",
    "weak_shares_from_mix",
]
