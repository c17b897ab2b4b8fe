"""Resampling, a zero-phase derivative of speed and zero-phase smoothing of a measured channel.

Choice of derivative: a Savitzky-Golay filter (``savgol`` below, the same filter as
``scipy.signal.savgol_filter`` with ``mode='interp'``, checked against it in the tests; written
here so that a run does not load scipy.signal, which takes about 0.6 s; quadratic fit, ``deriv=1``)
on a uniform time grid. It is a symmetric FIR filter, hence
zero-phase (no lag of braking points), and it differentiates any quadratic speed history
exactly, edges included (``mode='interp'`` fits the end windows). Filtfilt plus a gradient would
also be zero-phase, but is exact only for linear speed and needs a filter design choice.
"""
from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.trace import LapTrace

_POLYORDER = 2


def resample_uniform(trace: LapTrace, rate_hz: float) -> LapTrace:
    """Resample every channel of a trace onto a uniform time grid by linear interpolation.

    Parameters
    ----------
    trace : LapTrace
        The trace to resample [-]
    rate_hz : float
        Samples per second of the new grid [Hz]

    Returns
    -------
    LapTrace
        Samples at ``t0 + k / rate_hz`` for every k with the time inside the trace [-]

    Notes
    -----
    Linear interpolation (``numpy.interp``) of distance, speed, pressures, acceleration and each
    temperature; ``source`` and ``repairs`` are kept. At least two samples must result.
    """
    if not (np.isfinite(rate_hz) and rate_hz > 0.0):
        raise LapDataError(f"{trace.source}: rate_hz = {shown(rate_hz)}: expected a finite rate > 0 Hz")
    n = int(np.floor(trace.duration_s * rate_hz * (1.0 + 1e-12))) + 1
    if n < 2:
        raise LapDataError(f"{trace.source}: rate_hz = {rate_hz:g} gives fewer than 2 samples over "
                           f"{trace.duration_s:g} s: expected a higher rate")
    grid = trace.time_s[0] + np.arange(n) / rate_hz
    grid[-1] = min(grid[-1], trace.time_s[-1])

    def at(values):
        return None if values is None else np.interp(grid, trace.time_s, values)

    return replace(
        trace, time_s=grid, distance_m=at(trace.distance_m), speed_mps=at(trace.speed_mps),
        pressure_front_pa=at(trace.pressure_front_pa), pressure_rear_pa=at(trace.pressure_rear_pa),
        accel_long_mps2=at(trace.accel_long_mps2),
        temperatures_k={k: at(val) for k, val in trace.temperatures_k.items()},
    )


def smoothed_acceleration(time_s: np.ndarray, speed_mps: np.ndarray, window_s: float = 0.5) -> np.ndarray:
    """Zero-phase smoothed longitudinal acceleration dv/dt from a speed trace.

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    speed_mps : ndarray
        Speed at those times [m/s]
    window_s : float
        Length of the Savitzky-Golay window [s]

    Returns
    -------
    ndarray
        Acceleration at each sample, positive forwards [m/s^2]

    Notes
    -----
    Savitzky-Golay first derivative, quadratic local fit, window the odd number of samples
    nearest ``window_s`` (at least 3, at most the sample count). A non-uniform input is
    interpolated onto a uniform grid at the smaller of its median and mean steps and the result interpolated back.
    Exact for speed quadratic in time [1]_.

    References
    ----------
    .. [1] A. Savitzky and M. J. E. Golay, "Smoothing and differentiation of data by simplified
       least squares procedures", Analytical Chemistry 36(8), 1627-1639, 1964.
    """
    t = np.asarray(time_s, dtype=float)
    v = np.asarray(speed_mps, dtype=float)
    if t.ndim != 1 or t.shape != v.shape:
        raise LapDataError(f"smoothed_acceleration: time_s {t.shape} and speed_mps {v.shape}: "
                           f"expected two 1-D arrays of the same length")
    if t.size < 3:
        raise LapDataError(f"smoothed_acceleration: {t.size} samples: expected at least 3")
    step = np.diff(t)
    if not np.all(step > 0.0):
        raise LapDataError("smoothed_acceleration: time_s: expected strictly increasing times")
    if not (np.isfinite(window_s) and window_s > 0.0):
        raise LapDataError(f"smoothed_acceleration: window_s = {shown(window_s)}: expected a finite value > 0 s")
    for cached_t, cached_v, cached_window, acc in _RECENT:     # a plan drives the same lap again and again
        if cached_window == window_s and np.array_equal(cached_t, t) and np.array_equal(cached_v, v):
            return acc.copy()
    grid, dt, uniform = _uniform_grid(t)
    n = max(_odd_window(window_s, dt, grid.size), _POLYORDER + 1)
    acc = savgol(v if uniform else np.interp(grid, t, v), n, _POLYORDER, deriv=1, delta=dt)
    acc = acc if uniform else np.interp(t, grid, acc)
    _RECENT.insert(0, (t.copy(), v.copy(), window_s, acc.copy()))
    del _RECENT[_RECENT_SIZE:]
    return acc


_RECENT: list = []      # the last few (time, speed, window, acceleration), compared by content
_RECENT_SIZE = 8


def smoothed_channel(time_s, values, window_s: float) -> np.ndarray:
    """A measured channel smoothed with the same zero-phase Savitzky-Golay filter (no derivative).

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    values : ndarray
        Channel values at those times [any unit]
    window_s : float
        Filter window; 0 (or a window under three samples) means no smoothing [s]

    Returns
    -------
    ndarray
        Smoothed values at ``time_s`` [unit of values]

    Notes
    -----
    Quadratic fit over a centred window, zero phase, so a braking zone is not shifted in time;
    the grid and the window follow the same rules as :func:`smoothed_acceleration`.
    """
    t = np.asarray(time_s, dtype=float)
    y = np.asarray(values, dtype=float)
    if not window_s > 0 or t.size < 3:
        return y.copy()
    grid, dt, uniform = _uniform_grid(t)
    n = _odd_window(window_s, dt, grid.size)
    if n <= _POLYORDER:
        return y.copy()
    filtered = savgol(y if uniform else np.interp(grid, t, y), n, _POLYORDER)
    return filtered if uniform else np.interp(t, grid, filtered)


def _uniform_grid(t: np.ndarray) -> tuple[np.ndarray, float, bool]:
    """(grid, step, whether t is already uniform): a non-uniform trace goes onto a uniform grid at
    the smaller of its median and mean steps, so that no stretch is undersampled."""
    step = np.diff(t)
    dt = min(float(np.median(step)), float(t[-1] - t[0]) / (t.size - 1))
    if np.allclose(step, dt, rtol=1e-6, atol=0.0):
        return t, dt, True
    return t[0] + dt * np.arange(int(np.floor((t[-1] - t[0]) / dt)) + 1), dt, False


def _odd_window(window_s: float, dt: float, n_grid: int) -> int:
    """The odd number of samples nearest ``window_s``, at most the grid's (odd) length."""
    n = int(round(window_s / dt))
    n = n + 1 if n % 2 == 0 else n
    return min(n, n_grid if n_grid % 2 else n_grid - 1)


def savgol(values: np.ndarray, window: int, polyorder: int, deriv: int = 0, delta: float = 1.0) -> np.ndarray:
    """Savitzky-Golay filter of uniformly sampled values, edges by a polynomial fit to the end windows.

    Parameters
    ----------
    values : ndarray
        Samples on a uniform grid [any unit]
    window : int
        Odd window length in samples, more than ``polyorder`` and at most ``values.size`` [-]
    polyorder : int
        Order of the local least-squares polynomial [-]
    deriv : int
        Order of the derivative to return (0: the smoothed values) [-]
    delta : float
        Sample spacing, for derivatives [unit of the grid]

    Returns
    -------
    ndarray
        Filtered values (or derivative), one per sample [unit / unit of the grid^deriv]

    Notes
    -----
    Interior samples: the least-squares polynomial over the centred window, evaluated (or
    differentiated) at its centre, i.e. a fixed convolution (Savitzky & Golay 1964). The first
    and last ``window // 2`` samples: the polynomial fitted to the first or last window, evaluated
    at each of them, as ``scipy.signal.savgol_filter(..., mode='interp')`` does.

    Examples
    --------
    >>> import numpy as np
    >>> t = np.arange(9.0)
    >>> np.round(savgol(t ** 2, 5, 2, deriv=1), 12).tolist()[1:]    # exact for a quadratic: 2 t
    [2.0, 4.0, 6.0, 8.0, 10.0, 12.0, 14.0, 16.0]
    """
    y = np.asarray(values, dtype=float)
    if window % 2 != 1 or not polyorder < window <= y.size:
        raise LapDataError(f"savgol: window {window} must be odd, above polyorder {polyorder} and at most {y.size}")
    half = window // 2
    x = np.arange(-half, half + 1, dtype=float)
    fit = np.linalg.pinv(np.vander(x, polyorder + 1, increasing=True))     # coefficients from the window's values
    weights = fit[deriv] * math.factorial(deriv) / delta ** deriv           # d^k/dx^k at x = 0
    out = np.empty_like(y)
    out[half:y.size - half] = np.convolve(y, weights[::-1], mode="valid")
    # the ends: each end window's polynomial, evaluated (differentiated) at its own samples
    powers = np.arange(polyorder + 1)
    for window_values, positions, into in ((y[:window], x[:half], slice(0, half)),
                                           (y[-window:], x[half + 1:], slice(y.size - half, y.size))):
        coefficients = fit @ window_values
        terms = [coefficients[p] * math.factorial(p) / math.factorial(p - deriv) * positions ** (p - deriv)
                 for p in powers if p >= deriv]
        out[into] = np.sum(terms, axis=0) / delta ** deriv
    return out
