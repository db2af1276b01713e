"""Shared output helpers for commands: one JSON object on stdout, or readable text."""

from __future__ import annotations

import json
import math
import sys
from typing import Any

import numpy as np


def _plain(value: Any) -> Any:
    """Turn numpy and pandas scalars and arrays into JSON-ready Python values."""
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, np.ndarray):
        return [_plain(v) for v in value.tolist()]
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    if hasattr(value, "to_dict") and not isinstance(value, type):
        return _plain(value.to_dict())
    return value


def emit(payload: dict[str, Any], *, as_json: bool, text: str | None = None) -> None:
    """Print ``payload`` as one JSON object (``as_json``) or ``text`` for people."""
    if as_json:
        sys.stdout.write(json.dumps(_plain(payload), sort_keys=False) + "\n")
    else:
        sys.stdout.write((text if text is not None else json.dumps(_plain(payload), indent=2)) + "\n")


def fail(message: str, *, as_json: bool, code: int = 2) -> int:
    """Report an unusable input: JSON ``{"error": ...}`` on stdout, or the text on stderr."""
    if as_json:
        sys.stdout.write(json.dumps({"error": message}) + "\n")
    else:
        sys.stderr.write(f"error: {message}\n")
    return code
