"""``matchup-widgets blend``: estimate one batter-versus-pitcher matchup."""

from __future__ import annotations

import argparse

from ._output import emit, fail

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


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``blend`` command."""
    p = subparsers.add_parser(
        "blend",
        help="estimate one batter-versus-pitcher matchup (probabilities, intervals, wOBA, runs)",
        description=(
            "Shrink the batter's and the pitcher's outcome distributions in their platoon split toward "
            "the league of that split, blend them, and report each outcome's probability with an "
            "interval, the plate appearances behind it, wOBA and runs per PA relative to the league."
        ),
    )
    p.add_argument("--data", required=True, metavar="PATH", help="plate-appearance file (Parquet or CSV)")
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
                   help="side the batter hits from (default: the batter's usual side; switch hitters bat opposite the pitcher)")
    p.add_argument("--interval", type=float, default=0.8, metavar="P",
                   help="central probability of the intervals (default 0.8)")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(func=run)


def _text(d: dict) -> str:
    from matchup_widgets.data import OUTCOME_LABELS

    b, q, s = d["batter"], d["pitcher"], d["settings"]
    level = f"{s['interval']:.0%}"
    lines = [
        f"{b['name']} ({b['id']}, bats {b['hand']}) vs {q['name']} ({q['id']}, throws {q['hand']}): split {d['split']}",
        f"{s['method']} blend, pitcher weight {s['pitcher_weight']:g}; priors batter {s['batter_prior_pa']:g} PA, "
        f"pitcher {s['pitcher_prior_pa']:g} PA; {s['basis']} basis",
        f"PAs in the split: batter {d['pa']['batter']:,}, pitcher {d['pa']['pitcher']:,}; "
        f"effective sample {d['effective_pa']:,.0f} PA",
        "",
        f"{'outcome':<16}{'matchup':>9}  {level + ' interval':>17}  {'league':>7}",
    ]
    for code, p in d["probabilities"].items():
        lo, hi = d["intervals"][code]
        lines.append(f"{OUTCOME_LABELS[code]:<16}{p:>9.1%}  {lo:>7.1%} to {hi:>6.1%}  {d['league'][code]:>7.1%}")
    lg = d["summary"]["league"]
    lines += [
        "",
        f"wOBA {d['woba']:.3f} (league {lg['woba']:.3f}); on base {d['on_base']:.3f}; "
        f"runs per PA vs league {d['runs_per_pa']:+.4f}",
    ]
    return "\n".join(lines)


def run(args: argparse.Namespace) -> int:
    """Run ``blend``; return the exit code (0 estimated, 2 unusable input)."""
    from matchup_widgets.data import DataError, load_pas, resolve_player
    from matchup_widgets.model import MatchupModel

    try:
        pas = load_pas(args.data)
        # names first: a typo fails before the counts are aggregated
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
        estimate = model.predict(batter, pitcher, batter_hand=args.batter_hand)
    except (DataError, ValueError, NotImplementedError) as exc:
        return fail(f"blend: {exc}", as_json=args.json)
    payload = estimate.to_dict()
    emit(payload, as_json=args.json, text=_text(payload))
    return 0
