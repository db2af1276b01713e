"""Run every benchmark module (``bench_*.py``) in this folder, or those named on the command line.

Each module's ``main()`` prints its own times and the ratio against its named baseline.
Usage: ``python -m benchmarks [name ...]`` (names without the ``bench_`` prefix).
"""

from __future__ import annotations

import importlib
import sys
import time
from pathlib import Path


def main(argv: list[str]) -> int:
    here = Path(__file__).resolve().parent
    names = sorted(p.stem for p in here.glob("bench_*.py"))
    if argv:
        wanted = {f"bench_{a.removeprefix('bench_')}" for a in argv}
        names = [n for n in names if n in wanted]
    failed = 0
    for name in names:
        print(f"=== {name}", flush=True)
        start = time.perf_counter()
        try:
            importlib.import_module(f"benchmarks.{name}").main()
        except Exception as exc:  # report and go on with the other benchmarks
            failed += 1
            print(f"FAILED: {type(exc).__name__}: {exc}", flush=True)
        print(f"({time.perf_counter() - start:.1f} s in all)\n", flush=True)
    return 1 if failed else 0


sys.exit(main(sys.argv[1:]))
