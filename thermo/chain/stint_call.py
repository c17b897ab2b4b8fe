"""Laps of a stint solved in one compiled call (``solve_stint``), for ``CornerRun.advance_laps``.

Each lap's schedule, step grid and kernel inputs are made as ``CornerRun.advance`` makes them, then
passed to the stint kernel (``thermo.chain.stint_kernel``) concatenated, so the laps are integrated
and the pad worn between them without returning to Python. A call takes laps until their step
grids hold ``STINT_CALL_POINTS`` points, so that a long stint on a finely sampled logged lap keeps
its memory to that of a few laps.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from thermo.chain.stint_kernel import StintPads, StintWear, advance_stint
from thermo.corner.build import pad_first_layer_m
from thermo.corner.pad_terms import pad_constants, pad_terms
from thermo.solver import kernel
from thermo.solver.fast import step_grid
from thermo.solver.kernel_arrays import kernel_inputs
from thermo.solver.segments import output_grid

STINT_CALL_POINTS = 200_000     # step-grid points a call takes at most (then the next call goes on)


class Solved(NamedTuple):
    """What ``CornerRun`` keeps of one segment's solve (the fields of ``NetworkSolution`` it reads)."""

    time_s: np.ndarray
    temperatures_k: np.ndarray
    link_flows_w: np.ndarray | None     # None unless the run keeps the link flows (``CornerRun.keeps_flows``)
    link_energy_j: np.ndarray
    heat_in_j: float
    lost_j: float
    final_k: np.ndarray
    boundary_k: np.ndarray      # (rows, n_boundaries) the boundary temperatures at the rows [K], read by the kernel
    drivers: np.ndarray         # (rows, n_drivers) the drivers at the rows, read by the kernel


@dataclass
class StintCall:
    """The laps a ``solve_stint`` call solved: ``laps_done`` of them; ``stopped`` when the lap after
    them left a conductance table or failed (it is to be done on its own); each lap's
    ``schedules``, friction energy ``energy_j`` [J], and through ``solved(k)`` its solution (with the
    boundary temperatures and drivers at its rows, ``inputs`` at ``rows``); ``pads``
    (``StintPads``) the pad after each lap's wear; ``direct_start`` the interface share the first
    lap was solved with (None: the user's fixed partition)."""

    laps_done: int
    stopped: bool
    schedules: list
    out_times: list
    energy_j: np.ndarray
    result: kernel.KernelResult
    lap_rec: np.ndarray
    inputs: kernel.KernelInputs
    rows: np.ndarray
    pads: StintPads
    link_to_boundary: np.ndarray
    direct_start: float | None

    def solved(self, k: int) -> Solved:
        r0, r1 = self.lap_rec[k], self.lap_rec[k + 1]
        res, energy = self.result, self.result.link_energy[k]
        flows = res.flows[0, r0:r1] if res.flows.shape[1] else None
        rows = self.rows[r0:r1]
        return Solved(self.out_times[k], res.temps[0, r0:r1], flows, energy, float(res.heat_in[k]),
                      float(np.sum(energy[self.link_to_boundary], axis=-1)), res.final[k],
                      self.inputs.bk_grid[rows], self.inputs.drv_grid[rows])


def solve_stint(run, lap_schedules, duties, energies_j, min_thickness_m: float) -> StintCall:
    """Solve driven laps, each given by its ``Schedule``, ``SegmentDuty`` and friction energy [J], from
    the state of ``run`` (a ``CornerRun`` on its kernel arrays, ``run.pad_kernel``), as many as
    ``STINT_CALL_POINTS`` allow (at least one), in one call of the stint kernel; a worn pad is held
    at ``min_thickness_m`` [m]. The kernel's arrays and output weights are left at the pad after the
    last lap done."""
    scenario, design, settings, compiled = run.scenario, run.design, run.settings, run.compiled
    schedules, grids, out_times, inputs, energies, row_weights = [], [], [], [], [], []
    points = 0
    for schedule, duty, energy in zip(lap_schedules, duties, energies_j):
        a, b = schedule.t_start_s, schedule.t_end_s
        grid, out_t = step_grid(compiled, schedule, settings, a, b,
                                None if settings.max_stride > 1 else output_grid(schedule, a, b))
        if schedules and points + grid.size > STINT_CALL_POINTS:
            break
        points += grid.size
        schedules.append(schedule)
        grids.append(grid)
        out_times.append(out_t)
        inputs.append(kernel_inputs(compiled, schedule, grid))
        energies.append(energy)
        row_weights.append(np.interp(out_t, schedule.time_s, duty.pad_heat_w))
    laps = len(schedules)
    joined = kernel.KernelInputs(*(np.ascontiguousarray(np.concatenate([getattr(x, f) for x in inputs]))
                                   for f in kernel.KernelInputs._fields))
    lap_grid = np.concatenate([[0], np.cumsum([g.size for g in grids])]).astype(np.int64)
    lap_step = lap_grid - np.arange(laps + 1)
    lap_rec = np.concatenate([[0], np.cumsum([t.size for t in out_times])]).astype(np.int64)
    rows = np.concatenate([g0 + np.searchsorted(g, t) for g0, g, t in zip(lap_grid, grids, out_times)])
    record = np.zeros(lap_grid[-1], dtype=np.bool_)
    record[rows] = True         # the output times are grid points (``step_grid``)

    pk = run.pad_kernel
    knet = pk.network
    n, n_links, n_layers = knet.n_nodes, knet.link_a.size, len(run.layers)
    flow_rows = lap_rec[-1] if run.keeps_flows else 0       # the link flows at every row only if the run keeps them
    result = kernel.KernelResult(
        np.empty((1, lap_rec[-1], n)), np.empty((1, flow_rows, n_links)), np.empty((laps, n)), np.empty((laps, n)),
        np.zeros((laps, n), dtype=np.int64), np.zeros((laps, n_links)), np.zeros(laps),
        np.zeros(laps, dtype=np.int64), np.zeros(laps, dtype=np.int64), np.zeros((laps, 2), dtype=np.int64))
    pads = StintPads(np.empty((laps, *pk.output_weights.shape)), np.empty(laps), np.empty((laps, n_layers)),
                     np.empty((laps, n_layers)), np.empty(laps), np.empty((laps, n)))
    now = pad_terms(design, run.layers, pk.materials, pk.disc_face_resistance, run.thickness)
    w = scenario.pad_wear
    wear = StintWear(bool(w.enabled), float(w.wear_coefficient_m3_per_j), float(w.reference_temperature_k),
                     float(w.temperature_scale_k), np.array(energies), np.concatenate(row_weights),
                     float(min_thickness_m), pad_first_layer_m(design), int(run.pad_layer_count),
                     tuple(float(c) for c in pad_constants(design, pk.materials, pk.disc_face_resistance)),
                     pk.rows.index(), now.direct_disc_share is not None)
    done = advance_stint(run.T[None, :].copy(), joined, lap_grid, lap_step, lap_rec, knet.arrays(joined),
                         float(settings.rtol), float(settings.atol_k), kernel.MAX_NEWTON, record, result,
                         pk.output_weights, wear, float(run.thickness), np.asarray(run.layers, dtype=float),
                         0.0 if now.direct_disc_share is None else float(now.direct_disc_share), pads)
    return StintCall(done, done < laps, schedules, out_times, wear.energy_j, result, lap_rec, joined, rows, pads,
                     compiled.link_to_boundary, now.direct_disc_share)

