"""What a network solve returns: temperatures and link flows at the output times, and energies."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from thermo.network.energy import EnergyBalance


@dataclass(frozen=True, eq=False)
class NetworkSolution:
    """The solution of one network over one phase.

    Energies are accumulated inside the integration (they are states of the integrated system),
    not by quadrature of the outputs afterwards.

    Attributes
    ----------
    time_s : ndarray (n_t,)
        Output times [s]
    node_names : tuple of str
        The network's nodes, the order of every per-node axis [-]
    temperatures_k : ndarray (n_t, n_nodes)
        [K]
    link_names : tuple of str
        The network's links, the order of every per-link axis [-]
    link_flows_w : ndarray (n_t, n_links)
        Positive from a link's first end to its second [W]
    link_energy_j : ndarray (n_links,)
        Heat carried by each link over the phase [J]
    heat_in_j : float
        Heat put in by all sources [J]
    stored_j : float
        Rise of the nodes' enthalpy, from ``HeatCapacity.enthalpy`` [J]
    lost_j : float
        Heat carried by links that end at a boundary, toward it [J]
    status : str
        'success' or a message
    nfev : int
        Right-hand side evaluations, those of finite-difference Jacobians included
    njev : int
        Jacobian evaluations (analytic or numerical)
    final_k : ndarray (n_nodes,)
        Temperatures at the end of the phase [K]
    method : str
        The integrator used
    phase : str
        Name of the phase, for messages
    """

    time_s: np.ndarray
    node_names: tuple[str, ...]
    temperatures_k: np.ndarray
    link_names: tuple[str, ...]
    link_flows_w: np.ndarray
    link_energy_j: np.ndarray
    heat_in_j: float
    stored_j: float
    lost_j: float
    status: str
    nfev: int
    njev: int
    final_k: np.ndarray
    method: str = ""
    phase: str = ""

    @property
    def energy(self) -> EnergyBalance:
        """Heat in, stored and lost over the phase [J]."""
        return EnergyBalance(self.heat_in_j, self.stored_j, self.lost_j)

    @property
    def balance_rel_error(self) -> float:
        """|in - stored - lost| / max(|in|, |stored| + |lost|, 1 J) [-]."""
        return self.energy.balance_rel_error

    def temperature(self, node: str) -> np.ndarray:
        """Temperature history of one node [K]."""
        return self.temperatures_k[:, self.node_names.index(node)]

    def peak(self, node: str) -> tuple[float, float]:
        """(peak temperature [K], its time [s]) of one node at the output times."""
        series = self.temperature(node)
        i = int(np.argmax(series))
        return float(series[i]), float(self.time_s[i])


def energy_totals(enthalpy, initial_k, final_k, link_energy_j, link_to_boundary) -> tuple:
    """Heat stored and lost over a run [J]: the rise of the nodes' enthalpy and the heat carried by
    the links that end at a boundary, toward it.

    Parameters
    ----------
    enthalpy : callable
        Node enthalpies [J] of temperatures (..., n_nodes) [K].
    initial_k, final_k : ndarray (..., n_nodes)
        Temperatures at the start and the end [K].
    link_energy_j : ndarray (..., n_links)
        Heat carried by each link [J].
    link_to_boundary : ndarray of bool (n_links,)
        True where a link's second end is a boundary.

    Returns
    -------
    tuple
        (stored [J], lost [J]), each of shape (...).
    """
    stored = np.sum(enthalpy(final_k) - enthalpy(initial_k), axis=-1)
    lost = np.sum(np.asarray(link_energy_j)[..., link_to_boundary], axis=-1)
    return stored, lost


def finish_solution(compiled, schedule, time_s, temperatures_k, initial_k, final_k, heat_in_j,
                    link_energy_j, nfev, njev, method, phase, status="success", flows_w=None) -> NetworkSolution:
    """Build a ``NetworkSolution`` of every integrator: the link flows at the output times (from the
    assembler unless the integrator gives them, ``flows_w`` (n_t, n_links) [W]), the energy totals
    (``energy_totals``), the arrays read-only."""
    temps = np.asarray(temperatures_k, dtype=float)
    if flows_w is None:
        boundary_k, drivers = compiled.inputs_series(time_s, schedule)
        flows_w = compiled.flows(temps, boundary_k, drivers)
    flows = np.asarray(flows_w, dtype=float)
    link_energy = np.asarray(link_energy_j, dtype=float)
    stored, lost = energy_totals(compiled.capacities.enthalpy, np.asarray(initial_k), np.asarray(final_k),
                                 link_energy, compiled.link_to_boundary)
    for array in (temps, flows, link_energy):
        array.setflags(write=False)
    return NetworkSolution(
        time_s=np.asarray(time_s, dtype=float), node_names=compiled.node_names, temperatures_k=temps,
        link_names=compiled.link_names, link_flows_w=flows, link_energy_j=link_energy,
        heat_in_j=float(heat_in_j), stored_j=float(stored), lost_j=float(lost), status=status, nfev=int(nfev),
        njev=int(njev), final_k=np.array(final_k, dtype=float), method=method, phase=phase)
