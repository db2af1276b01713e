from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from matchup_widgets.data import OUTCOMES, DataError
from matchup_widgets.runs import (
    END,
    AdvancementTable,
    default_advancement,
    estimate_advancement,
    identity_runs,
    run_expectancy,
)
from matchup_widgets.runs._states import STATE_BASES, STATE_OUTS, STATE_RUNNERS


def test_default_rows_are_distributions():
    table = default_advancement()
    assert table.transitions.shape == (9, 25, 25)
    assert_allclose(table.transitions.sum(axis=2), 1.0, atol=1e-12)
    assert (table.transitions >= 0).all()
    assert table.transitions[:, END, END].tolist() == [1.0] * 9


def test_runs_scored_identity_on_every_default_transition():
    # runs = (runners before + outs before + 1) - (runners after + outs after): every batter
    # ends the play on base, out or scored (common practice). The table counts runs runner
    # by runner, so this is an independent check. Moves into three outs score 0 by design.
    table = default_advancement()
    o, s, t = np.nonzero(table.transitions)
    live = t != END
    expected = (STATE_RUNNERS[s] + STATE_OUTS[s] + 1) - (STATE_RUNNERS[t] + STATE_OUTS[t])
    assert_allclose(table.runs[o[live], s[live], t[live]], expected[live], atol=0)
    assert (table.runs[o[~live], s[~live], t[~live]] == 0).all()
    assert live.sum() > 200  # many transitions checked
    assert_allclose(identity_runs()[s[live], t[live]], expected[live])


@pytest.mark.parametrize("code", OUTCOMES)
def test_outs_never_go_down_and_batter_never_vanishes(code):
    table = default_advancement()
    i = OUTCOMES.index(code)
    s, t = np.nonzero(table.transitions[i, :END])
    assert (STATE_OUTS[t] >= STATE_OUTS[s]).all()


def test_common_practice_cells():
    table = default_advancement()
    one = OUTCOMES.index("1B")
    gb = OUTCOMES.index("GB_OUT")
    # Runner on first, nobody out, single: first-to-third about a quarter to a third of the
    # time (common practice), otherwise first and second.
    assert 0.25 <= table.transitions[one, 1, 5] <= 0.34
    assert_allclose(table.transitions[one, 1, 3] + table.transitions[one, 1, 5], 1.0)
    # Runner on second scores on a single most of the time (common practice).
    assert table.transitions[one, 2, 1] > 0.5
    # Double play on a ground-ball out with a runner on first and nobody out: to (2 outs, empty).
    assert table.transitions[gb, 1, 16] > 0.3
    # With two outs a ground-ball out ends the inning.
    assert table.transitions[gb, 16 + 7, END] == 1.0
    # Sacrifice fly: runner on third, one out, air out -> two outs, empty, one run.
    air = OUTCOMES.index("AIR_OUT")
    assert table.transitions[air, 8 + 4, 16] > 0.5 and table.runs[air, 8 + 4, 16] == 1.0


def _sample_plays(n: int, seed: int) -> pd.DataFrame:
    """Plays drawn from the default table: uniform outcome and start state, seeded."""
    rng = np.random.default_rng(seed)
    table = default_advancement()
    o = rng.integers(0, 9, n)
    s = rng.integers(0, 24, n)
    cum = np.cumsum(table.transitions[o, s], axis=1)
    t = np.minimum((rng.random(n)[:, None] >= cum / cum[:, -1:]).sum(axis=1), END)
    return pd.DataFrame({
        "outcome": np.array(OUTCOMES)[o],
        "outs_before": STATE_OUTS[s], "bases_before": STATE_BASES[s],
        "outs_after": np.where(t == END, 3, STATE_OUTS[t]),
        "bases_after": np.where(t == END, 0, STATE_BASES[t]),
        "runs_on_play": table.runs[o, s, t].astype(int),
    })


def test_estimate_recovers_the_generating_table_within_sampling_error():
    plays = _sample_plays(200_000, seed=7)
    est = estimate_advancement(plays, min_count=30)
    truth = default_advancement().transitions[:, :END]
    n = est.counts[:, :, None]
    assert est.counts.sum() == 200_000 and est.from_data.all()
    # Binomial standard error per cell; 5 SE covers all 9 x 24 x 25 cells comfortably.
    se = np.sqrt(truth * (1 - truth) / n) + 1e-12
    assert (np.abs(est.transitions[:, :END] - truth) <= 5 * se).all()
    assert_allclose(run_expectancy(np.full(9, 1 / 9), advancement=est),
                    run_expectancy(np.full(9, 1 / 9)), atol=0.03)


def test_estimate_by_hand_and_fallback():
    # Runner on 2nd, 0 outs, single: 2 plays score him (-> runner on 1st, 1 run), 1 holds him
    # at third (-> 1st & 3rd). MLE shares 2/3 and 1/3 (hand count).
    plays = pd.DataFrame({
        "outcome": ["1B", "1B", "1B", "K"],
        "outs_before": [0, 0, 0, 0], "bases_before": [2, 2, 2, 0],
        "outs_after": [0, 0, 0, 1], "bases_after": [1, 1, 5, 0],
        "runs_on_play": [1, 1, 0, 0],
    })
    est = estimate_advancement(plays, min_count=3)
    one = OUTCOMES.index("1B")
    assert_allclose(est.transitions[one, 2, [1, 5]], [2 / 3, 1 / 3])
    assert est.runs[one, 2, 1] == 1.0
    assert est.counts[one, 2] == 3 and est.counts[0, 0] == 1
    # The lone strikeout is below min_count: its row is the default one.
    assert not est.from_data[0, 0]
    assert_allclose(est.transitions[0, 0], default_advancement().transitions[0, 0])


def test_estimate_through_the_engine_matches_pandas():
    ibis = pytest.importorskip("ibis")
    plays = _sample_plays(5_000, seed=3)
    plays.loc[:9, "runs_on_play"] = None  # ten incomplete rows are skipped and counted
    a = estimate_advancement(plays, min_count=5)
    b = estimate_advancement(ibis.memtable(plays), min_count=5)
    assert a.n_skipped == b.n_skipped == 10
    # extra rows keep the count of rows the estimate left out
    assert a.with_extra_rows({"1B_x": a.row("1B")}).n_skipped == 10
    assert_allclose(a.transitions, b.transitions, atol=1e-12)
    assert_allclose(a.runs, b.runs, atol=1e-12)
    assert (a.counts == b.counts).all()


@pytest.mark.parametrize(
    ("change", "match"),
    [
        ({"outcome": "SAC"}, "codes outside"),
        ({"outs_before": 3}, "'outs_before' has 1 row"),
        ({"bases_after": 9}, "'bases_after'"),
        ({"runs_on_play": -1}, "'runs_on_play'"),
    ],
)
def test_estimate_refuses_bad_rows(change, match):
    plays = _sample_plays(20, seed=1)
    for col, value in change.items():
        plays[col] = plays[col].astype(object)
        plays.loc[0, col] = value
    with pytest.raises(DataError, match=match):
        estimate_advancement(plays)


def test_estimate_names_missing_columns():
    with pytest.raises(DataError, match=r"needs the column\(s\) \['bases_after'"):
        estimate_advancement(_sample_plays(5, seed=1).drop(columns="bases_after"))


def test_outs_going_down_is_refused():
    plays = _sample_plays(10, seed=2)
    plays.loc[0, ["outs_before", "outs_after"]] = [2, 1]
    with pytest.raises(DataError, match="outs_after < outs_before"):
        estimate_advancement(plays)


def test_extra_rows_split_an_outcome_without_changing_results():
    # Splitting singles into two rows with the same advancement must leave the chain unchanged.
    table = default_advancement()
    bigger = table.with_extra_rows({"1B_soft": table.row("1B")}, on_base=["1B_soft"])
    p = np.array([0.22, 0.08, 0.01, 0.15, 0.045, 0.005, 0.03, 0.22, 0.24])
    q = np.append(p, 0.05)
    q[OUTCOMES.index("1B")] -= 0.05
    assert_allclose(run_expectancy(q, advancement=bigger), run_expectancy(p), rtol=1e-12)
    # Runs may be left to the identity.
    via_identity = table.with_extra_rows({"1B_x": (table.row("1B")[0], None)})
    used = table.transitions[OUTCOMES.index("1B")] > 0
    assert_allclose(via_identity.runs[-1][used], table.runs[OUTCOMES.index("1B")][used])
    assert isinstance(bigger, AdvancementTable) and bigger.on_base[-1] == "1B_soft"


def test_extra_rows_are_checked():
    table = default_advancement()
    with pytest.raises(ValueError, match="already in the table"):
        table.with_extra_rows({"1B": table.row("1B")})
    with pytest.raises(ValueError, match="do not sum to 1"):
        table.with_extra_rows({"odd": (np.zeros((25, 25)), None)})


def test_demo_league_obeys_the_identity(repo_root):
    # Every demo row with base-out columns: runs = (runners + outs + 1) before - after
    # (common practice). Rows ending the inning are checked on the outs they add.
    path = repo_root / "demo_data" / "plate_appearances.parquet"
    if not path.exists():
        pytest.skip("demo league not written yet (make demo)")
    cols = ["outs_before", "bases_before", "outs_after", "bases_after", "runs_on_play"]
    try:
        frame = pd.read_parquet(path, columns=["outcome", *cols])
    except (KeyError, ValueError):
        pytest.skip("demo league has no base-out columns")
    rows = frame[cols].dropna().astype(int)
    live = rows[rows["outs_after"] < 3]
    ones = np.array([bin(b).count("1") for b in range(8)])
    before = ones[live["bases_before"]] + live["outs_before"] + 1
    after = ones[live["bases_after"]] + live["outs_after"]
    assert len(live) > 1000
    assert ((before - after).to_numpy() == live["runs_on_play"].to_numpy()).all()
    est = estimate_advancement(frame)
    assert est.counts.sum() == len(rows)


def test_hit_row_defaults_reproduce_the_table_and_options_change_it():
    from matchup_widgets.runs import hit_row

    table = default_advancement()
    for code in ("1B", "2B"):
        t, r = hit_row(code)
        assert_allclose(t, table.row(code)[0], atol=0)
        assert_allclose(r, table.row(code)[1], atol=0)
    t, r = hit_row("1B", scores_from_second=[0.2, 0.3, 0.5], first_to_third=0.0)
    assert_allclose(t[[2, 10, 18], [1, 9, 17]], [0.2, 0.3, 0.5])
    assert t[1, 5] == 0.0 and t[1, 3] == 1.0  # nobody goes first to third
    t, _ = hit_row("2B", scores_from_first=1.0)
    assert t[1, 2] == 1.0
    # A softer single is worth less than the default one.
    soft = table.with_extra_rows({"1B_soft": hit_row("1B", scores_from_second=0.3)}, on_base=["1B_soft"])
    from matchup_widgets.runs import linear_weights

    p = np.append(np.array([0.22, 0.08, 0.01, 0.10, 0.045, 0.005, 0.03, 0.22, 0.24]), 0.05)
    lw = linear_weights(p, advancement=soft)
    assert lw["1B_soft"] < lw["1B"]


@pytest.mark.parametrize(
    ("kwargs", "match"),
    [
        ({"code": "3B"}, "'1B' or '2B'"),
        ({"code": "1B", "scores_from_first": 0.5}, "applies to doubles"),
        ({"code": "2B", "first_to_third": 0.5}, "apply to singles"),
        ({"code": "1B", "scores_from_second": 1.5}, r"probability in \[0, 1\]"),
        ({"code": "1B", "scores_from_second": [0.5, 0.5]}, "three of them"),
    ],
)
def test_hit_row_checks_its_options(kwargs, match):
    from matchup_widgets.runs import hit_row

    code = kwargs.pop("code")
    with pytest.raises(ValueError, match=match):
        hit_row(code, **kwargs)


@pytest.mark.parametrize("engine", ["pandas", "ibis"])
@pytest.mark.parametrize("dtype", ["float64", "Int64"])
def test_missing_bases_after_a_third_out_is_not_a_gap(engine, dtype):
    # Bases after the third out mean nothing; a table that leaves them empty must give the
    # same estimate as one that fills them (hand rule: the play goes to the three-out state).
    plays = _sample_plays(5_000, seed=4)
    blank = plays.copy()
    blank["bases_after"] = blank["bases_after"].astype(dtype)
    blank.loc[blank["outs_after"] == 3, "bases_after"] = None
    assert blank["bases_after"].isna().sum() > 500
    if engine == "ibis":
        ibis = pytest.importorskip("ibis")
        blank = ibis.memtable(blank)
    a = estimate_advancement(plays, min_count=5)
    b = estimate_advancement(blank, min_count=5)
    assert b.n_skipped == 0
    assert_allclose(b.transitions, a.transitions, atol=1e-12)
    assert (b.counts == a.counts).all()
