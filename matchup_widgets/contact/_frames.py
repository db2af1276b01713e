"""Row-level access to batted balls for the contact layer (private helpers).

The contact layer needs one row per batted ball (exit velocity and launch angle are
per-ball measurements), so it works on the plate-appearance frame rather than on count
tables. Everything here accepts either a loaded ``PlateAppearances`` object (anything
with a ``.frame`` attribute) or a pandas DataFrame that follows the table contract.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BATTED, DataError, season_range

#: Key column of each role in the plate-appearance table.
ROLE_KEYS: dict[str, str] = {"batter": "batter_id", "pitcher": "pitcher_id"}
#: Columns the contact layer needs on every row.
CONTACT_COLUMNS: tuple[str, ...] = ("outcome", "exit_velo", "launch_angle")


def frame_of(pas: Any) -> pd.DataFrame:
    """Return the plate-appearance DataFrame behind ``pas`` (never a copy to be changed)."""
    if isinstance(pas, pd.DataFrame):
        return pas
    frame = getattr(pas, "frame", None)
    if isinstance(frame, pd.DataFrame):
        return frame
    msg = (
        f"expected a PlateAppearances object (from matchup_widgets.data.load_pas) or a "
        f"pandas DataFrame, got {type(pas).__name__}. Load the table first with load_pas(path)."
    )
    raise TypeError(msg)


def require_columns(frame: pd.DataFrame, columns: Iterable[str], *, purpose: str) -> None:
    """Raise DataError naming every missing column and what to do."""
    missing = [c for c in columns if c not in frame.columns]
    if missing:
        msg = (
            f"{purpose} needs column(s) {missing}, which the table lacks "
            f"(it has {list(frame.columns)[:12]}). Add them, or map your own column names "
            f"with the loader's mapping option."
        )
        raise DataError(msg)


def check_role(role: str) -> str:
    """Return the key column of ``role`` or raise ValueError."""
    if role not in ROLE_KEYS:
        msg = f"role must be 'batter' or 'pitcher', got {role!r}."
        raise ValueError(msg)
    return ROLE_KEYS[role]


def seasons_of(frame: pd.DataFrame) -> pd.Series:
    """The season of each row: the ``season`` column, else the year of ``game_date``."""
    if "season" in frame.columns:
        return frame["season"]
    require_columns(frame, ["game_date"], purpose="season filtering")
    return pd.to_datetime(frame["game_date"]).dt.year


def season_mask(values: pd.Series | np.ndarray, seasons: tuple[int, int] | None) -> np.ndarray:
    """True for rows whose season lies in the inclusive ``(first, last)`` pair (all when None).

    The same convention as :func:`matchup_widgets.data.outcome_counts`.
    """
    values = np.asarray(values)
    pair = season_range(seasons)
    if pair is None:
        return np.ones(len(values), dtype=bool)
    first, last = pair
    return (values >= first) & (values <= last)


def select_seasons(frame: pd.DataFrame, seasons: tuple[int, int] | None) -> pd.DataFrame:
    """Rows whose season lies in the inclusive ``(first, last)`` pair; all rows when None."""
    if seasons is None:
        return frame
    return frame[season_mask(seasons_of(frame).to_numpy(), seasons)]


def batted_rows(frame: pd.DataFrame, *, purpose: str) -> pd.DataFrame:
    """The batted-ball rows (outcome in BATTED) with float exit_velo / launch_angle."""
    require_columns(frame, CONTACT_COLUMNS, purpose=purpose)
    mask = frame["outcome"].isin(BATTED).to_numpy()
    out = frame.loc[mask].copy()
    out["exit_velo"] = pd.to_numeric(out["exit_velo"], errors="coerce").astype("float64")
    out["launch_angle"] = pd.to_numeric(out["launch_angle"], errors="coerce").astype("float64")
    return out


def measured_mask(ev: np.ndarray, la: np.ndarray) -> np.ndarray:
    """True where both exit velocity and launch angle are finite."""
    return np.isfinite(ev) & np.isfinite(la)


def outcome_index(outcomes: pd.Series | np.ndarray) -> np.ndarray:
    """Position of each outcome code within BATTED (-1 for codes outside BATTED)."""
    codes = pd.Categorical(np.asarray(outcomes, dtype=object), categories=list(BATTED))
    return np.asarray(codes.codes, dtype=np.int64)
