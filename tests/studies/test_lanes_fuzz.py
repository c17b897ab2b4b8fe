"""Cases a fuzz campaign of the lanes found (3869 points over the demo, the 24-hour demo, the heavy
GT and the small scenario): a chunk run side by side (``run_chunk_in_lanes``) must give each point
what it gives run alone (``run_point``, the chain of ``brakeheat run``), to the rounded 0.01 K, and
must never crash on a point that alone gives an error point. Each test is the smallest chunk found
that showed one discrepancy."""
from __future__ import annotations

from pathlib import Path

import numpy as np
from test_lanes import _assert_same_points

import thermo.studies.points as points_module
from thermo.chain import run_scenario
from thermo.chain.corner_lanes import CornerLanes, corner_shape
from thermo.chain.corner_run import conductance_grid
from thermo.chain.plan import expand_plan
from thermo.chain.run import corner_duties, solve_corner
from thermo.chain.setup import corner_brakes, corner_setup
from thermo.errors import BrakeheatError
from thermo.studies.lanes import drive_key, run_chunk_in_lanes
from thermo.studies.points import StudyJob, first_stints, point_scenario, run_point

ROOT = Path(__file__).resolve().parents[2]
DEMO = str(ROOT / "scenarios" / "demo.toml")
SMALL = str(ROOT / "tests" / "data" / "small.toml")
# the demo's first stint shortened to an out-lap, 2 + 1 + 1 laps, the in-lap and the stop
SHORT = (("plan.phases.2.count", 2), ("plan.phases.3.count", 1), ("plan.phases.4.count", 1))


def test_a_point_of_another_solver_runs_alone_in_a_chunk(monkeypatch):
    """A point whose [solver] method is not 'fast' must run alone through ``run_point``: the
    compiled kernel must not stand in for the solver it asks for."""
    job = StudyJob(DEMO, SHORT, ("fluid.water_content_pct", "solver.method"), stints=1)
    chunk = [(0, (0.5, "fast")), (1, (1.0, "fast")), (2, (1.5, "BDF"))]
    ran_alone = []

    def stub(job_, values):
        ran_alone.append(values)
        return {"values": {}, "corners": [], "ran": "alone"}
    monkeypatch.setattr(points_module, "run_point", stub)
    out = dict(run_chunk_in_lanes(job, chunk))
    assert ran_alone == [(1.5, "BDF")]
    assert out[2].get("ran") == "alone"


def test_a_brake_the_duty_refuses_gives_an_error_point_not_a_crash():
    """pad_mu 1.2 (the key's range once reached 1.5 while the brake's caliper refused more than
    1.0): alone the point is an error point; in a chunk it must be the same error point, and the
    chunk's other points must still run."""
    job = StudyJob(DEMO, SHORT, ("corners.rear.pad_mu",), stints=1)
    chunk = [(0, (0.48,)), (1, (0.5,)), (2, (1.2,))]
    alone = run_point(job, (1.2,))
    assert alone["corners"] == [] and "pad_mu" in alone["error"]
    out = dict(run_chunk_in_lanes(job, chunk))
    assert out[2] == alone
    assert "error" not in out[0] and "error" not in out[1]


def test_a_pad_worn_to_the_floor_side_by_side_equals_it_alone():
    """Pads worn to the 0.5 mm floor within the second lap (wear 100 mm3/kJ, no minimum), their six
    layers kept: the linearised scheme once used side by side gave the front pad_surface about
    1769 degC against 899 degC alone; side by side now runs the scheme of the point alone."""
    job = StudyJob(DEMO, SHORT + (("pad_wear.wear_coefficient_mm3_per_kj", 100.0),
                                  ("corners.front.pad.minimum_thickness_mm", 0.0)), ("fluid.water_content_pct",), stints=1)
    chunk = [(0, (0.5,)), (1, (1.0,))]
    _assert_same_points(run_chunk_in_lanes(job, chunk), [(i, run_point(job, v)) for i, v in chunk])


def test_a_new_thin_pad_of_six_layers_side_by_side_equals_it_alone():
    """The same without wear: a new 0.5 mm pad of six layers (0.083 mm each); the linearised lanes
    gave the front backing plate 1.3 K and the pad's mean 0.45 K off the point alone."""
    job = StudyJob(DEMO, SHORT + (("pad_wear.enabled", False), ("corners.front.pad.minimum_thickness_mm", 0.0),
                                  ("corners.front.pad.layers", 6)), ("corners.front.pad.thickness_mm",), stints=1)
    chunk = [(0, (0.5,)), (1, (0.6,))]
    _assert_same_points(run_chunk_in_lanes(job, chunk), [(i, run_point(job, v)) for i, v in chunk])


def test_a_layered_pad_on_a_lumped_disc_side_by_side_equals_it_alone():
    """small.toml (lumped discs, disc layers 1) with the front pad in two layers and high downforce:
    the linearised lanes gave the front pad_surface about 0.14 K off the point alone."""
    short = (("plan.phases.1.count", 1), ("plan.phases.4.count", 1), ("plan.phases.5.duration_s", 60.0),
             ("car.downforce_cl_a_m2", 6.0))
    job = StudyJob(SMALL, short, ("corners.front.pad.layers",), stints=0)
    chunk = [(0, (2,)), (1, (0,))]
    _assert_same_points(run_chunk_in_lanes(job, chunk), [(i, run_point(job, v)) for i, v in chunk])


# A second campaign compared at full precision: each corner of a chunk's points carried side by
# side in full Newton (``CornerLanes``) against ``run_scenario`` on each point alone, with
# np.array_equal, and ``run_chunk_in_lanes`` against ``run_point`` as whole dicts (errors too).
# It found no difference; the tests below keep its hardest chunks.

def _assert_bit_exact(job, chunk):
    """Every corner of every point of ``chunk`` side by side, grouped by drive and network shape as
    ``run_chunk_in_lanes`` groups them, against ``brakeheat run``'s chain on the point alone
    (``solve_corner``, the corner alone, where another corner stops the point's run), unrounded; then the whole chunk against ``run_point`` (rounded dicts, errors included). Returns
    {corner name: points the lanes dropped}: each must be a point whose own run fails, or whose
    state left a conductance table (the run alone then takes its fallback)."""
    scenarios = [point_scenario(job, values) for _, values in chunk]
    alone = {}
    for b, scenario in enumerate(scenarios):
        try:
            alone[b] = run_scenario(scenario, segments=first_stints(expand_plan(scenario), job.stints))
        except BrakeheatError as error:
            alone[b] = error
    drives, dropped = {}, {}
    for b, scenario in enumerate(scenarios):
        drives.setdefault(drive_key(scenario), []).append(b)
    for members in drives.values():
        first = scenarios[members[0]]
        segments = first_stints(expand_plan(first), job.stints)
        brakes = corner_brakes(first)
        duties = [corner_duties(first, segment, brakes) for segment in segments]
        settings = first.solver.settings()
        grid = conductance_grid(first)
        for c, design in enumerate(first.corners):
            setups = {b: corner_setup(scenarios[b], scenarios[b].corners[c], settings, grid=grid) for b in members}
            shapes = {}
            for b in members:
                shapes.setdefault(corner_shape(setups[b].network), []).append(b)
            for group in shapes.values():
                lanes = CornerLanes([scenarios[b] for b in group], c, settings, [setups[b] for b in group])
                for segment, duty in zip(segments, duties):
                    lanes.advance(segment, duty[design.name])
                for j, b in enumerate(group):
                    if j in lanes.failed:
                        dropped.setdefault(design.name, set()).add(b)
                        continue
                    if isinstance(alone[b], BrakeheatError):   # another corner stopped the run: this one alone
                        result = solve_corner(scenarios[b], scenarios[b].corners[c], segments, duties, settings)
                    else:
                        result = alone[b].corners[c]
                    peaks = np.max(result.temperatures_k, axis=0)
                    assert np.array_equal(lanes.peaks_k[j], peaks), (b, design.name, lanes.peaks_k[j] - peaks)
    assert run_chunk_in_lanes(job, chunk) == [(i, run_point(job, values)) for i, values in chunk]
    return dropped


def test_a_new_pad_at_a_risen_ambient_side_by_side_equals_it_alone():
    """Found by the full-precision campaign: the ambient rising along a profile (0.5 to 30 degC over
    0.2 h) and a 60 mm pad that keeps the backing plate below the air; at the stint's pit stop the
    pad is changed and the new pad and backing plate start at the ambient (278.0 K). Side by side
    the backing plate's peak is that state, 277.9708 K at the stop's first instant; alone
    (``CornerRun``) the segment's first row is dropped as a repeat of the previous end (276.69 K),
    so its peak is 277.9208 K a step later: 0.05 K apart, and the rounded points differed too. The
    lanes now count a segment's rows as the run stores them (its first row only in the first
    segment)."""
    short = (("plan.phases.1.count", 1), ("plan.phases.4.count", 1), ("plan.phases.5.duration_s", 60.0),
             ("ambient.temperature_profile_h_c", [[0.0, 0.5], [0.2, 30.0], [2.0, 44.0]]),
             ("corners.front.pad.minimum_thickness_mm", 0.0))
    job = StudyJob(SMALL, short, ("corners.front.pad.thickness_mm",), stints=1)
    _assert_bit_exact(job, [(0, (60.0,))])


def test_a_mixed_chunk_of_worn_thin_failing_and_layered_pads_is_the_run_alone_to_the_bit():
    """The campaign's hardest kind of demo chunk: an ordinary point, pads worn to the 0.5 mm floor
    (wear 100 mm3/kJ), a new 0.6 mm pad of six layers on a 0.1 mm backing plate, pads of two layers
    (another network shape), and a point whose rear pad takes all the heat (heat_partition 0) and
    leaves the model's range alone (heat_partition sets the heat split, so points 4 and 5 are drives
    of their own): the lanes drop that one rear corner only, and every other corner is the run
    alone to the bit."""
    short = (("plan.phases.2.count", 2), ("plan.phases.3.count", 1), ("plan.phases.4.count", 1),
             ("corners.front.pad.minimum_thickness_mm", 0.0), ("corners.rear.pad.minimum_thickness_mm", 0.0))
    keys = ("corners.front.pad.thickness_mm", "corners.front.pad.layers", "pad_wear.wear_coefficient_mm3_per_kj",
            "corners.rear.pad.heat_partition", "corners.front.pad.backing_thickness_mm")
    job = StudyJob(DEMO, short, keys, stints=1)
    chunk = [(0, (24.0, 0, 3.0, 0.95, 5.0)), (1, (24.0, 0, 100.0, 0.95, 5.0)), (2, (0.6, 6, 100.0, 0.95, 0.1)),
             (3, (24.0, 2, 100.0, 0.95, 5.0)), (4, (24.0, 0, 3.0, 0.0, 5.0)), (5, (12.0, 2, 30.0, 0.97, 0.3))]
    assert _assert_bit_exact(job, chunk) == {"rear": {4}}
    assert "error" in run_point(job, chunk[4][1])
