"""``matchup-widgets card``: write the one-page matchup card (HTML, PNG or SVG)."""

from __future__ import annotations

import argparse

from ._matchup_options import add_matchup_options, estimate_matchup
from ._output import emit, fail


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``card`` command (same settings options as ``blend``)."""
    p = subparsers.add_parser(
        "card",
        help="write a one-page matchup card (.html, .png or .svg) for presenting",
        description=(
            "Estimate one matchup as `blend` does and write a one-page card stating the players, "
            "the platoon split, the settings, the plate appearances behind each side, every "
            "probability with its interval, wOBA and runs per PA against the league, and a caution "
            "line. The format follows the file's suffix; HTML pages carry their JavaScript inline."
        ),
    )
    add_matchup_options(p)
    p.add_argument("--out", required=True, metavar="FILE", help="card file: FILE.html, FILE.png or FILE.svg")
    p.add_argument("--csv", metavar="FOLDER", default=None,
                   help="also write the numbers behind the card as CSV files into FOLDER")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Run ``card``; return the exit code (0 written, 2 unusable input)."""
    from matchup_widgets.data import DataError
    from matchup_widgets.export import card_format, write_matchup_card, write_tables

    try:
        fmt = card_format(args.out)
        estimate = estimate_matchup(args)
    except (DataError, ValueError, NotImplementedError) as exc:
        return fail(f"card: {exc}", as_json=args.json)
    try:
        path = write_matchup_card(estimate, args.out)
        csv_paths = []
        if args.csv:
            from matchup_widgets.export import card_tables

            csv_paths = write_tables(card_tables(estimate), args.csv, prefix="card_")
    except OSError as exc:
        return fail(f"card: could not write {args.out}: {exc}. Check the folder exists and is writable.",
                    as_json=args.json)
    payload = {
        "out": str(path),
        "format": fmt,
        "bytes": path.stat().st_size,
        "csv": [str(p) for p in csv_paths],
        "batter": {"id": estimate.batter_id, "name": estimate.batter_name, "hand": estimate.batter_hand},
        "pitcher": {"id": estimate.pitcher_id, "name": estimate.pitcher_name, "hand": estimate.pitcher_hand},
        "split": estimate.split,
        "pa": estimate.to_dict()["pa"],  # as blend prints them (whole PAs as integers)
        "settings": dict(estimate.settings),
    }
    text = f"Wrote the {fmt.upper()} card for {estimate.batter_name} vs {estimate.pitcher_name} to {path}"
    emit(payload, as_json=args.json, text=text)
    return 0
