"""What a run produced, per corner: temperatures, link energies (and flows if asked), energy, checks, laps, phases.

Plotting, reporting and the HDF5 writer read these objects and never run a model.
All temperatures here are kelvin; converting to degrees Celsius is the job of the edges.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from thermo.network.energy import EnergyBalance  # noqa: F401 (part of the results; defined with the network)


@dataclass(frozen=True)
class CheckResult:
    """One limit check: the peak against the limit, margin = limit - peak [K], status ok/caution/exceeded."""

    name: str            # e.g. "fluid_boiling_dry", "bearing_grease"
    node: str            # the node checked, e.g. "fluid"
    limit_k: float
    peak_k: float
    peak_time_s: float
    margin_k: float
    status: str          # "ok", "caution" (margin below caution_band_k) or "exceeded"
    caution_band_k: float
    source: str          # where the limit comes from (standard, maker, common practice)


@dataclass(frozen=True)
class PhaseSpan:
    """One phase of the plan (race laps, pit stop, soak ...) on the run's time axis [s]."""

    name: str
    kind: str            # "out_lap", "laps", "safety_car", "in_lap", "pit_stop", "soak"
    t_start_s: float
    t_end_s: float
    link_energy_j: tuple[float, ...] | None = None   # heat carried by each link in the phase [J]


@dataclass(frozen=True)
class LapSpan:
    """One lap on the run's time axis with each node's minimum and maximum in it [K]."""

    index: int           # 1-based lap count over the whole run
    phase: str
    t_start_s: float
    t_end_s: float
    min_k: dict[str, float]
    max_k: dict[str, float]
    braking_energy_j: float = 0.0
    link_energy_j: tuple[float, ...] | None = None   # heat carried by each link in the lap [J]


@dataclass(frozen=True)
class CornerResult:
    """The solution of one brake corner over the whole plan."""

    name: str                          # "front_left", "front_right", "rear_left", "rear_right" or "front"/"rear"
    node_names: tuple[str, ...]        # output nodes: disc, pad, piston, fluid, caliper, upright, bearing, hub, ...
    time_s: np.ndarray                 # (n_t,)
    temperatures_k: np.ndarray         # (n_t, n_nodes)
    link_names: tuple[str, ...]
    link_groups: tuple[str, ...]       # heat-path group of each link ("disc_convection", "radiation", ...)
    link_flows_w: np.ndarray | None    # (n_t, n_links), positive from the link's first end to its second;
                                       # None unless asked for (``store="full"``): laps and phases carry
                                       # each link's energy instead
    link_energy_j: np.ndarray          # (n_links,) heat carried by each link over the run [J]
    energy: EnergyBalance
    checks: tuple[CheckResult, ...]
    laps: tuple[LapSpan, ...] = ()
    phases: tuple[PhaseSpan, ...] = ()
    stop_time_s: float | None = None   # when the car stopped for the final soak (None: no soak)
    extras: dict = field(default_factory=dict)   # further per-corner facts (pad thickness per stint ...)
    speed_m_s: np.ndarray | None = None      # (n_t,) car speed at the stored rows [m/s] (None: not kept)
    brake_power_w: np.ndarray | None = None  # (n_t,) friction heat into the corner at the stored rows [W]

    def temperature(self, node: str) -> np.ndarray:
        """Temperature history of one output node [K]."""
        return self.temperatures_k[:, self.node_names.index(node)]

    def peak(self, node: str) -> tuple[float, float]:
        """(peak temperature [K], time of the peak [s]) of one node."""
        series = self.temperature(node)
        i = int(np.argmax(series))
        return float(series[i]), float(self.time_s[i])


@dataclass(frozen=True)
class Results:
    """A whole run: every corner, and what the report must print for the engineer who signs off."""

    scenario_name: str
    scenario_text: str                 # the scenario file as read (TOML text)
    version: str
    solver: str                        # method used, e.g. "LSODA"
    solver_status: str                 # "success" or a message
    references: tuple[str, ...]        # correlations and materials the run used, with their sources
    corners: tuple[CornerResult, ...]
    caution: str
    warnings: tuple[str, ...] = ()
    overrides: tuple[tuple[str, str], ...] = ()   # (dotted key, TOML value text) applied on top of scenario_text
    hydraulics: dict | None = None     # the hydraulics block (thermo.chain.hydraulics.hydraulics_dict)

    def corner(self, name: str) -> CornerResult:
        for c in self.corners:
            if c.name == name:
                return c
        raise KeyError(name)
