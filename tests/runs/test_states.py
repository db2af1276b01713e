from __future__ import annotations

import pytest

from matchup_widgets.runs import END, N_STATES, STATES, state_index, state_label


def test_there_are_24_states_and_the_end():
    assert N_STATES == 25 and END == 24
    assert len(STATES) == 25 and len(set(STATES)) == 25


@pytest.mark.parametrize("outs", [0, 1, 2])
@pytest.mark.parametrize("bases", range(8))
def test_index_follows_outs_then_bitmask(outs, bases):
    assert state_index(outs, bases) == outs * 8 + bases
    assert STATES[outs * 8 + bases] == state_label(outs, bases)


def test_labels_read_plainly():
    assert state_label(0, 7) == "Bases loaded, 0 outs"
    assert state_label(2, 6) == "Runners on 2nd & 3rd, 2 outs"
    assert state_label(1, 2) == "Runner on 2nd, 1 out"
    assert state_index(3, 0) == END


@pytest.mark.parametrize(("outs", "bases", "match"), [(3, 1, None), (-1, 0, "outs"), (0, 8, "bases")])
def test_bad_states_are_refused(outs, bases, match):
    if match is None:  # three outs is a valid index for any bases (the inning is over)
        assert state_index(outs, bases) == END
        return
    with pytest.raises(ValueError, match=match):
        state_label(outs, bases)
