"""A lap trace as CSV text in the format :func:`lapdata.reader.read_trace_csv` reads back.

Columns ``time [s]``, ``distance [m]``, ``speed [km/h]``, then whichever of ``accel_long [m/s^2]``,
``pressure_front [bar]``, ``pressure_rear [bar]`` and ``temp_<what> [degC]`` the trace holds.
Decimals: time 4, distance 3, speed 4, acceleration 4, pressure 4, temperature 3; so a trace read
back differs from the one written by at most half a unit of the last decimal in those units.
"""
from __future__ import annotations

import numpy as np

from lapdata.echo import printable
from lapdata.trace import LapTrace
from lapdata.units import BAR, KELVIN_AT_0C, KMH

# (header, decimals, SI -> the header's unit)
_BASE = (("time [s]", 4, 1.0), ("distance [m]", 3, 1.0), ("speed [km/h]", 4, 1.0 / KMH))


def trace_csv_text(trace: LapTrace, comment: str | None = None) -> str:
    """The CSV text of a trace (``comment``: one ``#`` line before the header, made printable).

    >>> import numpy as np
    >>> t = LapTrace(time_s=np.array([0.0, 0.5]), distance_m=np.array([0.0, 10.0]), speed_mps=np.array([20.0, 20.0]))
    >>> print(trace_csv_text(t), end="")
    time [s],distance [m],speed [km/h]
    0.0000,0.000,72.0000
    0.5000,10.000,72.0000
    """
    columns = [(header, decimals, np.asarray(values, dtype=float) * scale)
               for (header, decimals, scale), values in zip(_BASE, (trace.time_s, trace.distance_m, trace.speed_mps))]
    if trace.accel_long_mps2 is not None:
        columns.append(("accel_long [m/s^2]", 4, np.asarray(trace.accel_long_mps2, dtype=float)))
    for name, values in (("pressure_front", trace.pressure_front_pa), ("pressure_rear", trace.pressure_rear_pa)):
        if values is not None:
            columns.append((f"{name} [bar]", 4, np.asarray(values, dtype=float) / BAR))
    for name, values in trace.temperatures_k.items():
        columns.append((f"{name} [degC]", 3, np.asarray(values, dtype=float) - KELVIN_AT_0C))
    lines = [] if comment is None else ["# " + printable(comment)]
    lines.append(",".join(header for header, _, _ in columns))
    formats = [f"{{:.{decimals}f}}" for _, decimals, _ in columns]
    for row in zip(*(values for _, _, values in columns)):
        lines.append(",".join(f.format(x) for f, x in zip(formats, row)))
    return "\n".join(lines) + "\n"
