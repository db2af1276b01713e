"""The plate-appearance table contract: column names, outcome codes and their groups.

Every layer imports these names from :mod:`matchup_widgets.data` instead of spelling
codes or columns itself, so the contract lives in one place.
"""

from __future__ import annotations

#: Outcome codes in their canonical order (trade notation). Every probability vector
#: and every count table in the project uses this order.
OUTCOMES: tuple[str, ...] = ("K", "BB", "HBP", "1B", "2B", "3B", "HR", "GB_OUT", "AIR_OUT")

#: Plain words for each code, for labels on screen.
OUTCOME_LABELS: dict[str, str] = {
    "K": "Strikeout",
    "BB": "Walk",
    "HBP": "Hit by pitch",
    "1B": "Single",
    "2B": "Double",
    "3B": "Triple",
    "HR": "Home run",
    "GB_OUT": "Ground-ball out",
    "AIR_OUT": "Air out",
}

#: Outcomes in which the batter put the ball in play fair or over the fence (batted balls).
BATTED: tuple[str, ...] = ("1B", "2B", "3B", "HR", "GB_OUT", "AIR_OUT")
#: Balls in play in the usual sense (a home run leaves the field of play).
IN_PLAY: tuple[str, ...] = ("1B", "2B", "3B", "GB_OUT", "AIR_OUT")
#: Outcomes decided without a ball in play; the first stage of the two-stage blend adds "BIP".
NOT_IN_PLAY: tuple[str, ...] = ("K", "BB", "HBP", "HR")
HITS: tuple[str, ...] = ("1B", "2B", "3B", "HR")
ON_BASE: tuple[str, ...] = ("BB", "HBP", "1B", "2B", "3B", "HR")
OUTS: tuple[str, ...] = ("K", "GB_OUT", "AIR_OUT")

HANDS: tuple[str, ...] = ("L", "R")
#: The four platoon splits as (batter_hand, pitcher_hand) pairs.
SPLITS: tuple[tuple[str, str], ...] = (("L", "L"), ("L", "R"), ("R", "L"), ("R", "R"))

REQUIRED_COLUMNS: tuple[str, ...] = (
    "game_id",
    "game_date",
    "batter_id",
    "pitcher_id",
    "batter_name",
    "pitcher_name",
    "batter_hand",
    "pitcher_hand",
    "outcome",
)

OPTIONAL_COLUMNS: tuple[str, ...] = (
    "exit_velo",
    "launch_angle",
    "inning",
    "outs_before",
    "bases_before",
    "outs_after",
    "bases_after",
    "runs_on_play",
    "season",
)

#: Columns that describe the base-out situation; the runs layer uses them when all are present.
BASE_OUT_COLUMNS: tuple[str, ...] = (
    "outs_before",
    "bases_before",
    "outs_after",
    "bases_after",
    "runs_on_play",
)

#: Physical ranges accepted at load (mph, degrees).
EXIT_VELO_RANGE: tuple[float, float] = (0.0, 130.0)
LAUNCH_ANGLE_RANGE: tuple[float, float] = (-90.0, 90.0)
