"""Hydraulics (issue 16): every figure checked against a hand calculation written beside it.

Sources of the relations: the area of a circle, pi d^2 / 4; the pressure on a piston, F = p A;
the brake torque of a caliper with two friction faces, T = 2 mu F r_eff (any brake text, e.g.
Limpert, Brake Design and Safety, from memory); the lever law of a rigid balance bar (statics);
volume = area x travel. 1 bar = 1e5 Pa (SI Brochure, 9th ed., Table 8).
"""
from __future__ import annotations

import math
from pathlib import Path

import pytest

from thermo.chain.hydraulics import front_share, hydraulics_dict, master_cylinders, scenario_calipers
from thermo.duty.bias import HydraulicBias
from thermo.duty.hydraulics import (
    balance_bar_for_share, leading_trailing_area_ratio, piston_area_m2, pressure_ratio_for_share, rear_area_for_share,
)
from thermo.scenario import load_scenario

DEMO = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
HYDRAULIC = [("brakes.bias", "hydraulic"), ("brakes.master_cylinder_front_mm", 19.05),
             ("brakes.master_cylinder_rear_mm", 22.2), ("brakes.balance_bar_front_share", 0.55),
             ("brakes.pedal_ratio", 4.5), ("brakes.knock_back_mm", 0.15)]


def test_piston_areas_and_the_leading_trailing_ratio_by_hand():
    # pi/4 (32^2 + 36^2 + 38^2) = pi/4 x 3764 = 2956.24 mm^2
    assert piston_area_m2([0.032, 0.036, 0.038]) * 1e6 == pytest.approx(2956.24, abs=0.01)
    # leading 32 mm over trailing 38 mm: 1024 / 1444 = 0.70914
    assert leading_trailing_area_ratio([0.032, 0.036, 0.038]) == pytest.approx(1024 / 1444)
    assert leading_trailing_area_ratio([0.036]) == 1.0


def test_the_demo_calipers_by_hand():
    h = hydraulics_dict(load_scenario(DEMO))
    front, rear = h["corners"]["front"], h["corners"]["rear"]
    # front pistons 30, 32, 36 mm a side: pi/4 (900 + 1024 + 1296) = 2528.98 mm^2, caliper twice that
    assert front["piston_area_one_side_mm2"] == pytest.approx(2528.98, abs=0.01)
    assert front["piston_area_caliper_mm2"] == pytest.approx(5057.96, abs=0.02)
    # clamp force per bar: 1e5 Pa x 2528.98e-6 m^2 = 252.898 N
    assert front["clamp_force_n_per_bar"] == pytest.approx(252.898, abs=0.001)
    # torque per bar: 2 x 0.50 x 252.898 N x r_eff, r_eff = (380 + 250) / 4 mm = 0.1575 m -> 39.831 N m
    assert front["brake_torque_nm_per_bar"] == pytest.approx(39.831, abs=0.001)
    # fluid per mm of piston travel: 5057.96 mm^2 x 1 mm = 5.058 cm^3
    assert front["fluid_displacement_cm3_per_mm"] == pytest.approx(5.05796, abs=1e-5)
    assert front["leading_trailing_area_ratio"] == pytest.approx(900 / 1296)
    assert front["calipers"] == 2                        # the axle corner stands for both front wheels
    # rear 28, 30 mm: pi/4 (784 + 900) = 1322.61 mm^2; torque 2 x 0.48 x 132.261 N x (355 + 240)/4 mm = 18.887 N m
    assert rear["brake_torque_nm_per_bar"] == pytest.approx(18.887, abs=0.001)
    # fixed share 0.60: p_f / p_r = 0.6 / 0.4 x 18.887 / 39.831 = 0.71127
    assert h["bias"] == "fixed" and h["front_share"] == 0.60 and h["pedal_ratio"] is None
    assert h["pressure_ratio_front_to_rear"] == pytest.approx(1.5 * 18.887 / 39.831, rel=1e-4)
    assert h["master_cylinders"] is None


def test_hydraulic_bias_line_pressures_and_pedal_travel_by_hand():
    scenario = load_scenario(DEMO, HYDRAULIC)
    h = hydraulics_dict(scenario)
    mc = h["master_cylinders"]
    a_front, a_rear = math.pi / 4 * 19.05 ** 2, math.pi / 4 * 22.2 ** 2          # 285.02, 387.08 mm^2
    # line pressure per newton on the pedal: ratio x bar share / bore area
    assert mc["line_pressure_front_bar_per_n"] == pytest.approx(4.5 * 0.55 / (a_front * 1e-6) / 1e5, rel=1e-9)
    assert mc["line_pressure_rear_bar_per_n"] == pytest.approx(4.5 * 0.45 / (a_rear * 1e-6) / 1e5, rel=1e-9)
    # front share: 2 calipers x 39.831 N m/bar x p_f against 2 x 18.887 x p_r
    p_f, p_r = 0.55 / a_front, 0.45 / a_rear
    share = 39.831 * p_f / (39.831 * p_f + 18.887 * p_r)
    assert h["front_share"] == pytest.approx(share, rel=1e-4)
    assert h["front_share"] == pytest.approx(scenario.bias.front_share, rel=1e-12)   # the chain's own bias model
    # pedal travel per mm of piston travel: strokes 2 x 5057.96 / a_front and 2 x 2645.22 / a_rear mm,
    # pushrod 0.55 s_f + 0.45 s_r, pedal 4.5 x that; the knock-back takes 0.15 mm of piston travel
    per_mm = 4.5 * (0.55 * 2 * 5057.96 / a_front + 0.45 * 2 * 2645.22 / a_rear)
    assert mc["pedal_travel_mm_per_mm_piston_travel"] == pytest.approx(per_mm, rel=1e-5)
    assert mc["knock_back_pedal_travel_mm"] == pytest.approx(0.15 * per_mm, rel=1e-5)
    assert mc["front_bore_mm"] == pytest.approx(19.05) and h["pedal_ratio"] == 4.5


def test_rebalancing_restores_the_share_and_the_pressure_ratio_gives_it():
    scenario = load_scenario(DEMO, HYDRAULIC + [("corners.front.piston.diameters_mm", [34, 38, 40])])
    calipers, mc = scenario_calipers(scenario), master_cylinders(scenario)
    target = front_share(load_scenario(DEMO, HYDRAULIC))
    bar = balance_bar_for_share(target, calipers, mc.area_front_m2, mc.area_rear_m2)
    rebalanced = HydraulicBias(master_cylinder_front_m2=mc.area_front_m2, master_cylinder_rear_m2=mc.area_rear_m2,
                               balance_bar_front_share=bar, piston_area_front_m2=calipers[0].area_one_side_m2,
                               piston_area_rear_m2=calipers[1].area_one_side_m2, pad_mu_front=0.50, pad_mu_rear=0.48,
                               effective_radius_front_m=0.1575, effective_radius_rear_m=0.14875)
    assert rebalanced.front_share == pytest.approx(target, abs=1e-12)
    area = rear_area_for_share(target, calipers, mc.area_front_m2, mc.balance_bar_front_share)
    again = HydraulicBias(master_cylinder_front_m2=mc.area_front_m2, master_cylinder_rear_m2=area,
                          balance_bar_front_share=mc.balance_bar_front_share,
                          piston_area_front_m2=calipers[0].area_one_side_m2, piston_area_rear_m2=calipers[1].area_one_side_m2,
                          pad_mu_front=0.50, pad_mu_rear=0.48, effective_radius_front_m=0.1575,
                          effective_radius_rear_m=0.14875)
    assert again.front_share == pytest.approx(target, abs=1e-12)
    ratio = pressure_ratio_for_share(0.6, calipers[0].torque_nm_per_pa, calipers[1].torque_nm_per_pa)
    assert 0.6 == pytest.approx(calipers[0].torque_nm_per_pa * ratio / (calipers[0].torque_nm_per_pa * ratio
                                                                       + calipers[1].torque_nm_per_pa))


def test_the_fluid_drawn_by_pad_wear_follows_the_worn_thickness():
    from thermo.results import CornerFacts, CornerResult, StintPadThickness
    scenario = load_scenario(DEMO)
    new = scenario.corners[0].pad.thickness_m
    facts = CornerFacts(pad_thickness_m=(StintPadThickness("stop", new - 1.5e-3), StintPadThickness("end of run", new - 0.5e-3)),
                        pad_minimum_thickness_m=0.005, link_to_boundary=(), heat_partition_disc=0.9,
                        removed_with_pad_material_j=0.0, initial_temperature_k=300.0, warnings=())
    corner = CornerResult("front", (), None, None, (), (), None, None, None, (), facts=facts)
    rows = hydraulics_dict(scenario, [corner])["corners"]["front"]["pad_wear_by_stint"]
    # 2 calipers x 5057.96 mm^2 x 1.5 mm = 15173.9 mm^3 = 15.17 cm^3
    assert rows[0] == {"stint_end": "stop", "wear_mm": pytest.approx(1.5), "fluid_cm3": pytest.approx(15.1739, abs=1e-3)}
    assert rows[1]["fluid_cm3"] == pytest.approx(5.05796, abs=1e-4)
