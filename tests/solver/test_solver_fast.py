"""The 'fast' TR-BDF2 integrator against analytic solutions and against Radau at tight tolerance."""
import numpy as np
import pytest

from test_solver_analytic import lumped_network, slab_chain, surface_rise_semi_infinite
from test_solver_methods import nonlinear_network, nonlinear_schedule
from test_solver_pulses import PULSE, pulse_peaks, pulse_train, stint_reference, two_node_body
from thermo.network import Schedule
from thermo.solver import SolverSettings, solve_network
from thermo.solver.fast import time_grid


def test_lumped_cooling_converges_at_second_order():
    # exact: Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., eq. 5.6; TR-BDF2 is second
    # order (Hosea & Shampine, Appl. Numer. Math. 20, 1996): halving the step quarters the error
    t = np.linspace(0.0, 300.0, 31)
    s = Schedule(t, {"t_amb": np.full(t.size, 300.0)})
    exact = 300.0 + 300.0 * np.exp(-t / 100.0)
    errors = []
    for step in (5.0, 2.5, 1.25):   # each divides the 10 s sample interval
        sol = solve_network(lumped_network(), s, [600.0], SolverSettings(method="fast", max_step_s=step))
        errors.append(np.max(np.abs(sol.temperatures_k[:, 0] - exact)))
    assert 3.5 < errors[0] / errors[1] < 4.5 and 3.5 < errors[1] / errors[2] < 4.5
    assert errors[2] < 1e-3


def test_pulse_stint_matches_exact_and_radau():
    net, A = two_node_body()
    n = 3
    s = pulse_train(n, 40.0, PULSE, 6e4, 0.2)
    exact = stint_reference(s, A)      # Van Loan (1978) exact solution, see solver_oracles
    sol = solve_network(net, s, [300.0, 300.0], SolverSettings(method="fast", max_step_s=0.1))
    radau = solve_network(net, s, [300.0, 300.0], SolverSettings(method="Radau", rtol=1e-9, atol_k=1e-7))
    peaks = pulse_peaks(sol.time_s, sol.temperatures_k[:, 0], s, PULSE, 40.0, n)
    np.testing.assert_allclose(peaks, pulse_peaks(s.time_s, exact[:, 0], s, PULSE, 40.0, n), atol=0.05)
    np.testing.assert_allclose(sol.temperatures_k, radau.temperatures_k, atol=0.05)
    # exact discrete bookkeeping: the balance closes to round-off and Newton tolerance
    assert sol.balance_rel_error < 1e-10
    assert sol.heat_in_j == pytest.approx(s.integral("q", s.t_start_s, s.t_end_s), rel=1e-12)


def test_semi_infinite_solid_surface_temperature():
    # Carslaw & Jaeger (1959) sec. 2.9 / Incropera Table 5.1 case 3, as in test_solver_analytic
    e = np.sqrt(51.0 * 7100.0 * 499.0)
    t = np.linspace(0.0, 4.0, 81)
    s = Schedule(t, {"flux": np.full(t.size, 1e6)})
    net = slab_chain(50e-6, 1.1)
    sol = solve_network(net, s, np.full(len(net.nodes), 300.0), SolverSettings(method="fast"))
    rise = sol.temperatures_k[:, 0] - 300.0
    np.testing.assert_allclose(rise[20:], surface_rise_semi_infinite(1e6, e, t[20:]), atol=0.2)
    assert sol.balance_rel_error < 1e-10


def test_nonlinear_network_against_radau_with_and_without_jacobian():
    s = nonlinear_schedule(1)
    T0 = np.full(3, 300.0)
    radau = solve_network(nonlinear_network(), s, T0, SolverSettings(method="Radau", rtol=1e-10, atol_k=1e-8))
    fast = solve_network(nonlinear_network(), s, T0, SolverSettings(method="fast", max_step_s=0.25))
    np.testing.assert_allclose(fast.temperatures_k, radau.temperatures_k, atol=0.02)
    assert fast.balance_rel_error < 1e-9
    numeric = solve_network(nonlinear_network(), s, T0, SolverSettings(method="fast", max_step_s=0.25,
                                                                         use_jacobian=False))
    np.testing.assert_allclose(numeric.temperatures_k, fast.temperatures_k, atol=1e-3)
    assert numeric.nfev > fast.nfev


def test_time_grid_keeps_samples_and_splits_long_intervals():
    s = Schedule(np.array([0.0, 1.0, 4.0]), {"x": np.zeros(3)})
    np.testing.assert_allclose(time_grid(s, 0.0, 4.0, np.array([0.5]), None), [0.0, 0.5, 1.0, 4.0])
    np.testing.assert_allclose(time_grid(s, 0.0, 4.0, np.array([0.0]), 1.5), [0.0, 1.0, 2.5, 4.0])
