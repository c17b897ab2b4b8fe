"""Integrators agree, close the energy balance, use the Jacobian, and fail loudly."""
import numpy as np
import pytest

import thermo.solver.scipy_solve as scipy_solve
from lapdata.units import STEFAN_BOLTZMANN
from test_solver_analytic import slab_chain
from test_solver_pulses import pulse_train
from thermo.errors import ModelError, SolveError
from thermo.network import (
    Boundary, Conduction, Convection, HeatCapacity, HeatSource, Network, Node, Radiation, Schedule,
)
from thermo.solver import SolverSettings, solve_network


def film_conductance(speed, T_node, T_air):
    """Made-up conductance rising with speed and film temperature [W/K] (test input, not a correlation)."""
    return (3.0 + 0.8 * speed ** 0.8) * (1.0 + 2e-4 * (0.5 * (T_node + T_air) - 300.0))


def nonlinear_network():
    """Radiation, c(T) tables and a speed- and temperature-dependent convection."""
    hot = HeatCapacity(4.0, (300.0, 600.0, 1000.0), (460.0, 560.0, 700.0))
    mid = HeatCapacity(1.2, (300.0, 500.0), (880.0, 960.0))
    nodes = (Node("hot", hot), Node("mid", mid), Node("cool", HeatCapacity.constant(0.4, 2100.0)))
    links = (Convection("hot_air", "hot", "air", "speed", film_conductance),
             Radiation("hot_amb", "hot", "amb", 0.7 * STEFAN_BOLTZMANN * 0.08),
             Radiation("hot_mid", "hot", "mid", 0.2 * STEFAN_BOLTZMANN * 0.02),
             Conduction("hot_mid_k", "hot", "mid", 2.5), Conduction("mid_cool", "mid", "cool", 0.6),
             Convection("mid_air", "mid", "air", "speed", lambda v, a, b: 0.1 + 0.05 * v),
             Conduction("cool_amb", "cool", "amb", 0.3))
    return Network(nodes, (Boundary("amb", "t_amb"), Boundary("air", "t_air")), links,
                   (HeatSource("hot", "q", 0.95), HeatSource("mid", "q", 0.05)))


def nonlinear_schedule(n=6):
    s = pulse_train(n, 80.0, 3.0, 2e5, 0.3)
    t = s.time_s
    speed = 60.0 - 40.0 * (s.signals["q"] > 0) + 5.0 * np.sin(t / 30.0)
    return Schedule(t, {"q": s.signals["q"], "t_amb": np.full(t.size, 298.0), "t_air": 305.0 + 0.01 * t,
                        "speed": speed})


@pytest.fixture(scope="module")
def reference():
    return solve_network(nonlinear_network(), nonlinear_schedule(), np.full(3, 300.0),
                         SolverSettings(method="Radau", rtol=1e-10, atol_k=1e-8))


@pytest.mark.parametrize("method", ["LSODA", "BDF", "Radau", "RK45"])
def test_methods_agree_and_close_the_energy_balance(method, reference):
    sol = solve_network(nonlinear_network(), nonlinear_schedule(), np.full(3, 300.0), SolverSettings(method=method))
    assert reference.temperatures_k.max() > 650.0
    # stiff methods to the stated 0.05 K; explicit RK45 (non-stiff checks only) measured at 0.12 K
    np.testing.assert_allclose(sol.temperatures_k, reference.temperatures_k, atol=0.25 if method == "RK45" else 0.05)
    # first law over the run: heat in = rise in enthalpy + heat to the boundaries
    assert sol.balance_rel_error < 1e-5
    assert reference.balance_rel_error < 1e-8
    # heat in is the exact integral of the source signal (fractions 0.95 + 0.05)
    s = nonlinear_schedule()
    # (RK45 measured 6.5e-5: its embedded error estimate is blind to the kinks of a piecewise-linear input)
    assert sol.heat_in_j == pytest.approx(s.integral("q", s.t_start_s, s.t_end_s), rel=1e-4 if method == "RK45" else 1e-5)
    if method == "RK45":
        assert sol.njev == 0


def test_link_energies_match_quadrature_of_dense_flows(reference):
    s = nonlinear_schedule()
    fine = np.union1d(np.linspace(s.t_start_s, s.t_end_s, 20001), s.time_s)
    sol = solve_network(nonlinear_network(), s, np.full(3, 300.0), SolverSettings(rtol=1e-9, atol_k=1e-7),
                        output_times=fine)
    quad = np.trapezoid(sol.link_flows_w, sol.time_s, axis=0)
    np.testing.assert_allclose(sol.link_energy_j, quad, rtol=2e-4, atol=2.0)
    assert sol.lost_j == pytest.approx(sol.link_energy_j[[0, 1, 5, 6]].sum())


def test_jacobian_keeps_function_evaluations_low_on_a_stiff_chain():
    # 50 layers of 50 um to 5 mm: time constants from 1e-4 s to minutes (stiff)
    net = slab_chain(50e-6, 1.1)
    t = np.linspace(0.0, 4.0, 41)
    s = Schedule(t, {"flux": np.full(t.size, 1e6)})
    T0 = np.full(len(net.nodes), 300.0)
    BOUND = 800
    with_jac = solve_network(net, s, T0, SolverSettings(method="LSODA"))
    assert with_jac.nfev < BOUND
    without = solve_network(net, s, T0, SolverSettings(method="LSODA", use_jacobian=False))
    assert without.nfev > 3 * BOUND, "a finite-difference Jacobian costs one evaluation per state"
    np.testing.assert_allclose(without.final_k, with_jac.final_k, atol=1e-3)
    bdf = solve_network(net, s, T0, SolverSettings(method="BDF"))
    assert bdf.nfev < BOUND


def test_sub_interval_and_output_times():
    s = nonlinear_schedule(2)
    out = np.array([20.0, 50.0, 100.0])
    sol = solve_network(nonlinear_network(), s, np.full(3, 300.0), t_start=20.0, t_end=100.0, output_times=out)
    np.testing.assert_allclose(sol.time_s, out)
    np.testing.assert_allclose(sol.temperatures_k[0], 300.0)
    assert sol.heat_in_j == pytest.approx(s.integral("q", 20.0, 100.0), rel=1e-5)
    with pytest.raises(ModelError, match="outside the schedule"):
        solve_network(nonlinear_network(), s, np.full(3, 300.0), t_end=1e4)
    with pytest.raises(ModelError, match="output_times must lie within"):
        solve_network(nonlinear_network(), s, np.full(3, 300.0), t_start=20.0, output_times=[0.0, 30.0])


def test_missing_signal_and_bad_initial_state_are_model_errors():
    s = nonlinear_schedule(1)
    lacking = Schedule(s.time_s, {k: v for k, v in s.signals.items() if k != "speed"})
    with pytest.raises(ModelError, match="lacks signal 'speed'.*convection link 'hot_air'"):
        solve_network(nonlinear_network(), lacking, np.full(3, 300.0))
    with pytest.raises(ModelError, match=r"initial_k has shape \(2,\), expected \(3,\)"):
        solve_network(nonlinear_network(), s, [300.0, 300.0])
    with pytest.raises(ModelError, match="node 'mid'"):
        solve_network(nonlinear_network(), s, [300.0, -1.0, 300.0])


def test_settings_validation():
    with pytest.raises(ModelError, match="unknown method 'LSDOA'.*did you mean 'LSODA'"):
        SolverSettings(method="LSDOA")
    with pytest.raises(ModelError, match="rtol"):
        SolverSettings(rtol=0.0)
    with pytest.raises(ModelError, match="atol_k"):
        SolverSettings(atol_k=-1.0)
    with pytest.raises(ModelError, match="max_step_s"):
        SolverSettings(max_step_s=0.0)
    with pytest.raises(ModelError, match="restart_at_edges"):
        SolverSettings(method="fast", restart_at_edges=False)
    with pytest.raises(ModelError, match="use_jacobian must be true or false"):
        SolverSettings(use_jacobian=1)


def test_integrator_failure_is_a_solve_error_naming_phase_and_time(monkeypatch):
    real = scipy_solve.solve_ivp

    def fails_after_half(fun, span, y0, **kw):
        # stand-in for a scipy failure: integrate half the piece, then report status -1
        t0, t1 = span
        kw["t_eval"] = None
        sol = real(fun, (t0, 0.5 * (t0 + t1)), y0, **kw)
        sol.status, sol.message = -1, "Required step size is less than spacing between numbers."
        return sol

    monkeypatch.setattr(scipy_solve, "solve_ivp", fails_after_half)
    with pytest.raises(SolveError, match=r"phase 'race laps': LSODA failed at t = 5 s.*spacing"):
        solve_network(nonlinear_network(), nonlinear_schedule(1), np.full(3, 300.0), phase="race laps")
