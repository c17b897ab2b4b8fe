"""The sensor's first-order lag against scipy.signal.lsim and the textbook step and ramp responses."""
import numpy as np
import pytest
from scipy import signal

from thermo.fit.sensor import first_order_lag, sensor_reading


def test_step_response_matches_textbook():
    # Ogata, Modern Control Engineering, 5th ed., sec. 5-2: unit step through 1/(tau s + 1) -> 1 - exp(-t/tau)
    t = np.linspace(0.0, 10.0, 201)
    u = np.where(t > 0, 1.0, 0.0)
    u[0] = 0.0
    tau = 2.0
    t_fine = np.concatenate([[0.0, 1e-9], t[1:]])   # a step within the first nanosecond
    y = first_order_lag(t_fine, np.concatenate([[0.0, 1.0], u[1:]]), tau)[1:]
    assert np.allclose(y[1:], 1.0 - np.exp(-t[1:] / tau), atol=1e-6)


def test_ramp_settles_to_slope_times_tau_behind():
    # Ogata sec. 5-2: unit-ramp response t - tau + tau exp(-t/tau), a steady lag of tau
    t = np.linspace(0.0, 30.0, 61)
    y = first_order_lag(t, 3.0 * t, 1.5)
    assert np.allclose(y, 3.0 * (t - 1.5 + 1.5 * np.exp(-t / 1.5)), atol=1e-9)


def test_matches_scipy_lsim_on_a_noisy_signal():
    # scipy.signal.lsim with a first-order system (reference library) interpolates the input linearly too
    rng = np.random.default_rng(3)
    t = np.arange(300) * 0.1
    u = 400.0 + 50.0 * np.sin(t) + rng.normal(0, 5, t.size)
    tau = 0.7
    _, y_ref, _ = signal.lsim(signal.lti([1.0], [tau, 1.0]), u, t, X0=[u[0] / 1.0 * tau], interp=True)
    assert np.allclose(first_order_lag(t, u, tau), y_ref, atol=1e-6 * 400)


def test_zero_lag_and_offset():
    t = np.array([0.0, 1.0, 2.0])
    u = np.array([300.0, 310.0, 305.0])
    assert np.array_equal(first_order_lag(t, u, 0.0), u)
    assert np.allclose(sensor_reading(t, u, 0.0, 2.5, [0.5, 1.5]), [307.5, 310.0])
    with pytest.raises(ValueError, match="time constant"):
        first_order_lag(t, u, -1.0)
