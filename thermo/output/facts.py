"""A corner's ``CornerFacts`` as the ``extras`` block users read: JSON key ``extras`` of each corner
(``run --json``, summary.json) and HDF5 attribute ``extras_json`` of ``/corners/<corner>``.

The block's keys are the attribute names of ``CornerFacts``, in its field order; a fact that is
None (read from a file written before brakeheat recorded it) is left out, as the file had it.
Reading checks every key and value and names the key that is wrong: a file's block holds exactly
the facts this version knows (a key it does not know is an error, not dropped).
"""
from __future__ import annotations

from dataclasses import fields

from lapdata.echo import shown
from thermo.output.errors import OutputError
from thermo.results import CornerFacts, LapPadThickness, StintPadThickness


def facts_dict(facts: CornerFacts) -> dict:
    """The ``extras`` block of one corner: plain dicts, lists, strings, numbers and booleans.

    Parameters
    ----------
    facts : CornerFacts
        A corner's facts [-]

    Returns
    -------
    dict
        Key per fact in field order (None facts left out); ``pad_thickness_m`` a list of
        ``{"when", "thickness_m"}``, ``pad_thickness_by_lap_m`` a list of ``{"lap", "thickness_m"}`` [-]
    """
    out = {}
    for f in fields(facts):
        value = getattr(facts, f.name)
        if value is None:
            continue
        if f.name == "pad_thickness_m":
            value = [{"when": row.when, "thickness_m": row.thickness_m} for row in value]
        elif f.name == "pad_thickness_by_lap_m":
            value = [{"lap": row.lap, "thickness_m": row.thickness_m} for row in value]
        elif isinstance(value, tuple):
            value = list(value)
        out[f.name] = value
    return out


def facts_from_dict(block, where: str) -> CornerFacts:
    """``CornerFacts`` from an ``extras`` block as ``facts_dict`` makes it (or an older file held it).

    Parameters
    ----------
    block : dict
        The decoded block [-]
    where : str
        Named in error messages, e.g. "run.h5 corner front extras_json" [-]

    Returns
    -------
    CornerFacts
        The facts; those missing from an older file (the optional ones) None [-]

    Raises
    ------
    OutputError
        Not a dict, a required fact missing, a key this version does not know, or a value of
        the wrong kind; the message names the key.
    """
    if not isinstance(block, dict):
        raise OutputError(f"{where}: expected a JSON object of corner facts, got {shown(block)}")
    known = {f.name: f for f in fields(CornerFacts)}
    unknown = [key for key in block if key not in known]
    if unknown:
        raise OutputError(f"{where}: unknown key {shown(unknown[0])} (written by a newer brakeheat?); "
                          f"expected keys {', '.join(known)}")
    optional = {name for name, f in known.items() if f.default is None}
    missing = [name for name in known if name not in block and name not in optional]
    if missing:
        raise OutputError(f"{where}: key '{missing[0]}' is missing")
    values = {}
    for name, value in block.items():
        key = f"{where}.{name}"
        if name == "pad_thickness_m":
            values[name] = tuple(StintPadThickness(_text(_item(row, "when", key), f"{key}.when"),
                                                   _number(_item(row, "thickness_m", key), f"{key}.thickness_m"))
                                 for row in _list(value, key))
        elif name == "pad_thickness_by_lap_m":
            values[name] = tuple(LapPadThickness(_whole(_item(row, "lap", key), f"{key}.lap"),
                                                 _number(_item(row, "thickness_m", key), f"{key}.thickness_m"))
                                 for row in _list(value, key))
        elif name == "link_to_boundary":
            values[name] = tuple(_flag(v, key) for v in _list(value, key))
        elif name in ("warnings", "correlations_used"):
            values[name] = tuple(_text(v, key) for v in _list(value, key))
        else:
            values[name] = _number(value, key)
    return CornerFacts(**values)


def _list(value, key: str) -> list:
    if not isinstance(value, list):
        raise OutputError(f"{key}: expected a list, got {shown(value)}")
    return value


def _item(row, name: str, key: str):
    if not isinstance(row, dict) or name not in row:
        raise OutputError(f"{key}: expected objects with key '{name}', got {shown(row)}")
    return row[name]


def _number(value, key: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise OutputError(f"{key}: expected a number, got {shown(value)}")
    return float(value)


def _whole(value, key: str) -> int:
    if isinstance(value, bool) or not isinstance(value, int):
        raise OutputError(f"{key}: expected a whole number, got {shown(value)}")
    return value


def _flag(value, key: str) -> bool:
    if not isinstance(value, bool):
        raise OutputError(f"{key}: expected true or false, got {shown(value)}")
    return value


def _text(value, key: str) -> str:
    if not isinstance(value, str):
        raise OutputError(f"{key}: expected a string, got {shown(value)}")
    return value
