"""The project's own error type for unusable input."""

from __future__ import annotations


class DataError(ValueError):
    """Input data cannot be used as given.

    The message says what was wrong, where (column, how many rows, up to five example
    values) and what to do about it.
    """
