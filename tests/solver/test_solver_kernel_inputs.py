"""``kernel_inputs``: the signals on a time grid as the kernels read them.

Every array must equal, to the bit, what reading each signal on its own gives (``numpy.interp``
of the signal, and the exact integral of the piecewise linear signal as the trapezoid sum up to
the sample before a time plus the partial piece), on the small scenario's lap and on a grid that
falls between samples. Consistency checks: they need no outside source.
"""
from pathlib import Path

import numpy as np
import pytest

from thermo.chain.settle import lap_setup
from thermo.errors import ModelError
from thermo.network import Schedule
from thermo.scenario import load_scenario
from thermo.solver import kernel
from thermo.solver.grids import graded_grid
from thermo.solver.kernel_arrays import kernel_inputs

SMALL = Path(__file__).resolve().parents[1] / "data" / "small.toml"


def integral_to(s: Schedule, name: str, t: np.ndarray) -> np.ndarray:
    """Integral of one signal from the schedule's start to ``t``, one signal at a time."""
    tt, v = s.time_s, s.signals[name]
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (v[1:] + v[:-1]) * np.diff(tt))])
    tc = np.clip(t, tt[0], tt[-1])
    k = np.clip(np.searchsorted(tt, tc, side="right") - 1, 0, tt.size - 2)
    return cum[k] + 0.5 * (v[k] + np.interp(tc, tt, v)) * (tc - tt[k])


def signal_by_signal(net, s: Schedule, grid: np.ndarray) -> tuple:
    """The kernel's inputs built one signal and one set of times at a time."""
    h = np.diff(grid)
    t_mid = grid[:-1] + kernel.GAMMA * h
    at = lambda names, t: np.stack([np.interp(t, s.time_s, s.signals[n]) for n in names], axis=-1)
    step = lambda t0, t1: np.stack([integral_to(s, n, t1) - integral_to(s, n, t0) for n in net.source_signals], axis=-1)
    return (grid, h, at(net.boundary_signals, grid), at(net.driver_names, grid), at(net.boundary_signals, t_mid),
            at(net.driver_names, t_mid), step(grid[:-1], t_mid), step(grid[:-1], grid[1:]))


@pytest.fixture(scope="module")
def lap():
    _, _, net, s, _ = lap_setup(load_scenario(SMALL), "front")
    return net, s


def test_inputs_on_the_graded_grid_equal_the_signal_by_signal_ones_to_the_bit(lap):
    net, s = lap
    grid = graded_grid(s, net, s.t_start_s, s.t_end_s, 1, 8)
    got = kernel_inputs(net, s, grid)
    assert len(net.source_signals) >= 2 and len(net.driver_names) >= 1
    for name, mine, ref in zip(got._fields, got, signal_by_signal(net, s, grid)):
        assert mine.flags.c_contiguous, name
        np.testing.assert_array_equal(mine, ref, err_msg=name)


def test_inputs_between_samples_and_at_the_ends_equal_the_signal_by_signal_ones(lap):
    net, s = lap
    rng = np.random.default_rng(7)
    # heat ramps on and off between the samples, so that the partial pieces count
    signals = dict(s.signals)
    for name in net.source_signals:
        signals[name] = np.where(rng.random(s.time_s.size) < 0.5, 0.0, rng.uniform(0.0, 5e4, s.time_s.size))
    ramps = Schedule(s.time_s, signals)
    grid = np.unique(np.concatenate([[s.t_start_s, s.t_end_s], rng.uniform(s.t_start_s, s.t_end_s, 300)]))
    got = kernel_inputs(net, ramps, grid)
    for name, mine, ref in zip(got._fields, got, signal_by_signal(net, ramps, grid)):
        np.testing.assert_array_equal(mine, ref, err_msg=name)
    # the heat over the whole grid is the trapezoid integral of the samples (exact for a
    # piecewise linear signal; numpy.trapezoid as the reference)
    for j, name in enumerate(net.source_signals):
        assert got.qs_full[:, j].sum() == pytest.approx(np.trapezoid(signals[name], s.time_s), rel=1e-12)


def test_a_grid_off_the_schedule_or_not_increasing_is_refused(lap):
    net, s = lap
    with pytest.raises(ModelError, match="outside the schedule"):
        kernel_inputs(net, s, np.array([s.t_start_s, s.t_end_s + 1.0]))
    with pytest.raises(ModelError, match="strictly increasing"):
        kernel_inputs(net, s, np.array([s.t_start_s, s.t_start_s, s.t_end_s]))
