"""A chunk of a study's points, the unit of work of a study's executor (``run_chunk``): side by
side where they can be (``run_chunk_in_lanes``), else one by one.

Points that share their drive (``drive_key``: the scenario file, car, brake balance, fuel, air,
plan and solver settings, and each corner's view of the brakes and of its ducts' air) see the same
heat and air in every segment; they differ only in their corners' own build, pad wear rates and
limits. Each group runs corner by corner in ``thermo.chain.corner_lanes.CornerLanes``, one lane
block for each network shape among its corners (another number of pad or disc layers is another
shape). A point whose solver is not 'fast', and any point the lanes drop (see there), runs alone
through ``run_point``, exactly as ``brakeheat run`` would run it. None of this depends on which
points share a chunk, so a study's numbers do not depend on the chunk size or the workers (tested).
A point's result has the same form either way (``points.corner_entry``).
"""
from __future__ import annotations

import dataclasses

import numpy as np

from thermo.errors import BrakeheatError

DRIVE_FIELDS = ("path", "vehicle", "envelope", "bias", "power_method", "left_share_front", "left_share_rear",
                "fuel_consumption_kg_per_lap", "fuel_capacity_kg", "ambient", "plan", "solver")


def fingerprint(value) -> object:
    """A hashable, exact stand-in for ``value`` (dataclasses, sequences, mappings, arrays, numbers)."""
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        return (type(value).__name__,) + tuple((f.name, fingerprint(getattr(value, f.name)))
                                               for f in dataclasses.fields(value))
    if isinstance(value, np.ndarray):
        return ("array", value.dtype.str, value.shape, value.tobytes())
    if isinstance(value, dict):
        return ("dict",) + tuple(sorted((str(k), fingerprint(v)) for k, v in value.items()))
    if isinstance(value, (list, tuple)):
        return ("seq",) + tuple(fingerprint(v) for v in value)
    if isinstance(value, (np.generic, float, int, str, bool, type(None))):
        return (type(value).__name__, repr(value.item() if isinstance(value, np.generic) else value))
    return (type(value).__name__, repr(value))


def drive_key(scenario) -> object:
    """What points must share to run side by side: every input of each segment's heat and air."""
    from thermo.chain.setup import corner_brakes
    from thermo.corner.build import duct_air_signals
    corners = tuple((brake, tuple(duct_air_signals(design)))
                    for brake, design in zip(corner_brakes(scenario), scenario.corners))
    return fingerprint(tuple(getattr(scenario, name) for name in DRIVE_FIELDS) + (corners,))


def run_chunk(job, chunk) -> list:
    """A chunk of points, ``[(index, values), ...]``, run in this process: ``[(index, point), ...]``.
    The unit of work sent to an executor. Side by side where they share their drive
    (``run_chunk_in_lanes``), unless the job asks for each point alone (``job.lanes`` False) or
    for their series (``job.keep_series``). The stacked convection tables are emptied after the
    chunk (after each point when alone), and the tabulated conductances when more than about a
    point's worth are cached, so that a worker's memory stays about that of one chunk while points
    that share their airflow still share their tables."""
    from thermo.chain.run import STUDY_TABULATED_KEPT, forget_cached_tables
    from thermo.studies.points import run_point
    if job.lanes and not job.keep_series:
        out = run_chunk_in_lanes(job, chunk)
        forget_cached_tables(keep_tabulated=STUDY_TABULATED_KEPT)
        return out
    out = []
    for index, values in chunk:
        out.append((index, run_point(job, values)))
        forget_cached_tables(keep_tabulated=STUDY_TABULATED_KEPT)
    return out


def run_chunk_in_lanes(job, chunk) -> list:
    """``run_chunk`` with the points that share their drive side by side: ``[(index, point)]``."""
    from thermo.studies.points import point_scenario, run_point

    done, groups = {}, {}
    for index, values in chunk:
        try:
            scenario = point_scenario(job, values)
            key = drive_key(scenario) if scenario.solver.method == "fast" else None
        except BrakeheatError:
            key = None
        if key is None:          # another solver, run as it asks; or a point that says why it cannot run
            done[index] = run_point(job, values)
            continue
        groups.setdefault(key, []).append((index, values, scenario))
    for members in groups.values():
        done.update(_run_group(job, members))
    return [(index, done[index]) for index, _ in chunk]


def _run_group(job, members) -> dict:
    """Points of one drive: each corner's configurations side by side, the dropped ones alone."""
    from thermo.chain.corner_lanes import CornerLanes, corner_shape
    from thermo.chain.corner_run import conductance_grid, corner_check_specs
    from thermo.chain.plan import expand_plan
    from thermo.chain.run import corner_duties
    from thermo.chain.setup import corner_brakes, corner_setup
    from thermo.limits import evaluate_check
    from thermo.studies.points import _laps_to_settle, _plain, corner_entry, first_stints, run_point

    scenarios = [scenario for _, _, scenario in members]
    first = scenarios[0]
    try:
        segments = first_stints(expand_plan(first), job.stints)
        brakes = corner_brakes(first)
        duties = [corner_duties(first, segment, brakes) for segment in segments]
    except BrakeheatError:
        return {index: run_point(job, values) for index, values, _ in members}
    settings = first.solver.settings()
    corners = {index: [] for index, _, _ in members}
    alone: set[int] = set()
    grid = conductance_grid(first)
    for c, design in enumerate(first.corners):
        setups, shapes = {}, {}
        for b, scenario in enumerate(scenarios):
            try:
                setups[b] = corner_setup(scenario, scenario.corners[c], settings, grid=grid)
            except (BrakeheatError, ValueError):    # alone, where it says what is wrong
                alone.add(members[b][0])
                continue
            shapes.setdefault(corner_shape(setups[b].network), []).append(b)
        for group in shapes.values():
            try:
                lanes = CornerLanes([scenarios[b] for b in group], c, settings, [setups[b] for b in group])
                for segment, duty in zip(segments, duties):
                    lanes.advance(segment, duty[design.name])
            except (BrakeheatError, ValueError):    # alone, where each says what is wrong
                alone.update(members[b][0] for b in group)
                continue
            for j, b in enumerate(group):
                index, _, scenario = members[b]
                if j in lanes.failed:
                    alone.add(index)
                    continue
                model = lanes.models[j]
                peaks, when = lanes.peaks_k[j], lanes.peak_time_s[j]
                where = {node: i for i, node in enumerate(model.output_nodes)}
                checks = [evaluate_check(spec, np.array([when[where[spec.node]]]), np.array([peaks[where[spec.node]]]))
                          for spec in corner_check_specs(scenario, lanes.designs[j], model)]
                corners[index].append((design.name, model.output_nodes, peaks, checks))
    out = {}
    for index, values, scenario in members:
        if index in alone:
            out[index] = run_point(job, values)
            continue
        try:
            settled = _laps_to_settle(scenario) if job.settle else {}
        except BrakeheatError as error:
            out[index] = {"values": {k: _plain(v) for k, v in zip(job.keys, values)}, "corners": [], "error": str(error)}
            continue
        out[index] = {"values": {k: _plain(v) for k, v in zip(job.keys, values)},
                      "corners": [corner_entry(name, nodes, peaks, checks, settled.get(name))
                                  for name, nodes, peaks, checks in corners[index]]}
    return out
