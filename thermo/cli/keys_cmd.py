"""`brakeheat keys`: every scenario key with its default, allowed values and meaning."""
from __future__ import annotations

import sys


def add_parser(sub) -> None:
    p = sub.add_parser("keys", help="list every scenario key: default, allowed values, meaning",
                       description="Every key a scenario file may hold, from the one declaration of each.")
    p.add_argument("--markdown", action="store_true", help="Markdown tables (as in README)")
    p.set_defaults(handler=run)


def run(args) -> int:
    from thermo.scenario import keys_table
    sys.stdout.write(keys_table.markdown() if args.markdown else keys_table.text())
    return 0
