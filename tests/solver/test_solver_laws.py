"""One description of the network's laws (``thermo.network.laws``): every implementation agrees.

The flow of each link kind with its slopes, the table interpolation and the enthalpy H(T) are
written once and used by the numpy assembler (``CompiledNetwork.flows``, its Jacobian,
``CapacityTable``, ``tabulate.lookup``), by the compiled one-configuration kernels
(``kernel._flows``, ``kernel._capacity_enthalpy``), by the lane kernel (``kernel_lanes._flows_lanes``,
``_capacity_lanes``) and by the batch's energy bookkeeping (``kernel_arrays.enthalpy``). Here all of
them are evaluated on random states of a random network and compared; the laws themselves are
checked against the Stefan-Boltzmann law and the exact integral of C(T).
"""
import math

import numpy as np
import pytest

from lapdata.units import STEFAN_BOLTZMANN
from thermo.network import Boundary, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation
from thermo.network import laws
from thermo.network.assemble import compile_network
from thermo.network.elements import REFERENCE_TEMPERATURE_K
from thermo.network.tabulate import ConductanceGrid, TabulatedConductance, lookup
from thermo.solver import kernel, kernel_arrays, kernel_lanes
from thermo.solver.kernel_arrays import KernelInputs, kernel_network

GRID = ConductanceGrid(driver_min=0.0, driver_max=60.0, driver_step=2.0, node_min_k=250.0, node_max_k=1250.0,
                       node_step_k=10.0, boundary_min_k=280.0, boundary_max_k=340.0, boundary_step_k=5.0)


def film(v, t_node, t_air):
    """A made-up convective conductance growing with speed and both temperatures [W/K]."""
    return 0.5 + 0.08 * v + 4e-4 * (t_node - 250.0) + 3e-3 * (t_air - 280.0) + 1e-6 * v * (t_node - 250.0)


def contact(v, t_node, t_other):
    """A node-to-node conductance depending on the first end only (sliced in the kernels) [W/K]."""
    return 1.5 + 2e-3 * (t_node - 250.0) + 0.0 * t_other


def random_network(rng):
    """Five nodes (c(T) tables of one to three segments, one constant), two boundaries, every link kind:
    conduction node-node and node-boundary, radiation, tabulated convection to air (two drivers, a
    scale), a tabulated node-to-node link and one with no driver."""
    def capacity(segments):
        t = np.sort(rng.uniform(250.0, 1100.0, segments + 1))
        c = rng.uniform(400.0, 1200.0, segments + 1)
        return HeatCapacity(float(rng.uniform(0.2, 5.0)), tuple(t), tuple(c))
    nodes = tuple(Node(f"n{i}", capacity(s)) for i, s in enumerate((1, 2, 3, 2))) + (
        Node("n4", HeatCapacity.constant(0.7, 900.0)),)
    film_table = TabulatedConductance.build(film, GRID)
    contact_table = TabulatedConductance.build(contact, GRID)
    links = (Conduction("k01", "n0", "n1", float(rng.uniform(0.5, 5.0))),
             Conduction("k2amb", "n2", "amb", float(rng.uniform(0.1, 1.0))),
             Radiation("r0amb", "n0", "amb", 0.8 * STEFAN_BOLTZMANN * 0.05),
             Radiation("r12", "n1", "n2", 0.3 * STEFAN_BOLTZMANN * 0.02),
             Convection("h0", "n0", "air", "speed", film_table, scale=1.7),
             Convection("h3", "n3", "air", "speed_2", film_table),
             Convection("h4", "n4", "amb", None, film_table, scale=0.4),
             Convection("c34", "n3", "n4", "speed", contact_table),
             Conduction("k23", "n2", "n3", float(rng.uniform(0.5, 5.0))))
    return Network(nodes, (Boundary("amb", "t_amb"), Boundary("air", "t_air")), links, (HeatSource("n0", "q", 1.0),))


def random_state(rng, net):
    """Node temperatures on the tables, away from cell edges (for central differences), boundaries, drivers."""
    T = rng.uniform(260.0, 1200.0, net.n_nodes)
    T = np.floor(T / 10.0) * 10.0 + rng.uniform(0.5, 9.5, net.n_nodes)
    T[4] = 280.0 + rng.uniform(0.5, 4.5) + 5.0 * rng.integers(0, 12)    # c34's second end: on the boundary axis
    return T, rng.uniform(285.0, 335.0, net.n_boundaries), rng.uniform(0.0, 58.0, len(net.driver_names))


def constant_inputs(bk, drv):
    """KernelInputs of one step with constant boundary temperatures and drivers (for the table slices)."""
    one = lambda x: np.ascontiguousarray(np.repeat(x[None, :], 2, axis=0))
    return KernelInputs(np.array([0.0, 1.0]), np.array([1.0]), one(bk), one(drv), one(bk)[:1], one(drv)[:1],
                        np.zeros((1, 1)), np.zeros((1, 1)))


def kernel_flows(kn, T, bk, drv, sliced_run=False):
    """``kernel._flows`` of configuration 0 (tables sliced along constant boundaries when asked)."""
    arrays = kn.arrays(constant_inputs(bk, drv))
    if not sliced_run:
        arrays = arrays._replace(slot_sliced=np.zeros(kn.conv_drv.size, dtype=np.bool_))
    links, _ = kernel._configuration(arrays, 0)
    L = kn.link_a.size
    f, dfa, dfb = np.empty(L), np.empty(L), np.empty(L)
    nax = drv.size + bk.size
    ok = kernel._flows(T, bk, drv, links, f, dfa, dfb, np.zeros(nax, dtype=np.int64), np.zeros(nax),
                       np.zeros(nax, dtype=np.bool_))
    assert ok
    return f, dfa, dfb, arrays.slot_sliced


def lane_arrays(kn, inputs, W):
    """``kn.arrays`` laid out as one block of W lanes, every lane configuration 0."""
    return kn.arrays(inputs, lambda x: np.ascontiguousarray(np.repeat(x[:1, ..., None], W, axis=-1)))


def lane_flows(kn, Ts, bk, drv):
    """``kernel_lanes._flows_lanes`` with one lane per row of Ts (the same configuration in each)."""
    W = Ts.shape[0]
    links, _ = kernel._configuration(lane_arrays(kn, constant_inputs(bk, drv), W), 0)
    L = kn.link_a.size
    f, dfa, dfb = np.empty((L, W)), np.empty((L, W)), np.empty((L, W))
    flag = np.zeros(W, dtype=np.bool_)
    kernel_lanes._flows_lanes(np.ascontiguousarray(Ts.T), bk, drv, links, f, dfa, dfb, flag)
    assert not flag.any()
    return f.T, dfa.T, dfb.T


@pytest.fixture(scope="module")
def case():
    rng = np.random.default_rng(18)
    net = compile_network(random_network(rng))
    return rng, net, kernel_network(net)


def test_the_random_network_runs_compiled_and_covers_every_branch(case):
    _, net, kn = case
    assert kn is not None
    kinds = set(kn.kind.tolist())
    assert kinds == {kernel.KIND_CONDUCTION, kernel.KIND_RADIATION, kernel.KIND_CONVECTION}
    assert (kn.link_b[kn.kind == kernel.KIND_CONVECTION] < kn.n_nodes).any(), "a node-to-node convection link"
    assert (kn.conv_drv < 0).any() and (kn.par[0] != 1.0).any(), "a link with no driver, a scaled link"


@pytest.mark.parametrize("sliced_run", [False, True], ids=["trilinear", "sliced"])
def test_kernel_flows_agree_with_the_assembler(case, sliced_run):
    rng, net, kn = case
    c, r, v = net.cond_idx, net.rad_idx, net.conv_idx
    for _ in range(50):
        T, bk, drv = random_state(rng, net)
        f, dfa, dfb, slot_sliced = kernel_flows(kn, T, bk, drv, sliced_run)
        if sliced_run:
            assert slot_sliced.all(), "constant boundaries, a contact table flat along its second axis"
        np.testing.assert_allclose(f, net.flows(T, bk, drv), rtol=1e-12, atol=1e-12)
        # conduction and radiation slopes: the assembler's Jacobian, entry for entry
        F = net.flow_jacobian(T, bk, drv)
        rows = np.concatenate([c, r])
        np.testing.assert_allclose(dfa[rows], F[rows, net.link_a[rows]], rtol=1e-13)
        inner = rows[net.link_b[rows] < net.n_nodes]
        np.testing.assert_allclose(dfb[inner], F[inner, net.link_b[inner]], rtol=1e-13)
        # convection: the kernel's slopes are the exact derivatives of the assembler's flows (G from the
        # table, linear within a cell, so central differences are exact to round-off)
        h = 1e-3
        for end, slopes in ((net.link_a, dfa), (net.link_b, dfb)):
            for link in v:
                node = end[link]
                if node >= net.n_nodes:
                    continue
                if sliced_run and end is net.link_b:
                    continue                        # a slice has no slope along the second end (flat there)
                up, down = T.copy(), T.copy()
                up[node] += h
                down[node] -= h
                fd = (net.flows(up, bk, drv)[link] - net.flows(down, bk, drv)[link]) / (2 * h)
                assert slopes[link] == pytest.approx(fd, rel=1e-6, abs=1e-9)


def test_lane_flows_agree_with_the_one_configuration_kernel(case):
    rng, net, kn = case
    states = [random_state(rng, net) for _ in range(8)]
    bk, drv = states[0][1], states[0][2]
    Ts = np.array([s[0] for s in states])
    lf, la, lb = lane_flows(kn, Ts, bk, drv)
    for w in range(Ts.shape[0]):
        f, dfa, dfb, _ = kernel_flows(kn, Ts[w], bk, drv, sliced_run=True)
        np.testing.assert_allclose(lf[w], f, rtol=1e-14, atol=0)
        np.testing.assert_allclose(la[w], dfa, rtol=1e-14, atol=0)
        np.testing.assert_allclose(lb[w], dfb, rtol=1e-14, atol=0)


def test_table_lookup_agrees_with_the_kernels_interpolation(case):
    rng, net, kn = case
    table = net.conv_tables[0]
    for _ in range(200):
        d, tn, tb = rng.uniform(0.0, 60.0), rng.uniform(250.0, 1250.0), rng.uniform(280.0, 340.0)
        gp = kn.gp
        i, fi, _ = kernel._axis(d, gp[0], 1.0 / gp[1], int(gp[2]))
        j, fj, _ = kernel._axis(tn, gp[3], 1.0 / gp[4], int(gp[5]))
        k, fk, _ = kernel._axis(tb, gp[6], 1.0 / gp[7], int(gp[8]))
        g, _, _ = kernel._trilinear(table[None], 0, 1.0 / gp[4], 1.0 / gp[7], i, fi, j, fj, k, fk)
        assert lookup(GRID, table[None], d, tn, tb)[0] == pytest.approx(g, rel=1e-13)
        # a trilinear table of a function linear in each axis reproduces it (the film law above is)
        assert g == pytest.approx(film(d, tn, tb), rel=1e-12)


def test_heat_capacity_and_enthalpy_agree_everywhere(case):
    rng, net, kn = case
    caps = net.capacities
    inputs = constant_inputs(np.full(net.n_boundaries, 300.0), np.zeros(len(net.driver_names)))
    _, capacities = kernel._configuration(kn.arrays(inputs), 0)
    assert capacities.t_ref == REFERENCE_TEMPERATURE_K
    href = np.empty(capacities.seg_lo.size)
    kernel._reference_ramps(capacities, href)
    for _ in range(50):
        T = rng.uniform(150.0, 1600.0, net.n_nodes)      # below, inside and beyond every c(T) table
        C, H = np.empty(net.n_nodes), np.empty(net.n_nodes)
        kernel._capacity_enthalpy(T, capacities, href, C, H, True)
        H_only = np.full(net.n_nodes, np.nan)
        kernel._capacity_enthalpy(T, capacities, href, C, H_only, False)
        np.testing.assert_array_equal(H_only, H)
        np.testing.assert_allclose(C, caps.capacity(T), rtol=1e-13)
        np.testing.assert_allclose(H, caps.enthalpy(T), rtol=1e-12, atol=1e-9)
        np.testing.assert_allclose(kernel_arrays.enthalpy(kn, 0, T), H, rtol=1e-12, atol=1e-9)
    # the lane kernel, eight lanes of different states
    Ts = rng.uniform(150.0, 1600.0, (net.n_nodes, 8))
    _, lane_capacities = kernel._configuration(lane_arrays(kn, inputs, 8), 0)
    href = np.empty(lane_capacities.seg_lo.shape)
    kernel_lanes._reference_ramps(lane_capacities, href)
    CL, HL = np.empty((net.n_nodes, 8)), np.empty((net.n_nodes, 8))
    kernel_lanes._capacity_lanes(Ts, lane_capacities, href, CL, HL, True)
    np.testing.assert_allclose(CL.T, caps.capacity(Ts.T), rtol=1e-13)
    np.testing.assert_allclose(HL.T, caps.enthalpy(Ts.T), rtol=1e-12, atol=1e-9)


def test_enthalpy_is_the_exact_integral_of_the_heat_capacity(case):
    # H(T2) - H(T1) = integral of C(T) dT (definition of enthalpy at constant pressure); the integral
    # here by composite Simpson on a fine grid, exact for the piecewise quadratic H up to the kinks
    rng, net, _ = case
    caps = net.capacities
    for _ in range(5):
        t1, t2 = sorted(rng.uniform(200.0, 1500.0, 2))
        x = np.linspace(t1, t2, 20001)
        c = caps.capacity(np.repeat(x[:, None], net.n_nodes, axis=1))
        w = np.ones(x.size)
        w[1:-1:2], w[2:-1:2] = 4.0, 2.0
        integral = (x[1] - x[0]) / 3.0 * (w @ c)
        dH = caps.enthalpy(np.full(net.n_nodes, t2)) - caps.enthalpy(np.full(net.n_nodes, t1))
        np.testing.assert_allclose(dH, integral, rtol=1e-6)


def test_compiled_laws_are_the_numpy_laws():
    rng = np.random.default_rng(7)
    a, b, c, d = (rng.uniform(-2.0, 3.0, 40) for _ in range(4))
    ta, tb = rng.uniform(250.0, 1300.0, 40), rng.uniform(250.0, 1300.0, 40)
    fr = rng.uniform(0.0, 1.0, (3, 40))
    corners = rng.uniform(0.0, 5.0, (8, 40))
    cases = ((laws.conduction_flow, kernel.conduction_flow, (a, ta, tb)),
             (laws.radiation_flow, kernel.radiation_flow, (a * 1e-9, ta, tb)),
             (laws.convection_flow, kernel.convection_flow, (a, b, c, d, ta, tb)),
             (laws.bilinear, kernel.bilinear, (*corners[:4], fr[0], fr[1])),
             (laws.trilinear, kernel.trilinear, (*corners, *fr)),
             (laws.trilinear_slope_k, kernel.trilinear_slope_k, (*corners, fr[0], fr[1])),
             (laws.capacity_segment, kernel.capacity_segment, (ta, np.minimum(tb, ta + 100.0), tb + 50.0)))
    for numpy_law, compiled_law, args in cases:
        whole = numpy_law(*args)
        for e in range(40):
            one = compiled_law(*(float(x[e]) for x in args))
            whole_e = [float(np.broadcast_to(w, (40,))[e]) for w in (whole if isinstance(whole, tuple) else (whole,))]
            np.testing.assert_allclose(one, whole_e if isinstance(whole, tuple) else whole_e[0], rtol=1e-15)


def test_radiation_law_is_stefan_boltzmann():
    # black surface of 1 m^2 at 1000 K facing surroundings at 300 K: q = sigma (T1^4 - T2^4)
    # = 5.670374419e-8 x (1e12 - 8.1e9) = 56 244 W (Stefan-Boltzmann law; sigma CODATA 2018)
    f, dfa, dfb = laws.radiation_flow(STEFAN_BOLTZMANN, 1000.0, 300.0)
    assert f == pytest.approx(5.670374419e-8 * (1000.0 ** 4 - 300.0 ** 4), rel=1e-12)
    assert f == pytest.approx(56244.0, abs=1.0)
    assert dfa == pytest.approx(4 * STEFAN_BOLTZMANN * 1000.0 ** 3, rel=1e-14)
    assert dfb == pytest.approx(-4 * STEFAN_BOLTZMANN * 300.0 ** 3, rel=1e-14)
    # conduction through a plane wall, Fourier's law q = k A dT / L: k 50 W/(m K), A 0.01 m^2, L 0.02 m
    f, _, _ = laws.conduction_flow(50.0 * 0.01 / 0.02, 400.0, 300.0)
    assert f == pytest.approx(2500.0, rel=1e-14)
    assert math.isclose(laws.capacity_segment(500.0, 300.0, 400.0)[1], 0.5 * 100.0 ** 2 + 100.0 * 100.0)
