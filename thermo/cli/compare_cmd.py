"""`brakeheat compare SCENARIO.toml`: the baseline and every variant, side by side."""
from __future__ import annotations

import json
import sys
from pathlib import Path

from thermo.cli.options import add_common_options, add_threads_option
from thermo.cli.stdout_json import print_json
from thermo.studies.compare import (
    BIAS_WARNING_POINTS, KEEP_BIAS_CHOICES, bias_warnings, keep_bias_plans, plan_comparison, run_comparison,
)



def add_parser(sub) -> None:
    p = sub.add_parser("compare", help="run the baseline and each variant; peaks and margins side by side")
    p.add_argument("scenario", help="scenario TOML file (its [variants.NAME] tables are the variants)")
    p.add_argument("--variant", nargs="+", action="append", default=[], metavar=("NAME", "KEY=VALUE"),
                   help="add a variant from the command line: --variant NAME KEY=VALUE [KEY=VALUE ...] (repeatable)")
    p.add_argument("--only", nargs="+", metavar="NAME", help="run only these variants (scenario or command line)")
    add_common_options(p, json_what="the table",
                       out_help="write comparison.json, overlay plots, the margin bar chart and report.html into DIR")
    p.add_argument("--keep-bias", choices=KEEP_BIAS_CHOICES, metavar="{balance_bar,rear_master_cylinder}",
                   help="re-balance variants that move the front share (a caliper swap) back to the baseline's, "
                        "by the balance bar or the rear master cylinder bore (needs bias = \"hydraulic\")")
    p.add_argument("--bias-warning-points", type=float, default=BIAS_WARNING_POINTS, metavar="POINTS",
                   help=f"name a variant that moves the front share by more than this many points "
                        f"(default {BIAS_WARNING_POINTS:g}) when --keep-bias is not given")
    add_threads_option(p)
    p.set_defaults(handler=compare_command)


def format_comparison(data: dict) -> str:
    from thermo.output.analysis import COMPARED_PEAK_NODES as COMPARE_NODES
    from thermo.output.text_table import format_table
    variants = data["variants"]
    names = [v["name"] for v in variants]

    def row(label: str, values: list, fmt: str = ".1f") -> list[str]:
        base = values[0]
        return [label, format(base, fmt)] + [f"{x:{fmt}} ({x - base:+{fmt.lstrip('+')}})" for x in values[1:]]
    lines = [f"Comparison: {data['scenario']}", "Peaks in degC and margins in K; each variant shows its change "
             "against the baseline in brackets (a positive margin change is margin gained).", ""]
    hyd = [v.get("hydraulics") for v in variants]
    for ci, corner in enumerate(variants[0]["corners"]):
        rows = [row(f"peak {node}", [v["corners"][ci]["peak_c"][node] for v in variants])
                for node in COMPARE_NODES if node in corner["peak_c"]]
        rows += [row(f"margin {check['name']}", [v["corners"][ci]["checks"][k]["margin_k"] for v in variants], "+.1f")
                 for k, check in enumerate(corner["checks"])]
        if all(hyd) and corner["name"] in hyd[0]["corners"]:
            rows += [row(label, [h["corners"][corner["name"]][key] for h in hyd], fmt)
                     for label, key, fmt in (("clamp force [N/bar]", "clamp_force_n_per_bar", ".1f"),
                                             ("fluid [cm3/mm piston travel]", "fluid_displacement_cm3_per_mm", ".3f"))]
        lines += [f"Corner {corner['name']}", *format_table([""] + names, rows), ""]
    if all(hyd):
        lines += format_table([""] + names, [row("front share of brake torque [%]", [h["front_share"] * 100 for h in hyd],
                                                 ".2f")])
    for change in data.get("changes", []):
        r = change.get("rebalanced")
        if r:
            lines.append(f"  --keep-bias: variant '{change['name']}': {r['key']} {r['from']:.4g} -> {r['to']:.4g} "
                         f"(front share {r['front_share_before'] * 100:.2f} % -> {r['front_share_after'] * 100:.2f} %)")
    lines.append("")
    lines.append(data["caution"])
    return "\n".join(lines)


def write_comparison_files(data: dict, runs: list, out: Path, warnings=()) -> list[Path]:
    """comparison.json, the comparison plots and report.html into ``out``, each atomically; their paths."""
    from thermo.output.atomic import atomic_write
    from thermo.output.html_compare import write_comparison_html
    from thermo.output.plots import plot_comparison
    with atomic_write(out / "comparison.json") as handle:
        json.dump(data, handle, indent=2, allow_nan=False)
    plots = plot_comparison(runs, out)
    write_comparison_html(data, runs, out / "report.html", warnings=warnings)
    return [out / "comparison.json", *plots, out / "report.html"]


def compare_command(args) -> int:
    from thermo.cli.options import overrides_with_solver
    from thermo.output.folder import check_output_folder
    from thermo.output.manifest import write_output_set

    from thermo.chain import expand_plan
    from thermo.cli.progress import Progress

    if args.out is not None:
        check_output_folder(args.out, source="--out")
    plans = plan_comparison(Path(args.scenario), overrides_with_solver(args), args.variant, args.only)
    rebalanced, warnings = {}, []
    if args.keep_bias:
        plans, rebalanced = keep_bias_plans(plans, args.keep_bias, Path(args.scenario))
    else:
        warnings = bias_warnings(plans, args.bias_warning_points)
        for line in warnings:
            print(f"brakeheat: warning: {line}", file=sys.stderr)
    total = sum(len(expand_plan(sc)) * len(sc.corners) for _, sc in plans)
    progress = Progress(total, enabled=not (args.json or args.quiet))
    try:
        comparison = run_comparison(plans, progress=progress, rebalanced=rebalanced, threads=args.threads)
    finally:
        progress.close()
    runs = list(comparison.runs)
    data = comparison.as_dict()
    if args.out:
        command = "demo --compare" if getattr(args, "command", None) == "demo" else "compare"
        write_output_set(Path(args.out), command, lambda out: write_comparison_files(data, runs, out, warnings))
    if args.json:
        print_json(data)
    else:
        print(format_comparison(data))
        if args.out:
            print(f"\nWrote comparison.json, plots and report.html to {args.out}")
    return 0
