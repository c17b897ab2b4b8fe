"""The JSON a command prints with ``--json``, written to stdout in one piece."""
from __future__ import annotations

import json
import sys


def print_json(data) -> None:
    """``data`` as indented JSON and a newline on stdout, in one write.

    ``json.dump`` to a stream writes each token on its own; with stdout unbuffered
    (``PYTHONUNBUFFERED=1``, common in containers and CI) that was a system call per token:
    260 000 of them, about half a second, for the 24-hour demo's summary. A value JSON cannot
    hold (NaN) raises before anything is printed."""
    sys.stdout.write(json.dumps(data, indent=2, allow_nan=False) + "\n")
