"""Suite-wide fixtures: a private HOME for Jupyter and chromium, and the demo league."""

from __future__ import annotations

import os
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="session", autouse=True)
def _private_home(tmp_path_factory: pytest.TempPathFactory):
    """Jupyter, IPython and chromium write under $HOME: keep them in a temp dir."""
    home = tmp_path_factory.mktemp("home")
    saved = {k: os.environ.get(k) for k in ("HOME", "JUPYTER_RUNTIME_DIR", "IPYTHONDIR")}
    os.environ["HOME"] = str(home)
    os.environ["JUPYTER_RUNTIME_DIR"] = str(home / "jupyter-runtime")
    os.environ["IPYTHONDIR"] = str(home / "ipython")
    yield home
    for key, value in saved.items():
        if value is None:
            os.environ.pop(key, None)
        else:
            os.environ[key] = value


@pytest.fixture(scope="session")
def repo_root() -> Path:
    return REPO


@pytest.fixture(scope="session")
def artifacts_dir() -> Path:
    """Where tests leave files for a person to look at (screenshots, cards)."""
    path = REPO / "test-artifacts"
    path.mkdir(exist_ok=True)
    return path


_BASE_RATES = (0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.22, 0.23)


def _tilted_league(
    *,
    seed: int,
    n_pa: int,
    n_batters: int,
    n_pitchers: int,
    batter_sd: float,
    pitcher_sd: float | None = None,
    pa_per_game: int = 50,
    games_per_day: int = 4,
    batter_id: str = "b{i}",
    batter_names=None,
    pitcher_names=None,
    left_batter=lambda i: i % 3 == 0,
    left_pitcher=lambda i: i % 2 == 1,
):
    """A small invented league: every player tilts a fixed base mix of outcomes.

    Smoke data for panels and commands, never a check value. Each player's outcome shares are
    the base shares times a log-normal tilt per outcome (batter tilt x pitcher tilt),
    renormalised; outcomes are drawn once per plate appearance.
    """
    import numpy as np
    import pandas as pd

    from matchup_widgets.data import OUTCOMES

    rng = np.random.default_rng(seed)
    b, p = rng.integers(0, n_batters, n_pa), rng.integers(0, n_pitchers, n_pa)
    sd_p = batter_sd if pitcher_sd is None else pitcher_sd
    probs = (
        np.asarray(_BASE_RATES)
        * np.exp(rng.normal(0, batter_sd, (n_batters, 9)))[b]
        * np.exp(rng.normal(0, sd_p, (n_pitchers, 9)))[p]
    )
    probs /= probs.sum(axis=1, keepdims=True)
    outcome = np.minimum((rng.random(n_pa)[:, None] > probs.cumsum(axis=1)).sum(axis=1), 8)
    game = np.arange(n_pa) // pa_per_game
    b_names = [f"Batter Number{i}" for i in range(n_batters)] if batter_names is None else batter_names
    p_names = [f"Pitcher Number{i}" for i in range(n_pitchers)] if pitcher_names is None else pitcher_names
    return pd.DataFrame(
        {
            "game_id": [f"g{g:04d}" for g in game],
            "game_date": pd.Timestamp("2031-04-01") + pd.to_timedelta(game // games_per_day, unit="D"),
            "batter_id": [batter_id.format(i=i) for i in b],
            "pitcher_id": [f"p{i}" for i in p],
            "batter_name": [b_names[i] for i in b],
            "pitcher_name": [p_names[i] for i in p],
            "batter_hand": np.where(left_batter(b), "L", "R"),
            "pitcher_hand": np.where(left_pitcher(p), "L", "R"),
            "outcome": np.asarray(OUTCOMES)[outcome],
        }
    )


@pytest.fixture(scope="session")
def tilted_league():
    """Factory for a small invented league (see ``_tilted_league``); smoke data only."""
    return _tilted_league


def _contact_league(*, seed: int, n_pa: int, n_batters: int, n_pitchers: int):
    """A small invented league with exit velocity and launch angle on every batted ball.

    Outcomes come from one fixed mix and contact is drawn independently of them: smoke data
    for the contact paths of the model and the explorer, never a check value.
    """
    import numpy as np
    import pandas as pd

    from matchup_widgets.data import BATTED, OUTCOMES

    rng = np.random.default_rng(seed)
    codes = np.asarray(OUTCOMES)
    probs = np.asarray(_BASE_RATES)
    outcome = codes[rng.choice(9, n_pa, p=probs / probs.sum())]
    batted = np.isin(outcome, BATTED)
    b, p = rng.integers(0, n_batters, n_pa), rng.integers(0, n_pitchers, n_pa)
    game = np.arange(n_pa) // 60
    return pd.DataFrame(
        {
            "game_id": [f"g{g:04d}" for g in game],
            "game_date": pd.Timestamp("2031-04-01") + pd.to_timedelta(game // 3, unit="D"),
            "batter_id": [f"b{i:02d}" for i in b],
            "pitcher_id": [f"p{i:02d}" for i in p],
            "batter_name": [f"Batter Number{i}" for i in b],
            "pitcher_name": [f"Pitcher Number{i}" for i in p],
            "batter_hand": np.where(b % 3 == 0, "L", "R"),
            "pitcher_hand": np.where(p % 2 == 0, "L", "R"),
            "outcome": outcome,
            "exit_velo": np.where(batted, rng.normal(88, 13, n_pa), np.nan),
            "launch_angle": np.where(batted, rng.normal(12, 26, n_pa), np.nan),
        }
    )


@pytest.fixture(scope="session")
def contact_league():
    """Factory for a small invented league with contact columns (see ``_contact_league``)."""
    return _contact_league
