"""Reading the user's input files: regular files only, a size limit, TOML parsed within its limits.

``/dev/zero`` or a FIFO given as a scenario, a track or a trace would otherwise be read without
end or block for ever; a TOML file nested hundreds deep or holding a 5000-digit integer would
otherwise raise RecursionError or ValueError from the parser. Each problem becomes the caller's
own one-line error naming the file.
"""
from __future__ import annotations

import os
import stat
import tomllib

from lapdata.echo import shown
from lapdata.errors import LapDataError

MAX_TOML_BYTES = 4 * 2 ** 20          # scenario and track files: a few kB in practice
MAX_CSV_BYTES = 512 * 2 ** 20         # a logged stint at 1 kHz with 20 channels is ~300 MB
MAX_TOML_DEPTH = 16                   # tables and arrays nested inside each other
INT64 = 2 ** 63                       # TOML 1.0: integers are 64-bit signed


def read_regular_file(path, what: str, max_bytes: int, error=LapDataError) -> bytes:
    """The bytes of ``path`` if it is a regular file of at most ``max_bytes``; else ``error``.

    Parameters
    ----------
    path : str or Path
        The file [-]
    what : str
        What the file is, for the message ("scenario file", "lap trace") [-]
    max_bytes : int
        Largest accepted size [B]
    error : type
        Exception class raised, with a one-line message naming the file [-]
    """
    source = str(path)
    try:
        info = os.stat(path)
    except FileNotFoundError:
        raise error(f"{source}: no such {what} (file not found)") from None
    except OSError as exc:
        raise error(f"{source}: cannot read the {what} ({exc.strerror or type(exc).__name__})") from None
    if stat.S_ISDIR(info.st_mode):
        raise error(f"{source}: is a folder; expected a {what}")
    if not stat.S_ISREG(info.st_mode):
        raise error(f"{source}: not a regular file (a device, pipe or socket); expected a {what}")
    if info.st_size > max_bytes:
        raise error(f"{source}: {info.st_size / 2 ** 20:.1f} MiB is larger than the {max_bytes / 2 ** 20:g} MiB "
                    f"accepted for a {what}")
    try:
        with open(path, "rb") as handle:
            data = handle.read(max_bytes + 1)
    except OSError as exc:
        raise error(f"{source}: cannot read the {what} ({exc.strerror or type(exc).__name__})") from None
    if len(data) > max_bytes:
        raise error(f"{source}: larger than the {max_bytes / 2 ** 20:g} MiB accepted for a {what}")
    return data


def read_toml_file(path, what: str, error=LapDataError) -> tuple[dict, str]:
    """(parsed document, text) of a TOML input file, within ``parse_toml``'s limits."""
    data = read_regular_file(path, what, MAX_TOML_BYTES, error)
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise error(f"{path}: not UTF-8 text (bad byte at offset {exc.start})") from None
    return parse_toml(text, str(path), error), text


def parse_toml(text: str, source: str, error=LapDataError) -> dict:
    """Parse TOML text; a syntax error, deep nesting or an integer beyond 64 bits is ``error``.

    >>> parse_toml("a = [1, [2]]", "x.toml")
    {'a': [1, [2]]}
    >>> parse_toml("a = 99999999999999999999", "x.toml")
    Traceback (most recent call last):
    lapdata.errors.LapDataError: x.toml: a = 99999999999999999999 is outside the 64-bit range TOML allows; write it as a float (e.g. 1e19) if you mean it
    """
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise error(f"{source}: not valid TOML ({str(exc).splitlines()[0] if str(exc) else 'syntax'})") from None
    except RecursionError:
        raise error(f"{source}: not valid TOML here (tables or arrays nested too deep)") from None
    except ValueError:                   # an integer literal of more than 4300 digits (CPython's limit)
        raise error(f"{source}: not valid TOML here (an integer literal of thousands of digits)") from None
    _check_values(doc, source, "", 0, error)
    return doc


def _check_values(value, source: str, where: str, depth: int, error) -> None:
    if depth > MAX_TOML_DEPTH:
        raise error(f"{source}: {where or 'the document'} is nested more than {MAX_TOML_DEPTH} deep")
    if isinstance(value, dict):
        for key, item in value.items():
            _check_values(item, source, f"{where}.{key}" if where else str(key), depth + 1, error)
    elif isinstance(value, list):
        for index, item in enumerate(value):
            _check_values(item, source, f"{where}[{index}]", depth + 1, error)
    elif isinstance(value, int) and not isinstance(value, bool) and not -INT64 <= value < INT64:
        raise error(f"{source}: {shown(where)[1:-1]} = {shown(value)} is outside the 64-bit range TOML allows; "
                    f"write it as a float (e.g. 1e19) if you mean it")
