"""Bad scenario files, one per rule: text edits of tests/data/small.toml and/or overrides.

Shared by tests/scenario (library: ScenarioError / LapDataError) and tests/cli (exit 1, one line).
Each case lists fragments the one-line message must contain: the file, the section or key, and
what was expected (with the suggestion where the rule promises one). The rules are the project's
own (README "The scenario file", CONVENTIONS.md "Scenarios and data").
"""
from __future__ import annotations

import shutil
from dataclasses import dataclass, field
from pathlib import Path

DATA = Path(__file__).resolve().parents[1] / "data"
SMALL = DATA / "small.toml"
TRACK = DATA / "short_circuit.toml"

SOAK_LAST = '[[plan.phases]]\ntype = "soak"\nduration_s = 300\n'
FIRST_LAPS = '[[plan.phases]]\ntype = "laps"\ncount = 3\n'
BAD_TRACE_CSV = "time [s],speed [km/h]\n" + "".join(f"{0.05 * i:.2f},{150 - i}\n" for i in range(12)).replace(
    "0.25,145", "0.25,fast")


def trace_csv(column: str, value, rows: int = 12) -> str:
    """A short valid lap trace at 150-ish km/h with one more column, whose row i holds value(i)."""
    return f"time [s],speed [km/h],{column}\n" + "".join(
        f"{0.5 * i:.2f},{150 - i},{value(i)!r}\n" for i in range(rows))


@dataclass(frozen=True)
class Case:
    id: str
    fragments: tuple[str, ...]
    edits: tuple[tuple[str, str], ...] = ()           # (old text, new text) in small.toml
    overrides: tuple[tuple[str, object], ...] = ()    # applied by load_scenario
    error: str = "ScenarioError"                      # or "LapDataError"
    after_load: bool = False                          # raised by expand_plan, not load_scenario
    extra: dict = field(default_factory=dict)         # more files written beside the scenario


CASES = (
    Case("unknown_top_level", ("unknown key 'scenari'", "[top level]", "did you mean 'scenario'"),
         edits=(("[scenario]", "[scenari]"),)),
    Case("unknown_section_key", ("unknown key 'mas_kg'", "[car]", "did you mean 'mass_kg'"),
         edits=(("mass_kg = 1030", "mas_kg = 1030"),)),
    Case("unknown_corner_key", ("unknown key 'pad_muu'", "[corners.front]", "did you mean 'pad_mu'"),
         edits=(("pad_mu = 0.50", "pad_muu = 0.50"),)),
    Case("unknown_corner_name", ("unknown key 'raer'", "[corners]", "did you mean 'rear'"),
         edits=(("[corners.rear", "[corners.raer"),)),
    Case("unknown_corner_subtable_key", ("unknown key 'outer_diam_mm'", "[corners.front.disc]",
                                          "did you mean 'outer_diameter_mm'"),
         edits=(("outer_diameter_mm = 380", "outer_diam_mm = 380"),)),
    Case("unknown_duct_key", ("unknown key 'inlet_aera_mm2'", "[corners.front.ducts.main]",
                              "did you mean 'inlet_area_mm2'"),
         edits=(("inlet_area_mm2 = 9000", "inlet_aera_mm2 = 9000"),)),
    Case("unknown_phase_key", ("unknown key 'cont'", "[plan.phases #1]", "did you mean 'count'"),
         edits=(("count = 3", "cont = 3"),)),
    Case("missing_required_key", ("missing key 'mass_kg'", "[car]"),
         edits=(("mass_kg = 1030", "# no mass"),)),
    Case("missing_corner_key", ("missing key 'thickness_mm'", "[corners.front.disc]"),
         edits=(("thickness_mm = 36\n", "\n"),)),
    Case("missing_phase_count", ("missing key 'count'", "[plan.phases #4]"),
         edits=(("count = 2\n", "\n"),)),
    Case("missing_corner_section", ("missing section [corners.rear.caliper]",),
         edits=(('[corners.rear.caliper]\nmaterial = "aluminium_2618_t61"\nmass_kg = 2.2\narea_m2 = 0.07\n'
                 'fluid_wetted_area_mm2 = 9000\nfluid_volume_cm3 = 30\n', ""),)),
    Case("wrong_type_number", ("[car] mass_kg", "must be a finite number", "'heavy'"),
         edits=(("mass_kg = 1030", 'mass_kg = "heavy"'),)),
    Case("wrong_type_bool", ("[corners.front.disc] vented", "must be true or false"),
         edits=(("vented = true", 'vented = "yes"'),)),
    Case("wrong_type_int", ("[corners.front.disc] vane_count", "must be a whole number"),
         edits=(("vane_count = 48", "vane_count = 48.5"),)),
    Case("out_of_range_max", ("[car] rolling_resistance", "must be at most 1", "2.0"),
         edits=(("rolling_resistance = 0.012", "rolling_resistance = 2.0"),)),
    Case("out_of_range_min", ("[plan.phases #1] count", "must be at least 1"),
         edits=(("count = 3", "count = 0"),)),
    Case("not_an_allowed_choice", ("[corners.front.piston] type", "'vent'", "did you mean 'vented'"),
         edits=(('type = "solid"                     # "solid" or "vented"', 'type = "vent"'),)),
    Case("unknown_material", ("[corners.front.disc] material", "'grey_cast_irn'", "did you mean 'grey_cast_iron'"),
         overrides=(("corners.front.disc.material", "grey_cast_irn"),)),
    Case("unknown_secondary_material", ("[corners.rear.hub] bearing_material", "did you mean 'bearing_steel_52100'"),
         overrides=(("corners.rear.hub.bearing_material", "bearing_steel_5210"),)),
    Case("unknown_fluid_material", ("[fluid] material", "'brake_fluid_glycl'", "did you mean 'brake_fluid_glycol'"),
         overrides=(("fluid.material", "brake_fluid_glycl"),)),
    Case("unknown_phase_type", ("[plan.phases #1]", "unknown phase type 'lapz'", "did you mean 'laps'"),
         edits=(('type = "laps"\ncount = 3', 'type = "lapz"\ncount = 3'),)),
    Case("soak_not_last", ("[plan]", "the soak must be the last phase"),
         edits=((SOAK_LAST, ""), (FIRST_LAPS, SOAK_LAST + "\n" + FIRST_LAPS))),
    Case("custom_fluid_without_boiling_points", ("[fluid]", 'grade = "custom" needs dry_boiling_c and wet_boiling_c'),
         edits=(("dry_boiling_c = 312", "# no dry figure"),)),
    Case("unknown_dot_grade", ("[fluid]", "grade 'DOT 6' is unknown", "DOT 4", "DOT 5.1"),
         edits=(('grade = "custom"', 'grade = "DOT 6"'), ("dry_boiling_c = 312", ""), ("wet_boiling_c = 204", ""))),
    Case("boiling_points_without_custom", ("[fluid]", 'need grade = "custom"'),
         edits=(('grade = "custom"', 'grade = "DOT 4"'),)),
    Case("unknown_solver_method", ("[solver] method", "'LSDOA'", "did you mean 'LSODA'"),
         overrides=(("solver.method", "LSDOA"),)),
    Case("ambient_typed_in_kelvin", ("[ambient] temperature_c", "at most 60", "K would be 34.85 degC"),
         overrides=(("ambient.temperature_c", 308.0),)),
    Case("ambient_below_its_range", ("[ambient] temperature_c", "at least -60"),
         overrides=(("ambient.temperature_c", -300.0),)),
    Case("override_unknown_key", ("unknown key 'mas_kg'", "[car]", "did you mean 'mass_kg'"),
         overrides=(("car.mas_kg", 1000),)),
    Case("override_phase_out_of_range", ("override plan.phases.9.count", "from 1 to 5"),
         overrides=(("plan.phases.9.count", 2),)),
    Case("invalid_toml", ("not valid TOML", "line"),
         edits=(("mass_kg = 1030", "mass_kg = = 1030"),)),
    Case("lap_trace_missing", ("no_such_lap.csv", "file not found"), error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "no_such_lap.csv"))),
    Case("lap_trace_malformed", ("bad_lap.csv", "row", "speed", "'fast'"), error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "bad_lap.csv")),
         extra={"bad_lap.csv": BAD_TRACE_CSV}),
    Case("fuel_runs_out", ("the fuel runs out on lap 2", "fuel_kg"), after_load=True,
         overrides=(("car.fuel_kg", 3.0),)),
    # issue 13, class 1: the TOML parser's own limits
    Case("toml_nested_too_deep", ("not valid TOML", "nested too deep"),
         edits=(("[scenario]", "x = " + "[" * 600 + "]" * 600 + "\n[scenario]"),)),
    Case("toml_integer_literal_too_long", ("not valid TOML", "thousands of digits"),
         edits=(("mass_kg = 1030", "mass_kg = " + "9" * 5000),)),
    Case("toml_integer_beyond_64_bits", ("car.mass_kg", "64-bit range TOML allows"),   # TOML 1.0, "Integer"
         edits=(("mass_kg = 1030", "mass_kg = " + "9" * 400),)),
    # class 2: wrong types and text that would break a message
    Case("phase_type_not_text", ("[plan.phases #1]", "unknown phase type ['laps']"),
         edits=(('type = "laps"\ncount = 3', 'type = ["laps"]\ncount = 3'),)),
    Case("boiling_table_not_pairs", ("[fluid]", "boiling_table_pct_c must be a list of [water %, degC] pairs"),
         edits=(("wet_boiling_c = 204", "wet_boiling_c = 204\nboiling_table_pct_c = [1, 2]"),)),
    Case("material_with_a_newline", ("[corners.front.disc] material", "'grey\\ncast'", "control characters"),
         overrides=(("corners.front.disc.material", "grey\ncast"),)),
    Case("name_with_escape_sequences", ("[scenario] name", "control characters"),
         edits=(('name = "small test scenario"', 'name = "a\\u001b[31mred\\rb\\u0000"'),)),
    # class 3: upper bounds
    Case("caliper_area_astronomical", ("[corners.front.caliper] area_m2", "at most 2"),
         overrides=(("corners.front.caliper.area_m2", 1e300),)),
    Case("soak_of_thirty_thousand_years", ("[plan.phases #5] duration_s", "at most 172800"),
         edits=(("duration_s = 300", "duration_s = 1e12"),)),
    Case("a_billion_laps", ("[plan.phases #1] count", "at most 2000"),
         overrides=(("plan.phases.1.count", 1_000_000_000),)),
    Case("plan_longer_than_two_days", ("[plan] simulates more than 48 h",), after_load=True,
         overrides=(("plan.phases.1.count", 2000), ("plan.phases.1.pace", 0.05), ("car.fuel_consumption_kg_per_lap", 0.0))),
    Case("track_segment_of_1e308_m", ("short_circuit.toml", "length_m", "at most 30000"), error="LapDataError",
         after_load=True, extra={"short_circuit.toml": TRACK.read_text(encoding="utf-8").replace(
             "length_m = 700.0", "length_m = 1e308", 1)}),
    Case("track_radius_of_a_picometre", ("short_circuit.toml", "radius_m", "expected 5 to"), error="LapDataError",
         after_load=True, extra={"short_circuit.toml": TRACK.read_text(encoding="utf-8").replace(
             "radius_m = 60.0", "radius_m = 1e-12", 1)}),
    Case("track_minimum_speed_near_zero", ("short_circuit.toml", "min_speed_kmh", "expected 5 to"),
         error="LapDataError", after_load=True, extra={"short_circuit.toml": TRACK.read_text(encoding="utf-8").replace(
             "min_speed_kmh = 80.0", "min_speed_kmh = 1e-300", 1)}),
    Case("track_segment_name_with_a_newline", ("short_circuit.toml", "'Long\\nsweep'", "plain text"),
         error="LapDataError", after_load=True, extra={"short_circuit.toml": TRACK.read_text(encoding="utf-8").replace(
             "radius_m = 60.0", 'radius_m = 60.0\nname = "Long\\nsweep"', 1)}),
    Case("trace_pressure_minus_50_bar", ("crawl.csv", "pressure_front [bar]", "-50", "plausible range"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "crawl.csv")),
         extra={"crawl.csv": trace_csv("pressure_front [bar]", lambda i: -50.0 if i == 7 else 0.0)}),
    Case("trace_temperature_1e308", ("crawl.csv", "temp_disc [degC]", "plausible range"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "crawl.csv")),
         extra={"crawl.csv": trace_csv("temp_disc [degC]", lambda i: 1e308 if i == 7 else 300.0)}),
    Case("trace_acceleration_100_g", ("crawl.csv", "accel_long [g]", "plausible range"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "crawl.csv")),
         extra={"crawl.csv": trace_csv("accel_long [g]", lambda i: -100.0 if i == 7 else 0.0)}),
    Case("trace_distance_jumps_to_1e308_m", ("crawl.csv", "distance [m]", "jumps"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "crawl.csv")),
         extra={"crawl.csv": trace_csv("distance [m]", lambda i: 2.0 * i if i < 7 else 1e308)}),
    Case("trace_5_km_crawled_at_a_metre_an_hour", ("crawl.csv", "lasts", "expected at most 48 h"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "crawl.csv")),
         extra={"crawl.csv": "distance [m],speed [km/h]\n" + "".join(f"{500.0 * i:.1f},0.001\n" for i in range(11))}),
    Case("trace_that_is_not_a_csv", ("secrets.csv", "column '#1'", "is this a lap-trace CSV?"),
         error="LapDataError", after_load=True,
         overrides=(("plan.lap_source", "trace"), ("plan.trace", "secrets.csv")),
         extra={"secrets.csv": "root:x:0:0:private line:/root:/bin/sh\nsecond line\n"}),
    # class 4: impossible values and geometry that does not fit together
    Case("bearing_limit_below_zero_degc", ("[limits] bearing_c", "at least 0"),
         overrides=(("limits.bearing_c", -300.0),)),
    Case("crown_thicker_than_the_piston", ("[corners.front.piston]", "must be less than height_mm"),
         overrides=(("corners.front.piston.crown_thickness_mm", 40.0),)),
    Case("piston_wider_than_the_swept_ring", ("[corners.front.piston]", "does not fit on the", "swept ring"),
         overrides=(("corners.front.piston.diameters_mm", [100.0]),)),
    Case("pistons_larger_than_the_pad", ("[corners.front.piston]", "must fit on the pad"),
         overrides=(("corners.front.pad.area_mm2", 1000.0),)),
    Case("fuel_more_than_the_tank", ("[car] fuel_kg = 500", "does not fit in fuel_capacity_kg = 75"),
         overrides=(("car.fuel_kg", 500.0),)),
    Case("rolling_radius_of_1_mm", ("[car] rolling_radius_front_mm", "at least 100"),
         overrides=(("car.rolling_radius_front_mm", 1.0),)),
    Case("disc_larger_than_the_wheel", ("[corners.front.disc] outer_diameter_mm = 380", "does not fit inside a wheel"),
         overrides=(("car.rolling_radius_front_mm", 150.0),)),
    Case("backing_plate_a_kilometre_thick", ("[corners.front.pad] backing_thickness_mm", "at most 20"),
         overrides=(("corners.front.pad.backing_thickness_mm", 1e9),)),
    Case("variant_name_with_a_nul", ("[variants] name", "'a\\x00b'", "plain text"),
         edits=(("[plan]", '[variants."a\\u0000b"]\n"car.mass_kg" = 1000\n\n[plan]'),)),
    Case("car_of_1e300_kg", ("[car] mass_kg", "at most 5000"),
         overrides=(("car.mass_kg", 1e300),)),
)


def write_case(case: Case, folder: Path) -> Path:
    """small.toml with the case's edits, written into ``folder`` beside its track (and extra files)."""
    text = SMALL.read_text(encoding="utf-8")
    for old, new in case.edits:
        assert old in text, f"case {case.id}: {old!r} is not in {SMALL}"
        text = text.replace(old, new)
    folder.mkdir(parents=True, exist_ok=True)
    shutil.copy(TRACK, folder / TRACK.name)
    for name, content in case.extra.items():
        (folder / name).write_text(content, encoding="utf-8")
    path = folder / "scenario.toml"
    path.write_text(text, encoding="utf-8")
    return path


def override_args(case: Case) -> list[str]:
    """The case's overrides as --set arguments (values in TOML form)."""
    out = []
    for key, value in case.overrides:
        out += ["--set", f"{key}={value!r}".replace("'", '"') if isinstance(value, str) else f"{key}={value}"]
    return out
