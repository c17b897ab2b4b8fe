"""Batched runs: identical configurations equal single runs; varied ones equal their own single runs."""
import numpy as np
import pytest

from test_solver_fast_kernel import tabulated_network
from test_solver_methods import nonlinear_schedule
from test_solver_pulses import PULSE, pulse_train, stint_reference, two_node_body
from thermo.errors import ModelError
from thermo.network import Conduction, Network
from thermo.network.assemble import compile_network
from thermo.solver import SolverSettings, solve_network
from thermo.solver.batch import batch_network, kernel_network, scaled, solve_batch
from thermo.solver.grids import graded_grid

FAST = SolverSettings(method="fast", max_step_s=0.25)


def test_identical_configurations_give_the_single_run_exactly():
    net = compile_network(tabulated_network())
    s = nonlinear_schedule(2)
    T0 = np.full(3, 300.0)
    single = solve_network(net, s, T0, FAST)
    batch = solve_batch(scaled(kernel_network(net), link_scale=np.ones((7, net.n_links))), s, T0, FAST,
                        output_times=single.time_s)
    for b in range(7):   # same kernel code per configuration, serial or across cores: bit for bit
        np.testing.assert_array_equal(batch.final_k[b], single.final_k)
        np.testing.assert_array_equal(batch.temperatures_k[b], single.temperatures_k)
    assert np.all(batch.peak_k >= single.temperatures_k.max(axis=0))
    np.testing.assert_allclose(batch.heat_in_j, single.heat_in_j, rtol=1e-14)
    assert np.all(batch.balance_rel_error < 1e-6)     # to the Newton residual (kernel.newton_converged)


def test_varied_configurations_equal_their_own_single_runs_and_the_exact_solution():
    base, A = two_node_body()
    s = pulse_train(3, 40.0, PULSE, 6e4, 0.2)
    variants = [base]
    for g in (40.0, 80.0):
        links = tuple(Conduction("skin_body", "skin", "body", g) if l.name == "skin_body" else l for l in base.links)
        variants.append(Network(base.nodes, base.boundaries, links, base.sources))
    st = SolverSettings(method="fast", max_step_s=0.1)
    batch = solve_batch(variants, s, [300.0, 300.0], st, output_times=s.time_s)
    for b, v in enumerate(variants):
        single = solve_network(v, s, [300.0, 300.0], st)
        np.testing.assert_allclose(batch.temperatures_k[b], single.temperatures_k, atol=1e-9)
    # the base configuration against the exact solution (Van Loan 1978, see solver_oracles)
    np.testing.assert_allclose(batch.temperatures_k[0], stint_reference(s, A), atol=0.05)
    # more skin-body conductance (40, 60, 80 W/K) drains the skin faster: lower skin peak
    assert batch.peak("skin")[1] > batch.peak("skin")[0] > batch.peak("skin")[2]


def test_mixed_topologies_are_rejected():
    net, _ = two_node_body()
    with pytest.raises(ModelError, match="network 1 differs"):
        batch_network([net, tabulated_network()])
    with pytest.raises(ModelError, match="link_scale"):
        scaled(kernel_network(compile_network(net)), link_scale=np.ones((2, 5)))


def test_graded_grid_keeps_switch_on_samples_and_stays_accurate():
    net, A = two_node_body()
    s = pulse_train(3, 40.0, PULSE, 6e4, 0.2)
    t = np.union1d(s.time_s, np.arange(0.0, s.t_end_s, 0.05))
    fine = type(s)(t, {k: np.interp(t, s.time_s, v) for k, v in s.signals.items()})
    cnet = compile_network(net)
    g = graded_grid(fine, cnet, fine.t_start_s, fine.t_end_s, heated_stride=1, max_stride=8)
    on = fine.time_s[np.flatnonzero(fine.signals["q"] > 0) - 1]
    assert set(on) <= set(g), "every sample before a heated one is a grid point"
    assert g.size < 0.3 * fine.time_s.size
    coarse = solve_batch([net], fine, [300.0, 300.0], SolverSettings(method="fast"), grid=g, output_times=s.time_s)
    exact = stint_reference(s, A)
    np.testing.assert_allclose(coarse.temperatures_k[0], exact, atol=0.5)


def test_boundary_slices_are_kept_for_the_same_tables_and_air_only():
    """``boundary_slices`` keeps its result for a run on the same tables and the same constant air
    temperatures (lap after lap); another air temperature, or another table choice, works them
    out anew: the kept result always equals one worked out afresh."""
    from thermo.network import Schedule
    from thermo.solver.kernel_arrays import forget_slices, kernel_inputs

    kn = kernel_network(compile_network(tabulated_network()))
    s = nonlinear_schedule(2)

    def inputs(air_k):
        sched = Schedule(s.time_s, {**s.signals, "t_air": np.full(s.time_s.size, air_k)})
        return kernel_inputs(kn.compiled, sched, graded_grid(sched, kn.compiled, sched.t_start_s, sched.t_end_s))

    forget_slices()
    warm, cool = inputs(340.0), inputs(300.0)
    first = kn.boundary_slices(warm)
    assert kn.boundary_slices(warm) is first                      # kept
    other = kn.boundary_slices(cool)
    assert other is not first
    for got, fresh in ((first, kn._slices(warm)), (other, kn._slices(cool))):
        for a, b in zip(got, fresh):
            np.testing.assert_array_equal(a, b)
    assert not np.array_equal(first[0], other[0])                 # the air temperature matters
    forget_slices()
    assert kn.boundary_slices(warm) is not first
