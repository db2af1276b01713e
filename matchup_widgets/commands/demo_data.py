"""``matchup-widgets demo-data``: write the invented demo league as Parquet files."""

from __future__ import annotations

import argparse

from ._output import emit, fail


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``demo-data`` command."""
    p = subparsers.add_parser(
        "demo-data",
        help="write the invented demo league (Parquet) into a folder",
        description=(
            "Generate the invented demo league (made-up teams and players, three seasons) and write "
            "plate_appearances.parquet, players.parquet (with true talents) and teams.parquet into "
            "PATH. The same seed and package versions give the same bytes."
        ),
    )
    p.add_argument("--out", required=True, metavar="PATH", help="folder to write into (created if needed)")
    p.add_argument("--seed", type=int, default=2026, help="seed of the league (default 2026)")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    # Smaller leagues, for tests and quick trials.
    p.add_argument("--teams", type=int, default=20, help=argparse.SUPPRESS)
    p.add_argument("--seasons", type=int, default=3, help=argparse.SUPPRESS)
    p.add_argument("--games", type=int, default=162, help=argparse.SUPPRESS)
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Write the league; report the folder, files, number of plate appearances and seed."""
    import pyarrow.parquet as pq

    from matchup_widgets.data.demo import write_demo_league

    try:
        paths = write_demo_league(
            args.out, seed=args.seed, n_seasons=args.seasons, n_teams=args.teams, n_games=args.games
        )
    except (ValueError, OSError) as exc:
        return fail(f"demo-data: {exc}", as_json=args.json)
    n_pa = pq.ParquetFile(paths[0]).metadata.num_rows
    payload = {"out": str(paths[0].parent), "files": [str(p) for p in paths], "n_pa": n_pa, "seed": args.seed}
    text = f"Wrote {n_pa:,} plate appearances of the invented demo league (seed {args.seed}) to {paths[0].parent}:\n" + "\n".join(
        f"  {p.name}" for p in paths
    )
    emit(payload, as_json=args.json, text=text)
    return 0
