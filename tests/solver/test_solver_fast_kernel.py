"""The compiled 'fast' kernel: same scheme as the numpy stepper, against Radau, on the demo corner."""
import numpy as np
import pytest

from lapdata.units import STEFAN_BOLTZMANN
from test_solver_methods import film_conductance, nonlinear_schedule
from thermo.network import Boundary, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation
from thermo.network.assemble import compile_network
from thermo.network.tabulate import ConductanceGrid, TabulatedConductance
from thermo.solver import SolverSettings, solve_network
from thermo.solver import fast
from thermo.solver.batch import kernel_network

GRID = ConductanceGrid(driver_min=0.0, driver_max=80.0, driver_step=1.0, node_min_k=250.0, node_max_k=1200.0,
                       node_step_k=10.0, boundary_min_k=290.0, boundary_max_k=340.0, boundary_step_k=5.0)


def tabulated_network(grid=GRID):
    """Radiation, c(T) tables and tabulated speed- and temperature-dependent convection."""
    hot = HeatCapacity(4.0, (300.0, 600.0, 1000.0), (460.0, 560.0, 700.0))
    mid = HeatCapacity(1.2, (300.0, 500.0), (880.0, 960.0))
    nodes = (Node("hot", hot), Node("mid", mid), Node("cool", HeatCapacity.constant(0.4, 2100.0)))
    links = (Convection("hot_air", "hot", "air", "speed", TabulatedConductance.build(film_conductance, grid)),
             Radiation("hot_amb", "hot", "amb", 0.7 * STEFAN_BOLTZMANN * 0.08),
             Conduction("hot_mid_k", "hot", "mid", 2.5), Conduction("mid_cool", "mid", "cool", 0.6),
             Convection("mid_air", "mid", "air", "speed",
                        TabulatedConductance.build(lambda v, a, b: 0.1 + 0.05 * v + 0.0 * a, grid)),
             Conduction("cool_amb", "cool", "amb", 0.3))
    return Network(nodes, (Boundary("amb", "t_amb"), Boundary("air", "t_air")), links,
                   (HeatSource("hot", "q", 0.95), HeatSource("mid", "q", 0.05)))


def test_kernel_runs_tabulated_networks_and_matches_the_numpy_stepper():
    net = compile_network(tabulated_network())
    assert kernel_network(net) is not None, "a network tabulated on one grid must run compiled"
    s = nonlinear_schedule(2)
    T0 = np.full(3, 300.0)
    st = SolverSettings(method="fast", max_step_s=0.25)
    sol = solve_network(net, s, T0, st)
    grid = fast.time_grid(s, s.t_start_s, s.t_end_s, sol.time_s, st.max_step_s)
    ref = fast._integrate_numpy(net, s, T0, st, grid, sol.time_s, "numpy")
    assert sol.temperatures_k.max() > 600.0
    # one scheme, two implementations: they differ only by the Newton stopping point (1e-4 K tolerance)
    np.testing.assert_allclose(sol.temperatures_k, ref.temperatures_k, atol=2e-4)
    np.testing.assert_allclose(sol.link_flows_w, ref.link_flows_w, rtol=1e-5, atol=1e-3)
    # heat in = stored + lost to the Newton residual: the iteration stops once the corrections still
    # to come are within 1 % of atol_k + rtol |T| (kernel.newton_converged), about 1e-7 of the heat
    assert sol.balance_rel_error < 1e-6
    assert sol.nfev < ref.nfev, "the kernel's simplified Newton needs fewer flow evaluations"


def test_kernel_against_tight_radau():
    net = tabulated_network()
    s = nonlinear_schedule(3)
    T0 = np.full(3, 300.0)
    radau = solve_network(net, s, T0, SolverSettings(method="Radau", rtol=1e-10, atol_k=1e-8))
    sol = solve_network(net, s, T0, SolverSettings(method="fast", max_step_s=0.25))
    # issue 8: peaks within 0.05 K of the tight reference
    np.testing.assert_allclose(sol.temperatures_k, radau.temperatures_k, atol=0.05)
    assert abs(sol.temperatures_k[:, 0].max() - radau.temperatures_k[:, 0].max()) < 0.02


def test_state_off_the_tables_falls_back_to_the_exact_functions():
    small = ConductanceGrid(driver_min=0.0, driver_max=80.0, driver_step=2.0, node_min_k=250.0, node_max_k=500.0,
                            node_step_k=10.0, boundary_min_k=290.0, boundary_max_k=340.0, boundary_step_k=10.0)
    net = compile_network(tabulated_network(small))
    s = nonlinear_schedule(1)
    T0 = np.full(3, 300.0)     # the pulse takes 'hot' above 500 K, off the node axis
    sol = solve_network(net, s, T0, SolverSettings(method="fast", max_step_s=0.25))
    exact = solve_network(compile_network(tabulated_network(GRID)), s, T0, SolverSettings(method="fast", max_step_s=0.25))
    assert sol.temperatures_k[:, 0].max() > 550.0
    # the coarse table is used below 500 K and the exact film_conductance above it
    np.testing.assert_allclose(sol.temperatures_k, exact.temperatures_k, atol=0.5)
    # heat in = stored + lost to the Newton residual: the iteration stops once the corrections still
    # to come are within 1 % of atol_k + rtol |T| (kernel.newton_converged), about 1e-7 of the heat
    assert sol.balance_rel_error < 1e-6


@pytest.fixture(scope="module")
def demo_lap():
    from thermo.chain.settle import lap_setup
    from thermo.scenario import load_scenario
    from thermo.bench import _demo_path
    return lap_setup(load_scenario(_demo_path()), "front")


def test_demo_corner_braking_zones_against_radau(demo_lap):
    _, model, net, s, _ = demo_lap
    t1 = s.t_start_s + 30.0        # the first braking zones of the demo lap, from hot
    T0 = np.linspace(700.0, 330.0, net.n_nodes)
    radau = solve_network(net, s, T0, SolverSettings(method="Radau", rtol=1e-9, atol_k=1e-7), t_end=t1)
    sol = solve_network(net, s, T0, SolverSettings(method="fast"), t_end=t1)
    assert sol.method == "fast" and sol.njev < 2 * sol.time_s.size
    out_f, out_r = model.outputs(sol.temperatures_k), model.outputs(radau.temperatures_k)
    assert out_r[:, model.output_nodes.index("disc_surface")].max() > 720.0
    # issue 8 target: peaks within 0.05 K of a tight-tolerance Radau reference
    np.testing.assert_allclose(out_f.max(axis=0), out_r.max(axis=0), atol=0.05)
    # mid-rise, on the 0.05 s sample grid, the second-order scheme lags the friction faces (first
    # layers of 1.1 mm of iron and 0.34 mm of pad, chosen from the penetration depth) by up to
    # ~2.8 K (measured on the pad face, 0.4 %); every other output by less than 0.3 K
    np.testing.assert_allclose(out_f, out_r, atol=3.5)
    faces = [model.output_nodes.index(n) for n in ("disc_surface", "pad_surface")]
    others = [i for i in range(len(model.output_nodes)) if i not in faces]
    np.testing.assert_allclose(out_f[:, others], out_r[:, others], atol=0.3)
    # heat in = stored + lost to the Newton residual: the iteration stops once the corrections still
    # to come are within 1 % of atol_k + rtol |T| (kernel.newton_converged), about 1e-7 of the heat
    assert sol.balance_rel_error < 1e-6


def test_kernel_runs_as_plain_python_without_the_jit():
    # the package must work (slowly) with numba's JIT disabled; exact: Incropera eq. 5.6
    import subprocess
    import sys
    code = ("import numpy as np\n"
            "from thermo.network import Boundary, Conduction, HeatCapacity, Network, Node, Schedule\n"
            "from thermo.solver import SolverSettings, solve_network\n"
            "net = Network((Node('m', HeatCapacity.constant(2.0, 500.0)),), (Boundary('amb', 't_amb'),),"
            " (Conduction('h', 'm', 'amb', 10.0),))\n"
            "t = np.linspace(0.0, 300.0, 61)\n"
            "sol = solve_network(net, Schedule(t, {'t_amb': np.full(t.size, 300.0)}), [600.0],"
            " SolverSettings(method='fast'))\n"
            "print(np.max(np.abs(sol.temperatures_k[:, 0] - 300.0 - 300.0 * np.exp(-t / 100.0))))\n")
    env = {**__import__("os").environ, "NUMBA_DISABLE_JIT": "1"}
    out = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True, timeout=120)
    assert out.returncode == 0, out.stderr
    assert float(out.stdout.strip()) < 0.05     # 5 s steps, second order: measured 0.006 K


def test_newton_stops_on_the_rate_of_its_corrections():
    # the stopping rule of the simplified Newton iteration (Hairer & Wanner, Solving ODEs II, 2nd ed.
    # 1996, IV.8): with corrections shrinking at the rate theta, those still to come sum to at most
    # theta / (1 - theta) times the last (a geometric series)
    from thermo.solver.kernel import NEWTON_RATE_TOLERANCE, NEWTON_TOLERANCE, newton_converged
    assert newton_converged(0.9 * NEWTON_TOLERANCE, np.inf, 0)
    assert not newton_converged(2.0 * NEWTON_TOLERANCE, np.inf, 0)          # no rate known yet
    last = 0.5
    for theta in (0.002, 0.01, 0.05):
        e = 0.99 * NEWTON_RATE_TOLERANCE * (1 - theta) / theta          # the remainder just within
        assert e > NEWTON_TOLERANCE                                      # the plain test alone would go on
        assert newton_converged(e, e / theta, 1)
        assert not newton_converged(1.02 * e, 1.02 * e / theta, 1)
    assert not newton_converged(2 * last, last, 2)                        # diverging: never on the rate
