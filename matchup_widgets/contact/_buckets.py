"""Exit-velocity x launch-angle buckets, batted-ball types and the hard-hit flag.

Cut points (common practice in the trade, not taken from any one source):

* batted-ball type from launch angle: ground ball below 10 degrees, line drive 10 to
  25, fly ball 25 to 50, pop up above 50;
* hard-hit: exit velocity of 95 mph or more.

Bands are left-closed: a ball of exactly 95 mph falls in the band that starts at 95.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np
import pandas as pd

from ._frames import batted_rows, check_role, frame_of, measured_mask, select_seasons

#: Batted-ball types in order of rising launch angle.
BATTED_BALL_TYPES: tuple[str, ...] = ("ground ball", "line drive", "fly ball", "pop up")
#: Launch-angle cut points (degrees) between the types; common practice.
BATTED_BALL_TYPE_CUTS: tuple[float, float, float] = (10.0, 25.0, 50.0)
#: Exit velocity (mph) from which a ball counts as hard-hit; common practice.
HARD_HIT_MPH: float = 95.0

#: Default interior edges of the exit-velocity bands (mph); outer bands are open-ended.
EV_EDGES: tuple[float, ...] = (80.0, 90.0, 95.0, 100.0, 105.0)
#: Default interior edges of the launch-angle bands (degrees); outer bands are open-ended.
LA_EDGES: tuple[float, ...] = (0.0, 10.0, 25.0, 35.0, 50.0)

_GROUP = ("batter_hand", "pitcher_hand")


def batted_ball_type(launch_angle: Any) -> pd.Categorical:
    """Classify batted balls by launch angle into the four usual types.

    Ground ball below 10 degrees, line drive from 10 up to 25, fly ball from 25 up to and
    including 50, pop up above 50 (common practice). Missing angles give a missing type.

    Parameters
    ----------
    launch_angle : array-like of float
        Launch angles in degrees.

    Returns
    -------
    pandas.Categorical
        Categories :data:`BATTED_BALL_TYPES`, in that order.

    Examples
    --------
    >>> list(batted_ball_type([5.0, 10.0, 30.0, 50.0, 61.0]))
    ['ground ball', 'line drive', 'fly ball', 'fly ball', 'pop up']
    """
    la = np.asarray(launch_angle, dtype="float64")
    low, mid, high = BATTED_BALL_TYPE_CUTS
    codes = np.select([la < low, la < mid, la <= high, la > high], [0, 1, 2, 3], default=-1)
    return pd.Categorical.from_codes(codes, categories=list(BATTED_BALL_TYPES))


def is_hard_hit(exit_velo: Any, *, threshold: float = HARD_HIT_MPH) -> np.ndarray:
    """True for balls hit at ``threshold`` mph or harder (95 mph, common practice).

    Missing exit velocities are not hard-hit.

    Examples
    --------
    >>> is_hard_hit([94.9, 95.0, float("nan"), 110.0]).tolist()
    [False, True, False, True]
    """
    ev = np.asarray(exit_velo, dtype="float64")
    with np.errstate(invalid="ignore"):
        return np.greater_equal(ev, threshold) & np.isfinite(ev)


def _check_edges(edges: Sequence[float], name: str) -> np.ndarray:
    arr = np.asarray(edges, dtype="float64")
    if arr.ndim != 1 or arr.size == 0 or not np.all(np.isfinite(arr)) or np.any(np.diff(arr) <= 0):
        msg = (
            f"{name} must be a non-empty, strictly increasing sequence of finite numbers "
            f"(interior band edges), got {list(np.atleast_1d(edges))}."
        )
        raise ValueError(msg)
    return arr


def band_labels(edges: Sequence[float]) -> list[str]:
    """Readable labels of the bands cut by interior ``edges`` (outer bands open-ended).

    Examples
    --------
    >>> band_labels([90, 95])
    ['<90', '90-95', '95+']
    """
    arr = _check_edges(edges, "edges")
    fmt = [f"{e:g}" for e in arr]
    return [f"<{fmt[0]}"] + [f"{a}-{b}" for a, b in zip(fmt[:-1], fmt[1:])] + [f"{fmt[-1]}+"]


def bucket_index(
    exit_velo: Any,
    launch_angle: Any,
    *,
    ev_edges: Sequence[float] = EV_EDGES,
    la_edges: Sequence[float] = LA_EDGES,
) -> np.ndarray:
    """Flat grid-cell index of each ball: ``ev_band * n_la_bands + la_band``; -1 if unmeasured.

    Examples
    --------
    >>> bucket_index([85.0, 101.0, float("nan")], [5.0, 30.0, 20.0], ev_edges=[90], la_edges=[10, 25])
    array([ 0,  5, -1])
    """
    ev_e = _check_edges(ev_edges, "ev_edges")
    la_e = _check_edges(la_edges, "la_edges")
    ev = np.asarray(exit_velo, dtype="float64")
    la = np.asarray(launch_angle, dtype="float64")
    ok = measured_mask(ev, la)
    # side="right" counts the edges <= x, so band i holds [edge[i-1], edge[i]).
    ev_band = np.searchsorted(ev_e, np.where(ok, ev, 0.0), side="right")
    la_band = np.searchsorted(la_e, np.where(ok, la, 0.0), side="right")
    return np.where(ok, ev_band * (la_e.size + 1) + la_band, -1)


def bucket_labels(
    *, ev_edges: Sequence[float] = EV_EDGES, la_edges: Sequence[float] = LA_EDGES
) -> pd.DataFrame:
    """One row per grid cell, in flat-index order: ``exit_velo_bin``, ``launch_angle_bin``, ``bucket``.

    Examples
    --------
    >>> bucket_labels(ev_edges=[95], la_edges=[10])["bucket"].tolist()
    ['EV <95 | LA <10', 'EV <95 | LA 10+', 'EV 95+ | LA <10', 'EV 95+ | LA 10+']
    """
    ev_l = band_labels(ev_edges)
    la_l = band_labels(la_edges)
    ev_col = np.repeat(ev_l, len(la_l))
    la_col = np.tile(la_l, len(ev_l))
    bucket = [f"EV {a} | LA {b}" for a, b in zip(ev_col, la_col)]
    return pd.DataFrame({"exit_velo_bin": ev_col, "launch_angle_bin": la_col, "bucket": bucket})


def group_codes(frame: pd.DataFrame, keys: list[str]) -> tuple[np.ndarray, pd.DataFrame]:
    """Integer group code of each row and the key table (one row per group, sorted)."""
    grouped = frame.groupby(keys, sort=True, observed=True, dropna=False)
    codes = grouped.ngroup().to_numpy()
    key_frame = grouped.size().index.to_frame(index=False)
    return codes, key_frame


def _player_frame(pas: Any, role: str, seasons: Any, purpose: str) -> tuple[pd.DataFrame, list[str]]:
    key = check_role(role)
    frame = select_seasons(frame_of(pas), seasons)
    batted = batted_rows(frame, purpose=purpose)
    batted = batted.rename(columns={key: "player_id"})
    return batted, ["player_id", *_GROUP]


def bucket_shares(
    pas: Any,
    *,
    role: str,
    ev_edges: Sequence[float] = EV_EDGES,
    la_edges: Sequence[float] = LA_EDGES,
    seasons: tuple[int, int] | None = None,
) -> pd.DataFrame:
    """Counts and shares of each exit-velocity x launch-angle bucket per player and split.

    Parameters
    ----------
    pas : PlateAppearances or pandas.DataFrame
        Plate appearances with ``exit_velo`` and ``launch_angle``.
    role : {"batter", "pitcher"}
        Whose balls to count.
    ev_edges, la_edges : sequence of float
        Interior band edges (mph, degrees); the outer bands are open-ended.
    seasons : (int, int), optional
        Inclusive (first, last) seasons; all seasons when None.

    Returns
    -------
    pandas.DataFrame
        Long table, the whole grid for every player and platoon split that has a measured
        ball: ``player_id``, ``batter_hand``, ``pitcher_hand``, ``exit_velo_bin``, ``launch_angle_bin``,
        ``bucket``, ``n`` (balls in the bucket), ``n_measured`` (balls with both
        measurements in that player and split) and ``share`` (``n / n_measured``).
        Batted balls without a measurement are left out of the grid; see
        :func:`batted_ball_profile` for their count.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1", "b1"], "pitcher_id": ["p1", "p1"],
    ...     "batter_hand": ["L", "L"], "pitcher_hand": ["R", "R"], "outcome": ["1B", "K"],
    ...     "exit_velo": [101.0, None], "launch_angle": [12.0, None]})
    >>> out = bucket_shares(df, role="batter", ev_edges=[95], la_edges=[10])
    >>> out[["bucket", "n", "share"]].to_dict("list")
    {'bucket': ['EV <95 | LA <10', 'EV <95 | LA 10+', 'EV 95+ | LA <10', 'EV 95+ | LA 10+'], 'n': [0, 0, 0, 1], 'share': [0.0, 0.0, 0.0, 1.0]}
    """
    batted, keys = _player_frame(pas, role, seasons, "bucket_shares")
    cell = bucket_index(
        batted["exit_velo"].to_numpy(), batted["launch_angle"].to_numpy(),
        ev_edges=ev_edges, la_edges=la_edges,
    )
    measured = batted.loc[cell >= 0]
    cell = cell[cell >= 0]
    labels = bucket_labels(ev_edges=ev_edges, la_edges=la_edges)
    n_cells = len(labels)
    codes, key_frame = group_codes(measured, keys)
    counts = np.bincount(codes * n_cells + cell, minlength=len(key_frame) * n_cells)
    counts = counts.reshape(len(key_frame), n_cells)
    n_measured = counts.sum(axis=1)
    out = key_frame.loc[key_frame.index.repeat(n_cells)].reset_index(drop=True)
    for col in labels.columns:
        out[col] = np.tile(labels[col].to_numpy(dtype=object), len(key_frame))
    out["n"] = counts.ravel()
    out["n_measured"] = np.repeat(n_measured, n_cells)
    out["share"] = out["n"] / out["n_measured"]
    return out


def batted_ball_profile(
    pas: Any, *, role: str, seasons: tuple[int, int] | None = None
) -> pd.DataFrame:
    """Batted-ball types, hard-hit rate and average contact per player and platoon split.

    Returns
    -------
    pandas.DataFrame
        One row per player and split: ``player_id``, ``batter_hand``, ``pitcher_hand``,
        ``n_batted`` (all batted balls), ``n_measured`` (with both exit velocity and launch
        angle), ``n_unmeasured``, counts ``n_ground_ball``, ``n_line_drive``,
        ``n_fly_ball``, ``n_pop_up``, ``n_hard_hit`` and the matching ``share_*`` columns
        (over measured balls), ``mean_exit_velo`` and ``mean_launch_angle``.

    Examples
    --------
    >>> df = pd.DataFrame({"batter_id": ["b1"] * 3, "pitcher_id": ["p1"] * 3,
    ...     "batter_hand": ["R"] * 3, "pitcher_hand": ["R"] * 3,
    ...     "outcome": ["1B", "GB_OUT", "AIR_OUT"],
    ...     "exit_velo": [99.0, 80.0, None], "launch_angle": [15.0, -5.0, None]})
    >>> row = batted_ball_profile(df, role="batter").iloc[0]
    >>> int(row["n_batted"]), int(row["n_measured"]), float(row["share_hard_hit"])
    (3, 2, 0.5)
    """
    batted, keys = _player_frame(pas, role, seasons, "batted_ball_profile")
    ev = batted["exit_velo"].to_numpy()
    la = batted["launch_angle"].to_numpy()
    ok = measured_mask(ev, la)
    codes, key_frame = group_codes(batted, keys)
    n_groups = len(key_frame)
    out = key_frame.copy()

    def per_group(weights: np.ndarray) -> np.ndarray:
        return np.bincount(codes, weights=weights, minlength=n_groups)

    out["n_batted"] = np.bincount(codes, minlength=n_groups)
    out["n_measured"] = np.bincount(codes[ok], minlength=n_groups)
    out["n_unmeasured"] = out["n_batted"] - out["n_measured"]
    kinds = np.asarray(batted_ball_type(la).codes)
    names = [t.replace(" ", "_") for t in BATTED_BALL_TYPES]
    for i, name in enumerate(names):
        out[f"n_{name}"] = np.bincount(codes[ok & (kinds == i)], minlength=n_groups)
    out["n_hard_hit"] = np.bincount(codes[ok & is_hard_hit(ev)], minlength=n_groups)
    with np.errstate(invalid="ignore", divide="ignore"):
        denom = out["n_measured"].to_numpy(dtype="float64")
        for name in [*names, "hard_hit"]:
            out[f"share_{name}"] = out[f"n_{name}"].to_numpy() / denom
        out["mean_exit_velo"] = per_group(np.where(ok, ev, 0.0)) / denom
        out["mean_launch_angle"] = per_group(np.where(ok, la, 0.0)) / denom
    return out
