"""Check the correlations of a corner against their validity ranges on the states a run reached.

The solver looks convective conductances up in tables (thermo.network.tabulate), which span a
grid wider than any run; the validity of each correlation is therefore checked afterwards, on a
sample of the run's own speeds and temperatures, by evaluating every convection path exactly
once with its checks on. The same pass records which correlations the corner used, for the
references printed with the results.
"""
from __future__ import annotations

import warnings

import numpy as np

from thermo.correlations.validity import CorrelationWarning, recording_calls, set_validity_policy
from thermo.network import Convection
from thermo.network.tabulate import TabulatedConductance


def check_validity(network, states: list[tuple[np.ndarray, np.ndarray, np.ndarray]], corner: str):
    """(warning lines, names of correlations used) for one corner.

    ``states``: (speed [m/s], network node temperatures (n, n_nodes) [K], boundary temperatures
    (n, n_boundaries) [K]) samples gathered over the run.
    """
    if not states:
        return [], set()
    speed = np.concatenate([s[0] for s in states])
    nodes = np.concatenate([s[1] for s in states])
    bounds = np.concatenate([s[2] for s in states])
    index = {n: i for i, n in enumerate(network.node_names)}
    b_index = {b: i for i, b in enumerate(network.boundary_names)}
    lines: list[str] = []
    with recording_calls() as used, warnings.catch_warnings(record=True) as caught, set_validity_policy("warn"):
        warnings.simplefilter("always", CorrelationWarning)
        for link in network.links:
            if not isinstance(link, Convection) or link.boundary not in b_index:
                continue                      # node-to-node links (the pad-disc interface) use no correlation
            fn = link.conductance.function if isinstance(link.conductance, TabulatedConductance) else link.conductance
            start = len(caught)
            fn(speed, nodes[:, index[link.node]], bounds[:, b_index[link.boundary]])
            seen = set()
            for w in caught[start:]:
                if issubclass(w.category, CorrelationWarning) and str(w.message) not in seen:
                    seen.add(str(w.message))
                    lines.append(f"corner {corner}, heat path {link.name}: {w.message}")
    return lines, set(used.names)
