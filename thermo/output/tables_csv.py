"""The run's tables as CSV for spreadsheets: ``laps.csv`` (every lap of every corner) and
``checks.csv`` (every check of every corner). Headers use the project's ``name [unit]`` form;
temperatures in degC, margins in K. Each file is written atomically.
"""
from __future__ import annotations

import csv
import io

from lapdata.units import kelvin_to_celsius
from thermo.output.atomic import atomic_write
from thermo.results import Results


def _text(rows) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows(rows)
    return buffer.getvalue()


def laps_rows(results: Results) -> list[list]:
    """Header and one row per corner and lap: phase, times, braking energy, the pad thickness at
    the lap's end and each node's maximum in the lap."""
    nodes: list[str] = []
    for corner in results.corners:
        for lap in corner.laps:
            nodes += [n for n in lap.max_k if n not in nodes]
    header = ["corner", "lap", "phase", "t_start [s]", "t_end [s]", "braking_energy [kJ]", "pad_thickness [mm]"]
    rows = [header + [f"{node} max [degC]" for node in nodes]]
    for corner in results.corners:
        thickness = {row.lap: row.thickness_m for row in corner.facts.pad_thickness_by_lap_m or ()}
        for lap in corner.laps:
            pad = thickness.get(lap.index)
            rows.append([corner.name, lap.index, lap.phase, f"{lap.t_start_s:.3f}", f"{lap.t_end_s:.3f}",
                         f"{lap.braking_energy_j / 1e3:.3f}", "" if pad is None else f"{pad * 1e3:.3f}"]
                        + [f"{kelvin_to_celsius(lap.max_k[n]):.2f}" if n in lap.max_k else "" for n in nodes])
    return rows


def checks_rows(results: Results) -> list[list]:
    """Header and one row per corner and check: node, limit, peak, margin, status, when, source."""
    rows = [["corner", "check", "node", "limit [degC]", "peak [degC]", "margin [K]", "status", "peak_time [s]",
             "source"]]
    for corner in results.corners:
        for c in corner.checks:
            rows.append([corner.name, c.name, c.node, f"{kelvin_to_celsius(c.limit_k):.2f}",
                         f"{kelvin_to_celsius(c.peak_k):.2f}", f"{c.margin_k:.2f}", c.status, f"{c.peak_time_s:.3f}",
                         c.source])
    return rows


def write_laps_csv(results: Results, path) -> None:
    """``laps_rows`` to ``path``, atomically."""
    with atomic_write(path) as handle:
        handle.write(_text(laps_rows(results)))


def write_checks_csv(results: Results, path) -> None:
    """``checks_rows`` to ``path``, atomically."""
    with atomic_write(path) as handle:
        handle.write(_text(checks_rows(results)))
