"""End to end: the dashboard command serves the explorer with voila; headless Chromium
picks a matchup, moves the pitcher-weight slider and sees the chart change."""

from __future__ import annotations

import os
import shutil
import time
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[2]


@pytest.fixture()
def dashboard(serve_notebook) -> str:
    """The explorer served by `matchup-widgets dashboard`; its URL."""
    return serve_notebook()


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


def _settled(page, css: str, quiet_ms: int = 1500, timeout_s: float = 30.0) -> str:
    """Wait until the chart's markup has not changed for ``quiet_ms``; return it."""
    deadline = time.monotonic() + timeout_s
    last = _chart_markup(page, css)
    stable_since = time.monotonic()
    while time.monotonic() < deadline:
        page.wait_for_timeout(250)
        now = _chart_markup(page, css)
        if now != last:
            last, stable_since = now, time.monotonic()
        elif (time.monotonic() - stable_since) * 1000 >= quiet_ms:
            return now
    return last


def test_dashboard_updates_chart_in_browser(dashboard: str, chromium_browser, artifacts_dir: Path):
    outside: list[str] = []

    def local_only(route):
        # everything must come from the local server: vega JavaScript included (no CDN)
        url = route.request.url
        if url.startswith(dashboard) or url.startswith(("data:", "blob:")):
            route.continue_()
        else:
            outside.append(url)
            route.abort()

    bars = ".mw-outcome-bars"
    page = chromium_browser.new_page(viewport={"width": 1240, "height": 2000})
    page.route("**/*", local_only)
    page.goto(dashboard, wait_until="domcontentloaded", timeout=60_000)
    page.wait_for_selector(f"{bars} svg.marks", timeout=60_000)
    for css in (".mw-contact-heatmap", ".mw-tier-shares", ".mw-run-context"):
        page.wait_for_selector(f"{css} svg.marks", timeout=30_000)
    assert page.locator(".jp-InputArea-editor").count() == 0  # no code shown
    before = _settled(page, bars)

    # pick a matchup: choose another batter, then search a pitcher by part of a name
    pick = page.locator(".mw-batter-pick select")
    assert pick.locator("option").count() >= 2
    pick.select_option(index=1)
    _wait_changed(page, bars, before)
    first_pitcher = page.locator(".mw-pitcher-pick select option").nth(1).text_content()
    name = first_pitcher.split(" (")[0]
    page.locator(".mw-pitcher-search input").fill(name[:5])
    page.wait_for_function(
        "n => document.querySelector('.mw-pitcher-pick select').selectedOptions[0].text.startsWith(n)",
        arg=name[:5], timeout=20_000,
    )
    before = _settled(page, bars)
    headline = page.locator(".mw-headline").inner_text()
    assert name[:5] in headline
    readout = page.locator(".mw-pitcher-weight .widget-readout").inner_text()

    # move the pitcher-weight slider with the keyboard
    handle = page.locator(".mw-pitcher-weight .noUi-handle")
    handle.focus()
    for _ in range(10):
        handle.press("ArrowRight")
    after = _wait_changed(page, bars, before)
    assert after != before
    assert page.locator(".mw-pitcher-weight .widget-readout").inner_text() != readout
    _settled(page, bars, quiet_ms=800)
    assert page.locator(".mw-headline").inner_text() != headline
    assert page.locator(".mw-explorer .mw-status").inner_text().strip() == ""
    shot = artifacts_dir / "dashboard.png"
    page.screenshot(path=str(shot), full_page=True)
    # the charts rendered with every outside request blocked; the only ones tried are the
    # icon-font stylesheets of voila's page template (our panel uses no icon glyphs)
    assert all("fontawesome" in u for u in outside), outside
    if os.environ.get("MATCHUP_WIDGETS_UPDATE_SCREENSHOT"):
        docs = REPO / "docs"
        docs.mkdir(exist_ok=True)
        shutil.copyfile(shot, docs / "dashboard.png")
