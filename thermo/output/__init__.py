"""What a run shows the engineer: JSON summary, HDF5 results file, terminal report, plots.

These modules read :class:`thermo.results.Results` objects and never run a model.
"""
from thermo.output.atomic import atomic_path, atomic_write
from thermo.output.errors import OutputError
from thermo.output.hdf5 import read_results_hdf5, write_results_hdf5
from thermo.output.plots import plot_comparison, plot_run
from thermo.output.report import format_run_report
from thermo.output.summary import summary_dict, write_summary_json

__all__ = [
    "OutputError", "atomic_path", "atomic_write", "format_run_report", "plot_comparison", "plot_run",
    "read_results_hdf5", "summary_dict", "write_results_hdf5", "write_summary_json",
]
