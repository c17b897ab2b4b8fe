"""The full-Newton lane kernel (``thermo.solver.kernel_newton_lanes``, ``KernelNetwork.run(lanes=True)``).

Each configuration run side by side must get exactly, to the bit, what ``kernel.advance`` gives
it alone (temperatures, flows, peaks and when, link energies, heat in, status, evaluation counts),
whatever the batch, its width, its padding and its neighbours; a lane the one-configuration kernel
would carry by a fallback or report as failed (off a conductance table, a weak pivot, Newton not
converging, a non-finite state) is handed back to it and reported exactly as alone. Set-up as in
tests/solver/test_solver_lanes.py (the small scenario's and the demo's first lap). Consistency
checks of one implementation against another need no source.
"""
from dataclasses import replace

import numpy as np
import pytest

from thermo.solver import kernel
from thermo.solver.kernel_arrays import kernel_inputs, scaled
from thermo.solver.kernel_lanes import LANES

from test_solver_lanes import SMALL, _demo_path, corner_lap, hot_batch, weak_pivot_batch

RTOL, ATOL_K = 1e-6, 1e-3         # the 'fast' method's defaults (thermo.solver.settings)


@pytest.fixture(scope="module", params=["small", "demo"])
def lap(request):
    return dict(corner_lap(SMALL if request.param == "small" else _demo_path()), name=request.param)


def varied(lap, B, seed):
    """B configurations differing in every link, node mass and source, and in their start state."""
    kn = lap["kn"]
    n, L = kn.n_nodes, kn.link_a.size
    rng = np.random.default_rng(seed)
    kb = scaled(kn, link_scale=rng.uniform(0.6, 1.5, (B, L)), capacity_scale=rng.uniform(0.7, 1.3, (B, n)),
                source_scale=rng.uniform(0.6, 1.4, B))
    T0 = lap["ambient"] + rng.uniform(0.0, 150.0, (B, 1)) + rng.uniform(0.0, 30.0, (B, n))
    return kb, T0


def record_every(N, k):
    record = np.zeros(N + 1, dtype=bool)
    record[::k] = True
    record[[0, N]] = True
    return record


def alone(kb, inputs, T0, b, record):
    """Configuration b by itself in the one-configuration full-Newton kernel (``kernel.advance``)."""
    return kb.subset([b]).run(inputs, T0[b:b + 1], RTOL, ATOL_K, record)


def assert_as_alone(res, b, ref, what, record):
    """Row b of a lanes result is the one-configuration result, bit for bit, in every field (of a
    failed run, the records written before it stopped: the rest are never written)."""
    written = None
    if ref.status[0] != kernel.STATUS_OK:
        written = int(np.count_nonzero(record[:ref.fail_step[0] + 1]))
    for name in kernel.KernelResult._fields:
        got, want = getattr(res, name)[b], getattr(ref, name)[0]
        if name in ("temps", "flows") and written is not None:
            got, want = got[:written], want[:written]
        np.testing.assert_array_equal(got, want, err_msg=f"{what}: {name}, {b}")


@pytest.mark.parametrize("B", [1, 11, LANES + 6])      # one lane; padding; two blocks, the second padded
def test_each_lane_is_its_configuration_alone_to_the_bit(lap, reruns, B):
    inputs, N = lap["inputs"], lap["grid"].size - 1
    kb, T0 = varied(lap, B, 20261203 + B)
    record = record_every(N, 7)
    res = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    assert reruns == [], "no lane needed the one-configuration kernel"
    own = [alone(kb, inputs, T0, b, record) for b in range(B)]
    for b in range(B):
        assert_as_alone(res, b, own[b], f"B = {B}", record)
    # the comparison could show a mix-up: the configurations differ and take several Newton
    # iterations, differently in each lane, and on the demo corner refactor (more matrix
    # evaluations than steps; the small corner never needs to)
    assert np.all(res.counts[:, 0] > 4 * N)
    if B > 1:
        assert np.ptp(res.final.max(axis=1)) > 1.0 and np.unique(res.counts[:, 0]).size > 1
        assert lap["name"] == "small" or np.count_nonzero(res.counts[:, 1] > N) > B // 2


def test_a_lane_does_not_depend_on_its_neighbours(lap):
    inputs, N = lap["inputs"], lap["grid"].size - 1
    kb, T0 = varied(lap, 9, 5)
    record = record_every(N, 13)
    whole = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    order = np.array([4, 8, 0, 2])
    part = kb.subset(order).run(inputs, T0[order], RTOL, ATOL_K, record, lanes=True)
    for j, b in enumerate(order):
        for name in kernel.KernelResult._fields:
            np.testing.assert_array_equal(getattr(part, name)[j], getattr(whole, name)[b], err_msg=name)


def test_a_lane_off_the_table_is_rerun_and_reports_its_own_status(lap, reruns):
    inputs, N = lap["inputs"], lap["grid"].size - 1
    hot = 6
    kb, T0 = hot_batch(lap, hot, 30.0)       # 30 times the heat: the disc leaves the tables' top in one lap
    record = record_every(N, 11)
    own = [alone(kb, inputs, T0, b, record) for b in range(kb.size)]
    assert own[hot].status[0] == kernel.STATUS_OUTSIDE_GRID and 0 < own[hot].fail_step[0] < N
    assert all(own[b].status[0] == kernel.STATUS_OK for b in range(kb.size) if b != hot)
    del reruns[:]
    res = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    assert reruns == [[hot]], "exactly the hot configuration goes back to the one-configuration kernel"
    for b in range(kb.size):
        assert_as_alone(res, b, own[b], "hot lane", record)
    # the same with the boundary slices given, worked out for a larger batch (as CornerLanes gives
    # them): odd configurations read tables of their own (10 % more convection), so each
    # configuration's rows of the slices differ, and the rerun must take its own
    U = kb.tables.shape[0]
    tix = kb.tix.copy()
    tix[1::2] += U
    kb = replace(kb, tables=np.ascontiguousarray(np.concatenate([kb.tables, 1.1 * kb.tables])), tix=tix, varies_b=None)
    wider = replace(kb, tix=np.concatenate([kb.tix, kb.tix[:3]]), par=np.concatenate([kb.par, kb.par[:3]]))
    sliced, slot_sliced, six = wider.boundary_slices(inputs)
    order = np.array([3, 0, hot, 7])       # the hot one even: its tables are not those of the first row
    assert slot_sliced.any() and np.any(six[3] != six[0])
    given = replace(kb.subset(order), slices=(sliced, slot_sliced, np.ascontiguousarray(six[order])))
    del reruns[:]
    res = given.run(inputs, T0[order], RTOL, ATOL_K, record, lanes=True)
    assert reruns == [[2]]
    for j, b in enumerate(order):
        ref = alone(kb, inputs, T0, b, record)
        assert_as_alone(res, j, ref, "hot lane, slices given", record)
    assert ref.final[0].max() != own[7].final[0].max(), "the own tables change the numbers"


def test_lanes_that_newton_cannot_converge_are_each_reported_as_alone(lap, reruns, monkeypatch):
    # one Newton iteration a stage is too few for most steps (from the second, the rate of the
    # corrections may stop it): every configuration fails alone, each at its own step, and the
    # lanes must hand each back for its own report
    monkeypatch.setattr(kernel, "MAX_NEWTON", 1)
    inputs, N = lap["inputs"], lap["grid"].size - 1
    kb, T0 = varied(lap, 5, 11)
    record = record_every(N, 5)
    own = [alone(kb, inputs, T0, b, record) for b in range(kb.size)]
    assert all(r.status[0] == kernel.STATUS_NEWTON for r in own)
    del reruns[:]
    res = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    assert reruns[0] == list(range(kb.size))
    for b in range(kb.size):
        assert_as_alone(res, b, own[b], "max_newton 1", record)


def test_a_weak_pivot_lane_is_rerun_and_equals_its_own_run(lap, reruns):
    # the construction of tests/solver/test_solver_lanes.py: a thin backing plate whose convection
    # falls as it heats, so the sparse elimination meets a weak pivot and only the one-configuration
    # kernel's dense pivoted LU carries it
    inputs, N = lap["inputs"], lap["grid"].size - 1
    weak = 2
    kb, T0, _, _, _ = weak_pivot_batch(lap, 6, weak)
    record = record_every(N, 9)
    own = [alone(kb, inputs, T0, b, record) for b in range(6)]
    assert own[weak].status[0] == kernel.STATUS_OK, "the dense fallback carries it through"
    del reruns[:]
    res = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    assert reruns == [[weak]], "only the weak-pivot lane is flagged"
    for b in range(6):
        assert_as_alone(res, b, own[b], "weak pivot", record)


def test_a_state_off_the_tables_from_the_start_is_reported_as_alone(lap, reruns):
    kb = scaled(lap["kn"], source_scale=np.linspace(1.0, 2.0, 5))
    T0 = np.full((kb.size, kb.n_nodes), lap["ambient"])
    T0[1:3, 0] = lap["net"].conv_grid.node_max_k + 50.0
    inputs = kernel_inputs(lap["net"], lap["s"], lap["grid"][:21])
    record = record_every(20, 4)
    del reruns[:]
    res = kb.run(inputs, T0, RTOL, ATOL_K, record, lanes=True)
    assert reruns == [[1, 2]]
    for b in range(kb.size):
        ref = alone(kb, inputs, T0, b, record)
        assert ref.status[0] == (kernel.STATUS_OUTSIDE_GRID if b in (1, 2) else kernel.STATUS_OK)
        assert_as_alone(res, b, ref, "hot start", record)
