"""Compiled network: flows, right-hand side and Jacobian against hand balances and finite differences."""
import numpy as np
import pytest

from lapdata.units import STEFAN_BOLTZMANN
from thermo.errors import ModelError
from thermo.network import (
    Boundary, CapacityTable, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation,
    Schedule, compile_network,
)


def g_of_speed(v, T_node, T_boundary):
    """A made-up forced-convection conductance, G = 2 + 0.5 v [W/K] (test input, not a correlation)."""
    return 2.0 + 0.5 * v


def g_of_temperature(v, T_node, T_boundary):
    """A made-up conductance rising with the film temperature [W/K] (test input)."""
    return 1.0 + 0.01 * (0.5 * (T_node + T_boundary) - 300.0)


def three_node_network(convection=g_of_speed):
    caps = (HeatCapacity(3.0, (300.0, 800.0), (450.0, 650.0)), HeatCapacity.constant(1.0, 900.0),
            HeatCapacity.constant(0.5, 2000.0))
    nodes = tuple(Node(n, c) for n, c in zip(("hot", "mid", "cold"), caps))
    links = (
        Conduction("hot_mid", "hot", "mid", 4.0, group="conduction"),
        Conduction("mid_cold", "mid", "cold", 1.5),
        Radiation("hot_amb", "hot", "amb", 0.8 * STEFAN_BOLTZMANN * 0.05),
        Radiation("hot_cold", "hot", "cold", 0.3 * STEFAN_BOLTZMANN * 0.02),
        Convection("mid_air", "mid", "air", "speed", convection),
        Conduction("cold_amb", "cold", "amb", 0.7),
    )
    return Network(nodes, (Boundary("amb", "t_amb"), Boundary("air", "t_air")), links,
                   (HeatSource("hot", "power", 0.9), HeatSource("mid", "power", 0.1)))


def schedule():
    t = np.array([0.0, 10.0, 20.0])
    return Schedule(t, {"power": np.array([0.0, 5000.0, 0.0]), "t_amb": np.full(3, 300.0),
                        "t_air": np.array([305.0, 310.0, 305.0]), "speed": np.array([10.0, 40.0, 20.0])})


T_TEST = np.array([700.0, 450.0, 380.0])


def test_flows_match_hand_formulas():
    net = compile_network(three_node_network())
    f = net.flows(T_TEST, [300.0, 310.0], [40.0])
    # conduction q = G dT and radiation q = c (Ta^4 - Tb^4): Incropera, Fundamentals of Heat and Mass
    # Transfer, 6th ed., eqs. 3.1-3.6 (thermal resistance) and 1.7 (grey-body exchange)
    expected = [4.0 * 250.0, 1.5 * 70.0, 0.8 * STEFAN_BOLTZMANN * 0.05 * (700.0 ** 4 - 300.0 ** 4),
                0.3 * STEFAN_BOLTZMANN * 0.02 * (700.0 ** 4 - 380.0 ** 4), (2.0 + 0.5 * 40.0) * (450.0 - 310.0),
                0.7 * 80.0]
    np.testing.assert_allclose(f, expected, rtol=1e-13)


def test_rhs_is_the_node_energy_balance():
    cn = compile_network(three_node_network())
    s = schedule()
    t = 10.0
    f = dict(zip(cn.link_names, cn.flows(T_TEST, [300.0, 310.0], [40.0])))
    # first law for each lumped node: C dT/dt = sources + inflows - outflows (Incropera eq. 1.12c)
    C = [3.0 * np.interp(700.0, [300, 800], [450, 650]), 900.0, 1000.0]
    hand = [(0.9 * 5000.0 - f["hot_mid"] - f["hot_amb"] - f["hot_cold"]) / C[0],
            (0.1 * 5000.0 + f["hot_mid"] - f["mid_cold"] - f["mid_air"]) / C[1],
            (f["mid_cold"] + f["hot_cold"] - f["cold_amb"]) / C[2]]
    np.testing.assert_allclose(cn.rhs(t, T_TEST, s), hand, rtol=1e-13)


def central_difference_jacobian(fun, T, step=1e-4):
    """Central differences, error O(step^2) (Nocedal & Wright, Numerical Optimization, 2006, sec. 8.1)."""
    J = np.empty((T.size, T.size))
    for j in range(T.size):
        d = np.zeros(T.size)
        d[j] = step
        J[:, j] = (fun(T + d) - fun(T - d)) / (2 * step)
    return J


@pytest.mark.parametrize("t", [5.0, 10.0, 17.0])
def test_jacobian_matches_finite_differences(t):
    cn = compile_network(three_node_network())
    s = schedule()
    J = cn.jacobian(t, T_TEST, s)
    J_fd = central_difference_jacobian(lambda T: cn.rhs(t, T, s), T_TEST)
    np.testing.assert_allclose(J, J_fd, rtol=1e-7, atol=1e-10)
    assert np.all(cn.jacobian_sparsity() | (np.abs(J) == 0.0))


def test_sparsity_of_a_chain_is_tridiagonal():
    nodes = tuple(Node(f"n{i}", HeatCapacity.constant(1.0, 100.0)) for i in range(5))
    links = tuple(Conduction(f"k{i}", f"n{i}", f"n{i + 1}", 1.0) for i in range(4))
    cn = compile_network(Network(nodes, (Boundary("amb", "t"),), links + (Conduction("out", "n4", "amb", 1.0),)))
    expected = np.abs(np.subtract.outer(np.arange(5), np.arange(5))) <= 1
    np.testing.assert_array_equal(cn.jacobian_sparsity(), expected)
    J = cn.jacobian(0.0, np.full(5, 300.0), Schedule.constant(0.0, 1.0, {"t": 300.0}))
    np.testing.assert_array_equal(J != 0.0, expected)


def test_jacobian_leaves_out_only_the_temperature_dependence_of_convection():
    cn = compile_network(three_node_network(convection=g_of_temperature))
    s = schedule()
    J = cn.jacobian(10.0, T_TEST, s)
    J_fd = central_difference_jacobian(lambda T: cn.rhs(10.0, T, s), T_TEST)
    # the missing term, by the product rule: d/dT_mid [G(T) (T_mid - T_air)] - G = dG/dT (T_mid - T_air)
    missing = 0.01 * 0.5 * (450.0 - 310.0) / 900.0
    assert J_fd[1, 1] - J[1, 1] == pytest.approx(-missing, rel=1e-6)
    mask = np.ones_like(J, dtype=bool)
    mask[1, 1] = False
    np.testing.assert_allclose(J[mask], J_fd[mask], rtol=1e-7, atol=1e-10)


def test_flows_vectorised_over_time_equal_row_by_row():
    cn = compile_network(three_node_network())
    T = np.array([T_TEST, T_TEST + 20.0, T_TEST - 30.0])
    B = np.array([[300.0, 310.0], [301.0, 305.0], [299.0, 320.0]])
    V = np.array([[40.0], [0.0], [12.0]])
    rows = np.array([cn.flows(T[i], B[i], V[i]) for i in range(3)])
    np.testing.assert_allclose(cn.flows(T, B, V), rows, rtol=1e-14)


@pytest.mark.parametrize("drop, role", [
    ("t_air", "boundary 'air'"), ("speed", "driver of convection link 'mid_air'"), ("power", "heat source"),
])
def test_missing_signal_is_named(drop, role):
    cn = compile_network(three_node_network())
    full = schedule()
    s = Schedule(full.time_s, {k: v for k, v in full.signals.items() if k != drop})
    with pytest.raises(ModelError, match=f"lacks signal '{drop}'.*{role}"):
        cn.rhs(1.0, T_TEST, s)


def test_link_to_itself_and_bad_conductance_rejected():
    n = (Node("a", HeatCapacity.constant(1.0, 1.0)),)
    with pytest.raises(ModelError, match="joins 'a' to itself"):
        compile_network(Network(n, (), (Conduction("loop", "a", "a", 1.0),)))
    bad = Network(n, (Boundary("amb", "t"),), (Convection("c", "a", "amb", None, lambda v, a, b: -1.0 + 0 * a),))
    with pytest.raises(ModelError, match="convection link 'c'"):
        compile_network(bad).flows(np.array([300.0]), [300.0], [])


def test_capacity_table_equals_heat_capacity():
    caps = [HeatCapacity(2.0, (300.0, 500.0, 900.0), (450.0, 600.0, 700.0)), HeatCapacity.constant(1.5, 900.0),
            HeatCapacity(0.3, (250.0, 400.0), (1000.0, 1500.0))]
    table = CapacityTable(caps)
    T = np.array([[200.0, 290.0, 260.0], [400.0, 300.0, 350.0], [1000.0, 800.0, 450.0], [350.0, 200.0, 320.0]])
    for fn in ("capacity", "capacity_slope", "enthalpy"):
        ref = np.array([[getattr(c, fn)(x) for c, x in zip(caps, row)] for row in T])
        np.testing.assert_allclose(getattr(table, fn)(T), ref, rtol=1e-12, atol=1e-9)
        np.testing.assert_allclose(getattr(table, fn)(T[1]), ref[1], rtol=1e-12, atol=1e-9)
    # enthalpy is the integral of capacity: check one value by hand, trapezoid of c on 300..400 K
    assert table.enthalpy(np.array([400.0, 293.15, 293.15]))[0] == pytest.approx(
        2.0 * (450.0 * 6.85 + 0.5 * (450.0 + 525.0) * 100.0), rel=1e-12)
