"""Issue 13 beyond the bad-scenario table: run-time guards, special files, names that break writers,
warnings, and the same treatment for `settle` and `fit`.

Each case: exit 1 and exactly one stderr line ``brakeheat: error: ...`` without a traceback, or,
where the input is legal (a name with plot markup), exit 0 with every stderr line a one-line
``brakeheat: warning: ...``.
"""
from __future__ import annotations

import os
import subprocess
import sys
import threading
import time

import numpy as np
import pytest

from conftest import SHRINK, SMALL, cli, load_cases
from test_cli_errors import assert_one_line_error

CASES = load_cases()


def test_a_run_driven_out_of_the_physical_range_stops_naming_corner_node_and_time():
    # all of the friction heat into the pad: the pad would pass 2000 degC (it reached 22 165 degC
    # and was reported a success before the guard)
    code, out, err = cli(["run", SMALL, "--quiet", *SHRINK, "--set", "corners.front.pad.heat_partition=0"])
    assert_one_line_error(code, out, err, "corner front", "node 'pad", "degC at t =", "the run stopped")


def test_the_wall_clock_guard_stops_a_run(monkeypatch):
    import thermo.chain.guards as guards
    from thermo.errors import SolveError
    from thermo.chain import run_scenario
    from thermo.scenario import load_scenario
    ticks = iter(np.arange(0.0, 1e9, 1000.0))            # every reading of the clock 1000 s later
    monkeypatch.setattr(guards.time, "monotonic", lambda: float(next(ticks)))
    scenario = load_scenario(SMALL, [("solver.wall_clock_limit_s", 1800.0)])
    with pytest.raises(SolveError, match=r"corner (front|rear), .*wall_clock_limit_s = 1800 s"):
        run_scenario(scenario)


@pytest.mark.parametrize("what", ["scenario", "track", "trace"])
def test_device_and_fifo_inputs_are_refused_without_reading(tmp_path, what):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    text = SMALL.read_text(encoding="utf-8")
    scenario = tmp_path / "s.toml"
    if what == "scenario":
        argv_path = fifo
    else:
        key = "track" if what == "track" else "trace"
        text = text.replace('track = "short_circuit.toml"', f'{key} = "{fifo}"').replace(
            'lap_source = "track"', f'lap_source = "{key}"')
        scenario.write_text(text, encoding="utf-8")
        argv_path = scenario
    result = {}
    worker = threading.Thread(target=lambda: result.update(out=cli(["run", argv_path, "--quiet"])), daemon=True)
    worker.start()
    worker.join(timeout=30)
    if worker.is_alive():                       # unblock the reader before failing the test
        with open(fifo, "w"):
            pass
        pytest.fail("a FIFO input blocked the reader")
    assert_one_line_error(*result["out"], "pipe", "not a regular file")
    assert_one_line_error(*cli(["run", "/dev/zero", "--quiet"]), "/dev/zero", "not a regular file")


def test_a_trace_that_is_a_private_file_is_never_echoed(tmp_path):
    secret = "root:x:0:0:private-token-1234:/root:/bin/sh"
    (tmp_path / "short_circuit.toml").write_text((SMALL.parent / "short_circuit.toml").read_text(), encoding="utf-8")
    (tmp_path / "private.csv").write_text(secret + "\nsecond line\n", encoding="utf-8")
    code, out, err = cli(["run", SMALL, "--quiet", "--set", "plan.lap_source=trace",
                          "--set", f'plan.trace="{tmp_path / "private.csv"}"'])
    assert_one_line_error(code, out, err, "private.csv", "column '#1'")
    assert "private-token" not in err and "root:x" not in err


def test_names_with_plot_markup_and_missing_glyphs_write_every_file(tmp_path):
    # '$' would start matplotlib's math markup; the CJK glyphs are missing from the default font,
    # which matplotlib reports as a warning: the run succeeds and each warning is one line
    out_dir = tmp_path / "out"
    code, out, err = cli(["run", SMALL, "--quiet", *SHRINK, "--out", out_dir,
                          "--set", 'scenario.name="cost $\\\\frac{$ x \u4e2d\u6587"'])
    assert code == 0, err
    assert "Traceback" not in err
    assert all(line.startswith("brakeheat: warning: ") for line in err.splitlines()), err
    assert (out_dir / "results.h5").is_file() and len(list(out_dir.glob("*.png"))) >= 3
    import json
    assert json.loads((out_dir / "summary.json").read_text(encoding="utf-8"))["scenario"] == "cost $\\frac{$ x \u4e2d\u6587"


def test_variant_names_from_the_command_line_are_plain_text():
    code, out, err = cli(["compare", SMALL, "--quiet", *SHRINK, "--variant", "a\x1b[31m", "corners.front.pad_mu=0.5"])
    assert_one_line_error(code, out, err, "--variant", "\\x1b", "plain text")


CALIBRATION = """
[calibration]
corners = ["front"]

[calibration.channels.temp_disc_front]
corner = "front"
node = "disc"

[calibration.parameters.disc_convection]
key = "airflow.disc_convection_multiplier"
prior = 1.0
lower = 0.3
upper = 4.0
"""
MEASURED = CASES.trace_csv("temp_disc_front [degC]", lambda i: 300.0 + i, rows=40)


def fit_inputs(case, folder):
    """The case's scenario with a [calibration] table, and a small valid measured log beside it."""
    path = CASES.write_case(case, folder)
    path.write_text(path.read_text(encoding="utf-8") + CALIBRATION, encoding="utf-8")
    measured = folder / "measured.csv"
    measured.write_text(MEASURED, encoding="utf-8")
    return path, measured


SETTLE_AND_FIT_CASES = ("toml_nested_too_deep", "toml_integer_beyond_64_bits", "phase_type_not_text",
                        "caliper_area_astronomical", "crown_thicker_than_the_piston", "track_segment_of_1e308_m",
                        "name_with_escape_sequences", "trace_that_is_not_a_csv")


@pytest.mark.parametrize("case_id", SETTLE_AND_FIT_CASES)
@pytest.mark.parametrize("command", ["settle", "fit"])
def test_settle_and_fit_get_the_same_treatment(tmp_path, command, case_id):
    case = next(c for c in CASES.CASES if c.id == case_id)
    if command == "fit":
        path, measured = fit_inputs(case, tmp_path)
        extra = ["--measured", measured]
    else:
        path, extra = CASES.write_case(case, tmp_path), []
    code, out, err = cli([command, path, *extra, *CASES.override_args(case)])
    assert_one_line_error(code, out, err, str(tmp_path), *case.fragments)


@pytest.mark.parametrize("measured, fragment", [
    ("/dev/zero", "not a regular file"),
    ("private", "column '#1'"),
    ("hot", "plausible range"),
])
def test_fit_measured_file_problems(tmp_path, measured, fragment):
    scenario, _ = fit_inputs(CASES.Case("none", ()), tmp_path)
    if measured == "private":
        measured = tmp_path / "private.csv"
        measured.write_text("root:x:0:0:token:/root\n", encoding="utf-8")
    elif measured == "hot":
        measured = tmp_path / "hot.csv"
        measured.write_text(CASES.trace_csv("temp_disc_front [degC]", lambda i: 1e308 if i == 3 else 300.0),
                            encoding="utf-8")
    code, out, err = cli(["fit", scenario, "--measured", measured])
    assert_one_line_error(code, out, err, str(measured), fragment)


def test_settle_unknown_corner_with_control_characters():
    code, out, err = cli(["settle", SMALL, "--corner", "front\nrear"])
    assert_one_line_error(code, out, err, "front\\nrear")


def test_interrupt_while_the_libraries_load_prints_one_line():
    # Ctrl-C in the first second (numpy, scipy and matplotlib loading) reaches main()'s handler
    code = ("import signal, threading, os, sys;"
            "threading.Timer(0.05, lambda: os.kill(os.getpid(), signal.SIGINT)).start();"
            "from thermo.cli.main import main; sys.exit(main(['keys']))")
    started = time.monotonic()
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert time.monotonic() - started < 60
    if proc.returncode == 0:
        pytest.skip("the command finished before the signal landed")
    assert proc.returncode == 130, proc.stderr
    assert proc.stderr.strip().splitlines() == ["brakeheat: interrupted; nothing half-written was left"], proc.stderr
