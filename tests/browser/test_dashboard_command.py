"""The dashboard command without starting a server: what it would run, and its errors."""

from __future__ import annotations

from pathlib import Path

import pytest

from matchup_widgets.cli import main
from matchup_widgets.commands import dashboard


def test_runs_voila_on_localhost_with_sources_stripped(monkeypatch, capsys, tmp_path):
    data = tmp_path / "pas.parquet"
    data.write_bytes(b"")
    seen = {}

    def fake_execve(path, argv, env):
        seen.update(path=path, argv=argv, env=env)

    monkeypatch.setattr(dashboard.os, "execve", fake_execve)
    assert main(["dashboard", "--data", str(data), "--port", "9123"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("Serving matchup_explorer.ipynb at http://127.0.0.1:9123/")
    argv = seen["argv"]
    assert argv[1:3] == ["-m", "voila"]
    assert Path(argv[3]).name == "matchup_explorer.ipynb"
    for flag in ("--port=9123", "--Voila.ip=127.0.0.1", "--no-browser", "--strip_sources=True",
                 "--show_tracebacks=False", "--preheat_kernel=True", "--pool_size=1"):
        assert flag in argv
    assert seen["env"][dashboard.DATA_ENV] == str(data.resolve())


def test_no_preheat_and_other_notebook(monkeypatch, tmp_path):
    nb = tmp_path / "mine.ipynb"
    nb.write_text("{}")
    seen = {}
    monkeypatch.setattr(dashboard.os, "execve", lambda p, a, e: seen.update(argv=a))
    assert main(["dashboard", "--notebook", str(nb), "--no-preheat"]) == 0
    assert seen["argv"][3] == str(nb.resolve())
    assert "--preheat_kernel=True" not in seen["argv"]


def test_missing_data_file_is_reported(capsys):
    assert main(["dashboard", "--data", "no/such/file.parquet"]) == 2
    err = capsys.readouterr().err
    assert "--data 'no/such/file.parquet': no such file" in err


def test_unknown_notebook_lists_the_available_ones(capsys):
    assert main(["dashboard", "--notebook", "nope"]) == 2
    err = capsys.readouterr().err
    assert "no such notebook" in err and "matchup_explorer" in err


@pytest.mark.parametrize("name", ["matchup_explorer", "matchup_explorer.ipynb"])
def test_resolve_by_name(name):
    assert dashboard.resolve_notebook(name).name == "matchup_explorer.ipynb"
