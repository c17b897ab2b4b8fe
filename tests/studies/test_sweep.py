"""brakeheat sweep: the value specs, the grid, and a point against a plain run of the same scenario."""
from __future__ import annotations

import math

import numpy as np
import pytest

from study_cases import DUCT, SHRINK, SMALL
from thermo.chain import run_scenario
from thermo.chain.plan import expand_plan
from thermo.scenario import load_scenario
from thermo.studies.engine import StudyError
from thermo.studies.points import first_stints
from thermo.output.study_outputs import worst_check
from thermo.studies.sweep import parse_vary, sweep, sweep_dict, sweep_values


def test_list_range_log_and_single_value():
    assert parse_vary(f"{DUCT}=[5000, 7000, 9000]").values == (5000, 7000, 9000)
    # numpy.linspace is the reference for an even range with both ends included
    assert parse_vary(f"{DUCT}=4000:12000:9").values == tuple(np.linspace(4000, 12000, 9))
    # a log range: equal ratios between neighbours (numpy.geomspace)
    logs = parse_vary(f"{DUCT}=1000:100000:3:log").values
    assert logs == pytest.approx((1000.0, 10000.0, 100000.0))
    assert parse_vary(f"{DUCT}=4000:12000:3:lin").values == (4000.0, 8000.0, 12000.0)
    assert parse_vary(f"{DUCT}=6000").values == (6000,)
    assert parse_vary('corners.front.piston.type=["solid", "vented"]').values == ("solid", "vented")


def test_whole_number_keys_take_whole_values():
    assert parse_vary("plan.phases.1.count=2:6:3").values == (2, 4, 6)
    assert all(isinstance(v, int) for v in parse_vary("plan.phases.1.count=2:6:3").values)
    with pytest.raises(StudyError, match="not a whole number"):
        parse_vary("plan.phases.1.count=1:2:3")


@pytest.mark.parametrize("text, message", [
    (f"{DUCT}", "expected KEY=SPEC"),
    (f"{DUCT}=1:2", "LOW:HIGH:COUNT"),
    (f"{DUCT}=1:2:x", "COUNT a whole number"),
    (f"{DUCT}=0:10:3:log", "above 0"),
    (f"{DUCT}=1:10:0", "COUNT must be from 1"),
    (f"{DUCT}=1:10:3:cubic", "LOW:HIGH:COUNT"),
    (f"{DUCT}=[]", "empty"),
    (f"{DUCT}=nan:3:3", "finite"),
])
def test_bad_specs_say_what_is_expected(text, message):
    with pytest.raises(StudyError, match=message):
        parse_vary(text)


def test_grid_order_and_zip():
    a, b = parse_vary("x.a=[1, 2]"), parse_vary("x.b=[10, 20, 30]")
    # itertools.product order: the last key varies fastest
    assert sweep_values([a, b]) == [[1, 10], [1, 20], [1, 30], [2, 10], [2, 20], [2, 30]]
    c = parse_vary("x.c=[7, 8]")
    assert sweep_values([a, c], zip_keys=True) == [[1, 7], [2, 8]]
    with pytest.raises(StudyError, match="same number of values"):
        sweep_values([a, b], zip_keys=True)
    with pytest.raises(StudyError, match="given twice"):
        sweep_values([a, parse_vary("x.a=[3]")])


def test_a_value_the_scenario_refuses_stops_the_sweep_before_it_runs():
    with pytest.raises(StudyError, match=r"--vary corners.front.ducts.main.inlet_area_mm2=-5.*at least 0"):
        sweep(SMALL, [f"{DUCT}=[-5, 5000]"], overrides=SHRINK, stints=1, workers=1)
    with pytest.raises(StudyError, match="did you mean"):
        sweep(SMALL, ["corners.front.ducts.main.inlet_area_mm=[5000]"], overrides=SHRINK, stints=1, workers=1)


def test_first_stints_end_with_the_pit_stop():
    scenario = load_scenario(SMALL)
    segments = expand_plan(scenario)
    one = first_stints(segments, 1)
    assert one[-1].phase.kind == "pit_stop"
    assert [s.phase.kind for s in one] == ["laps"] * 3 + ["in_lap", "pit_stop"]
    assert first_stints(segments, 0) == list(segments) and first_stints(segments, 5) == list(segments)


@pytest.fixture(scope="module")
def duct_sweep():
    record = sweep(SMALL, [f"{DUCT}=[4000, 18000]"], overrides=SHRINK, stints=1, workers=1)
    return record, sweep_dict(record)


def test_a_sweep_point_equals_a_run_with_the_same_set(duct_sweep):
    """The issue's acceptance: a sweep point equals `run --set` of the same value to 0.01 K."""
    _, data = duct_sweep
    for point in data["points"]:
        value = point["values"][DUCT]
        scenario = load_scenario(SMALL, list(SHRINK) + [(DUCT, value)])
        results = run_scenario(scenario, segments=first_stints(expand_plan(scenario), 1))
        for corner, expected in zip(point["corners"], results.corners):
            assert corner["name"] == expected.name
            for check, ref in zip(corner["checks"], expected.checks):
                assert check["name"] == ref.name and check["status"] == ref.status
                assert check["margin_k"] == pytest.approx(ref.margin_k, abs=0.01)
                assert check["peak_c"] == pytest.approx(ref.peak_k - 273.15, abs=0.01)
            for node, peak in corner["peak_c"].items():
                assert peak == pytest.approx(float(np.max(expected.temperature(node))) - 273.15, abs=0.01)


def test_the_json_contract(duct_sweep):
    _, data = duct_sweep
    assert {"scenario", "caution", "varied", "points"} <= set(data)
    assert data["varied"] == [DUCT] and data["points_done"] == 2 and data["failed"] == 0
    for point in data["points"]:
        assert set(point) == {"values", "corners"}
        for corner in point["corners"]:
            assert {"name", "peak_c", "checks"} <= set(corner)
            for check in corner["checks"]:
                assert set(check) == {"name", "node", "limit_c", "peak_c", "margin_k", "status"}


def test_a_bigger_front_duct_cools_the_front_fluid_and_leaves_the_rear(duct_sweep):
    _, data = duct_sweep
    small, large = data["points"]
    fluid = lambda p, c: p["corners"][c]["peak_c"]["fluid"]
    assert fluid(large, 0) < fluid(small, 0)            # more cooling air, a cooler front corner: common practice, no published source
    assert fluid(large, 1) == fluid(small, 1)           # the rear corner has its own duct


def test_processes_give_the_numbers_of_one_process(duct_sweep):
    record, _ = duct_sweep
    again = sweep(SMALL, [f"{DUCT}=[4000, 18000]"], overrides=SHRINK, stints=1, workers=2, chunk_size=1)
    assert again.points == record.points


def test_a_combination_the_scenario_refuses_fails_alone():
    # each value fits alone (with the other's scenario value); an inner diameter of 330 mm with an
    # outer one of 360 mm leaves a 15 mm ring, too narrow for the caliper's 36 mm piston
    record = sweep(SMALL, ["corners.front.disc.inner_diameter_mm=[250, 330]",
                           "corners.front.disc.outer_diameter_mm=[360, 380]"], overrides=SHRINK, stints=1, workers=1)
    data = sweep_dict(record)
    failed = [p for p in data["points"] if "error" in p]
    assert data["failed"] == len(failed) == 1
    assert failed[0]["values"] == {"corners.front.disc.inner_diameter_mm": 330,
                                   "corners.front.disc.outer_diameter_mm": 360}
    assert "does not fit" in failed[0]["error"] and failed[0]["corners"] == []
    assert math.isnan(worst_check(failed[0])[0])
