"""brakeheat's model: heat into each brake corner, the corner heat network, its solution and reports.

The public Python API (README, "Python"); each name is imported on first use, so that
``import thermo`` stays light:

- ``load_scenario(path, overrides=())`` -> Scenario
- ``run(scenario)`` -> Results (every corner over the scenario's plan)
- ``compare(path, variants=(), overrides=(), only=None)`` -> Comparison
- ``settle(scenario, corners=None, phase=None)`` -> list of SettledLap
- ``lap_summary(trace, scenario)`` -> dict (braking zones, energy per corner)
- ``write_outputs(results, out_dir)`` -> the folder with results.h5, summary.json and plots
- ``read_results(path)`` -> Results from a results.h5
- ``sweep(path, vary, ...)`` -> StudyRecord (every point's peaks and margins; ``sweep_dict``)
- ``uncertainty(path, ...)`` -> (UncertaintyPlan, StudyRecord) (``uncertainty_dict``: the probabilities)
"""

__version__ = "0.1.0"

CAUTION = (
    "CAUTION: these results are engineering estimates, to be confirmed with instrumented running. "
    "The fluid, bearing and pad makers' limits and the series' technical regulations govern; "
    "a qualified engineer signs off."
)

_PUBLIC = {
    "load_scenario": ("thermo.scenario", "load_scenario"),
    "run": ("thermo.chain", "run_scenario"),
    "compare": ("thermo.studies.compare", "compare"),
    "settle": ("thermo.studies.settle", "settle"),
    "lap_summary": ("thermo.studies.lap", "lap_summary"),
    "write_outputs": ("thermo.output.files", "write_outputs"),
    "read_results": ("thermo.output.hdf5", "read_results_hdf5"),
    "sweep": ("thermo.studies.sweep", "sweep"),
    "uncertainty": ("thermo.studies.uncertainty", "uncertainty"),
}

__all__ = ["CAUTION", "__version__", *_PUBLIC]


def __getattr__(name):
    if name in _PUBLIC:
        import importlib
        module, attribute = _PUBLIC[name]
        return getattr(importlib.import_module(module), attribute)
    raise AttributeError(f"module 'thermo' has no attribute {name!r}")
