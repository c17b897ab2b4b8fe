"""The calibrated scenario: the original text with its [calibrated] table replaced by the fitted values."""
from __future__ import annotations

import re
import tomllib
from pathlib import Path

from lapdata.echo import printable
from thermo.fit.errors import FitError
from thermo.scenario.toml_text import toml_string

_TABLE = re.compile(r"^\s*\[+\s*([^\]]+?)\s*\]+\s*(#.*)?$")


def strip_calibrated(text: str) -> str:
    """The scenario text without its [calibrated] table (header to the next table header)."""
    out, skipping = [], False
    for line in text.splitlines(keepends=True):
        m = _TABLE.match(line)
        if m:
            skipping = m.group(1) == "calibrated" and not line.lstrip().startswith("[[")
        if not skipping:
            out.append(line)
    return "".join(out)


def calibrated_text(text: str, result, fit_date: str, *, measured: str, pinned=()) -> str:
    """Scenario text with a [calibrated] table of the fitted overrides, each commented with +- std error.

    Parameters
    ----------
    text : str
        The original scenario text [-]
    result : FitResult
        The fit [-]
    fit_date : str
        ISO date of the fit, written beside each value [-]
    measured : str
        The logged file the fit used, named in the table's comment [-]
    pinned : sequence of (dotted key, str)
        Extra overrides, e.g. plan files made absolute [-]
    """
    body = strip_calibrated(text).rstrip("\n")
    lines = ["", "", f"# Written by `brakeheat fit` on {fit_date} from {printable(measured)}.",
             "# Each value: fitted value, +- one approximate standard error (linearised, from the Jacobian).",
             "[calibrated]"]
    for v in result.values:
        for key in v.override_keys:
            lines.append(f'{toml_string(key)} = {v.value:.6g}    # +- {v.std_error:.3g} (1 s.e.), {v.kind}, fitted {fit_date}')
    for key, value in pinned:
        lines.append(f'{toml_string(key)} = {toml_string(value)}    # the calibrated file lives elsewhere: plan file pinned')
    out = body + "\n".join(lines) + "\n"
    try:
        tomllib.loads(out)
    except tomllib.TOMLDecodeError as error:
        raise FitError(f"cannot add [calibrated] to the scenario text: {error}") from None
    return out


def pinned_plan_files(scenario, target: Path) -> list[tuple[str, str]]:
    """The plan's lap file as an absolute override when the calibrated file is written to another folder."""
    if Path(target).resolve().parent == Path(scenario.path).resolve().parent:
        return []
    return [(f"plan.{scenario.plan.lap_source}", str(Path(scenario.plan.lap_path).resolve()))]
