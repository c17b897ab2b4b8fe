"""The lane kernel (``thermo.solver.kernel_lanes``): configurations side by side in blocks of lanes.

Each configuration of a lanes batch must equal the same configuration run alone in the
one-configuration linearised kernel (``thermo.solver.kernel_linearised``, the B = 1 path of
``KernelNetwork.run_laps``), whatever the block width and the padding; a lane the lane kernel
cannot finish (off a conductance table, a weak pivot) is rerun alone and reported exactly as
its own run reports it; ``lane_width`` keeps to its bounds and its documented rule; and the lanes
close the first law on the demo lap. Set-up as in tests/chain/test_race_laps.py (the small scenario's front corner).
Consistency checks need no source; the physics checks name theirs beside them.
"""
import inspect
import math
import os
import re
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
import scipy.integrate

from thermo.chain.settle import lap_setup
from thermo.errors import SolveError
from thermo.network import Schedule
from thermo.scenario import load_scenario
from thermo.solver import kernel, kernel_arrays, kernel_lanes, stage_matrix
from thermo.solver.batch import solve_batch
from thermo.solver.kernel_arrays import (MIN_LANES, kernel_inputs, kernel_network, lane_width,
                                         scaled)
from thermo.solver.grids import graded_grid

SMALL = Path(__file__).resolve().parents[1] / "data" / "small.toml"
N_LAPS = 3
B = 11                                   # not a multiple of any forced width below but 1 (padding)
FIELDS = ("final", "peak", "temps", "flows", "link_energy", "heat_in")


def _demo_path() -> Path:
    """scenarios/demo.toml of the work tree, else the installed copy (as ``brakeheat demo`` finds it)."""
    here = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
    if here.exists():
        return here
    import brakeheat_scenarios
    return Path(brakeheat_scenarios.__file__).parent / "demo.toml"


def corner_lap(path):
    """The scenario's first race lap for the front corner on the race path's graded grid."""
    scenario = load_scenario(path)
    _, model, net, s, segment = lap_setup(scenario, "front")
    grid = graded_grid(s, net, s.t_start_s, s.t_end_s, 1, 8)
    ambient = float(scenario.ambient.temperature_at(segment.t_start_s))
    return dict(model=model, net=net, s=s, kn=kernel_network(net), grid=grid, inputs=kernel_inputs(net, s, grid),
                ambient=ambient, W=np.ascontiguousarray(model.output_weights.T))


@pytest.fixture(scope="module")
def lap():
    return corner_lap(SMALL)


@pytest.fixture(scope="module")
def varied(lap):
    """B configurations differing in every link, node mass and source, and in their start state."""
    kn, net = lap["kn"], lap["net"]
    L, n = kn.link_a.size, net.n_nodes
    rng = np.random.default_rng(20240611)
    source = rng.uniform(0.6, 1.4, (B, 1)) * np.ones((1, n))
    source[::3] *= rng.uniform(0.7, 1.3, (len(source[::3]), n))          # some rows per node
    kb = scaled(kn, link_scale=rng.uniform(0.6, 1.5, (B, L)), capacity_scale=rng.uniform(0.7, 1.3, (B, n)),
                source_scale=source)
    T0 = lap["ambient"] + rng.uniform(0.0, 150.0, (B, 1)) + rng.uniform(0.0, 30.0, (B, n))
    N = lap["grid"].size - 1
    record = np.zeros(N + 1, dtype=bool)
    record[::7] = True
    record[[0, N]] = True
    return dict(kb=kb, T0=T0, record=record, source=source)


@pytest.fixture
def one_core_widths(monkeypatch):
    """``lane_width`` as on a one-core machine (W = min(LANES, B)), so that the automatic choice in
    ``run_laps`` and ``solve_batch`` takes the lanes whatever the core count of the test machine."""
    original = kernel_arrays.lane_width
    monkeypatch.setattr(kernel_arrays, "lane_width", lambda configurations, cores=None: original(configurations, 1))


def alone(kb, inputs, T0, b, n_laps, weights, record):
    """Configuration b of a batch run by itself: B = 1 takes the one-configuration kernel."""
    one = kb.subset([b])
    assert kernel_arrays.lane_width(one.size) < MIN_LANES
    return one.run_laps(inputs, T0[b:b + 1], n_laps, weights, record)


def assert_same_configuration(res, peaks, b, ref, ref_peaks, what):
    """Row b of a batch result against a B = 1 result, to round-off."""
    for name in FIELDS:
        got, want = getattr(res, name)[b], getattr(ref, name)[0]
        # temperatures to 1e-9 K; flows, energies to 1e-9 relative of the largest entry
        atol = 1e-9 if name in ("final", "peak", "temps") else 1e-9 * np.abs(want).max(initial=1.0)
        np.testing.assert_allclose(got, want, rtol=1e-9, atol=atol, err_msg=f"{what}: {name}, configuration {b}")
    for name in ("peak_step", "status", "fail_step", "counts"):
        np.testing.assert_array_equal(getattr(res, name)[b], getattr(ref, name)[0],
                                      err_msg=f"{what}: {name}, configuration {b}")
    np.testing.assert_allclose(peaks[b], ref_peaks[0], rtol=0, atol=1e-9, err_msg=f"{what}: lap peaks, {b}")


# 1. lanes against the one-configuration kernel ---------------------------------------------------------------

@pytest.fixture(scope="module")
def singles(lap, varied):
    return [alone(varied["kb"], lap["inputs"], varied["T0"], b, N_LAPS, lap["W"], varied["record"]) for b in range(B)]


def test_the_configurations_really_differ(lap, varied, singles):
    # otherwise a lane mix-up could not show
    finals = np.array([r.final[0] for r, _ in singles])
    assert np.all([r.status[0] == kernel.STATUS_OK for r, _ in singles])
    assert np.ptp(finals[:, 0]) > 20.0 and np.ptp([p[0, -1, 0] for _, p in singles]) > 20.0
    assert len({round(float(x), 6) for x in finals[:, 5]}) == B


@pytest.mark.parametrize("width", [1, 3, 4, 8, 64, None])
def test_lanes_equal_each_configuration_alone(lap, varied, singles, reruns, width):
    kb, T0, record = varied["kb"], varied["T0"], varied["record"]
    weights = kernel_arrays._sparse_weights(lap["W"])
    res, peaks = kb._run_lanes(lap["inputs"], T0, N_LAPS, weights, record, width)
    assert reruns == [], "no lane may be flagged here: the lanes themselves must have computed every row"
    n_rec = int(np.count_nonzero(record))
    assert res.temps.shape == (B, n_rec, kb.n_nodes) and res.flows.shape == (B, n_rec, kb.link_a.size)
    assert peaks.shape == (B, N_LAPS, lap["W"].shape[1])
    for b, (ref, ref_peaks) in enumerate(singles):
        assert_same_configuration(res, peaks, b, ref, ref_peaks, f"width {width}")


def test_run_laps_automatic_width_equals_each_configuration_alone(lap, varied, singles, reruns):
    kb, T0, record = varied["kb"], varied["T0"], varied["record"]
    # as the machine chooses (lanes if lane_width(B) >= MIN_LANES here, else the one-configuration kernel)
    res, peaks = kb.run_laps(lap["inputs"], T0, N_LAPS, lap["W"], record)
    for b, (ref, ref_peaks) in enumerate(singles):
        assert_same_configuration(res, peaks, b, ref, ref_peaks, "run_laps")
    assert reruns == []


def test_run_laps_takes_the_lanes_when_wide_enough(lap, varied, singles, reruns, one_core_widths, monkeypatch):
    called = []
    original = kernel_lanes.advance_lanes

    def watch(T0, *args):
        called.append(T0.shape)
        return original(T0, *args)
    monkeypatch.setattr(kernel_lanes, "advance_lanes", watch)
    kb, T0, record = varied["kb"], varied["T0"], varied["record"]
    res, peaks = kb.run_laps(lap["inputs"], T0, N_LAPS, lap["W"], record)
    assert called == [(1, kb.n_nodes, B)], "one block of B lanes"
    for b, (ref, ref_peaks) in enumerate(singles):
        assert_same_configuration(res, peaks, b, ref, ref_peaks, "run_laps, one core")
    # without output weights: no lap peaks, the same states
    res0, peaks0 = kb.run_laps(lap["inputs"], T0, N_LAPS, None, record)
    assert peaks0.shape == (B, N_LAPS, 0)
    np.testing.assert_array_equal(res0.final, res.final)
    assert reruns == []


# 2. a lane that leaves the conductance table is rerun alone ---------------------------------------------------

def hot_batch(lap, hot, heat):
    """8 configurations of the small corner, configuration ``hot`` with ``heat`` times the brake heat."""
    kn = lap["kn"]
    rng = np.random.default_rng(7)
    source = rng.uniform(0.7, 1.3, 8)
    source[hot] = heat
    kb = scaled(kn, link_scale=rng.uniform(0.8, 1.2, (8, kn.link_a.size)), source_scale=source)
    T0 = lap["ambient"] + rng.uniform(0.0, 40.0, (8, kn.n_nodes))
    return kb, T0


@pytest.mark.parametrize("hot", [2, 7])       # 7: the last configuration, repeated into the padding lanes
@pytest.mark.parametrize("width", [4, 3, None])
def test_a_lane_off_the_table_is_rerun_and_reports_its_own_status(lap, reruns, hot, width):
    inputs, W, N = lap["inputs"], lap["W"], lap["grid"].size - 1
    record = np.zeros(N + 1, dtype=bool)
    record[::11] = True
    kb, T0 = hot_batch(lap, hot, 5.0)
    cool, _ = hot_batch(lap, hot, 1.0)          # the same batch with configuration ``hot`` at its normal heat
    own = [alone(kb, inputs, T0, b, N_LAPS, W, record) for b in range(8)]
    ref, ref_peaks = own[hot]
    # 5 times the heat: the disc leaves the top of the convection tables after the first lap
    assert ref.status[0] == kernel.STATUS_OUTSIDE_GRID
    failed_lap = int(ref.fail_step[0]) // N
    assert 1 <= failed_lap < N_LAPS
    assert np.all(np.isfinite(ref_peaks[0, :failed_lap])) and np.all(np.isnan(ref_peaks[0, failed_lap + 1:]))
    del reruns[:]
    weights = kernel_arrays._sparse_weights(W)
    res, peaks = kb._run_lanes(inputs, T0, N_LAPS, weights, record, width)
    assert reruns == [[hot]], "exactly the hot configuration goes back to the one-configuration kernel"
    np.testing.assert_array_equal(peaks[hot], ref_peaks[0])                     # NaN where never driven
    for name in ("status", "fail_step", "counts", "final", "peak", "peak_step", "heat_in"):
        np.testing.assert_array_equal(getattr(res, name)[hot], getattr(ref, name)[0], err_msg=name)
    # the other configurations: as alone, and bit for bit as in the batch without the hot one (lanes never mix)
    del reruns[:]
    res_c, peaks_c = cool._run_lanes(inputs, T0, N_LAPS, weights, record, width)
    assert reruns == []
    for b in range(8):
        if b == hot:
            continue
        assert_same_configuration(res, peaks, b, *own[b], f"hot lane {hot}, width {width}")
        for name in FIELDS + ("peak_step",):
            np.testing.assert_array_equal(getattr(res, name)[b], getattr(res_c, name)[b], err_msg=name)
        np.testing.assert_array_equal(peaks[b], peaks_c[b])
    assert np.abs(res.final[hot] - res_c.final[hot]).max() > 1.0
    # without output weights the rerun takes none either
    del reruns[:]
    res0, peaks0 = kb._run_lanes(inputs, T0, N_LAPS, kernel_arrays._sparse_weights(None), record, width)
    assert reruns == [[hot]] and peaks0.shape == (8, N_LAPS, 0)
    np.testing.assert_array_equal(res0.status, res.status)
    np.testing.assert_array_equal(res0.final, res.final)


@pytest.mark.parametrize("width", [4, None])
def test_lanes_flag_exactly_the_configurations_whose_own_run_leaves_the_table(lap, reruns, width):
    # a ladder of brake heats across the edge of the tables (the disc's top node temperature, 1800 K,
    # is reached in the last of three laps): the lanes must hand back exactly those configurations
    # whose own run fails, none that completes, and each must report as alone
    inputs = lap["inputs"]
    heats = np.arange(3.8, 4.02, 0.025)
    kb = scaled(lap["kn"], source_scale=heats)
    T0 = np.full((kb.size, kb.n_nodes), lap["ambient"])
    runs = [alone(kb, inputs, T0, b, N_LAPS, None, None) for b in range(kb.size)]
    own = [r for r, _ in runs]
    status = np.array([r.status[0] for r in own])
    failed = np.flatnonzero(status != kernel.STATUS_OK)
    assert 0 < failed.size < kb.size and np.all(status[failed] == kernel.STATUS_OUTSIDE_GRID)
    assert np.all(np.diff(status) >= 0), "more heat never comes back onto the tables"
    # the last completed one stays within a few kelvin of the tables' top, the failures all in the last lap
    assert lap["net"].conv_grid.node_max_k - 15.0 < own[failed[0] - 1].peak[0].max() < lap["net"].conv_grid.node_max_k
    assert all(2 * inputs.h.size <= own[b].fail_step[0] < 3 * inputs.h.size for b in failed)
    del reruns[:]
    res, peaks = kb._run_lanes(inputs, T0, N_LAPS, kernel_arrays._sparse_weights(None), np.zeros(inputs.grid.size, bool),
                               width)
    assert reruns == [failed.tolist()]
    for b in range(kb.size):
        assert_same_configuration(res, peaks, b, *runs[b], f"heat ladder, width {width}")


@pytest.mark.parametrize("width", [4, 5])
def test_a_lane_whose_end_state_alone_is_off_the_table_is_flagged(lap, reruns, width):
    # the run ends a few samples into the first braking zone, the disc rising fast: with enough heat
    # only the accepted end state lies past the tables' top (every stage lookup is made at a stage's
    # first guess, below it), which only the end-state check finds
    net, s, kn, grid = lap["net"], lap["s"], lap["kn"], lap["grid"]
    heated = sum(np.interp(grid, s.time_s, s.signals[k]) for k in net.source_signals) > 0
    N = int(np.flatnonzero(heated)[0]) + 6
    inputs = kernel_inputs(net, s, grid[:N + 1])
    T0 = np.full((1, kn.n_nodes), lap["ambient"])
    status = lambda x: scaled(kn, source_scale=[x]).run_laps(inputs, T0, 1, None)[0].status[0]
    lo, hi = 1.0, 1000.0
    assert status(lo) == kernel.STATUS_OK and status(hi) == kernel.STATUS_OUTSIDE_GRID
    for _ in range(30):                         # the heat at which the run first leaves the tables
        lo, hi = (0.5 * (lo + hi), hi) if status(0.5 * (lo + hi)) == kernel.STATUS_OK else (lo, 0.5 * (lo + hi))
    kb = scaled(kn, source_scale=[1.0, 1.02 * hi, 0.98 * lo, 2.0, 10.0])
    T0 = np.repeat(T0, kb.size, axis=0)
    runs = [alone(kb, inputs, T0, b, 1, None, None) for b in range(kb.size)]
    end, below = runs[1][0], runs[2][0]
    assert end.status[0] == kernel.STATUS_OUTSIDE_GRID and end.fail_step[0] == N - 1, "the end-state check fired"
    assert end.final[0].max() > net.conv_grid.node_max_k > below.final[0].max()
    assert below.status[0] == kernel.STATUS_OK
    del reruns[:]
    res, peaks = kb._run_lanes(inputs, T0, 1, kernel_arrays._sparse_weights(None), np.zeros(N + 1, bool), width)
    assert reruns == [[1]]
    for b in range(kb.size):
        assert_same_configuration(res, peaks, b, *runs[b], f"end state, width {width}")


def test_solve_batch_names_the_configuration_off_the_table(lap, reruns, one_core_widths):
    s, net = lap["s"], lap["net"]
    hot = 5
    kb, T0 = hot_batch(lap, hot, 8.0)           # 8 times the heat: off the table within one lap
    with pytest.raises(SolveError) as alone_err:
        solve_batch(kb.subset([hot]), s, T0[hot:hot + 1], linearised=True, phase="lanes")
    t_fail = re.search(r"at t = (\S+) s", str(alone_err.value)).group(1)
    assert s.t_start_s < float(t_fail) < s.t_end_s
    del reruns[:]
    with pytest.raises(SolveError, match=re.escape(f"phase 'lanes': batch configuration {hot}: a state left the "
                                                   f"conductance tables at t = {t_fail} s")):
        solve_batch(kb, s, T0, linearised=True, phase="lanes")
    assert reruns == [[hot]]
    # the others alone complete (and the batch without the hot one, in lanes, closes its balance)
    others = [b for b in range(8) if b != hot]
    sol = solve_batch(kb.subset(others), s, T0[others], linearised=True)
    assert sol.final_k.shape == (7, net.n_nodes) and np.all(sol.balance_rel_error < 1e-4)


def test_many_lanes_off_the_table_are_each_rerun(lap, one_core_widths):
    # every configuration of a batch is off the tables (a sweep run past its limits; here from the
    # start, on the lap's first ten steps, to keep the recursion cheap): each must still get its own
    # status and fail step, as alone
    kb = scaled(lap["kn"], source_scale=np.linspace(1.0, 2.0, MIN_LANES + 1))
    T0 = np.full((kb.size, kb.n_nodes), lap["ambient"])
    T0[:, 0] = lap["net"].conv_grid.node_max_k + 50.0
    inputs = kernel_inputs(lap["net"], lap["s"], lap["grid"][:11])
    limit = sys.getrecursionlimit()
    sys.setrecursionlimit(len(inspect.stack(0)) + 200)      # each level costs a kernel call: fail fast
    try:
        res, _ = kb.run_laps(inputs, T0, 1, None)
    except RecursionError:
        raise AssertionError("run_laps recursed without end") from None     # (a short traceback)
    finally:
        sys.setrecursionlimit(limit)
    for b in range(kb.size):
        ref, _ = alone(kb, inputs, T0, b, 1, None, None)
        assert ref.status[0] == kernel.STATUS_OUTSIDE_GRID
        np.testing.assert_array_equal(res.status[b], ref.status[0])
        np.testing.assert_array_equal(res.fail_step[b], ref.fail_step[0])


# 3. a weak pivot: the lane kernel flags it, the one-configuration kernel refactors densely ---------------------

def falling_table(kn, slot, g_hi, g_lo, t_drop_k):
    """A convection table G(T_node) [W/K] that falls from g_hi to g_lo over the node-axis cell starting at
    t_drop_k, the same for every driver and boundary temperature: a heat flow that falls as the wall
    heats, as in the transition regime of a boiling curve (from memory), which no brake corner has."""
    nd, nn, nb = kn.tables.shape[1:]
    t_node = kn.gp[3] + kn.gp[4] * np.arange(nn)
    g = np.where(t_node <= t_drop_k, g_hi, g_lo)
    assert np.count_nonzero((t_node > t_drop_k - kn.gp[4]) & (t_node <= t_drop_k + kn.gp[4])) == 2
    return np.broadcast_to(g[None, :, None], (nd, nn, nb)).copy()


def weak_pivot_batch(lap, count, weak):
    """``count`` configurations of the lap's corner, configuration ``weak`` with a thin backing plate
    whose convection falls as it heats, started inside the falling cell: (batch, start state, the
    plate's node, its convection link, that link's slot)."""
    net, kn = lap["net"], lap["kn"]
    node, link = net.node_names.index("backing_plate"), net.link_names.index("backing_plate_convection")
    slot = int(kn.conv_slot[link])
    assert slot >= 0 and kn.link_a[link] == node and kn.link_b[link] >= net.n_nodes
    rng = np.random.default_rng(3)
    cs = np.ones((count, kn.n_nodes))
    cs[weak, node] = 0.02                       # a thin plate: its heat capacity no longer dominates the pivot
    ls = rng.uniform(0.8, 1.2, (count, kn.link_a.size))
    ls[weak] = 1.0
    kb = scaled(kn, link_scale=ls, capacity_scale=cs)
    # G from 100 to 60 W/K over 400-410 K: with the thin plate the pivot stays positive but under half of C
    tables = np.ascontiguousarray(np.concatenate([kb.tables, falling_table(kb, slot, 100.0, 60.0, 400.0)[None]]))
    tix = kb.tix.copy()
    tix[weak, slot] = tables.shape[0] - 1
    kb = replace(kb, tables=tables, tix=tix)
    T0 = np.full((count, kn.n_nodes), lap["ambient"]) + rng.uniform(0.0, 20.0, (count, 1))
    T0[weak, node] = 405.0                      # inside the falling cell: G + dG/dT (T - T_air) < 0
    return kb, T0, node, link, slot


def test_a_weak_pivot_lane_is_rerun_and_equals_its_own_run(lap, reruns):
    inputs, W, N = lap["inputs"], lap["W"], lap["grid"].size - 1
    weak = 3
    kb, T0, node, link, slot = weak_pivot_batch(lap, 8, weak)
    # the construction does what it says: at the first step the sparse elimination meets a weak pivot
    # and the dense pivoted LU does not (the kernel's own factorisations, thermo.solver.kernel)
    one = kb.subset([weak])
    f, dfa, dfb = (np.empty(kb.link_a.size) for _ in range(3))
    nax = inputs.drv_grid.shape[1] + inputs.bk_grid.shape[1]
    links, capacities = kernel._configuration(one.arrays(inputs), 0)
    kernel._flows(T0[weak], inputs.bk_grid[0], inputs.drv_grid[0], links, f, dfa, dfb,
                  np.zeros(nax, dtype=np.int64), np.zeros(nax), np.zeros(nax, dtype=np.bool_))
    assert dfa[link] < 0.0
    C, H = np.empty(kb.n_nodes), np.empty(kb.n_nodes)
    href = np.empty(capacities.seg_lo.size)
    kernel._reference_ramps(capacities, href)
    kernel._capacity_enthalpy(T0[weak], capacities, href, C, H, True)
    A = np.empty((kb.n_nodes, kb.n_nodes))
    stage_matrix._newton_matrix(A, C, inputs.h[0] * kernel.D_WEIGHT, kb.n_nodes, kb.link_a, kb.link_b, dfa, dfb)
    A_dense = A.copy()
    assert 0.0 < A[node, node] < 0.5 * C[node], "a weak (not a negative) diagonal"
    assert not stage_matrix._sparse_factor(A, C, kb.plan.order, kb.plan.ptr, kb.plan.nbr)
    assert stage_matrix._lu_factor(A_dense, np.zeros(kb.n_nodes, dtype=np.int64))
    own = [alone(kb, inputs, T0, b, N_LAPS, W, None) for b in range(8)]
    assert own[weak][0].status[0] == kernel.STATUS_OK, "the dense fallback carries it through"
    assert np.all(np.isfinite(own[weak][0].final)) and own[weak][0].final[0, node] < 400.0
    assert own[weak][0].peak[0, node] == 405.0, "the plate cools from its start, it never runs away"
    del reruns[:]
    res, peaks = kb._run_lanes(inputs, T0, N_LAPS, kernel_arrays._sparse_weights(W), np.zeros(N + 1, dtype=bool), 4)
    assert reruns == [[weak]], "only the weak-pivot lane is flagged"
    for b in range(8):
        assert_same_configuration(res, peaks, b, *own[b], "weak pivot")


# 4. lane_width -------------------------------------------------------------------------------------------------

def test_lane_width_bounds():
    assert kernel_lanes.LANES == 64 and MIN_LANES == 4
    for cores in range(1, 65):
        for configurations in range(1, 70 * cores, max(1, cores // 4)):
            w = lane_width(configurations, cores)
            assert isinstance(w, int) and 1 <= w <= kernel_lanes.LANES
            if configurations <= cores:
                assert w == 1, "fewer configurations than cores: one lane each"
            if configurations >= kernel_lanes.LANES * cores:
                assert w == kernel_lanes.LANES, "as wide as LANES allows once every core has a full block"
    assert lane_width(11) == lane_width(11, os.cpu_count() or 1), "default: the machine's core count"


# lane_width documents its rule: the batch shared evenly over the cores, ceil(B / cores) lanes a
# block, at most LANES; so no more blocks than cores until every block is full
@pytest.mark.parametrize("configurations, cores", [
    (2, 2), (8, 2), (11, 2), (1001, 2), (7, 4), (10, 4), (64, 8), (100, 8), (1000, 16), (4096, 64),
    (6, 4), (9, 4), (25, 8), (66, 16)])
def test_lane_width_shares_the_batch_evenly_over_the_cores(configurations, cores):
    w = lane_width(configurations, cores)
    assert w == min(kernel_lanes.LANES, math.ceil(configurations / cores))
    blocks = math.ceil(configurations / w)
    assert blocks <= cores or w == kernel_lanes.LANES
    assert blocks * w - configurations < w, "no block is all padding"


# 5. first law in the lanes on the demo lap ---------------------------------------------------------------------

def stored_heat(capacities, scale, T0, T1):
    """Heat stored from T0 to T1 [J]: the integral of scale * C(T) along the straight path
    (scipy.integrate.quad, split at every kink of the piecewise linear c(T)), independent of the
    kernel's closed-form enthalpy (as in tests/chain/test_race_laps.py)."""
    dT = T1 - T0
    kinks = sorted({float(u) for node, lo, hi in zip(capacities.seg_node, capacities.seg_lo, capacities.seg_hi)
                    for x in (lo, hi) if dT[node] != 0.0 for u in [(x - T0[node]) / dT[node]] if 0.0 < u < 1.0})
    value, _ = scipy.integrate.quad(lambda u: float((scale * capacities.capacity(T0 + u * dT)) @ dT), 0.0, 1.0,
                                    points=kinks or None, limit=4 * len(kinks) + 50, epsabs=0.0, epsrel=1e-12)
    return value


def test_lanes_close_the_first_law_on_the_demo_lap(reruns):
    demo = corner_lap(_demo_path())
    net, s, kn = demo["net"], demo["s"], demo["kn"]
    n, L, Bd = net.n_nodes, kn.link_a.size, 9
    rng = np.random.default_rng(11)
    cs = rng.uniform(0.7, 1.3, (Bd, n))
    ss = rng.uniform(0.5, 1.3, (Bd, n))
    kb = scaled(kn, link_scale=rng.uniform(0.6, 1.5, (Bd, L)), capacity_scale=cs, source_scale=ss)
    T0 = demo["ambient"] + rng.uniform(0.0, 200.0, (Bd, 1)) + rng.uniform(0.0, 20.0, (Bd, n))
    res, _ = kb._run_lanes(demo["inputs"], T0, 1, kernel_arrays._sparse_weights(None), np.zeros(demo["grid"].size, bool), 4)
    assert reruns == [] and np.all(res.status == kernel.STATUS_OK)
    # heat in: the piecewise linear source signals integrate exactly by the trapezoidal rule
    # (numpy.trapezoid) on the schedule's samples, times each node's (scaled) share of each signal
    per_signal = np.array([np.trapezoid(s.signals[name], s.time_s) for name in net.source_signals])
    expected_in = (ss * (net.source_matrix @ per_signal)[None, :]).sum(axis=1)
    assert np.all(expected_in > 1e5)
    np.testing.assert_allclose(res.heat_in, expected_in, rtol=1e-9)
    for b in range(Bd):
        stored = stored_heat(net.capacities, cs[b], T0[b], res.final[b])
        lost = res.link_energy[b, net.link_to_boundary].sum()
        # first law for the corner as a closed system: heat in = heat stored + heat lost to the boundaries
        # (Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., sec. 1.3, the energy balance;
        # section number from memory); the linearised scheme closes it to its linearisation error
        assert abs(res.heat_in[b] - stored - lost) <= 2e-5 * res.heat_in[b], b
    assert np.ptp(res.final[:, 0]) > 10.0, "the configurations differ"
    # the batch module's own balance (closed-form enthalpy) says the same through solve_batch
    sol = solve_batch(kb, s, T0, grid=demo["grid"], linearised=True)
    assert np.all(sol.balance_rel_error < 2e-5)
    np.testing.assert_allclose(sol.final_k, res.final, rtol=0, atol=1e-9)


# 6. constant boundary temperatures: tables pre-interpolated along the boundary axis ----------------------------

def test_constant_boundaries_read_presliced_tables_and_varying_ones_the_full_table(lap, varied):
    kb, T0, s, net = varied["kb"], varied["T0"], lap["s"], lap["net"]
    sliced, slot_sliced, six = kb.boundary_slices(lap["inputs"])
    to_boundary = [int(kb.conv_slot[l]) for l in np.flatnonzero(kb.kind == kernel.KIND_CONVECTION)
                   if kb.link_b[l] >= net.n_nodes]
    assert to_boundary and all(slot_sliced[to_boundary]), "the small scenario's boundaries are constant"
    # a slice is the table interpolated linearly along the boundary axis at the boundary temperature
    # (numpy.interp as the reference library, one table column at a time)
    gp = kb.gp
    l = int(np.flatnonzero(kb.kind == kernel.KIND_CONVECTION)[0])
    q, slot = int(kb.link_b[l]) - net.n_nodes, int(kb.conv_slot[l])
    axis = gp[6] + gp[7] * np.arange(int(gp[8]))
    t_b = lap["inputs"].bk_grid[0, q]
    table = kb.tables[kb.tix[0, slot]]
    piece = sliced.reshape(-1, table.shape[0], table.shape[1])[six[0, slot]]
    for i, j in ((0, 0), (3, 7), (table.shape[0] - 1, table.shape[1] - 1)):
        assert piece[i, j] == pytest.approx(np.interp(t_b, axis, table[i, j]), rel=1e-12)
    # a boundary temperature that varies over the run keeps the full trilinear table, and the lanes
    # still equal each configuration alone
    ramp = {k: (v + np.linspace(0.0, 8.0, v.size) if k in s.signals and k.endswith("_k") else v)
            for k, v in s.signals.items()}
    inputs = kernel_inputs(net, Schedule(s.time_s, ramp), lap["grid"])
    assert np.ptp(inputs.bk_grid, axis=0).max() > 1.0, "the ramp must reach the boundary temperatures"
    _, slot_sliced2, _ = kb.boundary_slices(inputs)
    to_boundary = np.array([kb.link_b[l] >= kb.n_nodes for l in np.flatnonzero(kb.kind == kernel.KIND_CONVECTION)])
    assert not slot_sliced2[to_boundary].any()
    # the pad-disc interface (node to node, G independent of the temperatures) is always sliced
    assert slot_sliced2[~to_boundary].all() and (~to_boundary).sum() == 1
    res, peaks = kb._run_lanes(inputs, T0, 2, kernel_arrays._sparse_weights(lap["W"]), varied["record"], 4)
    for b in (0, 6, B - 1):
        ref, ref_peaks = alone(kb, inputs, T0, b, 2, lap["W"], varied["record"])
        assert_same_configuration(res, peaks, b, ref, ref_peaks, f"varying boundary, configuration {b}")
