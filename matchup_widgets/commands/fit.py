"""``matchup-widgets fit``: choose the pitcher weight and prior sizes from held-out PAs."""

from __future__ import annotations

import argparse

from ._data_options import add_data_options, load_data
from ._output import emit, fail

_METHODS = ("linear", "odds-ratio", "two-stage")


def _prior_list(text: str) -> tuple[float, ...]:
    try:
        values = tuple(float(v) for v in text.split(",") if v.strip())
    except ValueError:
        msg = f"--priors takes comma-separated numbers of PAs such as 0,50,200; got {text!r}"
        raise argparse.ArgumentTypeError(msg) from None
    if not values or any(v < 0 for v in values):
        msg = f"--priors needs at least one prior size >= 0; got {text!r}"
        raise argparse.ArgumentTypeError(msg)
    return values


def _replicates(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        msg = f"--n-boot takes a whole number of bootstrap replicates >= 1 (e.g. 200); got {text!r}"
        raise argparse.ArgumentTypeError(msg)
    return value


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``fit`` command."""
    p = subparsers.add_parser(
        "fit",
        help="fit the pitcher weight and prior sizes on held-out plate appearances (Brier score)",
        description=(
            "Fit on --data less a held-out share of whole games (or all of it when --score gives a "
            "separate table), score every setting on the held-out PAs, and report the best pitcher "
            "weight and prior sizes with baselines, a bootstrap interval and the Brier surface."
        ),
    )
    p.add_argument("--data", required=True, metavar="PATH", help="plate-appearance file to fit on")
    add_data_options(p)
    where = p.add_mutually_exclusive_group()
    where.add_argument("--holdout-share", type=float, default=0.25, metavar="SHARE",
                       help="share of whole games held out for scoring (default 0.25)")
    where.add_argument("--score", metavar="PATH", help="separate plate-appearance file to score on (read with the same --mapping)")
    where.add_argument("--season-forward", action="store_true",
                       help="fit on the earlier seasons, score on the last one")
    p.add_argument("--seed", type=int, default=0, help="seed of the game split and the bootstrap (default 0)")
    p.add_argument("--method", action="append", choices=_METHODS, metavar="METHOD",
                   help="blend method(s) to compare: linear, odds-ratio, two-stage (repeatable; default all)")
    p.add_argument("--basis", choices=("observed", "contact"), default="observed",
                   help="fit distributions from observed outcomes or contact-expected ones (default observed)")
    p.add_argument("--priors", type=_prior_list, default=None, metavar="LIST",
                   help="prior sizes in PAs to search, comma-separated (default 0,25,50,100,200,400,800)")
    p.add_argument("--n-boot", type=_replicates, default=200, metavar="N", help="bootstrap replicates (default 200)")
    p.add_argument("--quiet", action="store_true", help="no progress line on stderr")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(func=run)


def _text(d: dict) -> str:
    base = d["brier_baselines"]
    lo, hi = d["weight_interval"]
    lines = [
        f"Fitted on {d['n_fit_pa']:,} PAs, scored on {d['n_holdout_pa']:,} held-out PAs ({d['split']} split, {d['basis']} basis).",
        f"Pitcher weight {d['pitcher_weight']:.3f} ({d['interval_level']:.0%} interval {lo:.3f} to {hi:.3f}); "
        f"prior sizes: batter {d['batter_prior_pa']:g} PA, pitcher {d['pitcher_prior_pa']:g} PA.",
        f"Brier {d['brier']:.5f}, log loss {d['log_loss']:.5f}.",
        "Baselines (Brier, skill of the fitted blend):",
    ]
    for name, value in base.items():
        lines.append(f"  {name:<13} {value:.5f}  {d['skill_scores'][name]:+.4%}")
    lines.append("Methods:")
    for row in d["methods"]:
        lines.append(f"  {row['method']:<11} Brier {row['brier']:.5f}  log loss {row['log_loss']:.5f}  {row['settings']}")
    return "\n".join(lines)


def run(args: argparse.Namespace) -> int:
    """Run ``fit``; return the exit code (0 fitted, 2 unusable input)."""
    from ..data import DataError
    from ..model import DEFAULT_PRIOR_GRID, calibrate

    try:
        pas = load_data(args, args.data)
        score = load_data(args, args.score) if args.score else None
        result = calibrate(
            pas,
            holdout_share=args.holdout_share,
            seed=args.seed,
            score=score,
            season_forward=args.season_forward,
            priors=args.priors or DEFAULT_PRIOR_GRID,
            basis=args.basis,
            n_boot=args.n_boot,
            progress=not args.quiet,
        )
    except (DataError, ValueError, FileNotFoundError) as exc:
        return fail(f"fit: {exc}", as_json=args.json)
    payload = result.to_dict()
    wanted = args.method or list(_METHODS)
    payload["methods"] = [m for m in payload["methods"] if m["method"] in wanted]
    emit(payload, as_json=args.json, text=_text(payload))
    return 0
