"""Writes that either complete or leave the old file alone: temporary file, fsync, rename.

An interrupt (Ctrl-C, or SIGTERM handled as Ctrl-C) may land between any two steps. The
temporary file's name is therefore chosen and remembered *before* the file is created, so that
whatever step the interrupt lands on, the clean-up knows which file to remove. Names still
remembered when the interpreter exits (an interrupt during the clean-up itself, say) are removed
then.

While the writer fills the temporary file (h5py, matplotlib, json), Ctrl-C and SIGTERM are held
and delivered when it returns: raised inside a library, a KeyboardInterrupt can land in a callback
that swallows it ("Exception ignored in ...", the run then carries on) or be turned into another
error. Held, it arrives in this module's own code, before the rename, and the clean-up runs. A
second signal while one is held is raised at once.
"""
from __future__ import annotations

import atexit
import contextlib
import os
import secrets
import signal
import threading
from pathlib import Path

from lapdata.echo import shown
from thermo.output.errors import OutputError

# temporary files made and neither renamed into place nor removed yet (normally empty)
_UNFINISHED: set[Path] = set()
# signals received while held (see interrupts_held); None when nothing is held
_held: list[int] | None = None
_NAME_ATTEMPTS = 100


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


def _fsync_file(path: Path) -> None:
    with open(path, "rb+") as handle:
        os.fsync(handle.fileno())


def temporary_name(target: Path) -> Path:
    """A hidden, random name beside ``target``: ``.NAME.<random>.tmp``."""
    return target.with_name(f".{target.name}.{secrets.token_hex(8)}.tmp")


def _create_empty(path: Path) -> None:
    """Create ``path`` (owner-only permissions until renamed); FileExistsError if it is there."""
    os.close(os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600))


def _create_temporary(target: Path) -> Path:
    """Make an empty temporary file beside ``target`` and return its name. The name is added to
    ``_UNFINISHED`` before the file is made, so an interrupt between the two cannot lose it."""
    for _ in range(_NAME_ATTEMPTS):
        tmp = temporary_name(target)
        _UNFINISHED.add(tmp)
        try:
            _create_empty(tmp)
        except FileExistsError:               # someone else's file: never ours to remove
            _UNFINISHED.discard(tmp)
            continue
        except BaseException:                 # made, perhaps, and then interrupted
            _remove(tmp)
            raise
        return tmp
    raise OutputError(f"{target}: no free temporary name beside it after {_NAME_ATTEMPTS} attempts")


def _remove(path: Path) -> None:
    """Remove a temporary file if it exists, then forget it."""
    with contextlib.suppress(FileNotFoundError):
        path.unlink()
    _UNFINISHED.discard(path)


@atexit.register
def _remove_unfinished() -> None:
    """Last resort at interpreter exit: remove temporary files a clean-up could not finish."""
    for path in list(_UNFINISHED):
        with contextlib.suppress(OSError):
            _remove(path)


def _held_signals() -> list[int]:
    return [getattr(signal, name) for name in ("SIGINT", "SIGTERM") if hasattr(signal, name)]


def _restore_handlers(previous: dict) -> None:
    """Put the handlers back; with the signals blocked meanwhile where the platform can, so that a
    restored handler cannot raise before every one of them is back."""
    mask = getattr(signal, "pthread_sigmask", None)
    if mask is not None:
        mask(signal.SIG_BLOCK, previous)
    try:
        for signum, handler in previous.items():
            signal.signal(signum, handler)
    finally:
        if mask is not None:
            mask(signal.SIG_UNBLOCK, previous)


@contextlib.contextmanager
def interrupts_held():
    """Hold Ctrl-C and SIGTERM inside the block; when it ends, deliver the first one held to the
    handler that was in place before (KeyboardInterrupt, or the default action).

    ``deliver_held_interrupt()`` inside the block raises KeyboardInterrupt at once when a signal is
    held: the safe points where a write can be abandoned. Nested blocks are covered by the
    outermost one. Outside the main thread (where handlers cannot be set) the block runs unchanged.
    """
    global _held
    if _held is not None or threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = {}
    try:
        _held = []
        for signum in _held_signals():
            handler = signal.getsignal(signum)
            if handler is None:               # installed outside Python: leave it alone
                continue
            previous[signum] = handler        # remembered before it is replaced
            signal.signal(signum, _hold)
        yield
    finally:
        received, _held = _held, None
        _restore_handlers(previous)
        if received:
            signal.raise_signal(received[0])  # its own handler runs now


def _hold(signum, frame) -> None:
    """The handler while held: note the signal; asked a second time, stop at once (a writer stuck
    on a slow disk must not make Ctrl-C useless)."""
    if _held is None:
        return
    _held.append(signum)
    if len(_held) > 1:
        raise KeyboardInterrupt


def deliver_held_interrupt() -> None:
    """A safe point inside ``interrupts_held``: raise KeyboardInterrupt now if a signal is held."""
    if _held:
        raise KeyboardInterrupt


@contextlib.contextmanager
def atomic_path(path):
    """Yield a temporary path beside ``path``; on success fsync it and rename it onto ``path``.

    For writers that open the file themselves (h5py, matplotlib). On any exception, an interrupt
    included, the temporary file is removed and an existing file at ``path`` is left untouched.
    Ctrl-C and SIGTERM are held meanwhile: one that arrives while the writer writes abandons the
    file (removed) once the writer returns; one that arrives after it, during the rename, takes
    effect after the rename.

    Parameters
    ----------
    path : str or os.PathLike
        Final file path [-]
    """
    with interrupts_held(), atomic_path_unheld(path) as tmp:    # held throughout: the inner holds are covered
        yield tmp


@contextlib.contextmanager
def atomic_path_unheld(path):
    """``atomic_path`` for a file filled over a long time (``thermo.output.hdf5_stream``: the results
    file written while a run goes): Ctrl-C and SIGTERM are held only while the temporary file is made
    and while it is renamed, so that they still stop the run at once; the writer holds them itself
    around each of its writes (``interrupts_held``). On any exception, an interrupt included, the
    temporary file is removed and an existing file at ``path`` is left untouched.

    Parameters
    ----------
    path : str or os.PathLike
        Final file path [-]
    """
    target = Path(path)
    directory = target.parent if str(target.parent) else Path(".")
    tmp = None
    try:
        with interrupts_held():
            deliver_held_interrupt()          # held before this file was begun: do not begin it
            tmp = _create_temporary(target)   # signals are held: nothing lands before tmp is set
        yield tmp
        with interrupts_held():
            deliver_held_interrupt()          # held while the writer wrote: abandon this file
            _fsync_file(tmp)
            os.chmod(tmp, _umask_mode())
            os.replace(tmp, target)
            _UNFINISHED.discard(tmp)
    except BaseException:
        if tmp is not None:
            _remove(tmp)
        raise
    _fsync_directory(directory)


@contextlib.contextmanager
def atomic_write(path, mode: str = "w", encoding: str | None = "utf-8"):
    """Open a temporary file beside ``path`` for writing; rename it onto ``path`` when the block succeeds.

    The file is flushed and fsynced before ``os.replace``; on any exception it is removed and an
    existing file at ``path`` is left untouched.

    Parameters
    ----------
    path : str or os.PathLike
        Final file path [-]
    mode : str
        ``"w"`` (text) or ``"wb"`` (binary) [-]
    encoding : str or None
        Text encoding, ignored in binary mode [-]
    """
    if mode not in ("w", "wb"):
        raise OutputError(f"atomic_write {path}: mode must be 'w' or 'wb', got {shown(mode)}")
    with atomic_path(path) as tmp:
        if mode == "wb":
            handle = open(tmp, "wb")
        else:
            handle = open(tmp, "w", encoding=encoding, newline="")
        with handle:
            yield handle
            handle.flush()
            os.fsync(handle.fileno())
