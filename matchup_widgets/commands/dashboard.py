"""``matchup-widgets dashboard``: serve the matchup explorer notebook with voila on 127.0.0.1.

The data path reaches the notebook through the ``MATCHUP_WIDGETS_DATA`` environment
variable; voila runs with sources stripped, tracebacks hidden and one preheated kernel, so
a page load shows the explorer in about a second after the first start.
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from matchup_widgets._paths import DATA_ENV

DEFAULT_NOTEBOOK = "matchup_explorer"


def register(subparsers: argparse._SubParsersAction) -> None:
    """Add the ``dashboard`` command."""
    p = subparsers.add_parser(
        "dashboard",
        help="serve the matchup explorer with voila on 127.0.0.1",
        description="Serve a notebook from notebooks/ as a dashboard (voila, code hidden) on 127.0.0.1.",
    )
    p.add_argument("--data", metavar="PATH", help="plate-appearance file (Parquet or CSV); default: the demo league")
    p.add_argument("--port", type=int, default=8866, help="port to listen on (default 8866)")
    p.add_argument(
        "--notebook",
        default=DEFAULT_NOTEBOOK,
        metavar="NAME",
        help="notebook name in notebooks/ (without .ipynb) or a path to one (default matchup_explorer)",
    )
    p.add_argument("--no-preheat", action="store_true", help="start a kernel per page load instead of keeping one warm")
    p.set_defaults(func=run)


def notebooks_dir() -> Path:
    """Return the folder that holds the project's notebooks (next to the package, else ./notebooks)."""
    beside = Path(__file__).resolve().parents[2] / "notebooks"
    return beside if beside.is_dir() else Path.cwd() / "notebooks"


def resolve_notebook(name: str) -> Path:
    """Return the notebook file for ``name`` (a name in notebooks/ or a path).

    Examples
    --------
    >>> resolve_notebook("matchup_explorer").name
    'matchup_explorer.ipynb'
    """
    path = Path(name)
    if path.suffix == ".ipynb" and path.is_file():
        return path.resolve()
    candidate = notebooks_dir() / f"{path.stem}.ipynb"
    if candidate.is_file():
        return candidate
    have = sorted(p.stem for p in notebooks_dir().glob("*.ipynb"))[:5]
    msg = f"--notebook {name!r}: no such notebook in {notebooks_dir()} (have: {', '.join(have) or 'none'}); pass one of those names or a path to an .ipynb file."
    raise FileNotFoundError(msg)


def voila_command(notebook: Path, *, port: int, preheat: bool = True) -> list[str]:
    """Return the voila command line for ``notebook`` on 127.0.0.1:``port``.

    Examples
    --------
    >>> cmd = voila_command(Path("x.ipynb"), port=9000)
    >>> "--port=9000" in cmd and "--strip_sources=True" in cmd and "--no-browser" in cmd
    True
    """
    cmd = [
        sys.executable,
        "-m",
        "voila",
        str(notebook),
        f"--port={port}",
        "--Voila.ip=127.0.0.1",
        "--no-browser",
        "--strip_sources=True",
        "--show_tracebacks=False",
        "--theme=light",
    ]
    if preheat:
        cmd += ["--preheat_kernel=True", "--pool_size=1"]
    return cmd


def run(args: argparse.Namespace) -> int:
    """Print the URL, then replace this process with voila serving the notebook."""
    from ._output import fail

    try:
        notebook = resolve_notebook(args.notebook)
    except FileNotFoundError as exc:
        return fail(str(exc), as_json=False)
    env = dict(os.environ)
    if args.data:
        data = Path(args.data)
        if not data.exists():
            return fail(f"--data {args.data!r}: no such file; give a plate-appearance Parquet/CSV file, or leave --data out for the demo league.", as_json=False)
        env[DATA_ENV] = str(data.resolve())
    url = f"http://127.0.0.1:{args.port}/"
    sys.stdout.write(f"Serving {notebook.name} at {url}  (Ctrl-C stops)\n")
    sys.stdout.flush()
    sys.stderr.flush()
    cmd = voila_command(notebook, port=args.port, preheat=not args.no_preheat)
    os.execve(cmd[0], cmd, env)
    return 0  # pragma: no cover - execve does not return
