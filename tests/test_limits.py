"""Limits and checks: FMVSS 116 boiling points, boiling at a water content, check statuses."""
from __future__ import annotations

import numpy as np
import pytest

from lapdata.units import KELVIN_AT_0C
from thermo.errors import ScenarioError
from thermo.limits import (
    FMVSS116_BOILING_POINTS_C, KEEN_1979_POINTS_PCT_C, KEEN_DECAY_PCT, KEEN_TOTAL_DROP_K, WET_WATER_CONTENT_PCT,
    CheckSpec, FluidSpec, Limits, boiling_drop_share, check_specs, evaluate_check, property_range_warnings, status_of,
)
from thermo.materials import get_material


@pytest.mark.parametrize("grade, dry_c, wet_c", [
    # 49 CFR 571.116 (FMVSS No. 116) S5.1.1 minimum dry ERBP and S5.1.2 minimum wet ERBP [degC]
    ("DOT 3", 205.0, 140.0),
    ("DOT 4", 230.0, 155.0),
    ("DOT 5", 260.0, 180.0),
    ("DOT 5.1", 260.0, 180.0),
])
def test_fmvss116_minimum_boiling_points(grade, dry_c, wet_c):
    assert FMVSS116_BOILING_POINTS_C[grade] == (dry_c, wet_c)
    fluid = FluidSpec.from_grade(grade)
    assert (fluid.dry_boiling_c, fluid.wet_boiling_c) == (dry_c, wet_c)


def test_grade_spellings_and_unknown_grade():
    assert FluidSpec.from_grade("dot4").name == "DOT 4"
    assert FluidSpec.from_grade("DOT 5.1").name == "DOT 5.1"
    with pytest.raises(ScenarioError, match="DOT 4"):
        FluidSpec.from_grade("DOT 44")


def test_wet_means_about_3_7_percent_water():
    # FMVSS 116 S7.2 humidification: the wet ERBP is taken at about 3.7 % water
    assert WET_WATER_CONTENT_PCT == 3.7


def test_keen_points_are_as_published():
    # Keen, "Vapour lock in car braking systems", TRRL Laboratory Report LR 903 (1979), abstract:
    # vapour lock point around 250 degC dry, around 180 degC at 1 % water, about 145 degC at 3 %
    assert KEEN_1979_POINTS_PCT_C == ((0.0, 250.0), (1.0, 180.0), (3.0, 145.0))


def test_exponential_through_keen_points_has_its_closed_form():
    # analytic solution: drops 70 K at 1 % and 105 K at 3 % give 1 + x + x^2 = 1.5, x = (sqrt(3) - 1) / 2,
    # so w0 = 1 / ln(1 + sqrt(3)) % water and A = 70 / (1 - x) = 140 / (3 - sqrt(3)) K
    assert KEEN_DECAY_PCT == pytest.approx(1.0 / np.log(1.0 + np.sqrt(3.0)), rel=1e-12)
    assert KEEN_TOTAL_DROP_K == pytest.approx(140.0 / (3.0 - np.sqrt(3.0)), rel=1e-12)


def test_scaled_curve_reproduces_keen_points():
    # a fluid with Keen's dry point (250 degC) and the curve's own 3.7 % point must give back
    # Keen (1979, TRRL LR 903): 180 degC at 1 % water and 145 degC at 3 %
    wet = 250.0 - KEEN_TOTAL_DROP_K * (1.0 - np.exp(-WET_WATER_CONTENT_PCT / KEEN_DECAY_PCT))
    fluid = FluidSpec("Keen 1979 fluid", 250.0, wet)
    assert fluid.boiling_at_water_c(1.0) == pytest.approx(180.0, abs=1e-9)
    assert fluid.boiling_at_water_c(3.0) == pytest.approx(145.0, abs=1e-9)
    # the share of the drop is independent of the scaling: 70 / 105 between 1 % and 3 % (Keen 1979)
    assert boiling_drop_share(1.0) / boiling_drop_share(3.0) == pytest.approx(70.0 / 105.0, rel=1e-12)


@pytest.mark.parametrize("grade", sorted(FMVSS116_BOILING_POINTS_C))
def test_curve_runs_from_dry_to_wet_falling_and_below_the_straight_line(grade):
    # FMVSS No. 116 (49 CFR 571.116) S5.1.1 dry and S5.1.2 wet ERBP at about 3.7 % water (S7.2)
    dry, wet = FMVSS116_BOILING_POINTS_C[grade]
    fluid = FluidSpec.from_grade(grade)
    assert fluid.boiling_at_water_c(0.0) == pytest.approx(dry, abs=1e-12)
    assert fluid.boiling_at_water_c(WET_WATER_CONTENT_PCT) == pytest.approx(wet, abs=1e-12)
    water = np.linspace(0.0, 10.0, 401)
    boiling = np.array([fluid.boiling_at_water_c(w) for w in water])
    assert np.all(np.diff(boiling) < 0)                      # falls with every added water
    # Keen (1979): "further increases have progressively less effect" -> below the straight line, the safe side
    inside = (water > 0.0) & (water < WET_WATER_CONTENT_PCT)
    straight = dry - (dry - wet) * water[inside] / WET_WATER_CONTENT_PCT
    assert np.all(boiling[inside] < straight)
    # beyond 3.7 % the fit flattens: at most 2.5 % of the dry-to-wet drop below wet (documented limitation)
    assert wet - 0.025 * (dry - wet) < boiling[-1] < wet


def test_dot4_at_one_percent_has_lost_about_two_thirds_of_its_drop():
    # Keen (1979): 70 of the 107.7 K fitted drop to 3.7 % comes in the first percent (0.650);
    # DOT 4 minimums of FMVSS 116 (230 / 155 degC) -> 230 - 75 x 0.650 = 181.3 degC
    fluid = FluidSpec.from_grade("DOT 4", water_content_pct=1.0)
    assert boiling_drop_share(1.0) == pytest.approx(0.650, abs=5e-4)
    assert fluid.boiling_at_water_c() == pytest.approx(230.0 - 75.0 * boiling_drop_share(1.0), rel=1e-12)
    assert fluid.boiling_at_water_c() == pytest.approx(181.3, abs=0.05)


def test_boiling_point_from_a_user_table_is_interpolated():
    # an invented maker's table (water %, degC) falling steeply over the first percent
    table = ((0.0, 312.0), (1.0, 260.0), (2.0, 235.0), (3.7, 204.0))
    fluid = FluidSpec("custom", 312.0, 204.0, 1.5, table, source="invented")
    assert fluid.boiling_at_water_c() == pytest.approx(247.5)       # halfway 260 -> 235
    assert fluid.boiling_at_water_c(0.5) == pytest.approx(286.0)
    assert fluid.boiling_at_water_c(5.0) == pytest.approx(204.0)    # held beyond the table
    with pytest.raises(ScenarioError, match="boiling_table"):
        FluidSpec("custom", 312.0, 204.0, 1.0, ((1.0, 260.0), (0.5, 280.0)))


def test_fluid_spec_rejects_bad_values():
    with pytest.raises(ScenarioError, match="wet_boiling_c"):
        FluidSpec("x", 200.0, 210.0)
    with pytest.raises(ScenarioError, match="water_content_pct"):
        FluidSpec("x", 230.0, 155.0, water_content_pct=-1.0)


@pytest.mark.parametrize("margin, band, status", [
    (25.0, 20.0, "ok"),
    (20.0, 20.0, "ok"),            # at the band edge: margin == band is no longer a caution
    (19.999, 20.0, "caution"),
    (0.0, 20.0, "caution"),        # at the limit itself: caution, not yet exceeded
    (-1e-9, 20.0, "exceeded"),
    (5.0, 0.0, "ok"),
])
def test_status_at_the_band_edges(margin, band, status):
    assert status_of(margin, band) == status


def test_evaluate_check_peak_time_margin_status():
    t = np.linspace(0.0, 100.0, 101)
    temps = 400.0 + 50.0 * np.exp(-((t - 63.0) / 10.0) ** 2)       # peak 450 K at 63 s
    spec = CheckSpec("fluid_boiling_dry", "fluid", 470.0, 20.0, "test")
    result = evaluate_check(spec, t, temps)
    assert result.peak_k == pytest.approx(450.0)
    assert result.peak_time_s == pytest.approx(63.0)
    assert result.margin_k == pytest.approx(20.0)
    assert result.status == "ok"
    assert evaluate_check(replace_limit(spec, 465.0), t, temps).status == "caution"
    assert evaluate_check(replace_limit(spec, 449.0), t, temps).status == "exceeded"


def replace_limit(spec, limit_k):
    return CheckSpec(spec.name, spec.node, limit_k, spec.caution_band_k, spec.source)


EXISTING_CHECKS = ("fluid_boiling_dry", "fluid_boiling_wet", "fluid_boiling_at_water_content", "bearing_grease",
                   "piston_seal", "caliper_body", "disc_max", "pad_max")


def test_check_specs_cover_fluid_bearing_seal_caliper_disc_pad():
    fluid = FluidSpec.from_grade("DOT 4", water_content_pct=1.85)
    specs = {s.name: s for s in check_specs(fluid, Limits(), disc_node="disc_surface")}
    assert tuple(specs) == EXISTING_CHECKS                         # names and order are users' JSON keys
    assert specs["fluid_boiling_dry"].limit_k == pytest.approx(230.0 + KELVIN_AT_0C)
    assert specs["fluid_boiling_wet"].limit_k == pytest.approx(155.0 + KELVIN_AT_0C)
    # Keen (1979, TRRL LR 903) curve scaled to DOT 4's FMVSS 116 points: 230 - 75 x share(1.85 %)
    at_water = 230.0 - 75.0 * boiling_drop_share(1.85)
    assert specs["fluid_boiling_at_water_content"].limit_k == pytest.approx(at_water + KELVIN_AT_0C)
    assert at_water < 192.5                                        # the straight line's value, unsafe side
    assert "Keen" in specs["fluid_boiling_at_water_content"].source
    assert "scaled to this fluid's dry and wet points" in specs["fluid_boiling_at_water_content"].source
    assert specs["disc_max"].node == "disc_surface"
    assert specs["piston_seal"].node == "piston_seal"
    # SAE J1603 tests EPDM seals at 175 degC in dry air (the default seal limit)
    assert specs["piston_seal"].limit_k == pytest.approx(175.0 + KELVIN_AT_0C)
    # bearing grease 150 degC with caution from 120 degC: common practice, no published source
    assert specs["bearing_grease"].limit_k == pytest.approx(150.0 + KELVIN_AT_0C)
    assert specs["bearing_grease"].caution_band_k == 30.0
    assert {s.node for s in specs.values()} == {"fluid", "bearing", "piston_seal", "caliper", "disc_surface", "pad"}


def test_user_table_source_names_the_table():
    fluid = FluidSpec("custom", 312.0, 204.0, 1.5, ((0.0, 312.0), (3.7, 204.0)), source="invented")
    specs = {s.name: s for s in check_specs(fluid, Limits())}
    assert specs["fluid_boiling_at_water_content"].source.endswith("user table, interpolated")


def test_fluid_checks_read_the_given_fluid_node():
    specs = check_specs(FluidSpec.from_grade("DOT 4"), Limits(), "disc_surface", fluid_node="fluid_at_piston")
    assert [s.node for s in specs[:3]] == ["fluid_at_piston"] * 3
    assert tuple(s.name for s in specs) == EXISTING_CHECKS


def test_material_checks_cover_nodes_no_other_check_watches():
    nodes = {"piston": get_material("titanium_6al_4v"), "caliper": get_material("aluminium_2618_t61"),
             "disc_surface": get_material("grey_cast_iron"), "pad": get_material("pad_sintered"),
             "backing_plate": get_material("steel_4340"), "fluid": get_material("brake_fluid_glycol"),
             "hub": get_material("aluminium_7075_t6")}
    specs = check_specs(FluidSpec.from_grade("DOT 4"), Limits(), "disc_surface", node_materials=nodes)
    names = [s.name for s in specs]
    assert tuple(names[:8]) == EXISTING_CHECKS
    # caliper, disc_surface and pad keep the user's limits; the fluid has no service limit (its boiling point governs)
    assert names[8:] == ["piston_material", "backing_plate_material", "hub_material"]
    piston = specs[8]
    assert piston.node == "piston"
    # Badea et al., U.P.B. Sci. Bull. B 76(1) 2014: industrial use of Ti-6Al-4V usually limited to 400 degC
    assert piston.limit_k == pytest.approx(400.0 + KELVIN_AT_0C)
    assert piston.caution_band_k == Limits().material_caution_band_k == 20.0
    assert piston.source.startswith("titanium_6al_4v service limit (") and "Badea" in piston.source
    assert {s.node for s in specs} >= {"piston", "backing_plate", "hub"}


def test_no_node_materials_changes_nothing():
    fluid, limits = FluidSpec.from_grade("DOT 3"), Limits()
    assert check_specs(fluid, limits, "disc") == check_specs(fluid, limits, "disc", node_materials={})


def test_property_range_warning_names_corner_node_peak_and_range():
    # grey iron property tables of materials.toml end at 800 degC; the 7075-T6 specific heat at 200 degC
    nodes = {"disc_surface": get_material("grey_cast_iron"), "pad": get_material("pad_organic"),
             "hub": get_material("aluminium_7075_t6"), "caliper": get_material("aluminium_2618_t61")}
    peaks = {"disc_surface": 850.0 + KELVIN_AT_0C, "pad": 900.0 + KELVIN_AT_0C,   # organic pad: one-row constants
             "hub": 210.0 + KELVIN_AT_0C, "caliper": 150.0 + KELVIN_AT_0C}       # caliper inside its data
    lines = property_range_warnings("front_left", nodes, peaks)
    assert len(lines) == 2
    assert lines[0].startswith("corner front_left: node disc_surface peaks at 850.0 degC")
    assert "grey_cast_iron (specific heat 20-800 degC, conductivity 20-800 degC)" in lines[0]
    assert lines[1].startswith("corner front_left: node hub peaks at 210.0 degC")
    assert "aluminium_7075_t6 (specific heat 20-200 degC)" in lines[1]
    assert all("\n" not in line for line in lines)
    assert property_range_warnings("front_left", nodes, {"disc_surface": 800.0 + KELVIN_AT_0C}) == []


def test_limits_reject_negative_bands():
    with pytest.raises(ScenarioError, match="bearing_caution_band_k"):
        Limits(bearing_caution_band_k=-1.0)
