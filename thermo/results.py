"""What a run produced, per corner: temperatures, link energies (and flows if asked), energy, checks, laps, phases.

Plotting, reporting and the HDF5 writer read these objects and never run a model.
All temperatures here are kelvin; converting to degrees Celsius is the job of the edges.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import NamedTuple

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
class StintPadThickness:
    """The pad thickness when a stint ended.

    Attributes
    ----------
    when : str
        What ended the stint: the pit stop that changed the pads (its phase name) or "end of run" [-]
    thickness_m : float
        Pad friction-material thickness then [m]
    """

    when: str
    thickness_m: float


@dataclass(frozen=True)
class LapPadThickness:
    """The pad thickness at the end of one lap.

    Attributes
    ----------
    lap : int
        1-based lap count over the whole run (``LapSpan.index``) [-]
    thickness_m : float
        Pad friction-material thickness at the lap's end [m]
    """

    lap: int
    thickness_m: float


@dataclass(frozen=True, kw_only=True)
class CornerFacts:
    """What a run found out about one corner beside its series and checks.

    Written as the JSON key ``extras`` of each corner (``run --json``, summary.json) and as the
    HDF5 attribute ``extras_json`` of ``/corners/<corner>``, with the attribute names below as
    keys, in this order. The three facts marked optional are None only in a ``Results`` read
    from a file written before brakeheat recorded them.

    Attributes
    ----------
    pad_thickness_m : tuple of StintPadThickness
        The pad thickness at the end of each stint: at each pit stop that changed the
        pads, then at the end of the run [m]
    pad_thickness_by_lap_m : tuple of LapPadThickness or None
        The pad thickness at the end of every lap (optional) [m]
    pad_minimum_thickness_m : float
        The pad's minimum friction-material thickness, from the design [m]
    link_to_boundary : tuple of bool
        One flag per link (the order of ``CornerResult.link_names``): True where the
        link's second end is a boundary (ambient or duct air), so that its heat leaves the corner [-]
    heat_partition_disc : float
        Nominal disc share of the friction heat: the area-weighted effusivity form,
        or the user's fixed share [-]
    heat_partition_realised : float or None
        Share of the run's friction heat that ended in the disc: what the sources put
        into its face plus what crossed the pad-disc interface (optional) [-]
    removed_with_pad_material_j : float
        Heat carried away with worn pad material and with pads taken off at pit stops,
        counted as lost in the energy balance [J]
    initial_temperature_k : float
        Temperature of every node at the start of the run [K]
    warnings : tuple of str
        This corner's warnings: alignment, pad wear, correlations used outside their
        ranges, material data extrapolated [-]
    correlations_used : tuple of str or None
        Names of the correlations the run evaluated, sorted (optional) [-]
    """

    pad_thickness_m: tuple[StintPadThickness, ...]
    pad_thickness_by_lap_m: tuple[LapPadThickness, ...] | None = None
    pad_minimum_thickness_m: float
    link_to_boundary: tuple[bool, ...]
    heat_partition_disc: float
    heat_partition_realised: float | None = None
    removed_with_pad_material_j: float
    initial_temperature_k: float
    warnings: tuple[str, ...]
    correlations_used: tuple[str, ...] | None = None


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
    facts: CornerFacts = field(kw_only=True)   # pad thickness, heat partition, warnings ... (keyword only)
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


class SeriesRows(NamedTuple):
    """A block of one corner's stored rows, as a run hands them to a series sink
    (``thermo.chain.corner_run.CornerRun``, ``thermo.output.hdf5_stream``); the columns of
    ``CornerResult``'s series."""

    time_s: np.ndarray             # (n,) [s]
    temperatures_k: np.ndarray     # (n, n_nodes) [K]
    speed_m_s: np.ndarray          # (n,) [m/s]
    brake_power_w: np.ndarray      # (n,) [W]
    link_flows_w: np.ndarray       # (n, n_links) [W]


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
