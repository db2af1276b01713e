"""``matchup-widgets card``: write the one-page matchup card (HTML, PNG or SVG)."""

from __future__ import annotations

import argparse

from ._output import emit, fail


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``card`` command (same settings options as ``blend``)."""
    from .blend import _METHODS, _pa, _unit_float

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
    p.add_argument("--data", required=True, metavar="PATH", help="plate-appearance file (Parquet or CSV)")
    p.add_argument("--batter", required=True, metavar="ID|NAME", help="batter id, full name or unique part of it")
    p.add_argument("--pitcher", required=True, metavar="ID|NAME", help="pitcher id, full name or unique part of it")
    p.add_argument("--out", required=True, metavar="FILE", help="card file: FILE.html, FILE.png or FILE.svg")
    p.add_argument("--csv", metavar="FOLDER", default=None,
                   help="also write the numbers behind the card as CSV files into FOLDER")
    p.add_argument("--pitcher-weight", type=_unit_float, default=0.5, metavar="W",
                   help="pitcher's weight in the blend, 0 to 1 (default 0.5)")
    p.add_argument("--batter-prior", type=_pa, default=200.0, metavar="PA",
                   help="league PAs added to the batter's counts (default 200; 0 = raw rates)")
    p.add_argument("--pitcher-prior", type=_pa, default=200.0, metavar="PA",
                   help="league PAs added to the pitcher's counts (default 200; 0 = raw rates)")
    p.add_argument("--method", choices=_METHODS, default="linear",
                   help="blend: linear, odds-ratio or two-stage (default linear)")
    p.add_argument("--basis", choices=("observed", "contact"), default="observed",
                   help="count observed outcomes, or contact-expected ones for balls in play (default observed)")
    p.add_argument("--seasons", type=int, nargs=2, metavar=("FIRST", "LAST"), default=None,
                   help="inclusive season range (default all seasons)")
    p.add_argument("--batter-hand", choices=("L", "R"), default=None,
                   help="side the batter hits from (default: his usual side)")
    p.add_argument("--interval", type=float, default=0.8, metavar="P",
                   help="central probability of the intervals (default 0.8)")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Run ``card``; return the exit code (0 written, 2 unusable input)."""
    from matchup_widgets.data import DataError, load_pas
    from matchup_widgets.export import card_format, write_matchup_card, write_tables
    from matchup_widgets.model import MatchupModel

    try:
        fmt = card_format(args.out)
        pas = load_pas(args.data)
        model = MatchupModel(
            method=args.method,
            pitcher_weight=args.pitcher_weight,
            batter_prior_pa=args.batter_prior,
            pitcher_prior_pa=args.pitcher_prior,
            basis=args.basis,
            seasons=tuple(args.seasons) if args.seasons else None,
            interval=args.interval,
        ).fit(pas)
        estimate = model.predict(args.batter, args.pitcher, batter_hand=args.batter_hand)
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
        "pa": {k: float(v) for k, v in estimate.pa.items()},
        "settings": dict(estimate.settings),
    }
    text = f"Wrote the {fmt.upper()} card for {estimate.batter_name} vs {estimate.pitcher_name} to {path}"
    emit(payload, as_json=args.json, text=text)
    return 0
