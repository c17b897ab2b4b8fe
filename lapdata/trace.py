"""The lap trace: one logged or built lap (or stint) of speed against time, in SI units."""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Mapping

import numpy as np


@dataclass(frozen=True)
class LapTrace:
    """Speed and optional channels against time, all SI.

    Attributes
    ----------
    time_s : ndarray
        Time from the start of the trace, strictly increasing [s]
    distance_m : ndarray
        Distance travelled from the start of the trace [m]
    speed_mps : ndarray
        Vehicle speed, never negative [m/s]
    pressure_front_pa, pressure_rear_pa : ndarray or None
        Brake line pressure [Pa]
    accel_long_mps2 : ndarray or None
        Longitudinal acceleration, positive forwards [m/s^2]
    temperatures_k : mapping of channel name to ndarray
        Measured temperatures, keyed by the
        CSV column name without its unit (e.g. ``temp_disc_front_left``) [K]
    source : str
        File the trace came from (or a description), for error messages
    repairs : tuple of str
        What was repaired on reading, one line each (empty if nothing)
    """

    time_s: np.ndarray
    distance_m: np.ndarray
    speed_mps: np.ndarray
    pressure_front_pa: np.ndarray | None = None
    pressure_rear_pa: np.ndarray | None = None
    accel_long_mps2: np.ndarray | None = None
    temperatures_k: Mapping[str, np.ndarray] = field(default_factory=dict)
    source: str = "<memory>"
    repairs: tuple[str, ...] = ()

    @property
    def duration_s(self) -> float:
        """Time from first to last sample [s]."""
        return float(self.time_s[-1] - self.time_s[0])

    @property
    def length_m(self) -> float:
        """Distance from first to last sample [m]."""
        return float(self.distance_m[-1] - self.distance_m[0])

    @property
    def has_pressure(self) -> bool:
        """True when both front and rear line pressure channels are present."""
        return self.pressure_front_pa is not None and self.pressure_rear_pa is not None
