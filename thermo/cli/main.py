"""`brakeheat` entry point: parse the command line, run a command, turn errors into one line.

Exit codes: 0 success (whatever the margins), 1 bad input or a failed solve (one line on stderr),
2 usage, 3 an exceeded limit when --fail-on-exceeded is given.
"""
from __future__ import annotations

import argparse
import sys

from thermo.cli.exit_codes import EXIT_EXCEEDED, EXIT_INPUT, EXIT_OK, EXIT_USAGE  # noqa: F401 (re-exported)
from thermo.errors import BrakeheatError, LapDataError


def build_parser() -> argparse.ArgumentParser:
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


def main(argv=None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        return args.handler(args)
    except (BrakeheatError, LapDataError) as error:
        print(f"brakeheat: error: {error}", file=sys.stderr)
        return EXIT_INPUT
    except OSError as error:
        print(f"brakeheat: error: {error.filename or ''}: {error.strerror or error}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("brakeheat: interrupted; nothing half-written was left", file=sys.stderr)
        return 130


if __name__ == "__main__":
    sys.exit(main())
