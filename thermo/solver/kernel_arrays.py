"""The kernels' arrays: networks of one topology as arrays, their signals on a time grid, the lane layout.

``KernelNetwork`` holds B configurations of one network topology as the compiled kernels read
them, and runs them (``run``: full Newton, ``thermo.solver.kernel``; ``run_laps``: the linearised
mode, one configuration at a time, ``thermo.solver.kernel_linearised``, or side by side in lanes,
``thermo.solver.kernel_lanes``). The batch API on top of it (``solve_batch``, ``BatchSolution``)
is ``thermo.solver.batch``; the 'fast' method (``thermo.solver.fast``) and the race and settled-lap
studies call this module directly.

Entry points
------------
``kernel_network(compiled)``  the array form of one network (cached on it), or None if it cannot
    run compiled (a convection link not tabulated on the shared grid).
``kernel_network_like(previous, compiled)``  the same, made from a network of one shape and tables
    (a worn pad) by taking only its values.
``batch_network(networks)``  one array form for several networks of one topology.
``scaled(kernel_net, ...)``  sweep points made by scaling a base network's links, capacities, sources.
``kernel_inputs(compiled, schedule, grid)``  the schedule's signals on a time grid (``KernelInputs``).
``lane_width(B)``  configurations per block of the lane kernel.
"""
from __future__ import annotations

import functools
import os
import threading
from dataclasses import dataclass, replace

import numba
import numpy as np

from thermo.errors import ModelError
from thermo.network.assemble import CompiledNetwork, compile_network
from thermo.network.elements import REFERENCE_TEMPERATURE_K
from thermo.network.laws import capacity_segment
from thermo.network.schedule import Schedule
from thermo.network.tabulate import TabulatedConductance
from thermo.solver import kernel, kernel_lanes, kernel_linearised, kernel_newton_lanes
from thermo.solver.elimination import EliminationPlan, elimination_plan


KernelInputs = kernel.KernelInputs      # a schedule's signals on one time grid (defined beside the kernels)
KernelResult = kernel.KernelResult      # raw kernel output for B configurations


@dataclass(frozen=True, eq=False)
class KernelNetwork:
    """The array form of B configurations of one topology, as the kernel reads it.

    Shared: ``link_a``, ``link_b`` (second ends index [nodes..., boundaries...]), ``kind`` (0
    conduction, 1 radiation, 2 convection), ``conv_slot`` (link -> convection slot), ``conv_drv``
    (slot -> driver, -1 none), ``tables`` (U, n_driver, n_node, n_boundary) [W/K], ``gp`` grid
    axes, ``seg_start`` (n+1) capacity segments of each node. Per configuration: ``par`` (B, L) G
    [W/K], c [W/K^4] or convection multiplier [-]; ``tix`` (B, n_conv) table of each slot;
    ``mass``, ``base`` (B, n); ``seg_lo``, ``seg_hi``, ``seg_slope`` (B, S); ``src`` (B, n, n_signals).
    ``plan`` the stage matrix's sparse elimination order (``thermo.solver.elimination``).
    """

    compiled: CompiledNetwork
    link_a: np.ndarray
    link_b: np.ndarray
    kind: np.ndarray
    conv_slot: np.ndarray
    conv_drv: np.ndarray
    tables: np.ndarray
    gp: np.ndarray
    seg_start: np.ndarray
    par: np.ndarray
    tix: np.ndarray
    mass: np.ndarray
    base: np.ndarray
    seg_lo: np.ndarray
    seg_hi: np.ndarray
    seg_slope: np.ndarray
    src: np.ndarray
    plan: EliminationPlan
    varies_b: np.ndarray = None     # (P,) bool: table p changes along its boundary axis (None: work it out)
    # ``boundary_slices`` already worked out by the caller for a larger batch of the same tables and
    # these inputs (``CornerLanes``: once for all its configurations), six holding this batch's rows
    slices: tuple = None

    @property
    def size(self) -> int:
        """Number of configurations B."""
        return self.par.shape[0]

    @property
    def n_nodes(self) -> int:
        return self.mass.shape[1]

    def arrays(self, inputs: KernelInputs, lanes=None) -> kernel.NetworkArrays:
        """The arrays the kernels read, for a run on ``inputs``; ``lanes`` (a function (B, ...) ->
        (K, ..., W)) lays the per-configuration rows out in blocks for the lane kernel."""
        sliced, slot_sliced, six = self.slices if self.slices is not None else self.boundary_slices(inputs)
        rows = (lambda x: x) if lanes is None else lanes
        return kernel.NetworkArrays(
            link_a=self.link_a, link_b=self.link_b, kind=self.kind, par=rows(self.par), conv_slot=self.conv_slot,
            conv_drv=self.conv_drv, tables=self.tables if lanes is None else self.tables.reshape(-1),
            tix=rows(self.tix), gp=self.gp, sliced=sliced, slot_sliced=slot_sliced, six=rows(six),
            mass=rows(self.mass), base=rows(self.base), seg_start=self.seg_start, seg_lo=rows(self.seg_lo),
            seg_hi=rows(self.seg_hi), seg_slope=rows(self.seg_slope), t_ref=REFERENCE_TEMPERATURE_K,
            src=rows(self.src), order=self.plan.order, ptr=self.plan.ptr, nbr=self.plan.nbr)

    def _result(self, B, n_rec) -> KernelResult:
        n, L = self.n_nodes, self.link_a.size
        return KernelResult(np.empty((B, n_rec, n)), np.empty((B, n_rec, L)), np.empty((B, n)), np.empty((B, n)),
                            np.zeros((B, n), dtype=np.int64), link_energy=np.zeros((B, L)), heat_in=np.zeros(B),
                            status=np.zeros(B, dtype=np.int64), fail_step=np.zeros(B, dtype=np.int64),
                            counts=np.zeros((B, 2), dtype=np.int64))

    def run(self, inputs: KernelInputs, initial_k: np.ndarray, rtol: float, atol_k: float,
            record: np.ndarray, linearised: bool = False, lanes: bool = False) -> KernelResult:
        """Call the kernel: ``initial_k`` (B, n) [K]; ``record`` (N+1,) grid points to keep;
        ``rtol``, ``atol_k`` the Newton tolerances; ``linearised`` the linearised mode
        (``thermo.solver.kernel_linearised``: no iteration, so the tolerances do not apply).
        ``lanes``: full Newton with the configurations side by side in lanes
        (``thermo.solver.kernel_newton_lanes``): each configuration's numbers are
        those of the one-configuration kernel, to the bit, whatever runs beside it."""
        if linearised:
            return self.run_laps(inputs, initial_k, 1, None, record)[0]
        if lanes:
            return self._run_newton_lanes(inputs, np.ascontiguousarray(initial_k, dtype=float), float(rtol),
                                          float(atol_k), np.ascontiguousarray(record, dtype=np.bool_))
        B = self.size
        out = self._result(B, int(np.count_nonzero(record)))
        fn = kernel.advance_parallel if B > 1 else kernel.advance
        fn(np.ascontiguousarray(initial_k, dtype=float), inputs, self.arrays(inputs), float(rtol), float(atol_k),
           kernel.MAX_NEWTON, np.ascontiguousarray(record, dtype=np.bool_), out)
        return out

    def run_laps(self, inputs: KernelInputs, initial_k: np.ndarray, n_laps: int, output_weights,
                 record: np.ndarray | None = None, width: int | None = None, always_lanes: bool = False) -> tuple:
        """The linearised kernel over the grid ``n_laps`` times, carrying the state (one call).

        ``output_weights`` (n_nodes, n_outputs) or None: the outputs whose peak in every lap is
        kept. Returns (KernelResult, lap_peaks (B, n_laps, n_outputs) [K]); ``record`` applies to
        the last lap and ``peak_step`` counts steps over all laps. ``width``: configurations per
        block of the lane kernel (None: ``lane_width(B)``, the blocks spread over the cores; a
        process that is itself one of several workers gives ``min(B, LANES)``, one block).
        ``always_lanes``: the lane kernel even for blocks narrower than ``MIN_LANES``; a
        configuration then gets the same numbers, to the bit, whatever the width and whatever
        else runs beside it (a study's result never depends on how its points were chunked)."""
        B = self.size
        record = np.zeros(inputs.grid.size, dtype=bool) if record is None else record
        record = np.ascontiguousarray(record, dtype=np.bool_)
        w_ptr, w_node, w_val = _sparse_weights(output_weights)
        T0 = np.ascontiguousarray(initial_k, dtype=float)
        width = lane_width(B) if width is None else int(min(width, kernel_lanes.LANES))
        if width >= MIN_LANES or always_lanes:
            return self._run_lanes(inputs, T0, int(n_laps), (w_ptr, w_node, w_val), record, width)
        return self._run_each(inputs, T0, int(n_laps), (w_ptr, w_node, w_val), record)

    def _run_each(self, inputs, T0, n_laps, weights, record) -> tuple:
        """``run_laps`` one configuration at a time (in parallel over the cores for B > 1)."""
        B = self.size
        lap_peaks = np.full((B, n_laps, weights[0].size - 1), np.nan)       # laps never driven stay NaN
        out = self._result(B, int(np.count_nonzero(record)))
        fn = kernel_linearised.advance_linearised_parallel if B > 1 else kernel_linearised.advance_linearised
        fn(T0, inputs, self.arrays(inputs), n_laps, weights, record, out, lap_peaks)
        return out, lap_peaks

    def _run_lanes(self, inputs, T0, n_laps, weights, record, width=None) -> tuple:
        """``run_laps`` in blocks of ``width`` (default ``lane_width(B)``) configurations side by side;
        a flagged lane is rerun alone in the one-configuration kernel (dense fallback, exact status)."""
        B, n, L = self.size, self.n_nodes, self.link_a.size
        Wd = lane_width(B) if width is None else int(width)
        K = -(-B // Wd)
        lanes = lambda x: _to_lanes(x, K, Wd)
        n_rec, n_out, N = int(np.count_nonzero(record)), weights[0].size - 1, inputs.h.size
        lane_out = kernel_lanes.LaneOutputs(
            temps=np.empty((K, n_rec, n, Wd)), flows=np.empty((K, n_rec, L, Wd)), final=np.empty((K, n, Wd)),
            peak=np.empty((K, n, Wd)), peak_step=np.zeros((K, n, Wd), dtype=np.int64),
            lap_peaks=np.empty((K, n_laps, n_out, Wd)), link_energy=np.zeros((K, L, Wd)), heat_in=np.zeros((K, Wd)),
            lane_flag=np.zeros((K, Wd), dtype=np.bool_), counts=np.zeros((K, Wd), dtype=np.int64))
        _call_blocks(kernel_lanes.advance_lanes, K, lanes(T0), inputs, self.arrays(inputs, lanes), n_laps, weights,
                     record, lane_out)
        temps, flows, final, peak, peak_step, lap_peaks, link_energy, heat_in, flag, _ = lane_out
        back = lambda y: _from_lanes(y, B)
        out = KernelResult(back(temps), back(flows), back(final), back(peak), back(peak_step), back(link_energy),
                           back(heat_in), np.zeros(B, dtype=np.int64), np.full(B, n_laps * N, dtype=np.int64),
                           np.tile(np.array([n_laps * (1 + 2 * N), n_laps * N], dtype=np.int64), (B, 1)))
        lap_peaks = back(lap_peaks)
        redo = np.flatnonzero(back(flag))
        if redo.size:        # never back into the lanes: the one-configuration kernel decides
            one, one_peaks = self.subset(redo)._run_each(inputs, np.ascontiguousarray(T0[redo]), n_laps, weights,
                                                         record)
            _take_rows(out, one, redo)
            lap_peaks[redo] = one_peaks
        return out, lap_peaks

    def _run_newton_lanes(self, inputs, T0, rtol, atol_k, record) -> KernelResult:
        """``run`` in full Newton with the configurations side by side in blocks of up to
        ``kernel_lanes.LANES`` (``kernel_newton_lanes``); a flagged lane is rerun alone in
        ``kernel.advance`` (dense fallback, exact status)."""
        B, n, L, N = self.size, self.n_nodes, self.link_a.size, inputs.h.size
        Wd = min(B, kernel_lanes.LANES)
        K = -(-B // Wd)
        lanes = lambda x: _to_lanes(x, K, Wd)
        n_rec = int(np.count_nonzero(record))
        lane_out = kernel_newton_lanes.NewtonLaneOutputs(
            temps=np.empty((K, n_rec, n, Wd)), flows=np.empty((K, n_rec, L, Wd)), final=np.empty((K, n, Wd)),
            peak=np.empty((K, n, Wd)), peak_step=np.zeros((K, n, Wd), dtype=np.int64),
            link_energy=np.zeros((K, L, Wd)), heat_in=np.zeros((K, Wd)), lane_flag=np.zeros((K, Wd), dtype=np.bool_),
            counts=np.zeros((K, 2, Wd), dtype=np.int64))
        _call_blocks(kernel_newton_lanes.advance_newton_lanes, K, lanes(T0), inputs, self.arrays(inputs, lanes), rtol,
                     atol_k, kernel.MAX_NEWTON, record, lane_out)
        temps, flows, final, peak, peak_step, link_energy, heat_in, flag, counts = lane_out
        back = lambda y: _from_lanes(y, B)
        out = KernelResult(back(temps), back(flows), back(final), back(peak), back(peak_step), back(link_energy),
                           back(heat_in), np.zeros(B, dtype=np.int64), np.full(B, N, dtype=np.int64), back(counts))
        redo = np.flatnonzero(back(flag))
        if redo.size:        # the one-configuration kernel decides (dense fallback, exact failure report)
            one = self.subset(redo).run(inputs, np.ascontiguousarray(T0[redo]), rtol, atol_k, record)
            _take_rows(out, one, redo)
        return out

    def boundary_slices(self, inputs: KernelInputs) -> tuple:
        """Convection tables interpolated along the boundary axis for every slot whose boundary
        temperature is constant over the run and on the table (``kernel._flows``,
        ``kernel_lanes._flows_lanes``).

        Returns (sliced (P * n_driver * n_node,), slot_sliced (n_conv,) bool, six (B, n_conv) slice
        of each configuration's slot). The slices depend only on the tables, which table each slot
        reads and the boundaries' constant temperatures, so a run that solves lap after lap on the
        same tables (a pad that wears takes new values, not new tables) makes them once
        (``_SLICES``, emptied by ``forget_slices``)."""
        n = self.n_nodes
        boundary_q = sorted({int(b) - n for b in self.link_b[self.kind == kernel.KIND_CONVECTION] if b >= n})
        constant = []
        for q in boundary_q:
            lo = min(inputs.bk_grid[:, q].min(), inputs.bk_mid[:, q].min())
            hi = max(inputs.bk_grid[:, q].max(), inputs.bk_mid[:, q].max())
            constant.append(float(lo) if lo == hi else None)
        key = (id(self.tables), self.tix.tobytes(), self.tix.shape, tuple(boundary_q), tuple(constant))
        with _SLICES_LOCK:
            kept = _SLICES.get(key)
        if kept is not None and kept[0] is self.tables:
            return kept[1]
        found = self._slices(inputs)
        with _SLICES_LOCK:          # the corners of a run may be solved in threads side by side
            while len(_SLICES) >= _SLICES_KEPT:
                _SLICES.pop(next(iter(_SLICES)))
            _SLICES[key] = (self.tables, found)
        return found

    def _slices(self, inputs: KernelInputs) -> tuple:
        """``boundary_slices`` worked out."""
        n, n_conv = self.n_nodes, self.conv_drv.size
        slot_sliced = np.zeros(n_conv, dtype=np.bool_)
        six = np.zeros((self.size, n_conv), dtype=np.int64)
        slices, index = [], {}
        gp = self.gp
        for l in np.flatnonzero(self.kind == kernel.KIND_CONVECTION):
            s, q = int(self.conv_slot[l]), int(self.link_b[l]) - n
            if q < 0:
                # a node-to-node link: sliced only where no table of the slot varies along the
                # second end's temperature axis (then its value there is irrelevant)
                if any(self._varies_along_boundary(int(t)) for t in np.unique(self.tix[:, s])):
                    continue
                k, fk = 0, 0.0
            else:
                series = np.concatenate([inputs.bk_grid[:, q], inputs.bk_mid[:, q]])
                if np.ptp(series) != 0.0:
                    continue
                k, fk, inside = kernel._axis(float(series[0]), gp[6], 1.0 / gp[7], int(gp[8]))
                if not inside:
                    continue                             # off the table: the kernel flags it as usual
            slot_sliced[s] = True
            used, which = np.unique(self.tix[:, s], return_inverse=True)
            new = [int(t) for t in used if (int(t), q) not in index]
            if new:         # the new tables' slices in one operation (the same arithmetic element by element)
                lo, hi = self.tables[new, :, :, k], self.tables[new, :, :, k + 1]
                slices.append(lo + fk * (hi - lo))
                for table in new:
                    index[(table, q)] = len(index)
            six[:, s] = np.array([index[(int(t), q)] for t in used], dtype=np.int64)[which.reshape(-1)]
        sliced = np.ascontiguousarray(np.concatenate(slices)).reshape(-1) if slices else np.zeros(1)
        return sliced, slot_sliced, six

    def _varies_along_boundary(self, table: int) -> bool:
        """Whether table number ``table`` changes along its boundary-temperature axis."""
        if self.varies_b is not None:
            return bool(self.varies_b[table])
        return bool(np.ptp(self.tables[table], axis=2).max() != 0.0)

    def subset(self, index) -> "KernelNetwork":
        """The configurations ``index`` (array of ints) of this batch."""
        ix = np.asarray(index, dtype=np.int64)
        pick = lambda a: np.ascontiguousarray(a[ix])
        slices = None if self.slices is None else (self.slices[0], self.slices[1], pick(self.slices[2]))
        return replace(self, par=pick(self.par), tix=pick(self.tix), mass=pick(self.mass), base=pick(self.base),
                       seg_lo=pick(self.seg_lo), seg_hi=pick(self.seg_hi), seg_slope=pick(self.seg_slope),
                       src=pick(self.src), slices=slices)


def varies_along_boundary(tables: np.ndarray, only: np.ndarray | None = None) -> np.ndarray:
    """(U,) bool: whether each of the stacked tables (U, n_driver, n_node, n_boundary) changes
    along its boundary-temperature axis (``KernelNetwork.varies_b``). With ``only`` (table numbers)
    just those are examined and the rest are taken as varying (so never read pre-sliced): the
    question is asked only of tables that node-to-node links read (``node_link_tables``)."""
    if only is None:
        return np.ptp(tables, axis=3).max(axis=(1, 2)) != 0.0
    varies = np.ones(tables.shape[0], dtype=bool)
    only = np.asarray(only, dtype=np.int64)
    if only.size:
        varies[only] = np.ptp(tables[only], axis=3).max(axis=(1, 2)) != 0.0
    return varies


def node_link_tables(kn: KernelNetwork, tix: np.ndarray) -> np.ndarray:
    """The table numbers that convection links between two nodes read, in configurations ``tix``
    (B, n_conv)."""
    conv = kn.kind == kernel.KIND_CONVECTION
    slots = np.unique(kn.conv_slot[conv & (kn.link_b < kn.n_nodes)])
    return np.unique(tix[:, slots]) if slots.size else np.zeros(0, dtype=np.int64)


_SLICES: dict = {}      # boundary_slices' results, by tables, table choice and boundary temperatures
_SLICES_KEPT = 8        # a run's corners each reuse theirs lap after lap
_SLICES_LOCK = threading.Lock()


def forget_slices() -> None:
    """Empty ``boundary_slices``' store (a study's worker does so after each point)."""
    _SLICES.clear()


def _call_blocks(fn, blocks: int, *args) -> None:
    """Call a lane kernel; with one block on one thread (no threads to wake: each would spin on a
    core another process may use)."""
    threads = numba.get_num_threads()
    if blocks == 1:
        numba.set_num_threads(1)
    try:
        fn(*args)
    finally:
        numba.set_num_threads(threads)


def _take_rows(out: KernelResult, alone: KernelResult, rows: np.ndarray) -> None:
    """Put the results of configurations ``rows``, rerun alone, into a batch's ``out``."""
    for field in KernelResult._fields:
        getattr(out, field)[rows] = getattr(alone, field)


MIN_LANES = 4    # narrower blocks are no cheaper per configuration than the one-configuration kernel


def lane_width(configurations: int, cores: int | None = None) -> int:
    """Configurations per block of the lane kernel: the batch shared evenly over the CPU cores,
    ceil(B / cores), but at most ``kernel_lanes.LANES`` (so up to ``cores`` blocks; with more
    than ``LANES`` configurations a core, blocks of ``LANES``). Measured on the demo corner, one
    core, cost per configuration and step: one-configuration kernel about 2.1 us; lanes 1: 3.7,
    2: 2.2, 4: 1.4, 8: 0.9, 16: 0.66, 32: 0.55, 64: 0.48 us (hence ``MIN_LANES`` and ``LANES``)."""
    cores = max(1, cores if cores is not None else (os.cpu_count() or 1))
    return int(max(1, min(kernel_lanes.LANES, -(-configurations // cores))))


def _to_lanes(x: np.ndarray, blocks: int, width: int) -> np.ndarray:
    """(B, ...) -> (blocks, ..., width), the last configuration repeated into unused lanes."""
    unused = blocks * width - x.shape[0]
    if unused:
        x = np.concatenate([x, np.repeat(x[-1:], unused, axis=0)])
    x = x.reshape(blocks, width, *x.shape[1:])
    return np.ascontiguousarray(np.moveaxis(x, 1, -1))


def _from_lanes(y: np.ndarray, count: int) -> np.ndarray:
    """(blocks, ..., width) -> (count, ...), the inverse of ``_to_lanes``."""
    y = np.moveaxis(y, -1, 1)
    return np.ascontiguousarray(y.reshape(y.shape[0] * y.shape[1], *y.shape[2:])[:count])


def _sparse_weights(weights):
    """(w_ptr, w_node, w_val) of an (n_nodes, n_outputs) weight matrix, column by column."""
    if weights is None:
        return np.zeros(1, dtype=np.int64), np.zeros(0, dtype=np.int64), np.zeros(0)
    W = np.asarray(weights, dtype=float)
    nodes, vals, ptr = [], [], [0]
    for o in range(W.shape[1]):
        nz = np.flatnonzero(W[:, o])
        nodes.extend(nz)
        vals.extend(W[nz, o])
        ptr.append(len(nodes))
    return np.asarray(ptr, dtype=np.int64), np.asarray(nodes, dtype=np.int64), np.asarray(vals, dtype=float)


def _link_tables(net: CompiledNetwork):
    """Each convection link's TabulatedConductance, or None if any is untabulated or grids differ."""
    if net.conv_idx.size == 0:
        return ()
    if not net.tabulated:
        return None
    fns = [net.network.links[i].conductance for i in net.conv_idx]
    return fns if all(isinstance(fn, TabulatedConductance) for fn in fns) else None


def _topology(net: CompiledNetwork) -> tuple:
    grid = net.conv_grid if net.conv_idx.size else None
    return (net.node_names, net.boundary_names, net.link_names, tuple(map(type, net.network.links)),
            tuple(net.link_a), tuple(net.link_b), net.driver_names, tuple(net.conv_driver_index)
            if net.conv_idx.size else (), net.source_signals, tuple(net.capacities.seg_node), grid)


def batch_network(networks) -> KernelNetwork:
    """One ``KernelNetwork`` for several networks of one topology (tables shared where identical).

    Raises ``ModelError`` naming the first network whose topology differs from the first, or one
    that cannot run compiled.
    """
    nets = [compile_network(x) for x in networks]
    if not nets:
        raise ModelError("batch: no networks given")
    first = _topology(nets[0])
    fns_all = []
    for k, net in enumerate(nets):
        if _topology(net) != first:
            raise ModelError(f"batch: network {k} differs in nodes, links, signals or tables from network 0; "
                             "a batch needs one topology")
        fns = _link_tables(net)
        if fns is None:
            raise ModelError(f"batch: network {k} has a convection link not tabulated on the shared grid")
        fns_all.append(fns)
    net0 = nets[0]
    L, n = net0.n_links, net0.n_nodes
    kind = np.full(L, kernel.KIND_CONDUCTION, dtype=np.int64)
    kind[net0.rad_idx] = kernel.KIND_RADIATION
    kind[net0.conv_idx] = kernel.KIND_CONVECTION
    conv_slot = np.full(L, -1, dtype=np.int64)
    conv_slot[net0.conv_idx] = np.arange(net0.conv_idx.size)
    unique, tix = {}, np.zeros((len(nets), net0.conv_idx.size), dtype=np.int64)
    varies_b = None
    for b, fns in enumerate(fns_all):
        for s, fn in enumerate(fns):
            tix[b, s] = unique.setdefault(id(fn.table), (len(unique), fn.table))[0]
    if unique and len(nets) == 1 and len(unique) == net0.conv_idx.size:
        tables = np.ascontiguousarray(net0.conv_tables)        # already stacked in slot order: no copy
    elif unique and len(nets) == 1:        # one network rebuilt (a worn pad): the same paths, the same stack
        tables, varies_b = _unique_stack(tuple(fns_all[0]))
    elif unique:
        tables = np.ascontiguousarray(np.stack([t for _, t in sorted(unique.values(), key=lambda x: x[0])]))
    if unique:
        g = net0.conv_grid
        nd, nn, nb = tables.shape[1:]
        gp = np.array([g.driver_min, g.driver_step, nd, g.node_min_k, g.node_step_k, nn,
                       g.boundary_min_k, g.boundary_step_k, nb], dtype=float)
        conv_drv = np.ascontiguousarray(net0.conv_driver_index, dtype=np.int64)
    else:
        tables = np.zeros((1, 2, 2, 2))
        gp = np.array([0.0, 1.0, 2, 0.0, 1.0, 2, 0.0, 1.0, 2])
        conv_drv = np.zeros(0, dtype=np.int64)
    rows = [configuration_rows(net) for net in nets]
    seg_start = np.searchsorted(net0.capacities.seg_node, np.arange(n + 1)).astype(np.int64)
    return KernelNetwork(
        compiled=net0, link_a=net0.link_a.astype(np.int64), link_b=net0.link_b.astype(np.int64), kind=kind,
        conv_slot=conv_slot, conv_drv=conv_drv, tables=tables, gp=gp, seg_start=seg_start, tix=tix,
        **{name: np.ascontiguousarray(np.concatenate([r[name] for r in rows])) for name in ROW_FIELDS},
        plan=elimination_plan(n, [(a, b) for a, b in zip(net0.link_a, net0.link_b) if b < n]), varies_b=varies_b)


ROW_FIELDS = ("par", "mass", "base", "seg_lo", "seg_hi", "seg_slope", "src")   # a configuration's own rows


def configuration_rows(net: CompiledNetwork) -> dict:
    """One configuration's rows of the kernel's arrays (``ROW_FIELDS``, each with a leading axis of
    1): ``par`` G [W/K], c [W/K^4] or convection scale [-] of each link; ``mass`` [kg], ``base``
    [J/(kg K)] and the capacity segments of each node; ``src`` each node's share of each signal."""
    par = np.ones((1, net.n_links))
    par[0, net.cond_idx] = net.cond_g
    par[0, net.rad_idx] = net.rad_c
    par[0, net.conv_idx] = net.conv_scale
    caps = net.capacities
    return {"par": par, "mass": np.array(caps.mass_kg, dtype=float).reshape(1, -1),
            "base": np.array(caps.base_j_kgk, dtype=float).reshape(1, -1),
            "seg_lo": np.array(caps.seg_lo, dtype=float).reshape(1, -1),
            "seg_hi": np.array(caps.seg_hi, dtype=float).reshape(1, -1),
            "seg_slope": np.array(caps.seg_slope, dtype=float).reshape(1, -1),
            "src": np.array(net.source_matrix, dtype=float).reshape(1, net.n_nodes, -1)}


@functools.lru_cache(maxsize=16)
def _unique_stack(functions: tuple) -> np.ndarray:
    """The distinct tables of a network's tabulated conductances, stacked in first-use order (the
    order ``batch_network`` numbers them in), and whether each varies along its boundary axis;
    cached, since equal paths give equal stacks."""
    unique = {}
    for fn in functions:
        unique.setdefault(id(fn.table), fn.table)
    tables = np.ascontiguousarray(np.stack(list(unique.values())))
    return tables, varies_along_boundary(tables)


def kernel_network(net: CompiledNetwork) -> KernelNetwork | None:
    """The array form of one compiled network, built once and kept on it; None if not compilable.

    The two refer to each other (``KernelNetwork.compiled``), so only Python's cycle collector
    frees them once dropped, and it runs by object count, not by memory: a chain that replaces a
    network (a worn pad, every lap) calls ``release_kernel_network`` on the old one, and both go
    at once."""
    if not hasattr(net, "_kernel_network"):
        net._kernel_network = batch_network([net]) if _link_tables(net) is not None else None
    return net._kernel_network


def kernel_network_like(previous: CompiledNetwork, net: CompiledNetwork) -> KernelNetwork | None:
    """The array form of ``net`` made from ``previous``'s (``kernel_network``), when the two have
    one shape and read the same tables (a corner whose pad has worn: only conductances, masses and
    source shares differ). The new values are taken from ``net``; the tables, the grid and the
    elimination plan are kept. It is kept on ``net`` as ``kernel_network`` would keep it. None
    (and nothing kept) when ``previous`` has no array form or the two differ in shape or tables."""
    old = getattr(previous, "_kernel_network", None)
    if old is None or old.size != 1 or net.link_names != previous.link_names or net.node_names != previous.node_names:
        return None
    if not (np.array_equal(net.link_a, previous.link_a) and np.array_equal(net.link_b, previous.link_b)
            and np.array_equal(net.capacities.seg_node, previous.capacities.seg_node)
            and net.source_signals == previous.source_signals):
        return None
    fns, old_fns = _link_tables(net), _link_tables(previous)
    if fns is None or old_fns is None or any(a.table is not b.table for a, b in zip(fns, old_fns)):
        return None
    kn = replace(old, compiled=net, **configuration_rows(net))
    net._kernel_network = kn
    return kn


def release_kernel_network(net: CompiledNetwork) -> None:
    """Drop the array form kept on ``net`` (see ``kernel_network``), breaking their reference cycle."""
    net.__dict__.pop("_kernel_network", None)


def scaled(base: KernelNetwork, link_scale=None, capacity_scale=None, source_scale=None) -> KernelNetwork:
    """Sweep points from a one-configuration base: each row scales links, capacities or sources.

    Parameters
    ----------
    base : KernelNetwork
        One configuration (B = 1)
    link_scale : array_like (B, n_links) or None
        Multiplies each link's G, c or convection G [-]
    capacity_scale : array_like (B, n_nodes) or None
        Multiplies each node's mass [-]
    source_scale : array_like (B,) or (B, n_nodes) or None
        Multiplies the heat into each node [-]
    """
    if base.size != 1:
        raise ModelError(f"batch: scaled() needs a one-configuration base, got {base.size}")
    given = [np.asarray(x, dtype=float) for x in (link_scale, capacity_scale, source_scale) if x is not None]
    if not given:
        raise ModelError("batch: scaled() needs at least one of link_scale, capacity_scale, source_scale")
    B = given[0].shape[0]
    n, L = base.n_nodes, base.link_a.size

    def rows(x, width, name):
        a = np.ones((B, width)) if x is None else np.asarray(x, dtype=float)
        if a.ndim == 1 and name == "source_scale":
            a = np.repeat(a[:, None], width, axis=1)
        if a.shape != (B, width) or not np.all(np.isfinite(a) & (a >= 0)):
            raise ModelError(f"batch: {name} must be finite, >= 0 and of shape ({B}, {width}), got {a.shape}")
        return a

    ls, cs, ss = rows(link_scale, L, "link_scale"), rows(capacity_scale, n, "capacity_scale"), \
        rows(source_scale, n, "source_scale")
    if np.any(cs == 0):
        raise ModelError("batch: capacity_scale must be > 0")
    rep = lambda a: np.ascontiguousarray(np.repeat(a, B, axis=0))
    return replace(base, par=base.par * ls, tix=rep(base.tix), mass=base.mass * cs, base=rep(base.base),
                   seg_lo=rep(base.seg_lo), seg_hi=rep(base.seg_hi), seg_slope=rep(base.seg_slope),
                   src=np.ascontiguousarray(base.src * ss[:, :, None]))


def kernel_inputs(net: CompiledNetwork, schedule: Schedule, grid: np.ndarray) -> KernelInputs:
    """Boundary temperatures and drivers at grid and stage times, source integrals per step.

    Every signal is read once at the grid and stage times together (each value depends on its own
    time only; ``Schedule.sample``). The source integrals are differences of each signal's
    integral from the schedule's start at those times: to the bit what ``Schedule.integral``
    gives step by step."""
    h = np.diff(grid)
    if np.any(h <= 0):
        raise ModelError("batch: the time grid must be strictly increasing")
    n, nb = grid.size, net.n_boundaries
    t_mid = grid[:-1] + kernel.GAMMA * h
    net.check_schedule(schedule)
    values, at = schedule.sample(net.boundary_signals + net.driver_names, net.source_signals,
                                 np.concatenate([grid, t_mid]))
    c = np.ascontiguousarray
    return KernelInputs(grid, c(h), c(values[:n, :nb]), c(values[:n, nb:]), c(values[n:, :nb]), c(values[n:, nb:]),
                        c(at[n:] - at[:n - 1]), c(at[1:n] - at[:n - 1]))


def enthalpy(kn: KernelNetwork, b: int, T: np.ndarray) -> np.ndarray:
    """Enthalpy of configuration b's nodes relative to 20 degC [J] (``thermo.network.laws``)."""
    h = kn.base[b] * (T - REFERENCE_TEMPERATURE_K)
    seg_node = kn.compiled.capacities.seg_node
    if seg_node.size:
        lo, hi, s = kn.seg_lo[b], kn.seg_hi[b], kn.seg_slope[b]
        ramp = capacity_segment(T[seg_node], lo, hi)[1] - capacity_segment(REFERENCE_TEMPERATURE_K, lo, hi)[1]
        h = h + np.bincount(seg_node, s * ramp, minlength=T.size)
    return kn.mass[b] * h
