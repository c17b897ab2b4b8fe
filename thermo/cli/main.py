"""`brakeheat` entry point: parse the command line, run a command, turn errors into one line.

Exit codes: 0 success (whatever the margins), 1 bad input or a failed solve (one line on stderr),
2 usage, 3 an exceeded limit when --fail-on-exceeded is given, 130 interrupted (Ctrl-C or SIGTERM).

Every line this module prints on stderr is one line of printable text (``lapdata.echo.printable``),
whatever an input file holds. Python warnings raised during a command (a font without a glyph, a
numerical warning) are collected and printed after it, one line each, as ``brakeheat: warning: ...``.
"""
from __future__ import annotations

import signal
import sys

from thermo.cli.exit_codes import EXIT_EXCEEDED, EXIT_INPUT, EXIT_OK, EXIT_USAGE  # noqa: F401 (re-exported)

# Nothing heavy is imported above this line: Ctrl-C while numpy and scipy load (the first
# second) must reach main()'s handler, not print a traceback.

EXIT_INTERRUPTED = 130
INTERRUPTED = "brakeheat: interrupted; nothing half-written was left"


def _terminate(signum, frame):
    """SIGTERM is handled as Ctrl-C: the same unwinding removes every temporary file."""
    raise KeyboardInterrupt


def build_parser():
    import argparse

    from thermo.cli import compare_cmd, fit_cmd, keys_cmd, lap_cmd, run_cmd, settle_cmd
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
    keys_cmd.add_parser(sub)
    return parser


def _version() -> str:
    import thermo
    return f"brakeheat {thermo.__version__}"


def _say(kind: str, message) -> None:
    from lapdata.echo import printable
    print(f"brakeheat: {kind}: {printable(message)}", file=sys.stderr)


def main(argv=None) -> int:
    try:
        signal.signal(signal.SIGTERM, _terminate)
    except ValueError:                       # not the main thread (an embedding program): leave it
        pass
    try:
        return _main(argv)
    except KeyboardInterrupt:
        print(INTERRUPTED, file=sys.stderr)
        return EXIT_INTERRUPTED


def _main(argv) -> int:
    import warnings

    from thermo.errors import BrakeheatError, LapDataError
    parser = build_parser()
    args = parser.parse_args(argv)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            code = args.handler(args)
        except (BrakeheatError, LapDataError) as error:
            _say("error", error)
            return EXIT_INPUT
        except OSError as error:
            _say("error", f"{error.filename or ''}: {error.strerror or error}")
            return EXIT_INPUT
        except (MemoryError, RecursionError) as error:
            _say("error", f"the input needs more {'memory' if isinstance(error, MemoryError) else 'nesting'} "
                          "than this command allows; check the sizes and counts it asks for")
            return EXIT_INPUT
    seen = set()
    for w in caught:
        text = f"{w.category.__name__}: {w.message}"
        if text not in seen:
            seen.add(text)
            _say("warning", text)
    return code


if __name__ == "__main__":
    sys.exit(main())
