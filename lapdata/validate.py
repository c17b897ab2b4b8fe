"""Checks and the two optional repairs applied to a lap trace as it is read.

Every check raises :class:`~lapdata.errors.LapDataError` with one line naming the file, the
row (1-based line number in the file) and the column, and what was expected. The functions
work on SI arrays in file order together with ``lines``, the file line number of each sample.

Rules (thresholds are module constants, so tests and documentation share them):

- at least :data:`MIN_SAMPLES` samples;
- the base column (time, or distance when there is no time) strictly increasing;
- a logged distance beside a time base never decreasing;
- speed never negative and below :data:`SPEED_CEILING_MPS`;
- between neighbouring samples no deceleration beyond :data:`DECEL_LIMIT_MPS2` and no
  acceleration beyond :data:`ACCEL_LIMIT_MPS2` (with a distance base the implied constant
  acceleration ``(v2^2 - v1^2) / (2 ds)`` is used);
- a one-sample speed drop-out (a sample reached by an implausible deceleration and left by an
  implausible acceleration) is an error that ``repair`` fixes with the mean of its neighbours;
- a step of the base column more than :data:`GAP_MISSING_FACTOR` median steps means missing
  samples: up to :data:`GAP_LONG_FACTOR` median steps ``repair`` fills them by linear
  interpolation; a longer gap is always an error;
- temperatures above absolute zero.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.errors import LapDataError
from lapdata.units import STANDARD_GRAVITY

MIN_SAMPLES = 10
DECEL_LIMIT_MPS2 = 5.0 * STANDARD_GRAVITY   # beyond any tyre on any car  # common practice, no published source
ACCEL_LIMIT_MPS2 = 3.0 * STANDARD_GRAVITY   # beyond any traction limit   # common practice, no published source
SPEED_CEILING_MPS = 200.0                   # 720 km/h: no circuit car logs this  # common practice, no published source
MAX_DURATION_S = 48 * 3600.0               # a logged trace of more than 48 h is no stint  # common practice, no published source
# Ranges of the other channels (SI); a value outside is a unit mix-up or a broken sensor.
CHANNEL_RANGES = {                          # common practice, no published source
    "temperature": (213.15, 2273.15),       # -60 to 2000 degC: below any ambient, above any disc
    "pressure": (-5.0e5, 300.0e5),          # -5 to 300 bar: a zero offset below, above any brake system
    "acceleration": (-10.0 * STANDARD_GRAVITY, 10.0 * STANDARD_GRAVITY),
}
DISTANCE_STEP_SPEED_FACTOR = 1.5            # a distance step may imply at most this x the speed ceiling
GAP_MISSING_FACTOR = 1.5                    # a step this many median steps long has lost a sample
GAP_LONG_FACTOR = 5.0                       # longer than this many median steps: not repairable


@dataclass(frozen=True)
class ColumnRef:
    """Where a column came from, for messages: the header text and the unit's SI scale and offset."""

    header: str
    unit: str
    scale: float
    offset: float = 0.0

    def to_file_unit(self, value_si: float) -> float:
        """Convert an SI value back to the unit of the file, for messages."""
        return (value_si - self.offset) / self.scale


def fail(source: str, line: int, column: str | None, what: str) -> LapDataError:
    """Build the one-line error: ``file: row N, column 'name [unit]': what``."""
    where = f"{source}: row {line}" if column is None else f"{source}: row {line}, column '{column}'"
    return LapDataError(f"{where}: {what}".replace("\n", " ").replace("\r", " "))


def check_sample_count(n: int, source: str, last_line: int) -> None:
    """At least :data:`MIN_SAMPLES` samples."""
    if n < MIN_SAMPLES:
        raise fail(source, last_line, None, f"expected at least {MIN_SAMPLES} data rows, got {n}")


def check_strictly_increasing(values: np.ndarray, lines: np.ndarray, source: str, col: ColumnRef) -> None:
    """Base column: every step positive and finite."""
    step = np.diff(values)
    bad = np.flatnonzero(~(step > 0.0))
    if bad.size:
        i = int(bad[0]) + 1
        kind = "repeated" if step[i - 1] == 0.0 else "decreasing"
        raise fail(source, int(lines[i]), col.header,
                   f"{kind} value {col.to_file_unit(values[i]):g} {col.unit} after "
                   f"{col.to_file_unit(values[i - 1]):g} {col.unit}: expected strictly increasing")
    huge = np.flatnonzero(~np.isfinite(step))
    if huge.size:
        i = int(huge[0]) + 1
        raise fail(source, int(lines[i]), col.header, "step from the previous row too large to represent")


def check_non_decreasing(values: np.ndarray, lines: np.ndarray, source: str, col: ColumnRef) -> None:
    """A logged distance next to a time base: the car never goes backwards."""
    bad = np.flatnonzero(np.diff(values) < 0.0)
    if bad.size:
        i = int(bad[0]) + 1
        raise fail(source, int(lines[i]), col.header,
                   f"value {col.to_file_unit(values[i]):g} {col.unit} below the previous row's "
                   f"{col.to_file_unit(values[i - 1]):g} {col.unit}: expected never decreasing")


def check_speed_range(speed: np.ndarray, lines: np.ndarray, source: str, col: ColumnRef) -> None:
    """Speed >= 0 and below :data:`SPEED_CEILING_MPS`."""
    neg = np.flatnonzero(speed < 0.0)
    if neg.size:
        i = int(neg[0])
        raise fail(source, int(lines[i]), col.header,
                   f"negative speed {col.to_file_unit(speed[i]):g} {col.unit}: expected >= 0")
    high = np.flatnonzero(speed > SPEED_CEILING_MPS)
    if high.size:
        i = int(high[0])
        raise fail(source, int(lines[i]), col.header,
                   f"speed {col.to_file_unit(speed[i]):g} {col.unit} implausible: expected at most "
                   f"{col.to_file_unit(SPEED_CEILING_MPS):g} {col.unit}")


def implied_acceleration(base_is_time: bool, base: np.ndarray, speed: np.ndarray) -> np.ndarray:
    """Acceleration between neighbouring samples [m/s^2], one value per step.

    With a time base ``dv/dt``; with a distance base the constant acceleration that joins the two
    speeds over the step, ``(v2^2 - v1^2) / (2 ds)`` (constant-acceleration kinematics).
    """
    with np.errstate(all="ignore"):
        if base_is_time:
            return np.diff(speed) / np.diff(base)
        return np.diff(speed**2) / (2.0 * np.diff(base))


def find_dropouts(base_is_time: bool, base: np.ndarray, speed: np.ndarray) -> np.ndarray:
    """Indices of one-sample speed drop-outs: entered too hard and left too hard."""
    acc = implied_acceleration(base_is_time, base, speed)
    into = acc[:-1] < -DECEL_LIMIT_MPS2
    out_of = acc[1:] > ACCEL_LIMIT_MPS2
    return np.flatnonzero(into & out_of) + 1


def repair_dropouts(speed: np.ndarray, idx: np.ndarray, lines: np.ndarray,
                    col: ColumnRef) -> tuple[np.ndarray, list[str]]:
    """Replace each drop-out by the mean of its neighbours; one report line each."""
    fixed = speed.copy()
    notes = []
    for i in idx:
        fixed[i] = 0.5 * (fixed[i - 1] + fixed[i + 1])
        notes.append(f"row {int(lines[i])}: speed drop-out {col.to_file_unit(speed[i]):.1f} {col.unit} "
                     f"replaced by {col.to_file_unit(fixed[i]):.1f} {col.unit}")
    return fixed, notes


def dropout_error(speed: np.ndarray, i: int, lines: np.ndarray, source: str, col: ColumnRef) -> LapDataError:
    """The error for an unrepaired drop-out (says that ``--repair`` would fix it)."""
    return fail(source, int(lines[i]), col.header,
                f"one-sample speed drop-out {col.to_file_unit(speed[i]):g} {col.unit} between "
                f"{col.to_file_unit(speed[i - 1]):g} and {col.to_file_unit(speed[i + 1]):g} {col.unit}: "
                f"--repair would replace it by the mean of its neighbours")


def check_jumps(base_is_time: bool, base: np.ndarray, speed: np.ndarray, lines: np.ndarray,
                source: str, col: ColumnRef) -> None:
    """No deceleration beyond 5 g nor acceleration beyond 3 g between neighbouring samples."""
    acc = implied_acceleration(base_is_time, base, speed)
    bad = np.flatnonzero((acc < -DECEL_LIMIT_MPS2) | (acc > ACCEL_LIMIT_MPS2) | ~np.isfinite(acc))
    if bad.size:
        i = int(bad[0]) + 1
        a_g = acc[i - 1] / STANDARD_GRAVITY
        raise fail(source, int(lines[i]), col.header,
                   f"implausible jump from {col.to_file_unit(speed[i - 1]):g} to "
                   f"{col.to_file_unit(speed[i]):g} {col.unit} ({a_g:+.3g} g): expected a deceleration "
                   f"within {DECEL_LIMIT_MPS2 / STANDARD_GRAVITY:g} g and an acceleration within "
                   f"{ACCEL_LIMIT_MPS2 / STANDARD_GRAVITY:g} g")


def find_gaps(base: np.ndarray) -> list[tuple[int, float]]:
    """Steps that lost samples: (index of the sample after the gap, length in median steps)."""
    step = np.diff(base)
    median = float(np.median(step))
    with np.errstate(all="ignore"):
        ratio = step / median
    return [(int(i) + 1, float(ratio[i])) for i in np.flatnonzero(ratio > GAP_MISSING_FACTOR)]


def gap_error(i: int, ratio: float, base: np.ndarray, lines: np.ndarray, source: str,
              col: ColumnRef) -> LapDataError:
    """The error for a gap: long gaps cannot be repaired, short ones say ``--repair``."""
    step = col.to_file_unit(base[i]) - col.to_file_unit(base[i - 1])
    what = f"gap of {step:g} {col.unit} after row {int(lines[i - 1])} ({ratio:.3g} median steps)"
    if ratio > GAP_LONG_FACTOR:
        return fail(source, int(lines[i]), col.header,
                    f"{what}: expected no gap longer than {GAP_LONG_FACTOR:g} median steps; "
                    f"split the file at the gap")
    return fail(source, int(lines[i]), col.header,
                f"{what}: samples missing; --repair would fill them by linear interpolation")


def fill_gaps(base: np.ndarray, channels: dict[str, np.ndarray], lines: np.ndarray,
              gaps: list[tuple[int, float]], col: ColumnRef
              ) -> tuple[np.ndarray, dict[str, np.ndarray], np.ndarray, list[str]]:
    """Insert the missing samples of each short gap, every channel linearly interpolated.

    The number inserted is ``round(ratio) - 1``, evenly spaced across the gap. Inserted samples
    carry the line number of the row after the gap.
    """
    median = float(np.median(np.diff(base)))
    new_base = [base]
    notes = []
    for i, ratio in gaps:
        n_new = max(int(round(ratio)) - 1, 1)
        new_base.append(np.linspace(base[i - 1], base[i], n_new + 2)[1:-1])
        notes.append(f"rows {int(lines[i - 1])}-{int(lines[i])}: {n_new} missing sample(s) in "
                     f"'{col.header}' (gap {ratio * median / col.scale:g} {col.unit}) filled by "
                     f"linear interpolation")
    grid = np.sort(np.concatenate(new_base))
    filled = {name: np.interp(grid, base, values) for name, values in channels.items()}
    new_lines = lines[np.minimum(np.searchsorted(base, grid), base.size - 1)]
    return grid, filled, new_lines, notes


def check_channel_range(values: np.ndarray, kind: str, lines: np.ndarray, source: str, col: ColumnRef) -> None:
    """A temperature, pressure or acceleration channel inside :data:`CHANNEL_RANGES` (first bad row named)."""
    low, high = CHANNEL_RANGES[kind]
    bad = np.flatnonzero((values < low) | (values > high))
    if bad.size:
        i = int(bad[0])
        raise fail(source, int(lines[i]), col.header,
                   f"{kind} {col.to_file_unit(values[i]):g} {col.unit} is outside the plausible range "
                   f"{col.to_file_unit(low):g} to {col.to_file_unit(high):g} {col.unit}")


def check_duration(time_s: np.ndarray, lines: np.ndarray, source: str) -> None:
    """A trace no longer than :data:`MAX_DURATION_S` (a lap crawled at 0.001 km/h would be years)."""
    if time_s.size and time_s[-1] > MAX_DURATION_S:
        i = int(np.searchsorted(time_s, MAX_DURATION_S))
        raise fail(source, int(lines[min(i, lines.size - 1)]), None,
                   f"the trace lasts {time_s[-1] / 3600:.3g} h: expected at most {MAX_DURATION_S / 3600:g} h "
                   "(check the time or speed units)")


def check_distance_steps(time_s: np.ndarray, distance_m: np.ndarray, lines: np.ndarray, source: str,
                         col: ColumnRef) -> None:
    """A logged distance never moves faster than the speed ceiling allows (a jump to 1e308 m)."""
    with np.errstate(all="ignore"):
        step_speed = np.diff(distance_m) / np.diff(time_s)
    bad = np.flatnonzero(~(step_speed <= DISTANCE_STEP_SPEED_FACTOR * SPEED_CEILING_MPS))
    if bad.size:
        i = int(bad[0]) + 1
        raise fail(source, int(lines[i]), col.header,
                   f"distance jumps by {col.to_file_unit(distance_m[i] - distance_m[i - 1]):g} {col.unit} in "
                   f"{time_s[i] - time_s[i - 1]:g} s: expected a car's travel")


def check_temperature(values_k: np.ndarray, lines: np.ndarray, source: str, col: ColumnRef) -> None:
    """Temperatures above absolute zero."""
    bad = np.flatnonzero(values_k <= 0.0)
    if bad.size:
        i = int(bad[0])
        raise fail(source, int(lines[i]), col.header,
                   f"temperature {col.to_file_unit(values_k[i]):g} {col.unit} at or below absolute zero")
