"""A long race of repeated laps for every corner, without per-lap Python set-up.

The chain (``thermo.chain.run``) rebuilds and re-solves each lap as its own segment, which is what
pad wear and changing fuel need. For a throughput estimate of a long race (the issue-8 benchmark,
a quick look at a 24-hour heat soak) every corner instead drives its first "laps" lap over and
over: the lap's time grid and its sampled and integrated inputs are built once, and one call of
the compiled kernel (``thermo.solver.kernel``) drives all the laps, carrying the node temperatures
on and keeping each lap's output peaks.

Accuracy choices, both measured on the demo corner against the full-grid 'fast' solve (30 laps):
- the graded grid (``thermo.solver.batch.graded_grid``): every sample while a source is on, the
  step growing by one sample per step up to ``max_stride`` samples once it is off (2065 -> 417
  steps a lap with the default stride 16, peaks within 0.007 K; stride 8: 498 steps, 0.005 K);
- the linearised kernel mode (``thermo.solver.kernel_linearised``): two flow evaluations and one
  factorisation a step, no Newton iteration, peaks within a further 0.005 K.
Pad wear and fuel burn are left out (the pad keeps the design's thickness), as in the settled lap.
"""
from __future__ import annotations

import math
import os
import time as _time
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass

import numpy as np

from thermo.errors import ModelError, SolveError
from thermo.solver import kernel
from thermo.solver.batch import kernel_inputs, kernel_network
from thermo.solver.grids import graded_grid
from thermo.solver.settings import SolverSettings

DEFAULT_MAX_STRIDE = 16


@dataclass(frozen=True)
class RepeatedLaps:
    """One corner over many identical laps.

    Attributes
    ----------
    output_nodes : tuple of str
        The corner's output nodes, the order of the last axis of lap_peaks_k [-]
    lap_peaks_k : ndarray (n_laps, n_outputs)
        Peak of each output node in each lap [K]
    final_k : ndarray (n_nodes,)
        Node temperatures at the end of the last lap [K]
    steps_per_lap : int
        Grid steps of one lap
    """

    output_nodes: tuple
    lap_peaks_k: np.ndarray
    final_k: np.ndarray
    steps_per_lap: int

    @property
    def peak_k(self) -> np.ndarray:
        """Peak of each output node over all laps [K]."""
        return self.lap_peaks_k.max(axis=0)


def repeated_laps(model, net, schedule, initial_k, n_laps: int, settings: SolverSettings | None = None, *,
                  max_stride: int = DEFAULT_MAX_STRIDE, linearised: bool = True, phase: str = "race") -> RepeatedLaps:
    """Drive one lap ``n_laps`` times, carrying the state: one kernel call for all laps in the
    linearised mode (the lap peaks of the outputs are kept inside the kernel), one a lap otherwise.

    Parameters
    ----------
    model : CornerModel
        Gives the output nodes and their weights
    net : CompiledNetwork
        The corner's network (must run compiled)
    schedule : Schedule
        One lap [s]
    initial_k : array_like (n_nodes,)
        Start temperatures [K]
    n_laps : int
        Laps to drive [-]
    settings : SolverSettings or None
        rtol and atol_k of the full-Newton kernel; the linearised
        mode has no iteration and so no tolerance (its accuracy is set by the grid) [-]
    max_stride : int
        Longest step off the brakes, in samples (1 = the full sample grid) [-]
    linearised : bool
        Kernel's linearised mode (see ``thermo.solver.kernel``) [-]
    phase : str
        Named in error messages

    Raises
    ------
    ModelError
        n_laps < 1 or a network that cannot run compiled.
    SolveError
        A lap failed.
    """
    if n_laps < 1:
        raise ModelError(f"race: n_laps must be >= 1, got {n_laps}")
    settings = SolverSettings(method="fast") if settings is None else settings
    kn = kernel_network(net)
    if kn is None:
        raise ModelError(f"race: phase '{phase}': the network cannot run compiled (untabulated convection)")
    a, b = schedule.t_start_s, schedule.t_end_s
    grid = graded_grid(schedule, net, a, b, 1, max_stride)
    inputs = kernel_inputs(net, schedule, grid)
    T = np.asarray(initial_k, dtype=float)[None, :].copy()
    if linearised:            # all laps in one kernel call, lap peaks of the outputs kept in the kernel
        res, peaks = kn.run_laps(inputs, T, n_laps, model.output_weights.T)
        _check(res, grid, phase)
        return RepeatedLaps(tuple(model.output_nodes), peaks[0], res.final[0].copy(), int(grid.size - 1))
    record = np.ones(grid.size, dtype=bool)
    W = np.ascontiguousarray(model.output_weights.T)
    lap_peaks = np.empty((n_laps, W.shape[1]))
    for lap in range(n_laps):
        res = kn.run(inputs, T, settings.rtol, settings.atol_k, record, False)
        _check(res, grid, phase, lap)
        lap_peaks[lap] = (res.temps[0] @ W).max(axis=0)
        T = res.final
    return RepeatedLaps(tuple(model.output_nodes), lap_peaks, T[0].copy(), int(grid.size - 1))


def _check(res, grid, phase: str, lap: int = 0) -> None:
    """SolveError naming the lap and time of a failed kernel run (``fail_step`` may count over laps)."""
    code = int(res.status[0])
    if code != kernel.STATUS_OK:
        n_steps = max(grid.size - 1, 1)
        lap += int(res.fail_step[0]) // n_steps
        t_fail = grid[min(int(res.fail_step[0]) % n_steps + 1, grid.size - 1)]
        raise SolveError(f"phase '{phase}': lap {lap + 1}: kernel status {code} at t = {t_fail:.6g} s "
                         "(1 Newton, 2 left the conductance tables, 3 non-finite)")


@dataclass(frozen=True)
class Race:
    """Every corner over a race of repeated laps.

    Attributes
    ----------
    corners : dict of str to RepeatedLaps
        Per corner name, its laps [-]
    wall_s : float
        Wall time of the whole race, model building included [s]
    build_s : float
        The model building alone [s]
    """

    corners: dict
    wall_s: float
    build_s: float


def race(scenario, hours: float, settings: SolverSettings | None = None, *, threads: int | None = None,
         **options) -> Race:
    """Every corner of the scenario over ``hours`` of its first "laps" lap, from ambient.

    Returns a ``Race``: per corner its ``RepeatedLaps``, the wall time (model building, about
    0.2-0.5 s on the demo, included) and the building alone. The corners run in ``threads``
    threads (default one per CPU core; the compiled kernel releases the GIL). ``options`` go to
    ``repeated_laps`` (max_stride, linearised).
    """
    from thermo.chain.settle import lap_setups
    if not hours > 0:
        raise ModelError(f"race: hours must be > 0, got {hours}")
    wall = _time.perf_counter()
    setups = lap_setups(scenario)
    build = _time.perf_counter() - wall

    def one(name):
        _, model, net, schedule, segment = setups[name]
        n_laps = math.ceil(hours * 3600.0 / (schedule.t_end_s - schedule.t_start_s))
        T0 = np.full(net.n_nodes, float(scenario.ambient.temperature_at(segment.t_start_s)))
        return repeated_laps(model, net, schedule, T0, n_laps, settings, phase=f"race {name}", **options)
    workers = max(1, min(len(setups), threads if threads is not None else (os.cpu_count() or 1)))
    if workers == 1:
        out = {name: one(name) for name in setups}
    else:       # the kernel releases the GIL: one corner per thread
        with ThreadPoolExecutor(max_workers=workers) as pool:
            out = dict(zip(setups, pool.map(one, setups)))
    return Race(out, _time.perf_counter() - wall, build)
