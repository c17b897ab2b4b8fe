"""The scenario's [calibration] table: what `brakeheat fit` fits, against which measurements.

Checked on every load (unknown keys are errors with a suggestion), so a misspelt channel or
parameter fails before any run. Layout (all keys documented in README "Calibration"):

    [calibration]                       duty, corners, holdout_laps, lap_length_m, time_offset_s, sample_s,
                                        max_evaluations
    [calibration.channels.temp_<what>]  corner, node, lag_s, offset_k, fit_offset, noise_k
    [calibration.parameters.<name>]     key, corners, prior, lower, upper, prior_std
    [[calibration.peaks]]               corner, node, kind, temperature_c, tolerance_k, name

Temperatures are converted to kelvin here, once. Parameter keys are corner-relative scenario keys
(``airflow.disc_convection_multiplier``); the fit sets them as overrides
``corners.<corner>.<key>`` for each corner the parameter applies to.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from lapdata.echo import shown
from thermo.errors import ScenarioError
from lapdata.units import KELVIN_AT_0C
from thermo.scenario.convert import convert_table, reject_unknown, suggestion
from thermo.scenario.schema import degc, f

DUTIES = ("measured", "plan")
PEAK_KINDS = ("reached", "not_reached")
# corner-relative key -> (lower bound must be above this, upper bound at most this or None)
PARAMETER_KEYS = {
    "airflow.local_airflow_factor": (0.0, None),
    "airflow.disc_convection_multiplier": (0.0, None),
    "airflow.vane_convection_multiplier": (0.0, None),
    "airflow.caliper_convection_multiplier": (0.0, None),
    "airflow.hub_convection_multiplier": (0.0, None),
    "airflow.duct_effectiveness_multiplier": (0.0, None),
    "airflow.contact_conductance_multiplier": (0.0, None),
    "pad.heat_partition": (0.0, 1.0),
}
# nodes a channel or a peak may name (disc_surface only for a layered disc)
NODES = ("disc", "disc_surface", "pad", "pad_surface", "piston", "fluid_at_piston", "fluid", "caliper", "upright",
         "bearing", "hub", "disc_bell", "backing_plate", "piston_seal")
CHANNEL_NAME = re.compile(r"temp_[a-z0-9_]+")

CALIBRATION = {
    "duty": f("duty", "measured", kind=str, choices=DUTIES,
              doc="'measured': run over the logged speed trace; 'plan': run the scenario's plan"),
    "lap_length_m": f("lap_length_m", 0.0, minimum=0.0, doc="0 = the plan's track or trace length"),
    "time_offset_s": f("time_offset_s", 0.0, doc="run time = measured time + offset"),
    "sample_s": f("sample_s", 1.0, minimum=0.0, doc="residual spacing; 0 = every logged sample"),
    "max_evaluations": f("max_evaluations", 60, kind=int, minimum=2, maximum=10000),
}
CHANNEL = {
    "corner": f("corner", kind=str),
    "node": f("node", kind=str, choices=NODES),
    "lag_s": f("lag_s", 0.0, minimum=0.0, doc="first-order sensor time constant"),
    "offset_k": f("offset_k", 0.0, doc="sensor reading minus true temperature (start value if fitted)"),
    "fit_offset": f("fit_offset", False, kind=bool),
    "noise_k": f("noise_k", 1.0, minimum=1e-6, doc="channel noise standard deviation (weights its residuals)"),
}
PARAMETER = {
    "key": f("key", kind=str, choices=tuple(PARAMETER_KEYS)),
    "prior": f("prior"),
    "lower": f("lower"),
    "upper": f("upper"),
    "prior_std": f("prior_std", 0.0, minimum=0.0, doc="0 = no prior term"),
}
PEAK = {
    "corner": f("corner", kind=str),
    "node": f("node", kind=str, choices=NODES),
    "kind": f("kind", kind=str, choices=PEAK_KINDS),
    "temperature_c": degc("temperature_k"),
    "tolerance_k": f("tolerance_k", 5.0, minimum=1e-6, doc="paint/sticker rating tolerance"),
    "name": f("name", "", kind=str),
}


@dataclass(frozen=True)
class ChannelMap:
    """A logged temperature channel: which corner node it reads and how (lag, offset, noise)."""

    channel: str
    corner: str
    node: str
    lag_s: float
    offset_k: float
    fit_offset: bool
    noise_k: float


@dataclass(frozen=True)
class FitParameter:
    """One fitted value set as the override ``corners.<c>.<key>`` for each of ``corners``."""

    name: str
    key: str
    corners: tuple[str, ...]
    prior: float
    lower: float
    upper: float
    prior_std: float

    @property
    def override_keys(self) -> tuple[str, ...]:
        return tuple(f"corners.{c}.{self.key}" for c in self.corners)


@dataclass(frozen=True)
class PeakObservation:
    """A peak-only reading: the node's peak over the logged run did (not) reach ``temperature_k``."""

    name: str
    corner: str
    node: str
    kind: str
    temperature_k: float
    tolerance_k: float


@dataclass(frozen=True)
class Calibration:
    """The checked [calibration] table (SI)."""

    duty: str
    corners: tuple[str, ...]
    holdout_laps: tuple[int, ...]
    lap_length_m: float
    time_offset_s: float
    sample_s: float
    max_evaluations: int
    channels: tuple[ChannelMap, ...]
    parameters: tuple[FitParameter, ...]
    peaks: tuple[PeakObservation, ...]


def parse_calibration(table, corners, source: str) -> Calibration | None:
    """Check the [calibration] table against the scenario's corners; None when there is none.

    Parameters
    ----------
    table : dict or None
        The parsed [calibration] table [-]
    corners : sequence of CornerDesign
        The scenario's corners (names and disc layers) [-]
    source : str
        Scenario file, for messages [-]
    """
    if table is None:
        return None
    where = "calibration"
    if not isinstance(table, dict):
        raise ScenarioError(f"{source}: [calibration] must be a table")
    nested = ("corners", "holdout_laps", "channels", "parameters", "peaks")
    reject_unknown(where, table, tuple(CALIBRATION) + nested, source)
    top = convert_table(where, {k: v for k, v in table.items() if k not in nested}, CALIBRATION, source)
    layers = {c.name: c.disc.layers for c in corners}
    names = _names(table.get("corners", list(layers)), f"{source}: [calibration] corners")
    for name in names:
        _check_corner(name, layers, f"{source}: [calibration] corners")
    holdout = table.get("holdout_laps", [])
    if not isinstance(holdout, list) or not all(isinstance(i, int) and not isinstance(i, bool) and i >= 1
                                                for i in holdout):
        raise ScenarioError(f"{source}: [calibration] holdout_laps must be a list of lap numbers from 1, got {shown(holdout)}")
    channels = tuple(_channel(name, t, layers, source) for name, t in _tables(table, "channels", source).items())
    parameters = tuple(_parameter(name, t, names, layers, source)
                       for name, t in _tables(table, "parameters", source).items())
    if not parameters:
        raise ScenarioError(f"{source}: [calibration] needs at least one [calibration.parameters.NAME] table")
    peaks_raw = table.get("peaks", [])
    if not isinstance(peaks_raw, list) or not all(isinstance(p, dict) for p in peaks_raw):
        raise ScenarioError(f"{source}: [calibration] peaks go in [[calibration.peaks]] tables")
    peaks = tuple(_peak(i, p, layers, source) for i, p in enumerate(peaks_raw, start=1))
    if not channels and not peaks:
        raise ScenarioError(f"{source}: [calibration] needs measured channels ([calibration.channels.temp_<what>]) "
                            "or peak readings ([[calibration.peaks]])")
    return Calibration(top["duty"], names, tuple(sorted(set(holdout))), top["lap_length_m"], top["time_offset_s"],
                       top["sample_s"], top["max_evaluations"], channels, parameters, peaks)


def _tables(table: dict, key: str, source: str) -> dict:
    sub = table.get(key, {})
    if not isinstance(sub, dict) or not all(isinstance(v, dict) for v in sub.values()):
        raise ScenarioError(f"{source}: [calibration] {key} go in named tables, e.g. [calibration.{key}.NAME]")
    return sub


def _names(value, at: str) -> tuple[str, ...]:
    if not isinstance(value, list) or not value or not all(isinstance(v, str) for v in value):
        raise ScenarioError(f"{at} must be a non-empty list of corner names, got {shown(value)}")
    return tuple(dict.fromkeys(value))


def _check_corner(name: str, layers: dict, at: str) -> None:
    if name not in layers:
        raise ScenarioError(f"{at}: unknown corner {shown(name)}{suggestion(name, layers)}; "
                            f"the scenario has: {', '.join(layers)}")


def _check_node(corner: str, node: str, layers: dict, at: str) -> None:
    if node == "disc_surface" and layers[corner] == 1:
        raise ScenarioError(f"{at}: node 'disc_surface' needs a layered disc (corners.{corner}.disc.layers > 1); "
                            "use node = \"disc\" for the bulk temperature")


def _channel(name: str, t: dict, layers: dict, source: str) -> ChannelMap:
    where = f"calibration.channels.{name}"
    if not CHANNEL_NAME.fullmatch(name):
        raise ScenarioError(f"{source}: [{where}] a channel name is the CSV column without its unit, "
                            "temp_<what> in lower case, e.g. temp_disc_front")
    v = convert_table(where, t, CHANNEL, source)
    _check_corner(v["corner"], layers, f"{source}: [{where}] corner")
    _check_node(v["corner"], v["node"], layers, f"{source}: [{where}]")
    return ChannelMap(name, **v)


def _parameter(name: str, t: dict, default_corners, layers: dict, source: str) -> FitParameter:
    where = f"calibration.parameters.{name}"
    corners = _names(t["corners"], f"{source}: [{where}] corners") if "corners" in t else default_corners
    for c in corners:
        _check_corner(c, layers, f"{source}: [{where}] corners")
    v = convert_table(where, {k: val for k, val in t.items() if k != "corners"}, PARAMETER, source)
    low_limit, high_limit = PARAMETER_KEYS[v["key"]]
    lower, upper, prior = v["lower"], v["upper"], v["prior"]
    if not (lower > low_limit and (high_limit is None or upper <= high_limit)):
        span = f"above {low_limit:g}" + ("" if high_limit is None else f" and at most {high_limit:g}")
        raise ScenarioError(f"{source}: [{where}] lower and upper must be {span}, got {lower:g} and {upper:g}")
    if not lower < upper:
        raise ScenarioError(f"{source}: [{where}] lower must be below upper, got {lower:g} and {upper:g}")
    if not lower <= prior <= upper:
        raise ScenarioError(f"{source}: [{where}] prior {prior:g} must lie within [lower, upper] = [{lower:g}, {upper:g}]")
    return FitParameter(name, v["key"], corners, prior, lower, upper, v["prior_std"])


def _peak(i: int, t: dict, layers: dict, source: str) -> PeakObservation:
    where = f"calibration.peaks #{i}"
    v = convert_table(where, t, PEAK, source)
    _check_corner(v["corner"], layers, f"{source}: [{where}] corner")
    _check_node(v["corner"], v["node"], layers, f"{source}: [{where}]")
    name = v.pop("name") or (f"{v['corner']} {v['node']} {v['kind'].replace('_', ' ')} "
                             f"{v['temperature_k'] - KELVIN_AT_0C:g} degC")
    return PeakObservation(name=name, **v)
