"""The options that say how to read a plate-appearance file, shared by every command that loads one."""

from __future__ import annotations

import argparse
import json
from typing import Any


def add_data_options(p: argparse.ArgumentParser) -> None:
    """Add --mapping, --outcome-map (the user's own column names and codes) and --duplicates to ``p``."""
    p.add_argument("--mapping", metavar="FILE", help="JSON file {their_column: our_column}")
    p.add_argument(
        "--outcome-map",
        metavar="FILE",
        help='JSON file {raw_code: code or null}, e.g. {"SAC": null, "E": "GB_OUT"}; null drops those rows',
    )
    p.add_argument(
        "--duplicates",
        choices=("auto", "drop", "keep"),
        default="auto",
        help="exact duplicate rows: drop them, keep them, or (auto) drop them only when the table has a "
        "column that tells plate appearances apart (inning, outs_before, bases_before or an extra column)",
    )


def read_outcome_map(path: str | None) -> dict | None:
    """Read an ``--outcome-map`` JSON file (None when not given); unreadable files raise DataError."""
    from matchup_widgets.data import DataError

    if path is None:
        return None
    try:
        with open(path, encoding="utf-8") as fh:
            return json.load(fh)
    except (OSError, UnicodeDecodeError, json.JSONDecodeError) as exc:
        msg = f"Outcome map {path!r} is not a readable JSON file ({exc}). It should hold {{raw_code: code or null}}."
        raise DataError(msg) from None


def load_data(args: argparse.Namespace, path: str, **kw: Any) -> Any:
    """``load_pas(path)`` with the --mapping, --outcome-map and --duplicates of ``args`` (DataError when unusable)."""
    from matchup_widgets.data import load_pas

    return load_pas(
        path,
        mapping=args.mapping,
        outcome_map=read_outcome_map(args.outcome_map),
        drop_duplicates={"auto": None, "drop": True, "keep": False}[args.duplicates],
        **kw,
    )
