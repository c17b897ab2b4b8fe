"""Energy and pressure methods of the braking power, against basic mechanics and closed forms."""
import numpy as np
import pytest
from hypothesis import given, settings, strategies as st
from scipy.integrate import quad

from duty_traces import aero_car, bare_car, stop_speed, stop_trace
from lapdata.errors import LapDataError
from lapdata.units import MM, STANDARD_GRAVITY
from thermo.duty import (
    Caliper, brake_energy_per_interval, braking_power_energy_method,
    braking_power_pressure_method, braking_torque_pressure_method, power_from_interval_energy,
    summed_piston_area_m2,
)
from thermo.errors import ScenarioError

V1, V2, DECEL = 80.0, 20.0, 30.0


def brake_energy(t, v, car, **options):
    return np.trapezoid(braking_power_energy_method(t, v, car, **options), t)


def kinetic_drop(car, v1=V1, v2=V2):
    # work-energy theorem: 1/2 m_eff (v1^2 - v2^2), basic mechanics
    return 0.5 * car.mass_effective_kg * (v1 ** 2 - v2 ** 2)


def test_effective_mass_counts_rotating_inertia():
    car = bare_car(rotating_inertia_factor=0.04)
    assert car.mass_total_kg == pytest.approx(750.0)
    assert car.mass_effective_kg == pytest.approx(780.0)  # m (1 + 0.04), by the definition used


@pytest.mark.parametrize("t_brake, jitter", [(1.0, 0.0), (1.004, 0.0), (1.0, 0.3), (1.013, 0.4)])
@pytest.mark.parametrize("window", [0.0, 0.5])
def test_stop_without_resistance_puts_kinetic_energy_into_brakes(t_brake, jitter, window):
    # energy conservation (work-energy theorem): all of 1/2 m_eff (v1^2 - v2^2) goes to the brakes,
    # on or off the sample grid, uniform or not, filtered or not
    car = bare_car()
    t, v = stop_trace(V1, V2, DECEL, t_brake=t_brake, jitter=jitter)
    assert brake_energy(t, v, car, smoothing_window_s=window) == pytest.approx(
        kinetic_drop(car), rel=1e-10)


def test_stop_to_standstill():
    car = bare_car()
    t, v = stop_trace(V1, 0.0, DECEL, t_brake=0.5, duration=4.0)
    assert brake_energy(t, v, car) == pytest.approx(kinetic_drop(car, V1, 0.0), rel=1e-10)


@pytest.mark.parametrize("t_brake", [1.0, 1.0037])
def test_drag_lowers_brake_energy_by_the_drag_work(t_brake):
    car = bare_car(drag_cd_a_m2=1.1)
    t, v = stop_trace(V1, V2, DECEL, t_brake=t_brake)
    t_end = t_brake + (V1 - V2) / DECEL
    # drag work integrated independently on the analytic speed profile (scipy quad)
    drag_work, _ = quad(lambda s: 0.5 * 1.2 * 1.1 * stop_speed(s, V1, V2, DECEL, t_brake) ** 3,
                        t_brake, t_end, limit=200)
    # and in closed form, 1/2 rho CdA (v1^4 - v2^4) / (4 a), for a constant deceleration
    assert drag_work == pytest.approx(0.5 * 1.2 * 1.1 * (V1 ** 4 - V2 ** 4) / (4 * DECEL), rel=1e-9)
    # off the grid the sampled trace cannot know when, inside its interval, braking began:
    # the error is at most the drag power times one step (6e-4 relative here)
    assert brake_energy(t, v, car) == pytest.approx(kinetic_drop(car) - drag_work, rel=1e-3)
    assert drag_work > 0.05 * kinetic_drop(car)  # the test can see the drag


def test_drag_downforce_rolling_and_engine_braking_closed_form():
    car = aero_car(engine_braking_force_n=400.0)
    t, v = stop_trace(V1, V2, DECEL)
    distance = (V1 ** 2 - V2 ** 2) / (2 * DECEL)          # constant deceleration kinematics
    int_v3 = (V1 ** 4 - V2 ** 4) / (4 * DECEL)            # integral of v^3 dt over the stop
    half_rho = 0.5 * 1.2
    resist = (half_rho * 1.1 * int_v3                                            # drag
              + 0.015 * (750.0 * STANDARD_GRAVITY * distance + half_rho * 3.0 * int_v3)  # rolling
              + 400.0 * distance)                                                # engine
    assert brake_energy(t, v, car) == pytest.approx(kinetic_drop(car) - resist, rel=1e-3)


@pytest.mark.parametrize("grade", [0.06, -0.06])
def test_grade_uphill_helps_downhill_adds(grade):
    car = bare_car()
    t, v = stop_trace(V1, V2, DECEL, t_brake=0.0, duration=(V1 - V2) / DECEL)
    distance = (V1 ** 2 - V2 ** 2) / (2 * DECEL)
    # potential energy change m g sin(theta) d acts on the real mass (basic mechanics)
    expected = kinetic_drop(car) - 750.0 * STANDARD_GRAVITY * np.sin(grade) * distance
    assert brake_energy(t, v, car, grade_rad=grade) == pytest.approx(expected, rel=1e-3)
    per_sample = np.full(t.size, grade)
    assert brake_energy(t, v, car, grade_rad=per_sample) == pytest.approx(expected, rel=1e-3)


def test_holding_speed_downhill_takes_the_potential_energy():
    # steady speed on a downhill grade: F_brakes = m g sin(theta), P = m g sin(theta) v
    car = bare_car()
    t = np.linspace(0.0, 3.0, 301)
    v = np.full(t.size, 30.0)
    power = braking_power_energy_method(t, v, car, grade_rad=-0.08)
    assert power == pytest.approx(750.0 * STANDARD_GRAVITY * np.sin(0.08) * 30.0, rel=1e-12)
    assert braking_power_energy_method(t, v, car, grade_rad=0.08).max() == 0.0


def test_measured_acceleration_of_a_constant_deceleration():
    car = bare_car()
    t = np.linspace(0.0, 2.0, 201)
    v = V1 - DECEL * t
    accel = np.full(t.size, -DECEL)
    assert brake_energy(t, v, car, accel_mps2=accel) == pytest.approx(
        kinetic_drop(car, V1, V1 - 2 * DECEL), rel=1e-10)
    # a measured deceleration half as large gives half the energy: accel is not ignored
    assert brake_energy(t, v, car, accel_mps2=accel / 2) == pytest.approx(
        0.5 * kinetic_drop(car, V1, V1 - 2 * DECEL), rel=1e-10)


def test_noise_on_a_straight_adds_no_brake_heat():
    # physical invariant: an accelerating car puts no heat into its brakes
    car = aero_car()
    t = np.linspace(0.0, 4.0, 401)
    rng = np.random.default_rng(7)
    v = 40.0 + 5.0 * t + rng.normal(0.0, 0.05, t.size)
    assert brake_energy(t, v, car, smoothing_window_s=0.0) > 1e3   # unfiltered noise leaks in
    assert brake_energy(t, v, car) == 0.0
    # the same with a noisy measured acceleration channel (vibration noise 6 m/s^2)
    accel = 5.0 + rng.normal(0.0, 6.0, t.size)
    assert brake_energy(t, v, car, accel_mps2=accel, smoothing_window_s=0.0) > 1e3
    assert brake_energy(t, v, car, accel_mps2=accel) == 0.0


def test_power_during_a_stop_is_the_force_balance():
    # mid-stop, P = (m_eff a - F_drag) v at the sample (the interval means straddle it linearly)
    car = bare_car(drag_cd_a_m2=1.1)
    t, v = stop_trace(V1, V2, DECEL)
    power = braking_power_energy_method(t, v, car)
    i = int(np.argmin(np.abs(t - 2.0)))
    expected = (780.0 * DECEL - 0.5 * 1.2 * 1.1 * v[i] ** 2) * v[i]
    assert power[i] == pytest.approx(expected, rel=1e-4)
    assert power[t < 0.99].max() == 0.0 and power[t > 3.01].max() == 0.0


@settings(max_examples=40, deadline=None)
@given(st.lists(st.floats(0.001, 0.5), min_size=2, max_size=40),
       st.lists(st.floats(0.0, 1e5), min_size=40, max_size=40))
def test_interval_energy_round_trips_through_the_trapezoid(steps, energies):
    t = np.concatenate([[0.0], np.cumsum(steps)])
    e = np.asarray(energies[: len(steps)])
    power = power_from_interval_energy(t, e)
    assert np.all(power >= 0)
    assert np.trapezoid(power, t) == pytest.approx(e.sum(), rel=1e-12, abs=1e-9)


def test_bad_traces_name_the_channel_and_row():
    car = bare_car()
    with pytest.raises(LapDataError, match=r"time_s: row 2"):
        brake_energy_per_interval([0.0, 1.0, 1.0, 2.0], [1.0, 1.0, 1.0, 1.0], car)
    with pytest.raises(LapDataError, match=r"speed_mps: row 1"):
        brake_energy_per_interval([0.0, 1.0, 2.0], [1.0, -1.0, 1.0], car)
    with pytest.raises(LapDataError, match=r"speed_mps: expected 3 samples"):
        brake_energy_per_interval([0.0, 1.0, 2.0], [1.0, 1.0], car)
    with pytest.raises(LapDataError, match=r"grade_rad: row 0"):
        brake_energy_per_interval([0.0, 1.0], [2.0, 1.0], car, grade_rad=[np.nan, 0.0])
    with pytest.raises(ScenarioError, match="smoothing_window_s"):
        brake_energy_per_interval([0.0, 1.0], [2.0, 1.0], car, smoothing_window_s=-1.0)


def test_vehicle_parameters_name_the_bad_field():
    with pytest.raises(ScenarioError, match=r"VehicleParameters.mass_kg"):
        bare_car(mass_kg=-1.0)
    with pytest.raises(ScenarioError, match=r"VehicleParameters.air_density_kg_m3"):
        bare_car(air_density_kg_m3=0.0)
    assert bare_car().with_fuel(10.0).mass_total_kg == pytest.approx(710.0)
    # with_fuel checks only the new fuel load, and changes nothing else
    car = aero_car()
    assert car.with_fuel(12.5) == aero_car(fuel_kg=12.5) and car.fuel_kg == 50.0
    for bad in (-1.0, float("nan"), "10"):
        with pytest.raises(ScenarioError, match=r"VehicleParameters.fuel_kg"):
            car.with_fuel(bad)


# --- pressure method -------------------------------------------------------------------------

def test_torque_hand_calculation():
    # F_clamp = p A = 50e5 * 4e-3 = 20 kN; F_friction = 2 * 0.5 * 20 kN = 20 kN; T = 20 kN * 0.15 m
    assert braking_torque_pressure_method(50e5, 4e-3, 0.5, 0.15) == pytest.approx(3000.0)
    # P = T v / r = 3000 * 50 / 0.3
    caliper = Caliper(4e-3, 0.5, 0.15)
    assert braking_power_pressure_method(50e5, 50.0, caliper, 0.3) == pytest.approx(5e5)
    # a slightly negative sensor offset is no braking
    assert braking_torque_pressure_method(-2e3, 4e-3, 0.5, 0.15) == 0.0


def test_clamp_depends_only_on_summed_piston_area():
    # geometry: area = pi/4 sum(d^2); four 38 mm pistons equal two of 38 sqrt(2) = 53.74 mm
    four = summed_piston_area_m2([38 * MM] * 4)
    two_exact = summed_piston_area_m2([38 * np.sqrt(2) * MM] * 2)
    two_nominal = summed_piston_area_m2([53.7 * MM] * 2)
    assert four == pytest.approx(np.pi * 0.019 ** 2 * 4, rel=1e-12)
    assert braking_torque_pressure_method(60e5, four, 0.45, 0.14) == pytest.approx(
        braking_torque_pressure_method(60e5, two_exact, 0.45, 0.14), rel=1e-12)
    # common practice, no published source: keep the summed piston area to keep the bias when
    # swapping calipers; 2 x 53.7 mm is within 0.15 % of 4 x 38 mm
    assert two_nominal == pytest.approx(four, rel=1.5e-3)
    assert two_nominal != pytest.approx(four, rel=1e-4)


def test_caliper_names_the_bad_field():
    with pytest.raises(ScenarioError, match=r"Caliper.pad_mu"):
        Caliper(4e-3, 0.0, 0.15)
    with pytest.raises(ScenarioError, match=r"Caliper.effective_radius_m"):
        braking_torque_pressure_method(1e5, 4e-3, 0.4, -0.1)
