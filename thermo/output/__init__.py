"""What a run shows the engineer: JSON summary, HDF5 results file, terminal report, plots.

These modules read :class:`thermo.results.Results` objects and never run a model. Names are
imported on first use, so that a `--json` run loads neither h5py nor matplotlib.
"""
from lapdata.lazy import lazy_exports

_PUBLIC = {
    "OutputError": "thermo.output.errors", "atomic_path": "thermo.output.atomic",
    "atomic_write": "thermo.output.atomic", "format_run_report": "thermo.output.report",
    "plot_comparison": "thermo.output.plots", "plot_run": "thermo.output.plots",
    "read_results_hdf5": "thermo.output.hdf5", "summary_dict": "thermo.output.summary",
    "write_results_hdf5": "thermo.output.hdf5", "write_summary_json": "thermo.output.summary",
}

__all__ = list(_PUBLIC)

__getattr__, __dir__ = lazy_exports("thermo.output", _PUBLIC)
