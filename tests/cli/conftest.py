"""Shared CLI runs: `brakeheat` called in-process through thermo.cli.main.main, output captured.

The expensive runs (a shrunk tests/data/small.toml: 1 + 1 in-lap + stop + 1 lap + 60 s soak, a few
seconds each) are made once per session and shared by the tests that read them.
"""
from __future__ import annotations

import contextlib
import importlib.util
import io
import json
import os
import sys
from pathlib import Path

import pytest

from thermo.cli.main import main

ROOT = Path(__file__).resolve().parents[2]
SMALL = ROOT / "tests" / "data" / "small.toml"
DEMO_LAP = ROOT / "scenarios" / "demo_lap.csv"
SHRINK = ["--set", "plan.phases.1.count=1", "--set", "plan.phases.4.count=1", "--set", "plan.phases.5.duration_s=60"]
EXCEED = ["--set", "limits.bearing_c=30"]     # the bearing passes 30 degC in every run of this scenario


def load_cases():
    """tests/scenario/scenario_cases.py (the bad-scenario table), loaded by path."""
    path = ROOT / "tests" / "scenario" / "scenario_cases.py"
    spec = importlib.util.spec_from_file_location("scenario_cases_for_cli", path)
    if spec.name in sys.modules:
        return sys.modules[spec.name]
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module     # dataclasses look their module up
    spec.loader.exec_module(module)
    return module


def cli(argv) -> tuple[int, str, str]:
    """(exit code, stdout, stderr) of `brakeheat ARGV`; argparse's SystemExit gives its code."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main([str(a) for a in argv])
        except SystemExit as exit_:
            code = exit_.code
    return code, out.getvalue(), err.getvalue()


def _snapshot(folder: Path) -> dict:
    return {p.name: (p.stat().st_ino, p.stat().st_mtime_ns, p.read_bytes()) for p in sorted(folder.iterdir())}


@pytest.fixture(scope="session")
def small_runs(tmp_path_factory):
    """Run 1: `run --json --out DIR` (limit exceeded, no flag); run 2: `run --out DIR --fail-on-exceeded`."""
    folder = tmp_path_factory.mktemp("run_out")
    first = cli(["run", SMALL, "--json", "--quiet", "--out", folder, *SHRINK, *EXCEED])
    after_first = _snapshot(folder)
    second = cli(["run", SMALL, "--quiet", "--out", folder, "--fail-on-exceeded", *SHRINK, *EXCEED])
    after_second = _snapshot(folder)
    return {"folder": folder, "first": first, "second": second,
            "json": json.loads(first[1]) if first[0] == 0 else None,
            "after_first": after_first, "after_second": after_second}


@pytest.fixture(scope="session")
def comparison():
    """`compare --json` with a variant equal to the baseline and a bigger front duct."""
    code, out, err = cli(["compare", SMALL, "--json", "--quiet", *SHRINK,
                          "--variant", "same", "corners.front.pad_mu=0.5",
                          "--variant", "bigger_duct", "corners.front.ducts.main.inlet_area_mm2=18000"])
    assert code == 0, err
    return json.loads(out)


@pytest.fixture(scope="session")
def lap_json():
    code, out, err = cli(["lap", DEMO_LAP, "--json"])
    assert code == 0, err
    return json.loads(out)


@pytest.fixture(autouse=True)
def _agg_backend(monkeypatch):
    monkeypatch.setenv("MPLBACKEND", os.environ.get("MPLBACKEND", "Agg"))
