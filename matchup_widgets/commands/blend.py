"""``matchup-widgets blend``: estimate one batter-versus-pitcher matchup."""

from __future__ import annotations

import argparse

from ._matchup_options import add_matchup_options, estimate_matchup
from ._output import emit, fail

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
    add_matchup_options(p)
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
    from matchup_widgets.data import DataError

    try:
        estimate = estimate_matchup(args)
    except (DataError, ValueError, NotImplementedError) as exc:
        return fail(f"blend: {exc}", as_json=args.json)
    payload = estimate.to_dict()
    emit(payload, as_json=args.json, text=_text(payload))
    return 0
