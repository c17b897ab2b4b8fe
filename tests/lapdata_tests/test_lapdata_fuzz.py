"""Fuzz the CSV reader: any input gives a LapTrace or a LapDataError, nothing else."""
import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from lapdata import LapDataError, LapTrace, read_trace_csv

VALID = "\n".join(
    ["# synthetic", "time [s],distance [m],speed [km/h],pressure_front [bar],accel_long [g],temp_disc_fl [degC]"]
    + [f"{0.05 * k:.2f},{2.5 * k:.2f},{180.0 - 0.5 * k:.1f},{0 if k < 10 else 40},{-0.1 * (k >= 10):.2f},{300 + k}"
       for k in range(20)]
) + "\n"
TOKENS = ["", ",", "\n", "#", "[", "]", " ", "nan", "inf", "-1", "0", "1e308", "1e400", "-0", "km/h",
          "x", "\r", "\x00", "\ufeff", "é", "1_0", "99999"]
FUZZ = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])


def check_outcome(path):
    for repair in (False, True):
        try:
            trace = read_trace_csv(path, repair=repair)
        except LapDataError as exc:
            assert "\n" not in str(exc)
            continue
        assert isinstance(trace, LapTrace)
        assert np.all(np.diff(trace.time_s) > 0) and np.all(np.isfinite(trace.speed_mps))
        assert np.all(np.isfinite(trace.distance_m)) and np.all(trace.speed_mps >= 0)


@FUZZ
@given(data=st.binary(max_size=2000))
def test_arbitrary_bytes(tmp_path, data):
    path = tmp_path / "fuzz.csv"
    path.write_bytes(data)
    check_outcome(path)


@FUZZ
@given(edits=st.lists(st.tuples(st.integers(0, len(VALID)), st.integers(0, 8), st.sampled_from(TOKENS)),
                      min_size=1, max_size=6))
def test_mangled_valid_csv(tmp_path, edits):
    text = VALID
    for position, cut, token in edits:
        position = min(position, len(text))
        text = text[:position] + token + text[position + cut:]
    path = tmp_path / "fuzz.csv"
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    check_outcome(path)


def test_valid_base_reads():
    # the fuzz seed itself must be valid, or the mangling test only ever sees errors
    import tempfile, pathlib
    with tempfile.TemporaryDirectory() as d:
        path = pathlib.Path(d) / "ok.csv"
        path.write_text(VALID, encoding="utf-8")
        assert read_trace_csv(path).time_s.size == 20


CELL_TOKENS = st.one_of(st.sampled_from(TOKENS), st.floats(allow_nan=True, allow_infinity=True).map(repr),
                        st.floats(-400, 400).map(lambda x: f"{x:.3g}"))


@FUZZ
@given(edits=st.lists(st.tuples(st.integers(2, 21), st.integers(0, 5), CELL_TOKENS), min_size=1, max_size=4))
def test_mangled_cells(tmp_path, edits):
    lines = VALID.split("\n")
    for row, col, token in edits:
        cells = lines[row].split(",")
        cells[col] = token
        lines[row] = ",".join(cells)
    path = tmp_path / "fuzz.csv"
    path.write_text("\n".join(lines), encoding="utf-8")
    check_outcome(path)
