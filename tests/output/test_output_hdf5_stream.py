"""The results file streamed while a run goes (``thermo.output.hdf5_stream``): read back exactly as
the file written at once, and never left half-written."""
import dataclasses

import h5py
import numpy as np
import pytest

from thermo.output import OutputError, read_results_hdf5, write_results_hdf5
from thermo.output import hdf5_stream
from thermo.output.hdf5_stream import streamed_results_hdf5
from thermo.results import SeriesRows
from test_output_hdf5 import assert_same


def _with_speed_and_power(results):
    """The fixture's corners with the car's speed and the brake power at every row (a streamed run has them)."""
    corners = tuple(dataclasses.replace(c, speed_m_s=np.linspace(60.0, 0.0, c.time_s.size) + i,
                                        brake_power_w=np.abs(np.sin(c.time_s / 7.0)) * 1e5)
                    for i, c in enumerate(results.corners))
    return dataclasses.replace(results, corners=corners)


def _stream(stream, corner, rows, sizes):
    """Append ``corner``'s series to ``stream`` for ``rows`` (indices) in blocks of the given sizes."""
    start = 0
    for size in sizes:
        index = rows[start:start + size]
        stream.append(corner.name, corner.node_names, corner.link_names, corner.link_groups,
                      SeriesRows(corner.time_s[index], corner.temperatures_k[index], corner.speed_m_s[index],
                                 corner.brake_power_w[index], corner.link_flows_w[index]))
        start += size
    assert start == rows.size


def _blocks(n, rng):
    sizes = []
    while sum(sizes) < n:
        sizes.append(int(min(rng.integers(1, 90), n - sum(sizes))))
    return sizes


@pytest.fixture
def small_chunks(monkeypatch):
    """Chunks and blocks small enough that the fixture's 2401 rows cross many of both."""
    monkeypatch.setattr(hdf5_stream, "CHUNK_ROWS", 64)


def test_streamed_file_reads_back_as_the_file_written_at_once(results, tmp_path, small_chunks):
    full = _with_speed_and_power(results)
    rng = np.random.default_rng(3)
    path = tmp_path / "results.h5"
    with streamed_results_hdf5(path, block_rows=300) as stream:
        # the corners' blocks interleaved, as a run makes them segment by segment
        edges = [np.cumsum([0] + _blocks(c.time_s.size, rng)) for c in full.corners]
        for k in range(max(map(len, edges)) - 1):
            for corner, edge in zip(full.corners, edges):
                if k + 1 < len(edge):
                    _stream(stream, corner, np.arange(edge[k], edge[k + 1]), [edge[k + 1] - edge[k]])
        stream.finish(full)
    assert_same(read_results_hdf5(path), full)
    write_results_hdf5(full, tmp_path / "at_once.h5")
    assert_same(read_results_hdf5(tmp_path / "at_once.h5"), read_results_hdf5(path))
    with h5py.File(path) as f:               # the layout of thermo.output.hdf5, attributes included
        for corner in full.corners:
            group = f["corners"][corner.name]
            assert list(group["temperature_k"].attrs["nodes"].astype(str)) == list(corner.node_names)
            assert group["link_flow_w"].attrs["units"] == "W" and group["time_s"].attrs["units"] == "s"
            assert group["link_flow_w"].compression == "gzip"


def test_the_runs_own_series_are_not_written_again(results, tmp_path, small_chunks):
    """The run keeps its series at the output interval; the file holds every streamed row."""
    full = _with_speed_and_power(results)
    thinned = dataclasses.replace(full, corners=tuple(
        dataclasses.replace(c, time_s=c.time_s[::10], temperatures_k=c.temperatures_k[::10], link_flows_w=None,
                            speed_m_s=c.speed_m_s[::10], brake_power_w=c.brake_power_w[::10])
        for c in full.corners))
    path = tmp_path / "results.h5"
    with streamed_results_hdf5(path, block_rows=500) as stream:
        for corner in full.corners:
            _stream(stream, corner, np.arange(corner.time_s.size), [1000, 1000, corner.time_s.size - 2000])
        stream.finish(thinned)
    assert_same(read_results_hdf5(path), full)


def test_a_failed_run_leaves_no_file_and_the_old_one_untouched(results, tmp_path, small_chunks):
    full = _with_speed_and_power(results)
    path = tmp_path / "results.h5"
    write_results_hdf5(full, path)
    before = path.read_bytes()
    corner = full.corners[0]
    with pytest.raises(RuntimeError, match="solver gave up"):
        with streamed_results_hdf5(path, block_rows=100) as stream:
            _stream(stream, corner, np.arange(1000), [500, 500])     # some blocks already in the file
            raise RuntimeError("solver gave up")
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["results.h5"]


def _never_finished(stream, full):
    _stream(stream, full.corners[0], np.arange(10), [10])


def _columns_changed(stream, full):
    corner = full.corners[0]
    _stream(stream, corner, np.arange(10), [10])
    _stream(stream, dataclasses.replace(corner, node_names=corner.node_names[::-1]), np.arange(10, 20), [10])


def _columns_not_the_results(stream, full):
    corner = full.corners[0]
    _stream(stream, corner, np.arange(10), [10])
    stream.finish(dataclasses.replace(full, corners=(dataclasses.replace(corner, link_names=corner.link_names[::-1]),
                                                     full.corners[1])))


@pytest.mark.parametrize("misuse, message", [
    (_never_finished, "ended before its results file was finished"),
    (_columns_changed, "changed their columns"),
    (_columns_not_the_results, "columns are not the results'")])
def test_a_misused_stream_is_an_error_and_leaves_nothing(results, tmp_path, misuse, message):
    with pytest.raises(OutputError, match=message):
        with streamed_results_hdf5(tmp_path / "results.h5") as stream:
            misuse(stream, _with_speed_and_power(results))
    assert list(tmp_path.iterdir()) == []
