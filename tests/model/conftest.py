"""Shared checks for the model tests."""

from __future__ import annotations

import numpy as np
import pytest

from matchup_widgets.data import OUTCOMES


def _cells_match_model(pas, result, *, basis: str, n_cells: int, atol: float = 0.0) -> None:
    """Assert that calibration scores the estimator's own predictions.

    For every method, the blend calibrate scores on held-out cells (the batter's and the
    pitcher's split counts from the fitting games, shrunk toward the split's league, then
    blended) must equal ``MatchupModel(**result.model_settings(method))`` fitted on the same
    games, on ``n_cells`` cells spread over the table; the league rows must agree too.
    """
    from matchup_widgets.model import MatchupModel, blend, split_games
    from matchup_widgets.model._calibrate import _prepare, _shrunk_cells

    codes = list(OUTCOMES)
    frame = pas.frame
    fit = frame.loc[~split_games(frame["game_id"].to_numpy(), holdout_share=0.25, seed=0)]
    prep = _prepare(pas, None, holdout_share=0.25, seed=0, season_forward=False, basis=basis)
    for method in ("linear", "odds-ratio", "two-stage"):
        settings = result.model_settings(method)
        model = MatchupModel(**settings).fit(fit)
        b = _shrunk_cells(prep, "batter", [settings["batter_prior_pa"]])[0]
        q = _shrunk_cells(prep, "pitcher", [settings["pitcher_prior_pa"]])[0]
        kw = {k: v for k, v in settings.items() if k not in ("method", "basis", "batter_prior_pa", "pitcher_prior_pa")}
        p = blend(method, b, q, prep.league, **kw)
        for i in np.linspace(0, len(prep.cells) - 1, n_cells).astype(int):
            cell = prep.cells.iloc[i]
            est = model.predict(cell["batter_id"], cell["pitcher_id"], batter_hand=cell["batter_hand"])
            np.testing.assert_allclose(est.distributions.loc["matchup", codes].to_numpy(float), p[i],
                                       rtol=1e-9, atol=atol, err_msg=method)
            np.testing.assert_allclose(est.distributions.loc["league", codes].to_numpy(float), prep.league[i],
                                       rtol=1e-9, err_msg=method)


@pytest.fixture(scope="session")
def cells_match_model():
    """The check ``_cells_match_model`` as a fixture (test files do not import each other)."""
    return _cells_match_model
