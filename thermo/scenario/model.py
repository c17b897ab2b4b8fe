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
from thermo.solver.settings import SolverSettings

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
    pad_change_below_m: float = 0.0    # pit stop: new pads on a corner whose pad is thinner (0: off)
    refuel_kg: float = 0.0
    refuel_full: bool = False          # pit stop: fill the tank to the car's capacity
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
    measured wear. The defaults are declared once, in the scenario schema ([pad_wear] in
    ``thermo/scenario/schema.py``: off; 0.25 mm^3/kJ, 450 degC and 150 K, illustrative only).
    """

    enabled: bool
    wear_coefficient_m3_per_j: float
    reference_temperature_k: float
    temperature_scale_k: float
    warn_margin_m: float


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
class StintTemplate:
    """A stint written once and run ``repeat`` times, or until the run clock reaches ``until_s``.

    ``repeat`` 0 means once without ``until_s`` and without limit with it (the plan's size bounds
    still hold). ``pad_change_every`` n > 0 puts new pads on at the pit stops of every n-th run of
    the template. The expansion into phases is ``thermo.chain.plan.plan_phases``.
    """

    name: str
    phases: tuple[Phase, ...]
    repeat: int = 0
    until_s: float = 0.0
    pad_change_every: int = 0


@dataclass(frozen=True)
class Plan:
    """Where the laps come from, and the order of the run: ``phases``, then each stint template
    in turn (``stints``), then ``finish``."""

    lap_source: str                 # 'track' or 'trace'
    lap_path: Path
    sample_hz: float
    soak_sample_s: float
    phases: tuple[Phase, ...]
    repair_trace: bool = False
    stints: tuple[StintTemplate, ...] = ()
    finish: tuple[Phase, ...] = ()


@dataclass(frozen=True)
class SolverChoice:
    """The [solver] table (defaults declared once, in ``thermo/scenario/schema.py``: method 'fast')."""

    method: str
    rtol: float
    atol_k: float
    output_s: float                 # stored series interval [s]; 0 = every solver step (extremes always kept)
    output_hz: float                # stored series rate [Hz], used instead of output_s when above 0
    wall_clock_limit_s: float       # a run taking longer stops with an error [s]
    max_stride: int                 # fast: longest step off the brakes [samples]
    linearised: bool                # fast: linearised steps, no Newton iteration

    def settings(self) -> SolverSettings:
        """The integrator settings this table asks for (the one conversion, used by every study)."""
        if self.method != "fast":
            return SolverSettings(method=self.method, rtol=self.rtol, atol_k=self.atol_k)
        return SolverSettings(method=self.method, rtol=self.rtol, atol_k=self.atol_k, max_stride=self.max_stride,
                              linearised=self.linearised)


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
    pedal_ratio: float              # pushrod force per pedal force [-]
    knock_back_m: float             # piston travel lost to knock-back, for the pedal travel report [m]
    variants: dict = field(default_factory=dict)
    overrides: tuple[tuple[str, object], ...] = ()
    calibration: object = None      # thermo.scenario.calibration.Calibration, or None without [calibration]
