"""Integrators for a generic heat network: scipy's stiff solvers with edge restarts, and 'fast'."""
from thermo.solver.scipy_solve import INTEGRATORS, solve_network
from thermo.solver.settings import METHODS, SolverSettings
from thermo.solver.solution import NetworkSolution

__all__ = ["INTEGRATORS", "METHODS", "NetworkSolution", "SolverSettings", "solve_network"]
