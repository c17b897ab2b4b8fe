"""`brakeheat lap TRACE.csv`: braking zones and per-corner braking energy and power of a logged lap."""
from __future__ import annotations

import json
import sys
from pathlib import Path

from thermo.studies.lap import lap_summary


def add_parser(sub) -> None:
    p = sub.add_parser("lap", help="braking zones and per-corner braking energy of a lap trace CSV")
    p.add_argument("trace", help="lap trace CSV (columns named 'name [unit]')")
    p.add_argument("--scenario", metavar="S.toml",
                   help="car and brakes from this scenario (default: the bundled demo car)")
    p.add_argument("--repair", action="store_true", help="repair short gaps and one-sample drop-outs, and report them")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(handler=lap_command)


def format_lap(summary: dict) -> str:
    lines = [f"Lap {summary['trace']}: {summary['duration_s']:.2f} s, {summary['length_m']:.0f} m "
             f"(car and brakes from {summary['car_from']}, {summary['power_method']} method)"]
    for r in summary["repairs"]:
        lines.append(f"  repaired: {r}")
    lines.append("")
    lines.append("Braking zones")
    lines.append(f"  {'#':>2} {'start [s]':>9} {'end [s]':>8} {'at [m]':>7} {'in [km/h]':>9} {'out [km/h]':>10} "
                 f"{'time [s]':>8} {'peak [g]':>8} {'energy [kJ]':>11}")
    for i, z in enumerate(summary["zones"], 1):
        lines.append(f"  {i:>2} {z['t_start_s']:9.2f} {z['t_end_s']:8.2f} {z['d_start_m']:7.0f} {z['v_in_kmh']:9.1f} "
                     f"{z['v_out_kmh']:10.1f} {z['duration_s']:8.2f} {z['peak_decel_g']:8.2f} {z['energy_j'] / 1e3:11.1f}")
    lines.append(f"  braking energy per lap, whole car: {summary['energy_per_lap_j'] / 1e6:.3f} MJ")
    lines.append("")
    lines.append("Per corner (one wheel)")
    lines.append(f"  {'corner':<12} {'energy [kJ]':>11} {'disc [kJ]':>10} {'pad [kJ]':>9} {'mean [kW]':>9} "
                 f"{'braking mean [kW]':>17} {'peak [kW]':>9}")
    for c in summary["corners"]:
        lines.append(f"  {c['name']:<12} {c['energy_j'] / 1e3:11.1f} {c['disc_energy_j'] / 1e3:10.1f} "
                     f"{c['pad_energy_j'] / 1e3:9.1f} {c['mean_power_w'] / 1e3:9.2f} {c['mean_braking_power_w'] / 1e3:17.2f} "
                     f"{c['peak_power_w'] / 1e3:9.1f}")
    import thermo
    lines += ["", thermo.CAUTION]
    return "\n".join(lines)


def lap_command(args) -> int:
    from lapdata.reader import read_trace_csv
    from thermo.cli.options import demo_scenario_path
    from thermo.scenario import load_scenario

    trace = read_trace_csv(Path(args.trace), repair=args.repair)
    scenario = load_scenario(Path(args.scenario) if args.scenario else demo_scenario_path())
    summary = lap_summary(trace, scenario)
    if args.json:
        json.dump(summary, sys.stdout, indent=2, allow_nan=False)
        sys.stdout.write("\n")
    else:
        print(format_lap(summary))
    return 0
