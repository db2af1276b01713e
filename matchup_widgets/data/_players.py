"""Players in a plate-appearance table: the roster table, name/id lookup and search."""

from __future__ import annotations

import difflib
from typing import Any

import numpy as np
import pandas as pd

from ._errors import DataError
from ._load import PlateAppearances, as_table

_ROLE_COLUMNS: dict[str, tuple[str, str, str]] = {
    # role: (id column, name column, the player's own hand column)
    "batter": ("batter_id", "batter_name", "batter_hand"),
    "pitcher": ("pitcher_id", "pitcher_name", "pitcher_hand"),
}
_PLAYER_COLUMNS = ["player_id", "name", "role", "hands", "pa"]


def _role_columns(role: str) -> tuple[str, str, str]:
    if role not in _ROLE_COLUMNS:
        msg = f"role must be 'batter' or 'pitcher', got {role!r}."
        raise ValueError(msg)
    return _ROLE_COLUMNS[role]


def player_table(pas: Any) -> pd.DataFrame:
    """One row per (player, role) with the name, hands seen and plate appearances.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table
        Validated plate appearances.

    Returns
    -------
    pandas.DataFrame
        Columns ``player_id, name, role, hands, pa``. ``name`` is the one used in the
        player's latest game; ``hands`` is ``"L"``, ``"R"`` or ``"L/R"`` (a switch
        hitter, or a pitcher who threw with both). Sorted by role, then id.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b1"], "pitcher_id": ["p1", "p2"],
    ...     "batter_name": ["Ada Quill"] * 2, "pitcher_name": ["Cy Moss", "Di Lark"],
    ...     "batter_hand": ["L", "R"], "pitcher_hand": ["R", "L"],
    ...     "game_date": pd.to_datetime(["2031-04-02", "2031-04-03"])})
    >>> player_table(df)
      player_id       name     role hands  pa
    0        b1  Ada Quill   batter   L/R   2
    1        p1    Cy Moss  pitcher     R   1
    2        p2    Di Lark  pitcher     L   1
    """
    if isinstance(pas, PlateAppearances):
        t = pas.table
    else:
        t = as_table(pas)
    parts = []
    # the latest game's name; without dates, the alphabetically last one (deterministic)
    when = t.game_date if "game_date" in t.columns else None
    for role, (id_col, name_col, hand_col) in _ROLE_COLUMNS.items():
        name = t[name_col].argmax(when) if when is not None else t[name_col].max()
        last = when.max() if when is not None else t[name_col].max()
        by_hand = (
            t.group_by(player_id=t[id_col], hand=t[hand_col])
            .aggregate(pa=t.count(), name=name, last=last)
            .to_pandas()
        )
        if by_hand.empty:
            continue
        by_hand = by_hand.sort_values(["player_id", "last", "hand"], kind="stable")
        grouped = by_hand.groupby("player_id", sort=True)
        part = pd.DataFrame(
            {
                "name": grouped["name"].last(),  # the latest game's name
                "role": role,
                "hands": grouped["hand"].agg(lambda s: "/".join(sorted(set(s)))),
                "pa": grouped["pa"].sum().astype(np.int64),
            }
        )
        parts.append(part.rename_axis("player_id").reset_index())
    if not parts:
        return pd.DataFrame({c: pd.Series(dtype="int64" if c == "pa" else "str") for c in _PLAYER_COLUMNS})
    return pd.concat(parts, ignore_index=True)[_PLAYER_COLUMNS]


def _roster(pas: Any, role: str) -> pd.DataFrame:
    _role_columns(role)
    players = pas.players if isinstance(pas, PlateAppearances) else player_table(pas)
    return players[players["role"] == role].reset_index(drop=True)


def _describe(rows: pd.DataFrame) -> str:
    return ", ".join(f"{n} ({i}, {p:,} PA)" for i, n, p in zip(rows["player_id"], rows["name"], rows["pa"]))


def resolve_player(pas: Any, query: str, *, role: str) -> str:
    """Find one player's id from an id or a name.

    Tries, in order: an exact id; a case-insensitive exact name; a unique
    case-insensitive part of a name.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table
        Validated plate appearances.
    query : str
        An id, a full name or a unique part of a name.
    role : {"batter", "pitcher"}
        Which players to look among.

    Returns
    -------
    str
        The player's id.

    Raises
    ------
    DataError
        When no player matches (the closest names are listed) or several do (they are
        listed with ids).

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b2"], "pitcher_id": ["p1", "p1"],
    ...     "batter_name": ["Ada Quill", "Bo Reed"], "pitcher_name": ["Cy Moss"] * 2,
    ...     "batter_hand": ["L", "R"], "pitcher_hand": ["R", "R"],
    ...     "game_date": pd.to_datetime(["2031-04-02"] * 2)})
    >>> resolve_player(df, "quill", role="batter")
    'b1'
    >>> resolve_player(df, "b2", role="batter")
    'b2'
    """
    roster = _roster(pas, role)
    text = str(query).strip()
    ids = roster["player_id"].astype(str)
    hit = roster[ids == text]
    if len(hit) == 1:
        return str(hit["player_id"].iloc[0])
    names = roster["name"].astype(str).str.casefold()
    needle = text.casefold()
    for mask in (names == needle, names.str.contains(needle, regex=False)):
        hit = roster[mask.to_numpy()]
        if len(hit) == 1:
            return str(hit["player_id"].iloc[0])
        if len(hit) > 1:
            shown = hit.sort_values("pa", ascending=False).head(8)
            more = f" and {len(hit) - 8} more" if len(hit) > 8 else ""
            msg = f"{role} {text!r} matches {len(hit)} players: {_describe(shown)}{more}. Give the id instead."
            raise DataError(msg)
    # the closest spellings; when none is close, still the nearest few so the user has a lead
    candidates = list(names)
    close = difflib.get_close_matches(needle, candidates, n=5, cutoff=0.5) or difflib.get_close_matches(
        needle, candidates, n=3, cutoff=0.0
    )
    shown = roster[names.isin(close).to_numpy()]
    hint = f" Closest names: {_describe(shown)}." if len(shown) else ""
    msg = (
        f"No {role} matches {text!r} among {len(roster):,} {role}s.{hint} "
        "Give an id or a name from the data (search_players lists them)."
    )
    raise DataError(msg)


def search_players(pas: Any, text: str, *, role: str, limit: int = 20) -> pd.DataFrame:
    """Players whose id or name matches ``text``, best matches first, for pickers.

    Ranking: exact id, then names starting with the text, then names containing it,
    then close spellings; ties go to the player with more plate appearances. An
    empty ``text`` lists the players with the most plate appearances.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table
        Validated plate appearances.
    text : str
        What the user typed.
    role : {"batter", "pitcher"}
        Which players to search.
    limit : int, default 20
        At most this many rows.

    Returns
    -------
    pandas.DataFrame
        Columns ``player_id, name, hands, pa``.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b2"], "pitcher_id": ["p1", "p1"],
    ...     "batter_name": ["Ada Quill", "Bo Quimby"], "pitcher_name": ["Cy Moss"] * 2,
    ...     "batter_hand": ["L", "R"], "pitcher_hand": ["R", "R"],
    ...     "game_date": pd.to_datetime(["2031-04-02"] * 2)})
    >>> search_players(df, "qui", role="batter")["name"].tolist()
    ['Ada Quill', 'Bo Quimby']
    """
    roster = _roster(pas, role)
    needle = str(text).strip().casefold()
    names = roster["name"].astype(str).str.casefold()
    rank = pd.Series(np.full(len(roster), 9), index=roster.index)
    if needle:
        words = names.str.split()
        word_start = words.map(lambda ws: any(w.startswith(needle) for w in ws))
        rank[names.str.contains(needle, regex=False).to_numpy()] = 3
        rank[word_start.to_numpy(dtype=bool)] = 2
        rank[names.str.startswith(needle).to_numpy()] = 1
        rank[(roster["player_id"].astype(str).str.casefold() == needle).to_numpy()] = 0
        close = set(difflib.get_close_matches(needle, list(names), n=limit, cutoff=0.6))
        rank[(names.isin(close) & (rank == 9)).to_numpy()] = 4
        roster = roster[(rank < 9).to_numpy()]
        rank = rank[rank < 9]
    order = pd.DataFrame({"rank": rank.to_numpy(), "pa": -roster["pa"].to_numpy(), "i": np.arange(len(roster))})
    order = order.sort_values(["rank", "pa", "i"], kind="stable")
    out = roster.iloc[order["i"].to_numpy()].head(limit)
    return out[["player_id", "name", "hands", "pa"]].reset_index(drop=True)
