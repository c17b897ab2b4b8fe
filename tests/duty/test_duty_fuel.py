"""Fuel burn over a stint and what it does to each lap's braking energy."""
import numpy as np
import pytest

from duty_traces import bare_car
from thermo.duty import braking_energy_by_lap, fuel_mass_by_lap
from thermo.errors import ScenarioError

# An invented lap: (time s, speed m/s) knots, speed linear between them. Two braking zones,
# 70 -> 25 m/s and 80 -> 40 m/s, the rest accelerating or steady. The first zone starts off
# the 0.01 s grid; the slowest point of each zone is a sample (a trace only knows its samples).
KNOTS_T = [0.0, 2.003, 3.5, 9.503, 10.0, 11.6, 15.6, 16.0]
KNOTS_V = [70.0, 70.0, 25.0, 80.0, 80.0, 40.0, 70.0, 70.0]
ZONES = [(70.0, 25.0), (80.0, 40.0)]


def test_fuel_at_the_start_of_each_lap():
    assert fuel_mass_by_lap(60.0, 2.5, 5) == pytest.approx([60.0, 57.5, 55.0, 52.5, 50.0])
    assert fuel_mass_by_lap(9.0, 3.0, 3) == pytest.approx([9.0, 6.0, 3.0])  # empty at the flag


def test_fuel_running_out_names_the_lap():
    with pytest.raises(ScenarioError, match="runs out on lap 4 of 5"):
        fuel_mass_by_lap(10.0, 3.0, 5)
    with pytest.raises(ScenarioError, match="n_laps"):
        fuel_mass_by_lap(10.0, 1.0, 0)


def test_fuel_burn_lowers_lap_braking_energy_by_half_dm_eff_dv2():
    # work-energy theorem with aero and rolling off: E_lap = 1/2 m_eff sum(v_in^2 - v_out^2), so
    # one lap's fuel burn dm lowers it by 1/2 dm (1 + factor) sum(v_in^2 - v_out^2), exactly
    t = np.arange(0.0, 16.0 + 1e-9, 0.01)
    v = np.interp(t, KNOTS_T, KNOTS_V)
    car = bare_car(rotating_inertia_factor=0.04)
    fuel = fuel_mass_by_lap(60.0, 2.5, 4)
    energies = braking_energy_by_lap(t, v, car, fuel)
    sum_dv2 = sum(v_in ** 2 - v_out ** 2 for v_in, v_out in ZONES)
    assert energies[0] == pytest.approx(0.5 * (700.0 + 60.0) * 1.04 * sum_dv2, rel=1e-10)
    assert -np.diff(energies) == pytest.approx(np.full(3, 0.5 * 2.5 * 1.04 * sum_dv2), rel=1e-8)
