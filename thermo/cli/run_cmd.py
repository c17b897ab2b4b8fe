"""`brakeheat run SCENARIO.toml` and `brakeheat demo`."""
from __future__ import annotations

import gc
from pathlib import Path

from thermo.cli.exit_codes import EXIT_EXCEEDED, EXIT_OK
from thermo.cli.options import add_common_options, add_threads_option, demo_scenario_path, overrides_with_solver
from thermo.cli.stdout_json import print_json
from thermo.studies.compare import BIAS_WARNING_POINTS


def _lap_rows(text: str) -> int:
    """--laps: "all" (a very large count) or a whole number of at least 1."""
    import argparse
    if text == "all":
        return 10 ** 9
    if not text.isdigit() or int(text) < 1:
        raise argparse.ArgumentTypeError(f"expected all or a whole number of rows of at least 1, got {text!r}")
    return int(text)


def add_run_options(p) -> None:
    add_common_options(p, out_help="write results.h5, summary.json, laps.csv, checks.csv, report.html and PNG plots "
                                   "into DIR")
    p.add_argument("--store", choices=("standard", "full"), default="standard",
                   help="what results.h5 keeps: standard (series at [solver] output_s, link energies per lap "
                        "and phase) or full (every solver step, and every link's flow at each, streamed into "
                        "results.h5 as the run goes; needs --out)")
    p.add_argument("--laps", type=_lap_rows, default=None, metavar="all|N",
                   help="per-lap table rows in the report: all, or about N (default: all up to 40 laps, "
                        "else about 20 with the last and the worst)")
    p.add_argument("--csv", metavar="FILE", help="also write the per-lap table (as laps.csv under --out) to FILE")
    p.add_argument("--fail-on-exceeded", action="store_true", help="exit 3 when any check is exceeded")
    add_threads_option(p)


def add_run_parsers(sub) -> None:
    p = sub.add_parser("run", help="run a scenario: temperatures, margins, results file, plots")
    p.add_argument("scenario", help="scenario TOML file")
    add_run_options(p)
    p.set_defaults(handler=run_command)
    d = sub.add_parser("demo", help="run the bundled invented demo scenario (same options as run)")
    add_run_options(d)
    d.add_argument("--print-scenario", action="store_true", help="print where the demo scenario lives and stop")
    d.add_argument("--compare", action="store_true",
                   help="compare the demo's variants (pistons, shim, ducts) instead of one run, as `brakeheat compare`")
    # what `compare` has and `demo --compare` does not offer: its defaults
    d.set_defaults(handler=demo_command, variant=[], only=None, keep_bias=None, bias_warning_points=BIAS_WARNING_POINTS)


def run_and_report(path: Path, args) -> int:
    from thermo.chain import expand_plan, run_scenario
    from thermo.cli.progress import Progress
    from thermo.scenario import load_scenario

    scenario = load_scenario(path, overrides_with_solver(args))
    segments = expand_plan(scenario)
    progress = Progress(len(segments) * len(scenario.corners), enabled=not (args.json or args.quiet))
    try:
        if args.out and args.store == "full":
            results = _run_streamed(scenario, segments, progress, Path(args.out))
        else:
            results = run_scenario(scenario, progress=progress, segments=segments, store=args.store,
                                   threads=args.threads)
    finally:
        progress.close()
    # what the solve leaves alive (the results, the models) stays alive while the results are
    # written: kept out of the garbage collector's full passes, which the plots' many short-lived
    # objects set off (a quarter of a second on a 24-hour run), and handed back after
    gc.collect()
    gc.freeze()
    try:
        _write_and_print(results, args)
    finally:
        gc.unfreeze()
    exceeded = any(c.status == "exceeded" for corner in results.corners for c in corner.checks)
    return EXIT_EXCEEDED if (args.fail_on_exceeded and exceeded) else EXIT_OK


def _run_streamed(scenario, segments, progress, out: Path):
    """``--store full --out DIR``: the run with its every row streamed into DIR/results.h5 as it goes
    (``thermo.output.hdf5_stream``), keeping in memory only the series at the output interval. The
    folder's manifest.json is removed once the file is complete, just before it replaces the earlier
    results.h5: a run that fails or is interrupted before then leaves the earlier set whole."""
    from thermo.chain import run_scenario
    from thermo.output.hdf5_stream import streamed_results_hdf5
    from thermo.output.manifest import remove_manifest
    out.mkdir(parents=True, exist_ok=True)
    with streamed_results_hdf5(out / "results.h5") as stream:
        results = run_scenario(scenario, progress=progress, segments=segments, store="full", sink=stream)
        stream.finish(results)
        remove_manifest(out)
    return results


def _write_and_print(results, args) -> None:
    """The output set (--out), the lap table (--csv), and the JSON summary or the text report."""
    from thermo.output.summary import summary_dict
    if args.out:
        from thermo.output.files import write_outputs
        write_outputs(results, Path(args.out), command=getattr(args, "command", None) or "run",
                      results_file_written=args.store == "full")
    if args.csv:
        from thermo.output.tables_csv import write_laps_csv
        write_laps_csv(results, Path(args.csv))
    if args.json:
        print_json(summary_dict(results))
    else:
        from thermo.output.report import format_run_report
        print(format_run_report(results, args.laps))
        if args.out:
            print(f"\nWrote results.h5, summary.json, plots and manifest.json to {args.out}")


def check_out_option(args) -> None:
    """A bad --out or --csv fails now, before the scenario is read or solved; so does --store full
    without --out (it says what results.h5 keeps, and only --out writes one)."""
    if getattr(args, "store", "standard") == "full" and args.out is None:
        from thermo.output.errors import OutputError
        raise OutputError("--store full: keeps every solver step in results.h5, which only --out DIR writes; "
                          "expected --out DIR with it")
    if args.out is not None:
        from thermo.output.folder import check_output_folder
        check_output_folder(args.out, source="--out")
    if getattr(args, "csv", None):
        from thermo.output.errors import OutputError
        target = Path(args.csv)
        if target.is_dir() or not target.parent.is_dir():
            raise OutputError(f"--csv {args.csv}: expected a file in an existing folder")


def run_command(args) -> int:
    check_out_option(args)
    return run_and_report(Path(args.scenario), args)


def demo_command(args) -> int:
    path = demo_scenario_path()
    if args.print_scenario:
        print(path)
        return 0
    if args.compare:
        if args.store != "standard":
            from thermo.output.errors import OutputError
            raise OutputError("--store: says what a run's results.h5 keeps; demo --compare writes none")
        from thermo.cli.compare_cmd import compare_command
        args.scenario = str(path)
        return compare_command(args)
    check_out_option(args)
    return run_and_report(path, args)
