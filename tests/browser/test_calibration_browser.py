"""End to end: voila serves the calibration lab with the explorer below it; headless Chromium
clicks fit, waits for the Brier heat map, pushes the settings, and reads the explorer's
pitcher-weight slider."""

from __future__ import annotations

import os
import re
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


@pytest.fixture()
def lab_page(tmp_path: Path):
    """Serve notebooks/calibration_lab.ipynb with `matchup-widgets dashboard`; yield its URL."""
    port = _free_port()
    log = tmp_path / "voila.log"
    env = dict(os.environ, HOME=str(tmp_path), JUPYTER_RUNTIME_DIR=str(tmp_path / "runtime"),
               XDG_CACHE_HOME=str(tmp_path / "cache"))
    cmd = [sys.executable, "-m", "matchup_widgets", "dashboard", "--notebook", "calibration_lab",
           "--port", str(port), "--no-preheat"]
    if DEMO.exists():
        cmd += ["--data", str(DEMO)]
    with log.open("wb") as out:
        proc = subprocess.Popen(cmd, cwd=REPO, env=env, stdout=out, stderr=subprocess.STDOUT, start_new_session=True)
    url = f"http://127.0.0.1:{port}/"
    try:
        deadline = time.monotonic() + 60
        while True:
            if proc.poll() is not None:
                pytest.fail(f"voila exited with {proc.returncode}:\n{log.read_text()[-3000:]}")
            try:
                with urllib.request.urlopen(url, timeout=5) as resp:  # noqa: S310 - local server
                    if resp.status == 200:
                        break
            except OSError:
                if time.monotonic() > deadline:
                    pytest.fail(f"voila did not answer on {url}:\n{log.read_text()[-3000:]}")
                time.sleep(0.5)
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


def test_fit_draws_heat_map_and_weight_reaches_explorer(lab_page: str, artifacts_dir: Path):
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        try:
            page = browser.new_page(viewport={"width": 1280, "height": 2400})
            page.goto(lab_page, wait_until="domcontentloaded", timeout=90_000)
            fit = page.locator("button.mw-fit")
            fit.wait_for(timeout=90_000)
            page.wait_for_selector(".mw-outcome-bars svg.marks", timeout=90_000)  # the explorer is up
            surface = ".mw-brier-surface svg.marks"
            page.wait_for_selector(surface, timeout=30_000)
            cells_before = page.locator(f"{surface} path").count()

            fit.click()
            summary = page.locator(".mw-fit-summary")
            summary.get_by_text("Pitcher weight").wait_for(timeout=120_000)
            text = summary.inner_text()
            fitted = float(re.search(r"Pitcher weight (\d\.\d\d)", text).group(1))

            # the heat map now holds the whole grid slice: many more marks than the placeholder
            deadline = time.monotonic() + 30
            while page.locator(f"{surface} path").count() <= cells_before + 50 and time.monotonic() < deadline:
                page.wait_for_timeout(250)
            assert page.locator(f"{surface} path").count() > cells_before + 50
            assert "held-out plate appearances" in page.locator(".mw-brier-surface").inner_text()

            page.locator("button.mw-apply-settings").click()
            page.locator(".mw-applied").get_by_text("Sent to the explorer").wait_for(timeout=20_000)
            readout = page.locator(".mw-pitcher-weight .widget-readout")
            deadline = time.monotonic() + 20
            while readout.inner_text().strip() != f"{fitted:.2f}" and time.monotonic() < deadline:
                page.wait_for_timeout(250)
            assert readout.inner_text().strip() == f"{fitted:.2f}"
            assert page.locator(".mw-calibration-lab .mw-status").inner_text().strip() == ""
            page.screenshot(path=str(artifacts_dir / "calibration_lab.png"), full_page=True)
        finally:
            browser.close()
