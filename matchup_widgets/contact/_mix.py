"""The matchup contact mix: the batter's and the pitcher's contact blended like their outcomes.

Each side's counts over contact categories (tiers, or exit-velocity x launch-angle
buckets) are shrunk toward the league shares of the same platoon split with the model's
prior sizes, then mixed with the model's pitcher weight. The outcome distribution that
the mix implies over ``BATTED`` is ``sum_c mix[c] * P(outcome | category c)``, with the
league's mean modeled outcomes in each category.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from matchup_widgets.data import BATTED

from ._buckets import EV_EDGES, LA_EDGES, bucket_shares
from ._cache import remembered
from ._dataset import _model, contact_tiers, league_bucket_table, tier_shares
from ._model import ContactModel
from ._tiers import ContactTiers


def shrink_shares(counts: Any, league: Any, prior: float) -> np.ndarray:
    """Posterior-mean shares ``(counts + prior * league) / (n + prior)`` over any categories.

    The same Dirichlet posterior mean as :func:`matchup_widgets.model.shrink`, which is
    fixed to the nine outcome codes; here the categories are contact tiers or buckets.
    With no counts and no prior the league shares come back.

    Examples
    --------
    >>> shrink_shares([6, 0, 0, 0], [0.25, 0.25, 0.25, 0.25], 4).tolist()
    [0.7, 0.1, 0.1, 0.1]
    """
    c = np.asarray(counts, dtype=float)
    lg = np.asarray(league, dtype=float)
    if c.shape != lg.shape or np.any(c < 0) or not np.all(np.isfinite(c)):
        msg = (
            f"counts must be finite, >= 0 and shaped like the league shares; got shapes "
            f"{c.shape} and {lg.shape}."
        )
        raise ValueError(msg)
    if not np.isfinite(prior) or prior < 0:
        msg = f"the prior size must be a finite number >= 0 (batted balls), got {prior!r}."
        raise ValueError(msg)
    lg = lg / lg.sum()
    n = c.sum()
    if n == 0:
        return lg.copy()
    # the same mean written as a weighted average, so a tiny prior cannot underflow
    w = prior / (n + prior)
    return (1.0 - w) * (c / n) + w * lg


def matchup_contact_mix(
    batter_counts: pd.Series,
    pitcher_counts: pd.Series,
    league_shares: pd.Series,
    *,
    outcome_given: pd.DataFrame,
    pitcher_weight: float,
    batter_prior_pa: float,
    pitcher_prior_pa: float,
) -> tuple[pd.Series, pd.Series]:
    """Blend the two sides' contact shares and give the outcomes that mix implies.

    Parameters
    ----------
    batter_counts, pitcher_counts : pandas.Series
        Batted balls per contact category (tier or bucket) of each side, same split.
    league_shares : pandas.Series
        League share of each category in that split (the shrinkage target).
    outcome_given : pandas.DataFrame
        Rows: the categories; columns: ``BATTED``; P(outcome | category).
    pitcher_weight : float in [0, 1]
        Weight of the pitcher's shares, as in the linear blend.
    batter_prior_pa, pitcher_prior_pa : float >= 0
        Prior sizes; here they count batted balls.

    Returns
    -------
    (pandas.Series, pandas.Series)
        The mix of shares over the categories, and the implied distribution over
        ``BATTED`` (sums to 1).

    Examples
    --------
    >>> cats = ["low", "high"]
    >>> given = pd.DataFrame({"1B": [0.1, 0.3], "2B": [0.0, 0.1], "3B": [0.0, 0.0],
    ...     "HR": [0.0, 0.1], "GB_OUT": [0.6, 0.2], "AIR_OUT": [0.3, 0.3]}, index=cats)
    >>> mix, outcomes = matchup_contact_mix(pd.Series([30, 10], cats), pd.Series([10, 30], cats),
    ...     pd.Series([0.5, 0.5], cats), outcome_given=given, pitcher_weight=0.5,
    ...     batter_prior_pa=0, pitcher_prior_pa=0)
    >>> mix.tolist(), round(float(outcomes["1B"]), 3)
    ([0.5, 0.5], 0.2)
    """
    w = float(pitcher_weight)
    if not 0.0 <= w <= 1.0:
        msg = f"pitcher_weight must lie in [0, 1], got {pitcher_weight!r}."
        raise ValueError(msg)
    cats = league_shares.index
    b = shrink_shares(batter_counts.reindex(cats, fill_value=0), league_shares, float(batter_prior_pa))
    q = shrink_shares(pitcher_counts.reindex(cats, fill_value=0), league_shares, float(pitcher_prior_pa))
    mix = w * q + (1.0 - w) * b
    given = outcome_given.reindex(index=cats, columns=list(BATTED))
    if given.isna().any().any():
        msg = "outcome_given must have a row for every category and a column for every BATTED code."
        raise ValueError(msg)
    implied = mix @ given.to_numpy(dtype=float)
    return pd.Series(mix, index=cats, name="share"), pd.Series(implied / implied.sum(), index=list(BATTED))


@dataclass(frozen=True)
class _SideCounts:
    """Every player's balls per contact category in one role, indexed for row selection."""

    rows: dict[tuple[str, str, str], int]  # (player_id, batter_hand, pitcher_hand) -> row
    counts: np.ndarray  # (n_rows, n_categories)
    league: dict[tuple[str, str], np.ndarray]  # split -> counts summed over all players

    def player(self, player_id: str, hands: tuple[str, str]) -> np.ndarray:
        row = self.rows.get((str(player_id), *hands))
        return np.zeros(self.counts.shape[1]) if row is None else self.counts[row]

    def split(self, hands: tuple[str, str]) -> np.ndarray:
        return self.league.get(hands, np.zeros(self.counts.shape[1]))


def _index_sides(keys: pd.DataFrame, counts: np.ndarray) -> _SideCounts:
    """Sum ``counts`` rows by (player, split) key and by split; runs once per cached table."""
    ids = keys["player_id"].astype(str).to_numpy(dtype=object)
    bh = keys["batter_hand"].astype(str).to_numpy(dtype=object)
    ph = keys["pitcher_hand"].astype(str).to_numpy(dtype=object)
    rows: dict[tuple[str, str, str], int] = {}
    codes = np.fromiter((rows.setdefault(k, len(rows)) for k in zip(ids, bh, ph)), dtype=np.int64, count=len(ids))
    summed = np.zeros((len(rows), counts.shape[1]))
    np.add.at(summed, codes, counts)
    splits: dict[tuple[str, str], int] = {}
    s_codes = np.fromiter((splits.setdefault(k, len(splits)) for k in zip(bh, ph)), dtype=np.int64, count=len(ids))
    s_sums = np.zeros((len(splits), counts.shape[1]))
    np.add.at(s_sums, s_codes, counts)
    return _SideCounts(rows=rows, counts=summed, league={k: s_sums[i] for k, i in splits.items()})


def _side_counts(
    pas: Any, *, role: str, kind: str, seasons: tuple[int, int] | None, model: ContactModel,
    tiers: ContactTiers | None, ev_edges: Any, la_edges: Any,
) -> _SideCounts:
    """All players' category counts in ``role``, computed once per dataset and settings."""
    if kind == "tier":
        key = ("side_counts", role, kind, seasons, id(model), id(tiers))
        owners: tuple = (model, tiers)

        def make() -> _SideCounts:
            table = tier_shares(pas, role=role, tiers=tiers, model=model, seasons=seasons)
            n_cols = [f"n_tier_{t}" for t in tiers.table.index]
            return _index_sides(table, table[n_cols].to_numpy(dtype=float))
    else:
        edges = (tuple(map(float, ev_edges)), tuple(map(float, la_edges)))
        key = ("side_counts", role, kind, seasons, edges)
        owners = ()

        def make() -> _SideCounts:
            long = bucket_shares(pas, role=role, ev_edges=ev_edges, la_edges=la_edges, seasons=seasons)
            n_cells = (len(edges[0]) + 1) * (len(edges[1]) + 1)
            # the long table holds the whole grid, in grid order, for each player and split
            counts = long["n"].to_numpy(dtype=float).reshape(-1, n_cells)
            return _index_sides(long.iloc[::n_cells], counts)

    return remembered(pas, key, make, owners=owners)


def matchup_contact(
    pas: Any,
    *,
    batter_id: str,
    pitcher_id: str,
    batter_hand: str,
    pitcher_hand: str,
    pitcher_weight: float,
    batter_prior_pa: float,
    pitcher_prior_pa: float,
    kind: str = "tier",
    seasons: tuple[int, int] | None = None,
    model: ContactModel | None = None,
    ev_edges: Any = EV_EDGES,
    la_edges: Any = LA_EDGES,
) -> tuple[pd.DataFrame, pd.Series]:
    """Contact shares of batter, pitcher, league and their matchup mix, in one platoon split.

    Every player's category counts are computed once per dataset, role, seasons, kind and
    contact model (or bucket edges) and kept; another pair only selects two rows and blends.

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
    batter_id, pitcher_id : str
    batter_hand, pitcher_hand : {"L", "R"}
        The split of the matchup (a switch hitter bats from the side opposite the pitcher).
    pitcher_weight, batter_prior_pa, pitcher_prior_pa : float
        The same settings as the outcome blend.
    kind : {"tier", "bucket"}
        Contact tiers or exit-velocity x launch-angle buckets.

    Returns
    -------
    (pandas.DataFrame, pandas.Series)
        Long table with ``side`` (batter, pitcher, league, matchup), ``category`` (tier
        number or bucket name), ``label``, ``n`` (batted balls; NaN for the mix) and
        ``share`` -- bucket tables also carry ``exit_velo_bin`` and ``launch_angle_bin`` --
        and the outcome distribution over ``BATTED`` that the matchup mix implies.
    """
    hands = (str(batter_hand), str(pitcher_hand))
    seasons = None if seasons is None else (int(seasons[0]), int(seasons[1]))
    if kind == "tier":
        model = _model(pas, model)
        tiers = contact_tiers(pas, model=model)
        cats = pd.Index(tiers.table.index, name="category")
        labels = tiers.table["label"].to_numpy()
        given = tiers.outcome_given_tier
        extra = None
    elif kind == "bucket":
        tiers = None
        table = league_bucket_table(pas, model=model, ev_edges=ev_edges, la_edges=la_edges)
        cats = pd.Index(table["bucket"], name="category")
        labels = table["bucket"].to_numpy()
        given = table.set_index("bucket")[list(BATTED)]
        extra = table[["exit_velo_bin", "launch_angle_bin"]]
    else:
        msg = f"kind must be 'tier' or 'bucket', got {kind!r}."
        raise ValueError(msg)
    given = given.set_axis(cats)  # a relabelled copy: the cached table is left as it is
    # every player's counts are computed once per dataset and settings; a new pair only selects rows
    bat, pit = (
        _side_counts(pas, role=role, kind=kind, seasons=seasons, model=model, tiers=tiers,
                     ev_edges=ev_edges, la_edges=la_edges)
        for role in ("batter", "pitcher")
    )
    b_counts = bat.player(batter_id, hands)
    p_counts = pit.player(pitcher_id, hands)
    league_counts = bat.split(hands)
    if league_counts.sum() == 0:
        msg = (
            f"no measured batted balls in the {batter_hand}/{pitcher_hand} split of this table; "
            f"pick another split or load data with exit velocity and launch angle."
        )
        raise ValueError(msg)
    league = pd.Series(league_counts / league_counts.sum(), index=cats)
    mix, implied = matchup_contact_mix(
        pd.Series(b_counts, index=cats), pd.Series(p_counts, index=cats), league,
        outcome_given=given, pitcher_weight=pitcher_weight,
        batter_prior_pa=batter_prior_pa, pitcher_prior_pa=pitcher_prior_pa,
    )
    parts = []
    with np.errstate(invalid="ignore", divide="ignore"):
        for side, counts, shares in (
            ("batter", b_counts, b_counts / b_counts.sum()),
            ("pitcher", p_counts, p_counts / p_counts.sum()),
            ("league", league_counts, league.to_numpy()),
            ("matchup", np.full(len(cats), np.nan), mix.to_numpy()),
        ):
            part = pd.DataFrame({"side": side, "category": cats, "label": labels, "n": counts, "share": shares})
            if extra is not None:
                part = pd.concat([part, extra.reset_index(drop=True)], axis=1)
            parts.append(part)
    return pd.concat(parts, ignore_index=True), implied
