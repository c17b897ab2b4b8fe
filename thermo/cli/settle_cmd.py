"""`brakeheat settle SCENARIO.toml`: the settled (cyclic steady-state) lap of each corner."""
from __future__ import annotations

from pathlib import Path

from thermo.cli.options import add_common_options
from thermo.cli.stdout_json import print_json
from thermo.studies.settle import settle, settled_dict


def add_parser(sub) -> None:
    p = sub.add_parser("settle", help="the settled lap of each corner: peaks once the car has run many laps alike")
    p.add_argument("scenario", help="scenario TOML file")
    p.add_argument("--corner", action="append", metavar="NAME", help="only this corner (repeatable; default all)")
    p.add_argument("--phase", metavar="NAME", help="the 'laps' phase whose lap is repeated (default the first)")
    add_common_options(p, quiet=False)
    p.set_defaults(handler=settle_command)


def format_settled(data: dict) -> str:
    from thermo.output.text_table import format_table
    lines = [f"Settled lap: {data['scenario']}", "The lap repeated until every node's temperature cycle repeats itself "
             "(pad wear, fuel burn and the plan's other phases left out).", ""]
    for c in data["corners"]:
        lines.append(f"Corner {c['name']}: phase '{c['phase']}', lap {c['lap_time_s']:.2f} s; from ambient it takes "
                     f"{c['laps_to_within_1k']} laps to come within 1 K of these peaks")
        lines += format_table(["node", "settled peak [degC]", "settled minimum [degC]"],
                              [[node, f"{peak:.1f}", f"{c['min_c'][node]:.1f}"] for node, peak in c["peak_c"].items()])
        lines.append(f"  ({c['method']}, {c['lap_solves']} lap solves, residual {c['residual_k']:.2g} K)")
        if c.get("checks"):
            lines += format_table(["check", "node", "limit [degC]", "settled peak [degC]", "margin [K]", "status"],
                                  [[k["name"], k["node"], f"{k['limit_c']:.1f}", f"{k['peak_c']:.1f}",
                                    f"{k['margin_k']:+.1f}", k["status"].upper() if k["status"] != "ok" else "ok"]
                                   for k in c["checks"]])
        lines.append("")
    lines.append(data["caution"])
    return "\n".join(lines)


def settle_command(args) -> int:
    from thermo.cli.options import overrides_with_solver
    from thermo.scenario import load_scenario

    scenario = load_scenario(Path(args.scenario), overrides_with_solver(args))
    results = settle(scenario, corners=args.corner, phase=args.phase)
    data = settled_dict(scenario, results)
    if args.json:
        print_json(data)
    else:
        print(format_settled(data))
    return 0
