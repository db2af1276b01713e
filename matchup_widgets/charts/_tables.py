"""Checks on the small tables chart builders take."""

from __future__ import annotations

from collections.abc import Iterable

import pandas as pd

from matchup_widgets.data import DataError


def require_columns(table: pd.DataFrame, columns: Iterable[str], *, where: str) -> None:
    """Raise :class:`DataError` when ``table`` lacks any of ``columns``.

    Examples
    --------
    >>> require_columns(pd.DataFrame({"a": [1]}), ["a"], where="demo_chart")
    >>> require_columns(pd.DataFrame({"a": [1]}), ["a", "b"], where="demo_chart")
    Traceback (most recent call last):
    ...
    matchup_widgets.data._errors.DataError: demo_chart: table lacks column(s) 'b' (it has 'a'); build the table with those columns first.
    """
    missing = [c for c in columns if c not in table.columns]
    if missing:
        have = ", ".join(repr(str(c)) for c in list(table.columns)[:5])
        need = ", ".join(repr(c) for c in missing)
        msg = f"{where}: table lacks column(s) {need} (it has {have}); build the table with those columns first."
        raise DataError(msg)


def ordered_unique(values: pd.Series) -> list:
    """Return the distinct values of ``values`` in order of first appearance.

    Examples
    --------
    >>> ordered_unique(pd.Series(["b", "a", "b"]))
    ['b', 'a']
    """
    return list(pd.unique(values.to_numpy()))
