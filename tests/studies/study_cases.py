"""Shared for the study tests: a shrunk copy of tests/data/small.toml (1 lap, an in-lap and the
pit stop when run with stints = 1: under 0.1 s a point), with an [uncertainty] table added."""
from __future__ import annotations

import shutil
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
SMALL = ROOT / "tests" / "data" / "small.toml"
SHRINK = (("plan.phases.1.count", 1),)
DUCT = "corners.front.ducts.main.inlet_area_mm2"


def small_copy(folder: Path, uncertainty: str = "") -> Path:
    """small.toml (and its track) copied into ``folder``, ``uncertainty`` appended; the copy's path."""
    shutil.copy(ROOT / "tests" / "data" / "short_circuit.toml", folder / "short_circuit.toml")
    path = folder / "small.toml"
    path.write_text(SMALL.read_text() + "\n" + uncertainty)
    return path
