"""The default advancement table: how runners move on each outcome, from common practice.

Every branch lists its probability, the outs and bases after the play and the runs that
scored. Runs are counted runner by runner here (not derived from the runs-scored
identity), so the identity stays an independent check on this table.

Values are rounded figures of common practice for the modern game, not fitted to any
one data set. No run counts on a play that makes the third out.
"""

from __future__ import annotations

import numpy as np

from ..data import OUTCOMES
from ._states import END, N_STATES, N_TRANSIENT

# --- Singles -------------------------------------------------------------------------
#: Runner on second scores on a single, by outs before the play (common practice: most of
#: the time, and almost always with two outs, when runners go on contact).
SINGLE_SCORES_FROM_SECOND: tuple[float, float, float] = (0.60, 0.65, 0.85)
#: Runner on first takes third on a single when third is free (common practice: about a
#: quarter to a third of the time); otherwise he stops at second.
SINGLE_FIRST_TO_THIRD: tuple[float, float, float] = (0.28, 0.28, 0.33)

# --- Doubles -------------------------------------------------------------------------
#: Runner on first scores on a double, by outs (common practice: about 40% with fewer than
#: two outs, well over half with two outs); otherwise he stops at third.
DOUBLE_SCORES_FROM_FIRST: tuple[float, float, float] = (0.40, 0.40, 0.60)

# --- Ground-ball outs with fewer than two outs -----------------------------------------
#: With a runner on first: double play (batter and the runner from first out; other
#: runners move up one base). Common practice: a double play ends about 11% of all plate
#: appearances in double-play situations, which is about 45% of the ground-ball outs there.
GROUND_DOUBLE_PLAY: float = 0.45
#: With a runner on first: fielder's choice (runner from first out at second, batter safe
#: at first, other runners move up one base). Common practice.
GROUND_FIELDERS_CHOICE: float = 0.20
# The rest of the ground-ball outs with a runner on first: batter out at first, every
# runner moves up one base.
#: Without a runner on first: runner on third scores on a ground-ball out (common
#: practice: most of the time with the infield back, as it plays in most innings; raised
#: from one half, which left the chain 0.10 runs low with a runner on third and no outs
#: against the published 2015 run-expectancy table).
GROUND_SCORES_FROM_THIRD: float = 0.70
#: Without a runner on first: runner on second takes third when it is free (common
#: practice: about two times in three, nearly always on balls to the right side).
GROUND_SECOND_TO_THIRD: float = 0.65

# --- Air outs (fly, line and pop outs) with fewer than two outs -------------------------
#: Runner on third scores after the catch: the sacrifice fly (common practice: about 70%
#: of air outs with a runner on third and fewer than two outs, as most outfield flies
#: score him and infield pops and liners do not).
AIR_SCORES_FROM_THIRD: float = 0.70
#: Runner on second tags and takes third when it is free (common practice).
AIR_SECOND_TO_THIRD: float = 0.20

Branch = tuple[float, int, int, int]  # probability, outs after, bases after, runs scored


def _bits(bases: int) -> tuple[bool, bool, bool]:
    return bool(bases & 1), bool(bases & 2), bool(bases & 4)


def _forced(bases: int) -> list[Branch]:
    """Walk or hit by pitch: the batter takes first, only forced runners move."""
    on1, on2, on3 = _bits(bases)
    if not on1:
        return [(1.0, 0, bases | 1, 0)]
    if not on2:
        return [(1.0, 0, bases | 3, 0)]
    if not on3:
        return [(1.0, 0, 7, 0)]
    return [(1.0, 0, 7, 1)]


def _single(bases: int, outs: int, score2: float | None = None, first3: float | None = None) -> list[Branch]:
    on1, on2, on3 = _bits(bases)
    runs0 = int(on3)
    a = SINGLE_SCORES_FROM_SECOND[outs] if score2 is None else score2
    b = SINGLE_FIRST_TO_THIRD[outs] if first3 is None else first3
    # Runner on second: scores (third free) or stops at third.
    second = [(a, 1, 0), (1 - a, 0, 4)] if on2 else [(1.0, 0, 0)]
    out: list[Branch] = []
    for p2, r2, b2 in second:
        third_free = b2 == 0
        if on1 and third_free:
            first = [(b, 4), (1 - b, 2)]
        elif on1:
            first = [(1.0, 2)]
        else:
            first = [(1.0, 0)]
        for p1, b1 in first:
            out.append((p2 * p1, 0, 1 | b2 | b1, runs0 + r2))
    return out


def _double(bases: int, outs: int, score1: float | None = None) -> list[Branch]:
    on1, on2, on3 = _bits(bases)
    runs0 = int(on2) + int(on3)
    if not on1:
        return [(1.0, 0, 2, runs0)]
    p = DOUBLE_SCORES_FROM_FIRST[outs] if score1 is None else score1
    return [(p, 0, 2, runs0 + 1), (1 - p, 0, 6, runs0)]


def _ground_out(bases: int, outs: int) -> list[Branch]:
    on1, on2, on3 = _bits(bases)
    if outs == 2:
        return [(1.0, 1, 0, 0)]
    if on1:
        up = (4 if on2 else 0), int(on3)  # other runners move up one base
        p_dp, p_fc = GROUND_DOUBLE_PLAY, GROUND_FIELDERS_CHOICE
        dp: Branch = (p_dp, 2, up[0], up[1]) if outs == 0 else (p_dp, 2, 0, 0)
        fc: Branch = (p_fc, 1, 1 | up[0], up[1])
        all_up: Branch = (1 - p_dp - p_fc, 1, 2 | up[0], up[1])
        return [dp, fc, all_up]
    return _runners_tag(bases, GROUND_SCORES_FROM_THIRD, GROUND_SECOND_TO_THIRD)


def _air_out(bases: int, outs: int) -> list[Branch]:
    if outs == 2:
        return [(1.0, 1, 0, 0)]
    return _runners_tag(bases, AIR_SCORES_FROM_THIRD, AIR_SECOND_TO_THIRD)


def _runners_tag(bases: int, p3: float, p2: float) -> list[Branch]:
    """Batter out; runner on third may score, runner on second may take a free third."""
    on1, on2, on3 = _bits(bases)
    keep1 = 1 if on1 else 0
    third = [(p3, 1, 0), (1 - p3, 0, 4)] if on3 else [(1.0, 0, 0)]
    out: list[Branch] = []
    for pt, r3, b3 in third:
        if on2 and b3 == 0:
            second = [(p2, 4), (1 - p2, 2)]
        elif on2:
            second = [(1.0, 2)]
        else:
            second = [(1.0, 0)]
        for ps, b2 in second:
            out.append((pt * ps, 1, keep1 | b3 | b2, r3))
    return out


def _strikeout(bases: int, outs: int) -> list[Branch]:
    return [(1.0, 1, bases, 0)]


def _branches(code: str, bases: int, outs: int) -> list[Branch]:
    """Branches of one outcome from one state; outs in a branch are outs added."""
    if code == "K":
        return _strikeout(bases, outs)
    if code in ("BB", "HBP"):
        return _forced(bases)
    if code == "1B":
        return _single(bases, outs)
    if code == "2B":
        return _double(bases, outs)
    if code == "3B":
        return [(1.0, 0, 4, bin(bases).count("1"))]
    if code == "HR":
        return [(1.0, 0, 0, bin(bases).count("1") + 1)]
    if code == "GB_OUT":
        return _ground_out(bases, outs)
    if code == "AIR_OUT":
        return _air_out(bases, outs)
    msg = f"no default advancement for outcome {code!r}."  # pragma: no cover
    raise KeyError(msg)  # pragma: no cover


def _fill(branches, trans: np.ndarray, runs: np.ndarray) -> None:
    """Write one outcome's branches (a function of bases, outs) into (25, 25) arrays."""
    for s in range(N_TRANSIENT):
        outs, bases = divmod(s, 8)
        for p, added, after, scored in branches(bases, outs):
            if p == 0.0:
                continue
            new_outs = outs + added
            to = END if new_outs >= 3 else new_outs * 8 + after
            trans[s, to] += p
            # Several branches land on one cell only with the same runs (runs identity).
            runs[s, to] = 0 if to == END else scored
    trans[END, END] = 1.0


def hit_arrays(
    code: str,
    score2: tuple[float, float, float] | None,
    first3: tuple[float, float, float] | None,
    score1: tuple[float, float, float] | None,
) -> tuple[np.ndarray, np.ndarray]:
    """``(T, R)`` for a single or double with its own runner-advance shares by outs."""
    trans = np.zeros((N_STATES, N_STATES))
    runs = np.zeros((N_STATES, N_STATES))
    if code == "1B":
        def branches(bases: int, outs: int) -> list[Branch]:
            return _single(bases, outs, None if score2 is None else score2[outs],
                           None if first3 is None else first3[outs])
    else:
        def branches(bases: int, outs: int) -> list[Branch]:
            return _double(bases, outs, None if score1 is None else score1[outs])
    _fill(branches, trans, runs)
    return trans, runs


def build_default_arrays() -> tuple[np.ndarray, np.ndarray]:
    """Return ``(T, R)``, each shaped ``(len(OUTCOMES), 25, 25)``, for the default table.

    Built once with small loops over the 9 x 24 (outcome, state) cells; the table does
    not grow with data.
    """
    n = len(OUTCOMES)
    trans = np.zeros((n, N_STATES, N_STATES))
    runs = np.zeros((n, N_STATES, N_STATES))
    for i, code in enumerate(OUTCOMES):
        _fill(lambda bases, outs, code=code: _branches(code, bases, outs), trans[i], runs[i])
    return trans, runs
