"""A read scenario holds SI values: checked against unit definitions, standards and CoolProp."""
from __future__ import annotations

import math

import pytest

from thermo.scenario import load_scenario
from thermo.scenario.overrides import parse_override
from scenario_cases import SMALL


@pytest.fixture(scope="module")
def small():
    return load_scenario(SMALL)


def test_units_converted_once_to_si(small):
    front = small.corners[0]
    # SI Brochure (BIPM, 9th ed., 2019): 1 mm = 1e-3 m, 1 mm^2 = 1e-6 m^2, T/K = t/degC + 273.15
    assert front.disc.outer_diameter_m == pytest.approx(0.380, rel=1e-12)
    assert front.disc.inner_diameter_m == pytest.approx(0.250, rel=1e-12)
    assert front.pad.area_m2 == pytest.approx(9500e-6, rel=1e-12)
    assert front.piston.diameters_m == pytest.approx((0.030, 0.032, 0.036), rel=1e-12)
    assert small.ambient.temperature_k == pytest.approx(28.0 + 273.15, abs=1e-12)
    assert small.ambient.pressure_pa == pytest.approx(101.3e3, rel=1e-12)
    assert small.vehicle.rolling_radius_m("front") == pytest.approx(0.335, rel=1e-12)
    # 1 km/h = 1000 m / 3600 s (SI Brochure, units accepted for use with the SI)
    in_lap = small.plan.phases[1]
    assert in_lap.kind == "in_lap" and in_lap.pit_lane_speed_m_s == pytest.approx(60 / 3.6, rel=1e-12)
    # limits keep degC as named (bearing_c); thermo.limits converts where it compares
    assert small.limits.bearing_c == 150.0 and small.limits.piston_seal_c == 175.0


def test_air_density_against_coolprop(small):
    coolprop = pytest.importorskip("CoolProp.CoolProp")
    # CoolProp (Lemmon et al. 2000 air model) at the scenario's 28 degC and 101.3 kPa
    rho = coolprop.PropsSI("D", "T", 301.15, "P", 101300.0, "Air")
    assert small.vehicle.air_density_kg_m3 == pytest.approx(rho, rel=2e-3)


def test_altitude_mode_uses_the_standard_atmosphere():
    scenario = load_scenario(SMALL, overrides=[("ambient.pressure_mode", "altitude"), ("ambient.altitude_m", 1000.0)])
    # ISO 2533:1975 / U.S. Standard Atmosphere 1976 troposphere: p = p0 (1 - L h / T0)^(g0 M / (R* L)),
    # p0 = 101325 Pa, L = 0.0065 K/m, T0 = 288.15 K, exponent 5.255877 (about 89 875 Pa at 1000 m)
    expected = 101325.0 * (1.0 - 0.0065 * 1000.0 / 288.15) ** 5.255877
    assert scenario.ambient.pressure_pa == pytest.approx(expected, rel=1e-4)


@pytest.mark.parametrize("grade, dry_c, wet_c", [("DOT 3", 205.0, 140.0), ("DOT 4", 230.0, 155.0),
                                                  ("DOT 5.1", 260.0, 180.0)])
def test_dot_grade_boiling_points(grade, dry_c, wet_c):
    scenario = load_scenario(SMALL, overrides=[("fluid.grade", grade), ("fluid.dry_boiling_c", 0),
                                               ("fluid.wet_boiling_c", 0)])
    # FMVSS No. 116 (49 CFR 571.116) S5.1.1 dry and S5.1.2 wet minimum ERBP
    assert scenario.fluid.dry_boiling_c == dry_c
    assert scenario.fluid.wet_boiling_c == wet_c


def test_custom_fluid_keeps_the_makers_figures(small):
    assert (small.fluid.dry_boiling_c, small.fluid.wet_boiling_c, small.fluid.water_content_pct) == (312.0, 204.0, 0.5)


def test_fluid_material_is_used_not_ignored():
    # a key that does nothing is an error in this project's rules; [fluid] material reaches every corner
    scenario = load_scenario(SMALL, overrides=[("fluid.material", "phenolic_composite")])
    assert {c.fluid_material for c in scenario.corners} == {"phenolic_composite"}
    assert {c.fluid_material for c in load_scenario(SMALL).corners} == {"brake_fluid_glycol"}


def test_overrides_change_exactly_their_key(small):
    changed = load_scenario(SMALL, overrides=[parse_override("corners.front.piston.type=vented"),
                                              parse_override("corners.front.piston.vent_hole_count=4"),
                                              parse_override("corners.front.piston.vent_hole_diameter_mm=5"),
                                              parse_override("plan.phases.1.count=7")])
    assert changed.corners[0].piston.piston_type == "vented"
    assert changed.corners[0].piston.vent_hole_count == 4
    assert changed.corners[0].piston.vent_hole_diameter_m == pytest.approx(5e-3)
    assert changed.corners[1].piston == small.corners[1].piston
    assert changed.plan.phases[0].count == 7 and changed.plan.phases[3].count == 2
    assert small.raw["plan"]["phases"][0]["count"] == 3          # the parsed file itself is untouched


@pytest.mark.parametrize("text, value", [
    ("a.b=12", 12), ("a.b=0.5", 0.5), ("a.b=true", True), ('a.b="DOT 4"', "DOT 4"), ("a.b=vented", "vented"),
    ("a.b=[38, 38]", [38, 38]), ("a.b = DOT 4", "DOT 4"), ("a.b=1e-3", 1e-3),
])
def test_override_values_are_toml(text, value):
    # TOML v1.0.0 value syntax (toml.io); a bare word is taken as text (README "Comparing options")
    key, parsed = parse_override(text)
    assert key == "a.b" and parsed == value and type(parsed) is type(value)


def test_left_right_split_reports_two_sides():
    scenario = load_scenario(SMALL, overrides=[("brakes.left_share_front", 0.55)])
    assert [c.name for c in scenario.corners] == ["front_left", "front_right", "rear"]
    assert math.isclose(scenario.left_share_front, 0.55)
