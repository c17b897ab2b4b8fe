"""A bad --out is refused before any solve: exit 1, one line naming the path and what is expected.

The contract is the project's own (README "Commands": exit 1 with one line naming what is wrong);
the check tries the folder (makes a file in it) instead of reading permission bits, since root
ignores those.
"""
from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from conftest import SHRINK, SMALL, cli

COMMANDS = {
    "run": lambda out: ["run", SMALL, "--out", out],
    "demo": lambda out: ["demo", "--out", out],
    "demo --compare": lambda out: ["demo", "--compare", "--out", out],
    "compare": lambda out: ["compare", SMALL, "--out", out],
    "fit": lambda out: ["fit", SMALL, "--measured", "log.csv", "--out", out],
}
LINUX_PROC = Path("/proc/self").is_dir()


@pytest.fixture
def no_solve(monkeypatch):
    """Every way into a scenario or a solve fails the test if called."""
    import thermo.chain
    import thermo.cli.compare_cmd
    import thermo.fit
    import thermo.scenario

    def started(*args, **kwargs):
        raise AssertionError("a scenario was read or solved before --out was checked")

    for module, name in ((thermo.scenario, "load_scenario"), (thermo.chain, "run_scenario"),
                         (thermo.cli.compare_cmd, "plan_comparison"), (thermo.cli.compare_cmd, "run_comparison"),
                         (thermo.fit, "fit_scenario")):
        monkeypatch.setattr(module, name, started)


def _bad_folders(tmp_path):
    """(case id, --out value, fragment the message must hold) for each kind of bad folder."""
    a_file = tmp_path / "a_file.txt"
    a_file.write_text("not a folder")
    cases = [("empty", "", "--out: empty folder name"),
             ("existing file", str(a_file), f"--out {a_file}: is a file, not a folder"),
             ("folder under a file", str(a_file / "sub" / "out"), f"{a_file} is a file, so no folder can be made under it")]
    if LINUX_PROC:
        # /proc takes no new files or folders, for root too (proc(5))
        cases += [("cannot be made", "/proc/brakeheat_no_such/out", "--out /proc/brakeheat_no_such/out: the folder cannot be made"),
                  ("read-only folder", "/proc", "--out /proc: no file can be written in it")]
    return cases


CASE_IDS = ["empty", "existing file", "folder under a file", "cannot be made", "read-only folder"]


@pytest.mark.parametrize("command", list(COMMANDS))
@pytest.mark.parametrize("case_id", CASE_IDS)
def test_bad_out_exits_1_before_any_solve(command, case_id, tmp_path, no_solve):
    cases = {c[0]: c for c in _bad_folders(tmp_path)}
    if case_id not in cases:
        pytest.skip("needs Linux /proc")
    _, out, fragment = cases[case_id]
    before = sorted(p.name for p in tmp_path.iterdir())
    code, stdout, stderr = cli(COMMANDS[command](out))
    assert code == 1, stderr
    assert stdout == ""
    lines = stderr.splitlines()
    assert len(lines) == 1 and lines[0].startswith("brakeheat: error: ") and "Traceback" not in stderr, stderr
    assert fragment in lines[0] and "expected a folder" in lines[0], lines[0]
    assert sorted(p.name for p in tmp_path.iterdir()) == before      # the check left nothing behind


def test_read_only_folder_by_permission_bits(tmp_path, no_solve):
    if os.geteuid() == 0:
        pytest.skip("root writes into a folder whatever its permission bits (the /proc case covers this)")
    folder = tmp_path / "locked"
    folder.mkdir()
    folder.chmod(0o555)
    try:
        code, _, stderr = cli(["run", SMALL, "--out", folder])
    finally:
        folder.chmod(0o755)
    assert code == 1 and f"--out {folder}: no file can be written in it" in stderr
    assert list(folder.iterdir()) == []


def test_a_good_folder_to_be_made_is_not_made_by_the_check(tmp_path):
    """A folder the check had to make to try it is removed again: a failing command leaves nothing."""
    out = tmp_path / "new" / "deeper"
    code, _, stderr = cli(["run", tmp_path / "missing.toml", "--out", out])
    assert code == 1 and "missing.toml" in stderr and "--out" not in stderr
    assert list(tmp_path.iterdir()) == []


def test_the_installed_command_refuses_a_file_as_out(tmp_path):
    """The real entry point, in its own process (that no solve starts is shown in-process above)."""
    a_file = tmp_path / "results.h5"
    a_file.write_bytes(b"an earlier file")
    done = subprocess.run([sys.executable, "-m", "thermo.cli.main", "run", str(SMALL), *SHRINK, "--out", str(a_file)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 1 and done.stdout == ""
    assert done.stderr.count("\n") == 1 and done.stderr.startswith(f"brakeheat: error: --out {a_file}: is a file")
    assert a_file.read_bytes() == b"an earlier file"
