"""Atomic writes: a failed write never damages the file that was there."""
import dataclasses
import os
import stat

import h5py
import pytest

from thermo.output import (OutputError, atomic_path, atomic_write, read_results_hdf5, write_results_hdf5,
                           write_summary_json)


def test_success_replaces(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("old")
    with atomic_write(path) as handle:
        handle.write("new")
        assert path.read_text() == "old"      # nothing visible until the block ends
    assert path.read_text() == "new"
    assert os.listdir(tmp_path) == ["a.txt"]


def test_writer_raises_old_file_intact(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("old")
    with pytest.raises(RuntimeError, match="boom"):
        with atomic_write(path) as handle:
            handle.write("half of the new")
            raise RuntimeError("boom")
    assert path.read_text() == "old"
    assert os.listdir(tmp_path) == ["a.txt"]   # the temporary file is gone


def test_writer_raises_no_file_created(tmp_path):
    with pytest.raises(RuntimeError):
        with atomic_write(tmp_path / "b.bin", "wb") as handle:
            handle.write(b"\x00")
            raise RuntimeError("boom")
    assert os.listdir(tmp_path) == []


def test_atomic_path_with_h5py(tmp_path):
    path = tmp_path / "c.h5"
    with atomic_path(path) as tmp:
        assert tmp.parent == tmp_path and tmp != path
        with h5py.File(tmp, "w") as f:
            f["x"] = [1, 2, 3]
    with h5py.File(path, "r") as f:
        assert list(f["x"][()]) == [1, 2, 3]
    assert os.listdir(tmp_path) == ["c.h5"]


def test_new_file_gets_umask_permissions(tmp_path):
    path = tmp_path / "d.txt"
    old = os.umask(0o022)
    try:
        with atomic_write(path) as handle:
            handle.write("x")
    finally:
        os.umask(old)
    # POSIX open(2) with mode 0666 under umask 022 gives 0644 (not mkstemp's 0600)
    assert stat.S_IMODE(path.stat().st_mode) == 0o644


def test_bad_mode_rejected(tmp_path):
    with pytest.raises(OutputError, match="mode must be"):
        with atomic_write(tmp_path / "e.txt", "a"):
            pass


def test_failed_hdf5_write_keeps_previous_results(results, factory, tmp_path):
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    before = path.read_bytes()
    corner = factory.corner()
    broken = dataclasses.replace(results, corners=(dataclasses.replace(corner, node_names=corner.node_names[:-1] + ("hub/bearing",)),))
    with pytest.raises(OutputError, match="'hub/bearing' cannot name an HDF5 object"):
        write_results_hdf5(broken, path)
    assert path.read_bytes() == before
    assert read_results_hdf5(path).scenario_name == results.scenario_name
    assert os.listdir(tmp_path) == ["run.h5"]


def test_failed_summary_write_keeps_previous(results, factory, tmp_path):
    path = tmp_path / "run.json"
    write_summary_json(results, path)
    before = path.read_text()
    with pytest.raises(OutputError):
        write_summary_json(factory.results(facts=factory.facts(link_to_boundary=(True,))), path)   # 1 flag, 7 links
    assert path.read_text() == before
