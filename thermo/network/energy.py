"""The first law over a solve or a run: heat in = change in stored heat + heat lost."""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class EnergyBalance:
    """Heat in = change in stored heat + heat lost, over the whole run [J]."""

    heat_in_j: float
    stored_j: float
    lost_j: float

    @property
    def balance_rel_error(self) -> float:
        """|in - stored - lost| / max(|in|, |stored|+|lost|, 1 J)."""
        scale = max(abs(self.heat_in_j), abs(self.stored_j) + abs(self.lost_j), 1.0)
        return abs(self.heat_in_j - self.stored_j - self.lost_j) / scale
