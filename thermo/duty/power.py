"""Braking power of the whole car from speed (energy method) or of one corner from pressure.

Energy method: the longitudinal force balance
``m_eff (-dv/dt) = F_brakes + F_aero + F_roll + F_engine + m g sin(grade)`` gives the brakes'
share of the deceleration; ``P = max(F_brakes, 0) v``.

Pressure method: ``F_clamp = p A_pistons_one_side``, ``F_friction = 2 mu F_clamp`` (two pad
faces), ``T = F_friction r_eff``, ``P = T v / r_roll``.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.signal import smoothed_acceleration, smoothed_channel
from lapdata.units import STANDARD_GRAVITY
from thermo.duty.vehicle import (
    VehicleParameters, check_number, drag_force_n, rolling_resistance_force_n,
)
from thermo.errors import ScenarioError

DEFAULT_SMOOTHING_WINDOW_S = 0.5  # a design choice: rejects 10-100 Hz logging noise, keeps zone edges


def check_channel(name: str, values, n_samples: int | None = None, *, nonnegative=False):
    """A float array of a channel, or LapDataError naming the channel and the first bad row."""
    array = np.atleast_1d(np.asarray(values, dtype=float))
    if array.ndim != 1:
        raise LapDataError(f"{name}: expected a one-dimensional array, got shape {array.shape}")
    if n_samples is not None and array.size != n_samples:
        raise LapDataError(f"{name}: expected {n_samples} samples (as time_s), got {array.size}")
    bad = ~np.isfinite(array)
    if nonnegative:
        bad |= array < 0
    if np.any(bad):
        row = int(np.argmax(bad))
        kind = "a finite value >= 0" if nonnegative else "a finite value"
        raise LapDataError(f"{name}: row {row} is {shown(array[row])}, expected {kind}")
    return array


def check_time(time_s):
    """Sample times as a float array: at least two, strictly increasing (LapDataError otherwise)."""
    t = check_channel("time_s", time_s)
    if t.size < 2:
        raise LapDataError(f"time_s: expected at least 2 samples, got {t.size}")
    steps = np.diff(t)
    if np.any(steps <= 0):
        row = int(np.argmax(steps <= 0)) + 1
        raise LapDataError(f"time_s: row {row} ({shown(t[row])}) does not increase on the row before")
    return t


def _per_interval(name, values, n_samples):
    """Interval means of a scalar or per-sample channel (None means zero)."""
    if values is None:
        return np.zeros(n_samples - 1)
    array = np.asarray(values, dtype=float)
    if array.ndim == 0:
        return np.full(n_samples - 1, float(check_channel(name, array)[0]))
    array = check_channel(name, array, n_samples)
    return 0.5 * (array[1:] + array[:-1])


def resistive_work_per_interval_j(time_s, speed_mps, vehicle: VehicleParameters, grade_rad=None):
    """Work done on each sample interval by drag, rolling resistance, engine braking and grade.

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    speed_mps : ndarray
        Vehicle speed [m/s]
    vehicle : VehicleParameters
        The car
    grade_rad : float or ndarray or None
        Road grade, positive uphill; None is level [rad]

    Returns
    -------
    ndarray
        Work on each of the n - 1 intervals [J]

    Notes
    -----
    Exact when the speed is linear in time over each interval (the same assumption that makes
    the kinetic-energy change exact): with v from a to b over dt,
    int v dt = dt (a + b) / 2 and int v^3 dt = dt (a + b)(a^2 + b^2) / 4.
    Grade is taken at its interval mean.
    """
    t = check_time(time_s)
    v = check_channel("speed_mps", speed_mps, t.size, nonnegative=True)
    return _resistive_work(t, np.diff(t), v, vehicle, grade_rad)


def _resistive_work(t, dt, v, vehicle, grade_rad):
    """``resistive_work_per_interval_j`` of checked times ``t`` (steps ``dt``) and speeds ``v``."""
    a, b = v[:-1], v[1:]
    int_v = dt * (a + b) / 2.0
    int_v3 = dt * (a + b) * (a * a + b * b) / 4.0
    grade = _per_interval("grade_rad", grade_rad, t.size)
    half_rho = 0.5 * vehicle.air_density_kg_m3
    weight = vehicle.mass_total_kg * STANDARD_GRAVITY
    aero = half_rho * vehicle.drag_cd_a_m2 * int_v3
    rolling = vehicle.rolling_resistance_coefficient * (
        weight * np.cos(grade) * int_v + half_rho * vehicle.downforce_cl_a_m2 * int_v3)
    engine = vehicle.engine_braking_force_n * int_v
    climb = weight * np.sin(grade) * int_v
    return aero + rolling + engine + climb


def _resistive_force_n(speed_mps, vehicle, grade_rad):
    weight = vehicle.mass_total_kg * STANDARD_GRAVITY
    return (drag_force_n(speed_mps, vehicle) + rolling_resistance_force_n(speed_mps, vehicle, grade_rad)
            + vehicle.engine_braking_force_n + weight * np.sin(grade_rad))


def brake_energy_per_interval(time_s, speed_mps, vehicle: VehicleParameters, *, grade_rad=None,
                              accel_mps2=None, smoothing_window_s=DEFAULT_SMOOTHING_WINDOW_S):
    """Heat the brakes of the whole car take on each sample interval (energy method).

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    speed_mps : ndarray
        Vehicle speed [m/s]
    vehicle : VehicleParameters
        The car
    grade_rad : float or ndarray or None
        Road grade, positive uphill; None is level [rad]
    accel_mps2 : ndarray or None
        Measured longitudinal acceleration, positive forwards; None
        takes the deceleration from the speed [m/s^2]
    smoothing_window_s : float
        Zero-phase filter window that decides where the brakes are on
        (:func:`lapdata.signal.smoothed_acceleration`, or the measured channel smoothed alike);
        0 turns the filter off [s]

    Returns
    -------
    ndarray
        Brake energy on each of the n - 1 intervals, never negative [J]

    Notes
    -----
    Per interval, x = 1/2 m_eff (v_i^2 - v_(i+1)^2) - W_resist, with W_resist from
    :func:`resistive_work_per_interval_j` (with ``accel_mps2``, the first term is
    m_eff int(-a v) dt with a and v linear over the interval). The energy taken is x where
    the brakes are on and x > 0, else 0. "On" is decided on the smoothed force balance at the
    interval's middle, m_eff (-dv/dt)_smoothed - F_resist(v_mid) > 0, so logging noise on a
    straight adds no heat, while the energy of a stop still telescopes exactly to
    1/2 m_eff (v1^2 - v2^2) minus the resistive work while braking.
    """
    t = check_time(time_s)
    v = check_channel("speed_mps", speed_mps, t.size, nonnegative=True)
    return _brake_energy(t, v, vehicle, grade_rad, accel_mps2, smoothing_window_s)


def _brake_energy(t, v, vehicle, grade_rad, accel_mps2, smoothing_window_s):
    """``brake_energy_per_interval`` of checked times ``t`` and speeds ``v`` (the options checked here)."""
    check_number("brake_energy_per_interval", "smoothing_window_s", smoothing_window_s, minimum=0.0)
    m_eff = vehicle.mass_effective_kg
    dt = np.diff(t)
    if accel_mps2 is None:
        kinetic = 0.5 * m_eff * (v[:-1] ** 2 - v[1:] ** 2)
    else:
        acc = check_channel("accel_mps2", accel_mps2, t.size)
        a0, a1, v0, v1 = acc[:-1], acc[1:], v[:-1], v[1:]
        kinetic = -m_eff * dt * (2 * a0 * v0 + a0 * v1 + a1 * v0 + 2 * a1 * v1) / 6.0
    energy = kinetic - _resistive_work(t, dt, v, vehicle, grade_rad)
    braking = energy > 0.0
    if smoothing_window_s > 0 and t.size >= 3:
        if accel_mps2 is None:
            acc_smooth = smoothed_acceleration(t, v, smoothing_window_s)
        else:
            acc_smooth = smoothed_channel(t, acc, smoothing_window_s)
        acc_mid = 0.5 * (acc_smooth[1:] + acc_smooth[:-1])
        v_mid = 0.5 * (v[1:] + v[:-1])
        grade_mid = _per_interval("grade_rad", grade_rad, t.size)
        braking &= m_eff * (-acc_mid) - _resistive_force_n(v_mid, vehicle, grade_mid) > 0.0
    return np.where(braking, energy, 0.0)


def power_from_interval_energy(time_s, energy_j):
    """Sample values of a power whose trapezoid integral gives back the interval energies exactly.

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    energy_j : ndarray
        Energy on each of the n - 1 intervals [J]

    Returns
    -------
    ndarray
        Power at each of the n samples [W]

    Notes
    -----
    Each interval's energy is shared half to each of its end samples, and a sample's value is
    the energy it holds over its trapezoid weight (dt_left + dt_right) / 2:
    P_j = (E_(j-1) + E_j) / (dt_(j-1) + dt_j), i.e. the time-weighted mean of the interval-mean
    powers on either side. The trapezoid integral of P over the whole trace equals sum(E) to
    rounding, on any grid; a solver that takes the heat input as piecewise linear between
    samples therefore puts in exactly the braking energy.
    """
    t = check_time(time_s)
    return _power_from_energy(t, check_channel("energy_j", energy_j, t.size - 1))


def _power_from_energy(t, e):
    """``power_from_interval_energy`` of checked times ``t`` and interval energies ``e``."""
    dt = np.diff(t)
    held = np.zeros(t.size)
    held[:-1] += 0.5 * e
    held[1:] += 0.5 * e
    weight = np.zeros(t.size)
    weight[:-1] += 0.5 * dt
    weight[1:] += 0.5 * dt
    return held / weight


def braking_power_energy_method(time_s, speed_mps, vehicle: VehicleParameters, *, grade_rad=None,
                                accel_mps2=None, smoothing_window_s=DEFAULT_SMOOTHING_WINDOW_S):
    """Braking power of the whole car from its speed trace (energy method).

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    speed_mps : ndarray
        Vehicle speed [m/s]
    vehicle : VehicleParameters
        The car
    grade_rad : float or ndarray or None
        Road grade, positive uphill; None is level [rad]
    accel_mps2 : ndarray or None
        Measured longitudinal acceleration, positive forwards [m/s^2]
    smoothing_window_s : float
        Window of the filter that decides where the brakes are on [s]

    Returns
    -------
    ndarray
        Power into all four brakes at each sample [W]. NOT the instantaneous
        max(F_brakes, 0) v: the sample value is the time-weighted mean of the interval-mean
        powers either side (see :func:`power_from_interval_energy`), so the trapezoid integral
        of the returned array is exactly the braking energy of :func:`brake_energy_per_interval`.

    Notes
    -----
    P = max(F_brakes, 0) v, F_brakes = m_eff (-dv/dt) - F_aero - F_roll - F_engine
    - m g sin(grade); F_aero = 1/2 rho C_d A v^2; F_roll = C_rr (m g cos(grade) + downforce);
    m_eff = m (1 + rotating_inertia_factor). Gravity acts on the real mass m, inertia on m_eff.
    """
    t = check_time(time_s)
    v = check_channel("speed_mps", speed_mps, t.size, nonnegative=True)
    return checked_braking_power(t, v, vehicle, grade_rad, accel_mps2, smoothing_window_s)


def checked_braking_power(t, v, vehicle: VehicleParameters, grade_rad=None, accel_mps2=None,
                          smoothing_window_s=DEFAULT_SMOOTHING_WINDOW_S):
    """``braking_power_energy_method`` of times and speeds already checked (``check_time``, and
    ``check_channel`` with ``nonnegative``): a caller that checked them once (``corner_heat_inputs``)
    does not pay for the checks again. The options are checked here."""
    return _power_from_energy(t, _brake_energy(t, v, vehicle, grade_rad, accel_mps2, smoothing_window_s))


def summed_piston_area_m2(piston_diameters_m) -> float:
    """Summed area of the pistons acting on one pad, pi/4 sum(d^2) [m^2] from diameters [m]."""
    d = check_channel("piston_diameters_m", piston_diameters_m)
    if np.any(d <= 0):
        raise ScenarioError(f"piston_diameters_m must all be positive, got {list(d)}")
    return float(np.pi / 4.0 * np.sum(d * d))


@dataclass(frozen=True)
class Caliper:
    """An opposed caliper as the pressure method needs it.

    Parameters
    ----------
    piston_area_one_side_m2 : float
        Summed area of all pistons on one side (one pad) [m^2]
    pad_mu : float
        Pad-disc friction coefficient [-]
    effective_radius_m : float
        Radius at which the friction force acts on the disc [m]
    """

    piston_area_one_side_m2: float
    pad_mu: float
    effective_radius_m: float

    def __post_init__(self):
        check_number("Caliper", "piston_area_one_side_m2", self.piston_area_one_side_m2, positive=True)
        check_number("Caliper", "pad_mu", self.pad_mu, positive=True, maximum=1.0)
        check_number("Caliper", "effective_radius_m", self.effective_radius_m, positive=True)


def braking_torque_pressure_method(pressure_pa, piston_area_one_side_m2, pad_mu, effective_radius_m):
    """Brake torque of one opposed caliper from its line pressure.

    Parameters
    ----------
    pressure_pa : float or ndarray
        Line pressure, gauge; negative values count as 0 [Pa]
    piston_area_one_side_m2 : float
        Summed area of all pistons on one side [m^2]
    pad_mu : float
        Pad-disc friction coefficient [-]
    effective_radius_m : float
        Effective friction radius [m]

    Returns
    -------
    float or ndarray
        Brake torque on the disc [N m]

    Notes
    -----
    F_clamp = p A (only the summed piston area on one side enters: four 38 mm pistons clamp as
    two of 38 sqrt(2) mm); F_friction = 2 mu F_clamp (two pad faces); T = F_friction r_eff.
    Rigid-body statics of the caliper; valid while the pads are in contact (p above the
    pressure that overcomes seal retraction, which is neglected).
    """
    Caliper(piston_area_one_side_m2, pad_mu, effective_radius_m)  # validates, names the field
    p = np.clip(np.asarray(pressure_pa, dtype=float), 0.0, None)
    if not np.all(np.isfinite(p)):
        raise LapDataError("pressure_pa: expected finite values")
    torque = 2.0 * pad_mu * p * piston_area_one_side_m2 * effective_radius_m
    return float(torque) if np.ndim(torque) == 0 else torque


def braking_power_pressure_method(pressure_pa, speed_mps, caliper: Caliper, rolling_radius_m: float):
    """Heat into one corner's brake from its line pressure and the vehicle speed.

    Parameters
    ----------
    pressure_pa : float or ndarray
        Line pressure of that corner [Pa]
    speed_mps : float or ndarray
        Vehicle speed [m/s]
    caliper : Caliper
        Piston area, pad friction coefficient and effective radius
    rolling_radius_m : float
        Rolling radius of that wheel [m]

    Returns
    -------
    float or ndarray
        Brake power P = T v / r_roll at each sample [W]
    """
    check_number("braking_power_pressure_method", "rolling_radius_m", rolling_radius_m, positive=True)
    v = np.asarray(speed_mps, dtype=float)
    if not np.all(np.isfinite(v)) or np.any(v < 0):
        raise LapDataError("speed_mps: expected finite values >= 0")
    torque = braking_torque_pressure_method(pressure_pa, caliper.piston_area_one_side_m2,
                                            caliper.pad_mu, caliper.effective_radius_m)
    power = torque * v / rolling_radius_m
    return float(power) if np.ndim(power) == 0 else power
