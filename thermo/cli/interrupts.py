"""Ctrl-C and SIGTERM while a command runs: the handler, and interrupts a callback swallowed.

Nothing heavy is imported here: an interrupt while numpy and scipy load (the first second) must
reach the handler ``main()`` installs, not print a traceback.
"""
from __future__ import annotations

_state = {"interrupted": False, "swallowed": False}


def reset() -> None:
    """A new command: no interrupt seen yet."""
    _state["interrupted"] = _state["swallowed"] = False


def interrupted() -> bool:
    """Whether an interrupt arrived during this command."""
    return _state["interrupted"]


def on_signal(signum, frame):
    """Ctrl-C and SIGTERM: note it and unwind as KeyboardInterrupt (which removes every temporary
    file). The note matters when a library turns the KeyboardInterrupt into another error: numpy,
    interrupted while it is imported, raises ImportError with no KeyboardInterrupt left in the
    chain; the command is still reported as interrupted, not as a failure."""
    _state["interrupted"] = True
    raise KeyboardInterrupt


def unraisable_hook(previous):
    """A ``sys.unraisablehook`` for the command. An interrupt raised inside a callback from C (a
    ctypes callback of the compiler while numba loads or compiles a kernel) is swallowed there and
    reported as "unraisable", and the run would go on with a traceback on stderr: it is noted
    instead, and ``raise_swallowed`` raises it again at the next safe point. Anything else goes to
    ``previous``."""
    def hook(unraisable) -> None:
        if _state["interrupted"] and isinstance(unraisable.exc_value, KeyboardInterrupt):
            _state["swallowed"] = True
            return
        previous(unraisable)
    return hook


def raise_swallowed() -> None:
    """At a safe point (between segments, at the end of a command): raise the interrupt that a
    callback from C swallowed, so that the command stops and reports it."""
    if _state["swallowed"]:
        _state["swallowed"] = False
        raise KeyboardInterrupt


def drain_pending() -> None:
    """Run, under brakeheat's own handler, any interrupt still pending (a second Ctrl-C), so that
    none reaches the caller's handler after the command has already reported the interrupt: a
    KeyboardInterrupt escaping there would end the process by SIGINT instead of with code 130."""
    import time
    for _ in range(3):
        try:
            time.sleep(0)                    # a call that runs pending signal handlers
        except KeyboardInterrupt:
            pass
