"""calibrate(): the honest split, the fitted settings and what the result reports."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES, load_pas
from matchup_widgets.model import (
    CalibrationResult,
    brier_score,
    calibrate,
    linear_blend,
    log_loss,
    shrink,
    split_games,
)

# Invented league line for simulation only (never a check value).
_LEAGUE = np.array([0.22, 0.08, 0.01, 0.14, 0.045, 0.004, 0.03, 0.21, 0.261])
_LEAGUE = _LEAGUE / _LEAGUE.sum()
_PRIORS = (0, 50, 200, 800)


def synthetic_frame(seed: int = 0, *, n_games: int = 1200, per_game: int = 50, weight: float = 0.45,
                    seasons: tuple[int, ...] = (2031, 2032)) -> pd.DataFrame:
    """Invented players whose PAs follow a linear blend; contract columns only."""
    rng = np.random.default_rng(seed)
    n_b, n_p = 160, 120
    batters, pitchers = rng.dirichlet(40 * _LEAGUE, n_b), rng.dirichlet(40 * _LEAGUE, n_p)
    n = n_games * per_game
    ib, iq = rng.integers(0, n_b, n), rng.integers(0, n_p, n)
    p = (1 - weight) * batters[ib] + weight * pitchers[iq]
    out = np.minimum((rng.random(n)[:, None] > p.cumsum(axis=1)).sum(axis=1), 8)
    game = np.repeat(np.arange(n_games), per_game)
    season = np.array(seasons)[game * len(seasons) // n_games]
    date = pd.to_datetime(pd.Series(season.astype(str)) + "-05-01") + pd.to_timedelta(game % 100, unit="D")
    return pd.DataFrame(
        {
            "game_id": pd.Series(game).map("g{:05d}".format),
            "game_date": date,
            "batter_id": pd.Series(ib).map("b{:03d}".format),
            "pitcher_id": pd.Series(iq).map("p{:03d}".format),
            "batter_name": pd.Series(ib).map("Batter {:03d}".format),
            "pitcher_name": pd.Series(iq).map("Pitcher {:03d}".format),
            "batter_hand": np.where(ib % 3 == 0, "L", "R"),
            "pitcher_hand": np.where(iq % 4 == 0, "L", "R"),
            "outcome": np.array(OUTCOMES)[out],
        }
    )


@pytest.fixture(scope="module")
def pas():
    return load_pas(synthetic_frame(), drop_duplicates=False)


@pytest.fixture(scope="module")
def result(pas) -> CalibrationResult:
    return calibrate(pas, priors=_PRIORS, n_boot=100, progress=False)


def _per_pa_reference(fit: pd.DataFrame, held: pd.DataFrame, prior_b: float, prior_p: float, w: float):
    """Brute-force held-out forecast, PA by PA, with pandas counting (independent of outcome_counts)."""
    onehot = pd.get_dummies(fit["outcome"]).reindex(columns=list(OUTCOMES), fill_value=0).astype(float)
    split = ["batter_hand", "pitcher_hand"]
    league = onehot.groupby([fit[k] for k in split]).sum()
    bat = onehot.groupby([fit["batter_id"], *[fit[k] for k in split]]).sum()
    pit = onehot.groupby([fit["pitcher_id"], *[fit[k] for k in split]]).sum()
    keys_b = pd.MultiIndex.from_frame(held[["batter_id", *split]])
    keys_p = pd.MultiIndex.from_frame(held[["pitcher_id", *split]])
    lg = league.reindex(pd.MultiIndex.from_frame(held[split])).to_numpy()
    lg = lg / lg.sum(axis=1, keepdims=True)
    bc = bat.reindex(keys_b).fillna(0.0).to_numpy()
    pc = pit.reindex(keys_p).fillna(0.0).to_numpy()
    return linear_blend(shrink(bc, lg, prior_b), shrink(pc, lg, prior_p), w), lg


def test_fit_scores_equal_a_per_pa_recomputation(pas, result):
    frame = pas.frame
    held = split_games(frame["game_id"].to_numpy(), holdout_share=0.25, seed=0)
    fit, hold = frame.loc[~held], frame.loc[held]
    assert (result.n_fit_pa, result.n_holdout_pa) == (len(fit), len(hold))
    p, lg = _per_pa_reference(fit, hold, result.batter_prior_pa, result.pitcher_prior_pa, result.pitcher_weight)
    y = hold["outcome"].to_numpy()
    assert_allclose(result.brier, brier_score(p, y), rtol=1e-10)
    assert_allclose(result.log_loss, log_loss(p, y), rtol=1e-10)
    assert_allclose(result.brier_baselines["league"], brier_score(lg, y), rtol=1e-10)
    # the even-blend baseline is the best prior pair at w = 0.5, PA by PA
    even = min(
        brier_score(_per_pa_reference(fit, hold, b, q, 0.5)[0], y) for b in _PRIORS for q in _PRIORS
    )
    assert_allclose(result.brier_baselines["even_blend"], even, rtol=1e-10)


def test_fit_finds_the_surface_minimum_and_beats_baselines(result):
    surf = result.surface
    assert len(surf) == 101 * len(_PRIORS) ** 2
    grid_best = surf.loc[surf["brier"].idxmin()]
    assert abs(grid_best["pitcher_weight"] - result.pitcher_weight) <= 0.01
    assert (grid_best["batter_prior_pa"], grid_best["pitcher_prior_pa"]) == (result.batter_prior_pa, result.pitcher_prior_pa)
    assert result.brier <= grid_best["brier"] + 1e-12
    for name, value in result.brier_baselines.items():
        assert result.brier < value, name
        assert result.skill_scores[name] > 0
    lo, hi = result.weight_interval
    assert lo <= result.pitcher_weight <= hi
    assert set(result.methods["method"]) == {"linear", "odds-ratio", "two-stage"}
    assert np.isfinite(result.methods[["brier", "log_loss"]].to_numpy()).all()
    ts = result.two_stage
    assert 0 <= ts["first_weight"] <= 1 and 0 <= ts["in_play_weight"] <= 1
    assert ts["brier"] < result.brier_baselines["league"]


def test_to_dict_has_the_command_keys_and_is_json(result):
    d = result.to_dict()
    for key in ("pitcher_weight", "batter_prior_pa", "pitcher_prior_pa", "brier", "log_loss",
                "brier_baselines", "n_fit_pa", "n_holdout_pa", "surface"):
        assert key in d
    assert set(d["brier_baselines"]) == {"league", "batter_only", "pitcher_only", "even_blend"}
    assert set(d["surface"][0]) == {"pitcher_weight", "batter_prior_pa", "pitcher_prior_pa", "brier"}
    json.dumps(d, allow_nan=False)


def test_season_forward_scores_the_last_season(pas):
    r = calibrate(pas, season_forward=True, priors=(0, 100), n_boot=20, progress=False)
    seasons = pas.frame["season"]
    assert r.split == "season-forward"
    assert (r.n_fit_pa, r.n_holdout_pa) == ((seasons < 2032).sum(), (seasons == 2032).sum())
    # the scored forecasts come from the earlier season alone (pandas recomputation, PA by PA)
    frame = pas.frame
    fit, hold = frame.loc[seasons < 2032], frame.loc[seasons == 2032]
    p, lg = _per_pa_reference(fit, hold, r.batter_prior_pa, r.pitcher_prior_pa, r.pitcher_weight)
    assert_allclose(r.brier, brier_score(p, hold["outcome"].to_numpy()), rtol=1e-10)
    assert_allclose(r.brier_baselines["league"], brier_score(lg, hold["outcome"].to_numpy()), rtol=1e-10)


def test_separate_score_table_fits_on_all_of_data(pas):
    other = load_pas(synthetic_frame(0, n_games=200, seasons=(2033,)), drop_duplicates=False)
    r = calibrate(pas, score=other, priors=(0, 100), n_boot=20, progress=False)
    assert r.split == "separate"
    assert (r.n_fit_pa, r.n_holdout_pa) == (len(pas.frame), len(other.frame))


def test_bad_options_raise_with_advice(pas):
    with pytest.raises(ValueError, match="basis must be one of \\['observed', 'contact'\\]; got 'raw'"):
        calibrate(pas, basis="raw", progress=False)
    with pytest.raises(ValueError, match="holdout_share must lie strictly between 0 and 1"):
        calibrate(pas, holdout_share=0, progress=False)
    # checked before any work (n_boot=0 used to fail deep inside with an IndexError)
    with pytest.raises(ValueError, match="n_boot must be a whole number >= 1; got 0"):
        calibrate(pas, n_boot=0, progress=False)
    with pytest.raises(ValueError, match="n_bins must be a whole number >= 1; got 2.5"):
        calibrate(pas, n_bins=2.5, progress=False)
    # a score table and the season-forward split are two different holdouts (season_forward
    # used to be ignored silently)
    with pytest.raises(ValueError, match="either a separate score table .* or the season-forward split"):
        calibrate(pas, score=pas, season_forward=True, progress=False)


def test_fitted_settings_reproduce_the_matchup_model(pas, result, cells_match_model):
    # The cells are scored with the same prediction the estimator makes: the batter's and the
    # pitcher's split counts shrunk toward the split's league, then blended.
    cells_match_model(pas, result, basis="observed", n_cells=8)


def test_separate_score_table_sharing_games_with_the_data_is_refused(pas):
    # Scoring PAs whose games were also fitted on is not a held-out score.
    from matchup_widgets.data import DataError

    frame = pas.frame
    overlap = load_pas(frame.loc[frame["game_id"].isin(["g00003", "g00007"])], drop_duplicates=False)
    with pytest.raises(DataError, match=r"the score table shares 2 game\(s\) with the fitting data .*g00003"):
        calibrate(pas, score=overlap, priors=(0,), n_boot=10, progress=False)
