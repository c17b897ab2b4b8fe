"""Run a scenario: heat per corner for each segment, the corner network solved across the plan."""
from __future__ import annotations

import warnings
from dataclasses import dataclass, replace

import numpy as np

import thermo
from thermo.chain.guards import WallClock, check_state_range
from thermo.chain.plan import PlanSegment, expand_plan
from thermo.chain.validity import check_validity
from thermo.corner.build import (
    SIGNAL_AMBIENT, SIGNAL_CLAMP, SIGNAL_DISC_HEAT, SIGNAL_DUCT_AIR, SIGNAL_PAD_HEAT, SIGNAL_SPEED, CornerModel, build_corner,
    clamp_signal, duct_air_signals, heat_partition, materials_used, pad_layers,
)
from thermo.corner.geometry import CornerDesign
from thermo.correlations import correlation_reference
from thermo.duty.corner_duty import CornerBrake, corner_heat_inputs
from thermo.errors import SolveError
from thermo.limits import check_specs, evaluate_check, property_range_warnings
from thermo.materials import get_material
from thermo.network.assemble import compile_network
from thermo.network.schedule import Schedule
from thermo.network.tabulate import ConductanceGrid
from thermo.results import CornerResult, EnergyBalance, LapSpan, PhaseSpan, Results
from thermo.scenario.model import Scenario
from thermo.scenario.toml_text import toml_value_text
from thermo.solver.scipy_solve import solve_network
from thermo.solver.settings import SolverSettings

MIN_PAD_THICKNESS_M = 0.5e-3   # a pad worn this far is held here (and the run warns)
VALIDITY_SAMPLE_EVERY = 10     # every n-th output sample is checked against the correlations' ranges


@dataclass(frozen=True)
class SegmentDuty:
    """Heat into one corner during one segment, on the segment's own time axis from 0."""

    time_s: np.ndarray
    disc_heat_w: np.ndarray
    pad_heat_w: np.ndarray
    speed_m_s: np.ndarray


def corner_brakes(scenario: Scenario) -> list[CornerBrake]:
    """The duty step's view of each corner (an axle corner stands for its left wheel); the heat
    partition comes from each design, without building its network."""
    brakes = []
    for design in scenario.corners:
        side = design.name.split("_")[1] if "_" in design.name else "left"
        brakes.append(CornerBrake(
            name=design.name, axle=design.axle, side=side, partition=heat_partition(design),
            piston_area_one_side_m2=design.piston.area_one_side_m2, pad_mu=design.pad_mu,
            effective_radius_m=design.effective_radius_m, rolling_radius_m=design.rolling_radius_m))
    return brakes


def corner_duties(scenario: Scenario, segment: PlanSegment, brakes: list[CornerBrake]) -> dict[str, SegmentDuty]:
    """Heat into each corner's disc and pad during one segment [W]."""
    trace = segment.trace
    if not segment.moving:
        zeros = np.zeros_like(trace.time_s)
        return {b.name: SegmentDuty(trace.time_s, zeros, zeros, zeros) for b in brakes}
    vehicle = scenario.vehicle.with_fuel(segment.fuel_kg)
    if scenario.power_method == "pressure":
        duties = corner_heat_inputs(trace.time_s, trace.speed_mps, vehicle, None, brakes, method="pressure",
                                    pressure_front_pa=trace.pressure_front_pa, pressure_rear_pa=trace.pressure_rear_pa)
    else:
        duties = corner_heat_inputs(trace.time_s, trace.speed_mps, vehicle, scenario.bias, brakes,
                                    left_share_front=scenario.left_share_front, left_share_rear=scenario.left_share_rear)
    return {name: SegmentDuty(d.time_s, np.asarray(d.disc_heat_w), np.asarray(d.pad_heat_w), np.asarray(d.vehicle_speed_mps))
            for name, d in duties.items()}


def _schedule(scenario: Scenario, design: CornerDesign, segment: PlanSegment, duty: SegmentDuty) -> Schedule:
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


def _wear_factor(scenario: Scenario, pad_k: float) -> float:
    w = scenario.pad_wear
    return float(np.exp(max(pad_k - w.reference_temperature_k, 0.0) / w.temperature_scale_k))


def solve_corner(scenario: Scenario, design: CornerDesign, segments, duties_by_segment, settings: SolverSettings,
                 progress=None, output_hz: float | None = None, clock: WallClock | None = None) -> CornerResult:
    """Solve one corner across all segments, carrying its state, with pad wear and pad changes.

    ``output_hz``: rate of the stored series (None: the scenario's ``[solver] output_hz``; 0: every row).
    ``clock``: the run's time budget (None: a new one of ``[solver] wall_clock_limit_s``). Every node
    is checked against the model's physical range after each segment (``thermo.chain.guards``).
    """
    clock = WallClock(scenario.solver.wall_clock_limit_s) if clock is None else clock
    grid = conductance_grid(scenario)
    rate = scenario.solver.output_hz if output_hz is None else output_hz
    pad_layer_count = len(pad_layers(design))     # kept as the pad wears, so the state maps node for node

    def with_pad(thickness_m: float):
        """The corner rebuilt with another pad thickness (conduction path and pad mass): a new pad
        exactly as ``build_corner(design)`` builds it, a worn one with the same number of layers."""
        pad = design.pad if thickness_m == design.pad.thickness_m else replace(
            design.pad, thickness_m=thickness_m, layers=pad_layer_count)
        built = build_corner(replace(design, pad=pad), scenario.ambient.pressure_pa, grid)
        return built, compile_network(built.network)

    model, compiled = with_pad(design.pad.thickness_m)
    names = model.network.node_names
    i_pads = [names.index(node) for node in model.pad_nodes]     # the pad layers keep their count as the pad wears
    i_back = names.index("backing_plate")
    T = np.full(len(names), float(scenario.ambient.temperature_at(0.0)))
    T_initial = T.copy()
    thickness = design.pad.thickness_m
    h0 = sum(n.heat_capacity.enthalpy(T[k]) for k, n in enumerate(model.network.nodes))
    times, temps, flows, link_energy = [], [], [], np.zeros(len(model.network.links))
    heat_in = lost = removed = direct_to_disc = 0.0
    laps, stint_thickness, warns, states, lap_thickness = [], [], [], [], []
    warned = set()     # pad warnings given this stint ('near', 'below'); a pad change starts a new stint
    for segment, duties in zip(segments, duties_by_segment):
        duty = duties[design.name]
        if segment.phase.kind == "pit_stop" and (segment.phase.pad_change or thickness < segment.phase.pad_change_below_m):
            stint_thickness.append((segment.phase.name, thickness))
            old = [model.network.nodes[k].heat_capacity.enthalpy(T[k]) for k in (*i_pads, i_back)]
            thickness = design.pad.thickness_m
            model, compiled = with_pad(thickness)
            T[[*i_pads, i_back]] = float(scenario.ambient.temperature_at(segment.t_start_s))
            new = [model.network.nodes[k].heat_capacity.enthalpy(T[k]) for k in (*i_pads, i_back)]
            removed += sum(old) - sum(new)
            warned.clear()
        schedule = _schedule(scenario, design, segment, duty)
        phase_name = segment.phase.name + (f" lap {segment.lap_index}" if segment.lap_index else "")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            sol = solve_network(compiled, schedule, T, settings, phase=f"corner {design.name}, {phase_name}")
        if sol.status != "success":
            raise SolveError(f"corner {design.name}, {segment.phase.name}: {sol.status}")
        check_state_range(design.name, phase_name, names, sol.time_s, sol.temperatures_k)
        clock.check(f"corner {design.name}, {phase_name}")
        skip = 1 if times else 0
        out = model.outputs(sol.temperatures_k)
        keep = stored_rows(sol.time_s, out, rate)[skip:]
        times.append(sol.time_s[keep])
        temps.append(out[keep])
        flows.append(sol.link_flows_w[keep])
        link_energy += sol.link_energy_j
        heat_in += sol.heat_in_j
        direct_to_disc += _direct_share(model) * sol.heat_in_j
        lost += sol.lost_j
        T = sol.final_k.copy()
        picks = slice(None, None, VALIDITY_SAMPLE_EVERY)
        boundary_k, drivers = compiled.inputs_series(sol.time_s[picks], schedule)
        states.append((drivers[:, 0] if drivers.shape[1] else np.zeros(len(boundary_k)),
                       sol.temperatures_k[picks], boundary_k))
        energy_lap = float(np.trapezoid(duty.disc_heat_w + duty.pad_heat_w, duty.time_s))
        if segment.lap_index:
            laps.append(LapSpan(segment.lap_index, segment.phase.name, float(sol.time_s[0]), float(sol.time_s[-1]),
                                dict(zip(model.output_nodes, map(float, out.min(axis=0)))),
                                dict(zip(model.output_nodes, map(float, out.max(axis=0)))), energy_lap))
        if scenario.pad_wear.enabled and segment.moving and energy_lap > 0:
            pad_series = out[:, model.output_nodes.index("pad")]
            weight = np.interp(sol.time_s, schedule.time_s, duty.pad_heat_w)
            pad_k = float(np.sum(weight * pad_series) / max(np.sum(weight), 1e-12))
            wear = (scenario.pad_wear.wear_coefficient_m3_per_j * energy_lap / (2 * design.pad.area_m2)
                    * _wear_factor(scenario, pad_k))
            new_thickness = max(thickness - wear, MIN_PAD_THICKNESS_M)
            if new_thickness < thickness:
                old_h = sum(model.network.nodes[k].heat_capacity.enthalpy(T[k]) for k in i_pads)
                old_dx = pad_layers(model.design)
                model, compiled = with_pad(new_thickness)
                # the wear takes the friction face: the rest keeps its temperature at its depth
                # from the backing plate, and the worn slice leaves with the face's heat
                T[i_pads] = worn_pad_profile(old_dx, T[i_pads], pad_layers(model.design))
                removed += old_h - sum(model.network.nodes[k].heat_capacity.enthalpy(T[k]) for k in i_pads)
                warns += _pad_warnings(design, scenario.pad_wear.warn_margin_m, new_thickness, segment.lap_index, warned)
                thickness = new_thickness
        if segment.lap_index:
            lap_thickness.append({"lap": segment.lap_index, "thickness_m": thickness})
        if progress is not None:
            progress(design.name, segment)
    stint_thickness.append(("end of run", thickness))
    validity_lines, used = check_validity(model.network, states, design.name)
    warns += validity_lines
    h1 = sum(n.heat_capacity.enthalpy(T[k]) for k, n in enumerate(model.network.nodes))
    time_s = np.concatenate(times)
    stored = h1 - h0
    energy = EnergyBalance(heat_in, stored, lost + removed)
    temps_all = np.concatenate(temps)
    node_index = {n: i for i, n in enumerate(model.output_nodes)}
    node_materials = {node: get_material(name) for node, name in _node_materials(design, model).items()
                      if node in node_index}
    specs = check_specs(scenario.fluid, scenario.limits, model.disc_check_node, fluid_node=model.fluid_check_node,
                        node_materials=node_materials)
    warns += property_range_warnings(design.name, node_materials,
                                     {n: float(temps_all[:, i].max()) for n, i in node_index.items() if n in node_materials})
    checks = tuple(evaluate_check(s, time_s, temps_all[:, node_index[s.node]]) for s in specs)
    phases = _phase_spans(segments)
    stop = next((s.t_start_s for s in segments if s.phase.kind == "soak"), None)
    extras = {"pad_thickness_m": [{"when": w, "thickness_m": th} for w, th in stint_thickness],
              "pad_thickness_by_lap_m": lap_thickness,
              "pad_minimum_thickness_m": design.pad.minimum_thickness_m,
              "link_to_boundary": [link.b in model.network.boundary_names for link in model.network.links],
              "heat_partition_disc": model.heat_partition,
              "heat_partition_realised": _realised_partition(model, heat_in, direct_to_disc, link_energy),
              "removed_with_pad_material_j": removed,
              "initial_temperature_k": float(T_initial[0]),
              "warnings": warns,
              "correlations_used": sorted(used)}
    links = model.network.links
    return CornerResult(
        name=design.name, node_names=model.output_nodes, time_s=time_s, temperatures_k=temps_all,
        link_names=tuple(link.name for link in links), link_groups=tuple(link.group for link in links),
        link_flows_w=np.concatenate(flows), link_energy_j=link_energy, energy=energy, checks=checks,
        laps=tuple(laps), phases=phases, stop_time_s=stop, extras=extras)


def stored_rows(time_s: np.ndarray, outputs: np.ndarray, output_hz: float) -> np.ndarray:
    """Indices of the rows of one segment to store: all of them (``output_hz`` 0), else the first
    row at or after each 1/output_hz step, the segment's ends, and every row where an output node
    reaches its maximum or minimum in the segment, so that thinning the stored series never moves
    a peak, a margin or a lap's extremes."""
    n = len(time_s)
    if output_hz <= 0 or n <= 2:
        return np.arange(n)
    slot = np.floor(np.asarray(time_s) * output_hz + 1e-9)
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    keep[1:] |= slot[1:] != slot[:-1]
    keep[np.argmax(outputs, axis=0)] = True
    keep[np.argmin(outputs, axis=0)] = True
    return np.flatnonzero(keep)


def worn_pad_profile(old_dx_m: np.ndarray, old_t_k: np.ndarray, new_dx_m: np.ndarray) -> np.ndarray:
    """Pad layer temperatures after wear [K]: each new layer centre takes the old profile's
    temperature at the same depth from the backing plate (linear between old centres), so the
    material worn off the friction face takes the face's heat with it."""
    def from_back(dx):
        return dx.sum() - (np.cumsum(dx) - dx / 2)          # face first, so decreasing
    old_x, new_x = from_back(np.asarray(old_dx_m)), from_back(np.asarray(new_dx_m))
    return np.interp(new_x, old_x[::-1], np.asarray(old_t_k)[::-1])


def _direct_share(model: CornerModel) -> float:
    """Share of the friction heat the sources put straight into the disc's face layer [-]; the duty
    splits it into disc_heat_w (share heat_partition) and pad_heat_w."""
    signal_share = {SIGNAL_DISC_HEAT: model.heat_partition, SIGNAL_PAD_HEAT: 1.0 - model.heat_partition}
    return sum(s.fraction * signal_share[s.signal] for s in model.network.sources if s.node == model.disc_face_node)


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
    if thickness_m - minimum < margin_m and "near" not in warned:
        warned.add("near")
        out.append(f"corner {design.name}: pad down to {thickness_m * 1e3:.1f} mm on lap {lap}, within "
                   f"{margin_m * 1e3:.1f} mm of its minimum {minimum * 1e3:.1f} mm")
    if thickness_m < minimum and "below" not in warned:
        warned.add("below")
        held = " (held there)" if thickness_m <= MIN_PAD_THICKNESS_M else ""
        out.append(f"corner {design.name}: pad worn to {thickness_m * 1e3:.1f} mm{held} on lap {lap}, below its "
                   f"minimum {minimum * 1e3:.1f} mm")
    return out


def _phase_spans(segments) -> tuple[PhaseSpan, ...]:
    """One span per plan phase, from its first segment's start to its last segment's end."""
    first: dict[int, PlanSegment] = {}
    last: dict[int, PlanSegment] = {}
    for seg in segments:
        first.setdefault(seg.phase_index, seg)
        last[seg.phase_index] = seg
    return tuple(PhaseSpan(first[i].phase.name, first[i].phase.kind, first[i].t_start_s, last[i].t_end_s)
                 for i in first)


def references_for(scenario: Scenario, correlations_used) -> tuple[str, ...]:
    """Sources of the correlations and materials a run used, for the engineer who signs off."""
    names = set(correlations_used) | {"heat_partition_area_weighted", "effusivity",
                                      "radiation_coefficient_grey_two_surface", "radiation_coefficient_to_surroundings"}
    refs = [f"correlation {name}: {correlation_reference(name)}" for name in sorted(names)]
    materials = sorted({m for design in scenario.corners for m in materials_used(design)})
    for name in materials:
        mat = get_material(name)
        refs.append(f"material {name}: " + "; ".join(f"{k}: {v}" for k, v in sorted(mat.sources.items())))
    refs.append(f"fluid {scenario.fluid.name}: {scenario.fluid.source}")
    return tuple(refs)


def run_scenario(scenario: Scenario, *, progress=None, segments=None) -> Results:
    """The whole chain for every corner of a scenario."""
    segments = expand_plan(scenario) if segments is None else segments
    brakes = corner_brakes(scenario)
    duties = [corner_duties(scenario, seg, brakes) for seg in segments]
    settings = scenario.solver.settings()
    clock = WallClock(scenario.solver.wall_clock_limit_s)
    corners = tuple(solve_corner(scenario, d, segments, duties, settings, progress, clock=clock) for d in scenario.corners)
    run_warnings = tuple(w for c in corners for w in c.extras.get("warnings", []))
    return Results(
        scenario_name=scenario.name, scenario_text=scenario.text, version=thermo.__version__,
        solver=settings.method, solver_status="success", references=references_for(scenario, {n for c in corners for n in c.extras["correlations_used"]}),
        corners=corners, caution=thermo.CAUTION, warnings=run_warnings, overrides=applied_overrides(scenario))


def applied_overrides(scenario: Scenario) -> tuple[tuple[str, str], ...]:
    """The --set and variant overrides a run applied on top of its scenario text, as (dotted key,
    TOML value text), so that a result says which run it is. ``[calibrated]`` values are part of
    the text itself and are not repeated."""
    return tuple((str(key), toml_value_text(value)) for key, value in scenario.overrides)
