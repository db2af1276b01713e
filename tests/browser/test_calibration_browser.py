"""End to end: voila serves the calibration lab with the explorer below it; headless Chromium
clicks fit, waits for the Brier heat map, pushes the settings, and reads the explorer's
pitcher-weight slider."""

from __future__ import annotations

import re
import time
from pathlib import Path

import pytest


@pytest.fixture()
def lab_page(serve_notebook) -> str:
    """notebooks/calibration_lab.ipynb served by `matchup-widgets dashboard`; its URL."""
    return serve_notebook("calibration_lab", timeout=90.0)


def test_fit_draws_heat_map_and_weight_reaches_explorer(lab_page: str, chromium_browser, artifacts_dir: Path):
    page = chromium_browser.new_page(viewport={"width": 1280, "height": 2400})
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
