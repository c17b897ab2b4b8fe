"""The lap builder against closed-form kinematics, and the track TOML reader.

Demo car used for scenarios/demo_lap.csv (invented, endurance-prototype-like), also recorded in
scenarios/demo_circuit.toml: mass 1000 kg with driver, braking 1.6 g and lateral grip 1.7 g at
low speed, 400 kW, traction 1.0 g, ClA 3.0 m^2, CdA 1.0 m^2, air 1.2 kg/m^3.
"""
import math
from pathlib import Path

import numpy as np
import pytest

from lapdata import (CarEnvelope, LapDataError, TrackDescription, TrackSegment, build_speed_trace,
                     find_braking_zones, read_trace_csv, read_track_toml)
from lapdata.units import KMH, STANDARD_GRAVITY as G

ROOT = Path(__file__).resolve().parents[2]
DEMO_CAR = CarEnvelope(mass_kg=1000.0, braking_decel_g=1.6, lateral_grip_g=1.7, power_w=400e3,
                       traction_accel_g=1.0, downforce_cl_a_m2=3.0, drag_cd_a_m2=1.0)


def no_aero_car(**kw):
    base = dict(mass_kg=800.0, braking_decel_g=1.0, lateral_grip_g=1.5, power_w=1e9, traction_accel_g=0.5,
                downforce_cl_a_m2=0.0, drag_cd_a_m2=0.0, top_speed_kmh=216.0)
    return CarEnvelope(**{**base, **kw})


KINEMATIC_TRACK = TrackDescription("test oval", (
    TrackSegment("corner", 200.0, min_speed_kmh=72.0, name="slow"),
    TrackSegment("straight", 1000.0, name="long"),
))


def test_braking_follows_constant_deceleration_kinematics():
    # v^2 = u^2 + 2 a s with a = -mu g (downforce and drag off): constant-acceleration kinematics
    # (Halliday, Resnick & Walker, Fundamentals of Physics, ch. 2)
    lap = build_speed_trace(KINEMATIC_TRACK, no_aero_car(), sample_hz=50.0)
    v, s = lap.speed_mps, lap.distance_m
    corner_entry = 1200.0   # end of the straight = start of the next lap's corner
    zone = (s > corner_entry - 200.0) & (v > 20.5) & (v < 59.5)
    assert zone.sum() > 100
    assert v[zone] ** 2 == pytest.approx(20.0**2 + 2.0 * G * (corner_entry - s[zone]), abs=0.05)
    # braking distance and time of the 60 -> 20 m/s stop
    zones = find_braking_zones(lap)
    assert len(zones) == 1
    assert zones[0].d_end_m - zones[0].d_start_m == pytest.approx((60.0**2 - 20.0**2) / (2 * G), abs=1.5)
    assert zones[0].peak_decel_mps2 == pytest.approx(G, rel=1e-3)


def test_traction_limited_acceleration_and_lap_time():
    # same kinematics source: accelerating at 0.5 g from 20 to 60 m/s, cruising, braking at 1 g
    lap = build_speed_trace(KINEMATIC_TRACK, no_aero_car(), sample_hz=50.0)
    v, s = lap.speed_mps, lap.distance_m
    out = (s > 200.0) & (s < 400.0) & (v < 59.5)
    assert v[out] ** 2 == pytest.approx(20.0**2 + 2.0 * 0.5 * G * (s[out] - 200.0), abs=0.05)
    a_up, a_down = 0.5 * G, G
    d_up, d_down = (60**2 - 20**2) / (2 * a_up), (60**2 - 20**2) / (2 * a_down)
    lap_time = 200 / 20 + 40 / a_up + 40 / a_down + (1000 - d_up - d_down) / 60
    assert lap.duration_s == pytest.approx(lap_time, abs=1.0 / 50.0 + 1e-3)   # last sample <= lap time
    assert lap.duration_s <= lap_time


def test_corner_speed_without_downforce():
    # uniform circular motion: v^2 / R = mu g (Halliday, Resnick & Walker, ch. 4 and 6)
    car = no_aero_car(top_speed_kmh=None, drag_cd_a_m2=0.5)
    assert car.corner_speed_mps(50.0) == pytest.approx(math.sqrt(1.5 * G * 50.0), rel=1e-12)
    track = TrackDescription("t", (TrackSegment("corner", 300.0, radius_m=50.0), TrackSegment("straight", 500.0)))
    assert build_speed_trace(track, car).speed_mps.min() == pytest.approx(math.sqrt(1.5 * G * 50.0), rel=1e-6)


def test_corner_speed_with_downforce_balances_lateral_force():
    # Newton's second law across the corner: m v^2 / R = mu (m g + rho ClA v^2 / 2)
    v = DEMO_CAR.corner_speed_mps(60.0)
    assert 1000.0 * v**2 / 60.0 == pytest.approx(1.7 * (1000.0 * G + 0.5 * 1.2 * 3.0 * v**2), rel=1e-12)
    assert math.isinf(DEMO_CAR.corner_speed_mps(1e5))   # downforce outgrows the centripetal need


def test_braking_deceleration_grows_with_downforce_and_drag():
    q = 0.5 * 1.2 * 80.0**2
    expected = (1.6 * (1000 * G + 3.0 * q) + 1.0 * q) / 1000
    assert DEMO_CAR.braking_decel_mps2(80.0) == pytest.approx(expected, rel=1e-12)
    assert DEMO_CAR.braking_decel_mps2(0.0) == pytest.approx(1.6 * G)


def test_drag_limited_top_speed():
    # power balance at top speed: P = rho CdA v^3 / 2 (drag equation, e.g. Hucho, Aerodynamics of
    # Road Vehicles, 4th ed., ch. 1)
    car = CarEnvelope(1000.0, 1.6, 1.7, 400e3, 1.0, 0.0, 1.0)
    v_top = (2 * 400e3 / (1.2 * 1.0)) ** (1 / 3)
    track = TrackDescription("drag strip", (TrackSegment("corner", 50.0, min_speed_kmh=100.0),
                                            TrackSegment("straight", 8000.0)))
    top = build_speed_trace(track, car).speed_mps.max()
    assert 0.99 * v_top < top < v_top


def test_pace_scales_speed_and_lap_time():
    full = build_speed_trace(KINEMATIC_TRACK, no_aero_car(), sample_hz=100.0)
    slow = build_speed_trace(KINEMATIC_TRACK, no_aero_car(), sample_hz=100.0, pace=0.8)
    assert slow.duration_s == pytest.approx(full.duration_s / 0.8, abs=0.011)   # time = integral ds / v
    assert slow.speed_mps.max() == pytest.approx(0.8 * 60.0)
    with pytest.raises(LapDataError, match="pace"):
        build_speed_trace(KINEMATIC_TRACK, no_aero_car(), pace=1.2)


def test_speed_limit_caps_everywhere():
    lap = build_speed_trace(KINEMATIC_TRACK, no_aero_car(), speed_limit_kmh=60.0)
    assert lap.speed_mps.max() == pytest.approx(60.0 * KMH) and np.all(lap.speed_mps <= 60.0 * KMH + 1e-12)
    assert lap.duration_s == pytest.approx(1200.0 / (60 * KMH), abs=0.05 + 1e-9)


def test_flying_lap_is_periodic_and_uniform():
    lap = build_speed_trace(read_track_toml(ROOT / "scenarios" / "demo_circuit.toml"), DEMO_CAR, sample_hz=20.0)
    assert np.diff(lap.time_s) == pytest.approx(np.full(lap.time_s.size - 1, 0.05))
    assert lap.speed_mps[-1] == pytest.approx(lap.speed_mps[0], rel=0.01)
    assert lap.accel_long_mps2 is not None and lap.pressure_front_pa is None


def test_demo_circuit_meets_its_brief():
    # project requirement from the brief (not an external source): 4.5-5.5 km, 10-14 segments,
    # 5-7 braking zones, lap 95-110 s for the demo car
    track = read_track_toml(ROOT / "scenarios" / "demo_circuit.toml")
    lap = build_speed_trace(track, DEMO_CAR)
    assert track.name == "Kestrel Valley Raceway" and 4500 <= track.length_m <= 5500
    assert 10 <= len(track.segments) <= 15
    assert 95.0 <= lap.duration_s <= 110.0
    assert 5 <= len(find_braking_zones(lap)) <= 7
    assert lap.accel_long_mps2.min() > -5 * G


def test_demo_lap_csv_reads_clean_and_matches_its_generator():
    import make_demo_lap   # tests/lapdata_tests/make_demo_lap.py
    trace = read_trace_csv(ROOT / "scenarios" / "demo_lap.csv")
    assert trace.repairs == () and trace.has_pressure
    assert np.diff(trace.time_s) == pytest.approx(np.full(trace.time_s.size - 1, 0.05), abs=1e-9)
    rows = make_demo_lap.make_demo_rows()
    assert trace.speed_mps * 3.6 == pytest.approx(rows[:, 2], abs=0.006)   # file rounds to 0.01 km/h
    assert len(find_braking_zones(trace)) == 6


def test_segment_validation():
    with pytest.raises(LapDataError, match="did you mean 'corner'"):
        TrackSegment("coner", 100.0, radius_m=30.0)
    with pytest.raises(LapDataError, match="length_m"):
        TrackSegment("straight", 0.0)
    with pytest.raises(LapDataError, match="exactly one"):
        TrackSegment("corner", 100.0)
    with pytest.raises(LapDataError, match="exactly one"):
        TrackSegment("corner", 100.0, radius_m=30.0, min_speed_kmh=80.0)
    with pytest.raises(LapDataError, match="radius_m"):
        TrackSegment("corner", 100.0, radius_m=-3.0)
    with pytest.raises(LapDataError, match="no radius_m"):
        TrackSegment("straight", 100.0, radius_m=30.0)
    with pytest.raises(LapDataError, match="power_w"):
        no_aero_car(power_w=0.0)
    with pytest.raises(LapDataError, match="non-empty"):
        TrackDescription("t", ())


def _toml(tmp_path, text):
    path = tmp_path / "track.toml"
    path.write_text(text, encoding="utf-8")
    return path


GOOD = 'name = "Test Ring"\n[[segments]]\nkind = "straight"\nlength_m = 500\n' \
       '[[segments]]\nkind = "corner"\nlength_m = 80.0\nradius_m = 30\nname = "T1"\n'


def test_read_track_toml(tmp_path):
    track = read_track_toml(_toml(tmp_path, GOOD))
    assert track.name == "Test Ring" and track.length_m == 580.0
    assert track.segments[1] == TrackSegment("corner", 80.0, radius_m=30, name="T1")


@pytest.mark.parametrize("text, expected", [
    (GOOD.replace("length_m = 500", "lenght_m = 500"), "segment 1: unknown key 'lenght_m' (did you mean 'length_m'?)"),
    (GOOD.replace('name = "Test Ring"', 'nmae = "Test Ring"'), "top level: unknown key 'nmae' (did you mean 'name'?)"),
    (GOOD.replace("radius_m = 30", "radius_mm = 30"), "segment 2: unknown key 'radius_mm'"),
    (GOOD.replace("radius_m = 30", ""), "segment 2: segment 'T1': a corner needs radius_m or min_speed_kmh"),
    (GOOD.replace("length_m = 80.0", "length_m = -80.0"), "segment 2: segment 'T1': length_m = -80.0"),
    (GOOD.replace("length_m = 500", 'length_m = "500"'), "length_m = '500': expected a finite number"),
    (GOOD.replace("length_m = 500\n", ""), "segment 1: missing key 'length_m'"),
    (GOOD + "[broken", "not valid TOML"),
    ('name = "x"\n', "expected keys 'name' and [[segments]]"),
])
def test_track_toml_errors(tmp_path, text, expected):
    path = _toml(tmp_path, text)
    with pytest.raises(LapDataError) as info:
        read_track_toml(path)
    assert str(info.value).startswith(str(path)) and expected in str(info.value)


def test_track_toml_missing_file(tmp_path):
    with pytest.raises(LapDataError, match="file not found"):
        read_track_toml(tmp_path / "nope.toml")
