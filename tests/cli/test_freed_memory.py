"""The console script keeps the memory it frees for its next arrays (``thermo.cli.freed_memory``).

Checked by what the operating system counts: minor page faults (``getrusage``'s ``ru_minflt``, POSIX)
while a fresh interpreter makes and drops 8 MiB of small arrays fifty times, as a run's laps do. By
default glibc trims the freed top of its heap above 128 KiB (its trim threshold, GNU C Library
manual, "Malloc Tunable Parameters"), so every round faults its 2048 pages of 4 KiB in again."""
from __future__ import annotations

import os
import platform
import subprocess
import sys

import pytest

from thermo.cli import main as cli_main
from thermo.cli.freed_memory import keep_freed_memory

CHILD = """
import resource, sys
import numpy as np
from thermo.cli.freed_memory import keep_freed_memory
changed = keep_freed_memory() if sys.argv[1] == "keep" else False
before = resource.getrusage(resource.RUSAGE_SELF).ru_minflt
for _ in range(50):
    arrays = [np.ones(12_800) for _ in range(80)]     # 80 arrays of 100 KiB: 8 MiB on the heap, every page written
    del arrays
print(changed, resource.getrusage(resource.RUSAGE_SELF).ru_minflt - before)
"""


def _faults(mode: str) -> tuple[str, int]:
    done = subprocess.run([sys.executable, "-c", CHILD, mode], capture_output=True, text=True, check=True)
    changed, faults = done.stdout.split()
    return changed, int(faults)


@pytest.mark.skipif(platform.libc_ver()[0] != "glibc", reason="glibc's allocator only")
def test_freed_arrays_are_reused_without_faulting_their_pages_again():
    assert _faults("default")[1] > 50 * 2048 * 0.9            # 2048 pages of 4 KiB a round, fifty rounds
    changed, faults = _faults("keep")
    assert changed == "True"
    assert faults < 2 * 2048                                   # the first round's pages, and little more


def test_the_console_script_keeps_freed_memory_and_main_alone_does_not(monkeypatch):
    called = []
    monkeypatch.setattr("thermo.cli.freed_memory.keep_freed_memory", lambda: called.append(True) or True)
    with pytest.raises(SystemExit):                 # argparse's --version: main itself leaves the allocator
        cli_main.main(["--version"])
    assert called == []
    with pytest.raises(SystemExit) as stop:
        cli_main.command(["--version"])
    assert stop.value.code == 0 and called == [True]


def test_without_glibc_nothing_changes(monkeypatch):
    monkeypatch.setattr(os, "confstr", lambda name: None)          # musl, for one, has no such string
    assert keep_freed_memory() is False
    monkeypatch.setattr(sys, "platform", "darwin")
    assert keep_freed_memory() is False
