"""Each duct carries its own air temperature (duct air may be warmer than ambient)."""
import numpy as np

from chain_runs import SHORT_PLAN, small_scenario
from thermo.chain.plan import expand_plan
from thermo.chain.corner_run import SegmentDuty, segment_schedule
from thermo.corner.build import build_corner


def _two_duct_scenario():
    return small_scenario(SHORT_PLAN, overrides=[
        ("corners.front.ducts.main.air_rise_k", 5.0),
        ("corners.front.ducts.caliper.target", "caliper"),
        ("corners.front.ducts.caliper.inlet_area_mm2", 2000.0),
        ("corners.front.ducts.caliper.air_rise_k", 15.0)])


def test_second_duct_has_its_own_boundary_and_air_rise():
    scenario = _two_duct_scenario()
    design = next(c for c in scenario.corners if c.name == "front")
    model = build_corner(design, scenario.ambient.pressure_pa, None)
    links = {link.name: link for link in model.network.links}
    assert links["duct_1_disc_eye"].boundary == "duct_air"
    assert links["duct_2_caliper"].boundary == "duct_air_2"
    segment = expand_plan(scenario)[0]
    t = segment.trace.time_s
    zeros = np.zeros_like(t)
    schedule = segment_schedule(scenario, design, segment, SegmentDuty(t, zeros, zeros, segment.trace.speed_mps))
    ambient = scenario.ambient.temperature_k
    # the values the scenario gives: ambient + air_rise_k of each duct
    assert np.allclose(schedule.value("duct_air_k", t), ambient + 5.0)
    assert np.allclose(schedule.value("duct_air_2_k", t), ambient + 15.0)
