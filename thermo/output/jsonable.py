"""Nested blocks as JSON (a corner's ``extras`` block from ``thermo.output.facts``, the hydraulics block):
plain for the summary, exact for HDF5."""
from __future__ import annotations

import json
import math
from typing import Any

import numpy as np

from lapdata.echo import shown
from thermo.output.errors import OutputError

_ARRAY_TAG = "__ndarray__"
_TUPLE_TAG = "__tuple__"


def json_ready(value: Any, where: str) -> Any:
    """A copy of ``value`` made of dict/list/str/int/float/bool/None only; NaN and infinities become None.

    numpy arrays and tuples become lists, numpy scalars Python numbers, dict keys strings.
    Anything else raises :class:`OutputError` naming ``where`` (a key path such as
    ``"corner front_left extras.pad"``): nothing is dropped silently.
    """
    if value is None or isinstance(value, (bool, str)):
        return value
    if isinstance(value, np.bool_):
        return bool(value)
    if isinstance(value, (int, np.integer)):
        return int(value)
    if isinstance(value, (float, np.floating)):
        number = float(value)
        return number if math.isfinite(number) else None
    if isinstance(value, np.ndarray):
        return json_ready(value.tolist(), where)
    if isinstance(value, (list, tuple)):
        return [json_ready(item, f"{where}[{i}]") for i, item in enumerate(value)]
    if isinstance(value, dict):
        out = {}
        for key, item in value.items():
            if not isinstance(key, (str, int, np.integer)):
                raise OutputError(f"{where}: key {shown(key)} must be a string or an integer")
            out[str(key)] = json_ready(item, f"{where}.{key}")
        return out
    raise OutputError(f"{where}: {type(value).__name__} cannot be written as JSON "
                      "(expected numbers, strings, lists, dicts or numpy arrays)")


def _tagged(value: Any, where: str) -> Any:
    if value is None or isinstance(value, (bool, str, int, float)):
        return value
    if isinstance(value, np.ndarray):
        if value.dtype.kind not in "biuf":
            raise OutputError(f"{where}: numpy array of dtype {value.dtype} cannot be stored "
                              "(expected bool, integer or float)")
        return {_ARRAY_TAG: value.ravel().tolist(), "dtype": value.dtype.str, "shape": list(value.shape)}
    if isinstance(value, np.generic):
        tagged = _tagged(np.asarray(value), where)
        tagged["scalar"] = True
        return tagged
    if isinstance(value, tuple):
        return {_TUPLE_TAG: [_tagged(item, f"{where}[{i}]") for i, item in enumerate(value)]}
    if isinstance(value, list):
        return [_tagged(item, f"{where}[{i}]") for i, item in enumerate(value)]
    if isinstance(value, dict):
        for key in value:
            if not isinstance(key, str):
                raise OutputError(f"{where}: key {shown(key)} must be a string to be stored exactly")
            if key in (_ARRAY_TAG, _TUPLE_TAG):
                raise OutputError(f"{where}: key {shown(key)} is reserved by the results file")
        return {key: _tagged(item, f"{where}.{key}") for key, item in value.items()}
    raise OutputError(f"{where}: {type(value).__name__} cannot be stored "
                      "(expected numbers, strings, lists, tuples, dicts or numpy arrays)")


def _untagged(value: Any) -> Any:
    if isinstance(value, list):
        return [_untagged(item) for item in value]
    if isinstance(value, dict):
        if _ARRAY_TAG in value:
            flat = np.array(value[_ARRAY_TAG], dtype=np.dtype(value["dtype"]))
            array = flat.reshape(value["shape"])
            return array[()] if value.get("scalar") else array
        if _TUPLE_TAG in value:
            return tuple(_untagged(item) for item in value[_TUPLE_TAG])
        return {key: _untagged(item) for key, item in value.items()}
    return value


def encode_exact(value: Any, where: str) -> str:
    """JSON text that :func:`decode_exact` turns back into an equal object.

    Floats keep every bit (Python writes the shortest repr that round-trips; NaN and
    infinities are kept as the JSON extensions ``NaN``/``Infinity``); numpy arrays and scalars
    keep dtype and shape; tuples stay tuples.
    """
    return json.dumps(_tagged(value, where), allow_nan=True, sort_keys=False)


def decode_exact(text: str) -> Any:
    """The object :func:`encode_exact` wrote."""
    return _untagged(json.loads(text))
