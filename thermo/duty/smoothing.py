"""Zero-phase smoothing of a logged channel (Savitzky-Golay), for deciding where the brakes are on.

The speed derivative itself comes from :func:`lapdata.signal.smoothed_acceleration`; this module
only smooths a measured channel (the longitudinal acceleration) with the same filter family.
"""
from __future__ import annotations

import numpy as np
from scipy.signal import savgol_filter

SAVGOL_POLYORDER = 2
_UNIFORM_TOLERANCE = 1e-6  # relative spread of the time steps below which a grid counts as uniform


def _window_samples(window_s: float, step_s: float, n_samples: int) -> int:
    """Odd window length in samples, or 0 when the window (or the trace) is too short to filter."""
    n = int(round(window_s / step_s))
    if n % 2 == 0:
        n += 1
    n = min(n, n_samples if n_samples % 2 == 1 else n_samples - 1)
    return n if n > SAVGOL_POLYORDER else 0


def smoothed_channel(time_s, values, window_s: float):
    """A channel smoothed with a zero-phase Savitzky-Golay filter.

    Parameters
    ----------
    time_s : ndarray  Sample times, strictly increasing [s]
    values : ndarray  Channel values at those times [any unit]
    window_s : float  Filter window; 0 (or a window under three samples) means no smoothing [s]

    Returns
    -------
    ndarray  Smoothed values at ``time_s`` [unit of values]

    Notes
    -----
    Quadratic Savitzky-Golay fit over a centred window (Savitzky, A., Golay, M.J.E., Anal. Chem.
    36, 1964): zero phase, so a braking zone is not shifted in time. A non-uniform grid is
    resampled at its median step, filtered, and interpolated back.
    """
    t = np.asarray(time_s, dtype=float)
    y = np.asarray(values, dtype=float)
    steps = np.diff(t)
    step = float(np.median(steps))
    uniform = np.ptp(steps) <= _UNIFORM_TOLERANCE * step
    grid = t if uniform else t[0] + step * np.arange(int(np.floor((t[-1] - t[0]) / step)) + 1)
    n_window = _window_samples(window_s, step, grid.size) if window_s > 0 else 0
    if n_window == 0:
        return y.copy()
    filtered = savgol_filter(y if uniform else np.interp(grid, t, y), n_window, SAVGOL_POLYORDER)
    return filtered if uniform else np.interp(t, grid, filtered)
