"""manifest.json marks a complete output set: written last, every file with its size and SHA-256."""
import hashlib
import json
import signal

import pytest

from thermo import __version__
from thermo.output.files import write_outputs
from thermo.output.manifest import (MANIFEST_FORMAT, MANIFEST_NAME, file_sha256, verify_manifest, write_manifest,
                                    write_output_set)


def _write_two(folder):
    (folder / "a.txt").write_text("alpha\n")
    (folder / "b.bin").write_bytes(bytes(range(256)) * 5000)     # > 1 MiB: read in more than one chunk
    return [folder / "a.txt", folder / "b.bin"]


def test_manifest_lists_every_file_with_size_and_sha256(tmp_path):
    written = write_output_set(tmp_path, "run", _write_two)
    data = json.loads((tmp_path / MANIFEST_NAME).read_text(encoding="utf-8"))
    assert data["format"] == MANIFEST_FORMAT and data["format_version"] == 1
    assert data["brakeheat_version"] == __version__ and data["command"] == "run"
    assert [e["name"] for e in data["files"]] == ["a.txt", "b.bin"]
    for entry, path in zip(data["files"], written):
        raw = path.read_bytes()
        # the digest of the bytes as hashlib computes it in one go (FIPS 180-4 SHA-256)
        assert entry["size_bytes"] == len(raw) and entry["sha256"] == hashlib.sha256(raw).hexdigest()
    assert verify_manifest(tmp_path) == []


def test_sha256_of_a_published_test_vector(tmp_path):
    path = tmp_path / "abc.txt"
    path.write_bytes(b"abc")
    # FIPS 180-2, appendix B.1: SHA-256("abc")
    assert file_sha256(path) == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"


def test_old_manifest_is_removed_before_the_first_file_and_written_last(tmp_path):
    write_output_set(tmp_path, "run", _write_two)
    seen = []

    def writer(folder):
        seen.append((folder / MANIFEST_NAME).exists())
        return _write_two(folder)

    write_output_set(tmp_path, "run", writer)
    assert seen == [False]                      # a set being rewritten carries no manifest
    manifest_time = (tmp_path / MANIFEST_NAME).stat().st_mtime_ns
    assert all(manifest_time >= (tmp_path / n).stat().st_mtime_ns for n in ("a.txt", "b.bin"))
    assert verify_manifest(tmp_path) == []


def test_a_failed_write_leaves_no_manifest(tmp_path):
    write_output_set(tmp_path, "run", _write_two)

    def failing(folder):
        (folder / "a.txt").write_text("half of a new set")
        raise RuntimeError("disk full")

    with pytest.raises(RuntimeError, match="disk full"):
        write_output_set(tmp_path, "run", failing)
    assert not (tmp_path / MANIFEST_NAME).exists()
    problems = verify_manifest(tmp_path)
    assert len(problems) == 1 and "missing" in problems[0] and MANIFEST_NAME in problems[0]


def test_verify_finds_a_changed_file(tmp_path):
    write_output_set(tmp_path, "run", _write_two)
    (tmp_path / "a.txt").write_text("ALPHA\n")          # same size, other bytes
    assert verify_manifest(tmp_path) == [f"{tmp_path / 'a.txt'}: changed (its SHA-256 differs from manifest.json)"]
    (tmp_path / "a.txt").write_text("alpha, longer\n")
    [problem] = verify_manifest(tmp_path)
    assert problem.startswith(f"{tmp_path / 'a.txt'}: changed (14 bytes")


def test_verify_finds_a_missing_and_an_unlisted_file(tmp_path):
    write_output_set(tmp_path, "run", _write_two)
    (tmp_path / "b.bin").unlink()
    (tmp_path / "extra.png").write_bytes(b"x")
    assert verify_manifest(tmp_path) == [f"{tmp_path / 'b.bin'}: missing (listed in manifest.json)",
                                         f"{tmp_path / 'extra.png'}: not listed in manifest.json (not part of the output set)"]


def test_verify_rejects_a_manifest_that_is_not_ours(tmp_path):
    (tmp_path / MANIFEST_NAME).write_text('{"files": []}')
    [problem] = verify_manifest(tmp_path)
    assert "not a brakeheat manifest" in problem
    (tmp_path / MANIFEST_NAME).write_text("{")
    [problem] = verify_manifest(tmp_path)
    assert "not readable as JSON" in problem


def test_verify_refuses_names_outside_the_folder(tmp_path):
    folder = tmp_path / "set"
    folder.mkdir()
    (tmp_path / "outside.txt").write_text("x")
    write_manifest(folder, [], "run")
    data = json.loads((folder / MANIFEST_NAME).read_text(encoding="utf-8"))
    data["files"] = [{"name": "../outside.txt", "size_bytes": 1, "sha256": hashlib.sha256(b"x").hexdigest()}]
    (folder / MANIFEST_NAME).write_text(json.dumps(data))
    [problem] = verify_manifest(folder)
    assert "bad entry" in problem


def test_write_outputs_marks_the_run_set_complete(results, tmp_path):
    out = write_outputs(results, tmp_path / "run", command="demo")
    data = json.loads((out / MANIFEST_NAME).read_text(encoding="utf-8"))
    names = {e["name"] for e in data["files"]}
    assert {"results.h5", "summary.json", "temperatures_front_left.png", "temperatures_rear_left.png"} <= names
    assert names == {p.name for p in out.iterdir()} - {MANIFEST_NAME}      # every file of the folder, nothing else
    assert data["command"] == "demo"
    assert verify_manifest(out) == []


def test_ctrl_c_between_two_files_leaves_no_manifest(tmp_path):
    write_output_set(tmp_path, "run", _write_two)

    def interrupted(folder):
        from thermo.output.atomic import atomic_write
        with atomic_write(folder / "a.txt") as handle:
            handle.write("a new alpha\n")
        signal.raise_signal(signal.SIGINT)        # held: takes effect before the next file is begun
        with atomic_write(folder / "b.bin", "wb") as handle:
            handle.write(b"never written")
        return [folder / "a.txt", folder / "b.bin"]

    with pytest.raises(KeyboardInterrupt):
        write_output_set(tmp_path, "run", interrupted)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.txt", "b.bin"]     # no manifest, no .tmp
    assert (tmp_path / "a.txt").read_text() == "a new alpha\n"                  # a mixed set ...
    assert (tmp_path / "b.bin").read_bytes() == bytes(range(256)) * 5000
    assert "missing" in verify_manifest(tmp_path)[0]                             # ... marked incomplete
