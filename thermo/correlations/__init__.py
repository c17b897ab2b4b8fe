"""Heat-transfer correlations and air properties: small pure functions, each citing its source.

``REGISTRY`` maps a name to each public correlation; dispatch by name goes through it only
(:func:`get_correlation`). Every function carries ``.reference`` (its docstring's References)
and ``.validity`` (the ranges it checks; see :mod:`thermo.correlations.validity`).
Heat partition (``partition.py``) joins through its ``REFERENCES`` dict or the decorator.
"""
from __future__ import annotations

import importlib
import importlib.util
import sys
from typing import Callable

from lapdata.suggest import did_you_mean
from thermo.correlations import air, contact, forced, internal, natural, radiation
from thermo.correlations.validity import (
    VALIDITY, CorrelationWarning, get_validity_policy, reference_from_docstring, set_validity_policy,
)
from thermo.errors import CorrelationError

_MODULES = [air, forced, internal, natural, radiation, contact]
if importlib.util.find_spec("thermo.correlations.partition") is not None:
    # written by another module owner; its functions join the registry when decorated with
    # thermo.correlations.validity.correlation or named in its module-level REFERENCES dict
    _MODULES.append(importlib.import_module("thermo.correlations.partition"))

#: name -> function, for every public correlation of the modules above.
REGISTRY: dict[str, Callable] = {
    name: func
    for module in _MODULES
    for name, func in vars(module).items()
    if callable(func) and not name.startswith("_")
    and (hasattr(func, "validity") or name in getattr(module, "REFERENCES", {}))
}


def get_correlation(name: str) -> Callable:
    """The correlation registered as ``name``; CorrelationError with close matches if unknown."""
    try:
        return REGISTRY[name]
    except KeyError:
        raise CorrelationError(f"correlation: unknown name '{name}'{did_you_mean(name, REGISTRY, n=3, cutoff=0.5)}") from None


def correlation_reference(name: str) -> str:
    """The reference text (References section of the docstring) of a registered correlation."""
    func = get_correlation(name)
    module = sys.modules[func.__module__]
    return (getattr(func, "reference", "") or getattr(module, "REFERENCES", {}).get(name, "")
            or reference_from_docstring(func.__doc__))


def correlation_names() -> tuple[str, ...]:
    """Sorted names of all registered correlations."""
    return tuple(sorted(REGISTRY))


__all__ = [
    "REGISTRY", "VALIDITY", "CorrelationWarning", "correlation_names", "correlation_reference",
    "get_correlation", "get_validity_policy", "set_validity_policy",
]
