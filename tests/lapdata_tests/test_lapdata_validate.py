"""One test per validation rule of the lap CSV reader (messages name file, row and column)."""
import numpy as np
import pytest

from lapdata import LapDataError, read_trace_csv
from lapdata.units import STANDARD_GRAVITY

HEADER = "time [s],speed [km/h]"


def write(tmp_path, text, name="lap.csv"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def lines_of(speeds_kmh, dt=0.05, times=None):
    times = [k * dt for k in range(len(speeds_kmh))] if times is None else times
    return [f"{t:.6g},{v:.6g}" for t, v in zip(times, speeds_kmh)]


def csv(rows, header=HEADER):
    return header + "\n" + "\n".join(rows) + "\n"


def error_of(path, **kw):
    with pytest.raises(LapDataError) as info:
        read_trace_csv(path, **kw)
    message = str(info.value)
    assert "\n" not in message and message.startswith(str(path))
    return message


STEADY = [150.0] * 20


def test_missing_unit(tmp_path):
    msg = error_of(write(tmp_path, csv(lines_of(STEADY), "time [s],speed")))
    assert "row 1, column 'speed'" in msg and "missing unit" in msg and "km/h" in msg


def test_unknown_unit(tmp_path):
    msg = error_of(write(tmp_path, csv(lines_of(STEADY), "time [s],speed [knots]")))
    assert "row 1" in msg and "'knots'" in msg and "m/s, km/h, mph" in msg


def test_unknown_channel_suggests_close_match(tmp_path):
    msg = error_of(write(tmp_path, csv([r + ",1" for r in lines_of(STEADY)], HEADER + ",presure_front [bar]")))
    assert "column 'presure_front [bar]'" in msg and "did you mean 'pressure_front'" in msg
    assert "accel_long" in msg and "temp_<what>" in msg


def test_duplicate_channel(tmp_path):
    msg = error_of(write(tmp_path, csv([r + ",1" for r in lines_of(STEADY)], HEADER + ",speed [m/s]")))
    assert "appears twice" in msg


def test_non_numeric_cell(tmp_path):
    rows = lines_of(STEADY)
    rows[6] = "0.3,fast"
    msg = error_of(write(tmp_path, csv(rows)))
    assert "row 8, column 'speed [km/h]'" in msg and "not a number" in msg


def test_empty_cell(tmp_path):
    rows = lines_of(STEADY)
    rows[3] = "0.15,"
    msg = error_of(write(tmp_path, csv(rows)))
    assert "row 5, column 'speed [km/h]'" in msg and "empty cell" in msg


@pytest.mark.parametrize("token", ["nan", "inf", "-Infinity", "1e400"])
def test_nan_and_inf(tmp_path, token):
    rows = lines_of(STEADY)
    rows[4] = f"0.2,{token}"
    msg = error_of(write(tmp_path, csv(rows)))
    assert "row 6, column 'speed [km/h]'" in msg and "not finite" in msg


def test_wrong_number_of_cells(tmp_path):
    rows = lines_of(STEADY)
    rows[2] += ",7"
    msg = error_of(write(tmp_path, csv(rows)))
    assert "row 4" in msg and "expected 2 cells" in msg


def test_decreasing_time(tmp_path):
    times = [k * 0.05 for k in range(20)]
    times[9] = 0.3
    msg = error_of(write(tmp_path, csv(lines_of(STEADY, times=times))))
    assert "row 11, column 'time [s]'" in msg and "decreasing" in msg and "strictly increasing" in msg


def test_repeated_time(tmp_path):
    times = [k * 0.05 for k in range(20)]
    times[5] = times[4]
    msg = error_of(write(tmp_path, csv(lines_of(STEADY, times=times))))
    assert "row 7, column 'time [s]'" in msg and "repeated" in msg


def test_repeated_distance_base(tmp_path):
    rows = [f"{2.0 * k if k != 8 else 14.0:g},72" for k in range(20)]
    msg = error_of(write(tmp_path, csv(rows, "distance [m],speed [km/h]")))
    assert "row 10, column 'distance [m]'" in msg and "repeated" in msg


def test_logged_distance_going_backwards(tmp_path):
    rows = [f"{0.1 * k:g},{2.0 * k if k != 8 else 13.0:g},72" for k in range(20)]
    msg = error_of(write(tmp_path, csv(rows, "time [s],distance [m],speed [km/h]")))
    assert "row 10, column 'distance [m]'" in msg and "never decreasing" in msg


def test_negative_speed(tmp_path):
    speeds = [2.0] * 20
    speeds[12] = -0.5
    msg = error_of(write(tmp_path, csv(lines_of(speeds, dt=1.0))))
    assert "row 14, column 'speed [km/h]'" in msg and "negative speed" in msg


def _constant_accel_speeds(accel_g, n=20, dt=0.05, v0_kmh=250.0):
    return [v0_kmh + 3.6 * accel_g * STANDARD_GRAVITY * dt * k for k in range(n)]


def test_deceleration_limit_5g(tmp_path):
    # limit stated in the brief: 5 g  # common practice, no published source
    assert read_trace_csv(write(tmp_path, csv(lines_of(_constant_accel_speeds(-4.9))), "ok.csv")).time_s.size == 20
    msg = error_of(write(tmp_path, csv(lines_of(_constant_accel_speeds(-5.1)))))
    assert "row 3, column 'speed [km/h]'" in msg and "implausible jump" in msg and "-5.1 g" in msg


def test_acceleration_limit_3g(tmp_path):
    # limit stated in the brief: about 3 g  # common practice, no published source
    assert read_trace_csv(write(tmp_path, csv(lines_of(_constant_accel_speeds(2.9, v0_kmh=60))), "ok.csv"))
    msg = error_of(write(tmp_path, csv(lines_of(_constant_accel_speeds(3.1, v0_kmh=60)))))
    assert "row 3" in msg and "implausible jump" in msg and "+3.1 g" in msg


def test_speed_dropout_error_says_repair(tmp_path):
    speeds = [187.3] * 20
    speeds[10] = 0.0
    msg = error_of(write(tmp_path, csv(lines_of(speeds))))
    assert "row 12, column 'speed [km/h]'" in msg and "drop-out" in msg and "--repair" in msg


def test_speed_dropout_repaired(tmp_path):
    speeds = [180.0 + 0.1 * k for k in range(20)]
    speeds[10] = 0.0
    trace = read_trace_csv(write(tmp_path, csv(lines_of(speeds))), repair=True)
    assert trace.repairs == ("row 12: speed drop-out 0.0 km/h replaced by 181.0 km/h",)
    assert trace.speed_mps[10] * 3.6 == pytest.approx(181.0)


def test_long_time_gap_is_an_error_even_with_repair(tmp_path):
    times = [k * 0.05 for k in range(10)] + [0.45 + 0.4 + k * 0.05 for k in range(10)]  # 9 steps long
    for repair in (False, True):
        msg = error_of(write(tmp_path, csv(lines_of(STEADY, times=times))), repair=repair)
        assert "row 12, column 'time [s]'" in msg and "no gap longer than 5 median steps" in msg


def test_short_time_gap_error_says_repair(tmp_path):
    times = [k * 0.05 for k in range(10)] + [0.45 + 0.15 + k * 0.05 for k in range(10)]  # 2 samples lost
    msg = error_of(write(tmp_path, csv(lines_of(STEADY, times=times))))
    assert "row 12, column 'time [s]'" in msg and "--repair" in msg and "after row 11" in msg


def test_short_time_gap_filled_by_linear_interpolation(tmp_path):
    times = [k * 0.05 for k in range(10)] + [0.6 + k * 0.05 for k in range(10)]
    speeds = [100.0 + 10.0 * t for t in times]   # linear in time: interpolation must be exact
    trace = read_trace_csv(write(tmp_path, csv(lines_of(speeds, times=times))), repair=True)
    assert trace.time_s == pytest.approx(np.arange(22) * 0.05)
    assert trace.speed_mps * 3.6 == pytest.approx(100.0 + 10.0 * trace.time_s)
    assert len(trace.repairs) == 1 and trace.repairs[0].startswith("rows 11-12: 2 missing sample(s)")


def test_fewer_than_10_samples(tmp_path):
    msg = error_of(write(tmp_path, csv(lines_of([100.0] * 9))))
    assert "at least 10 data rows, got 9" in msg and "row 10" in msg


def test_header_only(tmp_path):
    assert "got 0" in error_of(write(tmp_path, HEADER + "\n"))


def test_empty_file(tmp_path):
    assert "no header row" in error_of(write(tmp_path, "# only a comment\n\n"))


def test_missing_file(tmp_path):
    assert "file not found" in error_of(tmp_path / "absent.csv")


def test_unreadable_path(tmp_path):
    assert "is a folder; expected a lap trace CSV" in error_of(tmp_path)


def test_special_files_are_refused_without_reading(tmp_path):
    import os
    fifo = tmp_path / "pipe.csv"
    os.mkfifo(fifo)                        # reading it would block for ever
    assert "not a regular file" in error_of(fifo)
    assert "not a regular file" in error_of("/dev/zero")   # reading it would never end


def test_not_utf8(tmp_path):
    path = tmp_path / "lap.csv"
    path.write_bytes(csv(lines_of(STEADY)).encode() + b"\xff\xfe")
    assert "not UTF-8" in error_of(path)


def test_no_speed_column(tmp_path):
    msg = error_of(write(tmp_path, csv([f"{0.1 * k:g},{k:g}" for k in range(20)], "time [s],distance [m]")))
    assert "no speed column" in msg and "row 1" in msg


def test_no_time_or_distance_column(tmp_path):
    msg = error_of(write(tmp_path, csv(["100,1"] * 20, "speed [km/h],accel_long [g]")))
    assert "no time or distance column" in msg


def test_distance_base_needs_positive_speed(tmp_path):
    rows = [f"{2.0 * k:g},{0 if k == 19 else 5}" for k in range(20)]  # a gentle stop at the end
    msg = error_of(write(tmp_path, csv(rows, "distance [m],speed [km/h]")))
    assert "row 21, column 'speed [km/h]'" in msg and "speed > 0" in msg


def test_blank_line_inside_data(tmp_path):
    rows = lines_of(STEADY)
    rows.insert(5, "")
    msg = error_of(write(tmp_path, csv(rows)))
    assert "row 7" in msg and "blank line" in msg


def test_comment_inside_data(tmp_path):
    rows = lines_of(STEADY)
    rows.insert(5, "# pit entry")
    assert "only before the header" in error_of(write(tmp_path, csv(rows)))


def test_temperature_below_absolute_zero(tmp_path):
    rows = [r + (",-300" if k == 4 else ",20") for k, r in enumerate(lines_of(STEADY))]
    msg = error_of(write(tmp_path, csv(rows, HEADER + ",temp_caliper_fl [degC]")))
    assert "row 6, column 'temp_caliper_fl [degC]'" in msg and "absolute zero" in msg


def test_implausible_speed_ceiling(tmp_path):
    msg = error_of(write(tmp_path, csv(lines_of([800.0] * 20))))
    assert "row 2" in msg and "implausible" in msg
