"""The ``matchup-widgets`` command line.

Each command lives in its own module under :mod:`matchup_widgets.commands` and exposes
``register(subparsers)``. Registration imports nothing heavy; a command imports the core
it needs inside its ``run`` function, so ``matchup-widgets --help`` stays quick.
"""

from __future__ import annotations

import argparse
import importlib
import sys

# Module names under matchup_widgets.commands, in the order --help lists them.
_COMMAND_MODULES: tuple[str, ...] = (
    "dashboard",
    "demo_data",
    "check",
    "blend",
    "fit",
    "run_values",
    "card",
)


def build_parser() -> argparse.ArgumentParser:
    """Return the argument parser with every available command registered."""
    parser = argparse.ArgumentParser(
        prog="matchup-widgets",
        description=(
            "Batter-versus-pitcher matchup analysis. Commands that compute take --json "
            "and then print exactly one JSON object on stdout."
        ),
    )
    subparsers = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in _COMMAND_MODULES:
        try:
            module = importlib.import_module(f"matchup_widgets.commands.{name}")
        except ModuleNotFoundError as exc:
            if exc.name != f"matchup_widgets.commands.{name}":
                raise
            continue  # command not built yet
        module.register(subparsers)
    return parser


def main(argv: list[str] | None = None) -> int:
    """Run the command line; return the process exit code."""
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "func", None):
        parser.print_help()
        return 2
    return int(args.func(args) or 0)


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
