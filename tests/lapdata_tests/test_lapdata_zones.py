"""Braking zones found on synthetic traces with known constant-deceleration stops."""
import numpy as np
import pytest

from lapdata import LapDataError, LapTrace, braking_mask, find_braking_zones

DT = 0.05
# (start time, v_in, v_out, deceleration): the stops built into the synthetic trace
STOPS = ((5.0, 60.0, 20.0, 10.0), (25.0, 60.0, 30.0, 15.0))


def synthetic(with_pressure: bool) -> LapTrace:
    """Speed piecewise linear in time: constant-deceleration stops, cruises and a 8 m/s^2 climb back."""
    t = np.arange(0.0, 40.0, DT)
    v = np.full_like(t, 60.0)
    braking = np.zeros(t.size, dtype=bool)
    for k, (t0, v_in, v_out, decel) in enumerate(STOPS):
        t1 = t0 + (v_in - v_out) / decel
        inside = (t >= t0 - 1e-9) & (t <= t1 + 1e-9)
        v = np.where(inside, v_in - decel * (t - t0), v)
        braking |= inside
        if k == 0:
            v = np.where((t > t1) & (t < 15.0), v_out, v)
            v = np.where((t >= 15.0) & (t < 20.0), v_out + 8.0 * (t - 15.0), v)
        else:
            v = np.where(t > t1, v_out, v)
    s = np.concatenate([[0.0], np.cumsum(0.5 * (v[1:] + v[:-1]) * DT)])
    p = np.where(braking, 60e5, 0.0) if with_pressure else None
    return LapTrace(time_s=t, distance_m=s, speed_mps=v, pressure_front_pa=p,
                    pressure_rear_pa=None if p is None else 0.7 * p, source="synthetic")


def expected(k):
    t0, v_in, v_out, decel = STOPS[k]
    return t0, t0 + (v_in - v_out) / decel, v_in, v_out, decel


def test_zones_from_pressure_exact():
    zones = find_braking_zones(synthetic(True))
    assert len(zones) == 2
    for k, z in enumerate(zones):
        t0, t1, v_in, v_out, decel = expected(k)
        assert z.t_start_s == pytest.approx(t0, abs=1e-9) and z.t_end_s == pytest.approx(t1, abs=1e-9)
        assert z.v_in_mps == pytest.approx(v_in) and z.v_out_mps == pytest.approx(v_out)
        assert z.duration_s == pytest.approx(t1 - t0, abs=1e-9)
        # zone distance of a constant-deceleration stop: (v_in^2 - v_out^2) / (2 a)
        # (constant-acceleration kinematics, Halliday, Resnick & Walker, Fundamentals of Physics, ch. 2)
        assert z.d_end_m - z.d_start_m == pytest.approx((v_in**2 - v_out**2) / (2 * decel), rel=1e-9)
        assert z.peak_decel_mps2 == pytest.approx(decel, rel=1e-6)


def test_zones_from_deceleration_default_hysteresis():
    zones = find_braking_zones(synthetic(False))
    assert len(zones) == 2
    half_window = 0.25   # 0.5 s smoothing window: a kink is spread over +-5 samples
    for k, z in enumerate(zones):
        t0, t1, v_in, v_out, decel = expected(k)
        assert abs(z.t_start_s - t0) <= DT + 1e-9          # on at 4 m/s^2: within one sample
        assert 0.0 <= z.t_end_s - t1 <= half_window + 1e-9  # off at 2 m/s^2: late by less than half a window
        assert abs(z.v_in_mps - v_in) <= decel * DT + 1e-9
        assert z.v_out_mps == pytest.approx(v_out)
        assert z.peak_decel_mps2 == pytest.approx(decel, rel=1e-6)


def test_zones_from_deceleration_half_peak_threshold_within_one_sample():
    trace = synthetic(False)
    for k, (t0, v_in, v_out, decel) in enumerate(STOPS):
        zones = find_braking_zones(trace, decel_on_mps2=decel / 2, decel_off_mps2=decel / 2)
        z = [z for z in zones if abs(z.t_start_s - t0) < 1.0][0]
        t1 = t0 + (v_in - v_out) / decel
        assert abs(z.t_start_s - t0) <= DT + 1e-9 and abs(z.t_end_s - t1) <= DT + 1e-9
        assert abs(z.v_in_mps - v_in) <= decel * DT + 1e-9 and abs(z.v_out_mps - v_out) <= decel * DT + 1e-9


def test_hysteresis_keeps_zone_whole_and_min_duration_drops_blips():
    t = np.arange(0.0, 20.0, DT)
    # deceleration 6 m/s^2, dipping to 3 m/s^2 (between off and on) for 1 s, then a 0.2 s blip
    a = np.where((t >= 2) & (t < 8), -6.0, 0.0)
    a = np.where((t >= 4) & (t < 5), -3.0, a)
    a = np.where((t >= 12) & (t < 12.2), -6.0, a)
    v = 80.0 + np.concatenate([[0.0], np.cumsum(0.5 * (a[1:] + a[:-1]) * DT)])
    trace = LapTrace(time_s=t, distance_m=np.cumsum(v) * DT, speed_mps=v)
    zones = find_braking_zones(trace, min_duration_s=0.3)
    assert len(zones) == 1 and zones[0].t_start_s < 2.1 and zones[0].t_end_s > 7.9
    assert len(find_braking_zones(trace, decel_on_mps2=4.0, decel_off_mps2=4.0)) == 2   # no hysteresis: split
    mask = braking_mask(trace)
    assert mask.dtype == bool and mask.shape == t.shape and not mask[(t > 11) & (t < 13)].any()


def test_pressure_threshold():
    trace = synthetic(True)
    assert len(find_braking_zones(trace, pressure_threshold_pa=70e5)) == 0   # line pressure 60 bar
    assert braking_mask(trace, pressure_threshold_pa=50e5).sum() == braking_mask(trace).sum()


@pytest.mark.parametrize("kw", [dict(decel_on_mps2=0.0), dict(decel_off_mps2=5.0), dict(min_duration_s=-1.0),
                                dict(pressure_threshold_pa=float("nan"))])
def test_bad_settings(kw):
    with pytest.raises(LapDataError, match="synthetic"):
        find_braking_zones(synthetic(False), **kw)
