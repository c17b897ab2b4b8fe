"""`brakeheat lap TRACE.csv`: braking zones and per-corner braking energy and power of a logged lap."""
from __future__ import annotations

import json
import sys
from pathlib import Path

import numpy as np

from lapdata.units import KMH, STANDARD_GRAVITY


def add_parser(sub) -> None:
    p = sub.add_parser("lap", help="braking zones and per-corner braking energy of a lap trace CSV")
    p.add_argument("trace", help="lap trace CSV (columns named 'name [unit]')")
    p.add_argument("--scenario", metavar="S.toml",
                   help="car and brakes from this scenario (default: the bundled demo car)")
    p.add_argument("--repair", action="store_true", help="repair short gaps and one-sample drop-outs, and report them")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.set_defaults(handler=lap_command)


def lap_summary(trace, scenario) -> dict:
    """Zones, energy per lap and per-corner energy of one trace with a scenario's car (JSON-ready)."""
    from lapdata.zones import find_braking_zones
    from thermo.chain.run import conductance_grid, corner_brakes
    from thermo.corner.build import build_corner
    from thermo.duty.corner_duty import corner_heat_inputs_from_trace
    from thermo.duty.summary import lap_energy_summary

    models = {d.name: build_corner(d, scenario.ambient.pressure_pa, conductance_grid(scenario)) for d in scenario.corners}
    brakes = corner_brakes(scenario, models)
    if scenario.power_method == "pressure":
        duties = corner_heat_inputs_from_trace(trace, scenario.vehicle, None, brakes, method="pressure")
    else:
        duties = corner_heat_inputs_from_trace(trace, scenario.vehicle, scenario.bias, brakes,
                                               left_share_front=scenario.left_share_front,
                                               left_share_rear=scenario.left_share_rear)
    energies = lap_energy_summary(duties)
    # an axle corner stands for both wheels of its axle
    wheels = {d.name: (1 if "_" in d.name else 2) for d in scenario.corners}
    total = sum(e.braking_energy_j * wheels[name] for name, e in energies.items())
    t = trace.time_s
    car_power = sum(np.asarray(d.brake_heat_w) * wheels[name] for name, d in duties.items())
    zones = []
    for z in find_braking_zones(trace):
        inside = (t >= z.t_start_s) & (t <= z.t_end_s)
        zones.append({
            "t_start_s": round(z.t_start_s, 3), "t_end_s": round(z.t_end_s, 3),
            "d_start_m": round(z.d_start_m, 1), "d_end_m": round(z.d_end_m, 1),
            "v_in_kmh": round(z.v_in_mps / KMH, 1), "v_out_kmh": round(z.v_out_mps / KMH, 1),
            "duration_s": round(z.duration_s, 3), "peak_decel_g": round(z.peak_decel_mps2 / STANDARD_GRAVITY, 3),
            "energy_j": round(float(np.trapezoid(car_power[inside], t[inside])), 1),
        })
    return {
        "trace": str(trace.source), "scenario": scenario.name, "car_from": str(scenario.path),
        "duration_s": round(trace.duration_s, 3), "length_m": round(trace.length_m, 1),
        "repairs": list(trace.repairs), "zones": zones, "energy_per_lap_j": round(total, 1),
        "power_method": scenario.power_method,
        "corners": [{"name": name, "wheels": wheels[name], "energy_j": round(e.braking_energy_j, 1),
                     "disc_energy_j": round(e.disc_energy_j, 1), "pad_energy_j": round(e.pad_energy_j, 1),
                     "mean_power_w": round(e.mean_power_w, 1), "mean_braking_power_w": round(e.mean_braking_power_w, 1),
                     "peak_power_w": round(e.peak_power_w, 1)} for name, e in energies.items()],
    }


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
    from thermo.cli.run_cmd import demo_scenario_path
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
