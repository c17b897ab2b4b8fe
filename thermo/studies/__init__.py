"""Studies built on whole runs: comparisons of variants, the settled lap, the braking of a lap.

Library code (the command line is a thin layer over it); each returns plain results or
JSON-ready dicts and never prints. Importing the package stays light (its modules import numpy
and the model inside their functions): the command line's parser reads the comparison's option
choices, and `brakeheat --help` loads no numpy.
"""
from thermo.studies.compare import Comparison, compare
from thermo.studies.lap import lap_summary
from thermo.studies.settle import settle, settled_dict

__all__ = ["Comparison", "compare", "lap_summary", "settle", "settled_dict"]
