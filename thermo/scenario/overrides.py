"""Overrides: `dotted.key=value` pairs applied to the parsed scenario before it is checked.

Keys address the scenario exactly as its tables do: ``corners.front.piston.type``,
``corners.front.ducts.main.inlet_area_mm2``, ``plan.phases.2.count`` (phases counted from 1).
Values are TOML values (``vented`` or ``"vented"``, ``12``, ``true``, ``[38, 38]``). A key that
names nothing in the schema is an error with a suggestion, caught when the scenario is checked.
"""
from __future__ import annotations

import re

from lapdata.echo import shown
from lapdata.files import parse_toml
from thermo.errors import ScenarioError


_KEY_PART = re.compile(r"[A-Za-z0-9_-]+")


def parse_override(text: str, where: str = "--set") -> tuple[str, object]:
    """'KEY=VALUE' -> (key, value); a bare word value is taken as a string."""
    if "=" not in text:
        raise ScenarioError(f"{where} {shown(text)}: expected KEY=VALUE, e.g. corners.front.piston.type=vented")
    key, value = text.split("=", 1)
    key = key.strip()
    if not key or any(not part or not _KEY_PART.fullmatch(part) for part in key.split(".")):
        raise ScenarioError(f"{where} {shown(text)}: the key must be dotted names, e.g. corners.front.pad.thickness_mm")
    return key, parse_value(value.strip(), f"{where} {key}")


def parse_value(value: str, where: str):
    if "\n" not in value and "\r" not in value:
        try:
            return parse_toml(f"v = {value}", where, ScenarioError)["v"]
        except ScenarioError as error:
            if "64-bit" in str(error):
                raise ScenarioError(f"{where}: {shown(value)} is outside the 64-bit integer range TOML allows; "
                                    f"write it as a float (e.g. 1e19) if you mean it") from None
        if value[:1].isalpha() and all(ch.isalnum() or ch in "_-. " for ch in value):
            return value
    raise ScenarioError(f"{where}: cannot read the value {shown(value)} (use TOML: 12, 0.5, true, \"text\", [38, 38])")


def apply_overrides(data: dict, overrides, source: str) -> dict:
    """Set each (dotted key, value) in ``data`` (modified in place and returned)."""
    for key, value in overrides:
        parts = key.split(".")
        node = data
        for depth, part in enumerate(parts[:-1]):
            at = ".".join(parts[: depth + 1])
            if isinstance(node, list):
                node = _list_item(node, part, key, source)
                continue
            if part not in node:
                node[part] = {}
            node = node[part]
            if not isinstance(node, (dict, list)):
                raise ScenarioError(f"{source}: override {key}: '{at}' is a value, not a table")
        last = parts[-1]
        if isinstance(node, list):
            raise ScenarioError(f"{source}: override {key}: address a key inside the list item, e.g. {key}.count")
        node[last] = value
    return data


def _list_item(items: list, part: str, key: str, source: str):
    if not part.isdigit() or not (1 <= int(part) <= len(items)):
        raise ScenarioError(f"{source}: override {key}: {shown(part)} must be an item number from 1 to {len(items)}")
    return items[int(part) - 1]
