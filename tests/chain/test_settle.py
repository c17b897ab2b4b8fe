"""The settled lap against brute force (many laps simulated one after another); the repeated-lap race path."""
import numpy as np
import pytest

from thermo.bench import _demo_path
from thermo.chain.race import race, repeated_laps
from thermo.chain.settle import lap_setup, settled_lap
from thermo.errors import ModelError, ScenarioError
from thermo.scenario import load_scenario
from thermo.solver import SolverSettings, solve_network


@pytest.fixture(scope="module")
def demo():
    return load_scenario(_demo_path())


def test_settled_lap_matches_a_long_brute_force_run(demo):
    settled = settled_lap(demo, "rear")
    _, model, net, s, _ = lap_setup(demo, "rear")
    # the start state is a fixed point of the lap map
    sol = solve_network(net, s, np.array(list(settled.start_k.values())), SolverSettings(method="fast"))
    np.testing.assert_allclose(sol.final_k, list(settled.start_k.values()), atol=0.02)
    # brute force from ambient, lap after lap (issue 8: within 0.1 K)
    T = np.full(net.n_nodes, float(demo.ambient.temperature_at(0.0)))
    target = np.array([settled.peak_k[n] for n in model.output_nodes])
    first = None
    for lap in range(1, 161):
        sol = solve_network(net, s, T, SolverSettings(method="fast"))
        T = sol.final_k
        peaks = model.outputs(sol.temperatures_k).max(axis=0)
        if first is None and np.all(np.abs(peaks - target) <= 1.0):
            first = lap
    np.testing.assert_allclose(peaks, target, atol=0.1)
    assert settled.residual_k <= 0.01
    # the linearised count of laps to within 1 K against the brute-force count (measured: 2 apart on the demo)
    assert first is not None and abs(settled.laps_to_1k - first) <= 4
    assert settled.lap_solves <= 8


def test_unknown_corner_and_phase_are_named(demo):
    with pytest.raises(ScenarioError, match="no corner named 'middle'"):
        settled_lap(demo, "middle")
    with pytest.raises(ScenarioError, match="phase 'qualifying'"):
        settled_lap(demo, phase_name="qualifying")


def test_settled_lap_refuses_a_setup_of_another_corner(demo):
    with pytest.raises(ScenarioError, match="setup is for corner 'front', not 'rear'"):
        settled_lap(demo, "rear", setup=lap_setup(demo, "front"))


def test_repeated_laps_follow_the_full_grid_newton_solve(demo):
    # the race path (graded grid, linearised kernel) against the default 'fast' solve lap by lap,
    # itself tested against scipy's Radau (tests/solver); issue 8 bound 0.05 K, measured a few mK
    # (23 mK on the disc face with the automatic thin first layers of the friction faces)
    _, model, net, s, _ = lap_setup(demo, "front")
    T0 = np.full(net.n_nodes, float(demo.ambient.temperature_at(0.0)))
    fast = repeated_laps(model, net, s, T0, 3)
    T, peaks = T0, []
    for _ in range(3):
        sol = solve_network(net, s, T, SolverSettings(method="fast"))
        T = sol.final_k
        peaks.append(model.outputs(sol.temperatures_k).max(axis=0))
    assert fast.lap_peaks_k.shape == (3, len(model.output_nodes))
    assert fast.steps_per_lap < 0.4 * s.time_s.size
    np.testing.assert_allclose(fast.lap_peaks_k, np.array(peaks), atol=0.05)
    np.testing.assert_allclose(fast.final_k, T, atol=0.05)
    assert np.all(fast.lap_peaks_k[2] > fast.lap_peaks_k[0]), "from ambient, the third lap runs hotter than the first"
    with pytest.raises(ModelError, match="n_laps must be >= 1"):
        repeated_laps(model, net, s, T0, 0)


def test_race_in_threads_equals_the_serial_race(demo):
    one = race(demo, 0.1, threads=1)
    two = race(demo, 0.1, threads=2)
    for d in demo.corners:
        assert one.corners[d.name].lap_peaks_k.shape[0] == 4          # ceil(360 s / 103.25 s)
        np.testing.assert_array_equal(one.corners[d.name].lap_peaks_k, two.corners[d.name].lap_peaks_k)
    assert 0 < one.build_s < one.wall_s and set(one.corners) == {d.name for d in demo.corners}
    with pytest.raises(ModelError, match="hours must be > 0"):
        race(demo, 0.0)


def test_settle_reports_margins_against_the_runs_limits(demo):
    """Issue 17: `settle` reads the same checks as `run` (same names, same nodes, same limits) and
    gives each margin = limit - settled peak, with the run's status rule."""
    from thermo.chain.corner_run import corner_check_specs
    from thermo.corner.build import build_corner
    from thermo.limits import status_of
    from thermo.studies.settle import settle, settled_dict
    data = settled_dict(demo, settle(demo, corners=["rear"]))
    corner = data["corners"][0]
    design = next(d for d in demo.corners if d.name == "rear")
    specs = corner_check_specs(demo, design, build_corner(design, demo.ambient.pressure_pa, grid=None))
    assert [(c["name"], c["node"]) for c in corner["checks"]] == [(s.name, s.node) for s in specs]
    for check, spec in zip(corner["checks"], specs):
        assert check["peak_c"] == corner["peak_c"][check["node"]]
        assert check["margin_k"] == pytest.approx(check["limit_c"] - check["peak_c"], abs=0.011)
        assert check["status"] == status_of(spec.limit_k - (check["peak_c"] + 273.15), spec.caution_band_k)
