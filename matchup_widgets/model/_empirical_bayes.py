"""Empirical-Bayes prior sizes: how many league plate appearances to add, per outcome.

For one outcome, a player's count ``x`` in ``n`` plate appearances is modelled as
beta-binomial: the player's true rate ``p ~ Beta(M mu, M (1 - mu))`` and ``x ~ Bin(n, p)``.
Then ``Var(x / n) = mu (1 - mu) (1 + (n - 1) rho) / n`` with intra-player correlation
``rho = 1 / (M + 1)``, so the prior size is ``M = (1 - rho) / rho``. Method of moments with
unequal ``n`` and the pooled mean ``mu = sum x / sum n``:

    E[ sum_j n_j (x_j/n_j - mu)^2 ] = mu (1 - mu) [ (J - 1) + rho (sum_j (n_j - 1) - sum_j n_j (n_j - 1) / N) ]

which we solve for ``rho``. The whole-distribution row ("all") is the Dirichlet-multinomial
version, from Pearson's statistic ``sum_j sum_i n_j (p_ij - mu_i)^2 / mu_i`` whose expectation
is ``(K - 1) [(J - 1) + rho D]`` with the same ``D``. Platoon splits are separate strata:
each split contributes its own deviations from its own mean.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from matchup_widgets.data import OUTCOMES, DataError

from ._arrays import as_outcome_array


def empirical_bayes_prior(
    counts_table: pd.DataFrame | np.ndarray,
    *,
    role: str = "batter",
    min_pa: int = 10,
    by_split: bool = True,
) -> pd.DataFrame:
    """Suggest prior sizes (in plate appearances) per outcome from between-player spread.

    Parameters
    ----------
    counts_table : pandas.DataFrame or array of shape (n_players, 9)
        One row per player (and platoon split, and season if present) with one column per
        outcome code, as returned by ``matchup_widgets.data.outcome_counts``. Rows of the
        same player and split are summed over seasons first.
    role : {"batter", "pitcher"}, keyword-only
        Which side the table describes (picks the id column ``<role>_id`` when present).
    min_pa : int, keyword-only
        Players (per split) with fewer plate appearances are left out.
    by_split : bool, keyword-only
        Treat the platoon splits (``batter_hand`` x ``pitcher_hand`` columns) as strata.

    Returns
    -------
    pandas.DataFrame
        Index: the outcome codes then ``"all"`` (the Dirichlet-multinomial fit). Columns:
        ``prior_pa`` (``inf`` when players differ no more than chance allows, 0 when the
        moment estimate of ``rho`` reaches 1 and so calls for no pooling at all), ``rho``
        (share of variance between players), ``mean`` (pooled rate), ``n_players``, ``role``.

    Raises
    ------
    DataError
        If fewer than two players have ``min_pa`` plate appearances.

    Examples
    --------
    >>> import numpy as np
    >>> counts = np.zeros((2, 9))
    >>> counts[:, 0] = [20, 40]          # strikeouts
    >>> counts[:, 7] = [80, 60]          # the rest of 100 PA each
    >>> round(float(empirical_bayes_prior(counts).loc["K", "prior_pa"]), 2)
    10.61
    """
    if role not in ("batter", "pitcher"):
        msg = f"role must be 'batter' or 'pitcher'; got {role!r}."
        raise ValueError(msg)
    counts, strata = _player_counts(counts_table, role=role, by_split=by_split)
    return prior_from_counts(counts, strata, role=role, min_pa=min_pa)


def prior_from_counts(counts: np.ndarray, strata: np.ndarray, *, role: str, min_pa: float) -> pd.DataFrame:
    """Method-of-moments prior sizes from a (units, 9) count array with a stratum label per unit."""
    n = counts.sum(axis=1)
    keep = n >= min_pa
    counts, strata, n = counts[keep], strata[keep], n[keep]
    if len(n) < 2:
        msg = (
            f"empirical_bayes_prior needs at least two {role}s with >= {min_pa} plate appearances "
            f"(min_pa); got {len(n)}. Lower min_pa or use more seasons."
        )
        raise DataError(msg)
    # per stratum sums; the statistic and its expectation add over strata
    codes, strata_idx = np.unique(strata, return_inverse=True)
    n_strata = len(codes)
    x_s = np.zeros((n_strata, len(OUTCOMES)))
    np.add.at(x_s, strata_idx, counts)
    n_s = np.bincount(strata_idx, weights=n, minlength=n_strata)
    j_s = np.bincount(strata_idx, minlength=n_strata)
    mu_s = x_s / n_s[:, None]  # (strata, 9)
    rates = counts / n[:, None]
    dev2 = n[:, None] * (rates - mu_s[strata_idx]) ** 2  # (players, 9)
    stat = np.zeros((n_strata, len(OUTCOMES)))
    np.add.at(stat, strata_idx, dev2)
    nn1 = np.bincount(strata_idx, weights=n * (n - 1), minlength=n_strata)
    d_s = np.bincount(strata_idx, weights=n - 1, minlength=n_strata) - nn1 / n_s
    dof = float(np.sum(j_s - 1))
    d = float(np.sum(d_s))
    var_s = mu_s * (1 - mu_s)
    with np.errstate(invalid="ignore", divide="ignore"):
        # per outcome: sum over strata of stat / (mu (1 - mu)); outcomes a stratum never shows add 0
        scaled = np.where(var_s > 0, stat / var_s, 0.0).sum(axis=0)
        rho = (scaled - dof) / d
        chi = np.where(mu_s > 0, stat / mu_s, 0.0).sum()
        k_minus_1 = len(OUTCOMES) - 1
        rho_all = (chi / k_minus_1 - dof) / d
    rho = np.append(rho, rho_all)
    with np.errstate(invalid="ignore", divide="ignore"):
        # rho >= 1 (more spread than the model allows, possible with few players): no pooling
        prior = np.where(rho > 0, np.maximum((1 - rho) / rho, 0.0), np.inf)
    mean = np.append(x_s.sum(axis=0) / n_s.sum(), np.nan)
    return pd.DataFrame(
        {
            "prior_pa": prior,
            "rho": rho,
            "mean": mean,
            "n_players": len(n),
            "role": role,
        },
        index=pd.Index([*OUTCOMES, "all"], name="outcome"),
    )


def _player_counts(table: pd.DataFrame | np.ndarray, *, role: str, by_split: bool) -> tuple[np.ndarray, np.ndarray]:
    """Counts (players, 9) summed over seasons, and a stratum label per row."""
    if not isinstance(table, pd.DataFrame):
        counts = as_outcome_array(table, "counts_table").reshape(-1, len(OUTCOMES))
        return counts, np.zeros(len(counts), dtype=int)
    counts_all = as_outcome_array(table, "counts_table")
    split_cols = [c for c in ("batter_hand", "pitcher_hand") if by_split and c in table.columns]
    id_col = next((c for c in (f"{role}_id", "player_id") if c in table.columns), None)
    keys = ([id_col] if id_col else []) + split_cols
    if not keys:
        return counts_all, np.zeros(len(counts_all), dtype=int)
    frame = pd.DataFrame(counts_all, columns=list(OUTCOMES))
    for k in keys:
        frame[k] = table[k].astype(str).to_numpy()
    grouped = frame.groupby(keys, sort=True, observed=True)[list(OUTCOMES)].sum()
    if split_cols:
        strata = pd.MultiIndex.from_frame(grouped.index.to_frame()[split_cols]).codes
        label = np.zeros(len(grouped), dtype=int)
        for codes in strata:
            label = label * 4 + np.asarray(codes)
    else:
        label = np.zeros(len(grouped), dtype=int)
    return grouped.to_numpy(dtype=float), label
