"""Check one TOML table against its schema and convert it to SI (unknown keys are errors)."""
from __future__ import annotations

from lapdata.echo import has_control_characters, shown
from lapdata.suggest import did_you_mean
from thermo.errors import ScenarioError
from thermo.keys import REQUIRED, Field, is_finite_number


def suggestion(key: str, known) -> str:
    """`` (did you mean 'x'?)`` or nothing (``lapdata.suggest.did_you_mean``)."""
    return did_you_mean(key, known)


def reject_unknown(where: str, table: dict, known, source: str) -> None:
    for key in table:
        if key not in known:
            raise ScenarioError(
                f"{source}: unknown key {shown(key)} in [{where}]{suggestion(key, known)}; "
                f"expected one of: {', '.join(sorted(known))}")


def convert_value(where: str, key: str, field: Field, value, source: str):
    at = f"{source}: [{where}] {key}"
    if field.kind is bool:
        if not isinstance(value, bool):
            raise ScenarioError(f"{at} must be true or false, got {shown(value)}")
        return value
    if field.kind is str:
        if not isinstance(value, str):
            raise ScenarioError(f"{at} must be a text string, got {shown(value)}")
        if has_control_characters(value, allow_line_breaks=key == "description"):
            raise ScenarioError(f"{at} = {shown(value)}: control characters (line breaks, escapes, NUL) are not "
                                "allowed here; expected plain text")
        if field.choices and value not in field.choices:
            raise ScenarioError(f"{at} = {shown(value)} is not allowed{suggestion(value, field.choices)}; "
                                f"expected one of: {', '.join(field.choices)}")
        return value
    if field.kind is list:
        if not isinstance(value, list):
            raise ScenarioError(f"{at} must be a list, got {shown(value)}")
        return _convert_list(at, value, field)
    if field.kind is int:
        if isinstance(value, bool) or not isinstance(value, int):
            raise ScenarioError(f"{at} must be a whole number, got {shown(value)}")
    elif not is_finite_number(value):
        raise ScenarioError(f"{at} must be a finite number, got {shown(value)}")
    if field.minimum is not None and value < field.minimum:
        raise ScenarioError(f"{at} must be at least {field.minimum:g}, got {shown(value)}")
    if field.above is not None and not value > field.above:
        raise ScenarioError(f"{at} must be more than {field.above:g}, got {shown(value)}")
    if field.maximum is not None and value > field.maximum:
        hint = ""
        if key.endswith("_c") and field.minimum is not None and field.minimum <= value - 273.15 <= field.maximum:
            hint = f" (this key is in degC: {shown(value)} K would be {value - 273.15:g} degC)"
        raise ScenarioError(f"{at} must be at most {field.maximum:g}, got {shown(value)}{hint}")
    if field.kind is int:
        return value
    return float(value) * field.factor + field.offset


def _convert_list(at, value, field):
    def number(x):
        if not is_finite_number(x):
            raise ScenarioError(f"{at} must hold finite numbers, got {shown(x)}")
        return float(x)

    out = []
    for item in value:
        if isinstance(item, list):
            out.append(tuple(number(x) for x in item))
        else:
            x = number(item)
            if x <= 0:
                raise ScenarioError(f"{at} must hold positive numbers, got {shown(item)}")
            out.append(x * field.factor)
    return tuple(out)


def convert_table(where: str, table, schema: dict, source: str) -> dict:
    """SI values keyed by each field's SI name; defaults filled in; REQUIRED keys enforced."""
    if not isinstance(table, dict):
        raise ScenarioError(f"{source}: [{where}] must be a table")
    reject_unknown(where, table, schema, source)
    out = {}
    for key, field in schema.items():
        if key in table:
            out[field.si_name] = convert_value(where, key, field, table[key], source)
        elif field.default is REQUIRED:
            raise ScenarioError(f"{source}: missing key '{key}' in [{where}]" + (f" ({field.doc})" if field.doc else ""))
        elif field.default is None:
            out[field.si_name] = None
        elif field.kind in (float,) and isinstance(field.default, (int, float)):
            out[field.si_name] = float(field.default) * field.factor + field.offset
        elif field.kind is list:
            out[field.si_name] = tuple(field.default)
        else:
            out[field.si_name] = field.default
    return out
