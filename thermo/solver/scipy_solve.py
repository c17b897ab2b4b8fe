"""Solve a heat network over a schedule with scipy's integrators, restarting at heat-input edges.

The integrated state is [T (n_nodes), heat in (1), heat carried by each link (n_links)] so the
energies are accumulated by the integrator itself, under its error control, not by quadrature
of the outputs afterwards. Energies get the absolute tolerance atol_k x (total heat capacity).
"""
from __future__ import annotations

import numpy as np

from thermo.errors import ModelError, SolveError
from thermo.network.assemble import CompiledNetwork, compile_network
from thermo.network.schedule import Schedule
from thermo.solver.segments import output_grid, pieces, span
from thermo.solver.settings import SolverSettings
from thermo.solver.solution import NetworkSolution, finish_solution


# First step into a heated piece, in its shortest sample interval: a guess from a quiet start
# (zero heat input) is far too long for the pulse that follows.
FIRST_STEP_SAMPLES = 0.1


class _Counter:
    """Counts right-hand side and Jacobian evaluations, and the latest time reached."""

    def __init__(self):
        self.nfev = 0
        self.njev = 0
        self.t_reached = -np.inf


def _augmented_functions(net: CompiledNetwork, schedule: Schedule, counter: _Counter):
    n, L = net.n_nodes, net.n_links
    size = n + 1 + L

    def fun(t, y):
        counter.nfev += 1
        counter.t_reached = max(counter.t_reached, t)
        T = y[:n]
        u = net.inputs_at(t, schedule)
        f = net.flows(T, u.boundary_k, u.drivers)
        dy = np.empty(size)
        dy[:n] = (u.source_w + net.incidence @ f) / net.capacities.capacity(T)
        dy[n] = np.sum(u.source_w)
        dy[n + 1:] = f
        return dy

    def jac(t, y):
        counter.njev += 1
        T = y[:n]
        u = net.inputs_at(t, schedule)
        f = net.flows(T, u.boundary_k, u.drivers)
        F = net.flow_jacobian(T, u.boundary_k, u.drivers)
        C = net.capacities.capacity(T)
        J = np.zeros((size, size))
        J[:n, :n] = (net.incidence @ F) / C[:, None]
        J[np.arange(n), np.arange(n)] -= (u.source_w + net.incidence @ f) * net.capacities.capacity_slope(T) / C ** 2
        J[n + 1:, :n] = F
        return J

    sparsity = np.zeros((size, size), dtype=bool)
    sparsity[:n, :n] = net.jacobian_sparsity()
    sparsity[n + 1 + np.arange(L), net.link_a] = True
    to_node = ~net.link_to_boundary
    sparsity[n + 1 + np.flatnonzero(to_node), net.link_b[to_node]] = True
    return fun, jac, sparsity


def solve_ivp(fun, t_span, y0, **options):
    """``scipy.integrate.solve_ivp``, imported on first use: scipy.integrate takes about 0.7 s to
    load, and a run with the 'fast' method needs none of it."""
    from scipy.integrate import solve_ivp as scipy_solve_ivp
    return scipy_solve_ivp(fun, t_span, y0, **options)


def _solve_scipy(net: CompiledNetwork, schedule: Schedule, initial_k: np.ndarray, settings: SolverSettings,
                 t_start: float, t_end: float, out_t: np.ndarray, phase: str) -> NetworkSolution:
    counter = _Counter()
    fun, jac, sparsity = _augmented_functions(net, schedule, counter)
    n, L = net.n_nodes, net.n_links
    atol_energy = settings.atol_k * float(np.sum(net.capacities.capacity(initial_k)))
    atol = np.concatenate([np.full(n, settings.atol_k), np.full(1 + L, atol_energy)])
    options = {}
    if settings.method != "RK45":
        if settings.use_jacobian:
            options["jac"] = jac
        elif settings.method in ("BDF", "Radau"):
            options["jac_sparsity"] = sparsity
    y = np.concatenate([initial_k, np.zeros(1 + L)])
    temps = np.empty((out_t.size, n))
    njev_scipy = 0
    parts = pieces(net, schedule, t_start, t_end, settings.restart_at_edges)
    for i, part in enumerate(parts):
        last = i == len(parts) - 1
        take = (out_t >= part.t0_s) & ((out_t <= part.t1_s) if last else (out_t < part.t1_s))
        t_eval = np.union1d(out_t[take], [part.t1_s])
        max_step = np.inf if settings.max_step_s is None else settings.max_step_s
        first_step = None
        if part.heated:
            max_step = min(max_step, settings.heated_max_step_samples * part.mean_sample_interval_s)
            first_step = FIRST_STEP_SAMPLES * min(part.min_sample_interval_s, part.t1_s - part.t0_s)
        sol = solve_ivp(fun, (part.t0_s, part.t1_s), y, method=settings.method, t_eval=t_eval,
                        rtol=settings.rtol, atol=atol, max_step=max_step, first_step=first_step, **options)
        njev_scipy += sol.njev
        if sol.status != 0 or sol.t.size == 0 or sol.t[-1] != part.t1_s:
            reached = max(counter.t_reached, part.t0_s)
            raise SolveError(f"phase '{phase}': {settings.method} failed at t = {reached:.6g} s "
                             f"(piece {part.t0_s:.6g} to {part.t1_s:.6g} s): {sol.message}")
        if not np.all(np.isfinite(sol.y)):
            raise SolveError(f"phase '{phase}': {settings.method} returned non-finite temperatures "
                             f"between {part.t0_s:.6g} and {part.t1_s:.6g} s")
        index = np.searchsorted(t_eval, out_t[take])
        temps[take] = sol.y[:n, index].T
        y = sol.y[:, -1].copy()
    njev = counter.njev if settings.use_jacobian else njev_scipy
    return finish_solution(net, schedule, out_t, temps, initial_k, y[:n], y[n], y[n + 1:],
                           counter.nfev, njev, settings.method, phase)


def _solve_fast(net, schedule, initial_k, settings, t_start, t_end, out_t, phase):
    from thermo.solver.fast import integrate_fast
    return integrate_fast(net, schedule, initial_k, settings, t_start, t_end, out_t, phase)


# The one dispatch table: method name -> integrator.
INTEGRATORS = {"LSODA": _solve_scipy, "BDF": _solve_scipy, "Radau": _solve_scipy, "RK45": _solve_scipy,
               "fast": _solve_fast}


def solve_network(network, schedule: Schedule, initial_k, settings: SolverSettings | None = None, *,
                  t_start: float | None = None, t_end: float | None = None, output_times=None,
                  phase: str = "") -> NetworkSolution:
    """Integrate a heat network over (part of) a schedule.

    Parameters
    ----------
    network : Network or CompiledNetwork
        The heat network
    schedule : Schedule
        Heat sources [W], boundary temperatures [K] and drivers
    initial_k : array_like (n_nodes,)
        Node temperatures at ``t_start`` [K]
    settings : SolverSettings
        Integrator and tolerances (default ``SolverSettings()``)
    t_start, t_end : float or None
        Solve interval, default the whole schedule [s]
    output_times : array_like or None
        Output times within the interval, default the schedule's
        samples there plus both ends (for 'fast' with ``settings.max_stride`` > 1: the points of
        its graded step grid) [s]
    phase : str
        Name of this phase, used in error messages

    Returns
    -------
    NetworkSolution
        Temperatures at the kept times, link flows, peaks and the energy totals [-]

    Raises
    ------
    ModelError
        A signal the network needs is missing, or the inputs are malformed.
    SolveError
        The integrator failed: the message names the phase and the time reached.
    """
    settings = SolverSettings() if settings is None else settings
    if not isinstance(settings, SolverSettings):
        raise ModelError(f"solve_network: settings must be SolverSettings, got {type(settings).__name__}")
    net = compile_network(network)
    net.check_schedule(schedule)
    T0 = np.array(initial_k, dtype=float)
    if T0.shape != (net.n_nodes,):
        raise ModelError(f"solve_network: initial_k has shape {T0.shape}, expected ({net.n_nodes},) "
                         f"for nodes {', '.join(net.node_names)}")
    if not np.all(np.isfinite(T0) & (T0 > 0)):
        bad = net.node_names[int(np.argmax(~(np.isfinite(T0) & (T0 > 0))))]
        raise ModelError(f"solve_network: initial temperature of node '{bad}' must be a positive number of kelvin")
    a, b = span(schedule, t_start, t_end)
    if output_times is None and settings.method == "fast" and settings.max_stride > 1:
        out_t = None            # the graded step grid's points, chosen by the integrator
    else:
        out_t = output_grid(schedule, a, b, output_times)
    return INTEGRATORS[settings.method](net, schedule, T0, settings, a, b, out_t, phase)
