"""``matchup-widgets check PATH``: validate a plate-appearance file and print the report.

Exit status 0 when the data is usable, 2 (with a one-paragraph reason) when it is not.
"""

from __future__ import annotations

import argparse

from ._data_options import add_data_options, load_data


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``check`` command (cheap: no core imports here)."""
    p = subparsers.add_parser(
        "check",
        help="validate a plate-appearance file and print the report",
        description=(
            "Validate a plate-appearance table (.csv, .parquet or .duckdb) and print the report: rows read, "
            "rows kept, rows dropped per reason, warnings. Exit 0 if usable, 2 if not (with the reason)."
        ),
    )
    p.add_argument("path", metavar="PATH", help="a .csv, .parquet or .duckdb file")
    add_data_options(p)
    p.add_argument("--table", metavar="NAME", help="table inside a .duckdb file holding several")
    p.add_argument("--strict", action="store_true", help="treat any dropped row or repaired value as an error")
    p.add_argument("--batter", metavar="ID|NAME", help="also check that this batter is in the data")
    p.add_argument("--pitcher", metavar="ID|NAME", help="also check that this pitcher is in the data")
    p.add_argument(
        "--split",
        metavar="B-P",
        help="with --batter/--pitcher: require plate appearances in this platoon split, given as the "
        "batter's side and the pitcher's hand, e.g. L-R",
    )
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(func=run)


def _parse_split(text: str) -> tuple[str, str]:
    from matchup_widgets.data import DataError

    parts = text.upper().replace("/", "-").replace("V", "-").split("-")
    parts = [p for p in parts if p]
    if len(parts) != 2 or not all(p in ("L", "R") for p in parts):
        msg = f"--split {text!r} is not a platoon split; write the batter's side and the pitcher's hand, e.g. L-R."
        raise DataError(msg)
    return parts[0], parts[1]


def run(args: argparse.Namespace) -> int:
    """Validate ``args.path``; print the report (exit 0) or the reason it is unusable (exit 2)."""
    from matchup_widgets.commands._output import emit, fail
    from matchup_widgets.data import DataError, outcome_counts, require_split, resolve_player

    try:
        pas = load_data(args, args.path, table=args.table, strict=args.strict)
    except DataError as exc:
        return fail(f"{args.path}: not usable. {exc}", as_json=args.json)
    try:
        players: dict[str, dict] = {}
        split = _parse_split(args.split) if args.split else None
        if split is not None and args.batter is None and args.pitcher is None:
            msg = "--split checks a player's plate appearances in that split; give --batter or --pitcher with it."
            raise DataError(msg)
        for role, query in (("batter", args.batter), ("pitcher", args.pitcher)):
            if query is None:
                continue
            player_id = resolve_player(pas, query, role=role)
            entry: dict = {"player_id": player_id}
            if split is not None:
                counts = outcome_counts(pas, role=role)
                row = require_split(counts, player_id, split[0], split[1], role=role)
                entry["split_pa"] = int(row["pa"])
            players[role] = entry
    except DataError as exc:  # the data loads, but not for the players or split asked about
        return fail(f"{args.path}: {exc}", as_json=args.json)

    report = pas.report
    payload = {"usable": True, "path": str(args.path), **report.to_dict(), "seasons": pas.seasons}
    if players:
        payload["players"] = players
    text = report.summary() + f"\nSeasons: {', '.join(str(s) for s in pas.seasons)}."
    for role, entry in players.items():
        line = f"\n{role.capitalize()} {entry['player_id']}: found"
        if "split_pa" in entry:
            line += f", {entry['split_pa']:,} PA in the {split[0]}-{split[1]} split"
        text += line + "."
    emit(payload, as_json=args.json, text=text + "\nUsable: yes.")
    return 0
