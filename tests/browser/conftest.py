"""Shared fixtures for the end-to-end tests: a voila server on a free local port and
Debian's chromium driven by Playwright (never a downloaded browser)."""

from __future__ import annotations

import os
import signal
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[2]
CHROMIUM = Path("/usr/bin/chromium")
DEMO = REPO / "demo_data" / "plate_appearances.parquet"
CHROMIUM_ARGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--no-first-run",
    "--disable-sync",
]


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait_http(url: str, proc: subprocess.Popen, log: Path, timeout: float) -> None:
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        if proc.poll() is not None:
            pytest.fail(f"voila exited with {proc.returncode}:\n{log.read_text()[-3000:]}")
        try:
            with urllib.request.urlopen(url, timeout=5) as resp:  # noqa: S310 - local server
                if resp.status == 200:
                    return
        except OSError:
            time.sleep(0.5)
    pytest.fail(f"voila did not answer on {url} within {timeout:.0f} s:\n{log.read_text()[-3000:]}")


def _stop(proc: subprocess.Popen) -> None:
    try:
        os.killpg(proc.pid, signal.SIGTERM)
        proc.wait(timeout=15)
    except (ProcessLookupError, subprocess.TimeoutExpired):
        try:
            os.killpg(proc.pid, signal.SIGKILL)
        except ProcessLookupError:
            pass
        proc.wait(timeout=5)


@pytest.fixture()
def serve_notebook(tmp_path: Path):
    """Factory: serve a notebook with `matchup-widgets dashboard` on a free port; return its URL.

    Every server it starts is stopped when the test ends.
    """
    procs: list[subprocess.Popen] = []

    def serve(notebook: str | None = None, *, timeout: float = 60.0) -> str:
        port = _free_port()
        log = tmp_path / f"voila-{port}.log"
        env = dict(
            os.environ,
            HOME=str(tmp_path),
            JUPYTER_RUNTIME_DIR=str(tmp_path / "runtime"),
            XDG_CACHE_HOME=str(tmp_path / "cache"),
        )
        cmd = [sys.executable, "-m", "matchup_widgets", "dashboard", "--port", str(port), "--no-preheat"]
        if notebook:
            cmd += ["--notebook", notebook]
        if DEMO.exists():
            cmd += ["--data", str(DEMO)]
        with log.open("wb") as out:
            proc = subprocess.Popen(
                cmd, cwd=REPO, env=env, stdout=out, stderr=subprocess.STDOUT, start_new_session=True
            )
        procs.append(proc)
        url = f"http://127.0.0.1:{port}/"
        _wait_http(url, proc, log, timeout)
        return url

    try:
        yield serve
    finally:
        for proc in procs:
            _stop(proc)


@pytest.fixture()
def chromium_browser():
    """Debian's chromium, headless, through Playwright; skipped only when it is not installed."""
    if not CHROMIUM.exists():
        pytest.skip(
            "Debian's chromium is not installed at /usr/bin/chromium (.ci/run installs it: apt-get install chromium)"
        )
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        try:
            yield browser
        finally:
            browser.close()
