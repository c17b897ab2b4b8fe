"""Read a logged lap trace from CSV into a :class:`~lapdata.trace.LapTrace` (SI inside).

File format
-----------
UTF-8 text (a byte-order mark is allowed), comma separated, no quoting. Lines starting with
``#`` and blank lines may come before the header; after the header only blank lines at the
end. The header names each column ``name [unit]``:

============================  =============================  ==========================
channel                       units                          stored as
============================  =============================  ==========================
``time``                      ``s``                          ``time_s``
``distance``                  ``m``, ``km``                  ``distance_m``
``speed`` (required)          ``m/s``, ``km/h``, ``mph``     ``speed_mps``
``pressure_front``/``_rear``  ``bar``, ``kPa``, ``psi``,     ``pressure_front_pa`` ...
                              ``Pa``
``accel_long``                ``g``, ``m/s^2``               ``accel_long_mps2``
``temp_<what>``               ``degC``, ``K``                ``temperatures_k['temp_<what>']``
============================  =============================  ==========================

Either ``time`` or ``distance`` (or both) must be present. With time only, distance is the
trapezoidal integral of speed; with distance only, time is ``sum 2 ds / (v1 + v2)`` (exact for
constant acceleration between samples), which needs speed > 0 everywhere. Time and distance
are shifted to start at zero. The checks are described in :mod:`lapdata.validate`.
"""
from __future__ import annotations

import re
from pathlib import Path

import numpy as np

from lapdata import validate as v
from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.files import MAX_CSV_BYTES, read_regular_file
from lapdata.suggest import did_you_mean
from lapdata.trace import LapTrace
from lapdata.units import BAR, KELVIN_AT_0C, KM, KMH, KPA, MPH, PSI, STANDARD_GRAVITY
from lapdata.validate import ColumnRef

# quantity -> unit -> (scale, offset): SI = value * scale + offset
UNITS: dict[str, dict[str, tuple[float, float]]] = {
    "time": {"s": (1.0, 0.0)},
    "distance": {"m": (1.0, 0.0), "km": (KM, 0.0)},
    "speed": {"m/s": (1.0, 0.0), "km/h": (KMH, 0.0), "mph": (MPH, 0.0)},
    "pressure": {"bar": (BAR, 0.0), "kPa": (KPA, 0.0), "psi": (PSI, 0.0), "Pa": (1.0, 0.0)},
    "acceleration": {"g": (STANDARD_GRAVITY, 0.0), "m/s^2": (1.0, 0.0)},
    "temperature": {"degC": (1.0, KELVIN_AT_0C), "K": (1.0, 0.0)},
}
# channel name -> quantity; ``temp_<what>`` columns are matched by TEMPERATURE_NAME
CHANNELS: dict[str, str] = {
    "time": "time", "distance": "distance", "speed": "speed",
    "pressure_front": "pressure", "pressure_rear": "pressure", "accel_long": "acceleration",
}
TEMPERATURE_NAME = re.compile(r"temp_[a-z0-9_]+")
_HEADER_CELL = re.compile(r"\s*([^\[\]]*?)\s*(?:\[([^\[\]]*)\])?\s*")
# what a header cell may look like to be echoed in a message: a short name and a short unit
_SAFE_HEADER = re.compile(r"[A-Za-z_][A-Za-z0-9_ ]{0,39}(?:\[[A-Za-z0-9/^%. ]{0,16}\])?")


def read_trace_csv(path: str | Path, *, repair: bool = False) -> LapTrace:
    """Read, check and convert one lap trace CSV.

    Parameters
    ----------
    path : str or Path
        The CSV file [-]
    repair : bool
        Fill short gaps and replace one-sample speed drop-outs (each reported in
        ``LapTrace.repairs``); without it both are errors [-]

    Returns
    -------
    LapTrace
        The trace in SI units, time and distance from zero [-]

    Raises
    ------
    LapDataError
        For any problem with the file, naming file, row and column.
    """
    source = str(path)
    header_line, header, rows = _split_lines(_read_text(Path(path)), source)
    refs = _parse_header(header, header_line, source)
    lines = np.array([line for line, _ in rows], dtype=np.int64)
    v.check_sample_count(len(rows), source, int(lines[-1]) if rows else header_line)
    data = _parse_cells(rows, refs, source)
    return _build_trace(data, refs, lines, source, repair)


def _read_text(path: Path) -> str:
    raw = read_regular_file(path, "lap trace CSV", MAX_CSV_BYTES)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise LapDataError(f"{path}: not UTF-8 text (bad byte at offset {exc.start})") from None


def _split_lines(text: str, source: str) -> tuple[int, str, list[tuple[int, list[str]]]]:
    """Header line number, header text, and (line number, cells) of each data row."""
    lines = text.split("\n")
    while lines and not lines[-1].strip():
        lines.pop()
    header_at = next((i for i, s in enumerate(lines) if s.strip() and not s.lstrip().startswith("#")), None)
    if header_at is None:
        raise LapDataError(f"{source}: no header row: expected a line of 'name [unit]' columns")
    rows = []
    for i in range(header_at + 1, len(lines)):
        text_i = lines[i].rstrip("\r")
        if not text_i.strip():
            raise v.fail(source, i + 1, None, "blank line inside the data: expected one row of numbers "
                         "per line (blank lines only at the end)")
        if text_i.lstrip().startswith("#"):
            raise v.fail(source, i + 1, None, "comment line inside the data: '#' lines are allowed "
                         "only before the header")
        rows.append((i + 1, text_i.split(",")))
    return header_at + 1, lines[header_at].rstrip("\r"), rows


def _parse_header(header: str, line: int, source: str) -> dict[str, ColumnRef]:
    """Channel name -> ColumnRef, in file order."""
    refs: dict[str, ColumnRef] = {}
    known = sorted(CHANNELS) + ["temp_<what>"]
    for number, cell in enumerate(header.split(","), start=1):
        m = _HEADER_CELL.fullmatch(cell)
        shape = _SAFE_HEADER.fullmatch(cell.strip())
        if m is None or shape is None:
            # the cell is not header-shaped: say which column, never what it holds (it may be
            # the first line of a file that was never a lap trace)
            raise v.fail(source, line, f"#{number}", "expected a column header 'name [unit]', e.g. 'speed [km/h]' "
                                                    "(is this a lap-trace CSV?)")
        name, unit = m.group(1), m.group(2)
        quantity = CHANNELS.get(name) or ("temperature" if TEMPERATURE_NAME.fullmatch(name) else None)
        if quantity is None:
            raise v.fail(source, line, cell.strip(), f"unknown channel '{name}'{did_you_mean(name, sorted(CHANNELS) + ['temp_'])}: "
                                                     f"known channels are {', '.join(known)}")
        if name in refs:
            raise v.fail(source, line, cell.strip(), f"channel '{name}' appears twice")
        accepted = UNITS[quantity]
        if unit is None or not unit.strip():
            raise v.fail(source, line, cell.strip(),
                         f"missing unit: expected '{name} [unit]' with unit one of {', '.join(accepted)}")
        unit = unit.strip()
        if unit not in accepted:
            raise v.fail(source, line, cell.strip(),
                         f"unknown unit '{unit}' for {quantity}: expected one of {', '.join(accepted)}")
        scale, offset = accepted[unit]
        refs[name] = ColumnRef(header=cell.strip(), unit=unit, scale=scale, offset=offset)
    if "speed" not in refs:
        raise v.fail(source, line, None, "no speed column: expected a 'speed [km/h]' (or m/s, mph) column")
    if "time" not in refs and "distance" not in refs:
        raise v.fail(source, line, None, "no time or distance column: expected 'time [s]' or 'distance [m]'")
    return refs


def _parse_cells(rows: list[tuple[int, list[str]]], refs: dict[str, ColumnRef],
                 source: str) -> dict[str, np.ndarray]:
    """Numbers of each column converted to SI; every cell a finite number.

    The whole table is converted at once; only when that fails (or gives a non-finite value) is
    it walked cell by cell to name the first bad one.
    """
    names = list(refs)
    for line, cells in rows:
        if len(cells) != len(names):
            raise v.fail(source, line, None, f"expected {len(names)} cells (one per header column), "
                         f"got {len(cells)}")
    scale = np.array([refs[n].scale for n in names])
    offset = np.array([refs[n].offset for n in names])
    try:
        with np.errstate(all="ignore"):
            table = np.array([cells for _, cells in rows], dtype=float) * scale + offset
        if np.all(np.isfinite(table)):
            return {name: table[:, c].copy() for c, name in enumerate(names)}
    except (ValueError, OverflowError):
        pass
    for line, cells in rows:
        for c, cell in enumerate(cells):
            _cell_value(cell, refs[names[c]], line, source)
    raise LapDataError(f"{source}: cannot convert the data rows to numbers")  # not reached: a cell failed


def _cell_value(cell: str, ref: ColumnRef, line: int, source: str) -> float:
    """One cell in SI, or the error that names it."""
    text = cell.strip()
    if not text:
        raise v.fail(source, line, ref.header, "empty cell: expected a number")
    try:
        value = float(text)
    except ValueError:
        raise v.fail(source, line, ref.header, f"not a number: {shown(text)}") from None
    if not np.isfinite(value):
        raise v.fail(source, line, ref.header, f"{shown(text)} is not finite: expected a number")
    si = value * ref.scale + ref.offset
    if not np.isfinite(si):
        raise v.fail(source, line, ref.header, f"{shown(text)} too large to represent in SI")
    return si


def _build_trace(data: dict[str, np.ndarray], refs: dict[str, ColumnRef], lines: np.ndarray,
                 source: str, repair: bool) -> LapTrace:
    base_name = "time" if "time" in data else "distance"
    base_is_time = base_name == "time"
    base_ref, speed_ref = refs[base_name], refs["speed"]
    v.check_strictly_increasing(data[base_name], lines, source, base_ref)
    v.check_speed_range(data["speed"], lines, source, speed_ref)
    if "distance" in data and base_is_time:
        v.check_non_decreasing(data["distance"], lines, source, refs["distance"])
    for name, ref in refs.items():
        if name.startswith("temp_"):
            v.check_temperature(data[name], lines, source, ref)
            v.check_channel_range(data[name], "temperature", lines, source, ref)
        elif name.startswith("pressure_"):
            v.check_channel_range(data[name], "pressure", lines, source, ref)
        elif name == "accel_long":
            v.check_channel_range(data[name], "acceleration", lines, source, ref)
    repairs: list[str] = []

    drops = v.find_dropouts(base_is_time, data[base_name], data["speed"])
    if drops.size and not repair:
        raise v.dropout_error(data["speed"], int(drops[0]), lines, source, speed_ref)
    if drops.size:
        data["speed"], notes = v.repair_dropouts(data["speed"], drops, lines, speed_ref)
        repairs += notes
    v.check_jumps(base_is_time, data[base_name], data["speed"], lines, source, speed_ref)

    gaps = v.find_gaps(data[base_name])
    for i, ratio in gaps:
        if ratio > v.GAP_LONG_FACTOR or not repair:
            raise v.gap_error(i, ratio, data[base_name], lines, source, base_ref)
    if gaps:
        others = {k: val for k, val in data.items() if k != base_name}
        grid, others, lines, notes = v.fill_gaps(data[base_name], others, lines, gaps, base_ref)
        data = {base_name: grid, **others}
        repairs += notes

    speed = data["speed"]
    with np.errstate(all="ignore"):
        if base_is_time:
            time = data["time"] - data["time"][0]
            if "distance" in data:
                distance = data["distance"] - data["distance"][0]
            else:
                distance = np.concatenate([[0.0], np.cumsum(0.5 * (speed[1:] + speed[:-1]) * np.diff(time))])
        else:
            stopped = np.flatnonzero(speed <= 0.0)
            if stopped.size:
                i = int(stopped[0])
                raise v.fail(source, int(lines[i]), speed_ref.header,
                             "speed 0 with a distance base and no time column: expected speed > 0 "
                             "to derive time from distance")
            distance = data["distance"] - data["distance"][0]
            time = np.concatenate([[0.0], np.cumsum(2.0 * np.diff(distance) / (speed[1:] + speed[:-1]))])
    for label, values in (("time", time), ("distance", distance)):
        if not np.all(np.isfinite(values)):
            i = int(np.flatnonzero(~np.isfinite(values))[0])
            raise v.fail(source, int(lines[i]), None, f"derived {label} too large to represent")
    v.check_duration(time, lines, source)
    if "distance" in data and base_is_time:
        v.check_distance_steps(time, distance, lines, source, refs["distance"])

    temperatures = {k: val for k, val in data.items() if k.startswith("temp_")}
    return LapTrace(
        time_s=time, distance_m=distance, speed_mps=speed,
        pressure_front_pa=data.get("pressure_front"), pressure_rear_pa=data.get("pressure_rear"),
        accel_long_mps2=data.get("accel_long"), temperatures_k=temperatures,
        source=source, repairs=tuple(repairs),
    )
