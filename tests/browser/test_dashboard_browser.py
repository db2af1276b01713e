"""End to end: the dashboard command serves the explorer with voila; headless Chromium
picks a matchup, moves the pitcher-weight slider and sees the chart change."""

from __future__ import annotations

import os
import shutil
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

pytestmark = pytest.mark.skipif(
    not CHROMIUM.exists(),
    reason="Debian's chromium is not installed at /usr/bin/chromium (.ci/run installs it: apt-get install chromium)",
)


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait_http(url: str, proc: subprocess.Popen, log: Path, timeout: float = 60.0) -> None:
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


@pytest.fixture()
def dashboard(tmp_path: Path):
    """Start `matchup-widgets dashboard` on a free port; yield its URL; stop it."""
    port = _free_port()
    log = tmp_path / "voila.log"
    env = dict(os.environ, HOME=str(tmp_path), JUPYTER_RUNTIME_DIR=str(tmp_path / "runtime"))
    cmd = [sys.executable, "-m", "matchup_widgets", "dashboard", "--port", str(port), "--no-preheat"]
    if DEMO.exists():
        cmd += ["--data", str(DEMO)]
    with log.open("wb") as out:
        proc = subprocess.Popen(cmd, cwd=REPO, env=env, stdout=out, stderr=subprocess.STDOUT, start_new_session=True)
    url = f"http://127.0.0.1:{port}/"
    try:
        _wait_http(url, proc, log)
        yield url
    finally:
        try:
            os.killpg(proc.pid, signal.SIGTERM)
            proc.wait(timeout=15)
        except (ProcessLookupError, subprocess.TimeoutExpired):
            try:
                os.killpg(proc.pid, signal.SIGKILL)
            except ProcessLookupError:
                pass
            proc.wait(timeout=5)


def _chart_markup(page, css: str) -> str:
    return page.locator(f"{css} svg.marks").first.inner_html()


def _wait_changed(page, css: str, before: str, timeout_s: float = 20.0) -> str:
    deadline = time.monotonic() + timeout_s
    while time.monotonic() < deadline:
        now = _chart_markup(page, css)
        if now != before:
            return now
        page.wait_for_timeout(200)
    pytest.fail(f"chart {css} did not change within {timeout_s:.0f} s")


def test_dashboard_updates_chart_in_browser(dashboard: str, tmp_path: Path, artifacts_dir: Path):
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        try:
            page = browser.new_page(viewport={"width": 1240, "height": 2000})
            page.goto(dashboard, wait_until="domcontentloaded", timeout=60_000)
            bars = ".mw-outcome-bars"
            page.wait_for_selector(f"{bars} svg.marks", timeout=60_000)
            # no code is shown in the dashboard
            assert page.locator(".jp-InputArea-editor").count() == 0

            # pick a matchup: type part of a name, then choose from the matches
            before = _chart_markup(page, bars)
            pick = page.locator(".mw-batter-pick select")
            options = pick.locator("option").all_text_contents()
            assert len(options) >= 2, options
            pick.select_option(index=1)
            before = _wait_changed(page, bars, before)
            search = page.locator(".mw-pitcher-search input")
            first_pitcher = page.locator(".mw-pitcher-pick select option").nth(1).text_content()
            search.fill(first_pitcher.split(" (")[0][:4])
            search.press("Enter")
            page.wait_for_timeout(500)
            headline_before = page.locator(".mw-headline").inner_text()

            # move the pitcher-weight slider with the keyboard
            handle = page.locator(".mw-pitcher-weight .noUi-handle")
            handle.focus()
            for _ in range(5):
                handle.press("ArrowRight")
            after = _wait_changed(page, bars, before)
            assert after != before
            page.wait_for_timeout(300)
            assert page.locator(".mw-status").inner_text().strip() == ""
            shot = artifacts_dir / "dashboard.png"
            page.screenshot(path=str(shot), full_page=True)
            assert headline_before  # the headline figures rendered as text
        finally:
            browser.close()
    docs = REPO / "docs"
    docs.mkdir(exist_ok=True)
    if os.environ.get("MATCHUP_WIDGETS_UPDATE_SCREENSHOT"):
        shutil.copyfile(shot, docs / "dashboard.png")
