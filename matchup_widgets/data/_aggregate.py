"""Outcome counts per player and platoon split, computed by the engine through ibis.

The group-by runs where the data lives (DuckDB by default, or any ibis backend); only
the small count tables come back as pandas DataFrames.
"""

from __future__ import annotations

from typing import Any

import ibis.expr.types as ir
import numpy as np
import pandas as pd

from ._errors import DataError
from ._load import as_table
from ._schema import OUTCOMES, SPLITS

_ROLES: dict[str, str] = {"batter": "batter_id", "pitcher": "pitcher_id"}


def _check_role(role: str) -> str:
    if role not in _ROLES:
        msg = f"role must be 'batter' or 'pitcher', got {role!r}."
        raise ValueError(msg)
    return _ROLES[role]


def _require(t: ir.Table, columns: list[str]) -> None:
    missing = [c for c in columns if c not in t.columns]
    if missing:
        hint = " (or game_date, to derive it)" if "season" in missing else ""
        msg = (
            f"Counting needs column(s) {', '.join(repr(c) for c in missing)}{hint}, which the table lacks; "
            "load the data with load_pas so every contract column is present."
        )
        raise DataError(msg)


def season_range(seasons: Any) -> tuple[int, int] | None:
    """Check a season filter: an inclusive ``(first, last)`` pair of years, or None for all.

    Every layer that takes ``seasons=`` checks it here, so the rule and the message are one.

    Examples
    --------
    >>> season_range(["2024", 2026])
    (2024, 2026)
    >>> season_range(None) is None
    True
    """
    if seasons is None:
        return None
    try:
        first, last = (int(s) for s in seasons)
    except (TypeError, ValueError):
        msg = f"seasons must be an inclusive (first, last) pair of years or None, got {seasons!r}."
        raise ValueError(msg) from None
    if first > last:
        msg = f"seasons=({first}, {last}): the first season is after the last; give (first, last)."
        raise ValueError(msg)
    return first, last


def _filter_seasons(t: ir.Table, seasons: Any) -> ir.Table:
    pair = season_range(seasons)
    if pair is None:
        return t
    _require(t, ["season"])
    first, last = pair
    return t.filter((t.season >= first) & (t.season <= last))


def _count_columns(t: ir.Table) -> dict[str, ir.Value]:
    # one pass: a conditional count per outcome code, plus the plate appearances
    aggs: dict[str, ir.Value] = {code: (t.outcome == code).sum().cast("int64") for code in OUTCOMES}
    aggs["pa"] = t.count().cast("int64")
    return aggs


def _finish(df: pd.DataFrame, keys: list[str]) -> pd.DataFrame:
    df = df[keys + list(OUTCOMES) + ["pa"]]
    for c in [*OUTCOMES, "pa"]:
        df[c] = df[c].fillna(0).astype(np.int64)
    if "season" in keys:
        df["season"] = df["season"].astype(np.int64)
    return df.sort_values(keys, kind="stable").reset_index(drop=True)


def outcome_counts(
    pas: Any,
    *,
    role: str,
    seasons: tuple[int, int] | None = None,
    by_season: bool = False,
) -> pd.DataFrame:
    """Count each outcome per player and platoon split (and season), on the engine.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table
        Validated plate appearances (from :func:`load_pas`) or an ibis table with the
        contract's columns.
    role : {"batter", "pitcher"}
        Whose plate appearances to count: ``player_id`` is ``batter_id`` or ``pitcher_id``.
    seasons : (int, int), optional
        Inclusive (first, last) seasons; all seasons when None.
    by_season : bool, default False
        Add ``season`` to the grouping.

    Returns
    -------
    pandas.DataFrame
        Columns ``player_id, batter_hand, pitcher_hand, [season]``, one int64 column
        per code in ``OUTCOMES`` order, then ``pa``; sorted by the key columns. Only
        splits with plate appearances have rows.

    Examples
    --------
    >>> import pandas as pd
    >>> df = pd.DataFrame({"batter_id": ["b1", "b1", "b2"], "pitcher_id": ["p1"] * 3,
    ...     "batter_hand": ["L", "L", "R"], "pitcher_hand": ["R"] * 3,
    ...     "outcome": ["K", "HR", "K"], "season": [2031] * 3})
    >>> outcome_counts(df, role="batter")[["player_id", "batter_hand", "K", "HR", "pa"]]
      player_id batter_hand  K  HR  pa
    0        b1           L  1   1   2
    1        b2           R  1   0   1
    """
    id_col = _check_role(role)
    t = as_table(pas)
    _require(t, [id_col, "batter_hand", "pitcher_hand", "outcome"] + (["season"] if by_season else []))
    t = _filter_seasons(t, seasons)
    keys = ["player_id", "batter_hand", "pitcher_hand"] + (["season"] if by_season else [])
    grouped = t.group_by(
        player_id=t[id_col], batter_hand=t.batter_hand, pitcher_hand=t.pitcher_hand,
        **({"season": t.season} if by_season else {}),
    )
    df = grouped.aggregate(**_count_columns(t)).order_by(keys).to_pandas()
    return _finish(df, keys)


def league_counts(pas: Any, *, seasons: tuple[int, int] | None = None) -> pd.DataFrame:
    """Count each outcome for the whole league in each of the four platoon splits.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table
        Validated plate appearances or an ibis table with the contract's columns.
    seasons : (int, int), optional
        Inclusive (first, last) seasons; all seasons when None.

    Returns
    -------
    pandas.DataFrame
        Four rows in ``SPLITS`` order (zeros for a split with no plate appearances):
        ``batter_hand, pitcher_hand``, one int64 column per outcome code, ``pa``.

    Examples
    --------
    >>> import pandas as pd
    >>> df = pd.DataFrame({"batter_id": ["b1", "b2"], "pitcher_id": ["p1", "p1"],
    ...     "batter_hand": ["L", "R"], "pitcher_hand": ["R", "R"],
    ...     "outcome": ["BB", "K"], "season": [2031, 2031]})
    >>> league_counts(df)[["batter_hand", "pitcher_hand", "K", "BB", "pa"]]
      batter_hand pitcher_hand  K  BB  pa
    0           L            L  0   0   0
    1           L            R  0   1   1
    2           R            L  0   0   0
    3           R            R  1   0   1
    """
    t = as_table(pas)
    _require(t, ["batter_hand", "pitcher_hand", "outcome"])
    t = _filter_seasons(t, seasons)
    keys = ["batter_hand", "pitcher_hand"]
    got = t.group_by(keys).aggregate(**_count_columns(t)).to_pandas()
    full = pd.DataFrame(list(SPLITS), columns=keys)
    merged = full.merge(got, on=keys, how="left")
    out = _finish(merged, keys)
    # keep SPLITS order (already sorted L < R) and only the four valid splits
    return out


def require_split(
    counts: pd.DataFrame,
    player_id: str,
    batter_hand: str,
    pitcher_hand: str,
    *,
    role: str = "player",
    name: str | None = None,
) -> pd.Series:
    """Return a player's counts in one platoon split, or explain why there are none.

    Parameters
    ----------
    counts : pandas.DataFrame
        A table from :func:`outcome_counts` (with or without ``season``; seasons are
        summed).
    player_id : str
        The player's id.
    batter_hand, pitcher_hand : {"L", "R"}
        The split: the side the batter hits from and the pitcher's throwing hand.
    role : str, default "player"
        Used in the message ("batter", "pitcher").
    name : str, optional
        Display name used in the message.

    Returns
    -------
    pandas.Series
        The outcome counts and ``pa`` (int64), labelled by code.

    Raises
    ------
    DataError
        When the player has no plate appearances in that split; the message lists the
        splits they do have.

    Examples
    --------
    >>> counts = pd.DataFrame({"player_id": ["b1"], "batter_hand": ["L"], "pitcher_hand": ["R"],
    ...     **{c: [1 if c == "K" else 0] for c in OUTCOMES}, "pa": [1]})
    >>> int(require_split(counts, "b1", "L", "R")["pa"])
    1
    >>> try:
    ...     require_split(counts, "b1", "L", "L", role="batter")
    ... except DataError as exc:
    ...     print(str(exc)[:63])
    batter 'b1' has no plate appearances batting L against a left-h
    """
    rows = counts[counts["player_id"] == player_id]
    cols = [*OUTCOMES, "pa"]
    in_split = rows[(rows["batter_hand"] == batter_hand) & (rows["pitcher_hand"] == pitcher_hand)]
    total = in_split[cols].sum().astype(np.int64)
    if int(total["pa"]) > 0:
        return total
    who = f"{role} '{player_id}'" + (f" ({name})" if name else "")
    arm = {"L": "left-handed", "R": "right-handed"}.get(pitcher_hand, repr(pitcher_hand))
    split = f"batting {batter_hand} against a {arm} pitcher"
    if rows.empty:
        msg = (
            f"{who} has no plate appearances batting {batter_hand} against a {arm} pitcher, and none at all "
            "in the selected seasons. Check the id and the season range."
        )
        raise DataError(msg)
    have = rows.groupby(["batter_hand", "pitcher_hand"], sort=True)["pa"].sum()
    have = have[have > 0]
    listed = ", ".join(f"{b} vs {p} ({int(n):,} PA)" for (b, p), n in have.items())
    msg = (
        f"{who} has no plate appearances {split} (split {batter_hand} vs {pitcher_hand}). "
        f"Splits with plate appearances: {listed}. Pick one of those splits, or use the league average "
        "for this split (the model's shrinkage with zero PA)."
    )
    raise DataError(msg)
