"""Bad input through the command line: exit 1, one line on stderr starting 'brakeheat: error:', no traceback.

The contract is the project's own (README "Commands": exit codes 0/1/2/3, one line naming the
file and the key or row).
"""
from __future__ import annotations

import subprocess
import sys

import pytest

from conftest import SHRINK, SMALL, cli, load_cases

CASES = load_cases()


def assert_one_line_error(code, out, err, *fragments):
    assert code == 1, (code, err)
    assert out == ""
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("brakeheat: error: ")
    assert "Traceback" not in err
    for fragment in fragments:
        assert fragment in lines[0], f"{fragment!r} not in {lines[0]!r}"


@pytest.mark.parametrize("case", CASES.CASES, ids=[c.id for c in CASES.CASES])
def test_bad_scenario_exits_1_with_one_line(case, tmp_path):
    path = CASES.write_case(case, tmp_path)
    code, out, err = cli(["run", path, "--quiet", *CASES.override_args(case)])
    assert_one_line_error(code, out, err, str(tmp_path), *case.fragments)


@pytest.mark.parametrize("argv, fragments", [
    (["run", SMALL, "--set", "car.mass_kg"], ("--set 'car.mass_kg'", "expected KEY=VALUE")),
    (["run", SMALL, "--set", "car.mass_kg=[1,{]"], ("cannot read the value",)),
    (["run", SMALL, "--set", "corners.front.disc.layerz=2"], ("[corners.front.disc]", "did you mean 'layers'")),
    (["run", SMALL, "--solver", "BFD"], ("[solver] method", "did you mean 'BDF'")),
    (["run", "no_such_dir/none.toml"], ("none.toml: no such scenario file",)),
    (["demo", "--set", "car.mas_kg=1"], ("demo.toml", "did you mean 'mass_kg'")),
])
def test_bad_command_line_input(argv, fragments):
    assert_one_line_error(*cli(argv), *fragments)


def test_compare_unknown_variant_key_and_only(tmp_path):
    code, out, err = cli(["compare", SMALL, "--quiet", "--variant", "bad", "corners.front.pad_muu=0.5"])
    assert_one_line_error(code, out, err, "variant 'bad'", "unknown key 'pad_muu'", "did you mean 'pad_mu'")
    code, out, err = cli(["compare", SMALL, "--quiet", "--variant", "wider", "corners.front.pad_mu=0.55",
                          "--only", "wide"])
    assert_one_line_error(code, out, err, "--only wide: no such variant", "did you mean 'wider'")
    code, out, err = cli(["compare", SMALL, "--quiet", "--variant", "baseline", "corners.front.pad_mu=0.55"])
    assert_one_line_error(code, out, err, "may not be called 'baseline'")


def test_lap_on_malformed_csv(tmp_path):
    bad = tmp_path / "lap.csv"
    bad.write_text(CASES.BAD_TRACE_CSV, encoding="utf-8")
    assert_one_line_error(*cli(["lap", bad]), str(bad), "row", "'fast'")
    assert_one_line_error(*cli(["lap", tmp_path / "none.csv"]), "none.csv")


@pytest.mark.parametrize("argv", [[], ["frobnicate"], ["run"], ["run", SMALL, "--no-such-option"],
                                  ["compare", SMALL, "--variant"]])
def test_usage_errors_exit_2(argv):
    code, out, err = cli(argv)
    assert code == 2
    assert "usage: brakeheat" in err and "Traceback" not in err


def test_real_process_exit_code_and_stderr(tmp_path):
    # the console entry point, as a shell sees it: exit status 1 and exactly one stderr line
    done = subprocess.run([sys.executable, "-m", "thermo.cli.main", "run", str(SMALL), *SHRINK,
                           "--set", "car.mas_kg=1"], capture_output=True, text=True, timeout=120)
    assert done.returncode == 1
    assert done.stdout == ""
    assert done.stderr.count("\n") == 1 and done.stderr.startswith("brakeheat: error: ")
    assert "did you mean 'mass_kg'" in done.stderr
