"""A generic lumped heat network: nodes, links, sources, its right-hand side and Jacobian.

Nothing here knows what the network stands for, so it can be tested on textbook RC networks.
"""
from thermo.network.assemble import CompiledNetwork, Inputs, compile_network
from thermo.network.capacity import CapacityTable
from thermo.network.elements import (
    Boundary, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation,
)
from thermo.network.schedule import Schedule

__all__ = [
    "Boundary", "CapacityTable", "CompiledNetwork", "Conduction", "Convection", "HeatCapacity",
    "HeatSource", "Inputs", "Network", "Node", "Radiation", "Schedule", "compile_network",
]
