"""Terminal tables for every command (run, compare, lap, settle, fit): columns that never run together.

Each column is as wide as its widest cell or header, and two spaces separate columns, so a wide
number pushes its column wider instead of into its neighbour. Numbers are right-aligned and text
left-aligned (a column counts as numbers when every cell reads as one; a caller can say otherwise).
A text longer than ``max_text_width`` in any column but the last (a long check or variant name) is
abbreviated to its start and a mark ``~1``, ``~2`` ... and spelt out in full in a key below the
table; the same text gets the same mark. The last column is never abbreviated: nothing stands to
its right, and its rule of dashes stops at ``max_text_width`` (or its header's width).

>>> print("\\n".join(format_table(["check", "margin [K]"], [["fluid_boiling_dry", "+60.0"], ["bearing", "-5.2"]])))
  check              margin [K]
  -----------------  ----------
  fluid_boiling_dry       +60.0
  bearing                  -5.2
"""
from __future__ import annotations

import math
import re

GAP = "  "
MAX_TEXT_WIDTH = 40          # characters of a text cell or header before it is abbreviated
KEY_MARK = "~"
# a number, optionally signed, with an optional change in brackets: "1096.5", "+5.1", "1096.5 (+77.2)";
# a clock "1:40" or "1:02:03"; a lone "-" stands for a missing number
_NUMBER = re.compile(r"[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?%?(\s+\([+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?\))?")
_CLOCK = re.compile(r"-?\d+(:\d\d){1,2}")


def is_number(cell: str) -> bool:
    """Whether a cell reads as a number (right-aligned): a decimal, a number with its change in
    brackets, a clock time m:ss, or the "-" and "" of a missing value.

    >>> [is_number(c) for c in ("1019.3", "1096.5 (+77.2)", "1:40", "-", "nan", "fluid", "3 laps")]
    [True, True, True, True, True, False, False]
    """
    text = cell.strip()
    return (text in ("", "-") or text.lower() in ("nan", "inf", "-inf", "+inf")
            or bool(_NUMBER.fullmatch(text)) or bool(_CLOCK.fullmatch(text)))


def number(value, fmt: str = ".1f") -> str:
    """``value`` formatted for a table cell; "-" for None or a value that is not finite."""
    if value is None:
        return "-"
    try:
        if not math.isfinite(value):
            return "-"
    except TypeError:
        return str(value)
    return format(value, fmt)


class _Abbreviations:
    """The marks given to long texts, in the order they were first met."""

    def __init__(self, width: int):
        self.width, self.marks = width, {}

    def __call__(self, text: str) -> str:
        if len(text) <= self.width:
            return text
        mark = self.marks.setdefault(text, f"{KEY_MARK}{len(self.marks) + 1}")
        return text[: max(self.width - len(mark), 1)] + mark

    def key(self, indent: str) -> list[str]:
        if not self.marks:
            return []
        return [f"{indent}{mark} = {text}" for text, mark in self.marks.items()]


def format_table(headers, rows, *, align=None, indent: str = "  ", max_text_width: int = MAX_TEXT_WIDTH,
                 rule: bool = True) -> list[str]:
    """The lines of a table: header, a rule of dashes, one line per row, then the key of any
    abbreviated text.

    Parameters
    ----------
    headers : sequence of str
        Column titles, units in brackets [-]
    rows : sequence of sequences
        Cells, formatted by the caller (None shows as "-") [-]
    align : sequence of {"left", "right", None} or None
        Per column; None: right when every
        cell of the column reads as a number (:func:`is_number`), else left [-]
    indent : str
        Put before every line [-]
    max_text_width : int
        Longer text (not numbers) in a column other than the last is
        abbreviated, with a key below [characters]
    rule : bool
        Draw the line of dashes under the header [-]

    Returns
    -------
    list of str
        The lines, without trailing spaces [-]
    """
    headers = [str(h) for h in headers]
    n = len(headers)
    cells = [["-" if c is None else str(c) for c in row] for row in rows]
    for i, row in enumerate(cells):
        if len(row) != n:
            raise ValueError(f"table row {i + 1} has {len(row)} cells, expected {n} (one per header)")
    align = list(align) if align is not None else [None] * n
    right = [a == "right" if a is not None else all(is_number(r[j]) for r in cells) and bool(cells)
             for j, a in enumerate(align)]
    short = _Abbreviations(max_text_width)
    shown_headers = [h if j == n - 1 else short(h) for j, h in enumerate(headers)]
    shown_rows = [[c if j == n - 1 or (right[j] and is_number(c)) else short(c) for j, c in enumerate(row)]
                  for row in cells]
    widths = [max([len(shown_headers[j])] + [len(r[j]) for r in shown_rows]) for j in range(n)]

    def line(row):
        parts = [c.rjust(w) if r else c.ljust(w) for c, w, r in zip(row, widths, right)]
        return (indent + GAP.join(parts)).rstrip()
    lines = [line(shown_headers)]
    if rule:      # the last column's rule marks where it starts; a long source text need not stretch it
        ruled = widths[:-1] + [min(widths[-1], max(len(shown_headers[-1]), max_text_width))]
        lines.append(indent + GAP.join("-" * w for w in ruled))
    lines += [line(r) for r in shown_rows]
    return lines + short.key(indent)
