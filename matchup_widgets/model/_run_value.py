"""Run value of a matchup with its interval: the posterior draws carried through run values.

:func:`matchup_interval` gives an interval per outcome; ranking options needs one interval on
a single number. The same posterior draws (same seed, same order, so they are the draws
behind the estimate's own intervals, from :func:`matchup_draws`) are pushed through the linear weights (runs per PA) or
through the base-out chain (expected runs from one state).
"""

from __future__ import annotations

from typing import Any

import numpy as np

from matchup_widgets.data import OUTCOMES

from ._intervals import matchup_draws
from ._summary import run_weights


def estimate_draws(estimate: Any, *, n_draws: int | None = None) -> np.ndarray:
    """Posterior draws of a matchup's outcome distribution, as behind its intervals.

    Parameters
    ----------
    estimate : MatchupEstimate
        From :meth:`MatchupModel.predict`; its counts, league and settings are used.
    n_draws : int, optional
        Number of draws; default the estimate's ``n_draws`` setting.

    Returns
    -------
    numpy.ndarray, shape (n_draws, 9)
        Draws in ``OUTCOMES`` order, each summing to 1.
    """
    s = estimate.settings
    codes = list(OUTCOMES)
    weights = {k: s[k] for k in ("pitcher_weight", "first_weight", "in_play_weight",
                                 "batter_exponent", "pitcher_exponent")}
    return matchup_draws(
        s["method"],
        estimate.counts.loc["batter", codes].to_numpy(dtype=float),
        estimate.counts.loc["pitcher", codes].to_numpy(dtype=float),
        estimate.distributions.loc["league", codes].to_numpy(dtype=float),
        batter_prior_pa=s["batter_prior_pa"],
        pitcher_prior_pa=s["pitcher_prior_pa"],
        n_draws=int(s["n_draws"] if n_draws is None else n_draws),
        seed=s["seed"],
        **weights,
    )


def run_value_interval(
    estimate: Any,
    *,
    outs: int | None = None,
    bases: int | None = None,
    interval: float | None = None,
    n_draws: int | None = None,
) -> dict[str, Any]:
    """A matchup's run value with a central credible interval.

    Without a base-out state the value is runs per PA relative to the league-average PA of
    the split (linear weights, as in the estimate's summary). With ``outs`` and ``bases``
    it is the expected runs to the end of the inning from that state when every batter
    bats like the matchup (the base-out Markov chain of :mod:`matchup_widgets.runs`).

    Parameters
    ----------
    estimate : MatchupEstimate
    outs, bases : int, optional
        Base-out state (bases bitmask: 1 = first, 2 = second, 4 = third); both or neither.
    interval : float, optional
        Central probability; default the estimate's ``interval`` setting.
    n_draws : int, optional
        Draws; default the estimate's setting for runs per PA, at most 500 for a base-out
        state (each draw solves the 24-state chain).

    Returns
    -------
    dict
        ``measure`` (``"runs_per_pa"`` or ``"expected_runs"``), ``value`` (at the point
        estimate), ``lo``, ``hi`` (widened to contain ``value``), ``interval``, ``state``
        (label or None), ``draws`` (the values of the draws).

    Examples
    --------
    >>> import pandas as pd
    >>> from matchup_widgets.data import load_pas
    >>> from matchup_widgets.model import MatchupModel
    >>> df = pd.DataFrame({
    ...     "game_id": ["g1"] * 6, "game_date": ["2031-04-02"] * 6,
    ...     "batter_id": ["b1"] * 3 + ["b2"] * 3, "pitcher_id": ["p1"] * 6,
    ...     "batter_name": ["Ada Quill"] * 3 + ["Bo Reed"] * 3, "pitcher_name": ["Cy Moss"] * 6,
    ...     "batter_hand": ["L"] * 3 + ["R"] * 3, "pitcher_hand": ["R"] * 6,
    ...     "outcome": ["K", "1B", "HR", "BB", "GB_OUT", "AIR_OUT"]})
    >>> est = MatchupModel(n_draws=200).fit(load_pas(df)).predict("b1", "p1")
    >>> out = run_value_interval(est)
    >>> out["measure"], out["lo"] <= out["value"] <= out["hi"], abs(out["value"] - est.runs_per_pa) < 1e-12
    ('runs_per_pa', True, True)
    >>> run_value_interval(est, outs=2, bases=0, n_draws=50)["state"]
    'Bases empty, 2 outs'
    """
    from matchup_widgets import runs

    if (outs is None) != (bases is None):
        msg = f"give both outs and bases for a base-out state, or neither; got outs={outs}, bases={bases}."
        raise ValueError(msg)
    level = float(estimate.settings["interval"] if interval is None else interval)
    if not 0.0 < level < 1.0:
        msg = f"interval must lie strictly between 0 and 1 (e.g. 0.8); got {interval}."
        raise ValueError(msg)
    codes = list(OUTCOMES)
    league = estimate.distributions.loc["league", codes].to_numpy(dtype=float)
    point = estimate.probabilities[codes].to_numpy(dtype=float)
    if outs is None:
        linear = run_weights(league)["linear"]
        draws = estimate_draws(estimate, n_draws=n_draws) @ linear
        value, measure, state = float(point @ linear), "runs_per_pa", None
    else:
        n = min(500, int(estimate.settings["n_draws"])) if n_draws is None else int(n_draws)
        probs = estimate_draws(estimate, n_draws=n)
        probs = probs / probs.sum(axis=1, keepdims=True)  # exact sums for the chain's check
        # one 24-state solve per draw: a fixed, small number of draws, not data rows
        draws = np.array([runs.run_expectancy(p)[outs, bases] for p in probs])
        value = float(runs.run_expectancy(point / point.sum())[outs, bases])
        measure, state = "expected_runs", runs.state_label(outs, bases)
    tail = (1.0 - level) / 2.0
    lo, hi = np.quantile(draws, [tail, 1.0 - tail])
    return {
        "measure": measure,
        "value": value,
        "lo": float(min(lo, value)),
        "hi": float(max(hi, value)),
        "interval": level,
        "state": state,
        "draws": draws,
    }
