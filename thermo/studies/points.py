"""One point of a study (a sweep or an uncertainty study): the scenario with some keys set, run
through the same chain as ``brakeheat run``, and kept only as its peaks and margins.

A point keeps, per corner, every output node's peak and every limit check (limit, peak, margin,
status), and with ``settle`` the laps the corner takes from ambient to come within 1 K of its
settled lap. No time series is kept unless asked (``keep_series``), so a point costs its peaks,
not its run. ``StudyJob`` and the chunks of points are plain data: they travel to worker
processes (or Dask workers) by pickling, and each worker reads the scenario file itself (on a
cluster the scenario's folder must be readable at the same path on every worker).
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from lapdata.units import kelvin_to_celsius
from thermo.errors import BrakeheatError


@dataclass(frozen=True)
class StudyJob:
    """What every point of one study shares.

    Attributes
    ----------
    scenario_path : str
        The scenario TOML file [-]
    overrides : tuple of (str, object)
        ``--set`` overrides applied to every point, before its own [-]
    keys : tuple of str
        The dotted keys each point sets, in the order of its values [-]
    stints : int
        Run the plan up to and including its ``stints``-th pit stop (0: the whole plan) [-]
    settle : bool
        Also the laps each corner takes to settle (``thermo.chain.settle``) [-]
    keep_series : bool
        Keep each point's stored temperature series (memory grows with the points) [-]
    lanes : bool
        Run the points of a chunk that share their drive side by side (``thermo.studies.lanes``);
        False: every point alone, as ``brakeheat run`` runs it [-]
    """

    scenario_path: str
    overrides: tuple = ()
    keys: tuple = ()
    stints: int = 0
    settle: bool = False
    keep_series: bool = False
    lanes: bool = True


def first_stints(segments, stints: int) -> list:
    """The plan's segments up to and including those of its ``stints``-th pit stop (the stop's
    heat soak belongs to the stint before it); the whole plan if it has fewer stops or ``stints`` is 0."""
    if stints <= 0:
        return list(segments)
    stops = []
    for segment in segments:
        if segment.phase.kind == "pit_stop" and segment.phase_index not in stops:
            stops.append(segment.phase_index)
    if len(stops) < stints:
        return list(segments)
    last = stops[stints - 1]
    return [s for s in segments if s.phase_index <= last]


def point_scenario(job: StudyJob, values) -> object:
    """The scenario of one point: the job's overrides, then the point's (key, value) pairs. The
    file is read and parsed once per worker while it stays the same (``_scenario_file``)."""
    from thermo.scenario.reader import scenario_from_dict
    path, raw, text = _scenario_file(job.scenario_path)
    return scenario_from_dict(raw, path=path, text=text, overrides=list(job.overrides) + list(zip(job.keys, values)))


_FILES: dict = {}     # scenario path -> ((mtime, size), path, parsed, text), this worker's last read


def _scenario_file(name: str) -> tuple:
    """(path, parsed TOML, text) of a scenario file, parsed again only when its time or size changed
    (``scenario_from_dict`` works on a copy, so the parsed document is never changed)."""
    from lapdata.files import read_toml_file
    from thermo.errors import ScenarioError
    path = Path(name)
    try:
        stat = path.stat()
        stamp = (stat.st_mtime_ns, stat.st_size)
    except OSError:
        stamp = None
    kept = _FILES.get(name)
    if stamp is None or kept is None or kept[0] != stamp:
        raw, text = read_toml_file(path, "scenario file", ScenarioError)
        kept = _FILES[name] = (stamp, path, raw, text)
    return kept[1:]


def run_point(job: StudyJob, values) -> dict:
    """One point run and reduced: {"values": {key: value}, "corners": [...]} as ``sweep --json``
    prints it, or {"values", "corners": [], "error": message} when its scenario cannot be run."""
    from thermo.chain import run_scenario
    from thermo.chain.plan import expand_plan

    out = {"values": {k: _plain(v) for k, v in zip(job.keys, values)}}
    try:
        scenario = point_scenario(job, values)
        results = run_scenario(scenario, segments=first_stints(expand_plan(scenario), job.stints))
        settled = _laps_to_settle(scenario) if job.settle else {}
    except BrakeheatError as error:
        return {**out, "corners": [], "error": str(error)}
    out["corners"] = [corner_point(c, settled.get(c.name), job.keep_series) for c in results.corners]
    return out


def corner_point(corner, laps_to_settle=None, keep_series: bool = False) -> dict:
    """A corner's peaks [degC] and checks, rounded as ``run --json`` rounds them (0.01 K)."""
    entry = corner_entry(corner.name, corner.node_names, np.max(corner.temperatures_k, axis=0), corner.checks,
                         laps_to_settle)
    if keep_series:
        entry["series"] = {"time_s": corner.time_s.tolist(),
                           "temperature_c": {n: kelvin_to_celsius(corner.temperature(n)).round(2).tolist()
                                             for n in corner.node_names}}
    return entry


def corner_entry(name: str, node_names, peaks_k, checks, laps_to_settle=None) -> dict:
    """One corner of a point: {"name", "peak_c": {node: degC}, "checks": [...]} (and
    "laps_to_settle"), rounded as ``run --json`` rounds them (0.01 K); ``checks`` CheckResults."""
    c2 = lambda k: round(float(kelvin_to_celsius(k)), 2)
    entry = {
        "name": name,
        "peak_c": {node: c2(peak) for node, peak in zip(node_names, peaks_k)},
        "checks": [{"name": k.name, "node": k.node, "limit_c": c2(k.limit_k), "peak_c": c2(k.peak_k),
                    "margin_k": round(float(k.margin_k), 2), "status": k.status} for k in checks],
    }
    if laps_to_settle is not None:
        entry["laps_to_settle"] = int(laps_to_settle)
    return entry


def _laps_to_settle(scenario) -> dict:
    """Per corner, laps from ambient to within 1 K of the settled lap of the first 'laps' phase."""
    from thermo.studies.settle import settle
    return {r.corner: r.laps_to_1k for r in settle(scenario)}


def _plain(value):
    """A value as JSON has it (numpy scalars to Python numbers)."""
    if isinstance(value, np.generic):
        return value.item()
    return value
