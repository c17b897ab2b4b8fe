"""An interrupt landing on any step of an atomic write leaves no temporary file and the old file intact.

A KeyboardInterrupt (Ctrl-C, or SIGTERM as brakeheat handles it) is raised between two Python
bytecodes; here it is raised by the very calls the writer makes, on their way back, which is the
worst moment: the operating system has done the work, the writer has not yet seen the result.
"""
import os
import signal

import pytest

from thermo.output import atomic
from thermo.output.atomic import atomic_path, atomic_path_unheld, atomic_write


def _interrupt_after(monkeypatch, module, name, when=1):
    """Make ``module.name`` do its work, then raise KeyboardInterrupt, on its ``when``-th call."""
    real = getattr(module, name)
    calls = []

    def wrapped(*args, **kwargs):
        result = real(*args, **kwargs)
        calls.append(args)
        if len(calls) == when:
            raise KeyboardInterrupt
        return result

    monkeypatch.setattr(module, name, wrapped)
    return calls


def _write_new(path):
    with atomic_write(path) as handle:
        handle.write("new")


def _assert_clean(folder, old_text):
    assert sorted(os.listdir(folder)) == ["a.txt"]           # no hidden .a.txt.*.tmp left
    assert (folder / "a.txt").read_text() in (old_text, "new")
    assert not atomic._UNFINISHED


@pytest.mark.parametrize("step, when", [
    ("open", 1),        # the temporary file exists, its descriptor not yet back (mkstemp's window)
    ("close", 1),       # closing the new, empty temporary file
    ("fsync", 1),       # the writer's own fsync of its handle
    ("fsync", 2),       # the fsync before the rename
    ("chmod", 1),
])
def test_interrupt_on_a_step_leaves_the_old_file(tmp_path, monkeypatch, step, when):
    path = tmp_path / "a.txt"
    path.write_text("old")
    _interrupt_after(monkeypatch, os, step, when)
    with pytest.raises(KeyboardInterrupt):
        _write_new(path)
    monkeypatch.undo()
    _assert_clean(tmp_path, "old")
    assert path.read_text() == "old"


def test_interrupt_just_after_the_rename_leaves_the_new_file(tmp_path, monkeypatch):
    path = tmp_path / "a.txt"
    path.write_text("old")
    _interrupt_after(monkeypatch, os, "replace")
    with pytest.raises(KeyboardInterrupt):
        _write_new(path)
    monkeypatch.undo()
    _assert_clean(tmp_path, "old")
    assert path.read_text() == "new"                            # the rename is the moment of truth


def test_interrupt_while_the_writer_writes(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("old")
    with pytest.raises(KeyboardInterrupt):
        with atomic_path(path) as tmp:
            tmp.write_text("half")
            raise KeyboardInterrupt
    _assert_clean(tmp_path, "old")
    assert path.read_text() == "old"


def test_interrupt_during_the_clean_up_is_finished_at_exit(tmp_path, monkeypatch):
    """A second Ctrl-C while the first is being cleaned up: the name is kept and removed at exit."""
    path = tmp_path / "a.txt"
    path.write_text("old")
    real_unlink = type(path).unlink
    state = {"interrupted": False}

    def unlink_once_interrupted(self, *args, **kwargs):
        if not state["interrupted"]:
            state["interrupted"] = True
            raise KeyboardInterrupt
        return real_unlink(self, *args, **kwargs)

    monkeypatch.setattr(type(path), "unlink", unlink_once_interrupted)
    with pytest.raises(KeyboardInterrupt):
        with atomic_path(path):
            raise KeyboardInterrupt
    leftover = [n for n in os.listdir(tmp_path) if n.endswith(".tmp")]
    assert len(leftover) == 1 and len(atomic._UNFINISHED) == 1
    atomic._remove_unfinished()                                   # what atexit runs
    monkeypatch.undo()
    _assert_clean(tmp_path, "old")


def test_temporary_names_are_hidden_and_beside_the_target(tmp_path):
    name = atomic.temporary_name(tmp_path / "results.h5")
    assert name.parent == tmp_path and name.name.startswith(".results.h5.") and name.name.endswith(".tmp")
    assert name != atomic.temporary_name(tmp_path / "results.h5")


def _write_held(path, signum, went_on):
    with atomic_write(path) as handle:
        signal.raise_signal(signum)               # delivered now, and held
        handle.write("new")
        went_on.append(True)


def _fill_unheld(path, signum, went_on):
    with atomic_path_unheld(path) as tmp:
        tmp.write_text("half")
        signal.raise_signal(signum)               # raised here, not held
        went_on.append(True)


@pytest.mark.parametrize("signum", [signal.SIGINT, signal.SIGTERM])
@pytest.mark.parametrize("write, held", [(_write_held, True), (_fill_unheld, False)], ids=["held", "unheld"])
def test_a_signal_while_the_writer_writes(tmp_path, signum, write, held):
    """``atomic_write``: a library never sees the KeyboardInterrupt (one raised in its callbacks can
    be swallowed): the writer finishes, then the file is abandoned and the interrupt raised.
    ``atomic_path_unheld`` (the results file streamed while a run goes): the signal stops the
    filling at once, not when the run ends. Either way the old file stays and nothing is left."""
    path = tmp_path / "a.txt"
    path.write_text("old")
    went_on = []
    previous = signal.signal(signal.SIGTERM, signal.default_int_handler)   # as brakeheat's main() does
    try:
        with pytest.raises(KeyboardInterrupt):
            write(path, signum, went_on)
        assert signal.getsignal(signal.SIGTERM) is signal.default_int_handler      # handlers put back
        assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
    finally:
        signal.signal(signal.SIGTERM, previous)
    assert went_on == ([True] if held else [])
    _assert_clean(tmp_path, "old")
    assert path.read_text() == "old"


def test_a_signal_between_two_files_stops_before_the_next(tmp_path):
    from thermo.output.atomic import interrupts_held
    with pytest.raises(KeyboardInterrupt):
        with interrupts_held():
            _write_new(tmp_path / "first.txt")
            signal.raise_signal(signal.SIGINT)    # e.g. while the next figure is drawn
            _write_new(tmp_path / "second.txt")
    assert sorted(os.listdir(tmp_path)) == ["first.txt"]
    assert not atomic._UNFINISHED


def test_a_second_ctrl_c_while_held_stops_at_once(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("old")
    reached = []
    with pytest.raises(KeyboardInterrupt):
        with atomic_write(path) as handle:
            signal.raise_signal(signal.SIGINT)    # held
            reached.append("after the first")
            signal.raise_signal(signal.SIGINT)    # asked again: raised here, inside the writer
            reached.append("after the second")
            handle.write("new")
    assert reached == ["after the first"]
    _assert_clean(tmp_path, "old")
    assert path.read_text() == "old"


def test_a_file_filled_over_a_long_time_is_renamed_into_place(tmp_path):
    path = tmp_path / "a.txt"
    path.write_text("old")
    with atomic_path_unheld(path) as tmp:
        tmp.write_text("new")
    _assert_clean(tmp_path, "new")
    assert path.read_text() == "new"
