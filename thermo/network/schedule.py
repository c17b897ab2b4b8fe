"""Time-varying inputs of a heat network: named signals, piecewise linear between samples.

Heat-source signals [W], boundary temperatures [K] and drivers (a speed [m/s], say) are all
signals of one ``Schedule`` on one shared time axis [s].
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

import numpy as np

from lapdata.echo import shown
from lapdata.suggest import did_you_mean
from thermo.errors import ModelError

_TIME_TOLERANCE_S = 1e-9   # how far outside the time axis a query may fall (rounding only)


@dataclass(frozen=True, eq=False)
class Schedule:
    """Named signals on a strictly increasing time axis, linear between samples.

    Parameters
    ----------
    time_s : array_like
        Sample times, strictly increasing, at least two [s]
    signals : mapping of str to array_like
        One value per sample for each signal [signal unit]

    Outside ``[time_s[0], time_s[-1]]`` a signal has no value: asking for one is a ``ModelError``.
    """

    time_s: np.ndarray
    signals: Mapping[str, np.ndarray]

    def __post_init__(self):
        t = np.array(self.time_s, dtype=float)
        if t.ndim != 1 or t.size < 2:
            raise ModelError(f"schedule: time_s must be a 1-D array of at least two samples, got shape {t.shape}")
        if not np.all(np.isfinite(t)):
            raise ModelError(f"schedule: time_s has a non-finite value at sample {int(np.argmin(np.isfinite(t)))}")
        steps = np.diff(t)
        if np.any(steps <= 0):
            i = int(np.argmax(steps <= 0)) + 1
            raise ModelError(f"schedule: time_s must be strictly increasing, sample {i} is at {shown(t[i])} s after {shown(t[i - 1])} s")
        given = dict(self.signals)
        for name, series in given.items():
            if not isinstance(name, str) or not name:
                raise ModelError(f"schedule: signal names must be non-empty strings, got {shown(name)}")
            if np.shape(series) != t.shape:
                raise ModelError(f"schedule: signal '{name}' has shape {np.shape(series)}, expected {t.shape} like time_s")
        # every signal copied once into one table (a row each); the signals are its rows
        table = np.empty((len(given), t.size))
        for row, series in zip(table, given.values()):
            row[:] = series
        if not np.all(np.isfinite(table)):
            for name, v in zip(given, table):
                if not np.all(np.isfinite(v)):
                    i = int(np.argmin(np.isfinite(v)))
                    raise ModelError(f"schedule: signal '{name}' has a non-finite value at sample {i} (t = {t[i]} s)")
        table.setflags(write=False)
        t.setflags(write=False)
        object.__setattr__(self, "time_s", t)
        object.__setattr__(self, "signals", dict(zip(given, table)))
        object.__setattr__(self, "_names", tuple(given))
        object.__setattr__(self, "_row", {name: i for i, name in enumerate(given)})
        object.__setattr__(self, "_table", table)
        object.__setattr__(self, "_cumulative", {})     # rows -> (their signals, integrals at each sample), on first use

    # ------------------------------------------------------------------ construction helpers
    @classmethod
    def constant(cls, t_start_s: float, t_end_s: float, values: Mapping[str, float]) -> "Schedule":
        """A schedule whose signals hold the given values from ``t_start_s`` to ``t_end_s``."""
        return cls(np.array([t_start_s, t_end_s], dtype=float),
                   {name: np.full(2, float(v)) for name, v in values.items()})

    def shifted(self, dt_s: float) -> "Schedule":
        """The same signals with the time axis moved by ``dt_s`` [s]."""
        return Schedule(self.time_s + float(dt_s), self.signals)

    def concatenate(self, other: "Schedule") -> "Schedule":
        """This schedule followed by ``other`` (same signal names, ``other`` starting no earlier
        than this one ends). A shared end sample must carry equal values; a gap is linear."""
        if set(other.names) != set(self.names):
            extra = sorted(set(self.names) ^ set(other.names))
            raise ModelError(f"schedule: cannot concatenate schedules with different signals: {', '.join(extra)}")
        t_join = self.time_s[-1]
        if other.time_s[0] < t_join:
            raise ModelError(f"schedule: the second schedule starts at {other.time_s[0]} s, before the first ends at {t_join} s")
        drop_first = other.time_s[0] == t_join
        signals = {}
        for name in self.names:
            tail = other.signals[name]
            if drop_first:
                a, b = self.signals[name][-1], tail[0]
                if not np.isclose(a, b, rtol=1e-12, atol=1e-12):
                    raise ModelError(f"schedule: signal '{name}' jumps from {a} to {b} at the join t = {t_join} s; "
                                     "a jump needs two samples apart in time")
                tail = tail[1:]
            signals[name] = np.concatenate([self.signals[name], tail])
        t_tail = other.time_s[1:] if drop_first else other.time_s
        return Schedule(np.concatenate([self.time_s, t_tail]), signals)

    # ------------------------------------------------------------------ queries
    @property
    def names(self) -> tuple[str, ...]:
        """Signal names in their stored order."""
        return self._names

    @property
    def t_start_s(self) -> float:
        return float(self.time_s[0])

    @property
    def t_end_s(self) -> float:
        return float(self.time_s[-1])

    def _check_name(self, name: str) -> None:
        if name not in self.signals:
            raise ModelError(f"schedule: no signal named '{name}'{did_you_mean(name, self.names, n=3)}")

    def _check_times(self, t: np.ndarray) -> None:
        span = self.time_s[-1] - self.time_s[0]
        tol = _TIME_TOLERANCE_S * max(1.0, span)
        if t.size and (np.min(t) < self.time_s[0] - tol or np.max(t) > self.time_s[-1] + tol):
            raise ModelError(f"schedule: time {float(np.min(t) if np.min(t) < self.time_s[0] else np.max(t))} s "
                             f"is outside the schedule [{self.time_s[0]}, {self.time_s[-1]}] s")

    def _rows_of(self, names) -> list[int]:
        rows = []
        for name in names:
            self._check_name(name)
            rows.append(self._row[name])
        return rows

    def value(self, name: str, t):
        """Value of signal ``name`` at time(s) ``t`` [s], linear between samples [signal unit]."""
        self._check_name(name)
        tt = np.asarray(t, dtype=float)
        self._check_times(np.atleast_1d(tt))
        out = np.interp(tt, self.time_s, self.signals[name])
        return float(out) if out.ndim == 0 else out

    def columns(self, names, t) -> np.ndarray:
        """Several signals at times ``t`` [s], one column each: shape ``t.shape + (len(names),)``.

        Column j equals ``value(names[j], t)`` to the bit (the same interpolation, one signal at a
        time); the times are checked once for all the signals."""
        return self.sample(names, (), t)[0]

    def values_at(self, t: float) -> dict[str, float]:
        """Every signal at one time ``t`` [s]."""
        row = self.rows_at(float(t), np.arange(len(self.names)))
        return dict(zip(self.names, row.tolist()))

    def indices(self, names) -> np.ndarray:
        """Row numbers of the named signals, for ``rows_at`` (fast repeated lookups)."""
        return np.array(self._rows_of(names), dtype=int)

    def rows_at(self, t: float, rows: np.ndarray) -> np.ndarray:
        """Signals of the given row numbers at one time ``t`` [s]: the solver's fast path."""
        tt = self.time_s
        t = float(t)
        tol = _TIME_TOLERANCE_S * max(1.0, tt[-1] - tt[0])
        if t < tt[0] - tol or t > tt[-1] + tol:
            self._check_times(np.atleast_1d(t))
        k = min(max(int(np.searchsorted(tt, t, side="right")) - 1, 0), tt.size - 2)
        w = min(max((t - tt[k]) / (tt[k + 1] - tt[k]), 0.0), 1.0)
        lo = self._table[rows, k]
        return lo + w * (self._table[rows, k + 1] - lo)

    def integral(self, name: str, t0, t1):
        """Exact integral of signal ``name`` from ``t0`` to ``t1`` [signal unit x s].

        Notes
        -----
        A piecewise linear signal integrates exactly by the trapezoid rule on each piece; partial
        pieces at either end use the interpolated value. ``t0`` and ``t1`` may be arrays.
        """
        self._check_name(name)
        a = np.asarray(t0, dtype=float)
        b = np.asarray(t1, dtype=float)
        self._check_times(np.atleast_1d(a))
        self._check_times(np.atleast_1d(b))
        rows = [self._row[name]]
        out = (self._antiderivative(rows, b.reshape(-1))[0].reshape(b.shape)
               - self._antiderivative(rows, a.reshape(-1))[0].reshape(a.shape))
        return float(out) if np.ndim(out) == 0 else out

    def integral_columns(self, names, t) -> np.ndarray:
        """Integrals of several signals from the schedule's start to times ``t`` [s], one column
        each: shape ``t.shape + (len(names),)`` [signal unit x s].

        ``integral(name, t0, t1)`` is the difference of two of these, to the bit: a run that needs
        integrals over many steps on one grid works them out at each grid time once."""
        return self.sample((), names, t)[1]

    def sample(self, names, integrated, t) -> tuple[np.ndarray, np.ndarray]:
        """``columns(names, t)`` and ``integral_columns(integrated, t)`` in one call, the times
        checked once: each of shape ``t.shape + (number of signals,)``."""
        rows, irows = self._rows_of(names), self._rows_of(integrated)
        tt = np.asarray(t, dtype=float)
        flat = tt.reshape(-1)
        if rows or irows:
            self._check_times(flat)
        values = np.empty((len(rows), flat.size))
        for j, r in enumerate(rows):
            values[j] = np.interp(flat, self.time_s, self._table[r])
        return (values.T.reshape(tt.shape + (len(rows),)),
                self._antiderivative(irows, flat).T.reshape(tt.shape + (len(irows),)))

    def _antiderivative(self, rows: list[int], t: np.ndarray) -> np.ndarray:
        """Integrals of the signals of ``rows`` from the start to the times ``t`` (1-D, unchecked),
        shape (len(rows), t.size): the integral up to the sample at or before t, plus the
        trapezoid from there to t."""
        tt = self.time_s
        if not rows:
            return np.zeros((0, t.size))
        key = tuple(rows)
        kept = self._cumulative.get(key)
        if kept is None:        # the signals never change after construction: worked out once
            v = self._table[rows]
            cum = np.zeros(v.shape)
            np.cumsum(0.5 * (v[:, 1:] + v[:, :-1]) * np.diff(tt), axis=1, out=cum[:, 1:])
            kept = self._cumulative[key] = (v, cum)
        v, cum = kept
        tc = np.clip(t, tt[0], tt[-1])
        # the piece each time falls on; a time at the last sample takes the last piece (tc >= tt[0],
        # so the search gives at least 1, or the axis length for NaN: the lower bound 0 holds)
        k = np.minimum(np.searchsorted(tt, tc, side="right") - 1, tt.size - 2)
        v_t = np.empty((len(rows), tc.size))
        for j, row in enumerate(v):
            v_t[j] = np.interp(tc, tt, row)
        return np.take(cum, k, axis=1) + 0.5 * (np.take(v, k, axis=1) + v_t) * (tc - tt.take(k))
