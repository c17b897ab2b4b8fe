"""Scenario keys, each declared once: TOML name (with its unit), conversion to SI, range, default, doc.

A key is either a row of a schema table (``thermo/scenario/schema.py``) or, for the parts of a
corner, the metadata of a dataclass field (``key(...)`` below), from which the schema table, the
dataclass's own default, its range check and README's key tables (``brakeheat keys``) all follow.

    outer_diameter_m: float = key("outer_diameter_mm", factor=MM, above=0.0, doc="swept ring")

declares the TOML key ``outer_diameter_mm`` (required: no default), converted by x 1e-3 into the
field ``outer_diameter_m``, which must be above 0. Ranges and defaults are in the TOML key's unit.
"""
from __future__ import annotations

import dataclasses
import functools
import math
from dataclasses import dataclass
from typing import Any

from lapdata.echo import shown
from lapdata.units import KELVIN_AT_0C, MM
from thermo.errors import ScenarioError

REQUIRED = object()


@dataclass(frozen=True)
class Field:
    """One TOML key: converted value = value * factor + offset, stored under ``si_name``.

    ``minimum``/``maximum`` bound the value inclusively and ``above`` exclusively, in the key's
    own unit; ``default`` is in that unit too (REQUIRED: the key must be given).
    """

    si_name: str
    default: Any = REQUIRED
    factor: float = 1.0
    offset: float = 0.0
    kind: type = float
    choices: tuple = ()
    minimum: float | None = None
    maximum: float | None = None
    doc: str = ""
    above: float | None = None
    toml_name: str = ""

    def to_si(self, value):
        """A TOML-unit value (number, list of numbers, or other) in SI."""
        if self.kind is float and isinstance(value, (int, float)) and not isinstance(value, bool):
            return float(value) * self.factor + self.offset
        if self.kind is list:
            return tuple(tuple(x) if isinstance(x, (list, tuple)) else x * self.factor for x in value)
        return value

    def from_si(self, value):
        """An SI number back in the key's unit (for messages and tables)."""
        return (value - self.offset) / self.factor


def f(si, default=REQUIRED, factor=1.0, offset=0.0, kind=float, choices=(), minimum=None, maximum=None, doc="",
      above=None):
    return Field(si, default, factor, offset, kind, choices, minimum, maximum, doc, above)


def mm(si, default=REQUIRED, **kw):
    return f(si, default, MM, minimum=kw.pop("minimum", 0.0), **kw)


def degc(si, default=REQUIRED, **kw):
    return f(si, default, 1.0, KELVIN_AT_0C, **kw)


def key(toml_name: str, default=REQUIRED, *, factor=1.0, offset=0.0, kind=float, choices=(), minimum=None,
        maximum=None, above=None, doc="") -> dataclasses.Field:
    """A dataclass field declared as a scenario key (see the module notes); its Python default is
    the TOML default converted to SI."""
    declared = Field("", default, factor, offset, kind, choices, minimum, maximum, doc, above, toml_name)
    meta = {"key": declared}
    if default is REQUIRED:
        return dataclasses.field(metadata=meta)
    return dataclasses.field(default=None if default is None else declared.to_si(default), metadata=meta)


def declared_keys(cls) -> dict[str, Field]:
    """The schema table of a dataclass: TOML name -> Field (with the field's name as ``si_name``), in order."""
    return dict(_declared_keys(cls))


@functools.lru_cache(maxsize=None)
def _declared_keys(cls) -> dict[str, Field]:
    """``declared_keys``, worked out once a class (every instance checks itself against it)."""
    return {fld.metadata["key"].toml_name: dataclasses.replace(fld.metadata["key"], si_name=fld.name)
            for fld in dataclasses.fields(cls) if "key" in fld.metadata}


def is_finite_number(value) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


def check_declared(obj, section: str) -> None:
    """Check every declared field of a dataclass instance against its type, choices and range;
    a ScenarioError names the section and the TOML key, with the value in the key's unit."""
    for toml_name, declared in declared_keys(type(obj)).items():
        value = getattr(obj, declared.si_name)
        at = f"[{section}] {toml_name}"
        if value is None and declared.default is None:
            continue
        if declared.kind is str:
            if not isinstance(value, str) or (declared.choices and value not in declared.choices):
                want = f"one of {', '.join(declared.choices)}" if declared.choices else "a text string"
                raise ScenarioError(f"{at} must be {want}, got {shown(value)}")
            continue
        if declared.kind is bool:
            if not isinstance(value, bool):
                raise ScenarioError(f"{at} must be true or false, got {shown(value)}")
            continue
        if declared.kind is list:
            continue                      # lists are checked where their shape is known
        if declared.kind is int and (isinstance(value, bool) or not isinstance(value, int)):
            raise ScenarioError(f"{at} must be a whole number, got {shown(value)}")
        if not is_finite_number(value):
            raise ScenarioError(f"{at} must be a finite number, got {shown(value)}")
        in_unit = declared.from_si(value) if declared.kind is float else value
        if declared.minimum is not None and in_unit < declared.minimum - 1e-9 * max(1.0, abs(declared.minimum)):
            raise ScenarioError(f"{at} must be at least {declared.minimum:g}, got {in_unit:g}")
        if declared.above is not None and not in_unit > declared.above:
            raise ScenarioError(f"{at} must be more than {declared.above:g}, got {in_unit:g}")
        if declared.maximum is not None and in_unit > declared.maximum + 1e-9 * max(1.0, abs(declared.maximum)):
            raise ScenarioError(f"{at} must be at most {declared.maximum:g}, got {in_unit:g}")
