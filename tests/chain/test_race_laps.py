"""Many laps in one call of the linearised kernel (``KernelNetwork.run_laps``) and the repeated-lap
race path (``thermo.chain.race.repeated_laps``), on the small test scenario's front corner."""
import re

import numpy as np
import pytest
import scipy.integrate

from chain_runs import SMALL
from thermo.chain.race import DEFAULT_MAX_STRIDE, repeated_laps
from thermo.chain.settle import lap_setup
from thermo.errors import SolveError
from thermo.network import Schedule
from thermo.scenario import load_scenario
from thermo.solver import SolverSettings, kernel
from thermo.solver.batch import kernel_inputs, kernel_network, scaled
from thermo.solver.grids import graded_grid

N_LAPS = 4


@pytest.fixture(scope="module")
def lap():
    """The small scenario's first race lap for the front corner, on the race path's graded grid."""
    scenario = load_scenario(SMALL)
    _, model, net, s, segment = lap_setup(scenario, "front")
    kn = kernel_network(net)
    grid = graded_grid(s, net, s.t_start_s, s.t_end_s, 1, DEFAULT_MAX_STRIDE)
    T0 = np.full((1, net.n_nodes), float(scenario.ambient.temperature_at(segment.t_start_s)))
    return dict(model=model, net=net, s=s, kn=kn, grid=grid, inputs=kernel_inputs(net, s, grid), T0=T0,
                W=np.ascontiguousarray(model.output_weights.T), every=np.ones(grid.size, dtype=bool))


@pytest.fixture(scope="module")
def one_lap_runs(lap):
    """N_LAPS successive one-lap linearised calls, each starting from the previous ``final``,
    every grid point recorded."""
    T, runs = lap["T0"], []
    for _ in range(N_LAPS):
        r = lap["kn"].run(lap["inputs"], T, 1e-6, 1e-4, lap["every"], linearised=True)
        assert r.status[0] == kernel.STATUS_OK
        runs.append(r)
        T = r.final
    return runs


@pytest.fixture(scope="module")
def many(lap):
    res, peaks = lap["kn"].run_laps(lap["inputs"], lap["T0"], N_LAPS, lap["W"], lap["every"])
    assert res.status[0] == kernel.STATUS_OK
    return res, peaks


def stored_heat(net, T0, T1):
    """Heat stored between two states as the integral of C(T) along the straight path from T0 to
    T1 (scipy.integrate.quad, split at every kink of the piecewise linear c(T) so each piece is a
    polynomial): independent of the kernel's and the batch module's closed-form enthalpy."""
    caps = net.capacities
    dT = T1 - T0
    kinks = []
    for node, lo, hi in zip(caps.seg_node, caps.seg_lo, caps.seg_hi):
        for x in (lo, hi):
            if dT[node] != 0.0:
                s = (x - T0[node]) / dT[node]
                if 0.0 < s < 1.0:
                    kinks.append(s)
    value, err = scipy.integrate.quad(lambda s: float(caps.capacity(T0 + s * dT) @ dT), 0.0, 1.0,
                                      points=sorted(kinks) or None, limit=4 * len(kinks) + 50,
                                      epsabs=0.0, epsrel=1e-12)
    return value


def test_laps_in_one_call_equal_successive_one_lap_calls(lap, many, one_lap_runs):
    res, peaks = many
    W, N = lap["W"], lap["grid"].size - 1
    assert peaks.shape == (1, N_LAPS, W.shape[1])
    # carrying the state inside the kernel is the same as carrying ``final`` between calls
    np.testing.assert_allclose(res.final[0], one_lap_runs[-1].final[0], rtol=0, atol=1e-9)
    # the lap peaks of the outputs: per-lap maxima of the recorded outputs (grid point 0 of a lap is
    # the previous lap's end, which the kernel also counts)
    expected = np.array([(r.temps[0] @ W).max(axis=0) for r in one_lap_runs])
    np.testing.assert_allclose(peaks[0], expected, rtol=0, atol=1e-9)
    np.testing.assert_allclose(peaks[0], [lap["model"].outputs(r.temps[0]).max(axis=0) for r in one_lap_runs],
                               rtol=0, atol=1e-9)
    # from ambient the corner heats lap after lap (the disc, output 0, is hottest every lap)
    assert np.all(np.diff(peaks[0, :, 0]) > 1.0)
    # ``record`` applies to the last lap
    np.testing.assert_allclose(res.temps[0], one_lap_runs[-1].temps[0], rtol=0, atol=1e-9)
    # node peaks over all laps, and when: peak_step counts steps over all laps
    node_peaks = np.array([r.peak[0] for r in one_lap_runs])
    np.testing.assert_allclose(res.peak[0], node_peaks.max(axis=0), rtol=0, atol=1e-9)
    k = node_peaks.argmax(axis=0)
    steps = np.array([one_lap_runs[k[i]].peak_step[0, i] for i in range(k.size)])
    np.testing.assert_array_equal(res.peak_step[0], k * N + steps)
    assert res.peak_step[0].max() > (N_LAPS - 1) * N, "the hottest node peaks in the last lap"
    # work: one flow evaluation at each lap's start plus two a step, one matrix a step
    np.testing.assert_array_equal(res.counts[0], np.sum([r.counts[0] for r in one_lap_runs], axis=0))
    assert res.counts[0, 0] == N_LAPS * (2 * N + 1) and res.counts[0, 1] == N_LAPS * N


def test_other_output_weights(lap, one_lap_runs):
    # node temperatures themselves (identity) and arbitrary signed weights with zeros in them
    n = lap["net"].n_nodes
    rng = np.random.default_rng(4)
    Wr = rng.normal(0.0, 1.0, (n, 3)) * (rng.random((n, 3)) < 0.6)
    Wr[:, 2] = 0.0
    Wr[3, 2] = -1.0                       # the lap peak of -T is minus the lap minimum of T
    for W in (np.eye(n), Wr):
        _, peaks = lap["kn"].run_laps(lap["inputs"], lap["T0"], N_LAPS, W)
        expected = np.array([(r.temps[0] @ W).max(axis=0) for r in one_lap_runs])
        np.testing.assert_allclose(peaks[0], expected, rtol=0, atol=1e-9)
    np.testing.assert_allclose(peaks[0, :, 2], [-r.temps[0, :, 3].min() for r in one_lap_runs], atol=1e-9)
    res, peaks = lap["kn"].run_laps(lap["inputs"], lap["T0"], N_LAPS, None)
    assert peaks.shape == (1, N_LAPS, 0)
    np.testing.assert_allclose(res.final[0], one_lap_runs[-1].final[0], rtol=0, atol=1e-9)


def test_lap_energies_add_up_and_close_the_first_law(lap, many, one_lap_runs):
    res, _ = many
    net, s = lap["net"], lap["s"]
    le = np.sum([r.link_energy[0] for r in one_lap_runs], axis=0)
    np.testing.assert_allclose(res.link_energy[0], le, rtol=1e-12, atol=1e-12 * np.abs(le).max())
    np.testing.assert_allclose(res.heat_in[0], sum(r.heat_in[0] for r in one_lap_runs), rtol=1e-12)
    # heat in: the sources' piecewise linear signals integrate exactly by the trapezoidal rule
    # (numpy.trapezoid) on the schedule's samples, times each signal's share into the nodes
    per_lap = sum(net.source_matrix[:, k].sum() * np.trapezoid(s.signals[name], s.time_s)
                  for k, name in enumerate(net.source_signals))
    assert per_lap > 1e6
    np.testing.assert_allclose(res.heat_in[0], N_LAPS * per_lap, rtol=1e-9)
    # first law: heat in = heat stored + heat lost to the boundaries, over all laps and lap by lap
    # (the linearised mode closes it to its linearisation error, not to round-off)
    starts = [lap["T0"][0]] + [r.final[0] for r in one_lap_runs[:-1]]
    for T_a, T_b, e_in, links in [(lap["T0"][0], res.final[0], res.heat_in[0], res.link_energy[0])] + \
            [(t, r.final[0], r.heat_in[0], r.link_energy[0]) for t, r in zip(starts, one_lap_runs)]:
        stored = stored_heat(net, T_a, T_b)
        lost = links[net.link_to_boundary].sum()
        assert stored > 0 and lost > 0
        assert abs(e_in - stored - lost) <= 1e-4 * e_in


def test_a_batch_of_identical_configurations_equals_one(lap, many):
    res1, peaks1 = many
    kn, L = lap["kn"], lap["kn"].link_a.size
    kb = scaled(kn, link_scale=np.ones((3, L)))
    assert kb.size == 3
    res3, peaks3 = kb.run_laps(lap["inputs"], np.repeat(lap["T0"], 3, axis=0), N_LAPS, lap["W"], lap["every"])
    for b in range(3):    # B > 1 runs the lanes kernel, the same arithmetic side by side
        for name in ("final", "peak", "peak_step", "status", "counts", "temps"):
            np.testing.assert_array_equal(getattr(res3, name)[b], getattr(res1, name)[0], err_msg=name)
        np.testing.assert_array_equal(peaks3[b], peaks1[0])
        # link flows and energy sums may differ in the last bit (measured: 1 ulp)
        np.testing.assert_allclose(res3.flows[b], res1.flows[0], rtol=1e-14, atol=1e-12)
        np.testing.assert_allclose(res3.link_energy[b], res1.link_energy[0], rtol=1e-14, atol=1e-9)
        np.testing.assert_allclose(res3.heat_in[b], res1.heat_in[0], rtol=1e-14)
    # different start states in one batch do not leak into each other: each row equals its own run
    starts = lap["T0"] + np.array([[0.0], [25.0], [80.0]])
    res3, peaks3 = kb.run_laps(lap["inputs"], starts, 2, lap["W"])
    for b in range(3):
        r, p = kn.run_laps(lap["inputs"], starts[b:b + 1], 2, lap["W"])
        np.testing.assert_array_equal(res3.final[b], r.final[0])
        np.testing.assert_array_equal(peaks3[b], p[0])
    assert np.all(np.diff(res3.final[:, 0]) > 0), "a hotter start must end hotter"


def test_repeated_laps_linearised_and_full_newton_agree(lap):
    model, net, s, T0 = lap["model"], lap["net"], lap["s"], lap["T0"][0]
    fast = repeated_laps(model, net, s, T0, 3, linearised=True)
    newton = repeated_laps(model, net, s, T0, 3, linearised=False)
    assert fast.lap_peaks_k.shape == newton.lap_peaks_k.shape == (3, len(model.output_nodes))
    assert fast.steps_per_lap == newton.steps_per_lap == lap["grid"].size - 1
    # issue 8's accuracy bar for the throughput path: 0.05 K on every lap peak
    np.testing.assert_allclose(fast.lap_peaks_k, newton.lap_peaks_k, rtol=0, atol=0.05)
    np.testing.assert_allclose(fast.final_k, newton.final_k, rtol=0, atol=0.05)
    assert np.abs(fast.final_k - newton.final_k).max() > 1e-9, "the two modes are different schemes"
    # the linearised race path is run_laps on the graded grid with the model's output weights
    _, peaks = lap["kn"].run_laps(lap["inputs"], lap["T0"], 3, lap["W"])
    np.testing.assert_array_equal(fast.lap_peaks_k, peaks[0])
    # and the full-Newton one is the kernel lap after lap (the peaks of every recorded grid point)
    T, expected = lap["T0"], []
    st = SolverSettings(method="fast")
    for _ in range(3):
        r = lap["kn"].run(lap["inputs"], T, st.rtol, st.atol_k, lap["every"])
        expected.append(model.outputs(r.temps[0]).max(axis=0))
        T = r.final
    np.testing.assert_array_equal(newton.lap_peaks_k, np.array(expected))


def test_a_failure_in_a_later_lap_names_that_lap(lap):
    # 4.5 times the brake heat: the disc climbs lap after lap until it leaves the top of the
    # convection tables (the network's conductance grid) in a later lap
    model, net, s, T0 = lap["model"], lap["net"], lap["s"], lap["T0"][0]
    hot = Schedule(s.time_s, {k: v * 4.5 if k in net.source_signals else v for k, v in s.signals.items()})
    grid = graded_grid(hot, net, hot.t_start_s, hot.t_end_s, 1, DEFAULT_MAX_STRIDE)
    inputs = kernel_inputs(net, hot, grid)
    top = net.conv_grid.node_max_k
    st = SolverSettings(method="fast")
    every = np.ones(grid.size, dtype=bool)
    for linearised in (True, False):
        # independently: one-lap kernel calls carrying the state until one fails
        T, failed = lap["T0"], None
        for k in range(1, 8):
            r = lap["kn"].run(inputs, T, st.rtol, st.atol_k, every, linearised)
            if r.status[0] != kernel.STATUS_OK:
                failed = k
                break
            assert r.temps[0].max() < top, "a completed lap stayed on the tables"
            T = r.final
        assert failed is not None and failed >= 2, "the failure must come in a later lap"
        assert r.status[0] == kernel.STATUS_OUTSIDE_GRID
        n_done = int(r.fail_step[0])            # steps completed in the failing lap
        assert 0 < n_done < grid.size - 1
        # the accepted states reach the table's top: the lookups are made at each stage's first
        # guess, so the last accepted state may lie past the top by less than one step's rise
        accepted = r.temps[0, :n_done + 1]
        rise = np.diff(accepted, axis=0).max()
        assert top - rise < accepted.max() < top + rise
        t_fail = grid[n_done + 1]
        with pytest.raises(SolveError, match=re.escape(f"phase 'race': lap {failed}: kernel status 2 at "
                                                       f"t = {t_fail:.6g} s")):
            repeated_laps(model, net, hot, T0, failed + 2, linearised=linearised)
        # the laps before the failing one complete, with the same peaks as the one-lap calls
        ok = repeated_laps(model, net, hot, T0, failed - 1, linearised=linearised)
        assert ok.lap_peaks_k.shape[0] == failed - 1
        np.testing.assert_allclose(ok.final_k, T[0], rtol=0, atol=1e-9)
