"""The invented demo league: a seeded generator of plate appearances with a known truth.

Every team, player and game here is made up; names are built from syllables so that they
cannot be mistaken for real people. The data exists to demonstrate and to measure the
toolkit: because the generator knows each plate appearance's true outcome probabilities
(:func:`true_probabilities`, the oracle), a model's calibration and Brier score can be
compared with the best prediction possible. It is never a check value for a statistic.

The league
----------
``n_teams`` teams (20 by default) each carry 13 batters (left, right or switch hitters) and
13 pitchers (5 starters in rotation, 8 relievers). Seasons are 162 games of three-game
series on a balanced schedule. Before each game each team ranks its batters by true value
against the hand of the opposing starter (platoon-aware), rests a few, and bats the top nine
in that order. A starter faces 18-30 batters (mean ~24.5), then relievers take 3-7 each.
Games last nine innings, the bottom of the ninth is skipped when the home team leads, extra
innings continue until an inning ends with the scores apart, and a walk-off ends the game
after the play. Talents stay fixed across seasons, so every season draws from one truth.

The true matchup rule
---------------------
Hands are coded 0 = L, 1 = R; a switch hitter bats from the side opposite the pitcher.

Stage 1 (strikeout, walk, hit by pitch or batted ball). Each batter has talent rates
``b = (b_K, b_BB, b_HBP, b_BAT)`` against a league-average pitcher, each pitcher ``q`` against
a league-average batter, the league has ``l`` (``LEAGUE_STAGE1``) and the batter-hand x
pitcher-hand pair has platoon multipliers ``m`` (``PLATOON_STAGE1``; same-hand matchups
raise strikeouts and cut walks, more so for left-handed batters). Then::

    p_i = (b_i q_i m_i / l_i) / sum_j (b_j q_j m_j / l_j)     for i in K, BB, HBP, BAT

the odds-ratio rule (a batter who strikes out twice as often as the league facing a pitcher
who does the same strikes out about four times as often, before renormalising).

Stage 2 (a batted ball). Exit velocity and launch angle are independent normals::

    EV ~ N(EV_MEAN + ev_batter + ev_pitcher + PLATOON_EV[hands], EV_SD^2)
    LA ~ N(LA_MEAN + la_batter + la_pitcher, LA_SD^2)

(means 88 mph and 11 degrees, spreads 14 mph and 26 degrees), and the outcome among
``1B, 2B, 3B, HR, GB_OUT, AIR_OUT`` is drawn from a fixed smooth function
``f(EV, LA)`` (:func:`batted_ball_probabilities`): home runs need about 101 mph near 28
degrees, ground balls rarely leave the park, hard-hit balls are hits far more often, pop ups
are outs. So a plate appearance's true probabilities are
``P(K), P(BB), P(HBP)`` from stage 1 and ``P(BAT) * E[f(EV, LA)]`` for the batted outcomes;
the oracle computes the expectation by Gauss-Hermite quadrature (160 nodes per axis;
``f`` is a sum of products of an exit-velocity factor and a launch-angle factor, so two
one-dimensional integrals per term are exact to quadrature error, below 1e-4).

Base running: on a single the runner from third scores and the runner from second scores
more often on hard contact; on a double the runner from first sometimes scores; ground-ball
outs with a runner on first and fewer than two outs become double plays 45% of the time;
deep fly balls with fewer than two outs score the runner from third most of the time. Every
row satisfies the runs-scored identity (common practice)::

    runs_on_play = (runners_before + outs_before + 1) - (runners_after + outs_after)

so when the third out is made, ``bases_after`` keeps the runners left on base.

About 2% of batted balls have no exit velocity or launch angle, as with real tracking gaps;
recorded values are rounded to 0.1.
"""

from __future__ import annotations

import contextlib
import os
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pandas as pd

from ._demo_sim import make_players, make_schedule, plan_games, play_games
from ._demo_truth import (
    EV_MEAN,
    EV_SD,
    LA_MEAN,
    LA_SD,
    LEAGUE_STAGE1,
    PLATOON_EV,
    PLATOON_STAGE1,
    batted_ball_probabilities,
    contact_means,
    expected_batted,
    stage1_probabilities,
)
from ._errors import DataError
from ._schema import OUTCOMES

__all__ = [
    "DEMO_FILES",
    "EV_MEAN",
    "EV_SD",
    "LA_MEAN",
    "LA_SD",
    "LEAGUE_STAGE1",
    "PLATOON_EV",
    "PLATOON_STAGE1",
    "DemoLeague",
    "batted_ball_probabilities",
    "demo_path",
    "make_demo_league",
    "true_probabilities",
    "write_demo_league",
]

#: Files :func:`write_demo_league` writes, in this order.
DEMO_FILES: tuple[str, ...] = ("plate_appearances.parquet", "players.parquet", "teams.parquet")

#: The repository's folder of committed demo files.
_COMMITTED_DIR = Path(__file__).resolve().parents[2] / "demo_data"

#: Share of batted balls whose tracking values are left missing.
_TRACKING_GAP = 0.02

_TALENT_COLUMNS = ("talent_k", "talent_bb", "talent_hbp", "talent_bat", "talent_ev", "talent_la")

_PA_COLUMNS = (
    "game_id", "game_date", "season", "inning", "half", "team_batting", "team_fielding",
    "lineup_slot", "batter_id", "batter_name", "batter_hand", "pitcher_id", "pitcher_name",
    "pitcher_hand", "outs_before", "bases_before", "outcome", "exit_velo", "launch_angle",
    "outs_after", "bases_after", "runs_on_play",
)  # fmt: skip


@dataclass(frozen=True)
class DemoLeague:
    """An invented league: plate appearances, players with true talents, and teams.

    Attributes
    ----------
    pas : pandas.DataFrame
        One row per plate appearance, sorted by game then order, with the columns of the
        plate-appearance contract plus ``half``, ``team_batting``, ``team_fielding`` and
        ``lineup_slot``. ``game_date`` is ``datetime64[s]`` here and a Parquet ``date`` in the
        written file.
    players : pandas.DataFrame
        ``player_id, name, team_id, role`` (batter, starter, reliever), ``hand`` (L, R, or S
        for a switch hitter) and the true talents ``talent_k, talent_bb, talent_hbp,
        talent_bat`` (stage-1 rates against a league-average opponent) and ``talent_ev``,
        ``talent_la`` (mph and degrees added to the batted-ball means).
    teams : pandas.DataFrame
        ``team_id, place, nickname, name``.
    seed : int
        The seed that generated the league.
    """

    pas: pd.DataFrame
    players: pd.DataFrame
    teams: pd.DataFrame
    seed: int


def make_demo_league(
    *, seed: int = 2026, n_seasons: int = 3, n_teams: int = 20, n_games: int = 162
) -> DemoLeague:
    """Generate the invented demo league.

    Parameters
    ----------
    seed : int, default 2026
        Seed of every random draw; the same seed gives the same league.
    n_seasons : int, default 3
        Seasons to play (2024 onwards).
    n_teams : int, default 20
        Teams in the league; an even number, at least 2.
    n_games : int, default 162
        Games per team per season.

    Returns
    -------
    DemoLeague

    Raises
    ------
    ValueError
        If ``n_teams`` is odd or below 2, or ``n_seasons`` or ``n_games`` is below 1.

    Examples
    --------
    >>> league = make_demo_league(seed=1, n_seasons=1, n_teams=2, n_games=2)
    >>> league.pas["game_id"].unique().tolist()
    ['2024-0001', '2024-0002']
    >>> bool((league.pas["runs_on_play"] >= 0).all())
    True
    """
    if n_teams < 2 or n_teams % 2:
        msg = f"n_teams must be an even number of at least 2, got {n_teams}; pick e.g. 20."
        raise ValueError(msg)
    for name, value in (("n_seasons", n_seasons), ("n_games", n_games)):
        if value < 1:
            msg = f"{name} must be at least 1, got {value}."
            raise ValueError(msg)
    rng_players, rng_plan, rng_play, rng_gaps = (
        np.random.default_rng(s) for s in np.random.SeedSequence(seed).spawn(4)
    )
    players, teams = make_players(n_teams, rng_players)
    sched = make_schedule(n_teams, n_seasons, n_games)
    lineup, staff, leash = plan_games(sched, players, n_teams, rng_plan)
    _add_namesakes(players, lineup)
    cols = play_games(lineup, staff, leash, players, rng_play)
    pas = _pa_frame(cols, sched, players, teams, rng_gaps)
    return DemoLeague(pas=pas, players=players, teams=teams, seed=seed)


def _add_namesakes(players: pd.DataFrame, lineup: np.ndarray) -> None:
    """Give the most used batter of the second team the name of the first team's.

    Two distinct players (different ids) then share a display name, as happens in real
    data, so that lookups by name meet an ambiguous case.
    """
    counts = np.bincount(lineup.ravel(), minlength=len(players))
    team = players["team_id"].to_numpy()
    batter = (players["role"] == "batter").to_numpy()
    first, second = team[0], team[batter & (team != team[0])][0]  # n_teams >= 2
    a = int(np.argmax(np.where(batter & (team == first), counts, -1)))
    b = int(np.argmax(np.where(batter & (team == second), counts, -1)))
    players.loc[b, "name"] = players.loc[a, "name"]


def _pa_frame(cols, sched, players, teams, rng) -> pd.DataFrame:
    game = cols["game"]
    side = cols["half"]
    team_idx = np.stack([sched["away"].to_numpy(), sched["home"].to_numpy()], axis=1)
    team_ids = teams["team_id"].to_numpy()
    hands = np.array(["L", "R"])
    ids = players["player_id"].to_numpy()
    names = players["name"].to_numpy()

    ev = cols["exit_velo"]
    la = cols["launch_angle"]
    gap = ~np.isnan(ev) & (rng.random(len(ev)) < _TRACKING_GAP)
    ev = np.where(gap, np.nan, np.round(np.clip(ev, 0.0, 130.0), 1)).astype(np.float32)
    la = np.where(gap, np.nan, np.round(np.clip(la, -90.0, 90.0), 1)).astype(np.float32)

    frame = pd.DataFrame(
        {
            "game_id": sched["game_id"].to_numpy()[game],
            "game_date": pd.to_datetime(sched["game_date"]).to_numpy().astype("datetime64[s]")[game],
            "season": sched["season"].to_numpy().astype(np.int64)[game],
            "inning": cols["inning"],
            "half": np.array(["top", "bottom"])[side],
            "team_batting": team_ids[team_idx[game, side]],
            "team_fielding": team_ids[team_idx[game, 1 - side]],
            "lineup_slot": cols["slot"] + 1,
            "batter_id": ids[cols["batter"]],
            "batter_name": names[cols["batter"]],
            "batter_hand": hands[cols["batter_hand"]],
            "pitcher_id": ids[cols["pitcher"]],
            "pitcher_name": names[cols["pitcher"]],
            "pitcher_hand": hands[cols["pitcher_hand"]],
            "outs_before": cols["outs_before"],
            "bases_before": cols["bases_before"],
            "outcome": np.array(OUTCOMES)[cols["outcome"]],
            "exit_velo": ev,
            "launch_angle": la,
            "outs_after": cols["outs_after"],
            "bases_after": cols["bases_after"],
            "runs_on_play": cols["runs_on_play"],
        },
        columns=list(_PA_COLUMNS),
    )
    return frame


def true_probabilities(pas: pd.DataFrame, players: pd.DataFrame) -> np.ndarray:
    """Each plate appearance's true outcome probabilities before it happened (the oracle).

    Parameters
    ----------
    pas : pandas.DataFrame
        Plate appearances with ``batter_id``, ``pitcher_id``, ``batter_hand`` and
        ``pitcher_hand`` (the hands actually used in each plate appearance).
    players : pandas.DataFrame
        The league's players with their true talents (``DemoLeague.players`` or the
        ``players.parquet`` file written beside the plate appearances).

    Returns
    -------
    numpy.ndarray
        Shape ``(len(pas), 9)`` in ``OUTCOMES`` order; each row sums to 1.

    Raises
    ------
    DataError
        If a column is missing, a hand is not L or R, or a batter or pitcher id is not
        among ``players``.

    Examples
    --------
    >>> league = make_demo_league(seed=1, n_seasons=1, n_teams=2, n_games=1)
    >>> p = true_probabilities(league.pas, league.players)
    >>> p.shape[1], bool(np.allclose(p.sum(axis=1), 1.0))
    (9, True)
    """
    need = ["batter_id", "pitcher_id", "batter_hand", "pitcher_hand"]
    missing = [c for c in need if c not in pas.columns]
    if missing:
        msg = f"true_probabilities needs columns {missing} in the plate appearances; pass the demo league's table."
        raise DataError(msg)
    talents = players.set_index("player_id")[list(_TALENT_COLUMNS)]
    rows = {}
    for role in ("batter", "pitcher"):
        keys = pas[f"{role}_id"].to_numpy()
        idx = talents.index.get_indexer(keys)
        if (idx < 0).any():
            bad = pd.unique(keys[idx < 0])
            msg = (
                f"column '{role}_id' has {int((idx < 0).sum())} row(s) whose id is not among the players "
                f"(e.g. {', '.join(map(str, bad[:5]))}); pass the players table of the same demo league."
            )
            raise DataError(msg)
        rows[role] = talents.to_numpy()[idx]
    coded = {}
    for col in ("batter_hand", "pitcher_hand"):
        values = pas[col].to_numpy(dtype=object)
        bad = ~np.isin(values, ["L", "R"])
        if bad.any():
            shown = ", ".join(map(repr, pd.unique(values[bad])[:5]))
            msg = (
                f"column '{col}' is not L or R in {int(bad.sum())} row(s) (e.g. {shown}); give the hand "
                "used in each plate appearance (a switch hitter's side for that PA)."
            )
            raise DataError(msg)
        coded[col] = (values == "R").astype(np.int64)  # 0 = L, 1 = R
    bh, ph = coded["batter_hand"], coded["pitcher_hand"]
    b, q = rows["batter"], rows["pitcher"]
    p1 = stage1_probabilities(b[:, :4], q[:, :4], bh, ph)
    mu_ev, mu_la = contact_means(b[:, 4], q[:, 4], b[:, 5], q[:, 5], bh, ph)
    return np.column_stack([p1[:, :3], p1[:, 3:] * expected_batted(mu_ev, mu_la)])


def _arrow_tables(league: DemoLeague):
    import pyarrow as pa

    pas = league.pas
    fields = []
    for col in pas.columns:
        if col == "game_date":
            typ = pa.date32()
        elif col in ("exit_velo", "launch_angle"):
            typ = pa.float32()
        elif pas[col].dtype.kind in "iu":
            typ = pa.int64()
        else:
            typ = pa.string()
        fields.append(pa.field(col, typ, nullable=col in ("exit_velo", "launch_angle")))
    schema = pa.schema(fields)
    arrays = []
    for f in schema:
        values = pas[f.name].to_numpy()
        if f.name == "game_date":
            values = values.astype("datetime64[D]")
        arrays.append(pa.array(values, type=f.type, from_pandas=True))
    pa_table = pa.Table.from_arrays(arrays, schema=schema)

    def plain(frame):
        return pa.Table.from_pandas(frame, preserve_index=False).replace_schema_metadata(None)

    return pa_table, plain(league.players), plain(league.teams)


def write_demo_league(
    out_dir: str | os.PathLike,
    *,
    seed: int = 2026,
    n_seasons: int = 3,
    n_teams: int = 20,
    n_games: int = 162,
) -> list[Path]:
    """Generate the demo league and write it as Parquet files into ``out_dir``.

    The same seed and package versions give the same bytes: no timestamps or pandas
    metadata are written, strings are dictionary-encoded and compressed with zstd.

    Parameters
    ----------
    out_dir : str or path-like
        Folder to write into (created if needed).
    seed, n_seasons, n_teams, n_games
        As in :func:`make_demo_league`.

    Returns
    -------
    list of pathlib.Path
        The files written, in the order of ``DEMO_FILES``.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as tmp:
    ...     paths = write_demo_league(tmp, seed=1, n_seasons=1, n_teams=2, n_games=1)
    ...     [p.name for p in paths]
    ['plate_appearances.parquet', 'players.parquet', 'teams.parquet']
    """
    import pyarrow.parquet as pq

    from ._files import atomic_path, folder_lock, remove_stale_partials

    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    league = make_demo_league(seed=seed, n_seasons=n_seasons, n_teams=n_teams, n_games=n_games)
    paths = [out / name for name in DEMO_FILES]
    # All three files are written to temporary files first and renamed only when every one
    # is complete, under a lock on the folder: an interrupted run leaves the previous league
    # (or none), and two runs into one folder cannot mix one seed's files with another's.
    with folder_lock(out), contextlib.ExitStack() as stack:
        remove_stale_partials(out, DEMO_FILES)  # left by a run that was killed mid-write
        for path, table in zip(paths, _arrow_tables(league)):
            tmp = stack.enter_context(atomic_path(path))
            pq.write_table(
                table,
                tmp,
                compression="zstd",
                compression_level=9,
                use_dictionary=True,
                write_statistics=True,
            )
    return paths


def demo_path() -> Path:
    """Path of the demo league's ``plate_appearances.parquet``.

    The repository's committed ``demo_data/`` folder when it is there; otherwise the league
    is generated once (default seed) into the user cache folder (``$XDG_CACHE_HOME`` or
    ``~/.cache``, under ``matchup-widgets/demo-2026``) and that path is returned.

    Returns
    -------
    pathlib.Path

    Examples
    --------
    >>> demo_path().name
    'plate_appearances.parquet'
    """
    committed = _COMMITTED_DIR / DEMO_FILES[0]
    if committed.is_file():
        return committed
    cache = Path(os.environ.get("XDG_CACHE_HOME") or Path.home() / ".cache") / "matchup-widgets" / "demo-2026"
    target = cache / DEMO_FILES[0]
    if not all((cache / name).is_file() for name in DEMO_FILES):
        write_demo_league(cache, seed=2026)
    return target
