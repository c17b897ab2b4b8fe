"""Braking zones of a lap trace.

Rule: with a pressure channel, the brakes are on where the higher of the present line pressures
exceeds ``pressure_threshold_pa``. Without one, on where the deceleration rises to
``decel_on_mps2`` and off again once it falls below ``decel_off_mps2`` (hysteresis, so noise near
one threshold does not chop a zone). Either way, runs shorter than ``min_duration_s`` are dropped.
The deceleration is always the zero-phase derivative of speed
(:func:`lapdata.signal.smoothed_acceleration`, 0.5 s window), not the accelerometer channel,
whose offset changes with pitch and grade.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.signal import smoothed_acceleration
from lapdata.trace import LapTrace


@dataclass(frozen=True)
class BrakingZone:
    """One braking zone, from its first to its last braking sample (SI)."""

    t_start_s: float
    t_end_s: float
    d_start_m: float
    d_end_m: float
    v_in_mps: float
    v_out_mps: float
    peak_decel_mps2: float
    duration_s: float


def braking_mask(trace: LapTrace, *, pressure_threshold_pa: float = 5e5, decel_on_mps2: float = 4.0,
                 decel_off_mps2: float = 2.0, min_duration_s: float = 0.3) -> np.ndarray:
    """True on the samples of the trace where the brakes are applied.

    Parameters
    ----------
    trace : LapTrace
        The trace [-]
    pressure_threshold_pa : float
        Line pressure above which the brakes are on [Pa]
    decel_on_mps2 : float
        Deceleration at which a zone starts (no pressure channel) [m/s^2]
    decel_off_mps2 : float
        Deceleration below which it ends; at most ``decel_on_mps2`` [m/s^2]
    min_duration_s : float
        Shorter runs (last minus first sample time) are dropped [s]

    Returns
    -------
    ndarray of bool
        One flag per sample [-]
    """
    _check_settings(trace, pressure_threshold_pa, decel_on_mps2, decel_off_mps2, min_duration_s)
    pressures = [p for p in (trace.pressure_front_pa, trace.pressure_rear_pa) if p is not None]
    if pressures:
        on = np.max(np.vstack(pressures), axis=0) > pressure_threshold_pa
    else:
        decel = -smoothed_acceleration(trace.time_s, trace.speed_mps)
        on = np.zeros(decel.size, dtype=bool)
        braking = False
        for i, d in enumerate(decel):
            braking = d >= decel_on_mps2 if not braking else d >= decel_off_mps2
            on[i] = braking
    for i0, i1 in _runs(on):
        if trace.time_s[i1] - trace.time_s[i0] < min_duration_s:
            on[i0:i1 + 1] = False
    return on


def find_braking_zones(trace: LapTrace, *, pressure_threshold_pa: float = 5e5, decel_on_mps2: float = 4.0,
                       decel_off_mps2: float = 2.0, min_duration_s: float = 0.3) -> tuple[BrakingZone, ...]:
    """The braking zones of a trace, in order (same rule and parameters as :func:`braking_mask`)."""
    on = braking_mask(trace, pressure_threshold_pa=pressure_threshold_pa, decel_on_mps2=decel_on_mps2,
                      decel_off_mps2=decel_off_mps2, min_duration_s=min_duration_s)
    decel = -smoothed_acceleration(trace.time_s, trace.speed_mps)
    t, d, v = trace.time_s, trace.distance_m, trace.speed_mps
    return tuple(
        BrakingZone(t_start_s=float(t[i0]), t_end_s=float(t[i1]), d_start_m=float(d[i0]),
                    d_end_m=float(d[i1]), v_in_mps=float(v[i0]), v_out_mps=float(v[i1]),
                    peak_decel_mps2=float(np.max(decel[i0:i1 + 1])), duration_s=float(t[i1] - t[i0]))
        for i0, i1 in _runs(on)
    )


def _runs(flags: np.ndarray) -> list[tuple[int, int]]:
    """(first, last) index of each run of True."""
    padded = np.concatenate([[False], flags, [False]]).astype(np.int8)
    edges = np.diff(padded)
    return list(zip(np.flatnonzero(edges == 1), np.flatnonzero(edges == -1) - 1))


def _check_settings(trace, pressure_threshold_pa, decel_on_mps2, decel_off_mps2, min_duration_s):
    checks = (
        ("pressure_threshold_pa", pressure_threshold_pa, pressure_threshold_pa >= 0.0),
        ("decel_on_mps2", decel_on_mps2, decel_on_mps2 > 0.0),
        ("decel_off_mps2", decel_off_mps2, 0.0 <= decel_off_mps2 <= decel_on_mps2),
        ("min_duration_s", min_duration_s, min_duration_s >= 0.0),
    )
    for name, value, ok in checks:
        if not (np.isfinite(value) and ok):
            raise LapDataError(f"{trace.source}: {name} = {shown(value)}: expected a finite value >= 0 "
                               f"(decel_off_mps2 <= decel_on_mps2, decel_on_mps2 > 0)")
