"""Values echoed in messages: repr-style, escaped, at most 80 characters, never a file's contents.

Every error message that quotes a user's value goes through ``shown`` so that a newline, an
escape sequence or a megabyte of text in an input can neither break the one-line promise of
the command line nor reach the terminal raw; ``printable`` does the same for names that a
report prints as text (a scenario, segment or variant name).
"""
from __future__ import annotations

import unicodedata

LIMIT = 80


def _cut(text: str, limit: int) -> str:
    return text if len(text) <= limit else text[: limit - 3] + "..."


def shown(value, limit: int = LIMIT) -> str:
    """``value`` as a short, escaped, repr-style text of at most ``limit`` characters.

    >>> shown("grey\\ncast")
    "'grey\\\\ncast'"
    >>> shown(10 ** 5000)
    'an integer of 5001 digits'
    >>> len(shown("x" * 1000))
    80
    >>> shown([[[[1]]]])
    '[[[[1]]]]'
    """
    if isinstance(value, bool) or value is None:
        return repr(value)
    if isinstance(value, int):
        digits = value.bit_length() * 0.30103
        if digits > 60:
            return f"an integer of {len(str(abs(value))) if digits < 4000 else int(digits) + 1} digits"
        return _cut(repr(value), limit)
    if isinstance(value, (float, str, bytes)):
        return _cut(repr(value), limit)
    if isinstance(value, (list, tuple)):
        return _cut(_sequence(value, limit, depth=0), limit)
    if isinstance(value, dict):
        return _cut("{" + ", ".join(f"{shown(k, 20)}: {shown(v, 20)}" for k, v in list(value.items())[:4])
                    + (", ...}" if len(value) > 4 else "}"), limit)
    return _cut(f"<{type(value).__name__}>", limit)


def _sequence(value, limit: int, depth: int) -> str:
    open_, close = ("[", "]") if isinstance(value, list) else ("(", ")")
    if depth > 8:
        return open_ + "..." + close
    parts, length = [], 0
    for item in value:
        text = _sequence(item, limit, depth + 1) if isinstance(item, (list, tuple)) else shown(item, limit)
        parts.append(text)
        length += len(text) + 2
        if length > limit:
            parts.append("...")
            break
    return open_ + ", ".join(parts) + close


def has_control_characters(text: str, allow_line_breaks: bool = False) -> bool:
    """True if ``text`` holds a control or format character (Unicode category C, or a line or
    paragraph separator): a NUL, an escape sequence, a carriage return, a bidi override.

    >>> has_control_characters("Mill hairpin"), has_control_characters("a\\x1b[31m")
    (False, True)
    >>> has_control_characters("two\\nlines", allow_line_breaks=True)
    False
    """
    for c in text:
        if allow_line_breaks and c in "\n\t":
            continue
        if unicodedata.category(c)[0] == "C" or unicodedata.category(c) in ("Zl", "Zp"):
            return True
    return False


def printable(text, limit: int | None = None) -> str:
    """``text`` with every non-printable character escaped (``\\n``, ``\\x1b`` ...), for a terminal.

    >>> printable("Mill\\nhairpin\\x1b[31m")
    'Mill\\\\nhairpin\\\\x1b[31m'
    >>> printable("Épingle")
    'Épingle'
    """
    text = str(text)
    if not text.isprintable():
        text = "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)
    return text if limit is None else _cut(text, limit)
