"""`brakeheat lap TRACE.csv | TRACK.toml`: braking zones and per-corner braking energy and power of a
logged lap, or of the lap built from a track description with a scenario's car envelope."""
from __future__ import annotations

from pathlib import Path

from thermo.cli.stdout_json import print_json

LAP_TRACE_CSV = "lap_trace.csv"


def add_parser(sub) -> None:
    p = sub.add_parser("lap", help="braking zones and per-corner braking energy of a lap trace CSV or of the lap "
                                   "built from a track TOML")
    p.add_argument("trace", metavar="TRACE.csv|TRACK.toml",
                   help="lap trace CSV (columns named 'name [unit]'), or a track description (a file ending .toml, "
                        "the format of scenarios/demo_circuit.toml) to build the lap from")
    p.add_argument("--scenario", metavar="S.toml",
                   help="car and brakes (and, for a track, the car envelope and [plan] sample_hz) from this scenario "
                        "(default: the bundled demo car)")
    p.add_argument("--repair", action="store_true",
                   help="repair short gaps and one-sample drop-outs of a trace CSV, and report them")
    p.add_argument("--out", metavar="DIR",
                   help=f"write the lap's speed trace as {LAP_TRACE_CSV} (the trace CSV format, readable back) "
                        "and manifest.json into DIR")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(handler=lap_command)


def format_lap(summary: dict) -> str:
    from thermo.output.text_table import format_table
    lines = [f"Lap {summary['trace']}: {summary['duration_s']:.2f} s, {summary['length_m']:.0f} m "
             f"(car and brakes from {summary['car_from']}, {summary['power_method']} method)"]
    built = summary.get("built")
    if built:
        lines.append(f"  built from {built['track_file']} at {built['sample_hz']:g} Hz: lap time {built['lap_time_s']:.2f} s, "
                     f"top speed {built['top_speed_kmh']:.1f} km/h, minimum speed {built['min_speed_kmh']:.1f} km/h")
    for r in summary["repairs"]:
        lines.append(f"  repaired: {r}")
    if built:
        lines += ["", "Segments of the built lap"]
        lines += format_table(["#", "segment", "kind", "at [m]", "length [m]", "entry [km/h]", "min [km/h]", "max [km/h]"],
                              [[str(i), s["name"], s["kind"], f"{s['d_start_m']:.0f}", f"{s['length_m']:.0f}",
                                f"{s['v_entry_kmh']:.1f}", f"{s['v_min_kmh']:.1f}", f"{s['v_max_kmh']:.1f}"]
                               for i, s in enumerate(built["segments"], 1)], align=[None, "left", "left"] + [None] * 5)
    lines += ["", "Braking zones"]
    lines += format_table(["#", "start [s]", "end [s]", "at [m]", "in [km/h]", "out [km/h]", "time [s]", "peak [g]",
                           "energy [kJ]"],
                          [[str(i), f"{z['t_start_s']:.2f}", f"{z['t_end_s']:.2f}", f"{z['d_start_m']:.0f}",
                            f"{z['v_in_kmh']:.1f}", f"{z['v_out_kmh']:.1f}", f"{z['duration_s']:.2f}",
                            f"{z['peak_decel_g']:.2f}", f"{z['energy_j'] / 1e3:.1f}"]
                           for i, z in enumerate(summary["zones"], 1)], align=["right"] * 9)
    lines.append(f"  braking energy per lap, whole car: {summary['energy_per_lap_j'] / 1e6:.3f} MJ")
    lines += ["", "Per corner (one wheel)"]
    lines += format_table(["corner", "energy [kJ]", "disc [kJ]", "pad [kJ]", "mean [kW]", "braking mean [kW]", "peak [kW]"],
                          [[c["name"], f"{c['energy_j'] / 1e3:.1f}", f"{c['disc_energy_j'] / 1e3:.1f}",
                            f"{c['pad_energy_j'] / 1e3:.1f}", f"{c['mean_power_w'] / 1e3:.2f}",
                            f"{c['mean_braking_power_w'] / 1e3:.2f}", f"{c['peak_power_w'] / 1e3:.1f}"]
                           for c in summary["corners"]], align=["left"] + [None] * 6)
    import thermo
    lines += ["", thermo.CAUTION]
    return "\n".join(lines)


def is_track_file(path: Path) -> bool:
    """A track description is named *.toml; anything else is read as a trace CSV."""
    return path.suffix.lower() == ".toml"


def write_lap_files(trace, comment: str, out: Path) -> list[Path]:
    """The lap's speed trace as ``lap_trace.csv`` in ``out``, atomically; its path."""
    from lapdata.writer import trace_csv_text
    from thermo.output.atomic import atomic_write
    with atomic_write(out / LAP_TRACE_CSV) as handle:
        handle.write(trace_csv_text(trace, comment))
    return [out / LAP_TRACE_CSV]


def lap_command(args) -> int:
    from lapdata.reader import read_trace_csv
    from thermo.cli.options import demo_scenario_path
    from thermo.errors import ScenarioError
    from thermo.output.folder import check_output_folder
    from thermo.output.manifest import write_output_set
    from thermo.scenario import load_scenario
    from thermo.studies.lap import built_lap_dict, lap_from_track, lap_summary

    source = Path(args.trace)
    track_input = is_track_file(source)
    if track_input and args.repair:
        raise ScenarioError(f"{source}: --repair mends a logged trace CSV; a lap built from a track description "
                            "has nothing to repair")
    if args.out is not None:
        check_output_folder(args.out, source="--out")
    scenario = load_scenario(Path(args.scenario) if args.scenario else demo_scenario_path())
    if track_input:
        track, trace = lap_from_track(source, scenario)
        summary = lap_summary(trace, scenario)
        summary["built"] = built_lap_dict(source, track, trace, scenario.plan.sample_hz)
        comment = (f"lap built by brakeheat from the track {source} with the car envelope of {scenario.path}; "
                   "a quasi-steady model lap, not a measurement")
    else:
        trace = read_trace_csv(source, repair=args.repair)
        summary = lap_summary(trace, scenario)
        comment = f"lap trace {source} as read by brakeheat" + (" (repaired)" if trace.repairs else "")
    if args.out:
        write_output_set(Path(args.out), "lap", lambda out: write_lap_files(trace, comment, out))
    if args.json:
        print_json(summary)
    else:
        print(format_lap(summary))
        if args.out:
            print(f"\nWrote {LAP_TRACE_CSV} to {args.out}")
    return 0
