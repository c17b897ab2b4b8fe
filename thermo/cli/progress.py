"""A progress line on stderr for runs longer than a couple of seconds (quiet unless a terminal)."""
from __future__ import annotations

import sys
import time

from thermo.cli import interrupts


class Progress:
    """Counts finished steps; prints 'corner front: lap 12/47' on stderr after ``delay_s``."""

    def __init__(self, total: int, enabled: bool, delay_s: float = 2.0, stream=None):
        self.total = max(total, 1)
        self.stream = sys.stderr if stream is None else stream
        self.enabled = enabled and getattr(self.stream, "isatty", lambda: False)()
        self.delay_s = delay_s
        self.start = time.monotonic()
        self.done = 0
        self.shown = False

    def __call__(self, corner: str, segment) -> None:
        interrupts.raise_swallowed()         # a safe point between segments
        self.done += 1
        if not self.enabled or time.monotonic() - self.start < self.delay_s:
            return
        share = min(self.done / self.total, 1.0)
        bar = "#" * int(30 * share)
        self.stream.write(f"\r  solving [{bar:<30}] {100 * share:5.1f} %  corner {corner}, {segment.phase.name:<20.20}")
        self.stream.flush()
        self.shown = True

    def close(self) -> None:
        if self.shown:
            self.stream.write("\r" + " " * 90 + "\r")
            self.stream.flush()
