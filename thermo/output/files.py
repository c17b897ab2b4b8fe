"""Every file of one run's output set, written into one folder."""
from __future__ import annotations

from pathlib import Path

from thermo.results import Results


def write_outputs(results: Results, out_dir) -> Path:
    """results.h5, summary.json and the plots into ``out_dir`` (made if missing), each written
    atomically (a temporary file renamed into place). Returns the folder."""
    from thermo.output.hdf5 import write_results_hdf5
    from thermo.output.plots import plot_run
    from thermo.output.summary import write_summary_json
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    write_results_hdf5(results, out / "results.h5")
    write_summary_json(results, out / "summary.json")
    plot_run(results, out)
    return out
