"""Plate-appearance data: the contract, loading and validation, aggregation, the demo league."""

from ._aggregate import league_counts, outcome_counts, require_split, season_range
from ._errors import DataError
from ._load import PlateAppearances, as_table, load_pas
from ._players import player_table, resolve_player, search_players
from ._schema import (
    BASE_OUT_COLUMNS,
    BATTED,
    EXIT_VELO_RANGE,
    HANDS,
    HITS,
    IN_PLAY,
    LAUNCH_ANGLE_RANGE,
    NOT_IN_PLAY,
    ON_BASE,
    OPTIONAL_COLUMNS,
    OUTCOME_LABELS,
    OUTCOMES,
    OUTS,
    REQUIRED_COLUMNS,
    SPLITS,
)
from ._validate import ValidationReport
from .demo import DemoLeague, demo_path, make_demo_league, true_probabilities, write_demo_league

__all__ = [
    "BASE_OUT_COLUMNS",
    "BATTED",
    "DataError",
    "EXIT_VELO_RANGE",
    "HANDS",
    "HITS",
    "IN_PLAY",
    "LAUNCH_ANGLE_RANGE",
    "NOT_IN_PLAY",
    "ON_BASE",
    "OPTIONAL_COLUMNS",
    "OUTCOME_LABELS",
    "OUTCOMES",
    "OUTS",
    "REQUIRED_COLUMNS",
    "SPLITS",
    "PlateAppearances",
    "ValidationReport",
    "as_table",
    "league_counts",
    "load_pas",
    "outcome_counts",
    "player_table",
    "require_split",
    "resolve_player",
    "search_players",
    "season_range",
    "DemoLeague",
    "demo_path",
    "make_demo_league",
    "true_probabilities",
    "write_demo_league",
]
