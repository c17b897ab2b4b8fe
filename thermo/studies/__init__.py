"""Studies built on whole runs: comparisons of variants, the settled lap, the braking of a lap.

Library code (the command line is a thin layer over it); each returns plain results or
JSON-ready dicts and never prints. Names are imported on first use, so that the command line's
parser, which reads the comparison's option choices, does not load numpy (`brakeheat --help`).
"""
from lapdata.lazy import lazy_exports

_PUBLIC = {
    "Comparison": "thermo.studies.compare", "compare": "thermo.studies.compare",
    "lap_summary": "thermo.studies.lap", "settle": "thermo.studies.settle", "settled_dict": "thermo.studies.settle",
}

__all__ = list(_PUBLIC)

__getattr__, __dir__ = lazy_exports("thermo.studies", _PUBLIC)
