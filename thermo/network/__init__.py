"""A generic lumped heat network: nodes, links, sources, its right-hand side and Jacobian.

Nothing here knows about brakes, so it can be tested on textbook RC networks.
"""
from thermo.network.elements import (
    Boundary, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation,
)

__all__ = [
    "Boundary", "Conduction", "Convection", "HeatCapacity", "HeatSource", "Network", "Node",
    "Radiation",
]
