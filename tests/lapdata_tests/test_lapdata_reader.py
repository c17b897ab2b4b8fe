"""Reading lap CSVs: units, time or distance base, the documented file layout."""
import numpy as np
import pytest

from lapdata import LapDataError, read_trace_csv


def write(tmp_path, text, name="lap.csv"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def table(header, rows):
    return header + "\n" + "\n".join(",".join(f"{x:.10g}" for x in r) for r in rows) + "\n"


def constant_speed_rows(n=12, dt=0.1, speed=100.0):
    return [(k * dt, speed) for k in range(n)]


@pytest.mark.parametrize("unit, value, expected_mps", [
    # 1 km/h = 1000 m / 3600 s (SI Brochure, 9th ed. 2019, Table 8: hour = 3600 s)
    ("km/h", 180.0, 50.0),
    # mile per hour = 0.44704 m/s exactly (NIST SP 811, 2008 ed., Appendix B.8)
    ("mph", 100.0, 44.704),
    ("m/s", 42.0, 42.0),
])
def test_speed_units(tmp_path, unit, value, expected_mps):
    trace = read_trace_csv(write(tmp_path, table(f"time [s],speed [{unit}]", constant_speed_rows(speed=value))))
    assert trace.speed_mps == pytest.approx(np.full(12, expected_mps), rel=1e-12)


@pytest.mark.parametrize("unit, value, expected_pa", [
    ("bar", 80.0, 8.0e6),        # bar = 1.0E+05 Pa (NIST SP 811, Appendix B.8)
    ("psi", 1000.0, 6.894757e6),  # psi = 6.894 757E+03 Pa (NIST SP 811, Appendix B.8)
    ("kPa", 250.0, 2.5e5),        # SI prefix kilo = 1e3 (SI Brochure, 9th ed., Table 7)
    ("Pa", 12345.0, 12345.0),
])
def test_pressure_units(tmp_path, unit, value, expected_pa):
    rows = [(t, v, value, 0.5 * value) for t, v in constant_speed_rows()]
    trace = read_trace_csv(write(tmp_path, table(f"time [s],speed [m/s],pressure_front [{unit}],"
                                                 f"pressure_rear [{unit}]", rows)))
    assert trace.pressure_front_pa == pytest.approx(np.full(12, expected_pa), rel=1e-6)
    assert trace.pressure_rear_pa == pytest.approx(np.full(12, 0.5 * expected_pa), rel=1e-6)
    assert trace.has_pressure


@pytest.mark.parametrize("unit, value, expected_mps2", [
    ("g", -2.0, -19.6133),   # standard acceleration of gravity 9.80665 m/s^2 (3rd CGPM 1901; NIST SP 811 B.8)
    ("m/s^2", 3.5, 3.5),
])
def test_acceleration_units(tmp_path, unit, value, expected_mps2):
    rows = [(t, v, value) for t, v in constant_speed_rows()]
    trace = read_trace_csv(write(tmp_path, table(f"time [s],speed [m/s],accel_long [{unit}]", rows)))
    assert trace.accel_long_mps2 == pytest.approx(np.full(12, expected_mps2), rel=1e-12)


def test_temperature_units_and_keys(tmp_path):
    rows = [(t, v, 350.0, 600.0) for t, v in constant_speed_rows()]
    text = table("time [s],speed [m/s],temp_disc_front_left [degC],temp_fluid_rear_right [K]", rows)
    trace = read_trace_csv(write(tmp_path, text))
    assert set(trace.temperatures_k) == {"temp_disc_front_left", "temp_fluid_rear_right"}
    # T/K = t/degC + 273.15 (SI Brochure, 9th ed. 2019, section 2.3.1)
    assert trace.temperatures_k["temp_disc_front_left"] == pytest.approx(np.full(12, 623.15))
    assert trace.temperatures_k["temp_fluid_rear_right"] == pytest.approx(np.full(12, 600.0))


def test_distance_in_km_with_time_base(tmp_path):
    rows = [(k * 0.1, k * 0.002, 72.0) for k in range(12)]   # 2 m per 0.1 s = 20 m/s = 72 km/h
    trace = read_trace_csv(write(tmp_path, table("time [s],distance [km],speed [km/h]", rows)))
    assert trace.distance_m == pytest.approx(np.arange(12) * 2.0)   # 1 km = 1000 m (SI prefix)


def test_time_derived_from_distance_constant_acceleration(tmp_path):
    # s = u t + a t^2 / 2 and v = u + a t: constant-acceleration kinematics (Halliday, Resnick &
    # Walker, Fundamentals of Physics, ch. 2); t = sum 2 ds / (v1 + v2) is exact for it.
    u, a = 20.0, 3.0
    t = np.arange(15) * 0.1
    rows = list(zip(u * t + 0.5 * a * t**2, u + a * t))
    trace = read_trace_csv(write(tmp_path, table("distance [m],speed [m/s]", rows)))
    assert trace.time_s == pytest.approx(t, abs=1e-9)


def test_distance_derived_from_time_constant_acceleration(tmp_path):
    # trapezoidal integration of a linear v(t) is exact: s = u t + a t^2 / 2 (same kinematics source)
    u, a = 30.0, -6.0
    t = np.arange(15) * 0.2
    trace = read_trace_csv(write(tmp_path, table("time [s],speed [m/s]", list(zip(t, u + a * t)))))
    assert trace.distance_m == pytest.approx(u * t + 0.5 * a * t**2, abs=1e-9)


def test_time_and_distance_start_at_zero(tmp_path):
    rows = [(100.0 + k * 0.1, 500.0 + k * 2.0, 20.0) for k in range(12)]
    trace = read_trace_csv(write(tmp_path, table("time [s],distance [m],speed [m/s]", rows)))
    assert trace.time_s[0] == 0.0 and trace.distance_m[0] == 0.0
    assert trace.duration_s == pytest.approx(1.1) and trace.length_m == pytest.approx(22.0)


def test_comments_before_header_bom_crlf_and_trailing_blank_lines(tmp_path):
    body = table("time [s],speed [m/s]", constant_speed_rows()).replace("\n", "\r\n")
    path = tmp_path / "lap.csv"
    path.write_bytes(b"\xef\xbb\xbf# logger export\r\n# second comment\r\n\r\n" + body.encode() + b"\r\n\r\n  \r\n")
    trace = read_trace_csv(path)
    assert trace.time_s.size == 12 and trace.repairs == ()
    assert trace.source == str(path)


def test_channels_absent_are_none(tmp_path):
    trace = read_trace_csv(write(tmp_path, table("time [s],speed [m/s]", constant_speed_rows())))
    assert trace.pressure_front_pa is None and trace.accel_long_mps2 is None
    assert dict(trace.temperatures_k) == {} and not trace.has_pressure


def test_error_is_one_line_value_error(tmp_path):
    with pytest.raises(LapDataError) as info:
        read_trace_csv(write(tmp_path, "time [s],speed [m/s]\n" + "x,1\n" * 12))
    assert "\n" not in str(info.value) and isinstance(info.value, ValueError)
