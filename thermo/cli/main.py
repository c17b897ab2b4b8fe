"""`brakeheat` entry point: parse the command line, run a command, turn errors into one line.

Exit codes: 0 success (whatever the margins), 1 bad input or a failed solve (one line on stderr),
2 usage, 3 an exceeded limit when --fail-on-exceeded is given, 130 interrupted (Ctrl-C or SIGTERM),
141 the reader of stdout closed the pipe early (files under --out are written first).

Every line this module prints on stderr is one line of printable text (``lapdata.echo.printable``),
whatever an input file holds. Python warnings raised during a command (a font without a glyph, a
numerical warning) are collected and printed after it, one line each, as ``brakeheat: warning: ...``.
"""
from __future__ import annotations

import signal
import sys

from thermo.cli import interrupts
from thermo.cli.exit_codes import EXIT_EXCEEDED, EXIT_INPUT, EXIT_OK, EXIT_USAGE  # noqa: F401 (re-exported)

# Nothing heavy is imported above this line: Ctrl-C while numpy and scipy load (the first
# second) must reach main()'s handler, not print a traceback.

EXIT_INTERRUPTED = 130
EXIT_BROKEN_PIPE = 141        # 128 + SIGPIPE, as a shell reports a pipeline whose reader closed early
INTERRUPTED = "brakeheat: interrupted; nothing half-written was left"


def build_parser():
    import argparse

    from thermo.cli import compare_cmd, fit_cmd, keys_cmd, lap_cmd, report_cmd, run_cmd, settle_cmd, study_cmd
    parser = argparse.ArgumentParser(
        prog="brakeheat",
        description="Transient heat in race-car brake corners: fluid boiling margin, bearing heat soak, options compared.")
    parser.add_argument("--version", action="version", version=_version())
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    sub.required = True
    run_cmd.add_run_parsers(sub)
    lap_cmd.add_parser(sub)
    compare_cmd.add_parser(sub)
    fit_cmd.add_parser(sub)
    settle_cmd.add_parser(sub)
    study_cmd.add_parsers(sub)
    keys_cmd.add_parser(sub)
    report_cmd.add_parser(sub)
    return parser


def _version() -> str:
    import thermo
    return f"brakeheat {thermo.__version__}"


def _say(kind: str, message) -> None:
    from lapdata.echo import printable
    print(f"brakeheat: {kind}: {printable(message)}", file=sys.stderr)


def command(argv=None) -> int:
    """The `brakeheat` console script: ``main`` in a process of its own, which keeps the memory it
    frees for its next arrays (``thermo.cli.freed_memory``; ``main`` alone leaves an embedding
    program's allocator as it is)."""
    from thermo.cli.freed_memory import keep_freed_memory
    keep_freed_memory()
    return main(argv)


def main(argv=None) -> int:
    interrupts.reset()
    previous = {}
    try:
        for signum in (signal.SIGINT, signal.SIGTERM):
            previous[signum] = signal.signal(signum, interrupts.on_signal)
    except ValueError:                       # not the main thread (an embedding program): leave it
        pass
    previous_hook, sys.unraisablehook = sys.unraisablehook, interrupts.unraisable_hook(sys.unraisablehook)
    try:
        return _main(argv)
    except KeyboardInterrupt:
        print(INTERRUPTED, file=sys.stderr)
        return EXIT_INTERRUPTED
    except BaseException:
        if not interrupts.interrupted():
            raise
        print(INTERRUPTED, file=sys.stderr)
        return EXIT_INTERRUPTED
    finally:
        if interrupts.interrupted():
            interrupts.drain_pending()
        sys.unraisablehook = previous_hook
        for signum, handler in previous.items():     # a caller embedding main() gets its handlers back
            if handler is not None:
                signal.signal(signum, handler)


def _main(argv) -> int:
    import warnings

    from thermo.errors import BrakeheatError, LapDataError
    parser = build_parser()
    args = parser.parse_args(argv)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            code = args.handler(args)
            interrupts.raise_swallowed()
        except BrokenPipeError:              # the reader went away (`| head`): nothing more to say to it
            _quiet_stdout()
            return EXIT_BROKEN_PIPE
        except (BrakeheatError, LapDataError, OSError, MemoryError, RecursionError) as error:
            if interrupts.interrupted():     # a library turned the interrupt into an error
                raise KeyboardInterrupt from None
            _say("error", _one_line(error))
            return EXIT_INPUT
    seen = set()
    for w in caught:
        text = f"{w.category.__name__}: {w.message}"
        if text not in seen:
            seen.add(text)
            _say("warning", text)
    return code


def _quiet_stdout() -> None:
    """Point stdout at /dev/null, so that flushing it at exit does not fail a second time."""
    import os
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError, AttributeError):
        pass


def _one_line(error: BaseException) -> str:
    if isinstance(error, OSError):
        return f"{error.filename or ''}: {error.strerror or error}"
    if isinstance(error, (MemoryError, RecursionError)):
        return (f"the input needs more {'memory' if isinstance(error, MemoryError) else 'nesting'} than this "
                "command allows; check the sizes and counts it asks for")
    return str(error)


if __name__ == "__main__":
    # run the package's copy of this module, not this __main__ one, so that the interrupt state
    # (set by the signal handler, read by the progress line's safe points) lives in one place
    from thermo.cli.main import command as package_command
    sys.exit(package_command())
