"""Base-out states: 24 transient states plus the absorbing three-out state.

A state is indexed ``outs * 8 + bases`` where ``bases`` is a bitmask (1 = first,
2 = second, 4 = third) and ``outs`` is 0-2; index 24 is the end of the half-inning.
"""

from __future__ import annotations

import numpy as np

#: Number of transient base-out states.
N_TRANSIENT: int = 24
#: Index of the absorbing three-out state.
END: int = 24
#: Number of states including the absorbing one.
N_STATES: int = 25

_BASE_WORDS: dict[int, str] = {
    0: "Bases empty",
    1: "Runner on 1st",
    2: "Runner on 2nd",
    3: "Runners on 1st & 2nd",
    4: "Runner on 3rd",
    5: "Runners on 1st & 3rd",
    6: "Runners on 2nd & 3rd",
    7: "Bases loaded",
}

#: Outs of each state (the absorbing state has 3).
STATE_OUTS: np.ndarray = np.append(np.repeat(np.arange(3), 8), 3)
#: Base bitmask of each state (0 for the absorbing state).
STATE_BASES: np.ndarray = np.append(np.tile(np.arange(8), 3), 0)
#: Runners on base in each state (0 for the absorbing state).
STATE_RUNNERS: np.ndarray = np.array([bin(b).count("1") for b in STATE_BASES])


def _check_state(outs: int, bases: int, *, max_outs: int = 2) -> None:
    if not (isinstance(outs, (int, np.integer)) and 0 <= outs <= max_outs):
        msg = f"outs must be an integer from 0 to {max_outs}; got {outs!r}."
        raise ValueError(msg)
    if not (isinstance(bases, (int, np.integer)) and 0 <= bases <= 7):
        msg = (
            f"bases must be a bitmask from 0 to 7 (1 = first, 2 = second, 4 = third); "
            f"got {bases!r}."
        )
        raise ValueError(msg)


def state_index(outs: int, bases: int) -> int:
    """Return the index of a base-out state (``outs * 8 + bases``; 24 for three outs).

    Parameters
    ----------
    outs : int
        Outs, 0-2 (3 gives the absorbing end-of-inning state).
    bases : int
        Base bitmask 0-7: 1 = first, 2 = second, 4 = third.

    Returns
    -------
    int

    Examples
    --------
    >>> state_index(1, 5)
    13
    """
    _check_state(outs, bases, max_outs=3)
    return END if outs == 3 else int(outs) * 8 + int(bases)


def state_label(outs: int, bases: int) -> str:
    """Return a readable label for a base-out state.

    Parameters
    ----------
    outs : int
        Outs, 0-2 (3 labels the end of the inning).
    bases : int
        Base bitmask 0-7: 1 = first, 2 = second, 4 = third.

    Returns
    -------
    str

    Examples
    --------
    >>> state_label(1, 5)
    'Runners on 1st & 3rd, 1 out'
    >>> state_label(0, 0)
    'Bases empty, 0 outs'
    """
    _check_state(outs, bases, max_outs=3)
    if outs == 3:
        return "Three outs (inning over)"
    return f"{_BASE_WORDS[int(bases)]}, {outs} out{'' if outs == 1 else 's'}"


#: Labels of the 25 states in index order.
STATES: tuple[str, ...] = tuple(
    state_label(int(o), int(b)) for o, b in zip(STATE_OUTS[:N_TRANSIENT], STATE_BASES[:N_TRANSIENT])
) + (state_label(3, 0),)
