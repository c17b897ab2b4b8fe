"""An output folder checked before any work is done: a bad --out fails in a second, not after the solve.

The check leaves the file system as it found it: folders it had to make to find out whether they
can be made are removed again, and the file it writes to find out whether the folder is writable
is removed at once. Permission bits are never read (root ignores them); the folder is tried.
"""
from __future__ import annotations

import contextlib
import os
from pathlib import Path

from thermo.output.atomic import temporary_name
from thermo.output.errors import OutputError

EXPECTED = "expected a folder (existing, or one that can be made) where files can be written"


def first_non_folder(path: Path) -> Path | None:
    """The first existing entry on the way to ``path`` (``path`` included) that is not a folder."""
    for step in reversed((path, *path.parents)):
        if step.exists() and not step.is_dir():
            return step
    return None


def missing_folders(path: Path) -> list[Path]:
    """The folders on the way to ``path`` (``path`` included) that do not exist yet, outermost first."""
    return [step for step in reversed((path, *path.parents)) if not step.exists()]


def _remove_folders(made: list[Path]) -> None:
    """Remove the (empty) folders the check made, innermost first."""
    for folder in reversed(made):
        with contextlib.suppress(OSError):
            folder.rmdir()


def _try_write(folder: Path) -> None:
    """Create and remove a small hidden file in ``folder``; OSError if that cannot be done."""
    probe = temporary_name(folder / ".brakeheat-write-check")
    try:
        os.close(os.open(probe, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600))
    finally:
        with contextlib.suppress(OSError):
            probe.unlink()


def _reason(error: Exception) -> str:
    return getattr(error, "strerror", None) or str(error) or type(error).__name__


def check_output_folder(path, source: str = "--out") -> Path:
    """Check that ``path`` is, or can be made, a folder where files can be written; return it.

    Raises OutputError naming ``source`` (the option or key that gave the path), the path and
    what is expected: an empty name, an existing file, a folder under a file, a folder that
    cannot be made, a folder where no file can be written.
    """
    text = os.fspath(path)
    if text == "":
        raise OutputError(f"{source}: empty folder name; {EXPECTED}")
    folder = Path(text)
    try:
        blocker = first_non_folder(folder)
    except (OSError, ValueError) as error:    # a name too long, a loop of links, a NUL character ...
        raise OutputError(f"{source} {folder}: cannot be used ({_reason(error)}); {EXPECTED}") from None
    if blocker == folder:
        raise OutputError(f"{source} {folder}: is a file, not a folder; {EXPECTED}")
    if blocker is not None:
        raise OutputError(f"{source} {folder}: {blocker} is a file, so no folder can be made under it; {EXPECTED}")
    made = []
    try:
        for step in missing_folders(folder):
            made.append(step)                 # remembered before it exists, so an interrupt cannot leave it
            try:
                step.mkdir()
            except FileExistsError:           # made meanwhile by someone else: not ours to remove
                made.pop()
            except OSError as error:
                made.pop()
                raise OutputError(f"{source} {folder}: the folder cannot be made ({_reason(error)}); {EXPECTED}") from None
        try:
            _try_write(folder)
        except OSError as error:
            raise OutputError(f"{source} {folder}: no file can be written in it ({_reason(error)}); {EXPECTED}") from None
    finally:
        _remove_folders(made)
    return folder
