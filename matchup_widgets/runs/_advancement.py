"""Advancement tables: for each outcome, where the runners go and how many runs score.

A table holds two dense arrays shaped ``(n_outcomes, 25, 25)``: ``T[o, s, t]`` is the
probability that outcome ``o`` in state ``s`` leaves state ``t`` and ``R[o, s, t]`` the
runs that score on that move. The Markov chain for an outcome distribution ``p`` is then
``sum_o p[o] * T[o]``, which keeps every computation a small tensor product.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Any, Mapping

import numpy as np
import pandas as pd

from ..data import OUTCOMES, DataError
from ..data import ON_BASE as _ON_BASE
from ._default_table import build_default_arrays, hit_arrays
from ._states import END, N_STATES, N_TRANSIENT

#: Default minimum number of plate appearances in an (outcome, state) cell before an
#: estimated table uses the data instead of the default row.
MIN_COUNT: int = 30


@dataclass(frozen=True, eq=False)
class AdvancementTable:
    """Transition probabilities and runs for each outcome from each base-out state.

    Parameters
    ----------
    outcomes : tuple of str
        Outcome names, one per row of ``transitions``; the first nine are ``OUTCOMES``.
    transitions : ndarray, shape (n_outcomes, 25, 25)
        ``transitions[o, s, t]``: probability of moving from state ``s`` to ``t``.
    runs : ndarray, shape (n_outcomes, 25, 25)
        Runs scored on that move (a mean when estimated from data).
    on_base : tuple of str
        Outcomes in which the batter reaches base (numerator of on-base percentage).
    counts : ndarray of int, shape (n_outcomes, 24), optional
        Plate appearances behind each (outcome, state) row when estimated from data.
    from_data : ndarray of bool, shape (n_outcomes, 24), optional
        Which rows came from data (the others fell back to the default).
    n_skipped : int
        Rows of the data left out because a base-out value was missing.
    """

    outcomes: tuple[str, ...]
    transitions: np.ndarray
    runs: np.ndarray
    on_base: tuple[str, ...] = _ON_BASE
    counts: np.ndarray | None = None
    from_data: np.ndarray | None = None
    n_skipped: int = 0

    def __post_init__(self) -> None:
        # Own float copies, frozen below, so a caller's arrays are never changed.
        object.__setattr__(self, "transitions", np.array(self.transitions, dtype=float))
        object.__setattr__(self, "runs", np.array(self.runs, dtype=float))
        object.__setattr__(self, "outcomes", tuple(self.outcomes))
        object.__setattr__(self, "on_base", tuple(self.on_base))
        k = len(self.outcomes)
        for name, arr in (("transitions", self.transitions), ("runs", self.runs)):
            if arr.shape != (k, N_STATES, N_STATES):
                msg = (
                    f"AdvancementTable.{name} must be shaped ({k}, {N_STATES}, {N_STATES}) "
                    f"for {k} outcomes; got {arr.shape}."
                )
                raise ValueError(msg)
        sums = self.transitions[:, :N_TRANSIENT].sum(axis=2)
        bad = np.argwhere(np.abs(sums - 1.0) > 1e-9)
        if len(bad):
            examples = ", ".join(f"{self.outcomes[o]} from state {s}" for o, s in bad[:5])
            msg = (
                f"AdvancementTable.transitions: {len(bad)} row(s) do not sum to 1 "
                f"({examples}). Each (outcome, state) row must be a probability distribution."
            )
            raise ValueError(msg)
        if (self.transitions < 0).any() or (self.runs < 0).any():
            msg = "AdvancementTable: transitions and runs must be non-negative."
            raise ValueError(msg)
        step = (self.transitions * self.runs).sum(axis=2)[:, :N_TRANSIENT]
        object.__setattr__(self, "_step_runs", step)
        for arr in (self.transitions, self.runs, step):
            arr.setflags(write=False)

    @property
    def expected_step_runs(self) -> np.ndarray:
        """Expected runs on the play, ``sum_t T[o, s, t] R[o, s, t]``, shape (n_outcomes, 24)."""
        return self._step_runs  # type: ignore[attr-defined]

    @property
    def on_base_mask(self) -> np.ndarray:
        """Boolean mask over ``outcomes``: the batter reaches base."""
        return np.array([o in self.on_base for o in self.outcomes])

    def with_extra_rows(
        self,
        rows: Mapping[str, tuple[Any, Any]],
        *,
        on_base: tuple[str, ...] | list[str] = (),
    ) -> AdvancementTable:
        """Return a new table with extra outcome rows (for example tiered hits).

        Parameters
        ----------
        rows : mapping of str to (T, R)
            New outcome name -> ``(transitions, runs)``, each shaped ``(25, 25)``.
            ``R`` may be ``None`` to count runs with the runs-scored identity.
        on_base : sequence of str
            Which of the new names count as reaching base.

        Returns
        -------
        AdvancementTable

        Examples
        --------
        >>> table = default_advancement()
        >>> soft = table.row("1B")  # start from the single's row
        >>> bigger = table.with_extra_rows({"1B_soft": soft}, on_base=["1B_soft"])
        >>> bigger.outcomes[-1], bigger.transitions.shape
        ('1B_soft', (10, 25, 25))
        """
        names = list(rows)
        clash = [n for n in names if n in self.outcomes]
        if clash:
            msg = f"with_extra_rows: outcome name(s) {clash[:5]} already in the table; pick new names."
            raise ValueError(msg)
        unknown = [n for n in on_base if n not in names]
        if unknown:
            msg = f"with_extra_rows: on_base names {unknown[:5]} are not among the new rows {names[:5]}."
            raise ValueError(msg)
        new_t, new_r = [], []
        for name in names:
            t, r = rows[name]
            t = np.array(t, dtype=float)
            if t.shape != (N_STATES, N_STATES):
                msg = f"with_extra_rows: transitions for {name!r} must be (25, 25); got {t.shape}."
                raise ValueError(msg)
            t[END] = 0.0
            t[END, END] = 1.0
            r = identity_runs() * (np.arange(N_STATES) < END) if r is None else np.array(r, dtype=float)
            new_t.append(t)
            new_r.append(r)
        counts = self.counts
        from_data = self.from_data
        if counts is not None:
            counts = np.vstack([counts, np.zeros((len(names), N_TRANSIENT), dtype=counts.dtype)])
        if from_data is not None:
            from_data = np.vstack([from_data, np.zeros((len(names), N_TRANSIENT), dtype=bool)])
        return AdvancementTable(
            outcomes=self.outcomes + tuple(names),
            transitions=np.concatenate([self.transitions, np.stack(new_t)]),
            runs=np.concatenate([self.runs, np.stack(new_r)]),
            on_base=self.on_base + tuple(on_base),
            counts=counts,
            from_data=from_data,
            n_skipped=self.n_skipped,
        )

    def row(self, outcome: str) -> tuple[np.ndarray, np.ndarray]:
        """Return copies of ``(T, R)`` for one outcome, each shaped ``(25, 25)``.

        Examples
        --------
        >>> t, r = default_advancement().row("HR")
        >>> float(r[0, 0])  # solo home run from empty bases, 0 outs
        1.0
        """
        if outcome not in self.outcomes:
            msg = f"outcome {outcome!r} is not in this table; it has {list(self.outcomes)}."
            raise KeyError(msg)
        i = self.outcomes.index(outcome)
        return self.transitions[i].copy(), self.runs[i].copy()


def _by_outs(value: Any, name: str) -> tuple[float, float, float] | None:
    if value is None:
        return None
    arr = np.asarray(value, dtype=float)
    if arr.ndim == 0:
        arr = np.full(3, float(arr))
    if arr.shape != (3,) or not ((arr >= 0) & (arr <= 1)).all():
        msg = (
            f"{name} must be a probability in [0, 1] or three of them (for 0, 1 and 2 outs); "
            f"got {value!r}."
        )
        raise ValueError(msg)
    return (float(arr[0]), float(arr[1]), float(arr[2]))


def hit_row(
    code: str,
    *,
    scores_from_second: Any = None,
    first_to_third: Any = None,
    scores_from_first: Any = None,
) -> tuple[np.ndarray, np.ndarray]:
    """Advancement ``(T, R)`` for a single or double with its own runner-advance shares.

    Meant for extra rows such as soft and hard singles (see
    :meth:`AdvancementTable.with_extra_rows`); options left out keep the default table's
    common-practice values. Each share is one probability or three (for 0, 1, 2 outs).

    Parameters
    ----------
    code : {"1B", "2B"}
    scores_from_second : float or sequence of 3, optional
        Single: runner on second scores (otherwise stops at third).
    first_to_third : float or sequence of 3, optional
        Single: runner on first takes third when it is free (otherwise second).
    scores_from_first : float or sequence of 3, optional
        Double: runner on first scores (otherwise stops at third).

    Returns
    -------
    (ndarray, ndarray)
        Transitions and runs, each shaped (25, 25).

    Examples
    --------
    >>> t, r = hit_row("1B", scores_from_second=0.3)
    >>> float(t[2, 1]), float(r[2, 1])  # runner on 2nd, 0 outs: scores 30% of the time
    (0.3, 1.0)
    """
    if code == "1B":
        if scores_from_first is not None:
            msg = "scores_from_first applies to doubles ('2B'), not singles."
            raise ValueError(msg)
    elif code == "2B":
        if scores_from_second is not None or first_to_third is not None:
            msg = "scores_from_second and first_to_third apply to singles ('1B'), not doubles."
            raise ValueError(msg)
    else:
        msg = (
            f"hit_row builds rows for '1B' or '2B'; got {code!r}. Copy other rows with "
            f"AdvancementTable.row."
        )
        raise ValueError(msg)
    return hit_arrays(
        code,
        _by_outs(scores_from_second, "scores_from_second"),
        _by_outs(first_to_third, "first_to_third"),
        _by_outs(scores_from_first, "scores_from_first"),
    )


@lru_cache(maxsize=1)
def identity_runs() -> np.ndarray:
    """Runs implied by the runs-scored identity for each (from, to) pair, shape (25, 25).

    ``runs = (runners before + outs before + 1) - (runners after + outs after)``
    (common practice: every batter ends the play scored, out or on base). Pairs with a
    negative value cannot happen and get 0; moves into the three-out state get 0 here.

    Examples
    --------
    >>> float(identity_runs()[7, 0])  # bases loaded, 0 outs -> bases empty, 0 outs: a grand slam
    4.0
    """
    from ._states import STATE_OUTS, STATE_RUNNERS

    before = STATE_RUNNERS + STATE_OUTS + 1
    after = STATE_RUNNERS + STATE_OUTS
    runs = before[:, None] - after[None, :]
    runs = np.clip(runs, 0, None).astype(float)
    runs[:, END] = 0.0
    runs.setflags(write=False)
    return runs


@lru_cache(maxsize=1)
def default_advancement() -> AdvancementTable:
    """Return the default advancement table (common-practice values for each outcome).

    Returns
    -------
    AdvancementTable
        Rows in ``OUTCOMES`` order.

    Examples
    --------
    >>> table = default_advancement()
    >>> table.outcomes[:3]
    ('K', 'BB', 'HBP')
    >>> float(table.transitions[3, 2].sum())  # single from runner on 2nd, 0 outs
    1.0
    """
    trans, runs = build_default_arrays()
    return AdvancementTable(outcomes=OUTCOMES, transitions=trans, runs=runs)


_CELL_KEYS: tuple[str, ...] = ("outcome", "outs_before", "bases_before", "outs_after", "bases_after")


def _cells(data: Any) -> tuple[pd.DataFrame, int]:
    """Count plays per (outcome, before, after) cell: columns of ``_CELL_KEYS`` + n, runs.

    A DataFrame is counted in pandas; loaded plate appearances or an ibis table are
    counted by their engine (only the small cell table comes back). Rows with a missing
    base-out value are left out; their number is returned beside the cells.
    """
    table = getattr(data, "table", data)
    is_frame = isinstance(table, pd.DataFrame)
    if not is_frame and not hasattr(table, "group_by"):
        msg = (
            f"estimate_advancement expects a pandas DataFrame, loaded plate appearances or an "
            f"ibis table; got {type(data).__name__}."
        )
        raise TypeError(msg)
    columns = list(table.columns)
    needed = (*_CELL_KEYS, "runs_on_play")
    missing = [c for c in needed if c not in columns]
    if missing:
        msg = (
            f"estimate_advancement needs the column(s) {missing}; the data has "
            f"{columns[:12]}. Map your column names when loading, or use default_advancement()."
        )
        raise DataError(msg)
    # Bases after a third out carry no information (every runner is stranded), so a
    # missing value there is not a gap: without this, inning-ending plays (double plays
    # with one out among them) would be left out and the table would lean to live plays.
    if is_frame:
        rows = table[list(needed)]
        ended = pd.to_numeric(rows["outs_after"], errors="coerce").ge(3).fillna(False).to_numpy(dtype=bool)
        rows = rows.assign(bases_after=rows["bases_after"].mask(ended, 0))
        complete = rows.notna().all(axis=1)
        rows = rows[complete]
        cells = rows[list(_CELL_KEYS)].assign(
            n=1, runs=rows["runs_on_play"].to_numpy(dtype=float)
        )
        return cells, int((~complete).sum())
    n_all = int(table.count().execute())
    table = table.mutate(bases_after=(table.outs_after >= 3).ifelse(0, table.bases_after))
    kept = table.filter([table[c].notnull() for c in needed])
    cells = (
        kept.group_by(list(_CELL_KEYS))
        .aggregate(
            n=kept.count(),
            runs=kept.runs_on_play.sum(),
            runs_min=kept.runs_on_play.min(),
            runs_max=kept.runs_on_play.max(),
        )
        .to_pandas()
    )
    return cells, n_all - int(cells["n"].sum())


def _check_range(cells: pd.DataFrame, column: str, lo: int, hi: int) -> np.ndarray:
    values = cells[column].to_numpy(dtype=float)
    bad = ~((values >= lo) & (values <= hi) & (values == np.round(values)))
    if bad.any():
        examples = ", ".join(map(str, pd.unique(values[bad])[:5]))
        msg = (
            f"column {column!r} has {int(cells['n'].to_numpy()[bad].sum())} row(s) outside the "
            f"whole numbers {lo}-{hi} (e.g. {examples}). Fix or drop those rows before "
            f"estimating advancement."
        )
        raise DataError(msg)
    return values.astype(int)


def estimate_advancement(data: Any, *, min_count: int = MIN_COUNT) -> AdvancementTable:
    """Estimate the advancement table from plate appearances with base-out columns.

    Each (outcome, base-out state) row with at least ``min_count`` plate appearances uses
    the observed share of each resulting state and the mean runs on those plays; rarer
    rows fall back to :func:`default_advancement`. Rows missing any base-out value are
    left out and counted in the returned table's ``n_skipped``, except ``bases_after``
    on a play that makes the third out, which is not needed. Loaded plate appearances
    and ibis tables are counted by their engine.

    Parameters
    ----------
    data : DataFrame, PlateAppearances or ibis.Table
        Needs ``outcome`` and the base-out columns ``outs_before``, ``bases_before``,
        ``outs_after``, ``bases_after``, ``runs_on_play``.
    min_count : int, default 30
        Plate appearances needed in a cell before the data replaces the default.

    Returns
    -------
    AdvancementTable
        With ``counts`` (PAs per outcome and starting state) and ``from_data``.

    Raises
    ------
    DataError
        A column is missing, an outcome code is unknown, or a value is out of range.

    Examples
    --------
    >>> rows = pd.DataFrame({"outcome": ["HR"] * 40, "outs_before": 0, "bases_before": 1,
    ...                      "outs_after": 0, "bases_after": 0, "runs_on_play": 2})
    >>> table = estimate_advancement(rows)
    >>> int(table.counts[6, 1]), bool(table.from_data[6, 1])
    (40, True)
    """
    if min_count < 1:
        msg = f"min_count must be at least 1; got {min_count}."
        raise ValueError(msg)
    cells, n_skipped = _cells(data)
    weight = cells["n"].to_numpy(dtype=float)
    # Factorise first: only the few distinct codes are looked up as strings.
    inverse, uniques = pd.factorize(cells["outcome"])
    index = pd.Index(OUTCOMES).get_indexer(pd.Index(uniques).astype(str))[inverse]
    if (index < 0).any():
        bad = pd.unique(np.asarray(uniques, dtype=object)[inverse[index < 0]])
        msg = (
            f"column 'outcome' has {int(weight[index < 0].sum())} row(s) with codes outside "
            f"{list(OUTCOMES)} (e.g. {list(bad[:5])}). Map or drop them when loading."
        )
        raise DataError(msg)
    outs_b = _check_range(cells, "outs_before", 0, 2)
    bases_b = _check_range(cells, "bases_before", 0, 7)
    outs_a = _check_range(cells, "outs_after", 0, 3)
    bases_a = _check_range(cells, "bases_after", 0, 7)
    runs_sum = cells["runs"].to_numpy(dtype=float)
    for extreme in ("runs_min", "runs_max"):  # per-row extremes of each engine-side cell
        per_row = cells[extreme] if extreme in cells else cells["runs"]
        _check_range(cells.assign(runs_on_play=per_row), "runs_on_play", 0, 4)
    backwards = outs_a < outs_b
    if backwards.any():
        msg = (
            f"{int(weight[backwards].sum())} row(s) have outs_after < outs_before. Outs never "
            f"go down within an inning; fix or drop those rows."
        )
        raise DataError(msg)

    src = outs_b * 8 + bases_b
    dst = np.where(outs_a >= 3, END, outs_a * 8 + bases_a)
    k = len(OUTCOMES)
    flat = (index * N_STATES + src) * N_STATES + dst
    size = k * N_STATES * N_STATES
    cell_n = np.bincount(flat, weights=weight, minlength=size).reshape(k, N_STATES, N_STATES)
    cell_runs = np.bincount(flat, weights=runs_sum, minlength=size).reshape(cell_n.shape)
    row_n = cell_n.sum(axis=2)[:, :N_TRANSIENT]
    use = row_n >= min_count

    default = default_advancement()
    trans = default.transitions.copy()
    runs = default.runs.copy()
    with np.errstate(invalid="ignore", divide="ignore"):
        observed_t = cell_n[:, :N_TRANSIENT] / row_n[:, :, None]
        observed_r = np.where(cell_n > 0, cell_runs / np.maximum(cell_n, 1), runs)
    trans[:, :N_TRANSIENT] = np.where(use[:, :, None], observed_t, trans[:, :N_TRANSIENT])
    runs[:, :N_TRANSIENT] = np.where(use[:, :, None], observed_r[:, :N_TRANSIENT], runs[:, :N_TRANSIENT])
    return AdvancementTable(
        outcomes=OUTCOMES,
        transitions=trans,
        runs=runs,
        counts=np.rint(row_n).astype(np.int64),
        from_data=use,
        n_skipped=n_skipped,
    )
