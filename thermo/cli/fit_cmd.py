"""`brakeheat fit SCENARIO.toml --measured LOG.csv`: calibrate, print the fit, write the calibrated scenario."""
from __future__ import annotations

import datetime
import json
from pathlib import Path

from thermo.cli.stdout_json import print_json


def add_parser(sub) -> None:
    from thermo.cli.options import add_common_options
    p = sub.add_parser("fit", help="fit the scenario's [calibration] parameters to a logged stint")
    p.add_argument("scenario", help="scenario TOML file with a [calibration] table")
    p.add_argument("--measured", metavar="LOG.csv", required=True, help="logged stint: speed, distance, temp_* channels")
    p.add_argument("--calibrated", metavar="FILE",
                   help="where to write the calibrated scenario (default: SCENARIO_calibrated.toml in the --out "
                        "folder; without --out beside the scenario, and with --json alone not at all)")
    add_common_options(p, json_what="the table", quiet=False, out_help="write fit.json and fit_<channel>.png plots into DIR")
    p.set_defaults(handler=fit_command)


def write_fit_files(result, summary: dict, out: Path, calibrated: tuple[Path, str] | None = None) -> list[Path]:
    """fit_<channel>.png plots, fit.json and (``calibrated`` = (path in ``out``, text)) the calibrated
    scenario into ``out``, each atomically; their paths."""
    from thermo.fit.plots import plot_fit
    from thermo.output.atomic import atomic_write
    plots = plot_fit(result, out)
    with atomic_write(out / "fit.json", "w") as handle:
        json.dump(summary, handle, indent=2, allow_nan=False)
    written = [*plots, out / "fit.json"]
    if calibrated is not None:
        with atomic_write(calibrated[0], "w") as handle:
            handle.write(calibrated[1])
        written.append(calibrated[0])
    return written


def calibrated_target(args) -> Path | None:
    """Where the calibrated scenario goes: ``--calibrated``; else into the ``--out`` folder (listed
    in its manifest); else beside the scenario; with ``--json`` and neither, nowhere."""
    path = Path(args.scenario)
    name = f"{path.stem}_calibrated.toml"
    if args.calibrated:
        return Path(args.calibrated)
    if args.out:
        return Path(args.out) / name
    return None if args.json else path.with_name(name)


def check_output_options(args, target: Path | None) -> None:
    """A bad --out, or a calibrated scenario that cannot be written, fails now, before the fit."""
    from thermo.output.folder import check_output_folder
    if args.out is not None:
        check_output_folder(args.out, source="--out")
    if target is not None and not (args.out and target.parent == Path(args.out)):
        check_output_folder(target.parent, source="--calibrated (its folder)" if args.calibrated else
                            "the calibrated scenario's folder")


def fit_command(args) -> int:
    from thermo.cli.options import overrides_with_solver
    from thermo.fit import fit_scenario
    from thermo.fit.calibrated import calibrated_text, pinned_plan_files
    from thermo.fit.report import fit_dict, format_fit
    from thermo.output.atomic import atomic_write
    from thermo.output.manifest import write_output_set
    from thermo.scenario import load_scenario

    path = Path(args.scenario)
    target = calibrated_target(args)
    check_output_options(args, target)
    scenario = load_scenario(path, overrides_with_solver(args))
    result = fit_scenario(scenario, args.measured)
    today = datetime.date.today().isoformat()
    in_set = target is not None and args.out is not None and target.parent == Path(args.out)
    text = None if target is None else calibrated_text(scenario.text, result, today, measured=str(args.measured),
                                                       pinned=pinned_plan_files(scenario, target))
    if target is not None and not in_set:
        target.parent.mkdir(parents=True, exist_ok=True)
        with atomic_write(target, "w") as handle:
            handle.write(text)
    summary = fit_dict(result, scenario=str(path), measured=str(args.measured),
                       calibrated=None if target is None else str(target))
    if args.out:
        write_output_set(Path(args.out), "fit",
                         lambda out: write_fit_files(result, summary, out, (target, text) if in_set else None))
    if args.json:
        print_json(summary)
    else:
        print(format_fit(result))
        wrote = [f"the calibrated scenario {target}"] if target is not None else []
        wrote += [f"fit.json and plots in {args.out}"] if args.out else []
        if wrote:
            print("\nWrote " + "; ".join(wrote))
    return 0
