"""Heat into each corner: energy conservation over the corners, pressure against energy method."""
import numpy as np
import pytest

from duty_traces import aero_car, bare_car, stop_trace
from lapdata.errors import LapDataError
from lapdata.trace import LapTrace
from lapdata.units import MM
from thermo.duty import (
    CornerBrake, CornerDuty, FixedBias, HydraulicBias, braking_power_energy_method, corner_heat_inputs,
    braking_power_pressure_method, corner_heat_inputs_from_trace, lap_energy_summary, summed_piston_area_m2,
    total_braking_energy_j,
)
from thermo.duty.bias import split_left_right
from thermo.errors import ScenarioError

R_ROLL = 0.33
FRONT_AREA = summed_piston_area_m2([38 * MM] * 3)   # invented six-piston front caliper
REAR_AREA = summed_piston_area_m2([30 * MM] * 2)     # invented four-piston rear caliper


def corner(name, partition=0.95, **changes):
    axle, side = name.split("_")
    values = dict(name=name, axle=axle, side=side, partition=partition,
                  piston_area_one_side_m2=FRONT_AREA if axle == "front" else REAR_AREA,
                  pad_mu=0.5 if axle == "front" else 0.45,
                  effective_radius_m=0.14 if axle == "front" else 0.12, rolling_radius_m=R_ROLL)
    values.update(changes)
    return CornerBrake(**values)


CORNERS = [corner("front_left", 0.96), corner("front_right", 0.96), corner("rear_left", 0.93),
           corner("rear_right", 0.93)]


def energy(duty):
    return np.trapezoid(duty.brake_heat_w, duty.time_s)


def test_energy_method_shares_conserve_energy():
    car = aero_car()
    t, v = stop_trace()
    duties = corner_heat_inputs(t, v, car, FixedBias(0.6), CORNERS, left_share_front=0.55)
    total = np.trapezoid(braking_power_energy_method(t, v, car), t)
    # energy conservation: the four corners hold the car's braking energy
    assert total_braking_energy_j(duties) == pytest.approx(total, rel=1e-12)
    assert energy(duties["front_left"]) == pytest.approx(0.6 * 0.55 * total, rel=1e-12)
    assert energy(duties["front_right"]) == pytest.approx(0.6 * 0.45 * total, rel=1e-12)
    assert energy(duties["rear_right"]) == pytest.approx(0.4 * 0.5 * total, rel=1e-12)
    fl = duties["front_left"]
    assert fl.disc_heat_w == pytest.approx(0.96 * fl.brake_heat_w, rel=1e-14)
    assert fl.pad_heat_w == pytest.approx(0.04 * fl.brake_heat_w, rel=1e-14, abs=1e-12)
    assert fl.wheel_speed_rad_s == pytest.approx(v / R_ROLL)  # rolling without slip
    with pytest.raises(ValueError):
        fl.disc_heat_w[0] = 1.0  # results are read-only


def test_pressure_method_agrees_with_energy_method_on_consistent_pressures():
    # Build the line pressures that produce exactly the brake force the force balance asks for,
    # split by a hydraulic bias; both methods must then give the same energy (to the trapezoid
    # error of the pressure samples), per corner and in total.
    car = aero_car()
    bias = HydraulicBias(master_cylinder_front_m2=2.85e-4, master_cylinder_rear_m2=3.17e-4,
                         balance_bar_front_share=0.56, piston_area_front_m2=FRONT_AREA,
                         piston_area_rear_m2=REAR_AREA, pad_mu_front=0.5, pad_mu_rear=0.45,
                         effective_radius_front_m=0.14, effective_radius_rear_m=0.12)
    decel = 30.0
    t, v = stop_trace(decel=decel, t_brake=1.0)
    braking = (t > 1.0 - 1e-9) & (t < 3.0 + 1e-9)
    a = np.where(braking, decel, 0.0)
    a[np.isclose(t, 1.0) | np.isclose(t, 3.0)] = decel / 2  # a step's mid value at its sample
    half_rho_v2 = 0.5 * 1.2 * v ** 2
    resist = 1.1 * half_rho_v2 + 0.015 * (750.0 * 9.80665 + 3.0 * half_rho_v2)
    brake_force = np.where(braking, car.mass_effective_kg * a - resist, 0.0)
    torque_axle = brake_force * R_ROLL
    p_front = bias.front_share * torque_axle / 2 / (2 * 0.5 * FRONT_AREA * 0.14)
    p_rear = (1 - bias.front_share) * torque_axle / 2 / (2 * 0.45 * REAR_AREA * 0.12)
    by_pressure = corner_heat_inputs(t, v, car, None, CORNERS, method="pressure",
                                     pressure_front_pa=p_front, pressure_rear_pa=p_rear)
    by_energy = corner_heat_inputs(t, v, car, bias, CORNERS)
    for name in by_energy:
        assert energy(by_pressure[name]) == pytest.approx(energy(by_energy[name]), rel=1e-3)
    total_p = total_braking_energy_j(by_pressure)
    front_p = energy(by_pressure["front_left"]) + energy(by_pressure["front_right"])
    assert front_p / total_p == pytest.approx(bias.front_share, rel=1e-12)
    # and a pad friction 10 % low in the pressure method shows up as 10 % less heat
    weak = [corner(c.name, c.partition, pad_mu=0.9 * c.pad_mu) for c in CORNERS]
    by_weak = corner_heat_inputs(t, v, car, None, weak, method="pressure",
                                 pressure_front_pa=p_front, pressure_rear_pa=p_rear)
    assert total_braking_energy_j(by_weak) == pytest.approx(0.9 * total_p, rel=1e-12)


def test_summary_of_a_stop():
    car = bare_car()
    t, v = stop_trace(80.0, 20.0, 30.0, t_brake=1.0, duration=5.0, step=0.01)
    duties = corner_heat_inputs(t, v, car, FixedBias(0.5), CORNERS)
    summary = lap_energy_summary(duties)["front_left"]
    expected = 0.25 * 0.5 * 780.0 * (80.0 ** 2 - 20.0 ** 2)  # work-energy theorem, a quarter
    assert summary.braking_energy_j == pytest.approx(expected, rel=1e-10)
    assert summary.disc_energy_j == pytest.approx(0.96 * expected, rel=1e-10)
    assert summary.pad_energy_j == pytest.approx(0.04 * expected, rel=1e-9)
    assert summary.mean_power_w == pytest.approx(expected / 5.0, rel=1e-10)
    # 2 s of braking, plus the interval either side into which the edge samples spread the zone
    assert summary.braking_time_s == pytest.approx(2.0 + 2 * 0.01, abs=1e-9)
    assert summary.mean_braking_power_w == pytest.approx(expected / 2.0, rel=1.1e-2)
    # peak P = m_eff a v at the start of the stop (less one step), a quarter of it per corner
    assert summary.peak_power_w == pytest.approx(0.25 * 780.0 * 30.0 * 80.0, rel=5e-3)


def test_from_trace_uses_the_trace_channels():
    car = bare_car()
    t, v = stop_trace()
    pressure = np.where((t > 1.0) & (t < 3.0), 80e5, 0.0)
    trace = LapTrace(time_s=t, distance_m=np.concatenate([[0.0], np.cumsum(np.diff(t) * v[1:])]),
                     speed_mps=v, pressure_front_pa=pressure, pressure_rear_pa=0.5 * pressure,
                     source="invented.csv")
    duties = corner_heat_inputs_from_trace(trace, car, None, CORNERS, method="pressure")
    i = int(np.argmin(np.abs(t - 2.0)))
    # T = 2 mu p A r_eff, P = T v / r_roll, per corner
    expected = 2 * 0.45 * 40e5 * REAR_AREA * 0.12 * v[i] / R_ROLL
    assert duties["rear_left"].brake_heat_w[i] == pytest.approx(expected, rel=1e-12)
    bare = LapTrace(time_s=t, distance_m=trace.distance_m, speed_mps=v, source="invented.csv")
    with pytest.raises(LapDataError, match="invented.csv.*pressure"):
        corner_heat_inputs_from_trace(bare, car, None, CORNERS, method="pressure")
    with pytest.raises(LapDataError, match="invented.csv.*accel_long_mps2"):
        corner_heat_inputs_from_trace(bare, car, FixedBias(0.6), CORNERS, use_measured_accel=True)


def test_unused_or_inconsistent_options_are_errors():
    car = bare_car()
    t, v = stop_trace()
    p = np.zeros(t.size)
    with pytest.raises(ScenarioError, match="did you mean 'energy'"):
        corner_heat_inputs(t, v, car, FixedBias(0.6), CORNERS, method="energie")
    with pytest.raises(ScenarioError, match="pressure_front_pa is used only by method='pressure'"):
        corner_heat_inputs(t, v, car, FixedBias(0.6), CORNERS, pressure_front_pa=p)
    with pytest.raises(ScenarioError, match="bias.*pass bias=None"):
        corner_heat_inputs(t, v, car, FixedBias(0.6), CORNERS, method="pressure",
                           pressure_front_pa=p, pressure_rear_pa=p)
    with pytest.raises(ScenarioError, match="left_share_front is used only by method='energy'"):
        corner_heat_inputs(t, v, car, None, CORNERS, method="pressure", pressure_front_pa=p,
                           pressure_rear_pa=p, left_share_front=0.5)
    with pytest.raises(ScenarioError, match="pressure_rear_pa: method='pressure' needs it"):
        corner_heat_inputs(t, v, car, None, CORNERS, method="pressure", pressure_front_pa=p)
    with pytest.raises(ScenarioError, match="'front_left' is used twice"):
        corner_heat_inputs(t, v, car, FixedBias(0.6), [CORNERS[0], CORNERS[0]])
    with pytest.raises(ScenarioError, match="rolling_radius_m 0.3 differs.*rolling_radius_front_m"):
        corner_heat_inputs(t, v, car, FixedBias(0.6), [corner("front_left", rolling_radius_m=0.3)])


def test_corner_brake_names_the_bad_field():
    with pytest.raises(ScenarioError, match=r"'front_left'.*partition"):
        corner("front_left", partition=1.2)
    with pytest.raises(ScenarioError, match=r"'front_left'.*Caliper.pad_mu"):
        corner("front_left", pad_mu=-0.4)
    with pytest.raises(ScenarioError, match=r"axle must be 'front' or 'rear'"):
        CornerBrake(name="x", axle="middle", side="left", partition=0.9,
                    piston_area_one_side_m2=1e-3, pad_mu=0.4, effective_radius_m=0.1,
                    rolling_radius_m=0.3)


@pytest.mark.parametrize("method", ["energy", "pressure"])
def test_duties_are_those_the_checking_constructor_makes(method):
    # corner_heat_inputs checks the trace once and builds each CornerDuty without checking again:
    # each duty must equal, to the bit, the one the public constructor makes from that corner's power
    car = aero_car()
    t, v = stop_trace()
    t_in = t.copy()
    p_front = np.where(v > 40.0, 30e5, 0.0)
    if method == "energy":
        duties = corner_heat_inputs(t, v, car, FixedBias(0.6), CORNERS, left_share_front=0.55)
        axle = {"front": braking_power_energy_method(t, v, car) * 0.6}
        axle["rear"] = braking_power_energy_method(t, v, car) * (1.0 - 0.6)
        halves = {"front": split_left_right(axle["front"], 0.55), "rear": split_left_right(axle["rear"], 0.5)}
        power = {c.name: halves[c.axle][0 if c.side == "left" else 1] for c in CORNERS}
    else:
        duties = corner_heat_inputs(t, v, car, None, CORNERS, method="pressure", pressure_front_pa=p_front,
                                    pressure_rear_pa=0.5 * p_front)
        power = {c.name: braking_power_pressure_method(p_front if c.axle == "front" else 0.5 * p_front, v, c.caliper,
                                                       c.rolling_radius_m) for c in CORNERS}
    for c in CORNERS:
        brake = power[c.name]
        ref = CornerDuty(c.name, t, c.partition * brake, (1.0 - c.partition) * brake, v / c.rolling_radius_m, v)
        for key in ("time_s", "disc_heat_w", "pad_heat_w", "wheel_speed_rad_s", "vehicle_speed_mps"):
            np.testing.assert_array_equal(getattr(duties[c.name], key), getattr(ref, key))
            assert not getattr(duties[c.name], key).flags.writeable
    assert energy(duties["front_right"]) > 0
    # the caller's arrays are neither kept nor frozen
    t[0] -= 1.0
    assert duties["front_left"].time_s[0] == t_in[0] and t.flags.writeable and v.flags.writeable


def test_a_duty_with_a_non_finite_power_is_refused():
    car = aero_car()
    t, v = stop_trace()
    v[0] = 1e306        # finite, but its power overflows
    with pytest.raises(LapDataError, match="CornerDuty 'front_left' brake power: row 0 is .*inf.*, expected a finite"), \
            np.errstate(over="ignore"):
        corner_heat_inputs(t, v, car, None, CORNERS, method="pressure", pressure_front_pa=np.full(t.size, 1e6),
                           pressure_rear_pa=np.zeros(t.size))
