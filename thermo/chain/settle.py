"""The settled lap: the cyclic steady state of one corner driving the same lap over and over.

The lap map F takes the node temperatures at the start of a lap to those at its end. The settled
lap starts from the fixed point T* = F(T*). It is found by Newton shooting with a chord matrix:

    J = dF/dT0  by finite differences (n_nodes perturbed laps, one batched kernel call),
    T <- T - (J - I)^-1 (F(T) - T)   with F evaluated on the full sample grid,

(J - I refined by Broyden's rank-one update after each lap: C. G. Broyden, Math. Comp. 19 (1965)
577-593), repeated until the lap changes no node by more than ``tolerance_k``. The heat network is nearly
linear over a lap (radiation, c(T) and G(T) are smooth), so the chord converges in two or three
lap solves; the slow hub and upright modes that make brute force take dozens of laps are exactly
what J captures. How many laps a car starting from ambient needs to get within 1 K of the settled
peaks is counted on the linearised map: the start error after k laps is e_k = J^k e_0 and the
lap's trajectory is T*(t) + S(t) e_k with S(t) = dT(t)/dT0 from the same batched run.
Pad wear is left out: the pad keeps the design's thickness.
"""
from __future__ import annotations

import time as _time
from dataclasses import dataclass

import numpy as np

from thermo.chain.plan import expand_plan
from thermo.chain.run import _schedule, conductance_grid, corner_brakes, corner_duties
from thermo.corner.build import build_corner
from thermo.errors import ScenarioError, SolveError
from thermo.network.assemble import compile_network
from thermo.solver.batch import kernel_network, scaled, solve_batch
from thermo.solver.scipy_solve import solve_network
from thermo.solver.settings import SolverSettings

PERTURBATION_K = 1.0    # finite-difference step of the lap map's Jacobian (the map is nearly affine)
MAX_ITERATIONS = 12
MAX_LAPS_COUNTED = 10000


@dataclass(frozen=True)
class SettledLap:
    """The cyclic steady state of one corner on one repeated lap.

    Attributes
    ----------
    corner : str
    phase : str  The plan phase whose lap was repeated
    lap_time_s : float  [s]
    start_k : dict  Settled node temperature at the start (= end) of the lap, by network node [K]
    peak_k : dict  Settled lap's peak of each output node [K]
    min_k : dict  Settled lap's lowest temperature of each output node [K]
    laps_to_1k : int  Laps from the scenario's start state (ambient) until every output node's lap
        peak is within 1 K of the settled peak (linearised count, see the module notes)
    residual_k : float  max |F(T*) - T*| at the end [K]
    lap_solves : int  Full-grid lap solves used (the Jacobian's batched run not counted)
    method : str  How it was found
    wall_s : float  Wall time of the search [s]
    """

    corner: str
    phase: str
    lap_time_s: float
    start_k: dict
    peak_k: dict
    min_k: dict
    laps_to_1k: int
    residual_k: float
    lap_solves: int
    method: str
    wall_s: float


def lap_setup(scenario, corner_name=None, phase_name=None):
    """(design, model, compiled network, lap schedule, segment) for one corner's repeated lap."""
    designs = {d.name: d for d in scenario.corners}
    if corner_name is None:
        design = scenario.corners[0]
    elif corner_name in designs:
        design = designs[corner_name]
    else:
        raise ScenarioError(f"settle: no corner named '{corner_name}' (corners: {', '.join(designs)})")
    segments = expand_plan(scenario)
    laps = [s for s in segments if s.phase.kind == "laps" and (phase_name is None or s.phase.name == phase_name)]
    if not laps:
        what = f"phase '{phase_name}'" if phase_name else "a phase of type \"laps\""
        raise ScenarioError(f"settle: the plan has no {what} to repeat")
    segment = laps[0]
    grid = conductance_grid(scenario)
    models = {d.name: build_corner(d, scenario.ambient.pressure_pa, grid) for d in scenario.corners}
    duty = corner_duties(scenario, segment, corner_brakes(scenario, models))[design.name]
    schedule = _schedule(scenario, design, segment, duty)
    model = models[design.name]
    return design, model, compile_network(model.network), schedule, segment


def settled_lap(scenario, corner_name=None, *, phase_name=None, tolerance_k=0.01,
                settings: SolverSettings | None = None) -> SettledLap:
    """The settled lap of one corner (default the first) on the first lap of a "laps" phase.

    Parameters
    ----------
    scenario : Scenario
    corner_name : str or None  Corner, default the scenario's first
    phase_name : str or None  Plan phase whose lap is repeated, default the first "laps" phase
    tolerance_k : float  Stop when no node's start and end of lap differ by more than this [K]
    settings : SolverSettings or None  rtol/atol_k of the 'fast' lap solves [-]

    Raises
    ------
    ScenarioError  Unknown corner or phase.  SolveError  No fixed point within MAX_ITERATIONS.
    """
    wall = _time.perf_counter()
    settings = SolverSettings(method="fast", rtol=scenario.solver.rtol, atol_k=scenario.solver.atol_k) \
        if settings is None else settings
    design, model, net, schedule, segment = lap_setup(scenario, corner_name, phase_name)
    n = net.n_nodes
    T_start = np.full(n, float(scenario.ambient.temperature_at(segment.t_start_s)))

    def lap(T):
        return solve_network(net, schedule, T, settings, phase=f"settle {design.name}")

    # chord matrix and trajectory sensitivities from one batched run of n + 1 laps
    base = kernel_network(net)
    if base is None:
        raise SolveError(f"settle: corner {design.name}: the network cannot run compiled (untabulated convection)")
    sol0 = lap(T_start)
    out_t = sol0.time_s
    T_guess = sol0.final_k
    batch = scaled(base, capacity_scale=np.ones((n + 1, n)))
    starts = np.repeat(T_guess[None, :], n + 1, axis=0)
    starts[1:] += PERTURBATION_K * np.eye(n)
    runs = solve_batch(batch, schedule, starts, settings, output_times=out_t, phase=f"settle {design.name}")
    J = (runs.final_k[1:] - runs.final_k[0]).T / PERTURBATION_K                 # (n, n): dF_i/dT0_j
    S = (runs.temperatures_k[1:] - runs.temperatures_k[0]) / PERTURBATION_K       # (n, n_t, n): row j = d/dT0_j
    Bm = J - np.eye(n)                  # Jacobian of G(T) = F(T) - T, refined by Broyden's update
    T = T_guess
    G = runs.final_k[0] - T
    solves, residual = 1, np.inf
    for _ in range(MAX_ITERATIONS):
        dx = -np.linalg.solve(Bm, G)
        T = T + dx
        sol = lap(T)
        solves += 1
        G_new = sol.final_k - T
        residual = float(np.max(np.abs(G_new)))
        if residual <= tolerance_k:
            break
        Bm = Bm + np.outer(G_new - G - Bm @ dx, dx) / (dx @ dx)
        G = G_new
    else:
        raise SolveError(f"settle: corner {design.name}: no settled lap within {MAX_ITERATIONS} iterations "
                         f"(start and end of lap still differ by {residual:.3g} K)")
    outputs = model.outputs(sol.temperatures_k)
    peaks = outputs.max(axis=0)
    laps = _laps_to_within(model, sol.temperatures_k, S, J, T_start - T, peaks, 1.0)
    return SettledLap(
        corner=design.name, phase=segment.phase.name, lap_time_s=float(schedule.t_end_s - schedule.t_start_s),
        start_k=dict(zip(net.node_names, map(float, T))), peak_k=dict(zip(model.output_nodes, map(float, peaks))),
        min_k=dict(zip(model.output_nodes, map(float, outputs.min(axis=0)))), laps_to_1k=laps,
        residual_k=residual, lap_solves=solves,
        method="Newton shooting: finite-difference Jacobian from one batched kernel run, Broyden updates",
        wall_s=_time.perf_counter() - wall)


def _laps_to_within(model, settled_temps, S, J, e0, settled_peaks, band_k) -> int:
    """Laps k (counting the first as 1) until lap k's output peaks are within band_k of the settled ones."""
    e = e0.copy()
    W = model.output_weights
    for k in range(1, MAX_LAPS_COUNTED + 1):
        traj = settled_temps + np.einsum("j,jtn->tn", e, S)
        peaks = (traj @ W.T).max(axis=0)
        if np.all(np.abs(peaks - settled_peaks) <= band_k):
            return k
        e = J @ e
    return MAX_LAPS_COUNTED
