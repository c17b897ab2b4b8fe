"""The settled lap: the cyclic steady state of one corner driving the same lap over and over.

The lap map F takes the node temperatures at the start of a lap to those at its end. The settled
lap starts from the fixed point T* = F(T*). It is found by Newton shooting with a chord matrix:

    J = dF/dT0  by finite differences (n_nodes perturbed laps, one batched kernel call),
    T <- T - (J - I)^-1 (F(T) - T)   with F evaluated on the full sample grid,

(J - I refined by Broyden's rank-one update after each lap: C. G. Broyden, Math. Comp. 19 (1965)
577-593), repeated until the lap changes no node by more than ``tolerance_k``. J, a first guess and
the first iterations use the coarse lap map (graded grid, kernel's linearised mode, about 6x
cheaper a lap); its fixed point lies within a few thousandths of a kelvin of the full-grid map's,
on which the search ends (usually one or two full-grid lap solves). The heat network is nearly
linear over a lap (radiation, c(T) and G(T) are smooth), so the chord converges in two or three
lap solves; the slow hub and upright modes that make brute force take dozens of laps are exactly
what J captures. How many laps a car starting from ambient needs to get within 1 K of the settled
peaks is counted on the linearised map: the start error after k laps is e_k = J^k e_0 and the
lap's trajectory is T*(t) + S(t) e_k with S(t) = dT(t)/dT0 from the same batched run (coarse grid,
interpolated linearly onto the full one).
Pad wear is left out: the pad keeps the design's thickness.
"""
from __future__ import annotations

import time as _time
from dataclasses import dataclass, replace
from typing import NamedTuple

import numpy as np

from thermo.chain.guards import check_state_range
from thermo.chain.plan import PlanSegment, expand_plan
from thermo.chain.corner_run import corner_check_specs, segment_schedule
from thermo.chain.run import corner_duties
from thermo.chain.setup import corner_brakes, corner_setups
from thermo.corner.build import CornerModel
from thermo.corner.geometry import CornerDesign
from thermo.errors import ScenarioError, SolveError
from thermo.network.assemble import CompiledNetwork
from thermo.network.schedule import Schedule
from thermo.solver import kernel
from thermo.solver.batch import kernel_inputs, kernel_network, scaled, solve_batch
from thermo.solver.grids import graded_grid
from thermo.solver.scipy_solve import solve_network
from thermo.solver.settings import SolverSettings

PERTURBATION_K = 1.0    # finite-difference step of the lap map's Jacobian (the map is nearly affine)
MAX_ITERATIONS = 12
MAX_LAPS_COUNTED = 10000
COARSE_STRIDE = 8       # graded grid of the Jacobian's batched run (``thermo.solver.batch.graded_grid``)


@dataclass(frozen=True)
class SettledLap:
    """The cyclic steady state of one corner on one repeated lap.

    Attributes
    ----------
    corner : str
        Corner name [-]
    phase : str
        The plan phase whose lap was repeated
    lap_time_s : float
        [s]
    start_k : dict
        Settled node temperature at the start (= end) of the lap, by network node [K]
    peak_k : dict
        Settled lap's peak of each output node [K]
    min_k : dict
        Settled lap's lowest temperature of each output node [K]
    laps_to_1k : int
        Laps from the scenario's start state (ambient) until every output node's lap
        peak is within 1 K of the settled peak (linearised count, see the module notes)
    residual_k : float
        max |F(T*) - T*| at the end [K]
    lap_solves : int
        Full-grid lap solves used (the coarse ones and the Jacobian's batched run not
        counted; see ``method``)
    method : str
        How it was found
    wall_s : float
        Wall time of the search [s]
    check_specs : tuple of CheckSpec
        The corner's limit checks, on the nodes of the model that was solved
        (``thermo.chain.corner_run.corner_check_specs``) [-]
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
    check_specs: tuple = ()


class LapSetup(NamedTuple):
    """One corner's repeated lap, ready to solve (unpacks as ``design, model, net, schedule, segment``).

    Attributes
    ----------
    design : CornerDesign
        The corner [-]
    model : CornerModel
        Its network with the output nodes (``CornerSetup.model``) [-]
    net : CompiledNetwork
        The compiled network (``CornerSetup.network``) [-]
    schedule : Schedule
        The corner's inputs over the lap, on the run's time axis [s]
    segment : PlanSegment
        The plan's segment of that lap [-]
    """

    design: CornerDesign
    model: CornerModel
    net: CompiledNetwork
    schedule: Schedule
    segment: PlanSegment


def lap_setup(scenario, corner_name=None, phase_name=None) -> LapSetup:
    """``LapSetup`` of one corner (default the first) on the first lap of a "laps" phase (default the
    first such phase); only that corner's network is built."""
    if corner_name is None:
        corner_name = scenario.corners[0].name
    return lap_setups(scenario, phase_name, corners=[corner_name])[corner_name]


def lap_setups(scenario, phase_name=None, corners=None) -> dict:
    """``LapSetup`` of every corner (or of the named ones), each set up once
    (``thermo.chain.setup.corner_setups``): corner name -> LapSetup. The lap's heat input is split
    between all the scenario's corners, as in a run."""
    designs = [d.name for d in scenario.corners]
    for name in corners or ():
        if name not in designs:
            raise ScenarioError(f"settle: no corner named '{name}' (corners: {', '.join(designs)})")
    segments = expand_plan(scenario)
    laps = [s for s in segments if s.phase.kind == "laps" and (phase_name is None or s.phase.name == phase_name)]
    if not laps:
        what = f"phase '{phase_name}'" if phase_name else "a phase of type \"laps\""
        raise ScenarioError(f"settle: the plan has no {what} to repeat")
    segment = laps[0]
    duties = corner_duties(scenario, segment, corner_brakes(scenario))
    return {setup.name: LapSetup(setup.design, setup.model, setup.network,
                                 segment_schedule(scenario, setup.design, segment, duties[setup.name]), segment)
            for setup in corner_setups(scenario, corners)}


def settled_lap(scenario, corner_name=None, *, phase_name=None, tolerance_k=0.01,
                settings: SolverSettings | None = None, setup=None) -> SettledLap:
    """The settled lap of one corner (default the first) on the first lap of a "laps" phase.

    Parameters
    ----------
    scenario : Scenario
        A scenario read with ``load_scenario`` [-]
    corner_name : str or None
        Corner, default the scenario's first
    phase_name : str or None
        Plan phase whose lap is repeated, default the first "laps" phase
    tolerance_k : float
        Stop when no node's start and end of lap differ by more than this [K]
    settings : SolverSettings or None
        rtol/atol_k of the 'fast' lap solves; None: the scenario's tolerances
        (``scenario.solver.settings()``) on every sample with Newton steps [-]
    setup : LapSetup or None
        ``lap_setup(scenario, corner_name, phase_name)`` already built (the model
        build and its convection tables, about 0.5 s on the demo, are then not paid again)

    Raises
    ------
    ScenarioError
        Unknown corner or phase.
    SolveError
        No fixed point within MAX_ITERATIONS.
    """
    wall = _time.perf_counter()
    if settings is None:
        settings = replace(scenario.solver.settings(), method="fast", max_stride=1, linearised=False)
    design, model, net, schedule, segment = lap_setup(scenario, corner_name, phase_name) if setup is None else setup
    if corner_name is not None and design.name != corner_name:
        raise ScenarioError(f"settle: setup is for corner '{design.name}', not '{corner_name}'")
    n = net.n_nodes
    T_start = np.full(n, float(scenario.ambient.temperature_at(segment.t_start_s)))

    def lap(T):
        sol = solve_network(net, schedule, T, settings, phase=f"settle {design.name}")
        check_state_range(design.name, f"settled lap of {segment.phase.name}", net.node_names, sol.time_s,
                          sol.temperatures_k)
        return sol

    # chord matrix and trajectory sensitivities from one batched run of n + 1 laps, on the graded grid
    # in the kernel's linearised mode (only the chord matrix, a start guess and the lap count come
    # from the coarse map; the fixed point is confirmed with full-grid Newton lap solves)
    base = kernel_network(net)
    if base is None:
        raise SolveError(f"settle: corner {design.name}: the network cannot run compiled (untabulated convection)")
    coarse = graded_grid(schedule, net, schedule.t_start_s, schedule.t_end_s, 1, COARSE_STRIDE)
    guess = solve_batch(base, schedule, T_start, settings, grid=coarse, phase=f"settle {design.name}",
                        linearised=True)
    T_guess = guess.final_k[0]
    batch = scaled(base, capacity_scale=np.ones((n + 1, n)))
    starts = np.repeat(T_guess[None, :], n + 1, axis=0)
    starts[1:] += PERTURBATION_K * np.eye(n)
    runs = solve_batch(batch, schedule, starts, settings, output_times=coarse, grid=coarse,
                       phase=f"settle {design.name}", linearised=True)
    J = (runs.final_k[1:] - runs.final_k[0]).T / PERTURBATION_K                 # (n, n): dF_i/dT0_j
    S_coarse = (runs.temperatures_k[1:] - runs.temperatures_k[0]) / PERTURBATION_K   # (n, n_coarse, n)
    # Broyden on the coarse lap map to its fixed point, then on the full-grid map (they differ by
    # a few thousandths of a kelvin, so the full-grid part usually takes one or two lap solves)
    Bm = J - np.eye(n)                  # Jacobian of G(T) = F(T) - T, refined by Broyden's update

    coarse_inputs = kernel_inputs(net, schedule, coarse)
    no_record = np.zeros(coarse.size, dtype=bool)

    def coarse_lap(T):
        res = base.run(coarse_inputs, T[None, :], settings.rtol, settings.atol_k, no_record, linearised=True)
        if int(res.status[0]) != kernel.STATUS_OK:
            raise SolveError(f"settle: corner {design.name}: coarse lap solve failed (kernel status "
                             f"{int(res.status[0])})")
        return res.final[0]
    T, Bm, _, coarse_solves = _broyden(coarse_lap, T_guess, runs.final_k[0] - T_guess, Bm, 0.25 * tolerance_k,
                                       design.name, "coarse")
    sols = [lap(T)]

    def full_lap(T):
        sols.append(lap(T))
        return sols[-1].final_k
    T, Bm, residual, solves = _broyden(full_lap, T, sols[0].final_k - T, Bm, tolerance_k, design.name, "full-grid")
    sol = sols[-1]
    solves += 1
    outputs = model.outputs(sol.temperatures_k)
    peaks = outputs.max(axis=0)
    SW = _resample(S_coarse @ model.output_weights.T, runs.time_s, sol.time_s)   # (n, n_t, n_out): d output/dT0_j
    laps = _laps_to_within(outputs, SW, J, T_start - T, peaks, 1.0)
    return SettledLap(
        corner=design.name, phase=segment.phase.name, lap_time_s=float(schedule.t_end_s - schedule.t_start_s),
        start_k=dict(zip(net.node_names, map(float, T))), peak_k=dict(zip(model.output_nodes, map(float, peaks))),
        min_k=dict(zip(model.output_nodes, map(float, outputs.min(axis=0)))), laps_to_1k=laps,
        residual_k=residual, lap_solves=solves,
        method=f"Newton shooting: finite-difference Jacobian from one batched kernel run (graded grid, "
               f"linearised), Broyden updates on {coarse_solves} coarse then {solves} full-grid lap solves",
        wall_s=_time.perf_counter() - wall, check_specs=corner_check_specs(scenario, design, model))


def _laps_to_within(settled_outputs, SW, J, e0, settled_peaks, band_k) -> int:
    """Laps k (counting the first as 1) until lap k's output peaks are within band_k of the settled ones."""
    e = e0.copy()
    flat = SW.reshape(SW.shape[0], -1)
    for k in range(1, MAX_LAPS_COUNTED + 1):
        peaks = (settled_outputs + (e @ flat).reshape(settled_outputs.shape)).max(axis=0)
        if np.all(np.abs(peaks - settled_peaks) <= band_k):
            return k
        e = J @ e
    return MAX_LAPS_COUNTED


def _resample(S, t_from, t_to):
    """Linear interpolation of S (..., len(t_from), n) along its time axis onto t_to."""
    k = np.clip(np.searchsorted(t_from, t_to, side="right") - 1, 0, t_from.size - 2)
    w = ((t_to - t_from[k]) / (t_from[k + 1] - t_from[k]))[None, :, None]
    return S[:, k, :] * (1.0 - w) + S[:, k + 1, :] * w


def _broyden(lap_map, T, G, Bm, tolerance_k, corner, what):
    """Newton-Broyden on G(T) = F(T) - T from (T, G(T)); returns (T, Bm, residual, lap solves)."""
    residual, solves = float(np.max(np.abs(G))), 0
    for _ in range(MAX_ITERATIONS):
        if residual <= tolerance_k:
            return T, Bm, residual, solves
        dx = -np.linalg.solve(Bm, G)
        T = T + dx
        G_new = lap_map(T) - T
        solves += 1
        residual = float(np.max(np.abs(G_new)))
        Bm = Bm + np.outer(G_new - G - Bm @ dx, dx) / (dx @ dx)
        G = G_new
    if residual <= tolerance_k:
        return T, Bm, residual, solves
    raise SolveError(f"settle: corner {corner}: no settled lap on the {what} grid within {MAX_ITERATIONS} "
                     f"iterations (start and end of lap still differ by {residual:.3g} K)")
