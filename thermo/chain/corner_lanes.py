"""Many configurations of one corner carried across the plan side by side (``CornerLanes``).

A study's points often differ only in the corner's own build (duct size, convection multipliers,
pad thickness, pistons) and limits, while the car, the plan and so each segment's heat input and
air are the same. Those configurations run here together: each segment is one call of the
compiled kernel for all of them side by side in lanes, from each one's carried state, in the
scheme of ``brakeheat run`` (full Newton, ``thermo.solver.kernel_newton_lanes``), or with
``[solver] linearised = true`` in the linearised scheme (``thermo.solver.kernel_lanes``).
Between segments each configuration's pad wears and is changed at stops exactly as ``CornerRun``
does it, by writing the worn pad's values (``thermo.corner.pad_terms``) into its rows of the
kernel's arrays: nothing is rebuilt. The tables are stacked once for all configurations and
shared where equal. A configuration keeps only each output node's peak and when it was reached.

Each configuration's numbers are the same, to the bit, whatever runs beside it, and in the
default scheme they are those of the configuration run alone. All configurations must have one ``corner_shape``
(the caller groups them). A configuration whose state leaves a conductance table or the model's
physical range, or that the kernel cannot solve, is dropped (``failed``): its caller runs it
alone the ordinary way (``CornerRun``), which reports it as ``brakeheat run`` would.
"""
from __future__ import annotations

from dataclasses import replace

import numba
import numpy as np

from thermo.chain.corner_run import (
    SegmentDuty, conductance_grid, lap_wear, segment_schedule, worn_pad_profile,
)
from thermo.chain.guards import STATE_MAX_K, STATE_MIN_K
from thermo.chain.stint_kernel import heat_weighted_pad_k
from thermo.chain.pad_rows import PadRows
from thermo.chain.plan import PlanSegment
from thermo.chain.setup import corner_setup
from thermo.corner.build import corner_materials, disc_face_resistance, disc_layers, pad_layers
from thermo.corner.pad_terms import pad_terms
from thermo.solver import kernel
from thermo.solver.fast import step_grid
from thermo.solver.kernel_arrays import (
    ROW_FIELDS, _link_tables, configuration_rows, kernel_inputs, kernel_network, node_link_tables,
    varies_along_boundary,
)
from thermo.solver.settings import SolverSettings

def corner_shape(net) -> tuple:
    """What configurations side by side must share: nodes, links and their second ends, kinds,
    drivers, signals, capacity segments and the table grid (the edges' first end may differ)."""
    return (net.node_names, net.boundary_names, net.link_names, tuple(map(type, net.network.links)), tuple(net.link_b),
            net.driver_names, tuple(net.conv_driver_index) if net.conv_idx.size else (), net.source_signals,
            tuple(net.capacities.seg_node), net.conv_grid if net.conv_idx.size else None)


class CornerLanes:
    """One corner of several scenarios that share their drive, solved segment by segment side by side.

    ``scenarios``: one per configuration, each with this corner (``corner`` its index); their
    plans, cars, air and solver settings must be the same (``thermo.studies.lanes`` groups them).
    After ``advance`` over the segments, ``peaks_k`` (B, n_outputs) and ``peak_time_s`` hold each
    configuration's output peaks; ``failed`` the configurations to run alone.
    """

    def __init__(self, scenarios, corner: int, settings: SolverSettings, setups=None):
        self.scenarios = list(scenarios)
        first = self.scenarios[0]
        self.designs = [s.corners[corner] for s in self.scenarios]
        self.settings = settings
        if setups is None:
            grid = conductance_grid(first)
            setups = [corner_setup(s, d, settings, grid=grid) for d, s in zip(self.designs, self.scenarios)]
        self.models = [setup.model for setup in setups]
        nets = [setup.network for setup in setups]
        self.net = nets[0]
        self.failed: set[int] = set()
        template = kernel_network(self.net)
        if template is None:
            raise ValueError("corner lanes: the network does not run compiled")
        if any(corner_shape(net) != corner_shape(self.net) for net in nets):
            raise ValueError("corner lanes: configurations of more than one shape (group them by corner_shape)")
        tables, self.tix = {}, np.zeros((len(nets), self.net.conv_idx.size), dtype=np.int64)
        for b, net in enumerate(nets):
            fns = _link_tables(net)
            if fns is None:
                raise ValueError("corner lanes: a network that does not run compiled")
            for s, fn in enumerate(fns):
                self.tix[b, s] = tables.setdefault(id(fn.table), (len(tables), fn.table))[0]
        if not tables:
            raise ValueError("corner lanes: the network has no tabulated convection")
        stacked = np.ascontiguousarray(np.stack([t for _, t in sorted(tables.values(), key=lambda x: x[0])]))
        self.template = replace(template, tables=stacked,
                                varies_b=varies_along_boundary(stacked, node_link_tables(template, self.tix)))
        rows = [configuration_rows(net) for net in nets]
        self.rows = {name: np.ascontiguousarray(np.concatenate([r[name] for r in rows])) for name in ROW_FIELDS}
        self.link_a = np.array([net.link_a for net in nets], dtype=np.int64)
        self.weights = np.array([m.output_weights for m in self.models])
        self.pad_rows = PadRows(self.net, self.models[0])
        self.pad_count = len(self.models[0].pad_nodes)
        self.materials = [corner_materials(d) for d in self.designs]
        self.disc_face_r = [disc_face_resistance(d, disc_layers(d), m["disc"]) for d, m in zip(self.designs, self.materials)]
        self.thickness = np.array([d.pad.thickness_m for d in self.designs])
        self.layers = [pad_layers(d) for d in self.designs]       # as each was built
        n_out = len(self.models[0].output_nodes)
        self.T = np.array([np.full(self.net.n_nodes, float(s.ambient.temperature_at(0.0))) for s in self.scenarios])
        self.peaks_k = np.full((len(nets), n_out), -np.inf)
        self.peak_time_s = np.zeros((len(nets), n_out))
        self.segments_done = 0
        self.back = self.net.node_names.index("backing_plate")

    @property
    def live(self) -> np.ndarray:
        """The configurations still side by side."""
        return np.array([b for b in range(len(self.scenarios)) if b not in self.failed], dtype=np.int64)

    def _set_pad(self, b: int, thickness_m: float) -> None:
        """Configuration ``b``'s pad at ``thickness_m`` (``pad_terms``): a worn pad with the same number
        of layers, a new one (the design's thickness) with the design's own layers, as ``CornerRun``."""
        design = self.designs[b]
        renewed = thickness_m == design.pad.thickness_m
        self.layers[b] = pad_layers(design) if renewed else pad_layers(design, thickness_m, self.pad_count)
        terms = pad_terms(design, self.layers[b], self.materials[b], self.disc_face_r[b], thickness_m)
        self.pad_rows.write(self.rows, self.link_a, self.weights, b, terms)
        self.thickness[b] = thickness_m

    def advance(self, segment: PlanSegment, duty: SegmentDuty) -> None:
        """Solve one segment for every configuration still side by side."""
        phase = segment.phase
        schedule = segment_schedule(self.scenarios[0], self.designs[0], segment, duty)
        if phase.kind == "pit_stop":
            for b in self.live:
                if phase.pad_change or self.thickness[b] < phase.pad_change_below_m:
                    self._set_pad(b, self.designs[b].pad.thickness_m)
                    at = float(self.scenarios[b].ambient.temperature_at(segment.t_start_s))
                    self.T[b, list(self.pad_rows.pads) + [self.back]] = at
        grid, out_t = step_grid(self.net, schedule, self.settings, schedule.t_start_s, schedule.t_end_s, None)
        inputs = kernel_inputs(self.net, schedule, grid)
        record = np.zeros(grid.size, dtype=bool)
        record[np.searchsorted(grid, out_t)] = True
        energy = float(np.trapezoid(duty.disc_heat_w + duty.pad_heat_w, duty.time_s))
        weight = np.interp(out_t, schedule.time_s, duty.pad_heat_w)
        live = self.live
        first = 1 if self.segments_done else 0
        shapes: dict[bytes, list[int]] = {}
        for b in live:
            shapes.setdefault(self.link_a[b].tobytes(), []).append(int(b))
        # the tables pre-interpolated at this segment's constant boundary temperatures, once for all
        # configurations (the groups below change as pads wear; these depend only on the tables)
        sliced, slot_sliced, six = replace(self.template, tix=self.tix, par=self.rows["par"]).boundary_slices(inputs)
        for members in shapes.values():
            ix = np.array(members, dtype=np.int64)
            kn = replace(self.template, link_a=self.link_a[ix[0]].copy(), tix=np.ascontiguousarray(self.tix[ix]),
                         slices=(sliced, slot_sliced, np.ascontiguousarray(six[ix])),
                         **{name: np.ascontiguousarray(self.rows[name][ix]) for name in ROW_FIELDS})
            res = self._solve(kn, inputs, self.T[ix], record)
            for j, b in enumerate(members):
                temps = res.temps[j]
                if res.status[j] != kernel.STATUS_OK or not np.all((temps >= STATE_MIN_K) & (temps <= STATE_MAX_K)):
                    self.failed.add(b)
                    continue
                out = temps @ self.weights[b].T
                # as ``CornerRun`` stores them: a segment after the first starts at the row the last
                # one ended on, so its first row is not counted (after a pad change or wear it holds
                # the pad's new state at the same instant, which the run's series do not keep either)
                kept = out[first:]
                top = np.argmax(kept, axis=0)
                higher = kept[top, np.arange(kept.shape[1])] > self.peaks_k[b]
                self.peaks_k[b, higher] = kept[top[higher], np.flatnonzero(higher)]
                self.peak_time_s[b, higher] = out_t[first:][top[higher]]
                self.T[b] = res.final[j]
                self._wear(b, segment, temps, weight, energy)
        self.segments_done += 1

    def _solve(self, kn, inputs, T0: np.ndarray, record: np.ndarray):
        """One segment for the configurations of ``kn`` side by side in lanes, in the scheme the
        scenario asks for: full Newton (the default, ``brakeheat run``'s own scheme,
        ``thermo.solver.kernel_newton_lanes``), or with ``[solver] linearised = true`` the
        linearised scheme (``thermo.solver.kernel_lanes``). Either way a configuration gets the
        same numbers, to the bit, whatever runs beside it, and in full Newton those of
        ``kernel.advance`` on it alone. One process, one thread: a study's parallelism is its
        worker processes."""
        threads = numba.get_num_threads()
        numba.set_num_threads(1)
        try:
            if self.settings.linearised:
                return kn.run_laps(inputs, T0, 1, None, record, width=T0.shape[0], always_lanes=True)[0]
            return kn.run(inputs, T0, self.settings.rtol, self.settings.atol_k, record, lanes=True)
        finally:
            numba.set_num_threads(threads)

    def _wear(self, b: int, segment: PlanSegment, temps: np.ndarray, weight: np.ndarray, energy_lap: float) -> None:
        """``CornerRun._wear`` for configuration ``b``: the pad-heat weighted pad temperature sets the wear."""
        scenario = self.scenarios[b]
        if not (scenario.pad_wear.enabled and segment.moving and energy_lap > 0):
            return
        pads = self.pad_rows.pads
        pad_k = heat_weighted_pad_k(temps, self.weights[b][self.pad_rows.out_pad, pads], pads, weight)
        new = lap_wear(scenario, self.designs[b], self.thickness[b], energy_lap, pad_k)
        if new < self.thickness[b]:
            old_dx, pads = self.layers[b], self.pad_rows.pads
            self._set_pad(b, new)
            self.T[b, pads] = worn_pad_profile(old_dx, self.T[b, pads], self.layers[b])
