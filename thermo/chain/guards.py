"""Guards of a run: its state stays in the range where the model means anything, and its time is bounded.

A corner whose inputs drive a node beyond any brake material (all of the friction heat into a
thin pad, a cooling area typed a thousand times too small) must not be reported as a success
with a pad at 22 000 degC; nor may a run on absurd inputs go on for hours. Both stop the run
with one line naming the corner, the node and the time.
"""
from __future__ import annotations

import time

import numpy as np

from thermo.errors import SolveError

# Beyond these no brake part has material data or meaning: the model's correlations, its
# radiation and the materials' properties all stop well inside them.   # common practice, no published source
STATE_MAX_K = 2273.15     # 2000 degC: above carbon-carbon's service, far above iron's melting range
STATE_MIN_K = 173.15      # -100 degC: below any ambient the scenario accepts (-60 degC)


def check_state_range(corner: str, phase: str, node_names, time_s: np.ndarray, temperatures_k: np.ndarray) -> None:
    """SolveError at the first time a node leaves [STATE_MIN_K, STATE_MAX_K] (or is not finite)."""
    bad = ~((temperatures_k >= STATE_MIN_K) & (temperatures_k <= STATE_MAX_K))
    if not bad.any():
        return
    row = int(np.argmax(bad.any(axis=1)))
    column = int(np.argmax(bad[row]))
    value = temperatures_k[row, column]
    reached = f"{value - 273.15:.0f} degC" if np.isfinite(value) else "a value that is not a number"
    raise SolveError(
        f"corner {corner}, {phase}: node '{node_names[column]}' reached {reached} at t = {time_s[row]:.1f} s, "
        f"outside {STATE_MIN_K - 273.15:.0f} to {STATE_MAX_K - 273.15:.0f} degC where the model means anything; "
        "the run stopped. Check the inputs that feed it (heat_partition, areas, masses, conductances, cooling)")


class WallClock:
    """A run's time budget: ``check`` raises SolveError once ``limit_s`` of wall time have passed."""

    def __init__(self, limit_s: float):
        self.limit_s = float(limit_s)
        self.start = time.monotonic()

    def check(self, where: str) -> None:
        spent = time.monotonic() - self.start
        if spent > self.limit_s:
            raise SolveError(f"{where}: the run took more than [solver] wall_clock_limit_s = {self.limit_s:g} s of "
                             "wall time and was stopped; raise the limit for a long study, or check the plan's size")
