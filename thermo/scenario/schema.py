"""The scenario file's keys: their units, SI names, types and defaults (one table, documented in README).

A TOML key carries its unit in its name (``outer_diameter_mm``); ``Field`` converts it once to
the SI name (``outer_diameter_m``). Unknown keys are errors with a suggestion, missing required
keys name their section. Nothing is inferred from which keys happen to be present: model choices
(piston type, duct flow mode, bias mode, lap source) are explicit keys with documented defaults.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from lapdata.units import BAR, KELVIN_AT_0C, KMH, KPA, MM, MM2, CM3
from thermo.solver.settings import METHODS as SOLVER_METHODS

REQUIRED = object()


@dataclass(frozen=True)
class Field:
    """One TOML key: converted value = value * factor + offset, stored under ``si_name``."""

    si_name: str
    default: Any = REQUIRED
    factor: float = 1.0
    offset: float = 0.0
    kind: type = float
    choices: tuple = ()
    minimum: float | None = None
    maximum: float | None = None
    doc: str = ""


def f(si, default=REQUIRED, factor=1.0, offset=0.0, kind=float, choices=(), minimum=None, maximum=None, doc=""):
    return Field(si, default, factor, offset, kind, choices, minimum, maximum, doc)


def mm(si, default=REQUIRED, **kw):
    return f(si, default if default is REQUIRED or default is None else default, MM, minimum=0.0, **kw)


def degc(si, default=REQUIRED, **kw):
    return f(si, default, 1.0, KELVIN_AT_0C, **kw)


SCENARIO = {
    "name": f("name", "unnamed scenario", kind=str),
    "description": f("description", "", kind=str),
}

CAR = {
    "mass_kg": f("mass_kg", minimum=1.0, doc="car with driver, without fuel"),
    "fuel_kg": f("fuel_kg", 0.0, minimum=0.0, doc="fuel at the start"),
    "fuel_consumption_kg_per_lap": f("fuel_consumption_kg_per_lap", 0.0, minimum=0.0),
    "fuel_capacity_kg": f("fuel_capacity_kg", 1.0e9, minimum=0.0),
    "drag_cd_a_m2": f("drag_cd_a_m2", minimum=0.0),
    "downforce_cl_a_m2": f("downforce_cl_a_m2", 0.0),
    "rolling_resistance": f("rolling_resistance_coefficient", 0.012, minimum=0.0, maximum=1.0),
    "rotating_inertia_factor": f("rotating_inertia_factor", 0.04, minimum=0.0, maximum=1.0),
    "engine_braking_force_n": f("engine_braking_force_n", 0.0, minimum=0.0),
    "rolling_radius_front_mm": mm("rolling_radius_front_m"),
    "rolling_radius_rear_mm": mm("rolling_radius_rear_m"),
    # envelope for the track builder
    "braking_decel_g": f("braking_decel_g", 1.5, minimum=0.05),
    "lateral_grip_g": f("lateral_grip_g", 1.5, minimum=0.05),
    "power_kw": f("power_w", 400.0, factor=1000.0, minimum=0.1),
    "traction_accel_g": f("traction_accel_g", 0.8, minimum=0.05),
    "top_speed_kmh": f("top_speed_kmh", 0.0, minimum=0.0, doc="0 = drag-limited only"),
}

BRAKES = {
    "bias": f("bias", "fixed", kind=str, choices=("fixed", "hydraulic")),
    "front_share": f("front_share", 0.6, minimum=0.0, maximum=1.0),
    "master_cylinder_front_mm": mm("master_cylinder_front_diameter_m", 0.0),
    "master_cylinder_rear_mm": mm("master_cylinder_rear_diameter_m", 0.0),
    "balance_bar_front_share": f("balance_bar_front_share", 0.5, minimum=0.0, maximum=1.0),
    "left_share_front": f("left_share_front", 0.5, minimum=0.0, maximum=1.0),
    "left_share_rear": f("left_share_rear", 0.5, minimum=0.0, maximum=1.0),
    "power_method": f("power_method", "energy", kind=str, choices=("energy", "pressure")),
}

AMBIENT = {
    "temperature_c": degc("temperature_k", 25.0),
    "temperature_profile_h_c": f("temperature_profile_h_c", [], kind=list,
                                 doc="[[hours from start, degC], ...]; overrides temperature_c when not empty"),
    "pressure_mode": f("pressure_mode", "pressure", kind=str, choices=("pressure", "altitude")),
    "pressure_kpa": f("pressure_pa", 101.325, factor=KPA, minimum=10.0),
    "altitude_m": f("altitude_m", 0.0, minimum=-500.0, maximum=6000.0),
}

FLUID = {
    "grade": f("grade", "DOT 4", kind=str),
    "dry_boiling_c": f("dry_boiling_c", 0.0),
    "wet_boiling_c": f("wet_boiling_c", 0.0),
    "water_content_pct": f("water_content_pct", 0.0, minimum=0.0, maximum=10.0),
    "boiling_table_pct_c": f("boiling_table_pct_c", [], kind=list, doc="[[water %, degC], ...]"),
    "material": f("material", "brake_fluid_glycol", kind=str),
}

LIMITS = {
    "bearing_c": f("bearing_c", 150.0), "bearing_caution_band_k": f("bearing_caution_band_k", 30.0, minimum=0.0),
    "piston_seal_c": f("piston_seal_c", 175.0), "piston_seal_caution_band_k": f("piston_seal_caution_band_k", 25.0, minimum=0.0),
    "caliper_c": f("caliper_c", 200.0), "caliper_caution_band_k": f("caliper_caution_band_k", 20.0, minimum=0.0),
    "disc_c": f("disc_c", 750.0), "disc_caution_band_k": f("disc_caution_band_k", 50.0, minimum=0.0),
    "pad_c": f("pad_c", 650.0), "pad_caution_band_k": f("pad_caution_band_k", 50.0, minimum=0.0),
    "fluid_caution_band_k": f("fluid_caution_band_k", 20.0, minimum=0.0),
    "material_caution_band_k": f("material_caution_band_k", 20.0, minimum=0.0,
                                 doc="band of the checks against a part's material service limit"),
}

CORNER = {
    "pad_mu": f("pad_mu", 0.5, minimum=0.05, maximum=1.5),
}

DISC = {
    "material": f("material", kind=str),
    "outer_diameter_mm": mm("outer_diameter_m"),
    "inner_diameter_mm": mm("inner_diameter_m"),
    "thickness_mm": mm("thickness_m"),
    "vented": f("vented", kind=bool),
    "cheek_thickness_mm": mm("cheek_thickness_m", 0.0),
    "vane_count": f("vane_count", 0, kind=int, minimum=0),
    "vane_thickness_mm": mm("vane_thickness_m", 0.0),
    "layers": f("layers", 0, kind=int, minimum=0, maximum=12,
                doc="nodes through each cheek; 0 = automatic, from the braking pulse's penetration depth"),
    "vane_pumping_coefficient": f("vane_pumping_coefficient", 0.2, minimum=0.0, maximum=1.0),
    "bell_mass_kg": f("bell_mass_kg", 0.8, minimum=0.0),
    "bell_material": f("bell_material", "aluminium_7075_t6", kind=str),
    "bell_area_m2": f("bell_area_m2", 0.04, minimum=0.0),
    "emissivity": f("emissivity_override", None, minimum=0.0, maximum=1.0, doc="omit to use the material's"),
    "face_correlation": f("face_correlation", "rotating", kind=str, choices=("rotating", "limpert"),
                          doc="rotating: Cobb & Saunders on the wheel speed (or cross-flow); limpert: Limpert's form on the local air speed"),
}

PAD = {
    "material": f("material", kind=str),
    "area_mm2": f("area_m2", factor=MM2, minimum=0.0, doc="friction face of one pad"),
    "thickness_mm": mm("thickness_m"),
    "minimum_thickness_mm": mm("minimum_thickness_m", 3.0),
    "backing_thickness_mm": mm("backing_thickness_m", 5.0),
    "backing_material": f("backing_material", "steel_4340", kind=str),
    "heat_partition": f("partition_override", None, minimum=0.0, maximum=1.0,
                        doc="fixed disc share; omit to let the interface split the heat"),
    "layers": f("layers", 0, kind=int, minimum=0, maximum=12,
                doc="nodes through the friction material; 0 = automatic, from the penetration depth"),
    "rest_contact_conductance_w_m2k": f("rest_contact_conductance_w_m2k", 400.0, minimum=0.0,
                                        doc="pad resting on the disc between applications"),
}

PISTON = {
    "type": f("piston_type", "solid", kind=str, choices=("solid", "vented")),
    "material": f("material", kind=str),
    "diameters_mm": f("diameters_m", factor=MM, kind=list, doc="one per piston on ONE side"),
    "height_mm": mm("height_m", 25.0),
    "wall_thickness_mm": mm("wall_thickness_m", 3.0),
    "crown_thickness_mm": mm("crown_thickness_m", 4.0),
    "crown_contact_fraction": f("crown_contact_fraction", 0.6, minimum=0.0, maximum=1.0),
    "vent_hole_count": f("vent_hole_count", 0, kind=int, minimum=0),
    "vent_hole_diameter_mm": mm("vent_hole_diameter_m", 0.0),
    "insert_material": f("insert_material", "ceramic_zirconia", kind=str),
    "insert_thickness_mm": mm("insert_thickness_m", 0.0),
    "shim_material": f("shim_material", "mica_ceramic_fibre_shim", kind=str),
    "shim_thickness_mm": mm("shim_thickness_m", 0.0),
    "contact_conductance_w_m2k": f("contact_conductance_w_m2k", 3000.0, minimum=0.0),
    "seal_gap_conductance_w_m2k": f("seal_gap_conductance_w_m2k", 300.0, minimum=0.0),
}

CALIPER = {
    "material": f("material", kind=str),
    "mass_kg": f("mass_kg", minimum=0.0),
    "area_m2": f("area_m2", minimum=0.0, doc="outer surface in the airflow"),
    "fluid_wetted_area_mm2": f("fluid_wetted_area_m2", factor=MM2, minimum=0.0),
    "fluid_volume_cm3": f("fluid_volume_m3", factor=CM3, minimum=0.0),
    "fluid_film_conductance_w_m2k": f("fluid_film_conductance_w_m2k", 150.0, minimum=0.0),
    "piston_fluid_gap_mm": mm("piston_fluid_gap_m", 1.0, doc="fluid layer between each piston and its bore bottom"),
    "mount_conductance_w_k": f("mount_conductance_w_k", 2.0, minimum=0.0),
    "view_factor_from_disc": f("view_factor_from_disc", 0.08, minimum=0.0, maximum=1.0),
    "emissivity": f("emissivity_override", None, minimum=0.0, maximum=1.0),
}

HUB = {
    "hub_mass_kg": f("hub_mass_kg", 2.5, minimum=0.0),
    "hub_material": f("hub_material", "steel_4340", kind=str),
    "hub_area_m2": f("hub_area_m2", 0.03, minimum=0.0),
    "bearing_mass_kg": f("bearing_mass_kg", 0.9, minimum=0.0),
    "bearing_material": f("bearing_material", "bearing_steel_52100", kind=str),
    "upright_mass_kg": f("upright_mass_kg", 3.0, minimum=0.0),
    "upright_material": f("upright_material", "aluminium_6061_t6", kind=str),
    "upright_area_m2": f("upright_area_m2", 0.12, minimum=0.0),
    "disc_to_bell_w_k": f("disc_to_bell_w_k", 4.0, minimum=0.0),
    "bell_to_hub_w_k": f("bell_to_hub_w_k", 3.0, minimum=0.0),
    "hub_to_bearing_w_k": f("hub_to_bearing_w_k", 2.5, minimum=0.0),
    "bearing_to_upright_w_k": f("bearing_to_upright_w_k", 3.0, minimum=0.0),
}

DUCT = {
    "target": f("target", "disc_eye", kind=str, choices=("disc_eye", "disc_face", "caliper")),
    "flow": f("flow_mode", "area", kind=str, choices=("area", "volume_flow", "duct_velocity")),
    "inlet_area_mm2": f("inlet_area_m2", 0.0, factor=MM2, minimum=0.0),
    "duct_quality": f("effectiveness_coefficient", 0.6, minimum=0.0, maximum=1.0,
                      doc="C_eff: delivered flow / (rho v A_inlet)"),
    "volume_flow_m3_s": f("volume_flow_m3_s", 0.0, minimum=0.0, doc="at reference_speed_kmh"),
    "duct_velocity_m_s": f("duct_velocity_m_s", 0.0, minimum=0.0, doc="at reference_speed_kmh"),
    "outlet_area_mm2": f("outlet_area_m2", 4000.0, factor=MM2, minimum=0.0),
    "reference_speed_kmh": f("reference_speed_m_s", 200.0, factor=KMH, minimum=1.0),
    "air_rise_k": f("air_rise_k", 5.0, minimum=0.0),
    "face_area_share": f("face_area_share", 0.3, minimum=0.0, maximum=1.0),
}

AIRFLOW = {
    "local_airflow_factor": f("local_airflow_factor", 0.35, minimum=0.0),
    "disc_convection_multiplier": f("disc_convection_multiplier", 1.0, minimum=0.0, doc="disc faces"),
    "vane_convection_multiplier": f("vane_convection_multiplier", 1.0, minimum=0.0, doc="vane passages"),
    "caliper_convection_multiplier": f("caliper_convection_multiplier", 1.0, minimum=0.0),
    "hub_convection_multiplier": f("hub_convection_multiplier", 1.0, minimum=0.0),
    "duct_effectiveness_multiplier": f("duct_effectiveness_multiplier", 1.0, minimum=0.0),
    "contact_conductance_multiplier": f("contact_conductance_multiplier", 1.0, minimum=0.0),
}

PLAN = {
    "lap_source": f("lap_source", "track", kind=str, choices=("track", "trace")),
    "track": f("track", "", kind=str, doc="track description TOML, relative to the scenario"),
    "trace": f("trace", "", kind=str, doc="logged lap CSV, relative to the scenario"),
    "sample_hz": f("sample_hz", 20.0, minimum=1.0, maximum=1000.0),
    "soak_sample_s": f("soak_sample_s", 1.0, minimum=0.01, maximum=60.0),
    "repair_trace": f("repair_trace", False, kind=bool),
}

PHASE_COMMON = {"type": f("kind", kind=str), "name": f("name", "", kind=str)}
_PHASE_TRACE = {"trace": f("trace", "", kind=str, doc="this phase's own lap CSV (relative to the scenario); "
                                                       "empty: the plan's lap")}
PHASES = {
    "out_lap": {"pace": f("pace", 0.85, minimum=0.05, maximum=1.0),
                "pit_lane_speed_kmh": f("pit_lane_speed_m_s", 60.0, factor=KMH, minimum=1.0),
                "pit_lane_length_m": f("pit_lane_length_m", 300.0, minimum=0.0), **_PHASE_TRACE},
    "laps": {"count": f("count", kind=int, minimum=1), "pace": f("pace", 1.0, minimum=0.05, maximum=1.0), **_PHASE_TRACE},
    "safety_car": {"count": f("count", kind=int, minimum=1), "speed_factor": f("pace", 0.6, minimum=0.05, maximum=1.0),
                   **_PHASE_TRACE},
    "in_lap": {"pace": f("pace", 0.8, minimum=0.05, maximum=1.0),
               "pit_lane_speed_kmh": f("pit_lane_speed_m_s", 60.0, factor=KMH, minimum=1.0),
               "pit_lane_length_m": f("pit_lane_length_m", 300.0, minimum=0.0), **_PHASE_TRACE},
    "pit_stop": {"duration_s": f("duration_s", minimum=0.1), "pad_change": f("pad_change", False, kind=bool),
                 "refuel_kg": f("refuel_kg", 0.0, minimum=0.0)},
    "soak": {"duration_s": f("duration_s", minimum=1.0)},
}

PAD_WEAR = {
    "enabled": f("enabled", False, kind=bool),
    "wear_coefficient_mm3_per_kj": f("wear_coefficient_m3_per_j", 0.25, factor=1.0e-12, minimum=0.0,
                                     doc="pad volume worn per friction energy; illustrative default, calibrate"),
    "reference_temperature_c": degc("reference_temperature_k", 450.0),
    "temperature_scale_k": f("temperature_scale_k", 150.0, minimum=1.0),
    "warn_margin_mm": mm("warn_margin_m", 1.0),
}

SOLVER = {
    "method": f("method", "fast", kind=str, choices=SOLVER_METHODS),
    "rtol": f("rtol", 1.0e-6, minimum=1e-12, maximum=0.1),
    "atol_k": f("atol_k", 1.0e-4, minimum=1e-12, maximum=10.0),
    "output_hz": f("output_hz", 0.0, minimum=0.0, doc="0 = every input sample"),
}

SECTIONS = {
    "scenario": SCENARIO, "car": CAR, "brakes": BRAKES, "ambient": AMBIENT, "fluid": FLUID,
    "limits": LIMITS, "plan": PLAN, "pad_wear": PAD_WEAR, "solver": SOLVER,
}
CORNER_SECTIONS = {"disc": DISC, "pad": PAD, "piston": PISTON, "caliper": CALIPER, "hub": HUB,
                   "airflow": AIRFLOW}
CORNER_NAMES = ("front", "rear", "front_left", "front_right", "rear_left", "rear_right")
TOP_LEVEL = tuple(SECTIONS) + ("corners", "variants", "calibrated", "calibration")
# [calibrated]: "dotted.key" = value pairs written by `brakeheat fit`, applied before any override.
# [calibration]: what `brakeheat fit` fits and against which measurements (read by thermo.fit).


def is_finite_number(value) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)
