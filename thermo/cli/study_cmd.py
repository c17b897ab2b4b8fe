"""`brakeheat sweep` and `brakeheat uncertainty`: many runs of one scenario, reduced to peaks and margins.

Both run their points through ``thermo.studies.engine`` (local processes, or Dask with
``--scheduler``), show a progress bar on a terminal (none with ``--json`` or ``--quiet``), and with
``--out DIR`` checkpoint every finished chunk into DIR/sweep.h5 or DIR/uncertainty.h5, so that an
interrupted study keeps its finished points and ``--resume`` continues it.
"""
from __future__ import annotations

import sys
from pathlib import Path

from lapdata.echo import printable
from thermo.cli.stdout_json import print_json
from thermo.output.text_table import format_table, number

STUDY_FILES = {"sweep": "sweep.h5", "uncertainty": "uncertainty.h5"}
DEFAULT_ROWS = 40


def _common(p) -> None:
    from thermo.cli.options import add_common_options
    p.add_argument("scenario", help="scenario TOML file")
    p.add_argument("--stints", type=int, metavar="N",
                   help="run the plan up to and including its N-th pit stop (default: the whole plan)")
    p.add_argument("--settle", action="store_true", help="also each corner's laps to settle (a settled-lap solve per point)")
    add_common_options(p, out_help="write the study file, the CSV table and the plots into DIR")
    p.add_argument("--resume", action="store_true", help="continue the study in --out DIR without redoing its finished points")
    p.add_argument("--workers", type=int, metavar="N", help="local worker processes (default: the CPU cores; 1: this process)")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="run on Dask: 'local' (a LocalCluster on this machine) or a scheduler address, "
                        "e.g. tcp://10.0.0.5:8786 (needs pip install \".[cluster]\")")
    p.add_argument("--chunk-size", type=int, metavar="N", help="points per unit of work sent to a worker (default: automatic)")
    p.add_argument("--one-by-one", action="store_true",
                   help="run every point alone as 'brakeheat run' runs it, instead of side by side in one kernel "
                        "call per segment (the same numbers; slower; a check)")


def add_parsers(sub) -> None:
    p = sub.add_parser("sweep", help="run the scenario at every point of a grid of key values: peaks and margins per point")
    _common(p)
    p.add_argument("--vary", metavar="KEY=SPEC", action="append", default=[], required=True,
                   help="a key and its values: a list [5000, 7000], a range LOW:HIGH:COUNT (or :log), "
                        "or one value (repeatable: a full grid, or see --zip)")
    p.add_argument("--zip", action="store_true", help="the --vary keys go together point by point (lists of one length)")
    p.add_argument("--keep-series", action="store_true",
                   help="keep each point's temperature series in the JSON and sweep.h5 (memory grows with the points)")
    p.add_argument("--rows", type=int, metavar="N", default=DEFAULT_ROWS,
                   help=f"table rows shown, the worst first (default {DEFAULT_ROWS}; all in --json and sweep.csv)")
    p.set_defaults(handler=sweep_command)
    u = sub.add_parser("uncertainty", help="the probability of boiling and of every exceeded limit, from the "
                                           "scenario's [uncertainty] table")
    _common(u)
    u.add_argument("--samples", type=int, metavar="N", help="runs (default: the table's samples, else 200)")
    u.add_argument("--seed", type=int, metavar="N", help="seed of the sampling (default: the table's seed, else 0)")
    u.add_argument("--sampling", choices=("lhs", "sobol"), help="Latin hypercube or scrambled Sobol (default: the table's, else lhs)")
    u.set_defaults(handler=uncertainty_command)


class _Bar:
    """A tqdm progress bar on stderr when it is a terminal (and not --json or --quiet)."""

    def __init__(self, args, what: str):
        self.bar = None
        self.enabled = not (args.json or args.quiet) and sys.stderr.isatty()
        self.what = what

    def __call__(self, done: int, total: int) -> None:
        from thermo.cli import interrupts
        interrupts.raise_swallowed()
        if not self.enabled:
            return
        if self.bar is None:
            from tqdm import tqdm
            self.bar = tqdm(total=total, initial=done, unit=self.what, file=sys.stderr, dynamic_ncols=True, leave=False)
        self.bar.update(done - self.bar.n)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()


def _prepare_out(args, kind: str):
    """The output folder checked and its old manifest removed (the set is incomplete until the
    study ends); the study file's path, or None without --out."""
    if args.resume and not args.out:
        from thermo.studies.engine import StudyError
        raise StudyError("--resume needs --out DIR, the folder holding the study file to continue")
    if not args.out:
        return None
    from thermo.output.folder import check_output_folder
    from thermo.output.manifest import remove_manifest
    out = check_output_folder(Path(args.out))
    out.mkdir(parents=True, exist_ok=True)
    remove_manifest(out)
    return out / STUDY_FILES[kind]


def _run(args, kind: str, start):
    """Run ``start(checkpoint, progress)`` with the progress bar; on Ctrl-C say how many points
    the study file holds (and that --resume continues), then let the interrupt end the command."""
    checkpoint = _prepare_out(args, kind)
    bar = _Bar(args, "runs")
    try:
        return checkpoint, start(checkpoint, bar)
    except KeyboardInterrupt:
        bar.close()
        if checkpoint is not None and checkpoint.is_file():
            from thermo.output.study_file import read_study_hdf5
            try:
                held = read_study_hdf5(checkpoint)
                print(f"brakeheat: {kind} interrupted: {held.done} of {len(held.values)} points are in {checkpoint}; "
                      "run the same command with --resume to continue", file=sys.stderr)
            except Exception:                   # the note is a courtesy; the interrupt is what matters
                pass
        raise
    finally:
        bar.close()


def _finish_out(checkpoint, kind: str, write_rest) -> str:
    """After the study: its other files, then manifest.json listing every file of the set; the
    line the report ends with ("" without --out)."""
    if checkpoint is None:
        return ""
    from thermo.output.manifest import write_manifest
    out = checkpoint.parent
    paths = [checkpoint, *write_rest(out)]
    write_manifest(out, paths, kind)
    return f"\n\nWrote {', '.join(p.name for p in paths)} and manifest.json to {printable(str(out))}"


def _overrides(args) -> list:
    from thermo.cli.options import overrides_with_solver
    return overrides_with_solver(args)


def _stints(args):
    if args.stints is not None and args.stints < 0:
        from thermo.studies.engine import StudyError
        raise StudyError(f"--stints {args.stints}: expected a whole number of at least 0 (0: the whole plan)")
    return args.stints


# ----------------------------------------------------------------------------------------- sweep

def sweep_command(args) -> int:
    from thermo.studies.sweep import sweep, sweep_dict
    overrides = _overrides(args)

    def start(checkpoint, progress):
        return sweep(Path(args.scenario), args.vary, zip_keys=args.zip, overrides=overrides, stints=_stints(args) or 0,
                     settle=args.settle, keep_series=args.keep_series, scheduler=args.scheduler, workers=args.workers,
                     chunk_size=args.chunk_size, checkpoint=checkpoint, resume=args.resume, progress=progress,
                     one_by_one=args.one_by_one)
    checkpoint, record = _run(args, "sweep", start)
    data = sweep_dict(record)

    def rest(out):
        from thermo.output.html_study import write_study_html
        from thermo.output.study_outputs import plot_sweep, write_study_csv
        write_study_html("sweep", data, record, out / "report.html")
        return [write_study_csv(record, out / "sweep.csv"), out / "report.html", *plot_sweep(record, out)]
    written = _finish_out(checkpoint, "sweep", rest)          # the files first: a closed pipe cannot lose them
    if args.json:
        print_json(data)
    else:
        print(format_sweep(data, args.rows) + written)
    return 0


def _value_text(value) -> str:
    if isinstance(value, float):
        return f"{value:.6g}"
    return printable(str(value))


def format_sweep(data: dict, max_rows: int = DEFAULT_ROWS) -> str:
    """The sweep's points as a table sorted by the worst margin (the smallest first)."""
    from thermo.output.study_outputs import FLUID_CHECK, fluid_margin, point_verdict, ranked_points
    keys = data["varied"]
    scope = f"up to pit stop {data['stints']}" if data["stints"] else "the whole plan"
    lines = [f"Sweep: {printable(data['scenario'])}",
             f"{data['points_done']} of {data['points_total']} points, {scope}; sorted by the smallest margin of any "
             "check (worst first)", ""]
    ranked = ranked_points(data["points"])
    corners = list(dict.fromkeys(c["name"] for p in ranked for c in p.get("corners", [])))
    header = [*keys, *(f"{c} fluid [K]" for c in corners), "worst margin [K]", "status", "worst check", "exceeded"]
    rows = []
    for p in ranked[:max(1, max_rows)]:
        values = [_value_text(p["values"][k]) for k in keys]
        if "error" in p:
            rows.append([*values, *("-" for _ in corners), "-", "FAILED", printable(p["error"])[:80], "-"])
            continue
        v = point_verdict(p)
        fluid = [number(fluid_margin(p, name), "+.1f") for name in corners]
        rows.append([*values, *fluid, f"{v['margin_k']:+.1f}", v["status"].upper() if v["status"] != "ok" else "ok",
                     v["check"], str(v["exceeded"])])
    lines += format_table(header, rows)
    if corners:
        lines.append(f"  fluid: the margin of {FLUID_CHECK} (the fluid at the pistons against its boiling point "
                     "at the fluid's water content)")
    if len(ranked) > len(rows):
        lines.append(f"  ... {len(ranked) - len(rows)} more points (all in --json and sweep.csv; --rows N shows more)")
    if data["failed"]:
        lines += ["", f"{data['failed']} point(s) failed: their scenario could not be run (the reason is in the table)."]
    lines += ["", data["caution"]]
    return "\n".join(lines)


# ----------------------------------------------------------------------------------- uncertainty

def uncertainty_command(args) -> int:
    from thermo.studies.uncertainty import uncertainty, uncertainty_dict
    overrides = _overrides(args)
    if args.samples is not None and args.sampling == "sobol" and args.samples & (args.samples - 1):
        print(f"brakeheat: warning: --samples {args.samples} is not a power of two: Sobol points keep their "
              "balance only in powers of two (e.g. 256, 512, 1024)", file=sys.stderr)

    def start(checkpoint, progress):
        return uncertainty(Path(args.scenario), overrides=overrides, samples=args.samples, seed=args.seed,
                           sampling=args.sampling, stints=_stints(args), settle=args.settle, scheduler=args.scheduler,
                           workers=args.workers, chunk_size=args.chunk_size, checkpoint=checkpoint, resume=args.resume,
                           progress=progress, one_by_one=args.one_by_one)
    checkpoint, (plan, record) = _run(args, "uncertainty", start)
    data = uncertainty_dict(plan, record)

    def rest(out):
        from thermo.output.study_file import write_study_hdf5
        from thermo.output.study_outputs import plot_uncertainty, write_study_csv
        record.statistics = data
        write_study_hdf5(record, checkpoint)          # complete: with the statistics
        from thermo.output.html_study import write_study_html
        write_study_html("uncertainty", data, record, out / "report.html")
        return [write_study_csv(record, out / "uncertainty.csv"), out / "report.html", *plot_uncertainty(data, out)]
    written = _finish_out(checkpoint, "uncertainty", rest)
    if args.json:
        print_json(data)
    else:
        print(format_uncertainty(data) + written)
    return 0


def format_uncertainty(data: dict) -> str:
    """The headline (the probability that the fluid boils), every check's probabilities, the
    inputs and what drives each margin."""
    from thermo.output.study_outputs import percent as _percent
    how = {"lhs": "Latin hypercube", "sobol": "scrambled Sobol"}[data["sampling"]]
    scope = f"up to pit stop {data['stints']}" if data["stints"] else "the whole plan"
    conf = f"{100 * data['confidence']:g} %"
    lines = [f"Uncertainty: {printable(data['scenario'])}",
             f"{data['samples_done']} of {data['samples']} samples ({how}, seed {data['seed']}), {scope}", ""]
    if data["headline"]:
        lines.append("PROBABILITY THAT THE BRAKE FLUID BOILS (at its water content, fluid at the pistons):")
        for h in data["headline"]:
            lo, hi = h["p_exceed_ci"]
            lines.append(f"  {h['corner']}: {_percent(h['p_exceed'])}  ({conf} interval {_percent(lo)} to {_percent(hi)}); "
                         f"in the caution band or beyond: {_percent(h['p_caution'])}")
        lines.append("")
    header = ["corner", "check", "P(exceeded)", f"{conf} interval", "P(caution or worse)", "margin 5 % [K]",
              "median [K]", "95 % [K]"]
    rows = []
    for c in data["checks"]:
        lo, hi = c["p_exceed_ci"]
        m = c["margin_k_percentiles"]
        rows.append([c["corner"], c["name"], _percent(c["p_exceed"]), f"{_percent(lo)} to {_percent(hi)}",
                     _percent(c["p_caution"]), f"{m['5']:+.1f}", f"{m['50']:+.1f}", f"{m['95']:+.1f}"])
    lines.append("Every check (margin = limit - peak; below 0: exceeded):")
    lines += format_table(header, rows, align=["left", "left"] + ["right"] * 6)
    lines += ["", "Inputs:"]
    for inp in data["inputs"]:
        params = ", ".join(f"{k} {inp[k]:g}" for k in ("mean", "std", "low", "mode", "high", "median", "sigma") if k in inp)
        lines.append(f"  {printable(inp['name'])}: {inp['distribution']} ({params}) -> {', '.join(inp['keys'])}")
    lines += ["", "What drives each margin (Spearman rank correlation with the margin; above 0: more of the input, "
              "more margin; '~' within sampling noise, p >= 0.05):"]
    for s in data["sensitivity"]:
        top = ", ".join(f"{printable(d['input'])} {d['rank_correlation']:+.2f}{' ~' if d.get('within_noise') else ''}"
                        for d in s["inputs"][:3] if d["rank_correlation"] is not None)
        lines.append(f"  {s['corner']} {s['check']}: {top or 'no input moves it'}")
    if data["samples_failed"]:
        lines += ["", f"{data['samples_failed']} sample(s) failed (their scenario could not be run) and are left out."]
    lines += ["", "The intervals are exact binomial (Clopper-Pearson) intervals, which treat the samples as independent; "
              "stratified samples are spread more evenly, so the intervals err wide.", "", data["caution"]]
    return "\n".join(lines)
