"""Honest splits of plate appearances and their collapse into scoring cells.

A held-out set is made of whole games, so no game contributes both to the distributions a
prediction is built from and to the outcomes it is scored on. Held-out PAs that share a
batter, a pitcher and a platoon split share one prediction, so they are scored together as a
*cell* with outcome counts: the Brier score of a cell of ``n`` PAs only needs ``n`` and the
count vector (see :func:`~matchup_widgets.model.brier_score`).
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..data import OUTCOMES, DataError

__all__ = ["CELL_KEYS", "collapse_cells", "split_games", "split_last_season"]

#: Columns that identify a scoring cell: one batter against one pitcher in one platoon split.
CELL_KEYS: tuple[str, ...] = ("batter_id", "pitcher_id", "batter_hand", "pitcher_hand")


def split_games(game_ids, *, holdout_share: float = 0.25, seed: int = 0) -> np.ndarray:
    """Mark a seeded random share of whole games as held out.

    Parameters
    ----------
    game_ids : array-like, shape (n_pa,)
        Game key of each plate appearance.
    holdout_share : float, default 0.25
        Share of distinct games to hold out, strictly between 0 and 1. The number of
        held-out games is rounded and kept between 1 and ``n_games - 1``.
    seed : int, default 0
        Seed of the random choice; the same seed and games give the same split.

    Returns
    -------
    numpy.ndarray of bool, shape (n_pa,)
        True for PAs of held-out games.

    Raises
    ------
    ValueError
        If the share is outside (0, 1) or there are fewer than two games.

    Examples
    --------
    >>> held = split_games(["g1", "g1", "g2", "g3", "g4"], holdout_share=0.5, seed=1)
    >>> bool(held[0] == held[1]), int(held.sum()) in (2, 3)  # whole games, two of four
    (True, True)
    """
    share = float(holdout_share)
    if not 0.0 < share < 1.0:
        msg = (
            f"holdout_share must lie strictly between 0 and 1; got {holdout_share}. "
            "Use e.g. 0.25 to hold out a quarter of the games."
        )
        raise ValueError(msg)
    # sorted codes: the split depends on the set of game ids, not on the row order
    inverse, uniq = pd.factorize(pd.Series(np.asarray(game_ids, dtype=object)).astype(str), sort=True)
    n_games = len(uniq)
    if n_games < 2:
        msg = (
            f"a held-out split needs at least 2 games; the table has {n_games}. "
            "Pass a larger table, or score on a separate one (score=...)."
        )
        raise ValueError(msg)
    n_hold = int(min(max(round(share * n_games), 1), n_games - 1))
    rng = np.random.default_rng(seed)
    held_games = np.zeros(n_games, dtype=bool)
    held_games[rng.permutation(n_games)[:n_hold]] = True
    return held_games[inverse]


def split_last_season(seasons) -> np.ndarray:
    """Mark the PAs of the latest season as held out (fit on earlier seasons, score on the last).

    Parameters
    ----------
    seasons : array-like of int, shape (n_pa,)
        Season of each plate appearance.

    Returns
    -------
    numpy.ndarray of bool, shape (n_pa,)

    Raises
    ------
    ValueError
        If there is only one season.

    Examples
    --------
    >>> split_last_season([2031, 2032, 2032]).tolist()
    [False, True, True]
    """
    s = np.asarray(seasons)
    uniq = np.unique(s)
    if uniq.size < 2:
        msg = (
            f"a season-forward split needs at least 2 seasons; the table has {uniq.size} "
            f"({', '.join(map(str, uniq[:5]))}). Use a random share of games instead."
        )
        raise ValueError(msg)
    return s == uniq[-1]


def collapse_cells(
    frame: pd.DataFrame,
    *,
    keys: tuple[str, ...] | list[str] = CELL_KEYS,
    return_inverse: bool = False,
):
    """Count outcomes per unique key combination (by default batter x pitcher x split).

    Parameters
    ----------
    frame : pandas.DataFrame
        Plate appearances with the ``keys`` columns and an ``outcome`` column of codes.
    keys : sequence of str, keyword-only
        Columns that define a cell.
    return_inverse : bool, default False
        Also return, for each row of ``frame``, the position of its cell.

    Returns
    -------
    cells : pandas.DataFrame
        The key columns, one count column per outcome code (``OUTCOMES`` order) and ``pa``;
        one row per cell, sorted by the keys.
    inverse : numpy.ndarray of int, shape (len(frame),)
        Only with ``return_inverse``.

    Raises
    ------
    DataError
        If a key column or ``outcome`` is missing, or an outcome code is unknown.

    Examples
    --------
    >>> pas = pd.DataFrame({"batter_id": ["b1", "b1", "b2"], "pitcher_id": ["p1", "p1", "p1"],
    ...                     "batter_hand": ["L", "L", "R"], "pitcher_hand": ["R", "R", "R"],
    ...                     "outcome": ["K", "1B", "K"]})
    >>> cells = collapse_cells(pas)
    >>> cells[["batter_id", "K", "1B", "pa"]].to_numpy().tolist()
    [['b1', 1, 1, 2], ['b2', 1, 0, 1]]
    """
    keys = list(keys)
    missing = [c for c in [*keys, "outcome"] if c not in frame.columns]
    if missing:
        msg = (
            f"collapse_cells needs column(s) {missing}; the table has "
            f"{list(frame.columns)[:12]}. Load it with matchup_widgets.data.load_pas."
        )
        raise DataError(msg)
    codes = pd.Index(list(OUTCOMES)).get_indexer(frame["outcome"].astype(str)).astype(np.intp)
    bad = np.flatnonzero(codes < 0)
    if bad.size:
        examples = pd.unique(frame["outcome"].to_numpy()[bad])[:5]
        msg = (
            f"column 'outcome' has {bad.size} row(s) with codes outside OUTCOMES "
            f"(e.g. {', '.join(map(repr, examples))}); map or drop them at load."
        )
        raise DataError(msg)
    grouped = frame.groupby(keys, sort=True, dropna=False)
    cell = grouped.ngroup().to_numpy()
    cells = grouped.size().index.to_frame(index=False)
    n_cells, n_out = len(cells), len(OUTCOMES)
    counts = np.bincount(cell * n_out + codes, minlength=n_cells * n_out).reshape(n_cells, n_out)
    for k, code in enumerate(OUTCOMES):
        cells[code] = counts[:, k]
    cells["pa"] = counts.sum(axis=1)
    if return_inverse:
        return cells, cell
    return cells
