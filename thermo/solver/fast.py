"""'fast': TR-BDF2 on the schedule's own time grid, compiled, with exact energy bookkeeping.

The scheme is written on the node enthalpies H_i(T_i), dH/dt = r(t, T) + q(t), with r = D f the
net link flow into each node [W] and q the heat sources [W]. TR-BDF2 (Bank et al. 1985; Hosea &
Shampine 1996) as a stiffly accurate ESDIRK, gamma = 2 - sqrt(2), d = gamma/2, w = sqrt(2)/4:

    H(Y2) = H(T_n) + h (d r1 + d r2) + Q(t_n, t_n + gamma h)
    H(Y3) = H(T_n) + h (w r1 + w r2 + d r3) + Q(t_n, t_n + h),     T_{n+1} = Y3,

second order and L-stable (no ringing of a thin surface layer after a heat source switches off). Q is the
exact integral of the piecewise linear sources, so the heat input is averaged over each stage,
and each link's energy is accumulated with the same weights, h (w f1 + w f2 + d f3): heat in =
stored + lost holds to the Newton tolerance, step by step.

Every schedule sample is a grid point, so every edge where a source switches is one too;
intervals longer than ``max_step_s`` are split. Unbounded adaptive stepping is never used: it
steps over short braking pulses.

Two implementations of the same scheme:
- ``thermo.solver.kernel`` (numba, on-disk cache): used whenever every convection link of the
  network is tabulated on one grid (``CompiledNetwork.conv_tables``), as built by the corner builder,
  and the run stays on the tables. About 4 us a step for the 12-node demo corner (full Newton;
  the linearised mode used by races and batches, ``thermo.solver.kernel_linearised``, about
  2 us, and about 0.5 us a configuration with 64 configurations side by side,
  ``thermo.solver.kernel_lanes``).
- the numpy stepper below (a few ms a step): networks with untabulated convection functions,
  ``use_jacobian=False`` (finite-difference Jacobian), and any run whose state leaves a
  conductance table (the exact function is then evaluated, as ``tabulate.lookup`` does).

References
----------
R. E. Bank, W. M. Coughran, W. Fichtner, E. H. Grosse, D. J. Rose, R. K. Smith, "Transient
simulation of silicon devices and circuits", IEEE Trans. CAD 4 (1985) 436-451.
M. E. Hosea, L. F. Shampine, "Analysis and implementation of TR-BDF2", Appl. Numer. Math. 20
(1996) 21-37.
"""
from __future__ import annotations

import numpy as np

from thermo.errors import SolveError
from thermo.network.assemble import CompiledNetwork
from thermo.network.schedule import Schedule
from thermo.solver import kernel
from thermo.solver.kernel_arrays import KernelInputs, kernel_inputs, kernel_network
from thermo.solver.grids import graded_grid
from thermo.solver.segments import output_grid, split_long_steps, time_grid
from thermo.solver.settings import SolverSettings
from thermo.solver.solution import NetworkSolution, finish_solution

GAMMA = kernel.GAMMA

D_WEIGHT = kernel.D_WEIGHT
W_WEIGHT = kernel.W_WEIGHT
MAX_NEWTON = kernel.MAX_NEWTON


def integrate_fast(net: CompiledNetwork, schedule: Schedule, initial_k: np.ndarray, settings: SolverSettings,
                   t_start: float, t_end: float, out_t: np.ndarray, phase: str) -> NetworkSolution:
    """TR-BDF2 over [t_start, t_end] on the schedule's grid, or on the graded grid when
    ``settings.max_stride`` > 1; see the module notes. ``out_t`` None: every step grid point."""
    grid, out_t = step_grid(net, schedule, settings, t_start, t_end, out_t)
    knet = kernel_network(net) if settings.use_jacobian else None
    if knet is not None:
        inputs = kernel_inputs(net, schedule, grid)
        sol = _integrate_compiled(net, knet, inputs, schedule, initial_k, settings, out_t, phase)
        if sol is not None:
            return sol
    return _integrate_numpy(net, schedule, initial_k, settings, grid, out_t, phase)


def step_grid(net: CompiledNetwork, schedule: Schedule, settings: SolverSettings, t_start: float, t_end: float,
              out_t: np.ndarray | None) -> tuple[np.ndarray, np.ndarray]:
    """(step grid, output times) of a 'fast' run over [t_start, t_end] [s]: the graded grid when
    ``settings.max_stride`` > 1 (its points are the outputs unless ``out_t`` is given), else the
    schedule's samples with the outputs added; intervals longer than ``settings.max_step_s`` split."""
    if settings.max_stride > 1:
        grid = graded_grid(schedule, net, t_start, t_end, 1, settings.max_stride)
        grid = split_long_steps(grid if out_t is None else np.union1d(grid, out_t), settings.max_step_s)
    else:
        out_t = output_grid(schedule, t_start, t_end) if out_t is None else out_t
        grid = time_grid(schedule, t_start, t_end, out_t, settings.max_step_s)
    return grid, (grid if out_t is None else out_t)


def _integrate_compiled(net, knet, inputs: KernelInputs, schedule, initial_k, settings, out_t, phase):
    """One configuration through the kernel; None when the state left a conductance table."""
    res = run_compiled(knet, inputs, initial_k, settings, out_t, phase)
    if res is None:
        return None
    return finish_solution(net, schedule, out_t, res.temps[0], initial_k, res.final[0], res.heat_in[0],
                           res.link_energy[0], res.counts[0, 0], res.counts[0, 1], "fast", phase,
                           flows_w=res.flows[0])


def run_compiled(knet, inputs: KernelInputs, initial_k: np.ndarray, settings: SolverSettings, out_t: np.ndarray,
                 phase: str):
    """One configuration of ``knet`` (``kernel_arrays.KernelNetwork``) over ``inputs.grid`` from
    ``initial_k`` [K], recording at ``out_t`` (points of the grid) [s]: the ``KernelResult``, or None
    when the state left a conductance table (the caller then runs the numpy stepper). Raises
    ``SolveError`` naming ``phase`` and the time when Newton fails or a temperature is not finite."""
    grid = inputs.grid
    record = np.zeros(grid.size, dtype=bool)
    index = np.searchsorted(grid, out_t)
    record[index] = True
    res = knet.run(inputs, initial_k[None, :], settings.rtol, settings.atol_k, record, settings.linearised)
    code, step = int(res.status[0]), int(res.fail_step[0])
    if code == kernel.STATUS_OUTSIDE_GRID:
        return None
    if code != kernel.STATUS_OK:
        t_fail = grid[min(step + 1, grid.size - 1)]
        what = {kernel.STATUS_NEWTON: "Newton did not converge",
                kernel.STATUS_NONFINITE: "produced non-finite temperatures"}[code]
        raise SolveError(f"phase '{phase}': method fast: {what} at t = {t_fail:.6g} s")
    return res


# ---------------------------------------------------------------------- the numpy stepper
class _Stepper:
    def __init__(self, net: CompiledNetwork, settings: SolverSettings, phase: str):
        self.net = net
        self.settings = settings
        self.phase = phase
        self.nfev = 0
        self.njev = 0
        self.diagonal = np.diag_indices(net.n_nodes)

    def flows(self, T, bk, drv):
        self.nfev += 1
        return self.net.flows(T, bk, drv)

    def flows_and_jacobian(self, T, bk, drv):
        self.nfev += 1
        self.njev += 1
        if self.settings.use_jacobian:
            return self.net.flows_and_jacobian(T, bk, drv)
        f = self.net.flows(T, bk, drv)
        F = np.empty((self.net.n_links, self.net.n_nodes))
        for j in range(self.net.n_nodes):
            dT = 1e-6 * max(1.0, abs(T[j]))
            Tp = T.copy()
            Tp[j] += dT
            F[:, j] = (self.flows(Tp, bk, drv) - f) / dT
        return f, F

    def stage(self, t, T_guess, target_j, coef, bk, drv):
        """Solve H(Y) - coef * r(Y) = target_j for Y; return Y and its flows."""
        net, s = self.net, self.settings
        Y = T_guess.copy()
        D = net.incidence
        for _ in range(MAX_NEWTON):
            f, F = self.flows_and_jacobian(Y, bk, drv)
            R = net.capacities.enthalpy(Y) - coef * (D @ f) - target_j
            Jm = -coef * (D @ F)
            Jm[self.diagonal] += net.capacities.capacity(Y)
            dY = np.linalg.solve(Jm, -R)
            Y = Y + dY
            if np.all(np.abs(dY) <= 0.01 * (s.atol_k + s.rtol * np.abs(Y))):
                return Y, self.flows(Y, bk, drv)
        raise SolveError(f"phase '{self.phase}': method fast: Newton did not converge at t = {t:.6g} s")


def _integrate_numpy(net, schedule, initial_k, settings, grid, out_t, phase) -> NetworkSolution:
    """The same TR-BDF2 in plain numpy, with exact convection functions off the tables."""
    h = np.diff(grid)
    t_mid = grid[:-1] + GAMMA * h
    bk_grid, drv_grid = net.inputs_series(grid, schedule)
    bk_mid, drv_mid = net.inputs_series(t_mid, schedule)
    if net.source_signals:
        q_mid = np.stack([schedule.integral(s, grid[:-1], t_mid) for s in net.source_signals], axis=-1) @ net.source_matrix.T
        q_full = np.stack([schedule.integral(s, grid[:-1], grid[1:]) for s in net.source_signals], axis=-1) @ net.source_matrix.T
    else:
        q_mid = q_full = np.zeros((h.size, net.n_nodes))
    stepper = _Stepper(net, settings, phase)
    D = net.incidence
    T = initial_k.copy()
    temps = np.empty((grid.size, net.n_nodes))
    temps[0] = T
    link_energy = np.zeros(net.n_links)
    f1 = stepper.flows(T, bk_grid[0], drv_grid[0])
    for n in range(h.size):
        H0 = net.capacities.enthalpy(T)
        r1 = D @ f1
        Y2, f2 = stepper.stage(t_mid[n], T, H0 + h[n] * D_WEIGHT * r1 + q_mid[n], h[n] * D_WEIGHT,
                               bk_mid[n], drv_mid[n])
        target = H0 + h[n] * W_WEIGHT * (r1 + D @ f2) + q_full[n]
        Y3, f3 = stepper.stage(grid[n + 1], Y2, target, h[n] * D_WEIGHT, bk_grid[n + 1], drv_grid[n + 1])
        if not np.all(np.isfinite(Y3)):
            raise SolveError(f"phase '{phase}': method fast produced non-finite temperatures at t = {grid[n + 1]:.6g} s")
        link_energy += h[n] * (W_WEIGHT * (f1 + f2) + D_WEIGHT * f3)
        T, f1 = Y3, f3
        temps[n + 1] = T
    heat_in = float(np.sum(q_full))
    index = np.searchsorted(grid, out_t)
    return finish_solution(net, schedule, out_t, temps[index], initial_k, T, heat_in, link_energy,
                           stepper.nfev, stepper.njev, "fast", phase)
