"""A read scenario: the car, the corners, fluid, limits, ambient, the plan and the solver settings."""
from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from lapdata.track import CarEnvelope
from thermo.corner.geometry import CornerDesign
from thermo.duty.bias import FixedBias, HydraulicBias
from thermo.duty.vehicle import VehicleParameters
from thermo.limits import FluidSpec, Limits

PHASE_KINDS = ("out_lap", "laps", "safety_car", "in_lap", "pit_stop", "soak")
DRIVING_KINDS = ("out_lap", "laps", "safety_car", "in_lap")


@dataclass(frozen=True)
class Phase:
    """One step of the plan. Driving phases have laps; pit stops and the soak are stationary."""

    kind: str
    name: str
    count: int = 1
    pace: float = 1.0
    pit_lane_speed_m_s: float = 60 / 3.6
    pit_lane_length_m: float = 0.0
    duration_s: float = 0.0
    pad_change: bool = False
    refuel_kg: float = 0.0
    trace: Path | None = None          # this phase's own logged lap (None: the plan's lap)

    @property
    def driving(self) -> bool:
        return self.kind in DRIVING_KINDS


@dataclass(frozen=True)
class PadWear:
    """Pad wear per lap: dh = k E_friction f(T) / A_pads, f(T) = exp((T - T_ref)/T_scale) above T_ref, 1 below.

    k [m^3/J] is the pad volume worn per joule of friction work (both pads of the corner share
    the corner's friction energy E and area A_pads = 2 x one pad's face); T is the pad
    temperature weighted by the pad heat over the lap. An illustrative model (wear in proportion
    to friction work, rising with temperature) whose coefficients must be calibrated against
    measured wear; the defaults are illustrative only.
    """

    enabled: bool = False
    wear_coefficient_m3_per_j: float = 0.0
    reference_temperature_k: float = 623.15
    temperature_scale_k: float = 100.0
    warn_margin_m: float = 0.001


@dataclass(frozen=True)
class Ambient:
    """Ambient temperature (constant or a profile against time) and pressure."""

    temperature_k: float
    pressure_pa: float
    profile_s_k: tuple[tuple[float, float], ...] = ()

    def temperature_at(self, time_s):
        """Ambient temperature at run time(s) [K]."""
        if not self.profile_s_k:
            return np.full_like(np.asarray(time_s, dtype=float), self.temperature_k)
        t, temp = zip(*self.profile_s_k)
        return np.interp(time_s, t, temp)


@dataclass(frozen=True)
class Plan:
    """Where the laps come from and the ordered phases."""

    lap_source: str                 # 'track' or 'trace'
    lap_path: Path
    sample_hz: float
    soak_sample_s: float
    phases: tuple[Phase, ...]
    repair_trace: bool = False


@dataclass(frozen=True)
class SolverChoice:
    method: str = "LSODA"
    rtol: float = 1e-6
    atol_k: float = 1e-4
    output_hz: float = 0.0


@dataclass(frozen=True)
class Scenario:
    """Everything a run needs, in SI. ``raw`` is the parsed TOML (for overrides and variants)."""

    name: str
    description: str
    path: Path
    text: str
    raw: dict
    vehicle: VehicleParameters
    envelope: CarEnvelope
    bias: FixedBias | HydraulicBias
    power_method: str
    left_share_front: float
    left_share_rear: float
    fuel_consumption_kg_per_lap: float
    fuel_capacity_kg: float
    ambient: Ambient
    fluid: FluidSpec
    limits: Limits
    corners: tuple[CornerDesign, ...]
    plan: Plan
    pad_wear: PadWear
    solver: SolverChoice
    variants: dict = field(default_factory=dict)
    overrides: tuple[tuple[str, object], ...] = ()
    calibration: object = None      # thermo.scenario.calibration.Calibration, or None without [calibration]
