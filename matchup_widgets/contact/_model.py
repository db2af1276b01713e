"""Contact-expected outcomes: P(outcome | exit velocity, launch angle) over batted balls.

Two candidate models are fitted on the same balls and compared on a held-out share of
whole games by multiclass log loss; the better one is kept:

* ``"boosting"``: scikit-learn's HistGradientBoostingClassifier on the two measurements;
* ``"grid"``: a fine two-dimensional lookup (2 mph x 2 degree cells) whose outcome counts
  are smoothed with a Gaussian kernel across neighbouring cells and then pulled toward
  the league mix by one pseudo-ball.

The coarse bucket grid of :func:`bucket_shares` with per-bucket outcome frequencies is
scored too, as the baseline both candidates should beat.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from matchup_widgets.data import BATTED, DataError

from ._cache import dataset_cache
from ._buckets import EV_EDGES, LA_EDGES, bucket_index
from ._frames import batted_rows, frame_of, measured_mask, outcome_index

_K = len(BATTED)
_EPS = 1e-15  # probability floor for log loss, as in sklearn.metrics.log_loss
_MIN_BALLS = 200


def multiclass_log_loss(probs: np.ndarray, y: np.ndarray) -> float:
    """Mean negative log probability of the observed class (natural log).

    Examples
    --------
    >>> round(multiclass_log_loss(np.array([[0.5, 0.5], [0.9, 0.1]]), np.array([0, 0])), 6)
    0.399254
    """
    p = np.clip(probs[np.arange(len(y)), y], _EPS, 1.0)
    return float(-np.mean(np.log(p)))


def _cell_counts(cells: np.ndarray, y: np.ndarray, n_cells: int) -> np.ndarray:
    return np.bincount(cells * _K + y, minlength=n_cells * _K).reshape(n_cells, _K).astype(float)


def _pull_to_prior(counts: np.ndarray, prior: np.ndarray, alpha: float) -> np.ndarray:
    """``(counts + alpha * prior) / (n + alpha)`` per cell; an empty cell without prior gets the prior."""
    denom = counts.sum(axis=1, keepdims=True) + alpha
    with np.errstate(invalid="ignore", divide="ignore"):
        table = (counts + alpha * prior) / denom
    return np.where(denom > 0, table, prior)


class _BucketLookup:
    """Outcome frequencies per coarse bucket, pulled toward the league mix by ``alpha`` balls."""

    def __init__(self, ev_edges: Sequence[float], la_edges: Sequence[float], alpha: float = 1.0):
        self.ev_edges, self.la_edges, self.alpha = ev_edges, la_edges, alpha

    def fit(self, ev: np.ndarray, la: np.ndarray, y: np.ndarray) -> _BucketLookup:
        cells = bucket_index(ev, la, ev_edges=self.ev_edges, la_edges=self.la_edges)
        n_cells = (len(self.ev_edges) + 1) * (len(self.la_edges) + 1)
        counts = _cell_counts(cells, y, n_cells)
        prior = np.bincount(y, minlength=_K) / len(y)
        self.table_ = _pull_to_prior(counts, prior, self.alpha)
        return self

    def predict_proba(self, ev: np.ndarray, la: np.ndarray) -> np.ndarray:
        cells = bucket_index(ev, la, ev_edges=self.ev_edges, la_edges=self.la_edges)
        return self.table_[cells]


def _gauss_matrix(n: int, sigma: float) -> np.ndarray:
    """Row-normalised Gaussian smoothing matrix over ``n`` cells (edges renormalised)."""
    idx = np.arange(n)
    w = np.exp(-0.5 * ((idx[:, None] - idx[None, :]) / sigma) ** 2)
    return w / w.sum(axis=1, keepdims=True)


class _SmoothedGrid:
    """Fine grid of outcome counts, Gaussian-smoothed over cells, plus a league pseudo-ball."""

    EV_RANGE = (40.0, 120.0)
    LA_RANGE = (-60.0, 80.0)

    def __init__(self, step: tuple[float, float] = (2.0, 2.0), sigma: float = 1.5, alpha: float = 1.0):
        self.step, self.sigma, self.alpha = step, sigma, alpha

    def _cells(self, ev: np.ndarray, la: np.ndarray) -> np.ndarray:
        (e0, e1), (a0, a1) = self.EV_RANGE, self.LA_RANGE
        n_ev = int(np.ceil((e1 - e0) / self.step[0]))
        n_la = int(np.ceil((a1 - a0) / self.step[1]))
        i = np.clip(((ev - e0) // self.step[0]).astype(np.int64), 0, n_ev - 1)
        j = np.clip(((la - a0) // self.step[1]).astype(np.int64), 0, n_la - 1)
        self.shape_ = (n_ev, n_la)
        return i * n_la + j

    def fit(self, ev: np.ndarray, la: np.ndarray, y: np.ndarray) -> _SmoothedGrid:
        cells = self._cells(ev, la)
        n_ev, n_la = self.shape_
        counts = _cell_counts(cells, y, n_ev * n_la).reshape(n_ev, n_la, _K)
        # separable Gaussian smoothing: C'[a, b, k] = sum_ij S_ev[a, i] S_la[b, j] C[i, j, k]
        along_ev = np.tensordot(_gauss_matrix(n_ev, self.sigma), counts, axes=(1, 0))
        smooth = (_gauss_matrix(n_la, self.sigma) @ along_ev).reshape(n_ev * n_la, _K)
        prior = np.bincount(y, minlength=_K) / len(y)
        self.table_ = _pull_to_prior(smooth, prior, self.alpha)
        return self

    def predict_proba(self, ev: np.ndarray, la: np.ndarray) -> np.ndarray:
        return self.table_[self._cells(ev, la)]


def _threads(n: int | None) -> Any:
    """Limit OpenMP threads: on a busy shared machine one thread beats oversubscription."""
    from contextlib import nullcontext

    if n is None:
        return nullcontext()
    from threadpoolctl import threadpool_limits

    return threadpool_limits(limits=int(n), user_api="openmp")


class _Boosting:
    """HistGradientBoostingClassifier kept small enough for ~250k balls on two cores.

    The fitted trees split only at the histogram bin edges of each feature, so the model is
    constant on every (exit-velocity bin, launch-angle bin) cell. After fitting, the
    probabilities of every cell are computed once (one prediction at each cell's upper
    edge, which meets every split the same way as any value in the cell); predicting is
    then a table lookup, exact and fast enough for a click in a dashboard.
    """

    def __init__(self, *, max_iter: int, random_state: int, n_threads: int | None):
        self.max_iter, self.random_state, self.n_threads = max_iter, random_state, n_threads

    def fit(self, ev: np.ndarray, la: np.ndarray, y: np.ndarray) -> _Boosting:
        from sklearn.ensemble import HistGradientBoostingClassifier

        # early stopping holds out a stratified share, which needs a few balls of every
        # outcome present; with rarer outcomes run a short fixed number of rounds instead
        present = np.bincount(y)
        stop_early = present[present > 0].min() >= 10
        self.model_ = HistGradientBoostingClassifier(
            learning_rate=0.1,
            max_iter=self.max_iter if stop_early else min(self.max_iter, 40),
            max_leaf_nodes=15,
            min_samples_leaf=40,
            l2_regularization=1.0,
            early_stopping=bool(stop_early),
            validation_fraction=0.15,
            n_iter_no_change=8,
            random_state=self.random_state,
        )
        with _threads(self.n_threads):
            self.model_.fit(np.column_stack([ev, la]), y)
            self.classes_ = np.asarray(self.model_.classes_, dtype=np.int64)
            self._build_table()
        return self

    def _build_table(self) -> None:
        edges = getattr(getattr(self.model_, "_bin_mapper", None), "bin_thresholds_", None)
        if edges is None or len(edges) != 2:  # library internals changed: predict directly
            self.edges_ = None
            return
        self.edges_ = [np.asarray(e, dtype=float) for e in edges]
        # a cell's upper edge stands for the cell; the open top cell uses edge + 1
        reps = [np.append(e, e[-1] + 1.0) if e.size else np.zeros(1) for e in self.edges_]
        grid_ev, grid_la = np.meshgrid(reps[0], reps[1], indexing="ij")
        self.table_ = self._direct(grid_ev.ravel(), grid_la.ravel()).reshape(len(reps[0]), len(reps[1]), _K)

    def _direct(self, ev: np.ndarray, la: np.ndarray) -> np.ndarray:
        out = np.zeros((len(ev), _K))
        if len(ev):
            out[:, self.classes_] = self.model_.predict_proba(np.column_stack([ev, la]))
        return out

    def predict_proba(self, ev: np.ndarray, la: np.ndarray) -> np.ndarray:
        if self.edges_ is None:
            with _threads(self.n_threads):
                return self._direct(ev, la)
        # cell i holds edges[i-1] < x <= edges[i], as the trees' "go left if x <= t" splits
        i = np.searchsorted(self.edges_[0], ev, side="left")
        j = np.searchsorted(self.edges_[1], la, side="left")
        return self.table_[i, j]


def _holdout_mask(games: np.ndarray | None, n: int, share: float, seed: int) -> np.ndarray:
    """True for held-out balls: a share of whole games (or of balls when no game key)."""
    rng = np.random.default_rng(seed)
    if games is None:
        return rng.random(n) < share
    uniq, inverse = np.unique(games, return_inverse=True)
    return (rng.random(len(uniq)) < share)[inverse]


class ContactModel:
    """P(outcome | exit velocity, launch angle) over the batted-ball outcomes ``BATTED``.

    Parameters
    ----------
    kind : {"auto", "boosting", "grid"}
        ``"auto"`` fits both candidates and keeps the one with the lower held-out log loss.
    holdout_share : float
        Share of whole games held out to score the candidates.
    max_fit_balls : int
        The boosting candidate is fitted on at most this many balls (a seeded subsample),
        which keeps a fit on a full league within seconds.
    max_iter : int
        Boosting rounds at most (early stopping usually ends sooner).
    ev_edges, la_edges : sequence of float
        Interior edges of the coarse bucket grid used by the baseline.
    random_state : int
        Seed for the held-out split, the subsample and the boosting validation split.
    n_threads : int or None
        OpenMP threads for boosting (default 1: on a shared two-core machine one thread
        is faster than contended threads); None uses the library default.

    Attributes
    ----------
    kind_ : str
        The chosen model, ``"boosting"`` or ``"grid"``.
    scores_ : dict
        Held-out log loss of ``"boosting"``, ``"grid"`` and ``"bucket_baseline"``
        (lower is better; a candidate not fitted is absent).
    n_fit_, n_holdout_ : int
        Measured batted balls used to fit and to score.
    n_unmeasured_ : int
        Batted balls left out because exit velocity or launch angle was missing.
    classes_ : tuple of str
        ``BATTED``: the column order of :meth:`predict_proba`.

    Examples
    --------
    >>> import pandas as pd
    >>> rng = np.random.default_rng(0)
    >>> ev, la = rng.normal(88, 12, 2000), rng.normal(12, 25, 2000)
    >>> outcome = np.where(la < 10, "GB_OUT", np.where(ev > 100, "2B", "AIR_OUT"))
    >>> model = ContactModel(kind="grid").fit(
    ...     pd.DataFrame({"exit_velo": ev, "launch_angle": la, "outcome": outcome}))
    >>> p = model.predict_proba([110.0, 90.0, np.nan], [35.0, -20.0, 10.0])
    >>> p.shape, [BATTED[i] for i in p[:2].argmax(axis=1)], bool(np.isnan(p[2]).all())
    ((3, 6), ['2B', 'GB_OUT'], True)
    """

    def __init__(
        self,
        *,
        kind: str = "auto",
        holdout_share: float = 0.25,
        max_fit_balls: int = 60_000,
        max_iter: int = 150,
        ev_edges: Sequence[float] = EV_EDGES,
        la_edges: Sequence[float] = LA_EDGES,
        random_state: int = 0,
        n_threads: int | None = 1,
    ):
        self.kind = kind
        self.holdout_share = holdout_share
        self.max_fit_balls = max_fit_balls
        self.max_iter = max_iter
        self.ev_edges = ev_edges
        self.la_edges = la_edges
        self.random_state = random_state
        self.n_threads = n_threads

    def _check_params(self) -> None:
        if self.kind not in ("auto", "boosting", "grid"):
            msg = f"kind must be 'auto', 'boosting' or 'grid', got {self.kind!r}."
            raise ValueError(msg)
        if not 0.0 < float(self.holdout_share) < 1.0:
            msg = f"holdout_share must lie strictly between 0 and 1, got {self.holdout_share!r}."
            raise ValueError(msg)

    def fit(self, pas: Any) -> ContactModel:
        """Fit on the batted balls of ``pas`` (PlateAppearances or DataFrame).

        Raises
        ------
        DataError
            If a needed column is missing or fewer than 200 batted balls are measured.
        """
        self._check_params()
        batted = batted_rows(frame_of(pas), purpose="ContactModel.fit")
        ev = batted["exit_velo"].to_numpy()
        la = batted["launch_angle"].to_numpy()
        ok = measured_mask(ev, la)
        self.n_unmeasured_ = int((~ok).sum())
        if ok.sum() < _MIN_BALLS:
            msg = (
                f"ContactModel.fit needs at least {_MIN_BALLS} batted balls with exit_velo and "
                f"launch_angle; got {int(ok.sum())} ({self.n_unmeasured_} batted balls lack a "
                f"measurement). Load more seasons or a table with contact measurements."
            )
            raise DataError(msg)
        ev, la = ev[ok], la[ok]
        y = outcome_index(batted["outcome"].to_numpy()[ok])
        games = batted["game_id"].to_numpy()[ok] if "game_id" in batted.columns else None
        held = _holdout_mask(games, len(y), float(self.holdout_share), self.random_state)
        if held.all() or not held.any():
            held = _holdout_mask(None, len(y), float(self.holdout_share), self.random_state)
        fit_idx, hold_idx = np.flatnonzero(~held), np.flatnonzero(held)
        self.n_fit_, self.n_holdout_ = len(fit_idx), len(hold_idx)

        candidates = {
            "boosting": self._boosting,
            "grid": self._grid,
            "bucket_baseline": lambda e, a, t: _BucketLookup(self.ev_edges, self.la_edges).fit(e, a, t),
        }
        wanted = ["boosting", "grid"] if self.kind == "auto" else [self.kind]
        self.scores_: dict[str, float] = {}
        fitted = {}
        for name in [*wanted, "bucket_baseline"]:
            est = candidates[name](ev[fit_idx], la[fit_idx], y[fit_idx])
            probs = est.predict_proba(ev[hold_idx], la[hold_idx])
            self.scores_[name] = multiclass_log_loss(probs, y[hold_idx])
            fitted[name] = est
        self.kind_ = min(wanted, key=self.scores_.__getitem__)
        # Refit the chosen model on every measured ball (the scores stay held-out), unless
        # the boosting subsample was already full: a new subsample would add nothing.
        if self.kind_ == "boosting" and len(fit_idx) >= self.max_fit_balls:
            self._estimator = fitted["boosting"]
        else:
            self._estimator = candidates[self.kind_](ev, la, y)
        self.classes_ = BATTED
        return self

    def _subsample(self, n: int) -> np.ndarray:
        if n <= self.max_fit_balls:
            return np.arange(n)
        rng = np.random.default_rng(self.random_state + 1)
        return np.sort(rng.choice(n, size=int(self.max_fit_balls), replace=False))

    def _boosting(self, ev: np.ndarray, la: np.ndarray, y: np.ndarray) -> _Boosting:
        idx = self._subsample(len(y))
        est = _Boosting(max_iter=int(self.max_iter), random_state=self.random_state, n_threads=self.n_threads)
        return est.fit(ev[idx], la[idx], y[idx])

    def _grid(self, ev: np.ndarray, la: np.ndarray, y: np.ndarray) -> _SmoothedGrid:
        # pick the kernel width on an inner split of the fitting balls only
        inner = np.random.default_rng(self.random_state + 2).random(len(y)) < 0.2
        best = min(
            (0.5, 1.0, 2.0),
            key=lambda s: multiclass_log_loss(
                _SmoothedGrid(sigma=s).fit(ev[~inner], la[~inner], y[~inner]).predict_proba(
                    ev[inner], la[inner]
                ),
                y[inner],
            ),
        )
        return _SmoothedGrid(sigma=best).fit(ev, la, y)

    def predict_proba(self, exit_velo: Any, launch_angle: Any) -> np.ndarray:
        """Probabilities over ``BATTED`` for each ball, shape ``(n, 6)``.

        Rows whose exit velocity or launch angle is missing are all NaN, so the caller
        decides the fallback (the contact basis uses the player's observed mix).
        """
        if not hasattr(self, "_estimator"):
            msg = "this ContactModel is not fitted yet; call fit(pas) first."
            raise RuntimeError(msg)
        ev = np.atleast_1d(np.asarray(exit_velo, dtype="float64"))
        la = np.atleast_1d(np.asarray(launch_angle, dtype="float64"))
        if ev.shape != la.shape or ev.ndim != 1:
            msg = (
                f"exit_velo and launch_angle must be 1-D and of equal length, got shapes "
                f"{ev.shape} and {la.shape}."
            )
            raise ValueError(msg)
        ok = measured_mask(ev, la)
        out = np.full((len(ev), _K), np.nan)
        if ok.any():
            out[ok] = self._estimator.predict_proba(ev[ok], la[ok])
        return out


def contact_model_for(pas: Any, **params: Any) -> ContactModel:
    """The fitted :class:`ContactModel` of a dataset, fitted once and then reused.

    Repeat calls with the same PlateAppearances object (or a table with the same batted
    balls) and the same ``params`` return the same fitted model, so a dashboard does not
    refit on every click. ``params`` go to :class:`ContactModel`.

    Examples
    --------
    >>> import pandas as pd
    >>> rng = np.random.default_rng(1)
    >>> df = pd.DataFrame({"exit_velo": rng.normal(88, 12, 500),
    ...     "launch_angle": rng.normal(12, 25, 500), "outcome": ["1B", "GB_OUT"] * 250})
    >>> contact_model_for(df, kind="grid") is contact_model_for(df, kind="grid")
    True
    """
    key = ("model", tuple(sorted((k, repr(v)) for k, v in params.items())))
    cache = dataset_cache(pas)
    if key not in cache:
        cache[key] = ContactModel(**params).fit(pas)
    return cache[key]
