"""Braking energy and power per corner over a trace: the numbers an engineer checks first."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

import numpy as np

from thermo.duty.corner_duty import CornerDuty
from thermo.errors import ScenarioError


@dataclass(frozen=True)
class CornerEnergy:
    """Braking energy and power of one corner over a trace.

    Parameters
    ----------
    name : str
        Corner name
    braking_energy_j : float
        Disc plus pad heat, trapezoid integral over the trace [J]
    disc_energy_j : float
        Heat into the disc [J]
    pad_energy_j : float
        Heat into the pad [J]
    duration_s : float
        Length of the trace [s]
    braking_time_s : float
        Total length of the sample intervals with heat input [s]
    mean_power_w : float
        Braking energy over the whole trace duration [W]
    mean_braking_power_w : float
        Braking energy over the braking time (0 if no braking) [W]
    peak_power_w : float
        Largest sample of disc plus pad heat [W]
    """

    name: str
    braking_energy_j: float
    disc_energy_j: float
    pad_energy_j: float
    duration_s: float
    braking_time_s: float
    mean_power_w: float
    mean_braking_power_w: float
    peak_power_w: float


def corner_energy(duty: CornerDuty) -> CornerEnergy:
    """Braking energy and power of one corner's duty (trapezoid integrals, as the solver sees it)."""
    t = duty.time_s
    dt = np.diff(t)
    disc = float(np.trapezoid(duty.disc_heat_w, t))
    pad = float(np.trapezoid(duty.pad_heat_w, t))
    total = duty.brake_heat_w
    interval_mean = 0.5 * (total[1:] + total[:-1])
    braking_time = float(np.sum(dt[interval_mean > 0.0]))
    duration = float(t[-1] - t[0])
    energy = disc + pad
    return CornerEnergy(
        name=duty.name, braking_energy_j=energy, disc_energy_j=disc, pad_energy_j=pad,
        duration_s=duration, braking_time_s=braking_time, mean_power_w=energy / duration,
        mean_braking_power_w=energy / braking_time if braking_time > 0 else 0.0,
        peak_power_w=float(np.max(total)))


def lap_energy_summary(duties: Mapping[str, CornerDuty]) -> dict[str, CornerEnergy]:
    """:func:`corner_energy` for every corner of a :func:`corner_heat_inputs` result."""
    if not duties:
        raise ScenarioError("duties: expected at least one corner")
    return {name: corner_energy(duty) for name, duty in duties.items()}


def total_braking_energy_j(duties: Mapping[str, CornerDuty]) -> float:
    """Braking energy of all the given corners together [J]."""
    return float(sum(s.braking_energy_j for s in lap_energy_summary(duties).values()))
