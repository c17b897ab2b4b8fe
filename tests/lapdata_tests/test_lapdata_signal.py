"""Resampling and the zero-phase acceleration."""
import numpy as np
import pytest

from lapdata import LapDataError, LapTrace, resample_uniform, smoothed_acceleration


def ramp_trace():
    t = np.array([0.0, 0.03, 0.11, 0.2, 0.26, 0.4, 0.47, 0.6, 0.71, 0.8, 1.0])
    v = 40.0 - 5.0 * t
    return LapTrace(time_s=t, distance_m=40.0 * t - 2.5 * t**2, speed_mps=v,
                    pressure_front_pa=1e6 * t, pressure_rear_pa=7e5 * t, accel_long_mps2=-5.0 + 0 * t,
                    temperatures_k={"temp_disc_fl": 500.0 + 100.0 * t}, source="ramp", repairs=("x",))


def test_resample_uniform_all_channels_linear():
    out = resample_uniform(ramp_trace(), 20.0)
    grid = np.arange(21) * 0.05
    assert out.time_s == pytest.approx(grid, abs=1e-12)
    # linear channels are reproduced exactly by linear interpolation
    assert out.speed_mps == pytest.approx(40.0 - 5.0 * grid)
    assert out.pressure_front_pa == pytest.approx(1e6 * grid)
    assert out.pressure_rear_pa == pytest.approx(7e5 * grid)
    assert out.accel_long_mps2 == pytest.approx(np.full(21, -5.0))
    assert out.temperatures_k["temp_disc_fl"] == pytest.approx(500.0 + 100.0 * grid)
    assert out.source == "ramp" and out.repairs == ("x",)
    # distance is quadratic: linear interpolation error bounded by max|s''| h^2 / 8 (h = 0.2 s,
    # the longest input step; standard interpolation error bound, e.g. Burden & Faires, Numerical
    # Analysis, Thm 3.3)
    assert out.distance_m == pytest.approx(40.0 * grid - 2.5 * grid**2, abs=5.0 * 0.2**2 / 8)


def test_resample_keeps_absent_channels_absent():
    t = np.linspace(0, 2, 9)
    out = resample_uniform(LapTrace(time_s=t, distance_m=10 * t, speed_mps=10 + 0 * t), 10.0)
    assert out.pressure_front_pa is None and out.accel_long_mps2 is None and out.time_s.size == 21


@pytest.mark.parametrize("rate", [0.0, -5.0, float("nan"), float("inf"), 0.5])
def test_resample_bad_rate(rate):
    with pytest.raises(LapDataError, match="rate_hz"):
        resample_uniform(ramp_trace(), rate)


def test_smoothed_acceleration_exact_for_quadratic_speed():
    # A Savitzky-Golay quadratic fit reproduces a quadratic exactly, so its derivative is exact
    # (Savitzky & Golay, Analytical Chemistry 36, 1964), edges included with mode='interp'.
    t = np.arange(200) * 0.05
    v = 60.0 + 2.0 * t - 0.5 * t**2
    assert smoothed_acceleration(t, v) == pytest.approx(2.0 - t, abs=1e-9)


def test_smoothed_acceleration_non_uniform_input():
    rng = np.random.default_rng(1)
    t = np.cumsum(rng.uniform(0.04, 0.06, 200))
    v = 60.0 - 3.0 * t
    assert smoothed_acceleration(t, v) == pytest.approx(np.full(200, -3.0), abs=1e-6)


def test_smoothed_acceleration_zero_phase():
    # A centred (non-causal) Savitzky-Golay differentiator is antisymmetric: its response is purely
    # imaginary, like d/dt itself, so a sinusoid keeps its phase (Oppenheim & Schafer,
    # Discrete-Time Signal Processing, 3rd ed., sec. 5.7: generalised linear phase, here delay 0).
    t = np.arange(2000) * 0.02
    w = 2 * np.pi * 0.5
    a = smoothed_acceleration(t, 50.0 + 10.0 * np.sin(w * t), window_s=0.5)
    inner = slice(100, -100)
    basis = np.column_stack([np.cos(w * t[inner]), np.sin(w * t[inner])])
    (cos_part, sin_part), *_ = np.linalg.lstsq(basis, a[inner], rcond=None)
    assert abs(sin_part) < 1e-6 * abs(cos_part)
    # Gain: on a symmetric window the quadratic-fit derivative equals the least-squares slope,
    # h_k = k / (dt sum k^2) (Savitzky & Golay 1964; R. W. Schafer, "What is a Savitzky-Golay
    # filter?", IEEE Signal Processing Magazine 28(4), 2011), whose response to sin(w t) is
    # w G cos(w t) with G = sum k sin(k w dt) / (w dt sum k^2); 0.5 s at 50 Hz -> 25 samples.
    k = np.arange(-12, 13)
    gain = np.sum(k * np.sin(k * w * 0.02)) / (w * 0.02 * np.sum(k**2))
    assert cos_part == pytest.approx(10.0 * w * gain, rel=1e-9)
    assert 0.9 < gain < 1.0


def test_smoothed_acceleration_rejects_bad_input():
    with pytest.raises(LapDataError):
        smoothed_acceleration(np.array([0.0, 1.0]), np.array([1.0, 2.0]))
    with pytest.raises(LapDataError):
        smoothed_acceleration(np.array([0.0, 1.0, 1.0]), np.ones(3))
    with pytest.raises(LapDataError):
        smoothed_acceleration(np.arange(5.0), np.ones(4))


@pytest.mark.parametrize("window", [3, 5, 9, 21, 41])
@pytest.mark.parametrize("deriv", [0, 1])
def test_savgol_matches_scipy_signal_savgol_filter(window, deriv):
    """lapdata's own filter against the reference implementation (scipy.signal.savgol_filter,
    mode='interp', PyPI), edges included, on a noisy random walk."""
    from scipy.signal import savgol_filter
    from lapdata.signal import savgol
    y = np.random.default_rng(window + deriv).normal(size=301).cumsum()
    ours = savgol(y, window, 2, deriv=deriv, delta=0.05)
    reference = savgol_filter(y, window, 2, deriv=deriv, delta=0.05, mode="interp")
    np.testing.assert_allclose(ours, reference, rtol=1e-10, atol=1e-10 * np.abs(reference).max())


def test_savgol_rejects_a_window_it_cannot_fit():
    from lapdata.signal import savgol
    with pytest.raises(LapDataError, match="window 4 must be odd"):
        savgol(np.arange(10.0), 4, 2)
