"""Execute every notebook in notebooks/ top to bottom, as the dashboard would."""

from __future__ import annotations

import json
import os
import re
import sys
from pathlib import Path

import nbformat
import pytest

REPO = Path(__file__).resolve().parents[2]
NOTEBOOKS = sorted((REPO / "notebooks").glob("*.ipynb"))
DEMO = REPO / "demo_data" / "plate_appearances.parquet"


def _kernel_check_cell() -> nbformat.NotebookNode:
    # The kernel must run this venv's python (jupyter_client swaps a kernelspec's bare
    # "python" for the launching interpreter); fail loudly if it does not.
    return nbformat.v4.new_code_cell(
        f"import sys\nassert sys.prefix == {sys.prefix!r}, sys.executable\n"
    )


@pytest.mark.parametrize("path", NOTEBOOKS, ids=[p.stem for p in NOTEBOOKS])
def test_notebook_runs_top_to_bottom(path: Path, tmp_path: Path, monkeypatch: pytest.MonkeyPatch):
    from nbclient import NotebookClient

    if DEMO.exists():
        monkeypatch.setenv("MATCHUP_WIDGETS_DATA", str(DEMO))
    nb = nbformat.read(path, as_version=4)
    nb.cells.insert(0, _kernel_check_cell())
    client = NotebookClient(
        nb,
        kernel_name="python3",
        timeout=120,
        startup_timeout=60,
        store_widget_state=True,
        resources={"metadata": {"path": str(tmp_path)}},
    )
    client.execute(env=dict(os.environ))
    errors = [
        out
        for cell in nb.cells
        if cell.cell_type == "code"
        for out in cell.get("outputs", [])
        if out.get("output_type") == "error"
    ]
    assert not errors, errors
    # widget views were displayed and their state stored
    views = [
        out
        for cell in nb.cells
        if cell.cell_type == "code"
        for out in cell.get("outputs", [])
        if "application/vnd.jupyter.widget-view+json" in out.get("data", {})
    ]
    assert views, f"{path.name} displayed no widget"
    state = nb.metadata["widgets"]["application/vnd.jupyter.widget-state+json"]["state"]
    assert state
    _assert_panels_show_no_error(path.name, state)
    _assert_offline_and_small(path.name, nbformat.writes(nb), state)


def _assert_panels_show_no_error(name: str, state: dict) -> None:
    """No panel's status line or contact note shows an error after a top-to-bottom run.

    Callbacks are guarded, so a failing panel still executes without an error output;
    the message lands in the widget state instead (StatusLine.error writes role="alert").
    """
    shown = [
        str(model["state"].get("value", ""))
        for model in state.values()
        if model.get("model_name") == "HTMLModel"
    ]
    bad = [v for v in shown if 'role="alert"' in v or "not updated" in v]
    assert not bad, f"{name}: a panel shows an error: {bad[:2]}"


def _assert_offline_and_small(name: str, text: str, state: dict) -> None:
    """Nothing points at a CDN, and only the chart widgets carry large state.

    Each offline chart widget carries the vega bundle (~0.9 MB, JUPYTER-NOTES.md); any
    other widget over 100 KB would be HTML that stalls voila and nbclient.
    """
    cdn = re.findall(r"https?://[\w.-]*(?:cdn|jsdelivr|unpkg)[\w.-]*", text)
    assert not cdn, f"{name}: outputs load from the internet: {sorted(set(cdn))[:5]}"
    big = {
        key: (model.get("model_name"), len(json.dumps(model)))
        for key, model in state.items()
        if model.get("model_name") != "AnyModel" and len(json.dumps(model)) > 100_000
    }
    assert not big, f"{name}: widgets with large state (voila sends them on every load): {big}"
