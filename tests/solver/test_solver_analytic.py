"""The solvers against analytic solutions of textbook RC networks."""
import numpy as np
import pytest
from scipy.linalg import expm

from thermo.network import Boundary, Conduction, HeatCapacity, HeatSource, Network, Node, Schedule
from thermo.solver import SolverSettings, solve_network

SCIPY_METHODS = ("LSODA", "BDF", "Radau", "RK45")


def lumped_network(mass=2.0, c=500.0, hA=10.0):
    return Network((Node("m", HeatCapacity.constant(mass, c)),), (Boundary("amb", "t_amb"),),
                   (Conduction("h", "m", "amb", hA),))


@pytest.mark.parametrize("method", SCIPY_METHODS)
def test_lumped_cooling_error_within_requested_tolerance(method):
    # lumped capacitance: T - T_inf = (T0 - T_inf) exp(-t hA/(m c)); Incropera, Fundamentals of Heat
    # and Mass Transfer, 6th ed. (2007), eq. 5.6
    t = np.linspace(0.0, 300.0, 31)
    s = Schedule(t, {"t_amb": np.full(t.size, 300.0)})
    exact = 300.0 + 300.0 * np.exp(-t * 10.0 / (2.0 * 500.0))
    errors = []
    for rtol in (1e-4, 1e-6, 1e-8):
        atol = 100.0 * rtol
        sol = solve_network(lumped_network(), s, [600.0], SolverSettings(method=method, rtol=rtol, atol_k=atol))
        err = np.max(np.abs(sol.temperatures_k[:, 0] - exact))
        assert err < 5.0 * (atol + rtol * 600.0), (rtol, err)
        errors.append(err)
    assert errors[2] < errors[0] / 100.0
    np.testing.assert_allclose(sol.time_s, t)


def test_two_node_rc_network_against_matrix_exponential():
    # linear ODE dT/dt = A T + b, exact T(t) = T_ss + expm(A t) (T0 - T_ss) (linear ODE theory;
    # the oracle is scipy.linalg.expm)
    C1, C2, G1, G12, G2, q = 4000.0, 900.0, 3.0, 12.0, 1.5, 800.0
    net = Network((Node("a", HeatCapacity.constant(8.0, 500.0)), Node("b", HeatCapacity.constant(1.0, 900.0))),
                  (Boundary("amb", "t_amb"),),
                  (Conduction("a_amb", "a", "amb", G1), Conduction("a_b", "a", "b", G12),
                   Conduction("b_amb", "b", "amb", G2)),
                  (HeatSource("a", "q"),))
    A = np.array([[-(G1 + G12) / C1, G12 / C1], [G12 / C2, -(G12 + G2) / C2]])
    b = np.array([(q + G1 * 300.0) / C1, G2 * 300.0 / C2])
    T_ss = np.linalg.solve(A, -b)
    T0 = np.array([350.0, 500.0])
    t = np.linspace(0.0, 2000.0, 41)
    exact = np.array([T_ss + expm(A * ti) @ (T0 - T_ss) for ti in t])
    s = Schedule(t, {"t_amb": np.full(t.size, 300.0), "q": np.full(t.size, q)})
    for method in ("LSODA", "BDF", "Radau"):
        sol = solve_network(net, s, T0, SolverSettings(method=method, rtol=1e-8, atol_k=1e-6))
        np.testing.assert_allclose(sol.temperatures_k, exact, atol=2e-4)
        assert sol.balance_rel_error < 1e-8
        # heat in is exact: q x duration
        assert sol.heat_in_j == pytest.approx(q * 2000.0, rel=1e-8)


def test_series_resistances_reach_the_thermal_circuit_steady_state():
    # series thermal circuit: q = (T1 - T_inf)/R_tot, R_tot = sum R_i (Incropera, 6th ed., ch. 3,
    # eqs. 3.12 and 3.19); small capacities make it stiff
    R = np.array([0.02, 0.05, 0.1])
    q = 1500.0
    nodes = tuple(Node(n, HeatCapacity.constant(m, 500.0)) for n, m in (("n1", 0.01), ("n2", 5.0), ("n3", 0.2)))
    links = (Conduction("r1", "n1", "n2", 1 / R[0]), Conduction("r2", "n2", "n3", 1 / R[1]),
             Conduction("r3", "n3", "amb", 1 / R[2]))
    net = Network(nodes, (Boundary("amb", "t_amb"),), links, (HeatSource("n1", "q"),))
    t = np.array([0.0, 1e4])
    s = Schedule(t, {"t_amb": np.full(2, 300.0), "q": np.full(2, q)})
    expected = 300.0 + q * np.array([R.sum(), R[1:].sum(), R[2]])
    for method in ("LSODA", "BDF", "Radau"):
        sol = solve_network(net, s, np.full(3, 300.0), SolverSettings(method=method))
        np.testing.assert_allclose(sol.final_k, expected, atol=1e-3)
        np.testing.assert_allclose(sol.link_flows_w[-1], q, rtol=1e-6)
        assert sol.nfev < 2000, "stiff case: a stiff integrator needs only a few hundred evaluations"


def slab_chain(first_thickness, growth, depth=0.05, k=51.0, rho=7100.0, c=499.0):
    """A 1-D solid as a chain of layers, nodes at layer faces (vertex-centred finite volumes)."""
    x = [0.0]
    h = first_thickness
    while x[-1] < depth:
        x.append(x[-1] + h)
        h *= growth
    x = np.array(x)
    dx = np.diff(x)
    volume = np.zeros(x.size)
    volume[:-1] += dx / 2
    volume[1:] += dx / 2
    nodes = tuple(Node(f"n{i}", HeatCapacity.constant(rho * v, c)) for i, v in enumerate(volume))
    links = tuple(Conduction(f"k{i}", f"n{i}", f"n{i + 1}", k / d) for i, d in enumerate(dx))
    return Network(nodes, (), links, (HeatSource("n0", "flux"),))


def surface_rise_semi_infinite(q, e, t):
    """Constant flux q into a semi-infinite solid: T_s - T_i = 2 q sqrt(t/pi) / e.

    Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed. (1959), sec. 2.9; Incropera, 6th ed.,
    Table 5.1 case 3.
    """
    return 2.0 * q * np.sqrt(t / np.pi) / e


def test_constant_flux_semi_infinite_solid_with_graded_layers():
    e = np.sqrt(51.0 * 7100.0 * 499.0)
    # computed check value of the closed form (PHYSICS.md, sec. 2): q = 1 MW/m2, e = 13 440, 4 s -> 167.9 K
    assert surface_rise_semi_infinite(1e6, 13440.0, 4.0) == pytest.approx(167.9, abs=0.05)
    t = np.linspace(0.0, 4.0, 41)      # 4 s << L^2/alpha = 174 s for the 50 mm depth
    s = Schedule(t, {"flux": np.full(t.size, 1e6)})   # per square metre of surface
    errors = []
    for first, growth in ((200e-6, 1.2), (50e-6, 1.1)):
        net = slab_chain(first, growth)
        sol = solve_network(net, s, np.full(len(net.nodes), 300.0), SolverSettings(method="BDF"))
        rise = sol.temperatures_k[:, 0] - 300.0
        exact = surface_rise_semi_infinite(1e6, e, t)
        errors.append(np.max(np.abs(rise[10:] - exact[10:])))   # from 1 s on
        assert sol.balance_rel_error < 1e-9
    assert errors[1] < 0.15, "fine graded layers resolve the surface to 0.1 %"
    assert errors[1] < errors[0] / 2, "refining the layers must reduce the error"
