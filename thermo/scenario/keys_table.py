"""The scenario keys as tables for people: README's key tables and `brakeheat keys` are made here,
from the one declaration of each key (``thermo.scenario.schema``, ``thermo.keys``)."""
from __future__ import annotations

from thermo.keys import REQUIRED, Field
from thermo.scenario import schema as S


def sections() -> list[tuple[str, dict[str, Field]]]:
    """(TOML table, its keys) in the order a scenario file is written."""
    out = [(f"[{name}]", table) for name, table in S.SECTIONS.items()]
    out.insert(out.index(("[limits]", S.LIMITS)) + 1, ("[corners.NAME]", S.CORNER))
    at = out.index(("[corners.NAME]", S.CORNER)) + 1
    for i, (part, table) in enumerate(S.CORNER_SECTIONS.items()):
        out.insert(at + i, (f"[corners.NAME.{part}]", table))
    out.insert(at + len(S.CORNER_SECTIONS), ("[corners.NAME.ducts.DUCT]", S.DUCT))
    plan = out.index(("[plan]", S.PLAN)) + 1
    for i, (kind, table) in enumerate(S.PHASES.items()):
        out.insert(plan + i, (f'[[plan.phases]] type = "{kind}"', {"name": S.PHASE_COMMON["name"], **table}))
    # a template's own phases ([[plan.stints.phases]]) and [[plan.finish]] take the phase keys above
    out.insert(plan + len(S.PHASES), ("[[plan.stints]]", S.STINT))
    return out


def _value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        return f'"{value}"'
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_value(v) for v in value) + "]"
    return f"{value:g}" if isinstance(value, float) else str(value)


def default_text(field: Field) -> str:
    if field.default is REQUIRED:
        return "required"
    if field.default is None:
        return "omit"
    return _value(field.default)


def allowed_text(field: Field) -> str:
    if field.choices:
        return " / ".join(f'"{c}"' for c in field.choices)
    low = f"> {field.above:g}" if field.above is not None else (f">= {field.minimum:g}" if field.minimum is not None else "")
    high = f"<= {field.maximum:g}" if field.maximum is not None else ""
    kind = {bool: "true / false", int: "whole number", str: "text", list: "list"}.get(field.kind, "")
    return ", ".join(x for x in (kind, low, high) if x)


def markdown() -> str:
    """Every section's keys as Markdown tables (key, default, allowed, meaning)."""
    lines = []
    for title, table in sections():
        lines += [f"**{title}**", "", "| key | default | allowed | meaning |", "|---|---|---|---|"]
        lines += [f"| `{name}` | {default_text(fld)} | {allowed_text(fld)} | {fld.doc} |" for name, fld in table.items()]
        lines.append("")
    return "\n".join(lines)


def text() -> str:
    """The same for a terminal: one block per section, columns padded to their content."""
    lines = []
    for title, table in sections():
        rows = [(name, default_text(fld), allowed_text(fld), fld.doc) for name, fld in table.items()]
        widths = [max(len(r[i]) for r in rows + [("key", "default", "allowed", "")]) for i in range(3)]
        lines.append(title)
        for row in rows:
            cells = "  ".join(cell.ljust(w) for cell, w in zip(row[:3], widths))
            lines.append(("  " + cells + ("  " + row[3] if row[3] else "")).rstrip())
        lines.append("")
    return "\n".join(lines)
