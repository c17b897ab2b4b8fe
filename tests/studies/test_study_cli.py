"""`brakeheat sweep` and `brakeheat uncertainty` from the command line: JSON, files, errors, Ctrl-C."""
from __future__ import annotations

import json
import os
import re
import signal
import subprocess
import sys
import time

import h5py
import pytest

from study_cases import DUCT, small_copy
from thermo.cli.main import main
from thermo.output.manifest import verify_manifest

SHRINK = ["--set", "plan.phases.1.count=1", "--stints", "1"]
TABLE = """
[uncertainty]
samples = 6
seed = 3
[[uncertainty.inputs]]
name = "front duct"
key = "corners.front.ducts.main.inlet_area_mm2"
distribution = "uniform"
low = 6000
high = 14000
"""


def cli(argv, capsys) -> tuple[int, str, str]:
    try:
        code = main([str(a) for a in argv])
    except SystemExit as exit_:
        code = exit_.code
    out = capsys.readouterr()
    return code, out.out, out.err


def test_sweep_table_and_files(tmp_path, capsys):
    scenario = small_copy(tmp_path)
    out = tmp_path / "out"
    code, text, err = cli(["sweep", scenario, "--vary", f"{DUCT}=[4000,18000]", "--vary",
                           'corners.front.piston.type=["solid","vented"]', "--set", "corners.front.piston.vent_hole_count=4",
                           "--set", "corners.front.piston.vent_hole_diameter_mm=5", *SHRINK, "--workers", "1",
                           "--out", out], capsys)
    assert code == 0, err
    assert "worst margin [K]" in text and "front fluid [K]" in text and "CAUTION" in text
    assert "corners.front.ducts.main.inlet_area_mm2" in text and "corners.front.piston.type" in text
    names = sorted(p.name for p in out.iterdir())
    assert names == ["manifest.json", "report.html", "sweep.csv", "sweep.h5", "sweep_heatmap.png", "sweep_margin_main_inlet_area_mm2.png",
                     "sweep_margin_piston_type.png"]
    assert verify_manifest(out) == []
    header = (out / "sweep.csv").read_text().splitlines()[0]
    assert header.startswith(f"point,{DUCT},corners.front.piston.type,front fluid_boiling_dry margin [K]")
    assert len((out / "sweep.csv").read_text().splitlines()) == 5


def test_sweep_json_is_the_promised_shape(tmp_path, capsys):
    scenario = small_copy(tmp_path)
    code, text, err = cli(["sweep", scenario, "--vary", f"{DUCT}=6000:10000:2", *SHRINK, "--workers", "1", "--json"],
                          capsys)
    assert code == 0, err
    data = json.loads(text)
    assert data["varied"] == [DUCT] and [p["values"][DUCT] for p in data["points"]] == [6000.0, 10000.0]
    assert err == ""                                     # no progress bar with --json


def test_uncertainty_report_json_and_files(tmp_path, capsys):
    scenario = small_copy(tmp_path, TABLE)
    code, text, err = cli(["uncertainty", scenario, *SHRINK, "--workers", "1"], capsys)
    assert code == 0, err
    assert text.index("PROBABILITY THAT THE BRAKE FLUID BOILS") < text.index("Every check")
    assert "Clopper-Pearson" in text and "CAUTION" in text
    out = tmp_path / "out"
    code, text, err = cli(["uncertainty", scenario, *SHRINK, "--workers", "1", "--samples", "4", "--json",
                           "--out", out], capsys)
    assert code == 0, err
    data = json.loads(text)
    assert data["samples"] == 4 and data["seed"] == 3 and len(data["inputs"]) == 1
    assert sorted(p.name for p in out.iterdir()) == [
        "manifest.json", "report.html", "uncertainty.csv", "uncertainty.h5", "uncertainty_peaks_front.png", "uncertainty_peaks_rear.png",
        "uncertainty_tornado_front.png", "uncertainty_tornado_rear.png"]
    with h5py.File(out / "uncertainty.h5") as f:
        assert json.loads(f.attrs["statistics_json"]) == data


@pytest.mark.parametrize("argv, message", [
    (["sweep", "{s}", "--vary", "corners.front.ducts.main.inlet_area_mm2=1:2"], "LOW:HIGH:COUNT"),
    (["sweep", "{s}", "--vary", "corners.front.ducts.main.inlet_area=[1]"], "did you mean"),
    (["sweep", "{s}", "--vary", f"{DUCT}=[5000]", "--resume"], "--resume needs --out"),
    (["sweep", "{s}", "--vary", f"{DUCT}=[5000]", "--workers", "0"], "--workers 0"),
    (["sweep", "{s}", "--vary", f"{DUCT}=[5000]", "--chunk-size", "0"], "--chunk-size 0"),
    (["sweep", "{s}", "--vary", f"{DUCT}=[5000]", "--stints", "-1"], "--stints -1"),
    (["uncertainty", "{s}"], r"no \[uncertainty\] table"),
    (["uncertainty", "{t}", "--samples", "1"], "samples must be a whole number from 2"),
    (["uncertainty", "{t}", "--sampling", "grid"], "invalid choice"),
])
def test_bad_input_is_one_line_and_exit_1(tmp_path, capsys, argv, message):
    scenario = small_copy(tmp_path, TABLE if "{t}" in argv else "")
    argv = [a.replace("{t}", "{s}") for a in argv]
    code, text, err = cli([a.replace("{s}", str(scenario)) for a in argv] + ["--workers", "1"] * ("--workers" not in argv),
                          capsys)
    if message == "invalid choice":                 # argparse: usage, exit 2
        assert code == 2 and message in err
        return
    assert code == 1 and text == ""
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("brakeheat: error:")
    assert re.search(message, lines[0])


def test_ctrl_c_leaves_a_valid_partial_file_and_resume_finishes(tmp_path):
    scenario = small_copy(tmp_path)
    out = tmp_path / "out"
    argv = [sys.executable, "-m", "thermo.cli.main", "sweep", str(scenario), "--vary", f"{DUCT}=4000:18000:12", *SHRINK,
            "--workers", "1", "--chunk-size", "1", "--out", str(out), "--json"]
    process = subprocess.Popen(argv, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                               env={**os.environ, "MPLBACKEND": "Agg"})
    study = out / "sweep.h5"
    deadline = time.monotonic() + 120
    while time.monotonic() < deadline:
        try:
            with h5py.File(study) as f:
                if f.attrs["points_done"] >= 2:
                    break
        except (OSError, KeyError):
            pass
        time.sleep(0.05)
    process.send_signal(signal.SIGINT)
    _, err = process.communicate(timeout=120)
    assert process.returncode == 130, err
    assert "points are in" in err and "--resume" in err
    with h5py.File(study) as f:
        done, total = int(f.attrs["points_done"]), int(f.attrs["points_total"])
    assert 2 <= done < total == 12
    assert not (out / "manifest.json").exists()          # the set is not complete
    finished = subprocess.run(argv + ["--resume"], capture_output=True, text=True, timeout=300)
    assert finished.returncode == 0, finished.stderr
    data = json.loads(finished.stdout)
    assert data["points_done"] == 12 and len(data["points"]) == 12
    assert verify_manifest(out) == []


def test_a_reader_that_closes_the_pipe_early_loses_no_file(tmp_path):
    scenario = small_copy(tmp_path)
    out = tmp_path / "out"
    process = subprocess.Popen([sys.executable, "-m", "thermo.cli.main", "sweep", str(scenario), "--vary",
                                f"{DUCT}=[4000,18000]", *SHRINK, "--workers", "1", "--out", str(out)],
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                               env={**os.environ, "MPLBACKEND": "Agg"})
    process.stdout.close()                                # like `| head` that has read enough
    err = process.stderr.read()
    assert process.wait(timeout=120) == 141, err          # 128 + SIGPIPE, quietly
    assert "Traceback" not in err and "error" not in err
    assert verify_manifest(out) == []
