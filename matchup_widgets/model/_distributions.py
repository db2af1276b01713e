"""Outcome distributions by platoon split: count tables with rates beside them, and the
count cube (player x season x batter hand x pitcher hand x outcome) the estimator slices.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import HANDS, OUTCOMES, DataError, SPLITS

_HAND_INDEX = {h: i for i, h in enumerate(HANDS)}


def with_rates(counts: pd.DataFrame) -> pd.DataFrame:
    """Add a rate column ``<code>_rate`` beside each outcome count column.

    Parameters
    ----------
    counts : pandas.DataFrame
        A count table with one column per outcome code (and any key columns), as from
        ``outcome_counts`` or ``league_counts``.

    Returns
    -------
    pandas.DataFrame
        A copy with ``pa`` (recomputed from the codes when absent) and the rates; a row
        with no plate appearances gets NaN rates.

    Examples
    --------
    >>> counts = pd.DataFrame({c: [1 if c in ("K", "HR") else 0] for c in OUTCOMES})
    >>> with_rates(counts)[["K", "K_rate", "HR_rate", "pa"]].to_dict("records")
    [{'K': 1, 'K_rate': 0.5, 'HR_rate': 0.5, 'pa': 2}]
    """
    missing = [c for c in OUTCOMES if c not in counts.columns]
    if missing:
        msg = f"count table lacks outcome column(s) {missing[:5]}; build it with outcome_counts or league_counts."
        raise DataError(msg)
    out = counts.copy()
    n = out[list(OUTCOMES)].to_numpy(dtype=float).sum(axis=1)
    if "pa" not in out.columns:
        out["pa"] = n.astype(np.int64) if np.all(n == np.round(n)) else n
    with np.errstate(invalid="ignore", divide="ignore"):
        rates = out[list(OUTCOMES)].to_numpy(dtype=float) / np.where(n > 0, n, np.nan)[:, None]
    rate_frame = pd.DataFrame(rates, columns=[f"{c}_rate" for c in OUTCOMES], index=out.index)
    cols = list(out.columns)
    out = pd.concat([out, rate_frame], axis=1)
    # each rate right after its count
    order = []
    for c in cols:
        order.append(c)
        if c in OUTCOMES:
            order.append(f"{c}_rate")
    return out[order]


def outcome_distributions(pas: Any, *, role: str, seasons: tuple[int, int] | None = None) -> pd.DataFrame:
    """Each player's outcome counts and rates per platoon split, for a season range.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table or pandas.DataFrame
        Plate appearances.
    role : {"batter", "pitcher"}, keyword-only
        Whose distributions.
    seasons : (int, int), optional, keyword-only
        Inclusive season range; all seasons when None.

    Returns
    -------
    pandas.DataFrame
        ``player_id, batter_hand, pitcher_hand``, then each outcome count followed by its
        rate, then ``pa``.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b1"], "pitcher_id": ["p1", "p1"],
    ...     "batter_hand": ["L", "L"], "pitcher_hand": ["R", "R"],
    ...     "outcome": ["K", "1B"], "season": [2031, 2031]})
    >>> outcome_distributions(df, role="batter")[["player_id", "K", "K_rate", "pa"]]
      player_id  K  K_rate  pa
    0        b1  1     0.5   2
    """
    from matchup_widgets.data import outcome_counts

    return with_rates(outcome_counts(pas, role=role, seasons=seasons))


def league_distributions(pas: Any, *, seasons: tuple[int, int] | None = None) -> pd.DataFrame:
    """League outcome counts and rates in each of the four platoon splits.

    Parameters
    ----------
    pas : PlateAppearances or ibis.Table or pandas.DataFrame
        Plate appearances.
    seasons : (int, int), optional, keyword-only
        Inclusive season range; all seasons when None.

    Returns
    -------
    pandas.DataFrame
        Four rows in ``SPLITS`` order: ``batter_hand, pitcher_hand``, counts with rates, ``pa``.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b2"], "pitcher_id": ["p1", "p1"],
    ...     "batter_hand": ["L", "R"], "pitcher_hand": ["R", "R"],
    ...     "outcome": ["K", "1B"], "season": [2031, 2031]})
    >>> league_distributions(df)[["batter_hand", "pitcher_hand", "K_rate", "pa"]]
      batter_hand pitcher_hand  K_rate  pa
    0           L            L     NaN   0
    1           L            R     1.0   1
    2           R            L     NaN   0
    3           R            R     0.0   1
    """
    from matchup_widgets.data import league_counts

    return with_rates(league_counts(pas, seasons=seasons))


@dataclass(frozen=True)
class CountCube:
    """Counts per player, season, batter hand, pitcher hand and outcome (private to the model).

    ``counts[i, s, bh, ph, k]``: plate appearances of player ``ids[i]`` in season
    ``seasons[s]`` with the batter hitting from ``HANDS[bh]`` against a pitcher throwing
    ``HANDS[ph]`` that ended in ``OUTCOMES[k]``.
    """

    ids: np.ndarray
    seasons: np.ndarray
    counts: np.ndarray
    index: dict[str, int]
    by_season: bool = True

    @classmethod
    def from_table(cls, table: pd.DataFrame) -> CountCube:
        """Build from an ``outcome_counts(..., by_season=True)`` table (vectorised scatter-add)."""
        ids, player_idx = _factorize(table["player_id"].astype(str).to_numpy())
        by_season = "season" in table.columns
        if by_season:
            seasons, season_idx = _factorize(table["season"].to_numpy(dtype=np.int64))
        else:
            seasons, season_idx = np.array([0]), np.zeros(len(table), dtype=np.intp)
        bh = _hand_index(table["batter_hand"], "batter_hand")
        ph = _hand_index(table["pitcher_hand"], "pitcher_hand")
        cube = np.zeros((len(ids), len(seasons), len(HANDS), len(HANDS), len(OUTCOMES)))
        np.add.at(cube, (player_idx, season_idx, bh, ph), table[list(OUTCOMES)].to_numpy(dtype=float))
        return cls(
            ids=ids,
            seasons=seasons,
            counts=cube,
            index={str(p): i for i, p in enumerate(ids)},
            by_season=by_season,
        )

    def season_mask(self, seasons: tuple[int, int] | None) -> np.ndarray:
        """Boolean mask over ``self.seasons`` for an inclusive range (all when None).

        A cube built without seasons (already filtered when it was counted) is all True.
        """
        if seasons is None or not self.by_season:
            return np.ones(len(self.seasons), dtype=bool)
        first, last = seasons
        return (self.seasons >= first) & (self.seasons <= last)

    def player(self, player_id: str, mask: np.ndarray) -> np.ndarray:
        """Counts (2, 2, 9) of one player summed over the masked seasons."""
        return self.counts[self.index[player_id]][mask].sum(axis=0)

    def league(self, mask: np.ndarray) -> np.ndarray:
        """League counts (2, 2, 9) summed over players and masked seasons."""
        return self.counts[:, mask].sum(axis=(0, 1))

    def hand_totals(self, player_id: str) -> np.ndarray:
        """Plate appearances (2, 2) by batter hand and pitcher hand over all seasons."""
        return self.counts[self.index[player_id]].sum(axis=(0, 3))


def _factorize(values: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    uniques, inverse = np.unique(values, return_inverse=True)
    return uniques, inverse


def _hand_index(column: pd.Series, name: str) -> np.ndarray:
    values = column.astype(str).to_numpy()
    bad = ~np.isin(values, list(HANDS))
    if np.any(bad):
        examples = sorted(set(values[bad].tolist()))[:5]
        msg = f"column {name!r} has {int(bad.sum())} value(s) other than L/R (e.g. {examples}); map them at load."
        raise DataError(msg)
    return (values == HANDS[1]).astype(np.intp)


def split_label(batter_hand: str, pitcher_hand: str) -> str:
    """A short label for a platoon split, e.g. ``"L vs R"`` (batter side vs pitcher hand).

    Examples
    --------
    >>> split_label("L", "R")
    'L vs R'
    """
    if (batter_hand, pitcher_hand) not in SPLITS:
        msg = f"platoon split must be one of {SPLITS}; got ({batter_hand!r}, {pitcher_hand!r})."
        raise ValueError(msg)
    return f"{batter_hand} vs {pitcher_hand}"
