"""The JSON summary of a run: a fixed set of keys that users' scripts rely on.

Top level: scenario, version, solver, solver_status, caution, warnings, references, corners.
Each corner: name, peak_c, peak_time_s, checks, energy, heat_paths, soak (only when the run
has a stop), laps, extras (the corner's ``CornerFacts``, ``thermo.output.facts``). A check's ``still_rising`` and the soak's ``still_rising`` (nodes) say
where a peak came at the very end of the soak with the temperature still climbing. Temperatures in degC (keys end in ``_c``), margins in K, times in s,
energies in J. Rounded to 0.01 degC / K / s, 0.1 J, 4 decimals for shares; a value that is not
finite is written as null, never NaN.
"""
from __future__ import annotations

import json
import math

from lapdata.units import kelvin_to_celsius
from thermo import CAUTION
from thermo.output.analysis import check_still_rising, heat_path_shares, node_peaks, soak_rows
from thermo.output.atomic import atomic_write
from thermo.output.facts import facts_dict
from thermo.output.jsonable import json_ready
from thermo.results import CheckResult, CornerResult, LapSpan, Results

TEMPERATURE_DECIMALS = 2     # degC and K
TIME_DECIMALS = 2            # s
ENERGY_DECIMALS = 1          # J
SHARE_DECIMALS = 4           # fraction 0..1
RELATIVE_ERROR_DIGITS = 3    # significant digits


def _num(value, decimals: int):
    """A rounded float, or None for NaN/inf/None."""
    if value is None:
        return None
    number = float(value)
    return round(number, decimals) if math.isfinite(number) else None


def _c(kelvin):
    return None if kelvin is None else _num(kelvin_to_celsius(float(kelvin)), TEMPERATURE_DECIMALS)


def _significant(value, digits: int):
    number = float(value)
    return float(f"{number:.{digits}g}") if math.isfinite(number) else None


def _check_dict(check: CheckResult, corner: CornerResult) -> dict:
    return {
        "name": check.name,
        "node": check.node,
        "limit_c": _c(check.limit_k),
        "peak_c": _c(check.peak_k),
        "margin_k": _num(check.margin_k, TEMPERATURE_DECIMALS),
        "status": check.status,
        "peak_time_s": _num(check.peak_time_s, TIME_DECIMALS),
        "source": check.source,
        "still_rising": check_still_rising(corner, check),
    }


def _lap_dict(lap: LapSpan) -> dict:
    return {
        "index": int(lap.index),
        "phase": lap.phase,
        "t_start_s": _num(lap.t_start_s, TIME_DECIMALS),
        "t_end_s": _num(lap.t_end_s, TIME_DECIMALS),
        "braking_energy_j": _num(lap.braking_energy_j, ENERGY_DECIMALS),
        "max_c": {node: _c(k) for node, k in lap.max_k.items()},
        "min_c": {node: _c(k) for node, k in lap.min_k.items()},
    }


def _soak_dict(corner: CornerResult) -> dict | None:
    rows = soak_rows(corner)
    if rows is None:
        return None
    return {
        "peak_c": {r.node: _c(r.peak_k) for r in rows},
        "peak_after_stop_s": {r.node: _num(r.after_stop_s, TIME_DECIMALS) for r in rows},
        "worst_after_stop": [r.node for r in rows if r.worst_after_stop],
        "still_rising": [r.node for r in rows if r.still_rising],
    }


def corner_summary(corner: CornerResult) -> dict:
    """The summary of one corner (see the module docstring for its keys)."""
    peaks = node_peaks(corner)
    energy = corner.energy
    out = {
        "name": corner.name,
        "peak_c": {node: _c(k) for node, (k, _) in peaks.items()},
        "peak_time_s": {node: _num(t, TIME_DECIMALS) for node, (_, t) in peaks.items()},
        "checks": [_check_dict(c, corner) for c in corner.checks],
        "energy": {
            "heat_in_j": _num(energy.heat_in_j, ENERGY_DECIMALS),
            "stored_j": _num(energy.stored_j, ENERGY_DECIMALS),
            "lost_j": _num(energy.lost_j, ENERGY_DECIMALS),
            "balance_rel_error": _significant(energy.balance_rel_error, RELATIVE_ERROR_DIGITS),
        },
        "heat_paths": {g: _num(s, SHARE_DECIMALS) for g, s in heat_path_shares(corner).items()},
    }
    soak = _soak_dict(corner)
    if soak is not None:
        out["soak"] = soak
    out["laps"] = [_lap_dict(lap) for lap in corner.laps]
    out["extras"] = json_ready(facts_dict(corner.facts), f"corner {corner.name} extras")
    return out


def summary_dict(results: Results) -> dict:
    """A JSON-ready dict of the run's headline numbers, one entry per corner.

    Parameters
    ----------
    results : Results
        A finished run [-]

    Returns
    -------
    dict
        Keys scenario, version, solver, solver_status, caution, overrides, warnings, references, corners,
        hydraulics (null for results read from a file written before it) [-]
    """
    return {
        "scenario": results.scenario_name,
        "version": results.version,
        "solver": results.solver,
        "solver_status": results.solver_status,
        "caution": results.caution or CAUTION,
        "overrides": [{"key": key, "value": value} for key, value in results.overrides],
        "warnings": list(results.warnings),
        "references": list(results.references),
        "corners": [corner_summary(c) for c in results.corners],
        "hydraulics": _rounded(results.hydraulics),
    }


def _rounded(value):
    """A nested block with its floats to 6 significant digits (an infinite ratio becomes null)."""
    if isinstance(value, dict):
        return {k: _rounded(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_rounded(v) for v in value]
    if isinstance(value, float):
        return _significant(value, 6) if math.isfinite(value) else None
    return value


def summary_json(results: Results) -> str:
    """The summary as JSON text (strict JSON: no NaN), indented for reading."""
    return json.dumps(summary_dict(results), indent=2, allow_nan=False) + "\n"


def write_summary_json(results: Results, path) -> None:
    """Write the summary atomically to ``path`` (an existing file is replaced only on success).

    Parameters
    ----------
    results : Results
        A finished run [-]
    path : str or os.PathLike
        Destination .json file [-]
    """
    text = summary_json(results)
    with atomic_write(path, "w") as handle:
        handle.write(text)
