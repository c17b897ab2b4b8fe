"""Writes that either complete or leave the old file alone: temporary file, fsync, rename."""
from __future__ import annotations

import contextlib
import os
import tempfile
from pathlib import Path

from thermo.output.errors import OutputError


def _umask_mode() -> int:
    """The permission bits a plain ``open(path, 'w')`` would give a new file."""
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def _fsync_directory(directory: Path) -> None:
    """Make the rename itself durable (POSIX); a no-op where directories cannot be opened."""
    try:
        fd = os.open(directory, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


@contextlib.contextmanager
def atomic_path(path):
    """Yield a temporary path beside ``path``; on success fsync it and rename it onto ``path``.

    For writers that open the file themselves (h5py, matplotlib). On any exception the
    temporary file is removed and an existing file at ``path`` is left untouched.

    Parameters
    ----------
    path : str or os.PathLike  Final file path [-]
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    fd, tmp_name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
    os.close(fd)
    tmp = Path(tmp_name)
    try:
        yield tmp
        with open(tmp, "rb+") as handle:
            os.fsync(handle.fileno())
        os.chmod(tmp, _umask_mode())
        os.replace(tmp, target)
    except BaseException:
        with contextlib.suppress(FileNotFoundError):
            tmp.unlink()
        raise
    _fsync_directory(directory)


@contextlib.contextmanager
def atomic_write(path, mode: str = "w", encoding: str | None = "utf-8"):
    """Open a temporary file beside ``path`` for writing; rename it onto ``path`` when the block succeeds.

    The file is flushed and fsynced before ``os.replace``; on any exception it is removed and an
    existing file at ``path`` is left untouched.

    Parameters
    ----------
    path : str or os.PathLike  Final file path [-]
    mode : str  ``"w"`` (text) or ``"wb"`` (binary) [-]
    encoding : str or None  Text encoding, ignored in binary mode [-]
    """
    if mode not in ("w", "wb"):
        raise OutputError(f"atomic_write {path}: mode must be 'w' or 'wb', got {mode!r}")
    with atomic_path(path) as tmp:
        if mode == "wb":
            handle = open(tmp, "wb")
        else:
            handle = open(tmp, "w", encoding=encoding, newline="")
        with handle:
            yield handle
            handle.flush()
            os.fsync(handle.fileno())
