"""Points side by side in the kernel's lanes give what each point run alone gives.

The reference is each point run alone through the chain of ``brakeheat run`` (``run_point``: full
Newton, the pad rebuilt as it wears). Side by side the points run in full Newton too, in the lane
kernel (``thermo.solver.kernel_newton_lanes``), so each corner's peaks are those of the run alone
to the bit (tested at full precision below); the points' rounded peaks and margins are compared
to 0.01 K. The pads' rows are checked against a full build of the worn corner."""
from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from thermo.chain import corner_lanes, run_scenario
from thermo.chain.corner_lanes import CornerLanes
from thermo.chain.plan import expand_plan
from thermo.chain.run import corner_duties
from thermo.chain.setup import corner_brakes
from thermo.corner.build import build_corner, pad_layers
from thermo.network.assemble import compile_network
from thermo.scenario import load_scenario
from thermo.solver.kernel_arrays import configuration_rows
from thermo.studies.lanes import drive_key, run_chunk_in_lanes
from thermo.studies.points import StudyJob, first_stints, point_scenario, run_point

DEMO = str(Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml")
# the demo's first stint shortened to an out-lap, 2 + 1 + 1 laps, the in-lap and the stop; pads
# worn fast so that they wear through their layers within it
SHORT = (("plan.phases.2.count", 2), ("plan.phases.3.count", 1), ("plan.phases.4.count", 1),
         ("pad_wear.wear_coefficient_mm3_per_kj", 3.0))
KEYS = ("corners.front.pad.thickness_mm", "corners.front.ducts.main.inlet_area_mm2",
        "corners.front.airflow.disc_convection_multiplier", "corners.rear.airflow.hub_convection_multiplier",
        "fluid.water_content_pct")


def _chunk(n, seed=3):
    rng = np.random.default_rng(seed)
    return [(i, (float(rng.uniform(16, 24)), float(rng.uniform(7000, 12000)), float(rng.uniform(0.7, 1.3)),
                 float(rng.uniform(0.7, 1.3)), float(rng.uniform(0.5, 2.0)))) for i in range(n)]


def _assert_same_points(lanes, alone):
    for (i, a), (j, b) in zip(lanes, alone):
        assert i == j and a["values"] == b["values"]
        assert "error" not in a and "error" not in b
        for ca, cb in zip(a["corners"], b["corners"]):
            assert ca["name"] == cb["name"] and ca["peak_c"].keys() == cb["peak_c"].keys()
            for node in ca["peak_c"]:
                assert ca["peak_c"][node] == pytest.approx(cb["peak_c"][node], abs=0.0101), (i, ca["name"], node)
            assert [k["name"] for k in ca["checks"]] == [k["name"] for k in cb["checks"]]
            for ka, kb in zip(ca["checks"], cb["checks"]):
                assert ka["limit_c"] == kb["limit_c"] and ka["status"] == kb["status"]
                assert ka["margin_k"] == pytest.approx(kb["margin_k"], abs=0.0101), (i, ka["name"])


@pytest.fixture(scope="module")
def points():
    """Eight demo points side by side and each alone."""
    job = StudyJob(DEMO, SHORT, KEYS, stints=1)
    chunk = _chunk(8)
    return job, chunk, run_chunk_in_lanes(job, chunk), [(i, run_point(job, v)) for i, v in chunk]


def test_points_side_by_side_equal_each_point_alone(points):
    _, chunk, lanes, alone = points
    _assert_same_points(lanes, alone)
    # the water content moves the fluid's limit only: the lanes read each point's own limit
    limits = {p["values"]["fluid.water_content_pct"]: next(k["limit_c"] for k in p["corners"][0]["checks"]
                                                           if k["name"] == "fluid_boiling_at_water_content")
              for _, p in lanes}
    assert len(set(limits.values())) == len(limits)


def test_side_by_side_peaks_are_the_run_alone_to_the_bit():
    # the corners of eight points carried side by side (full Newton, pads worn by values) against
    # `brakeheat run`'s chain on each alone (pads rebuilt), unrounded
    job = StudyJob(DEMO, SHORT, KEYS, stints=1)
    scenarios = [point_scenario(job, values) for _, values in _chunk(8)]
    segments = first_stints(expand_plan(scenarios[0]), 1)
    brakes = corner_brakes(scenarios[0])
    duties = [corner_duties(scenarios[0], segment, brakes) for segment in segments]
    alone = [run_scenario(s, segments=first_stints(expand_plan(s), 1)) for s in scenarios]
    for c, design in enumerate(scenarios[0].corners):
        lanes = CornerLanes(scenarios, c, scenarios[0].solver.settings())
        for segment, duty in zip(segments, duties):
            lanes.advance(segment, duty[design.name])
        assert lanes.failed == set()
        for b, result in enumerate(alone):
            np.testing.assert_array_equal(lanes.peaks_k[b], np.max(result.corners[c].temperatures_k, axis=0),
                                          err_msg=f"corner {design.name}, point {b}")
        assert np.ptp(lanes.peaks_k, axis=0).max() > 1.0, "the points differ"


def test_a_point_the_lanes_drop_runs_alone(points, monkeypatch):
    """A configuration whose state leaves the model's range in the lanes is run alone (here every
    one: the lanes' range is narrowed), which gives the points alone, exactly."""
    job, chunk, _, alone = points
    monkeypatch.setattr(corner_lanes, "STATE_MAX_K", 330.0)
    assert run_chunk_in_lanes(job, chunk) == alone


def test_points_of_other_drives_run_in_their_own_groups():
    job = StudyJob(DEMO, SHORT, KEYS + ("car.mass_kg",), stints=1)
    chunk = [(i, values + (mass,)) for (i, values), mass in zip(_chunk(10, seed=5), [1150.0] * 5 + [1250.0] * 5)]
    scenarios = [load_scenario(DEMO, list(SHORT) + list(zip(job.keys, v))) for _, v in chunk]
    keys = [drive_key(s) for s in scenarios]
    assert len(set(keys[:5])) == 1 and len(set(keys[5:])) == 1 and keys[0] != keys[5]
    picked = chunk[:4] + chunk[5:9] + [chunk[9]]
    lanes = run_chunk_in_lanes(job, picked)
    _assert_same_points(lanes, [(i, run_point(job, v)) for i, v in picked])


def test_a_value_the_scenario_refuses_fails_alone_in_a_chunk():
    job = StudyJob(DEMO, SHORT, KEYS, stints=1)
    chunk = _chunk(5)
    chunk[2] = (2, (-3.0,) + chunk[2][1][1:])
    out = dict(run_chunk_in_lanes(job, chunk))
    assert "thickness_mm" in out[2]["error"] and out[2]["corners"] == []
    assert all("error" not in out[i] for i in (0, 1, 3, 4))


def test_a_worn_pad_writes_the_rows_a_full_build_gives():
    scenarios = [load_scenario(DEMO, [("corners.front.pad.thickness_mm", t)]) for t in (24.0, 19.0)]
    lanes = CornerLanes(scenarios, 0, scenarios[0].solver.settings())
    count = lanes.pad_count
    for b, design in enumerate(lanes.designs):
        for share in (0.9, 0.7, 0.55, 0.4):
            thickness = share * design.pad.thickness_m
            lanes._set_pad(b, thickness)
            worn = build_corner(replace(design, pad=replace(design.pad, thickness_m=thickness, layers=count)),
                                scenarios[b].ambient.pressure_pa, corner_lanes.conductance_grid(scenarios[b]))
            net = compile_network(worn.network)
            for name, row in configuration_rows(net).items():
                np.testing.assert_allclose(lanes.rows[name][b], row[0], rtol=1e-12, atol=0, err_msg=name)
            np.testing.assert_array_equal(lanes.link_a[b], net.link_a)
            np.testing.assert_allclose(lanes.weights[b], worn.output_weights, rtol=1e-12, atol=1e-15)
            np.testing.assert_allclose(lanes.layers[b], pad_layers(worn.design), rtol=1e-12)
        # a new pad at a stop: the design's own layers, as the first build (and the run) have them
        lanes._set_pad(b, design.pad.thickness_m)
        new = compile_network(lanes.models[b].network)
        for name, row in configuration_rows(new).items():
            np.testing.assert_allclose(lanes.rows[name][b], row[0], rtol=1e-12, atol=0, err_msg=name)
        np.testing.assert_allclose(lanes.weights[b], lanes.models[b].output_weights, rtol=1e-12, atol=1e-15)


def test_a_corner_of_another_shape_runs_in_its_own_lanes(monkeypatch):
    """One point with another number of pad layers (another network) among four of one shape: two
    lane blocks, none alone."""
    job = StudyJob(DEMO, SHORT, KEYS + ("corners.front.pad.layers",), stints=1)
    chunk = [(i, values + (layers,)) for (i, values), layers in zip(_chunk(5, seed=7), [0, 0, 2, 0, 0])]
    ran_alone = []
    real = run_point

    def counted(job_, values):
        ran_alone.append(values)
        return real(job_, values)
    import thermo.studies.points as points_module
    monkeypatch.setattr(points_module, "run_point", counted)
    lanes = run_chunk_in_lanes(job, chunk)
    assert ran_alone == []
    _assert_same_points(lanes, [(i, real(job, v)) for i, v in chunk])


def test_a_points_numbers_do_not_depend_on_its_chunk(points):
    """The lane kernel gives a configuration the same numbers, to the bit, whatever runs beside it,
    so a study gives the same JSON whatever its chunk size or workers."""
    job, chunk, lanes, _ = points
    for size in (1, 3, 5):
        rechunked = [item for k in range(0, len(chunk), size) for item in run_chunk_in_lanes(job, chunk[k:k + size])]
        assert rechunked == lanes
