"""Suite-wide fixtures: a private HOME for Jupyter and chromium, and the demo league."""

from __future__ import annotations

import os
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="session", autouse=True)
def _private_home(tmp_path_factory: pytest.TempPathFactory):
    """Jupyter, IPython and chromium write under $HOME: keep them in a temp dir."""
    home = tmp_path_factory.mktemp("home")
    saved = {k: os.environ.get(k) for k in ("HOME", "JUPYTER_RUNTIME_DIR", "IPYTHONDIR")}
    os.environ["HOME"] = str(home)
    os.environ["JUPYTER_RUNTIME_DIR"] = str(home / "jupyter-runtime")
    os.environ["IPYTHONDIR"] = str(home / "ipython")
    yield home
    for key, value in saved.items():
        if value is None:
            os.environ.pop(key, None)
        else:
            os.environ[key] = value


@pytest.fixture(scope="session")
def repo_root() -> Path:
    return REPO


@pytest.fixture(scope="session")
def artifacts_dir() -> Path:
    """Where tests leave files for a person to look at (screenshots, cards)."""
    path = REPO / "test-artifacts"
    path.mkdir(exist_ok=True)
    return path
