"""Ctrl-C and SIGTERM at any moment of `brakeheat run --out DIR`, where DIR holds an earlier complete set.

The promise is the project's own (README "Commands" and "What a run produces"): an interrupted run
exits 130 with one line on stderr, leaves no temporary file, and leaves either the earlier set
intact (its manifest.json verifying) or no manifest.json at all (a mixed set, marked incomplete).

Each case is its own process, all started together so that the file takes seconds, not minutes.
A signal is sent only once the process's main() has installed its SIGTERM handler (read from
/proc/PID/status): before that moment the interpreter is still starting, the kernel's default
action ends it, and it has written nothing (no program can handle a signal before it runs).
"""
from __future__ import annotations

import os
import shutil
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from conftest import ROOT, SHRINK, SMALL
from thermo.output.manifest import MANIFEST_NAME, verify_manifest

pytestmark = pytest.mark.skipif(not Path("/proc/self/status").is_file(), reason="reads /proc/PID/status (Linux)")

INTERRUPTED = "brakeheat: interrupted; nothing half-written was left"
WRITE_STARTS = "write starts"          # the earlier manifest.json has just been removed
MID_WRITE = "mid-write"                # results.h5 and summary.json replaced, a plot being written
MID_STREAM = "mid-stream"              # --store full: results.h5 being filled while the run goes
CASES = [(signal.SIGTERM, 0.05), (signal.SIGINT, 0.05), (signal.SIGTERM, 0.5), (signal.SIGINT, 0.5),
         (signal.SIGTERM, 1.0), (signal.SIGINT, 1.0), (signal.SIGTERM, WRITE_STARTS), (signal.SIGINT, WRITE_STARTS),
         (signal.SIGTERM, MID_WRITE), (signal.SIGINT, MID_WRITE), (signal.SIGTERM, MID_STREAM), (signal.SIGINT, MID_STREAM)]
IDS = [f"{sig.name}-{when}" for sig, when in CASES]
TIMEOUT_S = 50.0
# the installed command, as users run it; `python -m thermo.cli.main` where it is not installed
# (under -m, CPython ends a process that ever saw a KeyboardInterrupt pass through certain C-level
# imports by its own SIGINT after printing the same line: the shell shows 130, Popen -2)
_SCRIPT = Path(sys.executable).with_name("brakeheat")
BRAKEHEAT = [str(_SCRIPT)] if _SCRIPT.is_file() else [sys.executable, "-m", "thermo.cli.main"]


def _default_sigint() -> None:
    """In the child before it starts: Ctrl-C not ignored (a shell's background job inherits it ignored,
    and Python then never turns it into KeyboardInterrupt)."""
    signal.signal(signal.SIGINT, signal.SIG_DFL)


def handles_sigterm(pid: int) -> bool:
    """True once the process has a handler for SIGTERM (bit 15 of the SigCgt mask, proc(5))."""
    try:
        status = Path(f"/proc/{pid}/status").read_text()
    except OSError:
        return False
    for line in status.splitlines():
        if line.startswith("SigCgt:"):
            return bool(int(line.split()[1], 16) >> (signal.SIGTERM - 1) & 1)
    return False


def moment_reached(when, started: float, folder: Path) -> bool:
    if when == WRITE_STARTS:
        return not (folder / MANIFEST_NAME).exists()
    if when == MID_WRITE:
        return any(n.startswith(".") and ".png." in n and n.endswith(".tmp") for n in os.listdir(folder))
    if when == MID_STREAM:
        return any(n.startswith(".results.h5.") and n.endswith(".tmp") for n in os.listdir(folder))
    return time.monotonic() - started >= when


@pytest.fixture(scope="module")
def earlier_set(small_runs, tmp_path_factory):
    """A complete output set of the shrunk small scenario (the shared run's folder, copied)."""
    folder = tmp_path_factory.mktemp("earlier") / "set"
    shutil.copytree(small_runs["folder"], folder)
    assert verify_manifest(folder) == []
    return folder


@pytest.fixture(scope="module")
def interrupted(earlier_set, tmp_path_factory):
    """Per case: exit code, stderr, the folder, and whether the signal was sent before the run ended."""
    base = tmp_path_factory.mktemp("interrupted")
    env = {**os.environ, "MPLBACKEND": "Agg"}
    runs = []
    for k, (sig, when) in enumerate(CASES):
        folder = base / f"case_{k}"
        shutil.copytree(earlier_set, folder)
        store = ["--store", "full"] if when == MID_STREAM else []
        argv = [*BRAKEHEAT, "run", str(SMALL), *SHRINK, "--quiet", "--out", str(folder), *store]
        process = subprocess.Popen(argv, cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                                   text=True, start_new_session=True, preexec_fn=_default_sigint)
        runs.append({"sig": sig, "when": when, "folder": folder, "process": process,
                     "started": time.monotonic(), "sent": False})
    deadline = time.monotonic() + TIMEOUT_S
    while time.monotonic() < deadline and any(not r["sent"] and r["process"].poll() is None for r in runs):
        for r in runs:
            p = r["process"]
            if not r["sent"] and p.poll() is None and handles_sigterm(p.pid) \
                    and moment_reached(r["when"], r["started"], r["folder"]):
                p.send_signal(r["sig"])
                r["sent"] = True
        time.sleep(0.001)
    for r in runs:
        try:
            _, r["stderr"] = r["process"].communicate(timeout=max(1.0, deadline - time.monotonic()))
        except subprocess.TimeoutExpired:
            r["process"].kill()
            _, r["stderr"] = r["process"].communicate()
            r["stderr"] = "timed out\n" + r["stderr"]
        r["code"] = r["process"].returncode
    return dict(zip(IDS, runs))


@pytest.mark.parametrize("case", IDS)
def test_interrupt_leaves_a_whole_set_or_a_marked_one(interrupted, earlier_set, case):
    r = interrupted[case]
    folder, code, stderr = r["folder"], r["code"], r["stderr"]
    assert code in (130, 0), (code, stderr)
    assert "Traceback" not in stderr, stderr
    if code == 130:
        assert stderr.splitlines() == [INTERRUPTED], stderr
    else:
        assert all(line.startswith("brakeheat: ") for line in stderr.splitlines()), stderr
    assert not list(folder.rglob(".*.tmp")), sorted(p.name for p in folder.rglob("*"))
    if (folder / MANIFEST_NAME).exists():
        assert verify_manifest(folder) == []          # the earlier set intact, or the new one complete
    else:
        assert code == 130                            # only an interrupted write leaves no manifest
    if r["when"] == MID_STREAM and code == 130:       # stopped while results.h5 was streamed: the earlier set whole
        assert (folder / "results.h5").read_bytes() == (earlier_set / "results.h5").read_bytes()
        assert verify_manifest(folder) == []


def test_a_signal_in_the_write_phase_leaves_the_set_marked_incomplete(interrupted):
    """At least one case hit the write phase itself: the folder mixes old and new files, without manifest."""
    hits = [r for r in interrupted.values() if r["when"] in (WRITE_STARTS, MID_WRITE) and r["sent"] and r["code"] == 130]
    assert hits, {k: (r["sent"], r["code"]) for k, r in interrupted.items()}
    for r in hits:
        assert not (r["folder"] / MANIFEST_NAME).exists()


def test_a_signal_while_results_h5_is_streamed_stops_the_run(interrupted):
    """--store full: at least one case was stopped while its results.h5 was streamed (the run
    itself, not held until the end), and kept the earlier set whole (checked case by case above)."""
    hits = [r for r in interrupted.values() if r["when"] == MID_STREAM and r["sent"] and r["code"] == 130]
    assert hits, {k: (r["sent"], r["code"]) for k, r in interrupted.items()}



def test_an_interrupt_swallowed_by_a_callback_from_c_still_stops_the_command(monkeypatch, capsys):
    """While numba loads or compiles a kernel, the compiler calls back into Python through ctypes;
    a Ctrl-C raised inside such a callback is swallowed there (printed as "Exception ignored") and
    the run went on. It must still end the command as an interrupt: exit 130, one line."""
    import ctypes
    import thermo.cli.main as cli_main
    import thermo.cli.run_cmd as run_cmd

    def command(args):
        callback = ctypes.CFUNCTYPE(None)(lambda: signal.raise_signal(signal.SIGTERM))
        callback()                         # the handler's KeyboardInterrupt dies in the callback
        return 0                           # ... and the command would report success

    monkeypatch.setattr(run_cmd, "run_command", command)
    code = cli_main.main(["run", str(SMALL), "--quiet"])
    captured = capsys.readouterr()
    assert code == 130
    assert captured.err.strip().splitlines() == [INTERRUPTED]
