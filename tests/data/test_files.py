"""Writes that a reader never sees half of: interrupted and concurrent demo-data runs, failed
card and table writes."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pandas as pd
import pytest

from matchup_widgets.data import load_pas
from matchup_widgets.data._files import atomic_path, folder_lock, write_text_atomic
from matchup_widgets.data.demo import DEMO_FILES, write_demo_league

# A league big enough that writing it takes a noticeable moment (about a second here).
_SIZE = ["--teams", "12", "--seasons", "1", "--games", "120"]
_KW = {"n_teams": 12, "n_seasons": 1, "n_games": 120}


def _demo_command(out: Path, seed: int) -> list[str]:
    return [sys.executable, "-m", "matchup_widgets", "demo-data", "--out", str(out), "--seed", str(seed), *_SIZE]


def _contents(folder: Path) -> dict[str, bytes]:
    return {name: (folder / name).read_bytes() for name in DEMO_FILES if (folder / name).exists()}


@pytest.fixture(scope="module")
def references(tmp_path_factory):
    """The complete leagues of seeds 1 and 2, written by the library into their own folders."""
    root = tmp_path_factory.mktemp("reference")
    out = {}
    for seed in (1, 2):
        write_demo_league(root / str(seed), seed=seed, **_KW)
        out[seed] = _contents(root / str(seed))
    return out


def test_atomic_path_keeps_the_previous_file_on_failure(tmp_path):
    target = tmp_path / "card.svg"
    target.write_text("previous")
    with pytest.raises(RuntimeError, match="renderer failed"), atomic_path(target) as tmp:
        tmp.write_text("half a ca")
        msg = "renderer failed"
        raise RuntimeError(msg)
    assert target.read_text() == "previous"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["card.svg"]  # no temporary file left


def test_written_files_get_the_usual_mode(tmp_path):
    path = write_text_atomic(tmp_path / "t.csv", "a\n1\n")
    umask = os.umask(0)
    os.umask(umask)
    assert path.stat().st_mode & 0o777 == 0o666 & ~umask


def _listing(folder: Path) -> set[tuple[str, int, int]]:
    out = set()
    for p in folder.iterdir():
        try:
            st = p.stat()
        except FileNotFoundError:  # renamed away between the listing and the stat
            continue
        out.add((p.name, st.st_size, st.st_mtime_ns))
    return out


def _kill_when_writing_starts(proc: subprocess.Popen, folder: Path, *, extra: float, timeout: float = 60.0) -> None:
    """SIGKILL ``proc`` ``extra`` seconds after the folder first changes (the write began)."""
    before = _listing(folder)
    deadline = time.monotonic() + timeout
    while _listing(folder) == before and proc.poll() is None and time.monotonic() < deadline:
        time.sleep(0.002)
    time.sleep(extra)
    proc.send_signal(signal.SIGKILL)


@pytest.mark.parametrize("extra", [0.0, 0.02, 0.1])
def test_killed_demo_data_leaves_the_previous_league(tmp_path, references, extra):
    # A first complete league (seed 1), then a second run (seed 2) killed with SIGKILL while
    # it writes: the folder must hold one complete league, seed 1's or seed 2's, never a
    # truncated file or a mix, and it must load.
    out = tmp_path / "league"
    write_demo_league(out, seed=1, **_KW)
    proc = subprocess.Popen(_demo_command(out, 2), stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _kill_when_writing_starts(proc, out, extra=extra)
    proc.wait()
    got = _contents(out)
    assert got in (references[1], references[2]), "the folder holds neither complete league"
    assert load_pas(out / "plate_appearances.parquet").report.n_kept > 0
    # the next run clears what the killed one left behind and writes a whole league
    write_demo_league(out, seed=2, **_KW)
    assert _contents(out) == references[2]
    assert not list(out.glob("*.partial"))


def test_interrupted_first_run_leaves_no_file(tmp_path):
    out = tmp_path / "fresh"
    proc = subprocess.Popen(_demo_command(out, 3), stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    time.sleep(0.5)  # before the league is generated: nothing may be there yet
    proc.send_signal(signal.SIGINT)
    proc.wait()
    names = {p.name for p in out.glob("*.parquet")} if out.exists() else set()
    assert names in (set(), set(DEMO_FILES))


def test_two_concurrent_runs_never_mix_leagues(tmp_path, references):
    out = tmp_path / "shared"
    for _ in range(3):
        procs = [
            subprocess.Popen(_demo_command(out, seed), stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
            for seed in (1, 2)
        ]
        results = [p.communicate(timeout=120) + (p.returncode,) for p in procs]
        assert _contents(out) in (references[1], references[2])
        for _stdout, stderr, code in results:
            assert code == 0 or "another process is writing into" in stderr, stderr


def test_folder_lock_refuses_a_second_writer(tmp_path):
    with folder_lock(tmp_path), pytest.raises(OSError, match="another process is writing into"):
        with folder_lock(tmp_path):
            pass


def test_failed_card_write_leaves_the_previous_card(tmp_path, monkeypatch):
    import altair as alt

    from matchup_widgets import export

    target = tmp_path / "card.html"
    target.write_text("previous card")
    chart = alt.Chart(pd.DataFrame({"a": [1]})).mark_bar().encode(x="a:Q")

    def broken(*_args, **_kwargs):
        msg = "render stopped"
        raise RuntimeError(msg)

    monkeypatch.setattr(export, "render_card", broken)
    with pytest.raises(RuntimeError, match="render stopped"):
        export.write_card(chart, target)
    assert target.read_text() == "previous card"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["card.html"]
