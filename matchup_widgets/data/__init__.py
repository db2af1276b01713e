"""Plate-appearance data: the contract, loading and validation, aggregation, the demo league."""

from ._errors import DataError
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
]
