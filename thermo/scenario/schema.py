"""The scenario file's keys: their units, SI names, types and defaults (one table per section).

The keys of a corner's parts (disc, pad, piston, caliper, hub, airflow, ducts) are declared on the
dataclass fields that hold them (``thermo.keys.key``); their tables here are derived from those.

A TOML key carries its unit in its name (``outer_diameter_mm``); ``Field`` converts it once to
the SI name (``outer_diameter_m``). Unknown keys are errors with a suggestion, missing required
keys name their section. Nothing is inferred from which keys happen to be present: model choices
(piston type, duct flow mode, bias mode, lap source) are explicit keys with documented defaults.
"""
from __future__ import annotations

from lapdata.units import KMH, KPA
from thermo.corner.geometry import (
    AirflowSettings, CaliperGeometry, CornerDesign, DiscGeometry, DuctGeometry, HubGeometry, PadGeometry, PistonGeometry,
)
from thermo.keys import REQUIRED, Field, declared_keys, degc, f, is_finite_number, mm  # noqa: F401 (re-exported)
from thermo.limits import Limits
from thermo.solver.settings import METHODS as SOLVER_METHODS

SCENARIO = {
    "name": f("name", "unnamed scenario", kind=str),
    "description": f("description", "", kind=str),
}

CAR = {
    "mass_kg": f("mass_kg", minimum=50.0, doc="car with driver, without fuel", maximum=5000.0),
    "fuel_kg": f("fuel_kg", 0.0, minimum=0.0, doc="fuel at the start", maximum=500.0),
    "fuel_consumption_kg_per_lap": f("fuel_consumption_kg_per_lap", 0.0, minimum=0.0, maximum=50.0),
    "fuel_capacity_kg": f("fuel_capacity_kg", 500.0, minimum=0.0, maximum=500.0, doc="the tank; fuel_kg and refuels must fit"),
    "drag_cd_a_m2": f("drag_cd_a_m2", minimum=0.0, maximum=10.0),
    "downforce_cl_a_m2": f("downforce_cl_a_m2", 0.0, minimum=-5.0, maximum=20.0),
    "rolling_resistance": f("rolling_resistance_coefficient", 0.012, minimum=0.0, maximum=1.0),
    "rotating_inertia_factor": f("rotating_inertia_factor", 0.04, minimum=0.0, maximum=1.0),
    "engine_braking_force_n": f("engine_braking_force_n", 0.0, minimum=0.0, maximum=20000.0),
    "rolling_radius_front_mm": mm("rolling_radius_front_m", minimum=100.0, maximum=700.0),
    "rolling_radius_rear_mm": mm("rolling_radius_rear_m", minimum=100.0, maximum=700.0),
    # envelope for the track builder
    "braking_decel_g": f("braking_decel_g", 1.5, minimum=0.05, maximum=6.0),
    "lateral_grip_g": f("lateral_grip_g", 1.5, minimum=0.05, maximum=6.0),
    "power_kw": f("power_w", 400.0, factor=1000.0, minimum=0.1, maximum=3000.0),
    "traction_accel_g": f("traction_accel_g", 0.8, minimum=0.05, maximum=3.0),
    "top_speed_kmh": f("top_speed_kmh", 0.0, minimum=0.0, doc="0 = drag-limited only", maximum=500.0),
}

BRAKES = {
    "bias": f("bias", "fixed", kind=str, choices=("fixed", "hydraulic")),
    "front_share": f("front_share", 0.6, minimum=0.0, maximum=1.0),
    "master_cylinder_front_mm": mm("master_cylinder_front_diameter_m", 0.0, maximum=50.0),
    "master_cylinder_rear_mm": mm("master_cylinder_rear_diameter_m", 0.0, maximum=50.0),
    "balance_bar_front_share": f("balance_bar_front_share", 0.5, minimum=0.0, maximum=1.0),
    "pedal_ratio": f("pedal_ratio", 4.0, minimum=1.0, maximum=15.0,
                     doc="pushrod force per pedal force; typical 3 to 6 (common practice, no published source)"),
    "knock_back_mm": mm("knock_back_m", 0.1, maximum=2.0,
                        doc="piston travel the pedal must make up after the pads are knocked back (hydraulics report)"),
    "left_share_front": f("left_share_front", 0.5, minimum=0.0, maximum=1.0),
    "left_share_rear": f("left_share_rear", 0.5, minimum=0.0, maximum=1.0),
    "power_method": f("power_method", "energy", kind=str, choices=("energy", "pressure")),
}

AMBIENT = {
    "temperature_c": degc("temperature_k", 25.0, minimum=-60.0, maximum=60.0,
                          doc="the air round the car; outside -60 to 60 degC is an error"),
    "temperature_profile_h_c": f("temperature_profile_h_c", [], kind=list,
                                 doc="[[hours from start, degC], ...]; overrides temperature_c when not empty"),
    "pressure_mode": f("pressure_mode", "pressure", kind=str, choices=("pressure", "altitude")),
    "pressure_kpa": f("pressure_pa", 101.325, factor=KPA, minimum=10.0, maximum=120.0),
    "altitude_m": f("altitude_m", 0.0, minimum=-500.0, maximum=6000.0),
}

FLUID = {
    "grade": f("grade", "DOT 4", kind=str),
    "dry_boiling_c": f("dry_boiling_c", 0.0, minimum=0.0, maximum=400.0),
    "wet_boiling_c": f("wet_boiling_c", 0.0, minimum=0.0, maximum=400.0),
    "water_content_pct": f("water_content_pct", 0.0, minimum=0.0, maximum=10.0),
    "boiling_table_pct_c": f("boiling_table_pct_c", [], kind=list, doc="[[water %, degC], ...]"),
    "material": f("material", "brake_fluid_glycol", kind=str),
}

LIMITS = declared_keys(Limits)      # declared on thermo.limits.Limits

# the corner's keys, declared once on the fields of the dataclasses that hold them
CORNER = declared_keys(CornerDesign)
DISC = declared_keys(DiscGeometry)
PAD = declared_keys(PadGeometry)
PISTON = declared_keys(PistonGeometry)
CALIPER = declared_keys(CaliperGeometry)
HUB = declared_keys(HubGeometry)
DUCT = declared_keys(DuctGeometry)
AIRFLOW = declared_keys(AirflowSettings)

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
                "pit_lane_speed_kmh": f("pit_lane_speed_m_s", 60.0, factor=KMH, minimum=5.0, maximum=150.0),
                "pit_lane_length_m": f("pit_lane_length_m", 300.0, minimum=0.0, maximum=3000.0), **_PHASE_TRACE},
    "laps": {"count": f("count", kind=int, minimum=1, maximum=2000), "pace": f("pace", 1.0, minimum=0.05, maximum=1.0), **_PHASE_TRACE},
    "safety_car": {"count": f("count", kind=int, minimum=1, maximum=2000), "speed_factor": f("pace", 0.6, minimum=0.05, maximum=1.0),
                   **_PHASE_TRACE},
    "in_lap": {"pace": f("pace", 0.8, minimum=0.05, maximum=1.0),
               "pit_lane_speed_kmh": f("pit_lane_speed_m_s", 60.0, factor=KMH, minimum=5.0, maximum=150.0),
               "pit_lane_length_m": f("pit_lane_length_m", 300.0, minimum=0.0, maximum=3000.0), **_PHASE_TRACE},
    "pit_stop": {"duration_s": f("duration_s", minimum=0.1, maximum=3600.0),
                 "pad_change": f("pad_change", False, kind=bool, doc="new pads on every corner at this stop"),
                 "pad_change_below_mm": mm("pad_change_below_m", 0.0, maximum=100.0,
                                           doc="new pads on each corner whose pad is thinner than this at the stop; 0: off"),
                 "refuel_kg": f("refuel_kg", 0.0, minimum=0.0, maximum=500.0),
                 "refuel_full": f("refuel_full", False, kind=bool, doc="fill the tank to fuel_capacity_kg (refuel_kg then ignored)")},
    "soak": {"duration_s": f("duration_s", minimum=1.0, maximum=172800.0, doc="up to 48 h")},
}

# [[plan.stints]]: a stint template, repeated; its own phases are [[plan.stints.phases]] (any phase
# type but the soak). The plan runs [[plan.phases]], then each template in turn, then [[plan.finish]].
STINT = {
    "name": f("name", "", kind=str, doc="names the expanded phases, e.g. \"stint 3: laps\"; empty: \"stint\""),
    "repeat": f("repeat", 0, kind=int, minimum=0, maximum=1000,
                doc="times the template runs; 0: once, or without limit up to until_h"),
    "until_h": f("until_s", 0.0, factor=3600.0, minimum=0.0, maximum=48.0,
                 doc="hours from the start of the run: the template ends at the first lap end at or after it "
                     "(the chequered flag), skipping the rest of that stint; 0: no time limit"),
    "pad_change_every": f("pad_change_every", 0, kind=int, minimum=0, maximum=1000,
                          doc="new pads at the pit stops of every n-th repetition; 0: as the phases say"),
}

PAD_WEAR = {
    "enabled": f("enabled", False, kind=bool),
    "wear_coefficient_mm3_per_kj": f("wear_coefficient_m3_per_j", 0.25, factor=1.0e-12, minimum=0.0,
                                     doc="pad volume worn per friction energy; illustrative default, calibrate", maximum=100.0),
    "reference_temperature_c": degc("reference_temperature_k", 450.0, minimum=0.0, maximum=1500.0),
    "temperature_scale_k": f("temperature_scale_k", 150.0, minimum=1.0, maximum=2000.0),
    "warn_margin_mm": mm("warn_margin_m", 1.0, maximum=20.0),
}

SOLVER = {
    "method": f("method", "fast", kind=str, choices=SOLVER_METHODS),
    "rtol": f("rtol", 1.0e-6, minimum=1e-12, maximum=0.1),
    "atol_k": f("atol_k", 1.0e-4, minimum=1e-12, maximum=10.0),
    "output_s": f("output_s", 1.0, minimum=0.0, maximum=3600.0,
                  doc="interval of the stored series (results.h5, plots); every node's extremes, each "
                      "segment's ends and so every peak and lap extreme are kept; 0 = every solver step"),
    "output_hz": f("output_hz", 0.0, minimum=0.0, maximum=1000.0, doc="if above 0, the stored series' rate instead "
                                                                       "of output_s"),
    "max_stride_samples": f("max_stride", 8, kind=int, minimum=1, maximum=256,
                            doc="fast: longest step off the brakes, in input samples (every sample while braking); "
                                "1 = every sample"),
    "linearised": f("linearised", False, kind=bool,
                    doc="fast: one linearised solve a step instead of Newton iterations"),
    "wall_clock_limit_s": f("wall_clock_limit_s", 3600.0, minimum=1.0, maximum=7.0 * 86400.0,
                            doc="a run taking longer stops with an error"),
}

SECTIONS = {
    "scenario": SCENARIO, "car": CAR, "brakes": BRAKES, "ambient": AMBIENT, "fluid": FLUID,
    "limits": LIMITS, "plan": PLAN, "pad_wear": PAD_WEAR, "solver": SOLVER,
}
CORNER_SECTIONS = {"disc": DISC, "pad": PAD, "piston": PISTON, "caliper": CALIPER, "hub": HUB,
                   "airflow": AIRFLOW}
CORNER_NAMES = ("front", "rear", "front_left", "front_right", "rear_left", "rear_right")
TOP_LEVEL = tuple(SECTIONS) + ("corners", "variants", "calibrated", "calibration", "uncertainty")
# [calibrated]: "dotted.key" = value pairs written by `brakeheat fit`, applied before any override.
# [calibration]: what `brakeheat fit` fits and against which measurements (read by thermo.fit).
# [uncertainty]: the uncertain inputs of `brakeheat uncertainty` (read by thermo.studies.uncertainty).



def key_field(dotted: str) -> Field | None:
    """The declaration of a dotted scenario key as ``--set`` addresses it (its unit, kind, range),
    e.g. ``corners.front.ducts.main.inlet_area_mm2``; None if it names no key."""
    parts = dotted.split(".")
    if len(parts) == 2 and parts[0] in SECTIONS:
        return SECTIONS[parts[0]].get(parts[1])
    if parts[0] == "corners" and len(parts) == 3:
        return CORNER.get(parts[2])
    if parts[0] == "corners" and len(parts) == 4 and parts[2] in CORNER_SECTIONS:
        return CORNER_SECTIONS[parts[2]].get(parts[3])
    if parts[0] == "corners" and len(parts) == 5 and parts[2] == "ducts":
        return DUCT.get(parts[4])
    if parts[0] == "plan" and len(parts) >= 4 and parts[1] in ("phases", "stints", "finish"):
        if parts[1] == "stints" and len(parts) == 4:
            return STINT.get(parts[3])
        name = parts[-1]
        for table in (PHASE_COMMON, *PHASES.values()):
            if name in table:
                return table[name]
    return None
