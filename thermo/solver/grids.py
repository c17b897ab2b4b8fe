"""The graded step grid: every input sample while a heat source is on, longer steps once it is off.

Used by the 'fast' integrator when ``SolverSettings.max_stride`` > 1 (the default of a scenario's
``[solver] max_stride_samples``), by the race and settled-lap studies and by the batch kernels.
"""
from __future__ import annotations

import numpy as np

from thermo.errors import ModelError
from thermo.network.assemble import CompiledNetwork
from thermo.network.schedule import Schedule


def graded_grid(schedule: Schedule, net: CompiledNetwork, t_start: float, t_end: float,
                heated_stride: int = 1, max_stride: int = 8) -> np.ndarray:
    """A subset of the schedule's samples: every ``heated_stride``-th while any source is on,
    growing by one sample per step up to ``max_stride`` once it is off [s].

    Every switch-on and switch-off sample is kept (the heat input is integrated exactly over each
    step in any case); the gradual growth after a source switches off keeps a thin, fast node smooth.
    """
    if heated_stride < 1 or max_stride < heated_stride:
        raise ModelError("batch: graded grid needs 1 <= heated_stride <= max_stride")
    t = schedule.time_s
    keep = (t > t_start) & (t < t_end)
    table = np.array([schedule.signals[s] for s in net.source_signals]) if net.source_signals else np.zeros((0, t.size))
    on = np.any(table != 0.0, axis=0)
    # a chain solves the same lap over and over, shifted in time: the samples chosen depend only on
    # which samples have a source on, so the choice is kept by that pattern
    idx = np.flatnonzero(keep)
    if idx.size == 0:
        return np.unique(np.array([t_start, t_end], dtype=float))
    end = min(int(idx[-1]) + 2, t.size)
    key = (on[idx[0]:end].tobytes(), end == t.size, idx.size, heated_stride, max_stride)
    positions = _GRADED.get(key)
    if positions is None:
        positions = _graded_positions(on[idx[0]:end], idx.size, end == t.size, heated_stride, max_stride)
        if len(_GRADED) >= 64:
            _GRADED.clear()
        _GRADED[key] = positions
    return np.unique(np.concatenate([[t_start], t[idx[positions]], [t_end]]))


# the positions by pattern; read and written one operation at a time, so corners solved in threads
# side by side may share it (one may clear it between another's write and read: that one keeps its own)
_GRADED: dict = {}


def _graded_positions(on: np.ndarray, n: int, last_is_end: bool, heated_stride: int, max_stride: int) -> np.ndarray:
    """Positions (0..n-1) of the samples a graded grid keeps, from ``on`` over the n kept samples
    and the one after them (absent when ``last_is_end``)."""
    chosen = []
    k = 0
    stride = heated_stride
    while k < n:
        chosen.append(k)
        if on[k] or (k + 1 < on.size and on[k + 1]):
            stride = heated_stride
        else:
            stride = min(stride + 1, max_stride)
        # never step over a switch-on: stop at the sample before it
        window = np.arange(k + 1, min(k + stride, n))
        hits = np.flatnonzero(on[np.minimum(window + 1, on.size - 1)]) if window.size else []
        k = (k + 1 + int(hits[0])) if len(hits) else k + stride
    return np.asarray(chosen, dtype=np.int64)
