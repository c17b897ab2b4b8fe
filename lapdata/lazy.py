"""Names a package exports but imports only on first use (PEP 562 module ``__getattr__``).

Keeps ``import lapdata``, ``import thermo`` and ``import thermo.output`` light: numpy's, scipy's,
h5py's and matplotlib's start-up is paid by the command that uses them, not by ``--help``.
"""
from __future__ import annotations

import importlib


def lazy_exports(package: str, names: dict[str, str]):
    """(``__getattr__``, ``__dir__``) for ``package``, where ``names`` maps each exported name to the
    module that defines it."""
    def __getattr__(name):
        if name in names:
            return getattr(importlib.import_module(names[name]), name)
        raise AttributeError(f"module {package!r} has no attribute {name!r}")

    def __dir__():
        return sorted(list(importlib.import_module(package).__dict__) + list(names))
    return __getattr__, __dir__
