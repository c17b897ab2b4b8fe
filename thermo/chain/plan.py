"""Expand a scenario's plan into segments on one time axis: each lap, each stop, the soak."""
from __future__ import annotations

from dataclasses import dataclass

from lapdata.errors import LapDataError
from lapdata.laps import limit_speed_over_distance, paced, stationary
from lapdata.reader import read_trace_csv
from lapdata.track import build_speed_trace, read_track_toml
from lapdata.trace import LapTrace
from thermo.errors import ScenarioError
from thermo.scenario.model import Phase, Scenario


@dataclass(frozen=True)
class PlanSegment:
    """One lap or one stationary stretch of the plan.

    ``t_start_s`` is on the run's time axis; ``trace`` starts at its own time 0. ``fuel_kg`` is the
    fuel on board during the segment; ``lap_index`` counts laps over the run from 1 (0 for a stop).
    """

    phase: Phase
    phase_index: int
    lap_index: int
    t_start_s: float
    trace: LapTrace
    fuel_kg: float

    @property
    def t_end_s(self) -> float:
        return self.t_start_s + self.trace.duration_s

    @property
    def moving(self) -> bool:
        return self.phase.driving


def base_lap(scenario: Scenario) -> LapTrace:
    """The race lap at full pace: built from the track description or read from the logged trace."""
    plan = scenario.plan
    if plan.lap_source == "track":
        track = read_track_toml(plan.lap_path)
        return build_speed_trace(track, scenario.envelope, sample_hz=plan.sample_hz)
    return _read_lap(scenario, plan.lap_path)


def _read_lap(scenario: Scenario, path) -> LapTrace:
    """A logged lap CSV, checked for what the scenario's power method needs."""
    trace = read_trace_csv(path, repair=scenario.plan.repair_trace)
    if scenario.power_method == "pressure" and not trace.has_pressure:
        raise LapDataError(f"{path}: [brakes] power_method = \"pressure\" needs pressure_front and "
                           "pressure_rear columns in the trace")
    return trace


def _lap_for(phase: Phase, lap: LapTrace, sample_hz: float) -> LapTrace:
    trace = paced(_zero_based(lap), phase.pace)
    if phase.kind in ("in_lap", "out_lap") and phase.pit_lane_length_m > 0:
        length = trace.length_m
        start, end = (length - phase.pit_lane_length_m, length) if phase.kind == "in_lap" else (0.0, phase.pit_lane_length_m)
        trace = limit_speed_over_distance(trace, start, end, phase.pit_lane_speed_m_s, sample_hz=sample_hz)
    return trace


def _zero_based(trace: LapTrace) -> LapTrace:
    from dataclasses import replace
    return replace(trace, time_s=trace.time_s - trace.time_s[0], distance_m=trace.distance_m - trace.distance_m[0])


MAX_PLAN_S = 48 * 3600.0          # the longest plan: a 24-hour race twice over, soak included
MAX_PLAN_SAMPLES = 20_000_000     # input samples of the whole plan (a 24-hour race at 20 Hz is ~1.7 million)


def _check_plan_size(scenario: Scenario, phase, t_s: float, samples: int) -> None:
    """A plan too long to simulate is an input error, found before any memory is taken for it."""
    if t_s > MAX_PLAN_S:
        raise ScenarioError(f"{scenario.path}: [plan] simulates more than {MAX_PLAN_S / 3600:g} h by phase "
                            f"'{phase.name}' ({t_s / 3600:.1f} h so far); check the lap counts and durations")
    if samples > MAX_PLAN_SAMPLES:
        raise ScenarioError(f"{scenario.path}: [plan] needs more than {MAX_PLAN_SAMPLES:,} samples by phase "
                            f"'{phase.name}'; lower sample_hz or the lap counts")


def expand_plan(scenario: Scenario, lap: LapTrace | None = None) -> tuple[PlanSegment, ...]:
    """Segments of the whole plan, in order, with the fuel on board in each.

    Fuel burns at the scenario's consumption per lap, scaled by the phase pace (a slower lap uses
    less); a pit stop refuels (capped at the tank capacity). Running dry is an error naming the lap.
    """
    lap = base_lap(scenario) if lap is None else lap
    if scenario.power_method == "pressure" and any(ph.kind in ("in_lap", "out_lap") and ph.pit_lane_length_m > 0
                                                    for ph in scenario.plan.phases):
        raise ScenarioError(f"{scenario.path}: power_method = \"pressure\" cannot re-time in/out laps for a pit "
                            "lane; set pit_lane_length_m = 0 for those phases")
    cache: dict[tuple, LapTrace] = {}
    own_laps: dict = {}
    segments, t, fuel, lap_no, samples = [], 0.0, scenario.vehicle.fuel_kg, 0, 0
    for p_index, phase in enumerate(scenario.plan.phases):
        if phase.driving:
            key = (phase.kind, phase.pace, phase.pit_lane_length_m, phase.pit_lane_speed_m_s, phase.trace)
            if key not in cache:
                base = lap
                if phase.trace is not None:
                    if phase.trace not in own_laps:
                        own_laps[phase.trace] = _read_lap(scenario, phase.trace)
                    base = own_laps[phase.trace]
                cache[key] = _lap_for(phase, base, scenario.plan.sample_hz)
            trace = cache[key]
            for _ in range(phase.count):
                lap_no += 1
                segments.append(PlanSegment(phase, p_index, lap_no, t, trace, fuel))
                t += trace.duration_s
                samples += trace.time_s.size
                _check_plan_size(scenario, phase, t, samples)
                fuel -= scenario.fuel_consumption_kg_per_lap * phase.pace
                if fuel < -1e-9:
                    raise ScenarioError(f"{scenario.path}: the fuel runs out on lap {lap_no} ({phase.name}); "
                                        "add fuel_kg or a pit stop with refuel_kg")
                fuel = max(fuel, 0.0)
        else:
            trace = stationary(phase.duration_s, scenario.plan.soak_sample_s if phase.kind == "soak"
                               else min(scenario.plan.soak_sample_s, 0.5), phase.name)
            if phase.kind == "pit_stop":
                fuel = min(fuel + phase.refuel_kg, scenario.fuel_capacity_kg)
            segments.append(PlanSegment(phase, p_index, 0, t, trace, fuel))
            t += trace.duration_s
            samples += trace.time_s.size
            _check_plan_size(scenario, phase, t, samples)
    return tuple(segments)
