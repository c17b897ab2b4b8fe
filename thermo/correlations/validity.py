"""Validity ranges of correlations, declared as data and checked on every call.

Each public correlation is wrapped by :func:`correlation`, which records the range of each named
argument in the module-level dict :data:`VALIDITY` (``VALIDITY[name][argument] = (low, high)``)
and the reference text of its docstring in ``function.reference``. On a call, the minimum and
maximum of each checked argument (arrays included) are compared with the range and the policy
decides what happens when one lies outside:

- ``"warn"`` (default): ``warnings.warn(..., CorrelationWarning)``;
- ``"raise"``: :class:`thermo.errors.CorrelationError`;
- ``"ignore"``: nothing (the check is skipped, which is also the fastest).

The policy is set with :func:`set_validity_policy`, either for good or as a context manager::

    with set_validity_policy("raise"):
        nusselt_internal_turbulent_dittus_boelter(5000.0, 0.7)   # raises: Re below 1e4

Derived groups (a product such as Re Pr) are declared with ``derived={"re*pr": (fn, low, high)}``
where ``fn`` receives the call's arguments as a dict.
"""
from __future__ import annotations

import contextlib
import contextvars
import functools
import inspect
import re
import warnings
from typing import Callable

import numpy as np

from lapdata.echo import shown
from thermo.errors import CorrelationError

POLICIES = ("warn", "raise", "ignore")

#: name of correlation -> {argument or derived group: (low, high)}; filled by @correlation.
VALIDITY: dict[str, dict[str, tuple[float, float]]] = {}

_policy: contextvars.ContextVar[str] = contextvars.ContextVar("validity_policy", default="warn")
_recorder: contextvars.ContextVar[set | None] = contextvars.ContextVar("correlation_recorder", default=None)


class recording_calls:
    """Context manager collecting the names of the correlations called inside it (``.names``).

    A run uses it to list the references of exactly the correlations it used.
    """

    def __enter__(self):
        self.names: set[str] = set()
        self._token = _recorder.set(self.names)
        return self

    def __exit__(self, *exc):
        _recorder.reset(self._token)
        return False


class CorrelationWarning(UserWarning):
    """A correlation was evaluated outside its declared validity range."""


class _PolicyToken:
    """Returned by set_validity_policy: usable as a context manager that restores the old policy."""

    def __init__(self, previous: str):
        self._previous = previous

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        _policy.set(self._previous)
        return False


def set_validity_policy(policy: str) -> _PolicyToken:
    """Set what happens outside a validity range: "warn", "raise" or "ignore".

    Returns a token that, used in a ``with`` block, restores the previous policy on exit.
    """
    if policy not in POLICIES:
        raise CorrelationError(f"validity policy: expected one of {', '.join(POLICIES)}, got {shown(policy)}")
    previous = _policy.get()
    _policy.set(policy)
    return _PolicyToken(previous)


@contextlib.contextmanager
def unchecked():
    """Correlations evaluated with no validity check, and numpy's floating-point warnings off, in
    this thread only (both are context variables; ``warnings.catch_warnings`` changes the whole
    process, so another thread's warnings would be lost or its filters left behind). For tables that
    span states a run may never reach, and solves whose states are checked afterwards
    (``thermo.chain.validity``)."""
    with set_validity_policy("ignore"), np.errstate(all="ignore"):
        yield


def get_validity_policy() -> str:
    """The policy in force: "warn", "raise" or "ignore"."""
    return _policy.get()


def check_range(name: str, quantity: str, value, low: float, high: float) -> None:
    """Check min/max of ``value`` against [low, high] and act on the policy in force.

    NaN values count as outside the range.
    """
    policy = _policy.get()
    if policy == "ignore":
        return
    arr = np.asarray(value, dtype=float)
    if arr.size == 0:
        return
    lo_v, hi_v = float(np.min(arr)), float(np.max(arr))
    if lo_v >= low and hi_v <= high:  # False for NaN
        return
    message = (f"{name}: {quantity} spans [{lo_v:.4g}, {hi_v:.4g}], outside the validity range "
               f"[{low:.4g}, {high:.4g}]")
    if policy == "raise":
        raise CorrelationError(message)
    warnings.warn(message, CorrelationWarning, stacklevel=3)


def reference_from_docstring(doc: str | None) -> str:
    """The text of the numpydoc "References" section, entries joined by " | " (empty if none)."""
    if not doc:
        return ""
    lines = inspect.cleandoc(doc).splitlines()
    try:
        start = next(i for i, line in enumerate(lines)
                     if line.strip() == "References" and i + 1 < len(lines)
                     and set(lines[i + 1].strip()) == {"-"})
    except StopIteration:
        return ""
    entries: list[str] = []
    body = lines[start + 2:]
    for i, line in enumerate(body):
        text = line.strip()
        if i + 1 < len(body) and text and set(body[i + 1].strip()) == {"-"}:
            break  # the title of the next section
        if not text:
            continue
        if text.startswith(".. ["):
            entries.append(re.sub(r"^\.\. \[\d+\]\s*", "", text))
        elif entries:
            entries[-1] += " " + text
        else:
            entries.append(text)
    return " | ".join(entries)


def correlation(derived: dict | None = None, **ranges: tuple[float, float]) -> Callable:
    """Decorator: declare validity ranges of named arguments and check them on each call.

    ``ranges`` maps argument names to (low, high); an argument passed as ``None`` is not checked.
    The wrapped function gains ``.validity`` (the dict of ranges) and ``.reference`` (its
    docstring's References section).
    """
    derived = dict(derived or {})

    def decorate(func: Callable) -> Callable:
        signature = inspect.signature(func)
        for arg in ranges:
            if arg not in signature.parameters:
                raise CorrelationError(f"{func.__name__}: validity range for unknown argument '{arg}'")
        table = {**{k: (float(v[0]), float(v[1])) for k, v in ranges.items()},
                 **{k: (float(v[1]), float(v[2])) for k, v in derived.items()}}
        VALIDITY[func.__name__] = table
        defaults = {k: p.default for k, p in signature.parameters.items()
                    if p.default is not inspect.Parameter.empty}

        @functools.wraps(func)
        def wrapper(*args, **kwargs):
            calls = _recorder.get()
            if calls is not None:
                calls.add(func.__name__)
            if _policy.get() != "ignore" and table:
                values = dict(defaults)
                values.update(zip(signature.parameters, args))
                values.update(kwargs)
                for arg, (low, high) in ranges.items():
                    if values.get(arg) is not None:
                        check_range(func.__name__, arg, values[arg], float(low), float(high))
                for group, (fn, low, high) in derived.items():
                    check_range(func.__name__, group, fn(values), float(low), float(high))
            return func(*args, **kwargs)

        wrapper.validity = table
        wrapper.reference = reference_from_docstring(func.__doc__)
        return wrapper

    return decorate
