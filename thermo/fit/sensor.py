"""What a temperature sensor reports: the node temperature through a first-order lag, plus an offset."""
from __future__ import annotations

import numpy as np

from lapdata.echo import shown


def first_order_lag(time_s, signal, time_constant_s):
    """Response of a first-order lag tau dy/dt = u - y to a piecewise-linear input, starting at y = u(0).

    Parameters
    ----------
    time_s : array_like
        Strictly increasing sample times [s]
    signal : array_like
        Input u at those times (e.g. a node temperature) [K]
    time_constant_s : float
        Sensor time constant tau; 0 returns the input unchanged [s]

    Returns
    -------
    ndarray
        Lagged signal y at the sample times [K]

    Notes
    -----
    Exact for an input linear between samples: with a = exp(-h/tau) and slope s = (u1 - u0)/h,
    y1 = u1 - s tau + (y0 - u0 + s tau) a. A ramp of slope s is followed with a steady lag of
    s tau; a step settles as 1 - exp(-t/tau). Valid for any h > 0 and tau >= 0.

    References
    ----------
    K. Ogata, *Modern Control Engineering*, 5th ed., Prentice Hall, 2010, section 5-2
    (first-order systems: unit-step and unit-ramp responses).
    """
    t = np.asarray(time_s, dtype=float)
    u = np.asarray(signal, dtype=float)
    if time_constant_s < 0:
        raise ValueError(f"first_order_lag: time constant must be >= 0 s, got {shown(time_constant_s)}")
    if time_constant_s == 0 or u.size < 2:
        return u.copy()
    h = np.diff(t)
    a = np.exp(-h / time_constant_s)
    slope_tau = np.diff(u) / h * time_constant_s
    y = np.empty_like(u)
    y[0] = u[0]
    for i in range(h.size):   # a short loop: a few thousand samples per channel
        y[i + 1] = u[i + 1] - slope_tau[i] + (y[i] - u[i] + slope_tau[i]) * a[i]
    return y


def sensor_reading(time_s, node_temperature_k, lag_s: float, offset_k: float, at_time_s):
    """A sensor's reading at ``at_time_s``: lagged node temperature plus offset [K].

    Parameters
    ----------
    time_s : array_like
        Model output times [s]
    node_temperature_k : array_like
        Node temperature at those times [K]
    lag_s : float
        Sensor time constant [s]
    offset_k : float
        Reading minus true temperature [K]
    at_time_s : array_like
        Times of the logged samples, within the model's span [s]
    """
    lagged = first_order_lag(time_s, node_temperature_k, lag_s)
    return np.interp(at_time_s, time_s, lagged) + offset_k
