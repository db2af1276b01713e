"""``matchup-widgets run-values``: run expectancy, linear weights and wOBA weights for a league."""

from __future__ import annotations

import argparse
import json
from pathlib import Path
from typing import Any

from ._data_options import add_data_options, load_data
from ._output import emit, fail


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``run-values`` command."""
    p = subparsers.add_parser(
        "run-values",
        help="run expectancy matrix, linear weights and wOBA weights from league rates",
        description=(
            "Solve the base-out Markov chain for a league outcome distribution (a rates file, or "
            "the league totals of a plate-appearance file) and report the 24-state run "
            "expectancy, linear weights per outcome, wOBA weights and runs per 9 innings. With "
            "--data, advancement is estimated from the base-out columns when the data has them."
        ),
    )
    src = p.add_mutually_exclusive_group(required=True)
    src.add_argument("--rates", metavar="FILE.json",
                     help='JSON object {code: probability} over K, BB, HBP, 1B, 2B, 3B, HR, GB_OUT, AIR_OUT')
    src.add_argument("--data", metavar="PATH", help="plate-appearance file (.parquet, .csv, .duckdb)")
    add_data_options(p)
    p.add_argument("--seasons", type=int, nargs=2, metavar=("FIRST", "LAST"),
                   help="with --data: only these seasons (inclusive)")
    p.add_argument("--advancement", choices=("auto", "default", "data"), default="auto",
                   help="advancement table: estimated from the data's base-out columns (data), the "
                        "built-in common-practice table (default), or data when present (auto)")
    p.add_argument("--min-count", type=int, default=30, metavar="N",
                   help="PAs an (outcome, state) cell needs before the data replaces the default (30)")
    p.add_argument("--normalize", action="store_true",
                   help="with --rates: rescale rates that do not sum to 1 (e.g. rounded figures)")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(func=run)


def _read_rates(path: str, *, normalize: bool) -> dict[str, float]:
    try:
        text = Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        reason = exc.strerror if isinstance(exc, OSError) and exc.strerror else type(exc).__name__
        msg = f"--rates {path}: cannot read the file ({reason}). Give a JSON file {{code: probability}}."
        raise ValueError(msg) from None
    try:
        raw = json.loads(text)
    except json.JSONDecodeError as exc:
        msg = f"--rates {path}: not valid JSON ({exc.msg} at line {exc.lineno}). Give an object {{code: p}}."
        raise ValueError(msg) from None
    if not isinstance(raw, dict):
        msg = f"--rates {path}: expected a JSON object {{code: probability}}; got {type(raw).__name__}."
        raise ValueError(msg)
    bad = {k: v for k, v in raw.items() if isinstance(v, bool) or not isinstance(v, (int, float))}
    if bad:
        msg = f"--rates {path}: values must be numbers; got {dict(list(bad.items())[:5])}."
        raise ValueError(msg)
    rates = {str(k): float(v) for k, v in raw.items()}
    total = sum(rates.values())
    if normalize:
        if total <= 0:
            msg = f"--rates {path}: the rates sum to {total:g}; nothing to normalise."
            raise ValueError(msg)
        rates = {k: v / total for k, v in rates.items()}
    return rates


def _league_from_data(args: argparse.Namespace) -> tuple[dict[str, float], Any, dict[str, Any]]:
    from ..data import BASE_OUT_COLUMNS, OUTCOMES, as_table, league_counts
    from ..runs import estimate_advancement

    pas = load_data(args, args.data)
    seasons = tuple(args.seasons) if args.seasons else None
    counts = league_counts(pas, seasons=seasons)
    totals = counts[list(OUTCOMES)].sum()
    n_pa = int(counts["pa"].sum())
    if n_pa == 0:
        msg = f"--data {args.data}: no plate appearances{' in seasons ' + str(seasons) if seasons else ''}."
        raise ValueError(msg)
    rates = {code: float(totals[code]) / n_pa for code in OUTCOMES}
    has_base_out = set(BASE_OUT_COLUMNS) <= set(pas.table.columns)
    info: dict[str, Any] = {"n_pa": n_pa, "source": "default"}
    if args.advancement == "data" and not has_base_out:
        missing = sorted(set(BASE_OUT_COLUMNS) - set(pas.table.columns))
        msg = f"--advancement data needs the base-out columns; {args.data} lacks {missing}."
        raise ValueError(msg)
    table = None
    if has_base_out and args.advancement != "default":
        t = as_table(pas)
        if seasons:
            t = t.filter((t.season >= seasons[0]) & (t.season <= seasons[1]))
        table = estimate_advancement(t, min_count=args.min_count)
        info.update(
            source="data",
            cells_from_data=int(table.from_data.sum()),
            cells=int(table.from_data.size),
            pa_with_base_out=int(table.counts.sum()),
            pa_without_base_out=table.n_skipped,
        )
    return rates, table, info


def _text(d: dict[str, Any]) -> str:
    from ..runs import state_label

    lines = [f"Runs per inning {d['runs_per_inning']:.3f}, per 9 innings {d['runs_per_9']:.2f}",
             f"Advancement: {d['advancement']['source']}", "Run expectancy:"]
    for outs, row in enumerate(d["run_expectancy"]):
        for bases, value in enumerate(row):
            lines.append(f"  {state_label(outs, bases):<32} {value:.3f}")
    lines.append("Linear weights (runs relative to an average PA):")
    lines += [f"  {code:<8} {value:+.3f}" for code, value in d["linear_weights"].items()]
    lines.append(f"wOBA weights (scale {d['woba_scale']:.3f}):")
    lines += [f"  {code:<8} {value:.3f}" for code, value in d["woba_weights"].items()]
    return "\n".join(lines)


def run(args: argparse.Namespace) -> int:
    """Run ``run-values``; return the exit code (0 computed, 2 unusable input)."""
    from ..data import DataError
    from ..runs import linear_weights, run_expectancy, runs_per_inning, woba_weights

    try:
        if args.rates:
            if args.advancement == "data":
                msg = "--advancement data needs --data (a rates file has no base-out columns)."
                raise ValueError(msg)
            if args.seasons:
                msg = "--seasons picks seasons of --data; a rates file has none. Leave --seasons out."
                raise ValueError(msg)
            rates = _read_rates(args.rates, normalize=args.normalize)
            table, info = None, {"source": "default"}
            try:
                run_expectancy(rates)
            except ValueError as exc:
                msg = f"--rates {args.rates}: {exc} (--normalize rescales rounded rates)"
                raise ValueError(msg) from None
        else:
            rates, table, info = _league_from_data(args)
        re = run_expectancy(rates, advancement=table)
        lw = linear_weights(rates, advancement=table)
        weights, scale = woba_weights(rates, advancement=table)
        per_inning = runs_per_inning(rates, advancement=table)
    except (DataError, ValueError, OSError) as exc:
        return fail(str(exc), as_json=args.json)
    payload = {
        # Full precision: exact closed forms come out exact; the text output rounds for reading.
        "run_expectancy": [[float(v) for v in row] for row in re],
        "linear_weights": {k: float(v) for k, v in lw.items()},
        "woba_weights": {k: float(v) for k, v in weights.items()},
        "woba_scale": float(scale),
        "runs_per_inning": float(per_inning),
        "runs_per_9": float(9 * per_inning),
        "rates": {k: float(v) for k, v in rates.items()},
        "advancement": info,
    }
    emit(payload, as_json=args.json, text=_text(payload))
    return 0

