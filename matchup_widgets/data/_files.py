"""Writing files so that a reader never sees half of one.

Every file the project writes (the demo league, cards, CSV tables) goes to a temporary file
in the target's own folder first and is renamed over the target only once it is complete:
``os.replace`` is atomic on one file system, so an interrupted or failed write leaves the
previous file, or none, never a partial one. A folder written by several files at once (the
demo league) is guarded by a lock file, so two writers cannot interleave their files.
"""

from __future__ import annotations

import contextlib
import errno
import os
import tempfile
from collections.abc import Iterable, Iterator
from pathlib import Path

_LOCK_NAME = ".matchup-widgets-writing.lock"


@contextlib.contextmanager
def atomic_path(path: str | os.PathLike) -> Iterator[Path]:
    """Yield a temporary path beside ``path``; on success rename it over ``path``.

    On an exception (or an interrupt) the temporary file is removed and ``path`` is left
    as it was.

    Examples
    --------
    >>> import tempfile
    >>> with tempfile.TemporaryDirectory() as d:
    ...     target = Path(d) / "a.txt"
    ...     with atomic_path(target) as tmp:
    ...         _ = tmp.write_text("done")
    ...     target.read_text(), sorted(p.name for p in Path(d).iterdir())
    ('done', ['a.txt'])
    """
    out = Path(path)
    out.parent.mkdir(parents=True, exist_ok=True)
    fd, name = tempfile.mkstemp(prefix=f".{out.name}.", suffix=".partial", dir=out.parent)
    os.close(fd)
    tmp = Path(name)
    os.chmod(tmp, 0o666 & ~_umask())  # mkstemp makes 0600; the target gets the usual mode
    try:
        yield tmp
        os.replace(tmp, out)
    finally:
        with contextlib.suppress(FileNotFoundError):
            tmp.unlink()


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def remove_stale_partials(folder: str | os.PathLike, names: Iterable[str]) -> int:
    """Remove temporary files that a killed writer left beside ``names`` in ``folder``.

    Call it only while holding :func:`folder_lock` (no other writer can be using them).
    Returns how many were removed.
    """
    removed = 0
    for name in names:
        for stale in Path(folder).glob(f".{name}.*.partial"):
            with contextlib.suppress(FileNotFoundError):
                stale.unlink()
                removed += 1
    return removed


def write_bytes_atomic(path: str | os.PathLike, data: bytes) -> Path:
    """Write ``data`` to ``path`` atomically; return the path."""
    with atomic_path(path) as tmp:
        tmp.write_bytes(data)
    return Path(path)


def write_text_atomic(path: str | os.PathLike, text: str) -> Path:
    """Write ``text`` (UTF-8) to ``path`` atomically; return the path."""
    return write_bytes_atomic(path, text.encode("utf-8"))


@contextlib.contextmanager
def folder_lock(folder: str | os.PathLike) -> Iterator[None]:
    """Hold an exclusive lock on ``folder`` while a set of files is written into it.

    Raises
    ------
    OSError
        When another process holds the lock (another write into the same folder is under
        way); the message names the folder and what to do.
    """
    import fcntl

    root = Path(folder)
    root.mkdir(parents=True, exist_ok=True)
    lock = root / _LOCK_NAME
    with open(lock, "a+b") as handle:
        try:
            fcntl.flock(handle.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError as exc:
            if exc.errno not in (errno.EAGAIN, errno.EACCES, errno.EWOULDBLOCK):
                raise
            msg = (
                f"another process is writing into {root} right now; wait for it to finish "
                f"(or write into another folder) and run again."
            )
            raise OSError(msg) from None
        try:
            yield
        finally:
            # the lock file stays: removing it would let a third writer lock a new file
            # while a second one still holds the old one
            fcntl.flock(handle.fileno(), fcntl.LOCK_UN)
