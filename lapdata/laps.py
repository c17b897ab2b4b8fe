"""Variations of a lap for a stint plan: a slower pace, a pit-lane speed limit, a stationary stop.

Pure functions on LapTrace; they know nothing of brakes.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.trace import LapTrace


def paced(trace: LapTrace, pace: float) -> LapTrace:
    """The same lap driven at ``pace`` times the speed everywhere (0 < pace <= 1).

    Speeds scale by pace, so times stretch by 1/pace and decelerations by pace^2 over the same
    distances; logged pressure channels scale by pace^2 too (brake force follows deceleration).
    Measured temperatures are dropped: they belong to the lap as logged.
    """
    if not (0 < pace <= 1.0):
        raise LapDataError(f"{trace.source}: pace must be above 0 and at most 1, got {shown(pace)}")
    if pace == 1.0:
        return trace
    scale = lambda x: None if x is None else x * pace ** 2  # noqa: E731
    return replace(
        trace, time_s=trace.time_s[0] + (trace.time_s - trace.time_s[0]) / pace, speed_mps=trace.speed_mps * pace,
        pressure_front_pa=scale(trace.pressure_front_pa), pressure_rear_pa=scale(trace.pressure_rear_pa),
        accel_long_mps2=scale(trace.accel_long_mps2), temperatures_k={})


def limit_speed_over_distance(trace: LapTrace, start_m: float, end_m: float, limit_mps: float, *,
                              decel_mps2: float = 8.0, accel_mps2: float = 3.0, sample_hz: float = 20.0) -> LapTrace:
    """Cap the speed at ``limit_mps`` between two distances (a pit lane), braking down to it at
    ``decel_mps2`` before and accelerating away at ``accel_mps2`` after (v^2 = u^2 + 2 a s), and
    re-time the lap from its distances; returned uniformly sampled at ``sample_hz``.

    Pressure and acceleration channels are dropped (they no longer match the speed).
    """
    if limit_mps <= 0:
        raise LapDataError(f"{trace.source}: the pit-lane speed limit must be above 0")
    d = np.asarray(trace.distance_m, float) - trace.distance_m[0]
    start_m, end_m = max(start_m, 0.0), min(end_m, d[-1])
    cap = np.full_like(d, np.inf)
    before, inside, after = d < start_m, (d >= start_m) & (d <= end_m), d > end_m
    cap[inside] = limit_mps
    cap[before] = np.sqrt(limit_mps ** 2 + 2 * decel_mps2 * (start_m - d[before]))
    cap[after] = np.sqrt(limit_mps ** 2 + 2 * accel_mps2 * (d[after] - end_m))
    speed = np.minimum(trace.speed_mps, cap)
    if np.any(speed <= 0):
        raise LapDataError(f"{trace.source}: a speed limit zone needs a moving car (speed above 0) to re-time the lap")
    mean = 0.5 * (speed[1:] + speed[:-1])
    time = np.concatenate([[0.0], np.cumsum(np.diff(d) / mean)])
    uniform = np.arange(0.0, time[-1], 1.0 / sample_hz)
    if uniform[-1] < time[-1]:
        uniform = np.append(uniform, time[-1])
    return LapTrace(time_s=uniform + trace.time_s[0], distance_m=np.interp(uniform, time, d) + trace.distance_m[0],
                    speed_mps=np.interp(uniform, time, speed), source=trace.source, repairs=trace.repairs)


def stationary(duration_s: float, sample_s: float, source: str = "stationary") -> LapTrace:
    """A car standing still for ``duration_s`` seconds, sampled every ``sample_s`` seconds."""
    if duration_s <= 0 or sample_s <= 0:
        raise LapDataError(f"{source}: a stationary phase needs a duration and a sample interval above 0")
    n = max(int(np.ceil(duration_s / sample_s)), 1)
    time = np.linspace(0.0, duration_s, n + 1)
    zeros = np.zeros_like(time)
    return LapTrace(time_s=time, distance_m=zeros.copy(), speed_mps=zeros, source=source)
