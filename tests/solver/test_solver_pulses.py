"""Short heat pulses: the edge restarts must see every one of them."""
import numpy as np
import pytest

from solver_oracles import linear_piecewise_exact
from thermo.network import Boundary, Conduction, HeatCapacity, HeatSource, Network, Node, Schedule
from thermo.solver import SolverSettings, solve_network


def pulse_train(n_pulses, period_s, pulse_s, power_w, ramp_s, lead_s=10.0, ambient_k=300.0):
    """Trapezoidal pulses sampled only at their corners: long quiet gaps have no samples inside."""
    t, q = [0.0], [0.0]
    for i in range(n_pulses):
        t0 = lead_s + i * period_s
        t += [t0, t0 + ramp_s, t0 + pulse_s - ramp_s, t0 + pulse_s]
        q += [0.0, power_w, power_w, 0.0]
    t.append(lead_s + n_pulses * period_s)
    q.append(0.0)
    t = np.array(t)
    return Schedule(t, {"q": np.array(q), "t_amb": np.full(t.size, ambient_k)})


def pulse_peaks(sol_time, temps, schedule, pulse_s, period_s, n_pulses, lead_s=10.0):
    """Temperature at the end of each pulse (where a lumped node peaks)."""
    ends = lead_s + np.arange(n_pulses) * period_s + pulse_s
    return temps[np.searchsorted(sol_time, ends)]


def test_repeated_pulses_follow_newcomb_geometric_series():
    # Newcomb, J. Mech. Eng. Sci. 2 (1960): after the n-th of identical short stops with cooling between,
    # theta_n = dT (1 - exp(-n beta)) / (1 - exp(-beta)), beta = hA t_c / (m c)
    C, G, period, pulse, n = 1000.0, 10.0, 60.0, 0.5, 12
    net = Network((Node("m", HeatCapacity.constant(2.0, 500.0)),), (Boundary("amb", "t_amb"),),
                  (Conduction("h", "m", "amb", G),), (HeatSource("m", "q"),))
    s = pulse_train(n, period, pulse, 2e5, 1e-3)
    sol = solve_network(net, s, [300.0], SolverSettings())
    peaks = pulse_peaks(sol.time_s, sol.temperatures_k[:, 0], s, pulse, period, n) - 300.0
    dT = s.integral("q", 10.0, 10.0 + pulse) / C
    beta = G * period / C
    k = np.arange(1, n + 1)
    newcomb = dT * (1 - np.exp(-k * beta)) / (1 - np.exp(-beta))
    # finite pulses cool a little while heating: relative effect ~ G pulse / (2 C) = 0.25 %
    np.testing.assert_allclose(peaks, newcomb, rtol=5e-3)
    # the same train solved exactly (Van Loan 1978 augmented exponential, see solver_oracles)
    exact = linear_piecewise_exact([[-G / C]], lambda t: [(s.value("q", t) + G * 300.0) / C], s.time_s, [300.0])
    np.testing.assert_allclose(sol.temperatures_k[:, 0], exact[:, 0], atol=5e-3)


def two_node_body():
    """A thin hot skin on a thick body: the skin spikes in each pulse, the body soaks the heat up."""
    nodes = (Node("skin", HeatCapacity.constant(0.5, 500.0)), Node("body", HeatCapacity.constant(6.0, 500.0)))
    links = (Conduction("skin_body", "skin", "body", 60.0), Conduction("skin_amb", "skin", "amb", 2.0),
             Conduction("body_amb", "body", "amb", 8.0))
    A = np.array([[-(60.0 + 2.0) / 250.0, 60.0 / 250.0], [60.0 / 3000.0, -(60.0 + 8.0) / 3000.0]])
    return Network(nodes, (Boundary("amb", "t_amb"),), links, (HeatSource("skin", "q"),)), A


PERIOD, PULSE, N = 90.0, 2.0, 25


def stint_reference(s, A):
    b = lambda t: [(s.value("q", t) + 2.0 * 300.0) / 250.0, 8.0 * 300.0 / 3000.0]
    return linear_piecewise_exact(A, b, s.time_s, [300.0, 300.0])


def test_a_stint_in_one_call_sees_every_pulse():
    net, A = two_node_body()
    s = pulse_train(N, PERIOD, PULSE, 6e4, 0.2)
    exact = stint_reference(s, A)
    sol = solve_network(net, s, [300.0, 300.0], SolverSettings())
    np.testing.assert_allclose(sol.time_s, s.time_s)
    peaks = pulse_peaks(sol.time_s, sol.temperatures_k[:, 0], s, PULSE, PERIOD, N)
    exact_peaks = pulse_peaks(s.time_s, exact[:, 0], s, PULSE, PERIOD, N)
    assert exact_peaks.max() - 300.0 > 300.0, "pulses heat the skin by hundreds of kelvin"
    np.testing.assert_allclose(peaks, exact_peaks, atol=0.05)
    np.testing.assert_allclose(sol.temperatures_k, exact, atol=0.05)
    assert sol.balance_rel_error < 1e-6
    # the pitfall the restarts exist for: one adaptive run over the whole stint steps over the pulses
    naive = solve_network(net, s, [300.0, 300.0], SolverSettings(restart_at_edges=False))
    naive_peaks = pulse_peaks(naive.time_s, naive.temperatures_k[:, 0], s, PULSE, PERIOD, N)
    assert np.max(np.abs(naive_peaks - exact_peaks)) > 100.0


@pytest.mark.parametrize("method", ["LSODA", "BDF", "Radau"])
def test_halving_tolerances_moves_peaks_less_than_stated_accuracy(method):
    # stated accuracy of the default tolerances (README): peaks within 0.05 K of the exact solution
    net, A = two_node_body()
    s = pulse_train(5, PERIOD, PULSE, 6e4, 0.2)
    exact = pulse_peaks(s.time_s, stint_reference(s, A)[:, 0], s, PULSE, PERIOD, 5)
    runs = []
    for scale in (1.0, 0.5):
        st = SolverSettings(method=method, rtol=1e-6 * scale, atol_k=1e-4 * scale)
        sol = solve_network(net, s, [300.0, 300.0], st)
        runs.append(pulse_peaks(sol.time_s, sol.temperatures_k[:, 0], s, PULSE, PERIOD, 5))
    assert np.max(np.abs(runs[0] - runs[1])) < 0.05
    assert np.max(np.abs(runs[0] - exact)) < 0.05
