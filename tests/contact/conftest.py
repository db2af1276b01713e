"""Seeded synthetic plate appearances for the contact layer's tests.

The outcome law below is invented for testing only (it is never a check value): hit
chances rise with exit velocity, home runs need a fly-ball angle and a hard hit, ground
balls stay in the park and pop ups are almost always caught.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from matchup_widgets.data import BATTED


def _softmax(logits: np.ndarray) -> np.ndarray:
    z = logits - logits.max(axis=1, keepdims=True)
    e = np.exp(z)
    return e / e.sum(axis=1, keepdims=True)


def batted_law(ev: np.ndarray, la: np.ndarray) -> np.ndarray:
    """Invented P(outcome | ev, la) over BATTED, shape (n, 6)."""
    hard = (ev - 92.0) / 8.0
    gb = la < 10
    ld = (la >= 10) & (la < 25)
    fb = (la >= 25) & (la <= 50)
    pu = la > 50
    logits = np.zeros((len(ev), 6))  # 1B 2B 3B HR GB_OUT AIR_OUT
    logits[:, 0] = np.select([gb, ld, fb, pu], [-1.2 + 0.8 * hard, 0.3 + 0.3 * hard, -2.5, -4.0])
    logits[:, 1] = np.select([gb, ld, fb, pu], [-4.0 + 0.8 * hard, -1.0 + 0.8 * hard, -2.0 + 0.7 * hard, -6.0])
    logits[:, 2] = logits[:, 1] - 3.0
    hr_angle = -(((la - 28.0) / 9.0) ** 2)
    logits[:, 3] = np.where(fb | ld, -6.0 + 2.2 * np.maximum(hard, -2) + hr_angle, -12.0)
    logits[:, 4] = np.where(gb, 0.0, -6.0)
    logits[:, 5] = np.where(gb, -5.0, 0.0)
    return _softmax(logits)


def make_pas(n_pa: int, *, seed: int, n_batters: int = 40, n_pitchers: int = 30,
             missing_share: float = 0.02, base_out: bool = False) -> pd.DataFrame:
    """Seeded plate appearances following the table contract (invented players)."""
    rng = np.random.default_rng(seed)
    batters = np.array([f"b{i:03d}" for i in range(n_batters)])
    pitchers = np.array([f"p{i:03d}" for i in range(n_pitchers)])
    b = rng.integers(0, n_batters, n_pa)
    p = rng.integers(0, n_pitchers, n_pa)
    b_skill = rng.normal(0, 3, n_batters)  # mph of extra exit velocity
    p_skill = rng.normal(0, 2, n_pitchers)
    ev = rng.normal(88.0, 13.0, n_pa) + b_skill[b] - p_skill[p]
    ev = np.clip(ev, 30, 121)
    la = np.clip(rng.normal(12.0, 26.0, n_pa), -80, 85)
    probs = batted_law(ev, la)
    u = rng.random(n_pa)[:, None]
    batted_code = (u > probs.cumsum(axis=1)).sum(axis=1)
    batted_code = np.minimum(batted_code, 5)
    kind = rng.choice(4, size=n_pa, p=[0.22, 0.08, 0.01, 0.69])  # K, BB, HBP, batted
    outcome = np.where(kind == 0, "K", np.where(kind == 1, "BB", np.where(kind == 2, "HBP",
                        np.asarray(BATTED, dtype=object)[batted_code])))
    is_batted = kind == 3
    missing = rng.random(n_pa) < missing_share
    ev = np.where(is_batted & ~missing, ev, np.nan)
    la = np.where(is_batted & ~missing, la, np.nan)
    games = rng.integers(0, max(n_pa // 70, 2), n_pa)
    frame = pd.DataFrame({
        "game_id": [f"g{g:05d}" for g in games],
        "game_date": pd.to_datetime("2031-04-01") + pd.to_timedelta(games % 180, unit="D"),
        "batter_id": batters[b],
        "pitcher_id": pitchers[p],
        "batter_name": np.char.add("Batter ", batters[b]),
        "pitcher_name": np.char.add("Pitcher ", pitchers[p]),
        "batter_hand": np.where(b % 3 == 0, "L", "R"),
        "pitcher_hand": np.where(p % 4 == 0, "L", "R"),
        "outcome": outcome,
        "exit_velo": ev,
        "launch_angle": la,
        "season": 2031 + (games % 2),
    })
    if base_out:
        frame["outs_before"] = rng.integers(0, 3, n_pa)
        frame["bases_before"] = rng.integers(0, 8, n_pa)
    return frame


@pytest.fixture(scope="session")
def synth_pas() -> pd.DataFrame:
    return make_pas(40_000, seed=11)


@pytest.fixture(scope="session")
def make_synth():
    return make_pas
