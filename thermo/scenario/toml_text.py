"""Values written back as TOML text (the overrides a run records, the [calibrated] table `fit` writes).

A string is always written as a basic string with every character TOML forbids raw escaped, so
that a path holding a quote, a backslash or a newline can never end the string early or add a
key to the file it is written into (TOML 1.0, "String": basic strings).
"""
from __future__ import annotations


def toml_string(text: str) -> str:
    """``text`` as a TOML basic string.

    >>> toml_string('a "quoted" path\\\\with\\nnewline')
    '"a \\\\"quoted\\\\" path\\\\\\\\with\\\\nnewline"'
    >>> import tomllib; tomllib.loads("v = " + toml_string("x\\x7f\\x00\\t")) == {"v": "x\\x7f\\x00\\t"}
    True
    """
    out = []
    for c in str(text):
        if c == "\\":
            out.append("\\\\")
        elif c == '"':
            out.append('\\"')
        elif c == "\n":
            out.append("\\n")
        elif ord(c) < 0x20 or ord(c) == 0x7F:
            out.append(f"\\u{ord(c):04X}")
        else:
            out.append(c)
    return '"' + "".join(out) + '"'


def toml_value_text(value) -> str:
    """A value as TOML would write it: true/false, numbers, "text", [lists].

    >>> toml_value_text([1, 2.5, True, "vented"])
    '[1, 2.5, true, "vented"]'
    """
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return repr(value)
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(toml_value_text(v) for v in value) + "]"
    return toml_string(value)
