"""The results file written while the run goes (``brakeheat run --out DIR --store full``).

A run that keeps every solver step makes series far larger than the rest of its results (the
24-hour demo: about 400 000 rows a corner, each with 38 link flows). Held in memory and joined at
the end they took about 1 GB. Streamed, each corner's rows go into resizable datasets of the
results file, a block at a time (``BLOCK_ROWS``), as the run makes them; the run itself keeps only
its series at the output interval (``[solver] output_s``, with every extreme), which is what the
plots, report and summary read. The rest of the file is written when the run ends, in the layout
of ``thermo.output.hdf5`` (the same datasets, attributes and compression), so
``read_results_hdf5`` reads it back as any other results file.

The file is filled under a temporary name and renamed into place only once the run and the file
are complete (``atomic_path_unheld``): a run that fails or is interrupted leaves no file behind and
an older results.h5 untouched. Ctrl-C and SIGTERM are held only around each write to the file (its
opening and closing included), so that they still stop the run at once.
"""
from __future__ import annotations

import contextlib

import h5py
import numpy as np

from thermo.output.atomic import atomic_path_unheld, interrupts_held
from thermo.output.errors import OutputError
from thermo.output.hdf5 import SIGN_CONVENTION, _strings, _unique, write_results_into
from thermo.results import Results, SeriesRows

BLOCK_ROWS = 16384          # rows a corner gathers before they go to the file (about 7 MB with 38 links)
CHUNK_ROWS = 4096           # HDF5 chunk length of the streamed datasets
_DATASETS = ("time_s", "temperature_k", "speed_m_s", "brake_power_w", "link_flow_w")    # SeriesRows' order
_GZIP = {"compression": "gzip", "compression_opts": 1, "shuffle": True}     # as thermo.output.hdf5._dataset


class ResultsStream:
    """The open results file of a run in progress: ``append`` each corner's rows as they come, then
    ``finish`` with the run's ``Results`` (whose corners' own series are not written again)."""

    def __init__(self, f: h5py.File, path, block_rows: int = BLOCK_ROWS):
        self.f, self.path, self.block_rows = f, path, int(block_rows)
        self._pending: dict[str, list[SeriesRows]] = {}
        self._columns: dict[str, tuple] = {}
        self.finished = False

    def append(self, corner: str, node_names, link_names, link_groups, rows: SeriesRows) -> None:
        """Rows of ``corner`` (``SeriesRows``), in time order after the ones already appended;
        ``node_names``, ``link_names``, ``link_groups`` name the columns (the same at every call)."""
        columns = (tuple(node_names), tuple(link_names), tuple(link_groups))
        if corner not in self._columns:
            where = f"{self.path} corner {corner}"
            _unique([corner], "corner", str(self.path))
            _unique(columns[0], "node", where)
            with interrupts_held():
                self._create(corner, *columns)
            self._columns[corner] = columns
            self._pending[corner] = []
        elif columns != self._columns[corner]:
            raise OutputError(f"{self.path} corner {corner}: the streamed series changed their columns")
        pending = self._pending[corner]
        pending.append(rows)
        if sum(len(block.time_s) for block in pending) >= self.block_rows:
            self._flush(corner, whole_chunks=True)

    def _create(self, corner: str, nodes, links, groups) -> None:
        corners = self.f["corners"] if "corners" in self.f else self.f.create_group("corners", track_order=True)
        group = corners.create_group(corner)
        names = dict(links=_strings(links), groups=_strings(groups))
        for key, width, attrs in (("time_s", None, dict(units="s")),
                                  ("temperature_k", len(nodes), dict(units="K", nodes=_strings(nodes))),
                                  ("speed_m_s", None, dict(units="m/s")), ("brake_power_w", None, dict(units="W")),
                                  ("link_flow_w", len(links), dict(units="W", sign_convention=SIGN_CONVENTION, **names))):
            shape, most, chunks = ((0,), (None,), (CHUNK_ROWS,)) if width is None else \
                ((0, width), (None, width), (CHUNK_ROWS, max(width, 1)))
            dataset = group.create_dataset(key, shape=shape, maxshape=most, chunks=chunks, dtype=float, **_GZIP)
            for name, value in attrs.items():
                dataset.attrs[name] = value

    def _flush(self, corner: str, whole_chunks: bool = False) -> None:
        """The gathered rows to the file; ``whole_chunks``: only as many as fill whole chunks, the
        rest kept for the next flush (a chunk written in two parts would be read back, inflated
        and compressed again)."""
        blocks = self._pending[corner]
        if not blocks:
            return
        joined = SeriesRows(*(np.concatenate(column) for column in zip(*blocks)))
        n = len(joined.time_s)
        count = n - n % CHUNK_ROWS if whole_chunks else n
        group = self.f["corners"][corner]
        with interrupts_held():
            for key, values in zip(_DATASETS, joined):
                dataset = group[key]
                start = dataset.shape[0]
                dataset.resize(start + count, axis=0)
                dataset[start:] = values[:count]
        blocks.clear()
        if count < n:
            blocks.append(SeriesRows(*(values[count:] for values in joined)))

    def finish(self, results: Results) -> None:
        """The rows still gathered, then the rest of the file from the finished run ``results``."""
        for corner in self._columns:
            self._flush(corner)
        streamed = set(self._columns)
        missing = streamed - {c.name for c in results.corners}
        if missing:
            raise OutputError(f"{self.path}: streamed corner(s) {', '.join(sorted(missing))} missing from the results")
        for corner in results.corners:
            if corner.name in streamed and self._columns[corner.name] != (
                    tuple(corner.node_names), tuple(corner.link_names), tuple(corner.link_groups)):
                raise OutputError(f"{self.path} corner {corner.name}: the streamed series' columns are not the results'")
        with interrupts_held():
            write_results_into(self.f, results, self.path, streamed=streamed)
        self.finished = True


@contextlib.contextmanager
def streamed_results_hdf5(path, block_rows: int = BLOCK_ROWS):
    """Open ``path``'s temporary file for a run in progress and yield its ``ResultsStream``; the file
    is renamed onto ``path`` when the block ends after ``finish``, and removed on any exception
    (or when the block ends without ``finish``: the file would lack its results)."""
    with atomic_path_unheld(path) as tmp:
        with interrupts_held():
            f = h5py.File(tmp, "w", track_order=True)
        try:
            stream = ResultsStream(f, path, block_rows)
            yield stream
            if not stream.finished:
                raise OutputError(f"{path}: the run ended before its results file was finished")
        finally:
            with interrupts_held():           # closing writes the chunks h5py still caches
                f.close()
