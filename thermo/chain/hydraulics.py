"""The hydraulics block of a run (`run --json` key ``"hydraulics"``, the report, results.h5).

Each corner's caliper figures per bar of line pressure and per millimetre of piston travel, the
front share of the brake torque, the pressure ratio it implies, and with ``bias = "hydraulic"``
the line pressures per newton on the pedal and the pedal travel; after a run, the fluid each
corner's calipers drew from the reservoir as its pads wore, stint by stint. The formulas and
their assumptions (rigid hydraulics) are in ``thermo.duty.hydraulics``.
"""
from __future__ import annotations

from thermo.duty.bias import HydraulicBias
from thermo.duty.hydraulics import (
    PA_PER_BAR, MasterCylinders, axle_displacement_m3_per_m, axle_torque_nm_per_pa, bore_diameter_m,
    caliper_hydraulics, pressure_ratio_for_share,
)
from thermo.scenario.model import Scenario

AXLE_CORNER_CALIPERS = 2        # "front" and "rear" stand for both wheels of the axle


def scenario_calipers(scenario: Scenario) -> list:
    """``CaliperHydraulics`` of every corner of the scenario."""
    return [caliper_hydraulics(d.name, d.axle, AXLE_CORNER_CALIPERS if d.name in ("front", "rear") else 1,
                               d.piston.diameters_m, d.pad_mu, d.effective_radius_m) for d in scenario.corners]


def master_cylinders(scenario: Scenario) -> MasterCylinders | None:
    """The master cylinders, balance bar and pedal (None with ``bias = "fixed"``)."""
    bias = scenario.bias
    if not isinstance(bias, HydraulicBias):
        return None
    return MasterCylinders(bias.master_cylinder_front_m2, bias.master_cylinder_rear_m2,
                           bias.balance_bar_front_share, scenario.pedal_ratio)


def front_share(scenario: Scenario) -> float:
    """Front share of the brake torque: the fixed share, or the master cylinders' with these calipers."""
    mc = master_cylinders(scenario)
    return scenario.bias.front_share if mc is None else mc.front_share(scenario_calipers(scenario))


def hydraulics_dict(scenario: Scenario, corners=()) -> dict:
    """The JSON-ready block (README "Hydraulics"); ``corners``: the run's CornerResults, for the
    fluid drawn by pad wear per stint (left out when empty)."""
    calipers = scenario_calipers(scenario)
    mc = master_cylinders(scenario)
    share = front_share(scenario)
    tau_front, tau_rear = axle_torque_nm_per_pa(calipers, "front"), axle_torque_nm_per_pa(calipers, "rear")
    if mc is None:
        ratio = pressure_ratio_for_share(share, tau_front, tau_rear)
    else:
        p_front, p_rear = mc.line_pressure_pa_per_n()
        ratio = p_front / p_rear
    wear = {c.name: c.facts.pad_thickness_m for c in corners}
    design = {d.name: d for d in scenario.corners}
    out = {"bias": "fixed" if mc is None else "hydraulic", "front_share": share,
           "pressure_ratio_front_to_rear": ratio, "pedal_ratio": None if mc is None else mc.pedal_ratio,
           "knock_back_mm": scenario.knock_back_m * 1e3, "corners": {}, "master_cylinders": None}
    for c in calipers:
        entry = {"calipers": c.calipers,
                 "piston_area_one_side_mm2": c.area_one_side_m2 * 1e6,
                 "piston_area_caliper_mm2": c.area_caliper_m2 * 1e6,
                 "clamp_force_n_per_bar": c.clamp_force_n_per_pa * PA_PER_BAR,
                 "brake_torque_nm_per_bar": c.torque_nm_per_pa * PA_PER_BAR,
                 "fluid_displacement_cm3_per_mm": c.displacement_m3_per_m * 1e6 * 1e-3,
                 "leading_trailing_area_ratio": c.leading_trailing_area_ratio}
        if c.name in wear:
            entry["pad_wear_by_stint"] = _wear_by_stint(wear[c.name], design[c.name].pad.thickness_m, c)
        out["corners"][c.name] = entry
    if mc is not None:
        p_front, p_rear = mc.line_pressure_pa_per_n()
        per_mm = mc.pedal_travel_m(axle_displacement_m3_per_m(calipers, "front") * 1e-3,
                                   axle_displacement_m3_per_m(calipers, "rear") * 1e-3) * 1e3
        out["master_cylinders"] = {
            "front_bore_mm": bore_diameter_m(mc.area_front_m2) * 1e3,
            "rear_bore_mm": bore_diameter_m(mc.area_rear_m2) * 1e3,
            "front_area_mm2": mc.area_front_m2 * 1e6, "rear_area_mm2": mc.area_rear_m2 * 1e6,
            "balance_bar_front_share": mc.balance_bar_front_share,
            "line_pressure_front_bar_per_n": p_front / PA_PER_BAR, "line_pressure_rear_bar_per_n": p_rear / PA_PER_BAR,
            "pedal_travel_mm_per_mm_piston_travel": per_mm,
            "knock_back_pedal_travel_mm": per_mm * scenario.knock_back_m * 1e3}
    return out


def _wear_by_stint(thickness_rows, new_thickness_m: float, caliper) -> list[dict]:
    """Per stint (ended by a pad change or the end of the run; ``StintPadThickness`` rows): the pad
    worn and the fluid the corner's calipers drew from the reservoir to follow it (both pads of a
    caliper wear alike, so each side's pistons advance by one pad's wear: V = A_caliper x wear, for
    each caliper)."""
    rows = []
    for row in thickness_rows:
        worn = max(new_thickness_m - row.thickness_m, 0.0)
        rows.append({"stint_end": row.when, "wear_mm": worn * 1e3,
                     "fluid_cm3": caliper.calipers * caliper.displacement_m3_per_m * worn * 1e6})
    return rows
