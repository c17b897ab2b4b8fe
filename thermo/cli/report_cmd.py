"""`brakeheat report RESULTS.h5 [-o report.html]`: the shareable HTML report of a finished run."""
from __future__ import annotations

from pathlib import Path


def add_parser(sub) -> None:
    p = sub.add_parser("report", help="write the self-contained HTML report of a results.h5",
                       description="One HTML file, no network access needed: verdicts, plots, the per-lap table, "
                                   "the soak, pad wear, where the heat went, hydraulics, warnings, references.")
    p.add_argument("results", help="a results.h5 written by `brakeheat run --out` or `demo --out`")
    p.add_argument("-o", "--output", metavar="FILE", default=None,
                   help="the HTML file to write (default: report.html beside RESULTS.h5)")
    p.set_defaults(handler=run)


def run(args) -> int:
    from thermo.output.errors import OutputError
    from thermo.output.hdf5 import read_results_hdf5
    from thermo.output.html_report import write_report_html
    source = Path(args.results)
    target = Path(args.output) if args.output else source.with_name("report.html")
    if target.is_dir() or not target.parent.is_dir():
        raise OutputError(f"-o {target}: expected a file in an existing folder")
    write_report_html(read_results_hdf5(source), target)
    print(f"Wrote {target}")
    return 0
