"""Cases a fuzz campaign of the lanes found (3869 points over the demo, the 24-hour demo, the heavy
GT and the small scenario): a chunk run side by side (``run_chunk_in_lanes``) must give each point
what it gives run alone (``run_point``, the chain of ``brakeheat run``), to the rounded 0.01 K, and
must never crash on a point that alone gives an error point. Each test is the smallest chunk found
that showed one discrepancy."""
from __future__ import annotations

from pathlib import Path

from test_lanes import _assert_same_points

import thermo.studies.points as points_module
from thermo.studies.lanes import run_chunk_in_lanes
from thermo.studies.points import StudyJob, run_point

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
