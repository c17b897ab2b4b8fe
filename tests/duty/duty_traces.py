"""Invented traces and an invented car for the duty tests (no real car, circuit or team)."""
from __future__ import annotations

import numpy as np

from thermo.duty import VehicleParameters


def stop_speed(t, v1, v2, decel, t_brake):
    """Analytic speed: v1 until t_brake, then constant deceleration to v2, then v2 [m/s]."""
    t_end = t_brake + (v1 - v2) / decel
    return np.where(t < t_brake, v1, np.where(t < t_end, v1 - decel * (t - t_brake), v2))


def stop_trace(v1=80.0, v2=20.0, decel=30.0, t_brake=1.0, duration=5.0, step=0.01, jitter=0.0,
               seed=0):
    """Sample times and speed of one stop; ``jitter`` makes the grid non-uniform."""
    n = int(round(duration / step)) + 1
    t = np.linspace(0.0, duration, n)
    if jitter:
        rng = np.random.default_rng(seed)
        t[1:-1] += rng.uniform(-jitter, jitter, n - 2) * step
    return t, stop_speed(t, v1, v2, decel, t_brake)


def bare_car(**changes):
    """An invented 750 kg car with every resistance switched off."""
    values = dict(mass_kg=700.0, fuel_kg=50.0, drag_cd_a_m2=0.0, downforce_cl_a_m2=0.0,
                  rolling_resistance_coefficient=0.0, rolling_radius_front_m=0.33,
                  rolling_radius_rear_m=0.33, air_density_kg_m3=1.2)
    values.update(changes)
    return VehicleParameters(**values)


def aero_car(**changes):
    """The invented car with drag, downforce and rolling resistance."""
    values = dict(drag_cd_a_m2=1.1, downforce_cl_a_m2=3.0, rolling_resistance_coefficient=0.015)
    values.update(changes)
    return bare_car(**values)
