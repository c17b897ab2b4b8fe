"""Every file of one run's output set, written into one folder and marked complete by manifest.json."""
from __future__ import annotations

from pathlib import Path

from thermo.results import Results


def _write_run_files(results: Results, out: Path, results_file_written: bool = False) -> list[Path]:
    """results.h5 (unless ``results_file_written``), summary.json, laps.csv, checks.csv, report.html
    and the plots, each written atomically; their paths."""
    from thermo.output.hdf5 import write_results_hdf5
    from thermo.output.plots import plot_run
    from thermo.output.summary import write_summary_json
    from thermo.output.html_report import write_report_html
    from thermo.output.tables_csv import write_checks_csv, write_laps_csv
    if not results_file_written:
        write_results_hdf5(results, out / "results.h5")
    write_summary_json(results, out / "summary.json")
    write_laps_csv(results, out / "laps.csv")
    write_checks_csv(results, out / "checks.csv")
    svg: list[str] = []
    plots = plot_run(results, out, svg=svg)        # each figure built once, drawn as PNG and as the report's SVG
    write_report_html(results, out / "report.html", svg=svg)
    return [out / "results.h5", out / "summary.json", out / "laps.csv", out / "checks.csv", out / "report.html",
            *plots]


def write_outputs(results: Results, out_dir, command: str = "run", results_file_written: bool = False) -> Path:
    """results.h5, summary.json, laps.csv, checks.csv, report.html and the plots into ``out_dir`` (made if missing), each written
    atomically (a temporary file renamed into place), then manifest.json listing them, written last;
    the folder's old manifest.json is removed first. ``command`` is recorded in the manifest.
    ``results_file_written``: results.h5 is already in the folder (streamed while the run went,
    ``thermo.output.hdf5_stream``, after the old manifest was removed); it is listed, not written.
    Returns the folder."""
    from thermo.output.manifest import write_output_set
    out = Path(out_dir)
    write_output_set(out, command, lambda folder: _write_run_files(results, folder, results_file_written))
    return out
