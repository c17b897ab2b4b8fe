"""Limits and checks: FMVSS 116 boiling points, boiling at a water content, check statuses."""
from __future__ import annotations

import numpy as np
import pytest

from lapdata.units import KELVIN_AT_0C
from thermo.errors import ScenarioError
from thermo.limits import (
    FMVSS116_BOILING_POINTS_C, WET_WATER_CONTENT_PCT, CheckSpec, FluidSpec, Limits, check_specs, evaluate_check,
    status_of,
)


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


def test_boiling_point_falls_linearly_between_dry_and_wet():
    # documented simplification: linear in water content from dry (0 %) to wet (3.7 %), wet beyond;
    # DOT 4: 230 - (230 - 155) x 1.85 / 3.7 = 192.5 degC at half the wet water content
    fluid = FluidSpec.from_grade("DOT 4")
    assert fluid.boiling_at_water_c(0.0) == pytest.approx(230.0)
    assert fluid.boiling_at_water_c(1.85) == pytest.approx(192.5)
    assert fluid.boiling_at_water_c(3.7) == pytest.approx(155.0)
    assert fluid.boiling_at_water_c(6.0) == pytest.approx(155.0)
    assert FluidSpec.from_grade("DOT 3", water_content_pct=1.0).boiling_at_water_c() == pytest.approx(205.0 - 65.0 / 3.7)


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


def test_check_specs_cover_fluid_bearing_seal_caliper_disc_pad():
    fluid = FluidSpec.from_grade("DOT 4", water_content_pct=1.85)
    specs = {s.name: s for s in check_specs(fluid, Limits(), disc_node="disc_surface")}
    assert specs["fluid_boiling_dry"].limit_k == pytest.approx(230.0 + KELVIN_AT_0C)
    assert specs["fluid_boiling_wet"].limit_k == pytest.approx(155.0 + KELVIN_AT_0C)
    assert specs["fluid_boiling_at_water_content"].limit_k == pytest.approx(192.5 + KELVIN_AT_0C)
    assert specs["disc_max"].node == "disc_surface"
    assert specs["piston_seal"].node == "piston_seal"
    # SAE J1603 tests EPDM seals at 175 degC in dry air (the default seal limit)
    assert specs["piston_seal"].limit_k == pytest.approx(175.0 + KELVIN_AT_0C)
    # bearing grease 150 degC with caution from 120 degC: common practice, no published source
    assert specs["bearing_grease"].limit_k == pytest.approx(150.0 + KELVIN_AT_0C)
    assert specs["bearing_grease"].caution_band_k == 30.0
    assert {s.node for s in specs.values()} == {"fluid", "bearing", "piston_seal", "caliper", "disc_surface", "pad"}


def test_limits_reject_negative_bands():
    with pytest.raises(ScenarioError, match="bearing_caution_band_k"):
        Limits(bearing_caution_band_k=-1.0)
