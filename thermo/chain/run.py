"""Run a scenario: heat per corner for each segment, the corner network solved across the plan.

Each corner is set up once (``thermo.chain.setup``: brake, network, settings) and carried across
the plan by a ``CornerRun`` (``thermo.chain.corner_run``), which integrates each segment, applies
the pad-wear policy (wear, pad changes) and assembles the ``CornerResult``.
"""
from __future__ import annotations

import contextvars
from concurrent.futures import ThreadPoolExecutor, wait

import numpy as np

import thermo
from thermo.chain.corner_run import CornerRun, SegmentDuty
from thermo.chain.guards import WallClock
from thermo.chain.hydraulics import hydraulics_dict
from thermo.chain.plan import PlanSegment, expand_plan
from thermo.chain.stint_call import STINT_CALL_POINTS
from thermo.chain.setup import corner_setup, corner_setups
from thermo.corner.build import materials_used
from thermo.corner.geometry import CornerDesign
from thermo.correlations import correlation_reference
from thermo.duty.corner_duty import CornerBrake, corner_heat_inputs
from thermo.errors import ModelError
from thermo.materials import get_material
from thermo.results import CornerResult, Results
from thermo.scenario.model import Scenario
from thermo.scenario.toml_text import toml_value_text
from thermo.solver.settings import SolverSettings


def corner_duties(scenario: Scenario, segment: PlanSegment, brakes: list[CornerBrake]) -> dict[str, SegmentDuty]:
    """Heat into each corner's disc and pad during one segment [W]; ``brakes``: every corner's
    (``thermo.chain.setup.corner_brakes``, or each ``CornerSetup.brake``)."""
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


def solve_corner(scenario: Scenario, design: CornerDesign, segments, duties_by_segment,
                 settings: SolverSettings | None = None, progress=None, output_hz: float | None = None,
                 clock: WallClock | None = None, store: str = "standard") -> CornerResult:
    """Solve one corner across all segments, carrying its state, with pad wear and pad changes:
    the corner set up (``corner_setup``; ``settings`` None: the scenario's), then ``CornerRun`` one
    segment at a time. ``duties_by_segment`` holds each segment's ``corner_duties``.
    ``output_hz``: rate of the stored series (None: the scenario's output interval; 0: every row)."""
    interval = None if output_hz is None else (1.0 / output_hz if output_hz > 0 else 0.0)
    run = CornerRun(scenario, corner_setup(scenario, design, settings), interval_s=interval, store=store, clock=clock)
    duties_of = dict(zip(map(id, segments), duties_by_segment))
    for group in segment_groups(segments):
        _advance(run, group, [duties_of[id(s)][design.name] for s in group])
        if progress is not None:
            for segment in group:
                progress(design.name, segment)
    return run.result(segments)


def segment_groups(segments, max_samples: int = STINT_CALL_POINTS):
    """The segments in the groups a corner advances through at once: each stop on its own, and
    consecutive driven segments together (a stint's laps: ``CornerRun.advance_laps``), as many as
    hold ``max_samples`` trace samples in all (at least one), so that a run on a finely sampled
    logged lap holds only a few laps' heat inputs at a time."""
    group, samples = [], 0
    for segment in segments:
        n = segment.trace.time_s.size
        if group and (not segment.moving or not group[-1].moving or samples + n > max_samples):
            yield group
            group, samples = [], 0
        group.append(segment)
        samples += n
    if group:
        yield group


def _advance(run: CornerRun, group, duties) -> None:
    """``run`` through one of ``segment_groups`` with each segment's ``SegmentDuty``."""
    if group[0].moving:
        run.advance_laps(group, duties)
    else:
        run.advance(group[0], duties[0])


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


def run_scenario(scenario: Scenario, *, progress=None, segments=None, store: str = "standard",
                 sink=None, threads: int = 1) -> Results:
    """The whole chain for every corner of a scenario. ``store``: "standard" (series at the
    output interval, link energies per lap and phase) or "full" (every solver row, and the link
    flows at each). ``sink`` (store "full" only): takes every solver row as each segment is solved
    (``CornerRun``; ``thermo.output.hdf5_stream``), and the results then hold the series at the
    output interval, as with "standard". ``threads``: how many corners are solved side by side
    (``corner_threads``; 1, the default: one after another); the results are the same to the bit
    whatever the count."""
    segments = expand_plan(scenario) if segments is None else segments
    setups = corner_setups(scenario)
    brakes = [setup.brake for setup in setups]
    clock = WallClock(scenario.solver.wall_clock_limit_s)
    runs = [CornerRun(scenario, setup, store=store, clock=clock, sink=sink) for setup in setups]
    with CornerThreads(corner_threads(scenario, len(runs), threads, sink)) as pool:
        for group in segment_groups(segments):     # each segment's heat input made once, for every corner, then let go
            duties = [corner_duties(scenario, segment, brakes) for segment in group]
            pool.each([(run, group, [d[setup.name] for d in duties]) for setup, run in zip(setups, runs)])
            if progress is not None:
                for setup in setups:
                    for segment in group:
                        progress(setup.name, segment)
    corners = tuple(run.result(segments) for run in runs)
    run_warnings = tuple(w for c in corners for w in c.facts.warnings)
    used = {name for c in corners for name in c.facts.correlations_used}
    return Results(
        scenario_name=scenario.name, scenario_text=scenario.text, version=thermo.__version__,
        solver=scenario.solver.method, solver_status="success", references=references_for(scenario, used),
        corners=corners, caution=thermo.CAUTION, warnings=run_warnings, overrides=applied_overrides(scenario),
        hydraulics=hydraulics_dict(scenario, corners))


def corner_threads(scenario: Scenario, corners: int, threads: int = 1, sink=None) -> int:
    """How many corners a run solves side by side: ``threads``, at most one per corner. One when a
    ``sink`` takes the rows as they are solved (they go to it in corner order) and for the scipy
    methods (their integrators keep state of their own); the compiled kernel releases the GIL, so
    on the 'fast' method the corners' kernels run at once. The default is one: measured on the
    24-hour demo on 2 cores, two threads took about a fifth less wall time and a fifth more CPU
    time (DEVELOPERS.md, "The main command's speed")."""
    if not (isinstance(threads, (int, np.integer)) and threads >= 1):
        raise ModelError(f"run: threads must be a whole number of at least 1, got {threads!r}")
    if sink is not None or scenario.solver.method != "fast":
        return 1
    return min(corners, int(threads))


class CornerThreads:
    """The corners of a run advanced through one group of segments (``each``), side by side in
    ``workers`` threads, or one after another when ``workers`` is 1. Each task runs in a copy of
    the caller's context (the correlations' validity policy, numpy's error state). When tasks
    fail, the first corner's error is raised, after every task of the group has ended."""

    def __init__(self, workers: int):
        self.pool = ThreadPoolExecutor(max_workers=workers) if workers > 1 else None

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        if self.pool is not None:
            self.pool.shutdown(wait=True, cancel_futures=True)
        return False

    def each(self, tasks) -> None:
        """``_advance(run, group, duties)`` for each (run, group, duties) of ``tasks``."""
        if self.pool is None:
            for task in tasks:
                _advance(*task)
            return
        futures = [self.pool.submit(contextvars.copy_context().run, _advance, *task) for task in tasks]
        wait(futures)
        for future in futures:
            future.result()


def applied_overrides(scenario: Scenario) -> tuple[tuple[str, str], ...]:
    """The --set and variant overrides a run applied on top of its scenario text, as (dotted key,
    TOML value text), so that a result says which run it is. ``[calibrated]`` values are part of
    the text itself and are not repeated."""
    return tuple((str(key), toml_value_text(value)) for key, value in scenario.overrides)


STUDY_TABULATED_KEPT = 48      # tabulated conductances a study's worker keeps between points (about a point's worth)


def forget_cached_tables(keep_tabulated: int = 0) -> None:
    """Empty the caches of convection tables: the stacks the compiled kernels read (about 6 MB a
    network), and each path's tabulated conductance when more than ``keep_tabulated`` are cached.
    Within a run they spare rebuilding a worn corner's tables; a process that runs many
    configurations (a study's worker) calls this after each, so that its memory stays about that
    of one configuration, while configurations that share their airflow (only a limit or the
    fluid's water content varied) still share their tabulated conductances."""
    from thermo.corner import build
    from thermo.network import assemble
    from thermo.solver import kernel_arrays
    if build.tables_cached() > keep_tabulated:
        build.forget_tables()
    assemble._stacked_tables.cache_clear()
    kernel_arrays._unique_stack.cache_clear()
    kernel_arrays.forget_slices()
