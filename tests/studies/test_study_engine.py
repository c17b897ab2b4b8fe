"""Where study points run, and how a long study survives: chunks, processes, Dask, the study file,
an interrupt and --resume."""
from __future__ import annotations

import importlib.util
import os

import h5py
import pytest

from study_cases import DUCT, SHRINK, SMALL
from thermo.output.errors import OutputError
from thermo.output.study_file import read_study_hdf5
from thermo.studies import lanes as lanes_module
from thermo.studies.engine import MAX_CHUNK, StudyError, chunks_of, default_chunk_size, study_executor
from thermo.studies.sweep import sweep

VARY = [f"{DUCT}=[4000, 8000, 12000, 18000]"]


def test_chunks_cover_every_point_once_in_order():
    todo = list(range(10))
    assert chunks_of(todo, 4) == [[0, 1, 2, 3], [4, 5, 6, 7], [8, 9]]
    assert default_chunk_size(1000, 2) == MAX_CHUNK == 64 and default_chunk_size(100, 2) == 50
    assert default_chunk_size(8, 2) == 4 and default_chunk_size(9, 2) == 5


def test_bad_workers_are_refused():
    with pytest.raises(StudyError, match="--workers 0"):
        with study_executor(None, 0):
            pass


@pytest.fixture(scope="module")
def full(tmp_path_factory):
    path = tmp_path_factory.mktemp("study") / "sweep.h5"
    record = sweep(SMALL, VARY, overrides=SHRINK, stints=1, workers=1, checkpoint=path)
    return path, record


def test_the_study_file_holds_every_point(full):
    path, record = full
    again = read_study_hdf5(path)
    assert again.points == record.points and again.values == record.values and again.keys == (DUCT,)
    with h5py.File(path) as f:
        assert f.attrs["format"] == "brakeheat-study" and f.attrs["points_done"] == 4 and bool(f.attrs["complete"])
        assert f["values"].shape == (4, 1) and list(f["values"][:, 0]) == [4000, 8000, 12000, 18000]
        margins = f["corners/front/checks/margin_k"][()]
        names = list(f["corners/front/checks"].attrs["names"])
        k = names.index("bearing_grease")
        assert [round(m, 2) for m in margins[:, k]] == [
            next(ch["margin_k"] for ch in p["corners"][0]["checks"] if ch["name"] == "bearing_grease") for p in record.points]


def test_an_interrupted_study_leaves_a_valid_file_and_resume_finishes_it(full, tmp_path, monkeypatch):
    _, reference = full
    path = tmp_path / "sweep.h5"

    def stop_after_first(done, total):
        if done >= 1:
            raise KeyboardInterrupt
    with pytest.raises(KeyboardInterrupt):
        sweep(SMALL, VARY, overrides=SHRINK, stints=1, workers=1, chunk_size=1, checkpoint=path, progress=stop_after_first)
    partial = read_study_hdf5(path)
    assert partial.done == 1 and not partial.complete
    with h5py.File(path) as f:
        assert f.attrs["points_done"] == 1 and f.attrs["points_total"] == 4 and not f.attrs["complete"]

    ran = []
    original = lanes_module.run_chunk_in_lanes
    monkeypatch.setattr(lanes_module, "run_chunk_in_lanes", lambda job, chunk: ran.extend(chunk) or original(job, chunk))
    record = sweep(SMALL, VARY, overrides=SHRINK, stints=1, workers=1, chunk_size=1, checkpoint=path, resume=True)
    assert len(ran) == 3                                  # the finished point is not run again
    assert record.points == reference.points


def test_resume_refuses_another_study(full, tmp_path):
    path, _ = full
    with pytest.raises(OutputError, match="different study"):
        sweep(SMALL, [f"{DUCT}=[4000, 5000]"], overrides=SHRINK, stints=1, workers=1, checkpoint=path, resume=True)
    with pytest.raises(StudyError, match="no study file"):
        sweep(SMALL, VARY, overrides=SHRINK, stints=1, workers=1, checkpoint=tmp_path / "none.h5", resume=True)


@pytest.mark.slow
def test_a_dask_local_cluster_gives_the_numbers_of_the_local_run(full):
    if importlib.util.find_spec("distributed") is None:
        if os.environ.get("CI"):
            pytest.fail("CI must install the cluster extra (pip install \".[test,cluster]\")")
        pytest.skip("Dask is not installed (pip install \".[cluster]\")")
    _, reference = full
    record = sweep(SMALL, VARY, overrides=SHRINK, stints=1, scheduler="local", workers=2, chunk_size=1)
    assert record.points == reference.points
