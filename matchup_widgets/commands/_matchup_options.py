"""The options that name one matchup and its model settings, shared by ``blend`` and ``card``."""

from __future__ import annotations

import argparse
from typing import Any

from ._data_options import add_data_options, load_data

_METHODS = ("linear", "odds-ratio", "two-stage")


def _unit_float(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        value = float("nan")
    if not 0.0 <= value <= 1.0:
        msg = f"takes a number from 0 (all batter) to 1 (all pitcher); got {text!r}"
        raise argparse.ArgumentTypeError(msg)
    return value


def _pa(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        value = float("nan")
    if not value >= 0 or value == float("inf"):
        msg = f"takes a number of plate appearances >= 0 (0 = raw rates); got {text!r}"
        raise argparse.ArgumentTypeError(msg)
    return value


def add_matchup_options(p: argparse.ArgumentParser) -> None:
    """Add --data (with --mapping, --outcome-map), --batter, --pitcher and the model settings to ``p``."""
    p.add_argument("--data", required=True, metavar="PATH", help="plate-appearance file (Parquet or CSV)")
    add_data_options(p)
    p.add_argument("--batter", required=True, metavar="ID|NAME", help="batter id, full name or unique part of it")
    p.add_argument("--pitcher", required=True, metavar="ID|NAME", help="pitcher id, full name or unique part of it")
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
                   help="side the batter hits from (default: the batter's usual side; "
                   "switch hitters bat opposite the pitcher)")
    p.add_argument("--interval", type=float, default=0.8, metavar="P",
                   help="central probability of the intervals (default 0.8)")


def estimate_matchup(args: argparse.Namespace) -> Any:
    """Load ``args.data``, fit the model with the options' settings and predict the matchup.

    Names are resolved before the counts are aggregated, so a typo fails fast. Raises the
    core's ``DataError``/``ValueError`` for the caller to report.
    """
    from matchup_widgets.data import resolve_player
    from matchup_widgets.model import MatchupModel

    pas = load_data(args, args.data)
    batter = resolve_player(pas, args.batter, role="batter")
    pitcher = resolve_player(pas, args.pitcher, role="pitcher")
    model = MatchupModel(
        method=args.method,
        pitcher_weight=args.pitcher_weight,
        batter_prior_pa=args.batter_prior,
        pitcher_prior_pa=args.pitcher_prior,
        basis=args.basis,
        seasons=tuple(args.seasons) if args.seasons else None,
        interval=args.interval,
    ).fit(pas)
    return model.predict(batter, pitcher, batter_hand=args.batter_hand)
