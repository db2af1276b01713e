"""Execute every notebook in notebooks/ top to bottom, as the dashboard would."""

from __future__ import annotations

import os
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
    assert nb.metadata["widgets"]["application/vnd.jupyter.widget-state+json"]["state"]
