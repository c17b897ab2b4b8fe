"""Where an integration must restart: the edges at which heat sources switch on or off.

An adaptive integrator handed a whole stint at once grows its step through the quiet stretches
and can step clean over a short heat pulse, reporting success with temperatures hundreds of
kelvin wrong. Restarting at every edge, and bounding the step inside heated stretches, makes
every pulse be seen.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from thermo.errors import ModelError
from thermo.network.assemble import CompiledNetwork
from thermo.network.schedule import Schedule


@dataclass(frozen=True)
class Piece:
    """A stretch of time integrated in one go."""

    t0_s: float
    t1_s: float
    heated: bool
    mean_sample_interval_s: float
    min_sample_interval_s: float


def heated_samples(compiled: CompiledNetwork, schedule: Schedule) -> np.ndarray:
    """True at each schedule sample where any heat source into the network is non-zero."""
    if not compiled.source_signals:
        return np.zeros(schedule.time_s.size, dtype=bool)
    compiled.check_schedule(schedule)
    table = np.array([schedule.signals[name] for name in compiled.source_signals])
    used = np.any(compiled.source_matrix != 0.0, axis=0)
    return np.any(table[used] != 0.0, axis=0)


def pieces(compiled: CompiledNetwork, schedule: Schedule, t_start: float, t_end: float,
           restart_at_edges: bool) -> list[Piece]:
    """Split ``[t_start, t_end]`` at the edges where the heat input switches between zero and not.

    A schedule interval is heated when a source is non-zero at either of its samples; runs of
    heated and unheated intervals become pieces. Without ``restart_at_edges`` the whole span is
    one (unheated) piece.
    """
    if not t_end > t_start:
        raise ModelError(f"solve: t_end ({t_end} s) must be after t_start ({t_start} s)")
    if not restart_at_edges:
        return [Piece(t_start, t_end, False, t_end - t_start, t_end - t_start)]
    t = schedule.time_s
    on = heated_samples(compiled, schedule)
    interval_heated = on[:-1] | on[1:]
    out: list[Piece] = []
    k0 = int(np.clip(np.searchsorted(t, t_start, side="right") - 1, 0, t.size - 2))
    k1 = int(np.clip(np.searchsorted(t, t_end, side="left") - 1, 0, t.size - 2))
    start = t_start
    k = k0
    while k <= k1:
        j = k
        while j + 1 <= k1 and interval_heated[j + 1] == interval_heated[k]:
            j += 1
        stop = min(t[j + 1], t_end)
        n_int = j - k + 1
        out.append(Piece(start, stop, bool(interval_heated[k]), (t[j + 1] - t[k]) / n_int,
                         float(np.min(np.diff(t[k:j + 2])))))
        start = stop
        k = j + 1
    return [p for p in out if p.t1_s > p.t0_s]


def output_grid(schedule: Schedule, t_start: float, t_end: float, output_times=None) -> np.ndarray:
    """Output times: the schedule samples in [t_start, t_end] with both ends, or those given."""
    if output_times is None:
        t = schedule.time_s
        inner = t[(t > t_start) & (t < t_end)]
        return np.concatenate([[t_start], inner, [t_end]])
    out = np.asarray(output_times, dtype=float)
    if out.ndim != 1 or out.size == 0 or not np.all(np.isfinite(out)):
        raise ModelError("solve: output_times must be a non-empty 1-D array of finite times [s]")
    if np.any(np.diff(out) <= 0):
        raise ModelError("solve: output_times must be strictly increasing")
    if out[0] < t_start or out[-1] > t_end:
        raise ModelError(f"solve: output_times must lie within [{t_start}, {t_end}] s")
    return out


def span(schedule: Schedule, t_start, t_end) -> tuple[float, float]:
    """The solve interval, defaulting to the whole schedule, checked to lie inside it."""
    a = schedule.t_start_s if t_start is None else float(t_start)
    b = schedule.t_end_s if t_end is None else float(t_end)
    if a < schedule.t_start_s or b > schedule.t_end_s:
        raise ModelError(f"solve: interval [{a}, {b}] s is outside the schedule "
                         f"[{schedule.t_start_s}, {schedule.t_end_s}] s")
    if not b > a:
        raise ModelError(f"solve: t_end ({b} s) must be after t_start ({a} s)")
    return a, b


def time_grid(schedule: Schedule, t_start: float, t_end: float, out_t: np.ndarray,
              max_step_s: float | None) -> np.ndarray:
    """Schedule samples and output times in [t_start, t_end], long intervals split [s]."""
    t = schedule.time_s
    grid = np.union1d(np.concatenate([[t_start, t_end], t[(t > t_start) & (t < t_end)]]), out_t)
    return split_long_steps(grid, max_step_s)


def split_long_steps(grid: np.ndarray, max_step_s: float | None) -> np.ndarray:
    """The grid with every interval longer than ``max_step_s`` split evenly (None: unchanged) [s]."""
    if max_step_s is None:
        return grid
    h = np.diff(grid)
    m = np.ceil(h / max_step_s - 1e-12).astype(int)
    if not np.any(m > 1):
        return grid
    parts = [grid[:1]]
    for a, b, k in zip(grid[:-1], grid[1:], m):
        parts.append(np.linspace(a, b, k + 1)[1:] if k > 1 else np.array([b]))
    return np.concatenate(parts)
