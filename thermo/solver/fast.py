"""'fast': TR-BDF2 on the schedule's own time grid, with exact energy bookkeeping.

The scheme is written on the node enthalpies H_i(T_i), dH/dt = r(t, T) + q(t), with r = D f the
net link flow into each node [W] and q the heat sources [W]. TR-BDF2 (Bank et al. 1985; Hosea &
Shampine 1996) as a stiffly accurate ESDIRK, gamma = 2 - sqrt(2), d = gamma/2, w = sqrt(2)/4:

    H(Y2) = H(T_n) + h (d r1 + d r2) + Q(t_n, t_n + gamma h)
    H(Y3) = H(T_n) + h (w r1 + w r2 + d r3) + Q(t_n, t_n + h),     T_{n+1} = Y3,

second order and L-stable. Q is the exact integral of the piecewise linear sources, and each
link's energy is accumulated with the same weights, h (w f1 + w f2 + d f3), so heat in =
stored + lost holds to the Newton tolerance, step by step. Each stage is solved by Newton's
method with the Jacobian diag(C) - h d D dF/dT (convection G held constant in it).

Every schedule sample is a grid point, so every edge where a source switches is one too;
intervals longer than ``max_step_s`` are split.

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
from thermo.solver.settings import SolverSettings
from thermo.solver.solution import NetworkSolution, finish_solution

GAMMA = 2.0 - np.sqrt(2.0)
D_WEIGHT = GAMMA / 2.0
W_WEIGHT = np.sqrt(2.0) / 4.0
MAX_NEWTON = 12


def time_grid(schedule: Schedule, t_start: float, t_end: float, out_t: np.ndarray,
              max_step_s: float | None) -> np.ndarray:
    """Schedule samples and output times in [t_start, t_end], long intervals split [s]."""
    t = schedule.time_s
    grid = np.union1d(np.concatenate([[t_start, t_end], t[(t > t_start) & (t < t_end)]]), out_t)
    if max_step_s is not None:
        parts = [grid[:1]]
        for a, b in zip(grid[:-1], grid[1:]):
            m = int(np.ceil((b - a) / max_step_s - 1e-12))
            parts.append(np.linspace(a, b, m + 1)[1:])
        grid = np.concatenate(parts)
    return grid


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


def integrate_fast(net: CompiledNetwork, schedule: Schedule, initial_k: np.ndarray, settings: SolverSettings,
                   t_start: float, t_end: float, out_t: np.ndarray, phase: str) -> NetworkSolution:
    """TR-BDF2 over [t_start, t_end] on the schedule's grid; see the module notes."""
    grid = time_grid(schedule, t_start, t_end, out_t, settings.max_step_s)
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
