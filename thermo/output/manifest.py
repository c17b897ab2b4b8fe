"""manifest.json: the marker of a complete output set, written last, and its check.

A command that writes an output folder first removes the folder's old manifest.json, then
writes its files, then writes manifest.json listing each of them with its size and SHA-256.
A folder without manifest.json holds no complete set (a write was interrupted or failed); a
folder whose files disagree with their manifest was changed afterwards. ``verify_manifest``
tells which.
"""
from __future__ import annotations

import hashlib
import json
from pathlib import Path

from thermo import __version__
from thermo.output.atomic import atomic_write, interrupts_held

MANIFEST_NAME = "manifest.json"
MANIFEST_FORMAT = "brakeheat-output-set"
MANIFEST_FORMAT_VERSION = 1
_CHUNK_BYTES = 1 << 20


def file_sha256(path) -> str:
    """SHA-256 hex digest of a file's bytes, read in chunks."""
    digest = hashlib.sha256()
    with open(path, "rb") as handle:
        for chunk in iter(lambda: handle.read(_CHUNK_BYTES), b""):
            digest.update(chunk)
    return digest.hexdigest()


def file_entry(path) -> dict:
    """One file of the set as the manifest lists it: name, size in bytes, SHA-256."""
    path = Path(path)
    return {"name": path.name, "size_bytes": path.stat().st_size, "sha256": file_sha256(path)}


def manifest_dict(paths, command: str) -> dict:
    """The manifest of the files ``paths`` (all in one folder), written by brakeheat ``command``."""
    entries = sorted((file_entry(p) for p in paths), key=lambda entry: entry["name"])
    return {"format": MANIFEST_FORMAT, "format_version": MANIFEST_FORMAT_VERSION,
            "brakeheat_version": __version__, "command": command, "files": entries}


def remove_manifest(folder) -> None:
    """Mark the folder's set incomplete before it is overwritten: remove manifest.json if there."""
    Path(folder, MANIFEST_NAME).unlink(missing_ok=True)


def write_manifest(folder, paths, command: str) -> Path:
    """Write manifest.json into ``folder`` atomically, listing ``paths``; returns its path."""
    target = Path(folder) / MANIFEST_NAME
    data = manifest_dict(paths, command)
    with atomic_write(target, "w") as handle:
        json.dump(data, handle, indent=2, allow_nan=False)
        handle.write("\n")
    return target


def write_output_set(folder, command: str, write_files) -> list[Path]:
    """Write one output set into ``folder`` (made if missing) and mark it complete.

    ``write_files(folder)`` writes the set's files (each atomically) and returns their paths.
    The old manifest.json is removed before it is called and the new one written after it
    returns, so an interrupted or failed write leaves a folder without manifest.json. Ctrl-C and
    SIGTERM are held while it runs and take effect at the next file's start or end (see
    ``thermo.output.atomic.interrupts_held``).
    """
    out = Path(folder)
    out.mkdir(parents=True, exist_ok=True)
    remove_manifest(out)
    with interrupts_held():                   # Ctrl-C lands between two files, never inside a library
        written = [Path(p) for p in write_files(out)]
    write_manifest(out, written, command)
    return written


def _read_manifest(path: Path):
    """(manifest dict, None) or (None, the problem) for a folder's manifest.json."""
    if not path.is_file():
        return None, f"{path}: missing; the folder holds no complete output set (a write was interrupted or failed)"
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, ValueError) as error:
        return None, f"{path}: not readable as JSON ({error})"
    if not isinstance(data, dict) or data.get("format") != MANIFEST_FORMAT or not isinstance(data.get("files"), list):
        return None, f"{path}: not a brakeheat manifest (expected format {MANIFEST_FORMAT!r} and a 'files' list)"
    return data, None


def _plain_name(name) -> bool:
    return isinstance(name, str) and name not in ("", ".", "..", MANIFEST_NAME) and Path(name).name == name


def _entry_problem(folder: Path, entry) -> str | None:
    """What is wrong with one listed file, or None when it matches its entry."""
    name = entry.get("name") if isinstance(entry, dict) else None
    if not _plain_name(name):
        return f"{folder / MANIFEST_NAME}: bad entry {entry!r:.80} (expected a file name in this folder)"
    path = folder / name
    if not path.is_file():
        return f"{path}: missing (listed in {MANIFEST_NAME})"
    size = path.stat().st_size
    if size != entry.get("size_bytes"):
        return f"{path}: changed ({size} bytes, {MANIFEST_NAME} lists {entry.get('size_bytes')})"
    if file_sha256(path) != entry.get("sha256"):
        return f"{path}: changed (its SHA-256 differs from {MANIFEST_NAME})"
    return None


def verify_manifest(folder) -> list[str]:
    """The problems of an output folder against its manifest.json; an empty list for a complete set.

    Each problem is one line naming the file: manifest.json missing or unreadable, a listed file
    missing or changed (size or SHA-256), a file in the folder that the manifest does not list.
    """
    out = Path(folder)
    data, problem = _read_manifest(out / MANIFEST_NAME)
    if problem:
        return [problem]
    problems = [p for p in (_entry_problem(out, e) for e in data["files"]) if p]
    listed = {e.get("name") for e in data["files"] if isinstance(e, dict)}
    unlisted = sorted(p.name for p in out.iterdir() if p.is_file() and p.name not in listed and p.name != MANIFEST_NAME)
    problems += [f"{out / name}: not listed in {MANIFEST_NAME} (not part of the output set)" for name in unlisted]
    return problems
