"""Shared fixtures for the fit tests: a small calibrated-scenario folder and synthetic logged stints."""
from __future__ import annotations

import contextlib
import io
import json
import shutil
from pathlib import Path

import pytest

from make_demo_stint import SyntheticChannel, synthesize_stint
from thermo.cli.main import main

DATA = Path(__file__).resolve().parents[1] / "data"
TRUTH = (("corners.front.airflow.disc_convection_multiplier", 1.25),)
TRUE_CALIPER_OFFSET_K = 1.5
CHANNELS = (SyntheticChannel("temp_disc_front", "front", "disc", 0.3, 0.0, 2.0),
            SyntheticChannel("temp_caliper_front", "front", "caliper", 3.0, TRUE_CALIPER_OFFSET_K, 0.2))

CALIBRATION = '''
[calibration]
corners = ["front"]
sample_s = 1.0
max_evaluations = 10
holdout_laps = [2]

[calibration.channels.temp_disc_front]
corner = "front"
node = "disc"
lag_s = 0.3
noise_k = 2.0

[calibration.channels.temp_caliper_front]
corner = "front"
node = "caliper"
lag_s = 3.0
fit_offset = true
noise_k = 0.2

[calibration.parameters.disc_convection]
key = "airflow.disc_convection_multiplier"
prior = 2.0
lower = 0.3
upper = 4.0
'''


def small_text() -> str:
    """tests/data/small.toml without pad wear (the fast solver at its default tolerances: a looser
    Newton tolerance would make the finite-difference Jacobian of the fit noisy)."""
    text = (DATA / "small.toml").read_text(encoding="utf-8")
    for old, new in (("enabled = true", "enabled = false"),):
        assert old in text, old
        text = text.replace(old, new)
    return text


def make_folder(folder: Path, calibration: str = CALIBRATION) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    shutil.copy(DATA / "short_circuit.toml", folder / "short_circuit.toml")
    path = folder / "fit.toml"
    path.write_text(small_text() + calibration, encoding="utf-8")
    return path


@pytest.fixture(scope="session")
def stint(tmp_path_factory):
    """(scenario path, logged CSV path) of a 2-lap synthetic stint with known parameters TRUTH."""
    folder = tmp_path_factory.mktemp("fit")
    scenario = make_folder(folder)
    log = synthesize_stint(scenario, folder / "log.csv", CHANNELS, TRUTH, laps=2, sample_hz=20.0, seed=11)
    return scenario, log


def run_cli(argv) -> tuple[int, str]:
    """Exit code and stdout of `brakeheat ARGV`."""
    buffer = io.StringIO()
    with contextlib.redirect_stdout(buffer):
        code = main(argv)
    return code, buffer.getvalue()


@pytest.fixture(scope="session")
def cli_fit(stint, tmp_path_factory):
    """`brakeheat fit --json --out` on the synthetic stint: (parsed JSON, out dir, calibrated path)."""
    scenario, log = stint
    out = tmp_path_factory.mktemp("fit_out")
    calibrated = out / "fit_calibrated.toml"          # with --out the calibrated scenario joins the output set
    code, text = run_cli(["fit", str(scenario), "--measured", str(log), "--out", str(out), "--json"])
    assert code == 0
    return json.loads(text), out, calibrated
