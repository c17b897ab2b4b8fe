"""Expand a scenario's plan into segments on one time axis: each lap, each stop, the soak."""
from __future__ import annotations

import functools
from dataclasses import dataclass, replace
from pathlib import Path

from lapdata.errors import LapDataError
from lapdata.laps import limit_speed_over_distance, paced, stationary
from lapdata.reader import read_trace_csv
from lapdata.track import build_speed_trace, read_track_toml
from lapdata.trace import LapTrace
from thermo.errors import ScenarioError
from thermo.scenario.model import Phase, Scenario, StintTemplate


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
    """The race lap at full pace: built from the track description or read from the logged trace.

    A built lap is kept for the next scenario with the same track file (same size and modification
    time), car envelope and sample rate: the points of a sweep usually share their lap, and
    building it is about a fifth of a one-stint run."""
    plan = scenario.plan
    if plan.lap_source == "track":
        stat = Path(plan.lap_path).stat()
        return _built_lap(str(plan.lap_path), stat.st_size, stat.st_mtime_ns, scenario.envelope, plan.sample_hz)
    return _read_lap(scenario, plan.lap_path)


@functools.lru_cache(maxsize=4)
def _built_lap(path: str, size: int, mtime_ns: int, envelope, sample_hz: float) -> LapTrace:
    """``base_lap`` of a track description (the file's size and time are part of the key, so an
    edited file is read again). Callers never change a trace in place (``paced`` and the plan make
    new ones)."""
    return build_speed_trace(read_track_toml(path), envelope, sample_hz=sample_hz)


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


def written_phases(plan) -> tuple[Phase, ...]:
    """Every phase as the scenario writes it, templates' phases once each, in run order."""
    return plan.phases + tuple(ph for stint in plan.stints for ph in stint.phases) + plan.finish


def stint_phase(template: StintTemplate, run: int, phase: Phase) -> Phase:
    """A template's phase in its ``run``-th repetition: named after the template and the run, with
    new pads at its pit stops when the run is a multiple of ``pad_change_every``."""
    change = phase.pad_change or (phase.kind == "pit_stop" and template.pad_change_every > 0
                                  and run % template.pad_change_every == 0)
    return replace(phase, name=f"{template.name} {run}: {phase.name}", pad_change=change)


class _Expansion:
    """The plan laid out segment by segment: the run clock, the fuel on board, the lap count."""

    def __init__(self, scenario: Scenario, lap: LapTrace):
        self.scenario, self.lap = scenario, lap
        self.cache: dict[tuple, LapTrace] = {}
        self.own_laps: dict = {}
        self.segments: list[PlanSegment] = []
        self.t, self.fuel, self.lap_no, self.samples, self.index = 0.0, scenario.vehicle.fuel_kg, 0, 0, -1

    def _lap_trace(self, phase: Phase) -> LapTrace:
        key = (phase.kind, phase.pace, phase.pit_lane_length_m, phase.pit_lane_speed_m_s, phase.trace)
        if key not in self.cache:
            base = self.lap
            if phase.trace is not None:
                if phase.trace not in self.own_laps:
                    self.own_laps[phase.trace] = _read_lap(self.scenario, phase.trace)
                base = self.own_laps[phase.trace]
            self.cache[key] = _lap_for(phase, base, self.scenario.plan.sample_hz)
        return self.cache[key]

    def _append(self, phase: Phase, lap_index: int, trace: LapTrace) -> None:
        self.segments.append(PlanSegment(phase, self.index, lap_index, self.t, trace, self.fuel))
        self.t += trace.duration_s
        self.samples += trace.time_s.size
        _check_plan_size(self.scenario, phase, self.t, self.samples)

    def add(self, phase: Phase, until_s: float = 0.0) -> bool:
        """Lay out one phase; True when the flag fell in it (a lap ended at or after ``until_s`` > 0),
        in which case its remaining laps are not run."""
        scenario = self.scenario
        self.index += 1
        if not phase.driving:
            trace = stationary(phase.duration_s, scenario.plan.soak_sample_s if phase.kind == "soak"
                               else min(scenario.plan.soak_sample_s, 0.5), phase.name)
            if phase.kind == "pit_stop":
                self.fuel = scenario.fuel_capacity_kg if phase.refuel_full else min(self.fuel + phase.refuel_kg,
                                                                                    scenario.fuel_capacity_kg)
            self._append(phase, 0, trace)
            return False
        trace = self._lap_trace(phase)
        for _ in range(phase.count):
            self.lap_no += 1
            self._append(phase, self.lap_no, trace)
            self.fuel -= scenario.fuel_consumption_kg_per_lap * phase.pace
            if self.fuel < -1e-9:
                raise ScenarioError(f"{scenario.path}: the fuel runs out on lap {self.lap_no} ({phase.name}); "
                                    "add fuel_kg or a pit stop with refuel_kg or refuel_full")
            self.fuel = max(self.fuel, 0.0)
            if until_s > 0 and self.t >= until_s:
                return True
        return False


def expand_plan(scenario: Scenario, lap: LapTrace | None = None) -> tuple[PlanSegment, ...]:
    """Segments of the whole plan, in order, with the fuel on board in each.

    The run is ``[[plan.phases]]``, then each stint template repeated (``repeat`` times, or until
    a lap ends at or after its ``until_h``: the flag ends that stint, the rest of it is skipped),
    then ``[[plan.finish]]``. Fuel burns at the scenario's consumption per lap, scaled by the phase
    pace (a slower lap uses less); a pit stop refuels (capped at the tank capacity). Running dry
    is an error naming the lap.
    """
    lap = base_lap(scenario) if lap is None else lap
    plan = scenario.plan
    if scenario.power_method == "pressure" and any(ph.kind in ("in_lap", "out_lap") and ph.pit_lane_length_m > 0
                                                    for ph in written_phases(plan)):
        raise ScenarioError(f"{scenario.path}: power_method = \"pressure\" cannot re-time in/out laps for a pit "
                            "lane; set pit_lane_length_m = 0 for those phases")
    out = _Expansion(scenario, lap)
    for phase in plan.phases:
        out.add(phase)
    for template in plan.stints:
        run = 0
        while (template.repeat == 0 or run < template.repeat) and not (template.until_s and out.t >= template.until_s):
            run += 1
            if any(out.add(stint_phase(template, run, phase), template.until_s) for phase in template.phases):
                break
    for phase in plan.finish:
        out.add(phase)
    return tuple(out.segments)
