"""The demo league's machinery: rosters and talents, schedule, lineups, and the game engine.

Games are simulated as numpy lanes: every game of the league is a lane, and each step plays
one plate appearance in every game still going. Nothing loops over plate appearances in
Python; the loop runs once per step (about 90-150 steps for a whole league).
"""

from __future__ import annotations

import datetime as dt

import numpy as np
import pandas as pd

from ._demo_names import TEAM_NICKNAMES, TEAM_PLACES, invent_names
from ._demo_truth import (
    EV_SD,
    LA_SD,
    LEAGUE_STAGE1,
    _sigmoid,
    batted_ball_probabilities,
    contact_means,
    expected_batted,
    stage1_probabilities,
)

# Roster shape per team.
N_BATTERS, N_STARTERS, N_RELIEVERS = 13, 5, 8
N_LINEUP = 9
_PEN = 1 + N_RELIEVERS  # pitchers a team can use in one game, starter first

#: wOBA-style weights (common practice, from memory: typical recent linear weights scaled
#: to on-base units), used only to rank batters when a manager picks a lineup.
_LINEUP_WEIGHTS = np.array([0.0, 0.69, 0.72, 0.89, 1.27, 1.62, 2.10, 0.0, 0.0])

# Share of plate appearances by hand (common practice, rough): right-handed batters are the
# majority, switch hitters a small group; about a quarter to a third of pitchers throw left.
_BAT_HANDS = (("L", 0.32), ("R", 0.55), ("S", 0.13))
_THROW_LEFT = 0.28

_HAND_CODE = {"L": 0, "R": 1, "S": 2}
_START_DAY = (4, 1)  # opening day, month and day
_FIRST_SEASON = 2024


def _talent_rates(z: np.ndarray) -> np.ndarray:
    """Stage-1 talent rates ``l_i exp(z_i)`` renormalised; ``z`` is (n, 3) for K, BB, HBP."""
    raw = LEAGUE_STAGE1 * np.exp(np.column_stack([z, np.zeros(len(z))]))
    return raw / raw.sum(axis=1, keepdims=True)


def make_players(n_teams: int, rng: np.random.Generator) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Rosters with hands and true talents, and the teams table."""
    team_ids = [f"t{i + 1:02d}" for i in range(n_teams)]
    teams = pd.DataFrame(
        {
            "team_id": team_ids,
            "place": [TEAM_PLACES[i % len(TEAM_PLACES)] for i in range(n_teams)],
            "nickname": [TEAM_NICKNAMES[i % len(TEAM_NICKNAMES)] for i in range(n_teams)],
        }
    )
    teams["name"] = teams["place"] + " " + teams["nickname"]

    nb, npi = n_teams * N_BATTERS, n_teams * (N_STARTERS + N_RELIEVERS)
    hands = np.array([h for h, _ in _BAT_HANDS])
    bats = hands[rng.choice(len(hands), nb, p=[p for _, p in _BAT_HANDS])]
    throws = np.where(rng.random(npi) < _THROW_LEFT, "L", "R")

    # Batters: strikeout log-odds sd 0.30 gives a true-talent K% sd of ~5 points at 22%;
    # walks 0.33 (~2.5 points). Harder contact goes with more strikeouts and more lift.
    g = rng.standard_normal((nb, 5))
    b_ev = 2.2 * g[:, 0]
    b_z = np.column_stack(
        [0.30 * (0.35 * g[:, 0] + 0.94 * g[:, 1]), 0.33 * (0.25 * g[:, 0] + 0.97 * g[:, 2]), 0.45 * g[:, 3]]
    )
    b_la = 4.5 * (0.30 * g[:, 0] + 0.95 * g[:, 4])

    # Pitchers: strikeout sd 0.26 (~4.5 points), walks 0.28; strikeout pitchers allow
    # softer contact; relievers strike out more batters (common practice).
    h = rng.standard_normal((npi, 5))
    reliever = np.tile(np.r_[np.zeros(N_STARTERS, bool), np.ones(N_RELIEVERS, bool)], n_teams)
    p_z = np.column_stack([0.26 * h[:, 0] + 0.12 * reliever, 0.28 * h[:, 1], 0.40 * h[:, 2]])
    p_ev = 1.0 * (-0.30 * h[:, 0] + 0.95 * h[:, 3])
    p_la = 3.5 * h[:, 4]

    names = invent_names(nb + npi, rng)
    batters = pd.DataFrame(
        {
            "player_id": [f"b{i + 1:04d}" for i in range(nb)],
            "name": names[:nb],
            "team_id": np.repeat(team_ids, N_BATTERS),
            "role": "batter",
            "hand": bats,
        }
    )
    pitchers = pd.DataFrame(
        {
            "player_id": [f"p{i + 1:04d}" for i in range(npi)],
            "name": names[nb:],
            "team_id": np.repeat(team_ids, N_STARTERS + N_RELIEVERS),
            "role": np.where(reliever, "reliever", "starter"),
            "hand": throws,
        }
    )
    players = pd.concat([batters, pitchers], ignore_index=True)
    rates = np.vstack([_talent_rates(b_z), _talent_rates(p_z)])
    for j, col in enumerate(("talent_k", "talent_bb", "talent_hbp", "talent_bat")):
        players[col] = rates[:, j]
    players["talent_ev"] = np.r_[b_ev, p_ev]
    players["talent_la"] = np.r_[b_la, p_la]
    return players, teams


def lineup_values(players: pd.DataFrame) -> np.ndarray:
    """Each batter's true wOBA-style value against a league-average pitcher of each hand.

    Returns an (n_players, 2) array (columns: vs L, vs R); pitchers get -inf.
    """
    n = len(players)
    out = np.full((n, 2), -np.inf)
    bat = np.flatnonzero(players["role"].to_numpy() == "batter")
    hand = players["hand"].map(_HAND_CODE).to_numpy()[bat]
    rates = players[["talent_k", "talent_bb", "talent_hbp", "talent_bat"]].to_numpy()[bat]
    for ph in (0, 1):
        bh = np.where(hand == 2, 1 - ph, hand)
        avg = np.broadcast_to(LEAGUE_STAGE1, rates.shape)
        p1 = stage1_probabilities(rates, avg, bh, np.full_like(bh, ph))
        zeros = np.zeros(len(bat))
        mu_ev, mu_la = contact_means(
            players["talent_ev"].to_numpy()[bat], zeros, players["talent_la"].to_numpy()[bat], zeros, bh, ph
        )
        probs = np.column_stack([p1[:, :3], p1[:, 3:] * expected_batted(mu_ev, mu_la)])
        out[bat, ph] = probs @ _LINEUP_WEIGHTS
    return out


def make_schedule(n_teams: int, n_seasons: int, n_games: int) -> pd.DataFrame:
    """Balanced schedule of three-game series by the circle method, one table for all seasons.

    Columns: season, game_date, day, home, away (team indices), team game numbers.
    """
    n_rounds = -(-n_games // 3)
    fixed, rest = n_teams - 1, list(range(n_teams - 1))
    rounds = []
    hosted = np.zeros(n_teams, dtype=np.int64)
    for r in range(n_teams - 1):
        ring = rest[r:] + rest[:r]
        pairs = [(fixed, ring[0])] + [(ring[i], ring[-i]) for i in range(1, n_teams // 2)]
        this = []
        for i, (a, b) in enumerate(pairs):
            # The team that has hosted fewer series hosts this one (alternating on ties),
            # so every team hosts half its series over a cycle and its mirror.
            if hosted[a] != hosted[b]:
                home = a if hosted[a] < hosted[b] else b
            else:
                home = a if (r + i) % 2 == 0 else b
            hosted[home] += 1
            this.append((home, b if home == a else a))
        rounds.append(this)
    rows = []
    for season in range(n_seasons):
        start = dt.date(_FIRST_SEASON + season, *_START_DAY)
        for k in range(n_rounds):
            cycle, r = divmod(k, n_teams - 1)
            for g in range(3):
                day = 3 * k + g
                if day >= n_games:
                    break
                date = start + dt.timedelta(days=day + day // 6)  # an off day after every two series
                for home, away in rounds[r]:
                    if cycle % 2:
                        home, away = away, home
                    rows.append((_FIRST_SEASON + season, date, day, home, away))
    sched = pd.DataFrame(rows, columns=["season", "game_date", "day", "home", "away"])
    sched = sched.sort_values(["season", "day", "home"], kind="stable", ignore_index=True)
    sched["game_id"] = (
        sched["season"].astype(str) + "-" + (sched.groupby("season").cumcount() + 1).map("{:04d}".format)
    )
    return sched


def plan_games(
    sched: pd.DataFrame, players: pd.DataFrame, n_teams: int, rng: np.random.Generator
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Starters by rotation, platoon-aware lineups and bullpen order for every game.

    Returns ``lineup`` (G, 2, 9) batter rows of ``players``, ``staff`` (G, 2, 9) pitcher rows
    (starter first), and ``leash`` (G, 2, 9): batters each pitcher may face before being
    relieved. Side 0 is the visiting team, side 1 the home team.
    """
    n_games = len(sched)
    teams = np.stack([sched["away"].to_numpy(), sched["home"].to_numpy()], axis=1)  # (G, 2)
    # Team game number within the season sets the rotation turn (five-man rotation).
    seasons = sched["season"].to_numpy()
    long = pd.DataFrame({"season": np.repeat(seasons, 2), "team": teams.ravel()})
    long["n"] = long.groupby(["season", "team"], sort=False).cumcount()
    turn = long["n"].to_numpy().reshape(n_games, 2)

    per_team_p = N_STARTERS + N_RELIEVERS
    first_pitcher = n_teams * N_BATTERS
    starter = first_pitcher + teams * per_team_p + turn % N_STARTERS
    pen = np.argsort(rng.random((n_games, 2, N_RELIEVERS)), axis=-1)
    relievers = first_pitcher + teams[..., None] * per_team_p + N_STARTERS + pen
    staff = np.concatenate([starter[..., None], relievers], axis=-1)
    leash = np.concatenate(
        [
            np.clip(np.rint(rng.normal(24.5, 2.5, (n_games, 2, 1))), 18, 30),
            rng.integers(3, 8, (n_games, 2, N_RELIEVERS)),
        ],
        axis=-1,
    ).astype(np.int64)

    # Lineups: each team ranks its batters by true value against the opposing starter's
    # hand (platoon-aware), with a little noise and a few rest days, and bats the top nine
    # in order of that ranking.
    values = lineup_values(players)
    throws = players["hand"].map(_HAND_CODE).to_numpy()
    opp_hand = throws[starter[:, ::-1]]  # (G, 2) hand of the starter each side faces
    roster = teams[..., None] * N_BATTERS + np.arange(N_BATTERS)  # (G, 2, 13)
    score = values[roster, opp_hand[..., None]]
    score = score + rng.normal(0.0, 0.012, score.shape) - (rng.random(score.shape) < 0.05)
    order = np.argsort(-score, axis=-1, kind="stable")[..., :N_LINEUP]
    lineup = np.take_along_axis(roster, order, axis=-1)
    return lineup, staff, leash


def _true_like(x: np.ndarray) -> np.ndarray:
    return np.ones_like(x, dtype=bool)


def _advance(outcome, outs, bases, ev, la, u):
    """Base-out transition of one plate appearance, vectorised.

    The advancement chances are this generator's own, tuned (with ``f``) so the league
    scores ~4.4-4.7 runs per team-game (common practice, from memory) and grounds into a
    double play in ~2% of plate appearances.

    Returns (outs_after, bases_after, runs). Runners are conserved, so the runs-scored
    identity ``runs = runners_before + outs_before + 1 - runners_after - outs_after`` holds
    on every row; when the third out is made no run scores and the runners left on base
    stay in ``bases_after``.
    """
    r1, r2, r3 = (bases & 1) > 0, (bases & 2) > 0, (bases & 4) > 0
    ua, ub, uc, ud = u.T
    ev = np.nan_to_num(ev, nan=85.0)
    la = np.nan_to_num(la, nan=10.0)
    hard = _sigmoid((ev - 92.0) / 6.0)
    two_out = outs == 2
    false = np.zeros_like(r1)
    i = lambda x: x.astype(np.int64)  # noqa: E731

    # Walk, hit by pitch: forced runners move up.
    walk = (_true_like(r1), r2 | r1, r3 | (r1 & r2), i(r1 & r2 & r3))
    # Single: runner from third scores; from second scores more often on hard contact and
    # with two outs (running on contact); from first to third sometimes.
    s2 = r2 & (ua < 0.55 + 0.30 * hard + 0.15 * two_out)
    hold2 = r2 & ~s2
    t13 = r1 & ~hold2 & (ub < 0.25 + 0.16 * hard + 0.08 * two_out)
    single = (_true_like(r1), r1 & ~t13, hold2 | t13, i(r3) + i(s2))
    # Double: runners on second and third score; from first sometimes.
    s1 = r1 & (ua < 0.40 + 0.26 * hard + 0.15 * two_out)
    double = (false, _true_like(r1), r1 & ~s1, i(r3) + i(r2) + i(s1))
    triple = (false, false, _true_like(r1), i(r1) + i(r2) + i(r3))
    homer = (false, false, false, i(r1) + i(r2) + i(r3) + 1)

    # Ground-ball out with fewer than two outs: double play, fielder's choice or a plain
    # out on which runners may move up.
    dp = r1 & ~two_out & (ua < 0.45)
    dp_end = dp & (outs == 1)
    fc = r1 & ~two_out & ~dp & (ub < 0.35)
    forced3 = r1 & r2 & r3
    s3 = r3 & (forced3 | (uc < 0.50))
    stay3 = r3 & ~s3
    a2 = r2 & ((r1 & r2) | (~stay3 & (ud < 0.55)))
    plain = (false, (r2 & ~a2) | r1, stay3 | a2, i(s3))
    ground = tuple(
        np.where(dp_end, d_end, np.where(dp, d_mid, np.where(fc, f, p)))
        for d_end, d_mid, f, p in zip(
            (false, r2, r3, 0 * outs),  # third out on the double play: others stranded
            (false, false, r2, i(r3)),  # double play with none out: others move up
            (_true_like(r1), false, r2 | r3, i(r2 & r3)),  # out at second, batter safe
            plain,
        )
    )
    ground_outs = outs + 1 + dp
    # Air out with fewer than two outs: a deep fly ball scores the runner from third
    # (sacrifice fly) and may move the runner from second up.
    deep = _sigmoid((ev - 82.0) / 5.0) * _sigmoid((la - 20.0) / 3.0) * (1.0 - _sigmoid((la - 50.0) / 3.0))
    f3 = r3 & (uc < 0.85 * deep)
    fstay3 = r3 & ~f3
    f2 = r2 & ~fstay3 & (ud < 0.45 * deep)
    air = (r1, r2 & ~f2, fstay3 | f2, i(f3))

    kept = (r1, r2, r3, 0 * outs)
    branches = [kept, walk, walk, single, double, triple, homer, ground, air]
    parts = []
    for k in range(4):
        choices = [b[k] for b in branches]
        parts.append(np.choose(outcome, [np.broadcast_to(c, outcome.shape) for c in choices]))
    n1, n2, n3, runs = parts
    outs_after = np.choose(
        outcome, [outs + 1, outs, outs, outs, outs, outs, outs, ground_outs, outs + 1]
    )
    # Two outs and an out on the play: the inning ends, runners stranded, no runs.
    third = two_out & ((outcome == 0) | (outcome == 7) | (outcome == 8))
    n1, n2, n3 = np.where(third, r1, n1), np.where(third, r2, n2), np.where(third, r3, n3)
    runs = np.where(third, 0, runs)
    outs_after = np.where(third, 3, outs_after)
    bases_after = n1.astype(np.int64) + 2 * n2 + 4 * n3
    return outs_after, bases_after, runs


def play_games(
    lineup: np.ndarray,
    staff: np.ndarray,
    leash: np.ndarray,
    players: pd.DataFrame,
    rng: np.random.Generator,
    *,
    max_innings: int = 30,
) -> dict[str, np.ndarray]:
    """Play every game as a numpy lane, one plate appearance per step.

    Returns column arrays, one entry per plate appearance, sorted by game then order.
    """
    n_games = lineup.shape[0]
    rates = players[["talent_k", "talent_bb", "talent_hbp", "talent_bat"]].to_numpy()
    t_ev = players["talent_ev"].to_numpy()
    t_la = players["talent_la"].to_numpy()
    hand = players["hand"].map(_HAND_CODE).to_numpy()

    inning = np.ones(n_games, np.int64)
    half = np.zeros(n_games, np.int64)  # 0 top (visitors bat), 1 bottom
    outs = np.zeros(n_games, np.int64)
    bases = np.zeros(n_games, np.int64)
    score = np.zeros((n_games, 2), np.int64)
    slot = np.zeros((n_games, 2), np.int64)
    pslot = np.zeros((n_games, 2), np.int64)
    faced = np.zeros((n_games, 2), np.int64)
    active = np.ones(n_games, bool)
    records: list[dict[str, np.ndarray]] = []

    while active.any():
        g = np.flatnonzero(active)
        n = len(g)
        side = half[g]
        fld = 1 - side
        # Relieve a pitcher who has reached the leash (the last reliever stays in).
        tired = (faced[g, fld] >= leash[g, fld, pslot[g, fld]]) & (pslot[g, fld] < _PEN - 1)
        pslot[g[tired], fld[tired]] += 1
        faced[g[tired], fld[tired]] = 0

        batter = lineup[g, side, slot[g, side]]
        pitcher = staff[g, fld, pslot[g, fld]]
        ph = hand[pitcher]
        bh = np.where(hand[batter] == 2, 1 - ph, hand[batter])  # switch hitters bat opposite

        u = rng.random((n, 6))
        z = rng.standard_normal((n, 2))
        p1 = stage1_probabilities(rates[batter], rates[pitcher], bh, ph)
        cls = (u[:, :1] > np.cumsum(p1, axis=1)[:, :3]).sum(axis=1)
        mu_ev, mu_la = contact_means(t_ev[batter], t_ev[pitcher], t_la[batter], t_la[pitcher], bh, ph)
        ev = mu_ev + EV_SD * z[:, 0]
        la = mu_la + LA_SD * z[:, 1]
        fb = batted_ball_probabilities(ev, la)
        bcls = (u[:, 1:2] > np.cumsum(fb, axis=1)[:, :5]).sum(axis=1)
        outcome = np.where(cls < 3, cls, 3 + bcls)
        batted = outcome >= 3
        ev = np.where(batted, ev, np.nan)
        la = np.where(batted, la, np.nan)

        o_before, b_before = outs[g], bases[g]
        o_after, b_after, runs = _advance(outcome, o_before, b_before, ev, la, u[:, 2:])
        records.append(
            {
                "game": g,
                "inning": inning[g],
                "half": side,
                "slot": slot[g, side],
                "batter": batter,
                "pitcher": pitcher,
                "batter_hand": bh,
                "pitcher_hand": ph,
                "outcome": outcome,
                "exit_velo": ev,
                "launch_angle": la,
                "outs_before": o_before,
                "bases_before": b_before,
                "outs_after": o_after,
                "bases_after": b_after,
                "runs_on_play": runs,
            }
        )

        score[g, side] += runs
        slot[g, side] = (slot[g, side] + 1) % N_LINEUP
        faced[g, fld] += 1
        outs[g], bases[g] = o_after, b_after

        late = inning[g] >= 9
        walk_off = (side == 1) & late & (score[g, 1] > score[g, 0])
        over = o_after == 3
        top_done = over & (side == 0)
        bottom_done = over & (side == 1)
        finished = (
            walk_off
            | (top_done & late & (score[g, 1] > score[g, 0]))  # home team leads: no bottom half
            | (bottom_done & late & (score[g, 1] != score[g, 0]))
            | (bottom_done & (inning[g] >= max_innings))
        )
        active[g[finished]] = False
        go_on = over & ~finished
        gg = g[go_on]
        inning[gg] += half[gg]
        half[gg] = 1 - half[gg]
        outs[gg] = 0
        bases[gg] = 0

    cols = {k: np.concatenate([r[k] for r in records]) for k in records[0]}
    order = np.argsort(cols["game"], kind="stable")
    return {k: v[order] for k, v in cols.items()}
