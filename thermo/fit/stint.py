"""The run a fit compares against: segments over the logged stint (or the plan), corners solved per parameter set."""
from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from lapdata.reader import read_trace_csv
from lapdata.track import read_track_toml
from lapdata.trace import LapTrace
from thermo.chain.plan import PlanSegment, expand_plan
from thermo.chain.run import corner_duties, solve_corner
from thermo.chain.setup import corner_brakes
from thermo.fit.errors import FitError
from thermo.results import CornerResult
from thermo.scenario.model import Phase, Scenario
from thermo.scenario.reader import scenario_from_dict

LOGGED_PHASE = Phase(kind="laps", name="logged stint", count=1)


def lap_length_m(scenario: Scenario) -> float:
    """Length of one lap for splitting a logged stint: [calibration] lap_length_m, else the plan's lap [m]."""
    cal = scenario.calibration
    if cal.lap_length_m > 0:
        return cal.lap_length_m
    plan = scenario.plan
    if plan.lap_source == "track":
        return read_track_toml(plan.lap_path).length_m
    return read_trace_csv(plan.lap_path, repair=plan.repair_trace).length_m


def lap_numbers(distance_m: np.ndarray, lap_m: float) -> np.ndarray:
    """Lap number from 1 of each sample of a stint that starts at the start/finish line [-]."""
    return np.floor((distance_m - distance_m[0]) / lap_m + 1e-9).astype(int) + 1


def _piece(trace: LapTrace, i0: int, i1: int) -> LapTrace:
    cut = slice(i0, i1 + 1)
    opt = lambda a: None if a is None else a[cut]  # noqa: E731
    return LapTrace(time_s=trace.time_s[cut] - trace.time_s[i0], distance_m=trace.distance_m[cut] - trace.distance_m[i0],
                    speed_mps=trace.speed_mps[cut], pressure_front_pa=opt(trace.pressure_front_pa),
                    pressure_rear_pa=opt(trace.pressure_rear_pa), accel_long_mps2=opt(trace.accel_long_mps2),
                    source=trace.source)


def logged_segments(scenario: Scenario, trace: LapTrace, lap_m: float) -> tuple[PlanSegment, ...]:
    """The logged stint cut into one segment per lap (sharing the boundary samples), fuel burning per lap."""
    laps = lap_numbers(trace.distance_m, lap_m)
    starts = [0] + [int(i) for i in np.flatnonzero(np.diff(laps)) + 1]
    ends = starts[1:] + [trace.time_s.size - 1]
    segments = []
    fuel = scenario.vehicle.fuel_kg
    for i0, i1 in zip(starts, ends):
        if i1 - i0 < 1:
            continue
        segments.append(PlanSegment(LOGGED_PHASE, 0, int(laps[i0]), float(trace.time_s[i0]), _piece(trace, i0, i1),
                                    max(fuel, 0.0)))
        fuel -= scenario.fuel_consumption_kg_per_lap
    return tuple(segments)


def segment_lap(segments, time_s: np.ndarray) -> np.ndarray:
    """Lap number of the segment holding each run time (0 in stops and the soak) [-]."""
    starts = np.array([s.t_start_s for s in segments])
    index = np.clip(np.searchsorted(starts, time_s, side="right") - 1, 0, len(segments) - 1)
    return np.array([segments[i].lap_index for i in index], dtype=int)


@dataclass(frozen=True)
class Prediction:
    """The corners solved for one parameter set: output-node series per corner."""

    corners: dict[str, CornerResult]

    def node(self, corner: str, node: str) -> tuple[np.ndarray, np.ndarray]:
        """(time [s], temperature [K]) of one output node."""
        result = self.corners[corner]
        if node not in result.node_names:
            raise FitError(f"corner {corner} has no output node '{node}'; it has: {', '.join(result.node_names)}")
        return result.time_s, result.temperatures_k[:, result.node_names.index(node)]


class StintRunner:
    """Runs the scenario's corners over fixed segments with a set of (dotted key, value) overrides.

    The overrides are applied to the scenario's parsed TOML exactly as ``--set`` would, and the
    scenario is rebuilt for each parameter set, so a fitted value means the same as in ``run``.
    """

    def __init__(self, scenario: Scenario, segments, corners):
        self.scenario = scenario
        self.segments = tuple(segments)
        self.corners = tuple(corners)
        self.evaluations = 0

    @property
    def span_s(self) -> tuple[float, float]:
        return self.segments[0].t_start_s, self.segments[-1].t_end_s

    def with_overrides(self, overrides) -> Scenario:
        base = self.scenario
        return scenario_from_dict(base.raw, path=base.path, text=base.text,
                                  overrides=list(base.overrides) + list(overrides))

    def run(self, overrides) -> Prediction:
        """The fitted corners solved with ``overrides``, each set up once (``solve_corner``, with the
        scenario's solver settings); the duty splits the car's braking between all its corners."""
        scenario = self.with_overrides(overrides)
        brakes = corner_brakes(scenario)
        duties = [corner_duties(scenario, seg, brakes) for seg in self.segments]
        designs = {d.name: d for d in scenario.corners}
        self.evaluations += 1
        return Prediction({c: solve_corner(scenario, designs[c], self.segments, duties, output_hz=0.0)
                           for c in self.corners})


def runner_for(scenario: Scenario, trace: LapTrace, corners) -> StintRunner:
    """Segments from the logged speed trace (duty = 'measured') or from the plan (duty = 'plan')."""
    if scenario.calibration.duty == "plan":
        segments = expand_plan(scenario)
    else:
        segments = logged_segments(scenario, replace(trace, temperatures_k={}), lap_length_m(scenario))
    return StintRunner(scenario, segments, corners)
