"""Choose the pitcher weight and the prior sizes from held-out plate appearances.

:func:`calibrate` splits the table honestly (whole games held out, or the last season, or a
separate table), builds each side's outcome counts and the league baselines from the fitting
rows only, collapses the held-out PAs into batter x pitcher x split cells and searches the
Brier surface in closed form (see :mod:`._calibrate_surface`). It also scores the baselines,
the other blend methods, a bootstrap interval for the weight and a reliability table.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np
import pandas as pd

from ..data import OUTCOMES, DataError, league_counts, load_pas, outcome_counts
from ._blend import linear_blend, odds_ratio_blend, two_stage_blend
from ._calibrate_split import CELL_KEYS, collapse_cells, split_games, split_last_season
from ._calibrate_surface import (
    DEFAULT_PRIOR_GRID,
    DEFAULT_WEIGHTS,
    _best_pairs,
    _bootstrap_shrunk,
    _check_grid,
    _linear_coefficients,
    _shrunk_grid,
    _surface_frame,
    _two_stage_coefficients,
    _two_stage_grid,
)
from ._scores import brier_score, log_loss, reliability_table
from ._settings import BASES, METHODS, BlendSettings

__all__ = ["CalibrationResult", "FittedSettings", "calibrate"]

_SPLIT_KEYS = ["batter_hand", "pitcher_hand"]


@dataclass(frozen=True)
class FittedSettings:
    """One method's best settings found on held-out PAs, with their held-out scores.

    Attributes
    ----------
    settings : BlendSettings
        The fitted settings (``MatchupModel(settings)`` predicts with them).
    brier, log_loss : float
        Held-out scores at those settings (lower is better).
    """

    settings: BlendSettings
    brier: float
    log_loss: float

    def to_dict(self) -> dict[str, Any]:
        """The settings' own dict plus ``brier`` and ``log_loss``."""
        return {**self.settings.to_dict(), "brier": self.brier, "log_loss": self.log_loss}


@dataclass(frozen=True)
class CalibrationResult:
    """What :func:`calibrate` found. All scores are on held-out PAs (lower is better).

    Attributes
    ----------
    pitcher_weight : float
        Best linear-blend pitcher weight (closed form, not rounded to the grid).
    batter_prior_pa, pitcher_prior_pa : float
        Best prior sizes from the grid.
    brier, log_loss : float
        Held-out scores of the linear blend at those settings.
    brier_baselines : dict
        Brier of ``league`` (league split distribution only), ``batter_only`` (w = 0),
        ``pitcher_only`` (w = 1) and ``even_blend`` (w = 0.5), each at its own best priors.
    skill_scores : dict
        ``1 - brier / baseline`` for each baseline (share of the baseline's error removed).
    weight_interval : tuple of float
        Bootstrap interval of the weight from resampling held-out games.
    interval_level : float
        Coverage of that interval.
    two_stage : dict
        Best ``first_weight``, ``in_play_weight``, prior sizes, ``brier`` and ``log_loss`` of the
        two-stage blend.
    methods : pandas.DataFrame
        One row per blend method: ``method``, ``brier``, ``log_loss``, ``batter_prior_pa``,
        ``pitcher_prior_pa``, ``settings``.
    surface : pandas.DataFrame
        ``pitcher_weight``, ``batter_prior_pa``, ``pitcher_prior_pa``, ``brier`` over the grid.
    best_by_priors : pandas.DataFrame
        Closed-form best weight and its Brier for every prior pair.
    reliability : pandas.DataFrame
        Predicted-probability bins against observed frequency per outcome, at the best settings.
    n_fit_pa, n_holdout_pa, n_cells : int
        Fitting PAs, held-out PAs, and the held-out cells they collapse into.
    split : str
        ``"games"``, ``"season-forward"`` or ``"separate"``.
    basis : str
        ``"observed"`` or ``"contact"``.
    fitted : dict
        Method -> :class:`FittedSettings` (as scikit-learn's ``best_params_``, one per method);
        :meth:`best_settings` picks one.
    """

    pitcher_weight: float
    batter_prior_pa: float
    pitcher_prior_pa: float
    brier: float
    log_loss: float
    brier_baselines: dict[str, float]
    skill_scores: dict[str, float]
    weight_interval: tuple[float, float]
    interval_level: float
    two_stage: dict[str, float]
    methods: pd.DataFrame = field(repr=False)
    surface: pd.DataFrame = field(repr=False)
    best_by_priors: pd.DataFrame = field(repr=False)
    reliability: pd.DataFrame = field(repr=False)
    n_fit_pa: int
    n_holdout_pa: int
    n_cells: int
    split: str
    basis: str
    fitted: dict[str, FittedSettings] = field(default_factory=dict, repr=False)

    @property
    def best_method(self) -> str:
        """The method with the lowest held-out Brier score (the first listed on a tie)."""
        return min(METHODS, key=lambda m: (self.fitted[m].brier, METHODS.index(m)))

    def best_settings(self, method: str | None = None) -> BlendSettings:
        """A method's fitted settings; the best method's (by held-out Brier) when None."""
        chosen = self.best_method if method is None else method
        if chosen not in self.fitted:
            msg = f"unknown method {chosen!r}; choose one of {list(METHODS)}."
            raise ValueError(msg)
        return self.fitted[chosen].settings

    def model_settings(self, method: str = "linear") -> dict[str, Any]:
        """Settings for ``MatchupModel(**settings)`` (or ``with_settings``) that reproduce a fit.

        Parameters
        ----------
        method : {"linear", "odds-ratio", "two-stage"}, default "linear"
            Which fitted method's settings to return.

        Returns
        -------
        dict
            ``method``, its weights, ``batter_prior_pa``, ``pitcher_prior_pa`` and ``basis``.
        """
        settings = self.best_settings(method)
        return {"method": settings.method, **settings.method_weights(), "batter_prior_pa": settings.batter_prior_pa,
                "pitcher_prior_pa": settings.pitcher_prior_pa, "basis": settings.basis}

    def to_dict(self) -> dict[str, Any]:
        """Plain JSON-ready dict: the ``fit`` command's keys first, then the extras."""
        out = {
            "pitcher_weight": self.pitcher_weight,
            "batter_prior_pa": self.batter_prior_pa,
            "pitcher_prior_pa": self.pitcher_prior_pa,
            "brier": self.brier,
            "log_loss": self.log_loss,
            "brier_baselines": dict(self.brier_baselines),
            "n_fit_pa": self.n_fit_pa,
            "n_holdout_pa": self.n_holdout_pa,
            "surface": self.surface.to_dict(orient="records"),
            "skill_scores": dict(self.skill_scores),
            "weight_interval": list(self.weight_interval),
            "interval_level": self.interval_level,
            "two_stage": dict(self.two_stage),
            "methods": self.methods.to_dict(orient="records"),
            "reliability": self.reliability.to_dict(orient="records"),
            "n_cells": self.n_cells,
            "split": self.split,
            "basis": self.basis,
            "settings": {"best": self.best_method, **{m: f.to_dict() for m, f in self.fitted.items()}},
        }
        return _plain(out)


def _plain(value: Any) -> Any:
    """numpy scalars to Python numbers, recursively."""
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, np.generic):
        return value.item()
    return value


def _as_pas(source: Any, name: str):
    """A PlateAppearances as given, or loaded from anything load_pas accepts."""
    if hasattr(source, "table") and hasattr(source, "frame"):
        return source
    try:
        return load_pas(source)
    except DataError as exc:
        msg = f"{name}: {exc}"
        raise DataError(msg) from None


def _side_counts(fit: Any, role: str, basis: str) -> pd.DataFrame:
    """Fitting counts per player and split for one side (observed or contact basis).

    The contact basis takes the counts exactly as ``MatchupModel(basis="contact")`` does
    (per season, which sets the fallback mix of unmeasured balls, then summed), so a fitted
    setting is scored on the predictions the estimator will make.
    """
    if basis == "contact":
        from ._matchup import _contact_counts

        table = _contact_counts(fit, role=role)
        keys = ["player_id", *_SPLIT_KEYS]
        return table.groupby(keys, sort=True, observed=True, as_index=False)[[*OUTCOMES, "pa"]].sum()
    return outcome_counts(fit, role=role)


@dataclass(frozen=True)
class _Prepared:
    """Held-out cells and each side's fitting rows, aligned by index (internal to calibrate)."""

    cells: pd.DataFrame  # held-out cells: keys, outcome counts, pa
    cell_of_pa: np.ndarray  # cell of each held-out PA
    held: pd.DataFrame  # held-out PAs (game_id, outcome)
    y: np.ndarray  # (n_cells, 9) held-out outcome counts
    league: np.ndarray  # (n_cells, 9) league of the cell's split on the basis (shrink target)
    league_observed: np.ndarray  # (n_cells, 9) observed league of the split (the league-only baseline)
    sides: dict  # role -> (row counts (n_rows, 9), row league (n_rows, 9), row of each cell)
    n_fit_pa: int
    split: str


def _split_index(batter_hand, pitcher_hand) -> np.ndarray:
    """Position of each (batter_hand, pitcher_hand) pair in SPLITS (L/L, L/R, R/L, R/R)."""
    return 2 * (np.asarray(batter_hand, dtype=object) == "R") + (np.asarray(pitcher_hand, dtype=object) == "R")


def _league_table(league: pd.DataFrame) -> np.ndarray:
    """(4, 9) league distributions in SPLITS order; a split without PAs gets the whole league."""
    counts = np.zeros((4, len(OUTCOMES)))
    idx = _split_index(league["batter_hand"].astype(str), league["pitcher_hand"].astype(str))
    np.add.at(counts, idx, league[list(OUTCOMES)].to_numpy(dtype=float))
    empty = counts.sum(axis=1) == 0
    counts[empty] = counts.sum(axis=0)
    return counts / counts.sum(axis=1, keepdims=True)


def _side_rows(cells: pd.DataFrame, counts: pd.DataFrame, id_column: str, league4: np.ndarray):
    """Fitting rows of one side plus one empty row per split, and the row of each cell.

    Shrinking is done once per player x split row and then gathered per cell; a player without
    fitting PAs in the cell's split points at the empty row, which shrinks to the league.
    """
    n_rows = len(counts)
    rows = np.vstack([counts[list(OUTCOMES)].to_numpy(dtype=float), np.zeros((4, len(OUTCOMES)))])
    split_of_row = np.r_[_split_index(counts["batter_hand"].astype(str), counts["pitcher_hand"].astype(str)), np.arange(4)]
    right = pd.DataFrame(
        {
            id_column: counts["player_id"].astype(str).to_numpy(),
            "batter_hand": counts["batter_hand"].astype(str).to_numpy(),
            "pitcher_hand": counts["pitcher_hand"].astype(str).to_numpy(),
            "_row": np.arange(n_rows),
        }
    )
    left = cells[[id_column, *_SPLIT_KEYS]].astype(str)
    merged = left.merge(right, on=[id_column, *_SPLIT_KEYS], how="left", validate="many_to_one")
    row = merged["_row"].to_numpy(dtype=float, na_value=np.nan)
    cell_split = _split_index(left["batter_hand"], left["pitcher_hand"])
    row = np.where(np.isnan(row), n_rows + cell_split, row).astype(np.intp)
    return rows, league4[split_of_row], row


def _fit_source(pas, held_games: np.ndarray, basis: str):
    """The fitting rows for the count functions: an engine-side anti-join on held-out games."""
    import ibis

    if basis == "contact":  # the contact layer works on a pandas frame
        frame = pas.frame
        return frame.loc[~frame["game_id"].astype(str).isin(held_games)]
    table = pas.table
    held = ibis.memtable(pd.DataFrame({"game_id": pd.Series(held_games, dtype=object)}))
    return table.anti_join(held, table.game_id.cast("string") == held.game_id)


def _check_no_shared_games(fit_frame: pd.DataFrame, score_frame: pd.DataFrame) -> None:
    """A separate score table must not hold games of the fitting table (same id and date)."""
    keys = ["game_id", "game_date"]

    def games(frame: pd.DataFrame) -> pd.MultiIndex:
        return pd.MultiIndex.from_frame(frame[keys].drop_duplicates().astype(str))

    shared = games(score_frame).intersection(games(fit_frame))
    if len(shared):
        examples = ", ".join(f"{g} ({d})" for g, d in shared[:5])
        msg = (
            f"the score table shares {len(shared)} game(s) with the fitting data (game_id and game_date, "
            f"e.g. {examples}); their PAs would be scored by distributions fitted on them. Drop those "
            "games from one of the tables, or hold out a share of games instead (holdout_share)."
        )
        raise DataError(msg)


def _prepare(pas, score, *, holdout_share: float, seed: int, season_forward: bool, basis: str) -> _Prepared:
    """Split, count both sides on the fitting rows, collapse the held-out PAs into cells."""
    frame = pas.frame
    if score is not None:
        fit, held, split = pas, score.frame, "separate"
        n_fit = len(frame)
        _check_no_shared_games(frame, held)
    else:
        if season_forward:
            if "season" not in frame.columns:
                msg = "season-forward split needs a 'season' column (or game_date); load the table with load_pas."
                raise DataError(msg)
            is_held = split_last_season(frame["season"].to_numpy())
            split = "season-forward"
        else:
            is_held = split_games(frame["game_id"].to_numpy(), holdout_share=holdout_share, seed=seed)
            split = "games"
        held = frame.loc[is_held, [*CELL_KEYS, "game_id", "outcome"]]
        n_fit = int((~is_held).sum())
        held_games = pd.unique(held["game_id"].astype(str).to_numpy())
        if season_forward:
            # fit on the earlier seasons only (a game id may not be unique across seasons)
            last = frame["season"].max()
            fit = pas.frame.loc[~is_held] if basis == "contact" else pas.table.filter(pas.table.season < int(last))
        else:
            fit = _fit_source(pas, held_games, basis)
    if len(held) == 0 or n_fit == 0:
        msg = (
            f"the split left {n_fit} fitting and {len(held)} held-out PAs; both must be non-empty. "
            "Use more games, another holdout share, or a separate score table."
        )
        raise DataError(msg)
    counts = {role: _side_counts(fit, role, basis) for role in ("batter", "pitcher")}
    # every fitting PA has one batter: the batters' counts summed per split are the league's
    # on the same basis (one engine query fewer), the target MatchupModel shrinks toward too;
    # the league-only baseline stays the observed league whatever the basis
    league4 = _league_table(counts["batter"])
    observed4 = league4 if basis == "observed" else _league_table(league_counts(fit))
    cells, cell_of_pa = collapse_cells(held, return_inverse=True)
    sides = {role: _side_rows(cells, counts[role], f"{role}_id", league4) for role in counts}
    cell_split = _split_index(cells["batter_hand"].astype(str), cells["pitcher_hand"].astype(str))
    return _Prepared(
        cells=cells,
        cell_of_pa=cell_of_pa,
        held=held,
        y=cells[list(OUTCOMES)].to_numpy(dtype=float),
        league=league4[cell_split],
        league_observed=observed4[cell_split],
        sides=sides,
        n_fit_pa=int(n_fit),
        split=split,
    )


def _shrunk_cells(prep: _Prepared, role: str, priors: np.ndarray) -> np.ndarray:
    """(n_priors, n_cells, 9): shrink each fitting row once per prior, then gather per cell."""
    rows, row_league, row_of_cell = prep.sides[role]
    return _shrunk_grid(rows, row_league, priors)[:, row_of_cell]


def calibrate(
    pas: Any,
    *,
    holdout_share: float = 0.25,
    seed: int = 0,
    score: Any = None,
    season_forward: bool = False,
    priors=DEFAULT_PRIOR_GRID,
    batter_priors=None,
    pitcher_priors=None,
    weights=DEFAULT_WEIGHTS,
    basis: str = "observed",
    n_boot: int = 200,
    interval_level: float = 0.9,
    n_bins: int = 10,
    progress: bool = False,
) -> CalibrationResult:
    """Fit the linear blend's pitcher weight and both prior sizes on held-out PAs.

    Parameters
    ----------
    pas : PlateAppearances or anything :func:`~matchup_widgets.data.load_pas` accepts
        The table to fit on.
    holdout_share : float, default 0.25
        Share of whole games held out for scoring (random, seeded).
    seed : int, default 0
        Seed of the game split and of the bootstrap.
    score : PlateAppearances or source, optional
        A separate table to score on; then all of ``pas`` is used for fitting. It must not
        share a game (same ``game_id`` and ``game_date``) with ``pas``.
    season_forward : bool, default False
        Fit on the earlier seasons and score on the last one instead of a random share.
    priors : sequence of float, default (0, 25, 50, 100, 200, 400, 800)
        Prior sizes (PAs) searched for both sides, unless ``batter_priors`` or
        ``pitcher_priors`` is given.
    weights : sequence of float, default 0, 0.01, ..., 1
        Pitcher weights of the surface and of the two-stage grid.
    basis : {"observed", "contact"}, default "observed"
        Fitting distributions from observed outcomes, or contact-expected ones.
    n_boot : int, default 200
        Bootstrap replicates for the weight interval (games resampled).
    interval_level : float, default 0.9
        Coverage of the weight interval.
    n_bins : int, default 10
        Bins per outcome of the reliability table.
    progress : bool, default False
        Report progress with tqdm.auto (a bar in a notebook, a line in a terminal).

    Returns
    -------
    CalibrationResult

    Raises
    ------
    DataError
        If the table cannot be split, the held-out part is empty, or a separate score table
        shares games with ``pas``.
    ValueError
        On a bad option.

    Notes
    -----
    The linear blend's two weights sum to 1, so it already damps each side's deviation from
    the league. When both sides are well measured and their effects add up (as under an
    odds-ratio rule, where a strikeout pitcher and a strikeout batter compound), shrinkage
    only damps them further and the best prior sizes are 0/0; the odds-ratio row of
    ``methods`` then scores better with positive priors. Priors of 0 are a finding about
    the linear blend, not a failure of the search.

    Examples
    --------
    >>> from matchup_widgets.data.demo import make_demo_league
    >>> league = make_demo_league(seed=1, n_seasons=1, n_teams=2, n_games=8)
    >>> result = calibrate(league.pas, priors=(0, 100), n_boot=20, progress=False)
    >>> 0 <= result.pitcher_weight <= 1, result.n_fit_pa + result.n_holdout_pa == len(league.pas)
    (True, True)
    """
    from tqdm.auto import tqdm

    if basis not in BASES:
        msg = f"basis must be one of {list(BASES)}; got {basis!r}."
        raise ValueError(msg)
    if not 0.0 < float(interval_level) < 1.0:
        msg = f"interval_level must lie strictly between 0 and 1; got {interval_level}."
        raise ValueError(msg)
    if score is not None and season_forward:
        msg = (
            "give either a separate score table (score) or the season-forward split "
            "(season_forward=True), not both: with a score table all of the data is fitted on."
        )
        raise ValueError(msg)
    for name, value in (("n_boot", n_boot), ("n_bins", n_bins)):
        if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
            msg = f"{name} must be a whole number >= 1; got {value!r}."
            raise ValueError(msg)
    bp = _check_grid(priors if batter_priors is None else batter_priors, "batter_priors")
    pp = _check_grid(priors if pitcher_priors is None else pitcher_priors, "pitcher_priors")
    w_grid = _check_grid(weights, "weights", upper=1.0)
    pas = _as_pas(pas, "data")
    score = None if score is None else _as_pas(score, "score")

    steps = tqdm(total=7, desc="fit", disable=not progress, unit="step")
    try:
        steps.set_postfix_str("splitting and counting")
        prep = _prepare(pas, score, holdout_share=holdout_share, seed=seed, season_forward=season_forward, basis=basis)
        cells, y, lg = prep.cells, prep.y, prep.league
        steps.update(2)

        steps.set_postfix_str("linear surface")
        bs, qs = _shrunk_cells(prep, "batter", bp), _shrunk_cells(prep, "pitcher", pp)
        a_, b_, c_, total = _linear_coefficients(y, bs, qs)
        surface = _surface_frame(a_, b_, c_, total, bp, pp, w_grid)
        best_by_priors = _best_pairs(a_, b_, c_, total, bp, pp)
        best = best_by_priors.loc[best_by_priors["brier"].idxmin()]
        ib = int(np.flatnonzero(bp == best["batter_prior_pa"])[0])
        ip = int(np.flatnonzero(pp == best["pitcher_prior_pa"])[0])
        w_best = float(best["pitcher_weight"])
        p_best = linear_blend(bs[ib], qs[ip], w_best)
        baselines = _baselines(a_, b_, c_, total, prep.league_observed, y)
        steps.update()

        steps.set_postfix_str("two-stage surface")
        coef, _ = _two_stage_coefficients(y, bs, qs, progress=False)
        grid = _two_stage_grid(coef, total, w_grid, w_grid)
        i2 = np.unravel_index(np.argmin(grid), grid.shape)
        two_p = two_stage_blend(bs[i2[0]], qs[i2[1]], first_weight=w_grid[i2[2]], in_play_weight=w_grid[i2[3]])
        two_stage = {
            "first_weight": float(w_grid[i2[2]]),
            "in_play_weight": float(w_grid[i2[3]]),
            "batter_prior_pa": float(bp[i2[0]]),
            "pitcher_prior_pa": float(pp[i2[1]]),
            "brier": float(grid[i2]),
            "log_loss": log_loss(two_p, y),
        }
        steps.update()

        steps.set_postfix_str("odds-ratio blend")
        odds = _odds_ratio_best(y, bs, qs, lg, bp, pp)
        steps.update()

        steps.set_postfix_str("bootstrap")
        # scoring units that lie in one game each: cell x game
        units = pd.DataFrame(
            {"cell": prep.cell_of_pa, "game_id": prep.held["game_id"].astype(str).to_numpy(), "outcome": prep.held["outcome"].to_numpy()}
        )
        unit_cells = collapse_cells(units, keys=("cell", "game_id"))
        uc = unit_cells["cell"].to_numpy()
        boot = _bootstrap_shrunk(
            unit_cells[list(OUTCOMES)].to_numpy(dtype=float), bs[:, uc], qs[:, uc], unit_cells["game_id"].to_numpy(),
            n_boot=n_boot, seed=seed, progress=False,
        )
        tail = (1.0 - float(interval_level)) / 2.0
        interval = (float(np.quantile(boot, tail)), float(np.quantile(boot, 1.0 - tail)))
        steps.update()

        steps.set_postfix_str("reliability")
        reliability = reliability_table(p_best, y, n_bins=n_bins)
        brier_best = float(best["brier"])
        methods = pd.DataFrame(
            [
                {
                    "method": "linear", "brier": brier_best, "log_loss": log_loss(p_best, y),
                    "batter_prior_pa": float(bp[ib]), "pitcher_prior_pa": float(pp[ip]),
                    "settings": f"pitcher_weight={w_best:.3f}",
                },
                {
                    "method": "odds-ratio", "brier": odds["brier"], "log_loss": odds["log_loss"],
                    "batter_prior_pa": odds["batter_prior_pa"], "pitcher_prior_pa": odds["pitcher_prior_pa"],
                    "settings": "batter_exponent=1, pitcher_exponent=1",
                },
                {
                    "method": "two-stage", "brier": two_stage["brier"], "log_loss": two_stage["log_loss"],
                    "batter_prior_pa": two_stage["batter_prior_pa"], "pitcher_prior_pa": two_stage["pitcher_prior_pa"],
                    "settings": f"first_weight={two_stage['first_weight']:.2f}, in_play_weight={two_stage['in_play_weight']:.2f}",
                },
            ]
        )
        steps.update()
    finally:
        steps.close()

    return CalibrationResult(
        pitcher_weight=w_best,
        batter_prior_pa=float(bp[ib]),
        pitcher_prior_pa=float(pp[ip]),
        brier=brier_best,
        log_loss=float(methods.loc[0, "log_loss"]),
        brier_baselines=baselines,
        skill_scores={k: 1.0 - brier_best / v for k, v in baselines.items()},
        weight_interval=interval,
        interval_level=float(interval_level),
        two_stage=two_stage,
        methods=methods,
        surface=surface,
        best_by_priors=best_by_priors,
        reliability=reliability,
        n_fit_pa=prep.n_fit_pa,
        n_holdout_pa=int(len(prep.held)),
        n_cells=int(len(cells)),
        split=prep.split,
        basis=basis,
        fitted=_fitted_settings(methods, w_best, two_stage, basis),
    )


def _fitted_settings(methods: pd.DataFrame, w_best: float, two_stage: dict, basis: str) -> dict[str, FittedSettings]:
    """Each method's best settings and scores as FittedSettings (one shape for all methods)."""
    weights = {
        "linear": {"pitcher_weight": w_best},
        "odds-ratio": {"batter_exponent": 1.0, "pitcher_exponent": 1.0},
        "two-stage": {"first_weight": two_stage["first_weight"], "in_play_weight": two_stage["in_play_weight"]},
    }
    out = {}
    for row in methods.itertuples(index=False):  # one row per method (three)
        settings = BlendSettings(
            method=row.method, batter_prior_pa=float(row.batter_prior_pa), pitcher_prior_pa=float(row.pitcher_prior_pa),
            basis=basis, **weights[row.method],
        )
        out[row.method] = FittedSettings(settings, float(row.brier), float(row.log_loss))
    return out


def _baselines(a_, b_, c_, total, lg, y) -> dict[str, float]:
    """League-only, and the blend at w = 0, 1, 0.5, each at its best prior pair."""

    def at(w: float) -> float:
        return float(np.min(a_ * w**2 + b_ * w + c_) / total)

    return {
        "league": brier_score(lg, y),
        "batter_only": at(0.0),
        "pitcher_only": at(1.0),
        "even_blend": at(0.5),
    }


def _odds_ratio_best(y, bs, qs, lg, bp, pp) -> dict[str, float]:
    """Odds-ratio blend (exponents 1) at every prior pair; the best pair's scores."""
    n = y.sum(axis=1)
    total = n.sum()
    best = {"brier": np.inf}
    for i in range(bs.shape[0]):  # one vectorised block per batter prior: (n_pitcher_priors, cells, 9)
        p = odds_ratio_blend(bs[i][None], qs, lg[None])
        brier = (np.einsum("jrk,jrk,r->j", p, p, n) - 2 * np.einsum("jrk,rk->j", p, y) + total) / total
        j = int(np.argmin(brier))
        if brier[j] < best["brier"]:
            best = {
                "brier": float(brier[j]),
                "log_loss": log_loss(p[j], y),
                "batter_prior_pa": float(bp[i]),
                "pitcher_prior_pa": float(pp[j]),
            }
    return best

