"""Batched runs: many configurations of one network topology advanced together in one kernel call.

A configuration is a network with the same nodes, links (names, kinds, ends, drivers) and sources
as the others; it may differ in every number: conductances, radiation coefficients, convection
tables, heat capacities, source fractions, initial temperatures. The schedule (the duty) is shared.
Inputs on the time grid are sampled and integrated once for the whole batch. Full Newton
(``thermo.solver.kernel``) loops over the configurations, in parallel over the CPU cores. The
linearised mode puts configurations side by side in lanes (``thermo.solver.kernel_lanes``: the
innermost loop runs over configurations, in SIMD, and the work the batch shares is done once per
block), so the cost per configuration falls as the batch grows: measured on the demo corner, one
core, from about 2.1 us a step alone to about 0.48 us at 64 lanes. A single 'fast' solve is a
batch of one.

This module is the batch API: ``solve_batch`` -> ``BatchSolution``. The array form of the
configurations and of the signals, and the lane layout, are ``thermo.solver.kernel_arrays``
(``kernel_network``, ``batch_network``, ``scaled``, ``kernel_inputs``, ``lane_width``: imported here,
so that ``from thermo.solver.batch import scaled, solve_batch`` keeps working).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from thermo.errors import ModelError, SolveError
from thermo.network.schedule import Schedule
from thermo.solver import kernel
from thermo.solver.kernel_arrays import (MIN_LANES, KernelInputs, KernelNetwork, KernelResult, batch_network,
                                         enthalpy, kernel_inputs, kernel_network, lane_width, scaled)
from thermo.solver.segments import output_grid, span, time_grid
from thermo.solver.settings import SolverSettings
from thermo.solver.solution import energy_totals

__all__ = ["BatchSolution", "solve_batch",
           # the kernels' arrays (thermo.solver.kernel_arrays), for callers of the batch API
           "MIN_LANES", "KernelInputs", "KernelNetwork", "KernelResult", "batch_network", "kernel_inputs",
           "kernel_network", "lane_width", "scaled"]


@dataclass(frozen=True, eq=False)
class BatchSolution:
    """Results of B configurations over one phase.

    Attributes
    ----------
    node_names : tuple of str
        The network's nodes, the order of every per-node axis [-]
    time_s : ndarray (n_out,)
        Times at which temperatures were kept [s]
    temperatures_k : ndarray (B, n_out, n_nodes)
        [K]
    peak_k : ndarray (B, n_nodes)
        Highest temperature of each node on the grid [K]
    peak_time_s : ndarray (B, n_nodes)
        When it occurred [s]
    final_k : ndarray (B, n_nodes)
        [K]
    heat_in_j, stored_j, lost_j : ndarray (B,)
        Energy totals [J]
    link_energy_j : ndarray (B, n_links)
        [J]
    steps : int
        Grid steps taken
    """

    node_names: tuple
    time_s: np.ndarray
    temperatures_k: np.ndarray
    peak_k: np.ndarray
    peak_time_s: np.ndarray
    final_k: np.ndarray
    heat_in_j: np.ndarray
    stored_j: np.ndarray
    lost_j: np.ndarray
    link_energy_j: np.ndarray
    steps: int

    def peak(self, node: str) -> np.ndarray:
        """Peak of one node in every configuration [K]."""
        return self.peak_k[:, self.node_names.index(node)]

    @property
    def balance_rel_error(self) -> np.ndarray:
        """|in - stored - lost| / max(|in|, |stored| + |lost|, 1 J) per configuration [-]."""
        scale = np.maximum(np.maximum(np.abs(self.heat_in_j), np.abs(self.stored_j) + np.abs(self.lost_j)), 1.0)
        return np.abs(self.heat_in_j - self.stored_j - self.lost_j) / scale


def solve_batch(networks, schedule: Schedule, initial_k, settings: SolverSettings | None = None, *,
                t_start: float | None = None, t_end: float | None = None, output_times=None,
                grid: np.ndarray | None = None, phase: str = "", linearised: bool = False) -> BatchSolution:
    """Integrate B configurations over one schedule with the compiled TR-BDF2 kernel.

    Parameters
    ----------
    networks : KernelNetwork or sequence of Network/CompiledNetwork
        The configurations
    schedule : Schedule
        Shared duty: sources [W], boundary temperatures [K], drivers
    initial_k : array_like (n_nodes,) or (B, n_nodes)
        Start temperatures [K]
    settings : SolverSettings
        rtol, atol_k and max_step_s are used (method is ignored: this is
        always the compiled 'fast' scheme) [-]
    t_start, t_end : float or None
        Interval, default the whole schedule [s]
    output_times : array_like or None
        Times at which to keep temperatures (added to the grid);
        None keeps only the final state, the peaks and the energies [s]
    grid : array_like or None
        Time grid; default the schedule's samples (``graded_grid`` gives
        a coarser one) [s]
    phase : str
        Named in error messages
    linearised : bool
        The linearised mode: each stage linearised once, no Newton iteration, so
        rtol and atol_k do not apply; configurations side by side in lanes for larger batches
        (peaks within about 0.005 K of full Newton on the demo; see
        ``thermo.solver.kernel_linearised`` and ``thermo.solver.kernel_lanes``) [-]

    Raises
    ------
    ModelError
        Mixed topologies, bad shapes.
    SolveError
        A configuration failed (named).
    """
    settings = SolverSettings(method="fast") if settings is None else settings
    kn = networks if isinstance(networks, KernelNetwork) else batch_network(list(networks))
    net = kn.compiled
    net.check_schedule(schedule)
    a, b = span(schedule, t_start, t_end)
    out_t = np.zeros(0) if output_times is None else output_grid(schedule, a, b, output_times)
    if grid is None:
        g = time_grid(schedule, a, b, out_t, settings.max_step_s)
    else:
        g = np.union1d(np.asarray(grid, dtype=float), np.concatenate([[a, b], out_t]))
        g = g[(g >= a) & (g <= b)]
    T0 = np.asarray(initial_k, dtype=float)
    T0 = np.repeat(T0[None, :], kn.size, axis=0) if T0.ndim == 1 else T0
    if T0.shape != (kn.size, kn.n_nodes) or not np.all(np.isfinite(T0) & (T0 > 0)):
        raise ModelError(f"batch: initial_k must be positive kelvin of shape ({kn.n_nodes},) or "
                         f"({kn.size}, {kn.n_nodes}), got {T0.shape}")
    record = np.zeros(g.size, dtype=bool)
    record[np.searchsorted(g, out_t)] = True
    inputs = kernel_inputs(net, schedule, g)
    res = kn.run(inputs, T0, settings.rtol, settings.atol_k, record, linearised)
    bad = np.flatnonzero(res.status != kernel.STATUS_OK)
    if bad.size:
        k = int(bad[0])
        what = {kernel.STATUS_NEWTON: "Newton did not converge", kernel.STATUS_OUTSIDE_GRID:
                "a state left the conductance tables", kernel.STATUS_NONFINITE: "non-finite temperatures"}
        t_fail = g[min(int(res.fail_step[k]) + 1, g.size - 1)]
        raise SolveError(f"phase '{phase}': batch configuration {k}: {what[int(res.status[k])]} at t = {t_fail:.6g} s")
    H = lambda T: np.stack([enthalpy(kn, i, T[i]) for i in range(kn.size)])
    stored, lost = energy_totals(H, T0, res.final, res.link_energy, net.link_to_boundary)
    return BatchSolution(net.node_names, out_t, res.temps, res.peak, g[res.peak_step], res.final, res.heat_in,
                         stored, lost, res.link_energy, int(g.size - 1))
