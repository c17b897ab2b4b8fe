"""`brakeheat compare SCENARIO.toml`: the baseline and every variant, side by side."""
from __future__ import annotations

import json
import sys
from pathlib import Path

from thermo.errors import ScenarioError

BASELINE = "baseline"
COMPARE_NODES = ("disc", "disc_surface", "pad", "piston", "fluid", "caliper", "hub", "bearing", "upright")


def add_parser(sub) -> None:
    p = sub.add_parser("compare", help="run the baseline and each variant; peaks and margins side by side")
    p.add_argument("scenario", help="scenario TOML file (its [variants.NAME] tables are the variants)")
    p.add_argument("--variant", nargs="+", action="append", default=[], metavar=("NAME", "KEY=VALUE"),
                   help="add a variant from the command line: --variant NAME KEY=VALUE [KEY=VALUE ...] (repeatable)")
    p.add_argument("--only", nargs="+", metavar="NAME", help="run only these variants (scenario or command line)")
    p.add_argument("--set", metavar="KEY=VALUE", action="append", default=[], dest="overrides",
                   help="override a key for the baseline and every variant (repeatable)")
    p.add_argument("--solver", metavar="METHOD", help="override [solver] method for all runs")
    p.add_argument("--json", action="store_true", help="print one JSON object on stdout")
    p.add_argument("--out", metavar="DIR", help="write comparison.json, overlay plots and the margin bar chart into DIR")
    p.add_argument("--quiet", action="store_true", help="no progress indication")
    p.set_defaults(handler=compare_command)


def variant_overrides(scenario_raw: dict, cli_variants, only, source: str) -> list[tuple[str, list]]:
    """(name, overrides) of every variant to run, scenario ones first, in file order."""
    from thermo.scenario.overrides import parse_override
    declared = scenario_raw.get("variants", {})
    if not isinstance(declared, dict):
        raise ScenarioError(f"{source}: [variants] must hold tables [variants.NAME]")
    out = []
    for name, table in declared.items():
        if not isinstance(table, dict):
            raise ScenarioError(f"{source}: [variants.{name}] must be a table of \"dotted.key\" = value overrides")
        out.append((name, list(table.items())))
    for item in cli_variants:
        name, pairs = item[0], item[1:]
        if "=" in name:
            raise ScenarioError(f"--variant {' '.join(item)}: the first word is the variant's name, then KEY=VALUE pairs")
        if not pairs:
            raise ScenarioError(f"--variant {name}: give at least one KEY=VALUE override")
        out = [(n, o) for n, o in out if n != name]
        out.append((name, [parse_override(p, f"--variant {name}") for p in pairs]))
    if name_clash := [n for n, _ in out if n == BASELINE]:
        raise ScenarioError(f"{source}: a variant may not be called '{name_clash[0]}'")
    if only:
        known = [n for n, _ in out]
        for name in only:
            if name not in known:
                from thermo.scenario.convert import suggestion
                raise ScenarioError(f"--only {name}: no such variant{suggestion(name, known)}; known: {', '.join(known) or 'none'}")
        out = [(n, o) for n, o in out if n in only]
    return out


def run_comparison(path: Path, base_overrides, cli_variants=(), only=None, progress_enabled=False):
    """[(name, Results)] for the baseline and each variant. Each variant is checked before any runs."""
    from thermo.chain import expand_plan, run_scenario
    from thermo.cli.progress import Progress
    from thermo.scenario import load_scenario

    base = load_scenario(path, base_overrides)
    plans = [(BASELINE, base)]
    for name, overrides in variant_overrides(base.raw, cli_variants, only, str(path)):
        try:
            plans.append((name, load_scenario(path, list(base_overrides) + list(overrides))))
        except ScenarioError as error:
            raise ScenarioError(f"variant '{name}': {error}") from None
    segments = [expand_plan(sc) for _, sc in plans]
    progress = Progress(sum(len(s) * len(sc.corners) for s, (_, sc) in zip(segments, plans)), enabled=progress_enabled)
    try:
        return [(name, run_scenario(sc, progress=progress, segments=seg)) for (name, sc), seg in zip(plans, segments)]
    finally:
        progress.close()


def comparison_dict(runs) -> dict:
    """JSON-ready: ``variants`` (baseline first), each with ``name`` and ``corners`` as in `run --json`,
    and ``changes``: per variant and corner, peak and margin differences against the baseline [K]."""
    from thermo.output.summary import summary_dict
    summaries = [(name, summary_dict(res)) for name, res in runs]
    base = summaries[0][1]
    changes = []
    for name, s in summaries[1:]:
        corners = []
        for bc, vc in zip(base["corners"], s["corners"]):
            corners.append({
                "name": vc["name"],
                "peak_change_k": {n: round(vc["peak_c"][n] - bc["peak_c"][n], 3) for n in vc["peak_c"] if n in bc["peak_c"]},
                "margin_change_k": {c["name"]: round(c["margin_k"] - b["margin_k"], 3)
                                    for c, b in zip(vc["checks"], bc["checks"])},
            })
        changes.append({"name": name, "corners": corners})
    return {
        "scenario": base["scenario"], "version": base["version"], "caution": base["caution"],
        "variants": [{"name": name, **{k: v for k, v in s.items() if k not in ("caution", "version")}} for name, s in summaries],
        "changes": changes,
    }


def format_comparison(data: dict) -> str:
    variants = data["variants"]
    names = [v["name"] for v in variants]
    width = max(14, *(len(n) + 2 for n in names))
    lines = [f"Comparison: {data['scenario']}", "Peaks in degC and margins in K; each variant shows its change "
             "against the baseline in brackets (a positive margin change is margin gained).", ""]
    for ci, corner in enumerate(variants[0]["corners"]):
        lines.append(f"Corner {corner['name']}")
        lines.append("  " + f"{'':<34}" + "".join(f"{n:>{width}}" for n in names))
        nodes = [n for n in COMPARE_NODES if n in corner["peak_c"]]
        for node in nodes:
            base = corner["peak_c"][node]
            cells = [f"{base:>{width}.1f}"]
            for v in variants[1:]:
                value = v["corners"][ci]["peak_c"][node]
                cells.append(f"{f'{value:.1f} ({value - base:+.1f})':>{width}}")
            lines.append("  " + f"{'peak ' + node:<34}" + "".join(cells))
        for k, check in enumerate(corner["checks"]):
            base = check["margin_k"]
            cells = [f"{base:>{width}.1f}"]
            for v in variants[1:]:
                value = v["corners"][ci]["checks"][k]["margin_k"]
                cells.append(f"{f'{value:.1f} ({value - base:+.1f})':>{width}}")
            lines.append("  " + f"{'margin ' + check['name']:<34}" + "".join(cells))
        lines.append("")
    lines.append(data["caution"])
    return "\n".join(lines)


def compare_command(args) -> int:
    from thermo.cli.run_cmd import overrides_with_solver
    from thermo.output.atomic import atomic_write
    from thermo.output.plots import plot_comparison

    runs = run_comparison(Path(args.scenario), overrides_with_solver(args), args.variant, args.only,
                          progress_enabled=not (args.json or args.quiet))
    data = comparison_dict(runs)
    if args.out:
        out = Path(args.out)
        out.mkdir(parents=True, exist_ok=True)
        with atomic_write(out / "comparison.json") as handle:
            json.dump(data, handle, indent=2, allow_nan=False)
        plot_comparison(runs, out)
    if args.json:
        json.dump(data, sys.stdout, indent=2, allow_nan=False)
        sys.stdout.write("\n")
    else:
        print(format_comparison(data))
        if args.out:
            print(f"\nWrote comparison.json and plots to {args.out}")
    return 0
