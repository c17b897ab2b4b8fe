"""One brake corner carried across the plan, segment by segment (``CornerRun``).

The run (``thermo.chain.run``) works out each segment's heat input once for every corner and
hands it to each corner's ``CornerRun.advance``; the corner solves the segment from its carried
state, wears its pad, changes pads at stops, keeps each lap's extremes and each link's energy,
and stores its series thinned to the output interval. ``CornerRun.result`` then makes the
``CornerResult``. Nothing of a segment is kept beyond the stored rows, so a run's memory grows
with the output interval, not with the solver's steps.
"""
from __future__ import annotations

import contextlib
import warnings
from dataclasses import dataclass, replace

import numpy as np

from thermo.chain.guards import WallClock, check_state_range
from thermo.chain.pad_rows import PadKernel
from thermo.chain.plan import PlanSegment
from thermo.chain.stint_call import Solved, solve_stint
from thermo.chain.stint_kernel import heat_weighted_pad_k
from thermo.chain.validity import check_validity
from thermo.corner.build import (
    SIGNAL_AMBIENT, SIGNAL_CLAMP, SIGNAL_DISC_HEAT, SIGNAL_DUCT_AIR, SIGNAL_PAD_HEAT, SIGNAL_SPEED, CornerModel, build_corner,
    clamp_signal, duct_air_signals, pad_layers, worn_corner,
)
from thermo.corner.geometry import CornerDesign
from thermo.corner.layers import worn_pad_profile
from thermo.corner.pad_terms import pad_sources
from thermo.corner.pad_wear import worn_thickness_m
from thermo.correlations.validity import unchecked
from thermo.errors import SolveError
from thermo.limits import check_specs, evaluate_check, property_range_warnings
from thermo.materials import get_material
from thermo.network.assemble import compile_network
from thermo.network.elements import table_enthalpy
from thermo.network.schedule import Schedule
from thermo.network.tabulate import ConductanceGrid
from thermo.results import (
    CornerFacts, CornerResult, EnergyBalance, LapPadThickness, LapSpan, PhaseSpan, SeriesRows, StintPadThickness,
)
from thermo.scenario.model import Scenario
from thermo.solver.fast import run_compiled, step_grid
from thermo.solver.kernel_arrays import kernel_inputs, kernel_network_like, release_kernel_network
from thermo.solver.scipy_solve import solve_network
from thermo.solver.segments import output_grid

MIN_PAD_THICKNESS_M = 0.5e-3   # a pad worn this far is held here (and the run warns)
VALIDITY_SAMPLE_EVERY = 10     # every n-th output sample is checked against the correlations' ranges
STORE_CHOICES = ("standard", "full")


@dataclass(frozen=True)
class SegmentDuty:
    """Heat into one corner during one segment, on the segment's own time axis from 0."""

    time_s: np.ndarray
    disc_heat_w: np.ndarray
    pad_heat_w: np.ndarray
    speed_m_s: np.ndarray


def segment_schedule(scenario: Scenario, design: CornerDesign, segment: PlanSegment, duty: SegmentDuty) -> Schedule:
    """The corner network's inputs over one segment, on the run's time axis."""
    t = segment.t_start_s + duty.time_s
    ambient = scenario.ambient.temperature_at(t)
    signals = {SIGNAL_DISC_HEAT: duty.disc_heat_w, SIGNAL_PAD_HEAT: duty.pad_heat_w,
               SIGNAL_CLAMP: clamp_signal(duty.disc_heat_w + duty.pad_heat_w),
               SIGNAL_SPEED: duty.speed_m_s, SIGNAL_AMBIENT: ambient, SIGNAL_DUCT_AIR: ambient}
    for signal, rise in duct_air_signals(design):
        signals[signal] = ambient + rise
    return Schedule(t, signals)


def conductance_grid(scenario: Scenario) -> ConductanceGrid:
    """The tabulation grid spanning this scenario's air temperatures (ambient and duct air)."""
    if scenario.ambient.profile_s_k:
        temps = [t for _, t in scenario.ambient.profile_s_k]
        lo, hi = min(temps), max(temps)
    else:
        lo = hi = scenario.ambient.temperature_k
    rise = max((d.air_rise_k for c in scenario.corners for d in c.ducts), default=0.0)
    lo, hi = np.floor(lo - 5.0), np.ceil(hi + rise + 5.0)
    return ConductanceGrid(boundary_min_k=float(lo), boundary_max_k=float(max(hi, lo + 10.0)), boundary_step_k=5.0)


def output_interval_s(scenario: Scenario) -> float:
    """The stored series' interval [s]: 1 / ``[solver] output_hz`` where that is set, else
    ``[solver] output_s`` (0: every solver row)."""
    hz = scenario.solver.output_hz
    return 1.0 / hz if hz > 0 else scenario.solver.output_s


def lap_wear(scenario: Scenario, design: CornerDesign, thickness_m: float, energy_j: float, pad_k: float) -> float:
    """The pad's thickness after a lap of friction energy ``energy_j`` [J] at the heat-weighted pad
    temperature ``pad_k`` [K] (``thermo.corner.pad_wear``), held at ``MIN_PAD_THICKNESS_M`` [m]."""
    w = scenario.pad_wear
    return float(worn_thickness_m(thickness_m, w.wear_coefficient_m3_per_j, energy_j, 2 * design.pad.area_m2, pad_k,
                                  w.reference_temperature_k, w.temperature_scale_k, MIN_PAD_THICKNESS_M))


class CornerRun:
    """One corner solved segment by segment, carrying its state, with pad wear and pad changes.

    ``interval_s``: interval of the stored series (None: ``output_interval_s(scenario)``; 0: every
    solver row); the rows where a node reaches its extremes in a segment are always kept.
    ``store``: "standard" keeps each link's energy per lap and per phase; "full" also keeps every
    link's flow at every stored row, and every solver row. ``sink`` (only with store "full"): an
    object whose ``append(corner, node_names, link_names, link_groups, rows)`` takes every solver
    row of each segment as it is solved (``thermo.results.SeriesRows``; the results file written
    while the run goes, ``thermo.output.hdf5_stream``); the corner then keeps in memory only its
    series at the output interval, as with "standard". ``clock``: the run's time budget (None:
    a new one of ``[solver] wall_clock_limit_s``). Every node is checked against the model's
    physical range after each segment (``thermo.chain.guards``).

    With the 'fast' method on a compiled network (the default), every segment is solved on the
    corner's own kernel arrays (``PadKernel``): a worn or new pad writes its values into them, and
    the corner's model is made for the pad only where something reads it (a segment that leaves a
    conductance table, and the result). Otherwise the corner is rebuilt for each pad.
    """

    def __init__(self, scenario: Scenario, setup, *,
                 interval_s: float | None = None, store: str = "standard", clock: WallClock | None = None,
                 sink=None):
        """``setup``: the corner as ``thermo.chain.setup.corner_setup`` built it (design, model, compiled
        network, conductance grid, solver settings); the run starts from its network."""
        if store not in STORE_CHOICES:
            raise ValueError(f"store must be one of {STORE_CHOICES}, got {store!r}")
        if sink is not None and store != "full":
            raise ValueError("a series sink takes every solver row: it needs store 'full'")
        self.sink, self.streamed_rows, self._columns = sink, 0, None
        design = setup.design
        self.scenario, self.design, self.settings = scenario, design, setup.settings
        self.clock = WallClock(scenario.solver.wall_clock_limit_s) if clock is None else clock
        self.grid = setup.grid
        self.full = store == "full" and sink is None        # every row and the link flows kept in memory
        self.keeps_flows = store == "full"                  # in memory or streamed: the solves keep link flows
        self.interval_s = 0.0 if self.full else (output_interval_s(scenario) if interval_s is None else interval_s)
        self.pad_layer_count = len(pad_layers(design))   # kept as the pad wears, so the state maps node for node
        self.model, self.compiled = setup.model, setup.network
        self.layers = pad_layers(design)                 # the pad's layers now [m]
        self.pad_kernel = _pad_kernel(setup)
        self.pad_values = None      # the pad's values (PadTerms) when they are newer than self.model's
        self.pad_heat_table = get_material(design.pad.material).specific_heat_table
        names = self.model.network.node_names
        self.i_pads = [names.index(node) for node in self.model.pad_nodes]
        self.i_back = names.index("backing_plate")
        self.T = np.full(len(names), float(scenario.ambient.temperature_at(0.0)))
        self.T_initial = self.T.copy()
        self.thickness = design.pad.thickness_m
        self.h0 = self._enthalpy()
        self.times, self.temps, self.flows, self.speeds, self.powers = [], [], [], [], []
        self.link_energy = np.zeros(len(self.model.network.links))
        self.heat_in = self.lost = self.removed = self.direct_to_disc = 0.0
        self.laps, self.stint_thickness, self.warns, self.states, self.lap_thickness = [], [], [], [], []
        self.energy_by_phase: dict[int, np.ndarray] = {}
        self.warned: set = set()    # pad warnings given this stint ('near', 'below'); a pad change starts a new stint

    def _with_pad(self, thickness_m: float):
        """The corner with another pad thickness (conduction path and pad mass): a new pad exactly
        as ``build_corner(design)`` builds it, a worn one with the same number of layers. A worn pad
        takes only its new values into the corner already built (``worn_corner``; its kernel arrays
        keep their tables, ``kernel_network_like``) unless the pad's edges move to another layer. The
        network it replaces lets go of its kernel arrays at once (``release_kernel_network``)."""
        previous = getattr(self, "compiled", None)
        renewed = thickness_m == self.design.pad.thickness_m      # a new pad: the design's own layers
        built = None if previous is None or renewed else worn_corner(self.model, thickness_m)
        if built is None:
            design = self.design
            pad = design.pad if thickness_m == design.pad.thickness_m else replace(
                design.pad, thickness_m=thickness_m, layers=self.pad_layer_count)
            built = build_corner(replace(design, pad=pad), self.scenario.ambient.pressure_pa, self.grid)
        compiled = compile_network(built.network)
        if previous is not None:
            kernel_network_like(previous, compiled)
            release_kernel_network(previous)
        return built, compiled

    def _set_pad(self, thickness_m: float) -> None:
        """The pad at ``thickness_m``: a new one (the design's thickness) in the design's own layers, a
        worn one in as many layers; its values written into the kernel's arrays, or the corner
        rebuilt where there are none (``_with_pad``)."""
        renewed = thickness_m == self.design.pad.thickness_m
        self.layers = pad_layers(self.design) if renewed else pad_layers(self.design, thickness_m, self.pad_layer_count)
        if self.pad_kernel is None:
            self.model, self.compiled = self._with_pad(thickness_m)
        else:
            self.pad_values = self.pad_kernel.set_pad(self.design, thickness_m, self.layers)
        self.thickness = thickness_m

    def _current_model(self) -> None:
        """Make ``self.model`` and ``self.compiled`` those of the pad now (after pads took their values
        in the kernel's arrays only)."""
        if self.pad_values is not None:
            self.model, self.compiled = self._with_pad(self.thickness)
            self.pad_values = None

    def _output_weights(self) -> np.ndarray:
        return self.model.output_weights if self.pad_kernel is None else self.pad_kernel.output_weights

    def _enthalpy(self, index=None, pad_masses_kg=None, T=None) -> float:
        """Stored heat of the nodes ``index`` (None: all) relative to 20 degC [J], at ``T`` (None: the
        state now), the pad's layers at ``pad_masses_kg`` (None: their masses now)."""
        nodes = self.model.network.nodes
        index = range(len(nodes)) if index is None else index
        T = self.T if T is None else T
        masses = self.pad_values.masses_kg if pad_masses_kg is None and self.pad_values is not None else pad_masses_kg
        if masses is None:
            return sum(nodes[k].heat_capacity.enthalpy(T[k]) for k in index)
        # every pad layer at once: elementwise the same arithmetic as one layer at a time
        pads = dict(zip(self.i_pads, table_enthalpy(masses, *self.pad_heat_table, T[self.i_pads])))
        return sum(pads[k] if k in pads else nodes[k].heat_capacity.enthalpy(T[k]) for k in index)

    def _direct_share(self, direct: float | None = None) -> float:
        """Share of the friction heat the sources put straight into the disc's face layer [-]: with
        the pad now, or with an interface share ``direct`` (``PadTerms.direct_disc_share``)."""
        model, values = self.model, self.pad_values
        if direct is None and values is None:
            return _direct_share(model)
        sources = pad_sources(model.disc_face_node, model.pad_nodes[0], values.direct_disc_share if direct is None else direct,
                              (SIGNAL_DISC_HEAT, SIGNAL_PAD_HEAT))
        return _direct_share_of(sources, model.disc_face_node, model.heat_partition)

    def _change_pads(self, segment: PlanSegment) -> None:
        self.stint_thickness.append((segment.phase.name, self.thickness))
        replaced = (*self.i_pads, self.i_back)
        old = self._enthalpy(replaced)
        self._set_pad(self.design.pad.thickness_m)
        self.T[list(replaced)] = float(self.scenario.ambient.temperature_at(segment.t_start_s))
        self.removed += old - self._enthalpy(replaced)
        self.warned.clear()

    def _solve(self, schedule: Schedule, phase: str):
        """One segment from the carried state: on the corner's own kernel arrays where it has them,
        else (or when the state leaves a conductance table) by ``solve_network`` on the model."""
        settings = self.settings
        if self.pad_kernel is not None:
            a, b = schedule.t_start_s, schedule.t_end_s
            out_t = None if settings.max_stride > 1 else output_grid(schedule, a, b)
            grid, out_t = step_grid(self.compiled, schedule, settings, a, b, out_t)
            inputs = kernel_inputs(self.compiled, schedule, grid)
            res = run_compiled(self.pad_kernel.network, inputs, self.T, settings, out_t, phase)
            if res is not None:
                energy = res.link_energy[0]
                rows = np.searchsorted(grid, out_t)         # the output times are grid points
                return Solved(out_t, res.temps[0], res.flows[0], energy, float(res.heat_in[0]),
                               float(np.sum(energy[self.compiled.link_to_boundary], axis=-1)), res.final[0],
                               inputs.bk_grid[rows], inputs.drv_grid[rows])
            self._current_model()       # off the tables: the model's own functions, in the numpy stepper
        with _quietly(settings.method):
            sol = solve_network(self.compiled, schedule, self.T, settings, phase=phase)
        if sol.status != "success":
            raise SolveError(f"{phase}: {sol.status}")
        return sol

    def advance(self, segment: PlanSegment, duty: SegmentDuty) -> None:
        """Solve one segment from the carried state and keep what the result needs."""
        phase = segment.phase
        if phase.kind == "pit_stop" and (phase.pad_change or self.thickness < phase.pad_change_below_m):
            self._change_pads(segment)
        schedule = segment_schedule(self.scenario, self.design, segment, duty)
        sol = self._solve(schedule, f"corner {self.design.name}, {_phase_name(segment)}")
        energy_lap = lap_energy_j(duty)
        self._keep(segment, duty, schedule, sol, self._output_weights(), self._direct_share(), energy_lap)
        if self.scenario.pad_wear.enabled and segment.moving and energy_lap > 0:
            self._wear(segment, duty, schedule, sol, energy_lap)
        if segment.lap_index:
            self.lap_thickness.append({"lap": segment.lap_index, "thickness_m": self.thickness})

    def advance_laps(self, segments, duties) -> None:
        """``advance`` through consecutive driven segments (no stop between them, so no pad change),
        with their ``SegmentDuty`` each: on the corner's kernel arrays by full Newton, every lap in one
        compiled call with the pad worn between laps (``thermo.chain.stint_call``); a lap that leaves a
        conductance table, and every lap of a corner that does not run compiled, one at a time."""
        if any(not s.moving for s in segments):
            raise ValueError("advance_laps takes driven segments only (a stop may change the pads)")
        done = 0
        while done < len(segments):
            if self.pad_kernel is not None and not self.settings.linearised:
                laps, stopped = self._advance_stint(segments[done:], duties[done:])
                done += laps
                if not stopped:
                    continue
            self.advance(segments[done], duties[done])
            done += 1

    def _advance_stint(self, segments, duties) -> tuple[int, bool]:
        """Laps in one compiled call (``stint_call.solve_stint``), then what the result keeps of each,
        as ``advance`` keeps it; returns the number of laps done and whether the lap after them left
        a conductance table or failed (the caller then does that one by ``advance``)."""
        scenario, design = self.scenario, self.design
        energies = [lap_energy_j(duty) for duty in duties]
        call = solve_stint(self, [segment_schedule(scenario, design, s, d) for s, d in zip(segments, duties)], duties,
                           energies, MIN_PAD_THICKNESS_M)
        direct = call.direct_start
        masses = None if self.pad_values is None else self.pad_values.masses_kg
        thickness = self.thickness
        for k in range(call.laps_done):
            segment, duty = segments[k], duties[k]
            share = self._direct_share() if k == 0 else self._direct_share(call.pads.direct[k - 1] if direct is not None else None)
            self._keep(segment, duty, call.schedules[k], call.solved(k), call.pads.weights[k], share, energies[k])
            self.T = call.pads.state_k[k].copy()
            if call.pads.thickness_m[k] < thickness:        # the kernel wore the pad: what the worn slice took away
                new_masses = call.pads.masses_kg[k]
                self.removed += (self._enthalpy(self.i_pads, masses, call.result.final[k])
                                 - self._enthalpy(self.i_pads, new_masses, self.T))
                masses, thickness = new_masses, float(call.pads.thickness_m[k])
                self.warns += _pad_warnings(design, scenario.pad_wear.warn_margin_m, thickness, segment.lap_index,
                                            self.warned)
            if segment.lap_index:
                self.lap_thickness.append({"lap": segment.lap_index, "thickness_m": thickness})
        if thickness != self.thickness:
            self._set_pad(thickness)        # the same values the kernel wrote, and the pad's PadTerms
        return call.laps_done, call.stopped

    def _keep(self, segment: PlanSegment, duty: SegmentDuty, schedule: Schedule, sol, weights: np.ndarray,
              direct_share: float, energy_lap: float) -> np.ndarray:
        """Keep what the result needs of a solved segment ``sol`` (its series through ``weights``, the
        pad's output weights it was solved with; ``direct_share``, ``_direct_share`` of its pad; its
        friction energy [J]), and carry its end state; returns its output series."""
        design, model, phase = self.design, self.model, segment.phase
        phase_name = _phase_name(segment)
        check_state_range(design.name, phase_name, model.network.node_names, sol.time_s, sol.temperatures_k)
        self.clock.check(f"corner {design.name}, {phase_name}")
        out = sol.temperatures_k @ weights.T
        keep = stored_rows(sol.time_s, out, self.interval_s, continues=bool(self.times))
        self.times.append(sol.time_s[keep])
        self.temps.append(out[keep])
        speed, power = _speed_and_power(duty, sol.time_s[keep] - segment.t_start_s)
        self.speeds.append(speed)
        self.powers.append(power)
        if self.full:
            self.flows.append(sol.link_flows_w[keep])
        if self.sink is not None:
            self._stream(segment, duty, sol, out)
        self.link_energy += sol.link_energy_j
        previous = self.energy_by_phase.get(segment.phase_index)
        self.energy_by_phase[segment.phase_index] = sol.link_energy_j.copy() if previous is None else previous + sol.link_energy_j
        self.heat_in += sol.heat_in_j
        self.direct_to_disc += direct_share * sol.heat_in_j
        self.lost += sol.lost_j
        self.T = sol.final_k.copy()
        picks = slice(None, None, VALIDITY_SAMPLE_EVERY)
        if isinstance(sol, Solved):             # a stint call's rows: the values the kernel read there
            boundary_k, drivers = sol.boundary_k[picks], sol.drivers[picks]
        else:
            boundary_k, drivers = self.compiled.inputs_series(sol.time_s[picks], schedule)
        self.states.append((drivers[:, 0].copy() if drivers.shape[1] else np.zeros(len(boundary_k)),
                            sol.temperatures_k[picks].copy(), boundary_k))
        if segment.lap_index:
            self.laps.append(LapSpan(segment.lap_index, phase.name, float(sol.time_s[0]), float(sol.time_s[-1]),
                                     dict(zip(model.output_nodes, map(float, out.min(axis=0)))),
                                     dict(zip(model.output_nodes, map(float, out.max(axis=0)))), energy_lap,
                                     tuple(map(float, sol.link_energy_j))))
        return out

    def _stream(self, segment: PlanSegment, duty: SegmentDuty, sol, out: np.ndarray) -> None:
        """Every row of the segment to the sink (the first one only if none went before: it is the
        previous segment's last), as store "full" keeps them in memory."""
        rows = stored_rows(sol.time_s, out, 0.0, continues=self.streamed_rows > 0)
        if self._columns is None:          # the columns' names, the same for every segment
            links = self.model.network.links
            self._columns = (self.model.output_nodes, [link.name for link in links], [link.group for link in links])
        speed, power = _speed_and_power(duty, sol.time_s[rows] - segment.t_start_s)
        self.sink.append(self.design.name, *self._columns,
                         SeriesRows(sol.time_s[rows], out[rows], speed, power, sol.link_flows_w[rows]))
        self.streamed_rows += rows.size

    def _wear(self, segment, duty, schedule, sol, energy_lap: float) -> None:
        scenario, design = self.scenario, self.design
        pads = np.array(self.i_pads)
        pad_k = heat_weighted_pad_k(sol.temperatures_k, self._output_weights()[self.model.output_nodes.index("pad"), pads],
                                    pads, np.interp(sol.time_s, schedule.time_s, duty.pad_heat_w))
        new_thickness = lap_wear(scenario, design, self.thickness, energy_lap, pad_k)
        if new_thickness < self.thickness:
            old_h = self._enthalpy(self.i_pads)
            old_dx = self.layers
            self._set_pad(new_thickness)
            # the wear takes the friction face: the rest keeps its temperature at its depth
            # from the backing plate, and the worn slice leaves with the face's heat
            self.T[self.i_pads] = worn_pad_profile(old_dx, self.T[self.i_pads], self.layers)
            self.removed += old_h - self._enthalpy(self.i_pads)
            self.warns += _pad_warnings(design, scenario.pad_wear.warn_margin_m, new_thickness, segment.lap_index,
                                        self.warned)

    def result(self, segments) -> CornerResult:
        """The corner's results over the segments it advanced through (in order); the network lets
        go of its kernel arrays (``release_kernel_network``): the run is over."""
        self._current_model()
        scenario, design, model = self.scenario, self.design, self.model
        stint_thickness = self.stint_thickness + [("end of run", self.thickness)]
        validity_lines, used = check_validity(model.network, self.states, design.name)
        warns = design.alignment_warnings() + self.warns + validity_lines
        time_s = np.concatenate(self.times)
        energy = EnergyBalance(self.heat_in, self._enthalpy() - self.h0, self.lost + self.removed)
        temps_all = np.concatenate(self.temps)
        node_index = {n: i for i, n in enumerate(model.output_nodes)}
        node_materials = output_node_materials(design, model)
        specs = corner_check_specs(scenario, design, model)
        warns += property_range_warnings(design.name, node_materials,
                                         {n: float(temps_all[:, i].max()) for n, i in node_index.items() if n in node_materials})
        checks = tuple(evaluate_check(s, time_s, temps_all[:, node_index[s.node]]) for s in specs)
        stop = next((s.t_start_s for s in segments if s.phase.kind == "soak"), None)
        facts = CornerFacts(
            pad_thickness_m=tuple(StintPadThickness(w, th) for w, th in stint_thickness),
            pad_thickness_by_lap_m=tuple(LapPadThickness(row["lap"], row["thickness_m"]) for row in self.lap_thickness),
            pad_minimum_thickness_m=design.pad.minimum_thickness_m,
            link_to_boundary=tuple(link.b in model.network.boundary_names for link in model.network.links),
            heat_partition_disc=model.heat_partition,
            heat_partition_realised=_realised_partition(model, self.heat_in, self.direct_to_disc, self.link_energy),
            removed_with_pad_material_j=self.removed, initial_temperature_k=float(self.T_initial[0]),
            warnings=tuple(warns), correlations_used=tuple(sorted(used)))
        links = model.network.links
        release_kernel_network(self.compiled)
        return CornerResult(
            name=design.name, node_names=model.output_nodes, time_s=time_s, temperatures_k=temps_all,
            link_names=tuple(link.name for link in links), link_groups=tuple(link.group for link in links),
            link_flows_w=np.concatenate(self.flows) if self.full else None, link_energy_j=self.link_energy,
            energy=energy, checks=checks, laps=tuple(self.laps), phases=_phase_spans(segments, self.energy_by_phase),
            stop_time_s=stop, facts=facts, speed_m_s=np.concatenate(self.speeds),
            brake_power_w=np.concatenate(self.powers))


def lap_energy_j(duty: SegmentDuty) -> float:
    """The friction energy into the corner over a segment [J]."""
    return float(np.trapezoid(duty.disc_heat_w + duty.pad_heat_w, duty.time_s))


def _phase_name(segment: PlanSegment) -> str:
    return segment.phase.name + (f" lap {segment.lap_index}" if segment.lap_index else "")


@contextlib.contextmanager
def _quietly(method: str):
    """A segment solved on the model's own functions, its correlations unchecked (validity is
    checked afterwards on the run's states, ``check_validity``): ``unchecked``, this thread only, as
    corners on method 'fast' may be solved side by side; a scipy method (never beside another
    corner, ``run.corner_threads``) with every warning of its integrators silenced as well."""
    with unchecked():
        if method == "fast":
            yield
            return
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            yield


def stored_rows(time_s: np.ndarray, outputs: np.ndarray, interval_s: float, continues: bool = False) -> np.ndarray:
    """Indices of the rows of one segment to store: all of them (``interval_s`` 0), else the first
    row at or after each ``interval_s`` step, the segment's ends, and every row where an output
    node reaches its maximum or minimum in the segment, so that thinning the stored series never
    moves a peak, a margin or a lap's extremes.

    ``continues``: the segment follows one already stored, whose last row is at this one's first
    instant, so the first row is not stored again, and the extremes are those of the rows after it
    (after a pad change or wear the first row holds the pad's new state at that same instant,
    which the series do not keep; the peak of what follows must not be thinned away)."""
    n = len(time_s)
    skip = 1 if continues else 0
    if interval_s <= 0 or n <= 2:
        return np.arange(skip, n)
    slot = np.floor(np.asarray(time_s) / interval_s + 1e-9)
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    keep[1:] |= slot[1:] != slot[:-1]
    keep[skip + np.argmax(outputs[skip:], axis=0)] = True
    keep[skip + np.argmin(outputs[skip:], axis=0)] = True
    return np.flatnonzero(keep[skip:]) + skip


def _speed_and_power(duty: SegmentDuty, local_s: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The car's speed [m/s] and the friction heat into the corner [W] at ``local_s``, the
    segment's own time axis [s]."""
    return (np.interp(local_s, duty.time_s, duty.speed_m_s),
            np.interp(local_s, duty.time_s, duty.disc_heat_w + duty.pad_heat_w))


def _direct_share(model: CornerModel) -> float:
    """Share of the friction heat the sources put straight into the disc's face layer [-]; the duty
    splits it into disc_heat_w (share heat_partition) and pad_heat_w."""
    return _direct_share_of(model.network.sources, model.disc_face_node, model.heat_partition)


def _direct_share_of(sources, face_node: str, heat_partition: float) -> float:
    """``_direct_share`` of the heat ``sources`` (``HeatSource``) of a corner [-]."""
    signal_share = {SIGNAL_DISC_HEAT: heat_partition, SIGNAL_PAD_HEAT: 1.0 - heat_partition}
    return sum(s.fraction * signal_share[s.signal] for s in sources if s.node == face_node)


def _pad_kernel(setup) -> PadKernel | None:
    """The corner's own kernel arrays for a run by the 'fast' method with the analytic Jacobian, or None
    (another method, a network that does not run compiled, a friction heat split otherwise)."""
    settings = setup.settings
    if settings.method != "fast" or not settings.use_jacobian:
        return None
    try:
        return PadKernel(setup.network, setup.model)
    except ValueError:
        return None


def _realised_partition(model: CornerModel, heat_in_j: float, direct_j: float, link_energy_j: np.ndarray) -> float:
    """Share of the run's friction heat that ended up in the disc: what the sources put into its
    face layer (summed segment by segment) plus what crossed the pad-disc interface (pad to disc
    positive) [-]."""
    if heat_in_j <= 0:
        return float(model.heat_partition)
    names = model.network.link_names
    crossed = float(sum(link_energy_j[names.index(name)] for name in ("pad_disc_interface", "pad_disc_interface_clamped")
                        if name in names))
    return float((direct_j + crossed) / heat_in_j)


def output_node_materials(design: CornerDesign, model: CornerModel) -> dict:
    """The Material of each output node that a material check or data-range warning reads."""
    return {node: get_material(name) for node, name in _node_materials(design, model).items()
            if node in model.output_nodes}


def corner_check_specs(scenario: Scenario, design: CornerDesign, model: CornerModel) -> tuple:
    """The limit checks of one corner (``thermo.limits.check_specs``) on the nodes this model has:
    the disc's face where it is layered, the fluid at the pistons, each material's service limit."""
    return check_specs(scenario.fluid, scenario.limits, model.disc_check_node, fluid_node=model.fluid_check_node,
                       node_materials=output_node_materials(design, model))


def _node_materials(design: CornerDesign, model: CornerModel) -> dict[str, str]:
    """The material of each output node a material check or data-range warning reads."""
    # the pad's face is the interface (the disc's face temperature): the pad maker's window is read
    # on the pad bulk (pad_max), so the face gets no material check of its own
    out = {"disc": design.disc.material, model.disc_check_node: design.disc.material, "pad": design.pad.material,
           "backing_plate": design.pad.backing_material,
           "piston": design.piston.material, "caliper": design.caliper.material, "hub": design.hub.hub_material,
           "bearing": design.hub.bearing_material, "upright": design.hub.upright_material,
           "disc_bell": design.disc.bell_material, "fluid_at_piston": design.fluid_material, "fluid": design.fluid_material}
    return out


def _pad_warnings(design: CornerDesign, margin_m: float, thickness_m: float, lap: int, warned: set) -> list[str]:
    """Warnings, each once per stint, when a worn pad comes within ``margin_m`` of its minimum and when below it."""
    minimum = design.pad.minimum_thickness_m
    out = []
    if 0.0 <= thickness_m - minimum < margin_m and "near" not in warned:
        warned.add("near")
        out.append(f"corner {design.name}: pad down to {thickness_m * 1e3:.1f} mm on lap {lap}, within "
                   f"{margin_m * 1e3:.1f} mm of its minimum {minimum * 1e3:.1f} mm")
    if thickness_m < minimum and "below" not in warned:
        warned.update(("near", "below"))
        held = " (held there)" if thickness_m <= MIN_PAD_THICKNESS_M else ""
        out.append(f"corner {design.name}: pad worn to {thickness_m * 1e3:.1f} mm{held} on lap {lap}, below its "
                   f"minimum {minimum * 1e3:.1f} mm")
    return out


def _phase_spans(segments, energy_by_phase: dict) -> tuple[PhaseSpan, ...]:
    """One span per plan phase, from its first segment's start to its last segment's end, with
    the heat each link carried in it."""
    first: dict[int, PlanSegment] = {}
    last: dict[int, PlanSegment] = {}
    for seg in segments:
        first.setdefault(seg.phase_index, seg)
        last[seg.phase_index] = seg
    return tuple(PhaseSpan(first[i].phase.name, first[i].phase.kind, first[i].t_start_s, last[i].t_end_s,
                           tuple(map(float, energy_by_phase[i])) if i in energy_by_phase else None) for i in first)
