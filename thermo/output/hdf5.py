"""The results file: one documented HDF5 layout, written atomically, read back exactly.

Layout (format "brakeheat-results", format_version 2; every array kept bit for bit):

- root attrs: format, format_version, scenario_name, scenario_text, version, solver,
  solver_status, caution, references (string array), warnings (string array), overrides (string
  array of "dotted.key = TOML value", the --set and variant overrides applied on top of
  scenario_text; absent in files written before it), corners
  (string array: corner order), hydraulics_json (the hydraulics block as JSON; absent in files
  written before it)
- ``/corners/<corner>/`` attrs name, nodes, stop_time_s (NaN: no stop), extras_json (the corner's
  ``CornerFacts`` as ``thermo.output.facts.facts_dict`` makes them)
  - ``time_s`` (n_t) [s]; ``temperature_k`` (n_t x n_nodes) [K], attr nodes; ``speed_m_s`` (n_t)
    [m/s] and ``brake_power_w`` (n_t) [W], the car's speed and the friction heat into the corner
    at the stored rows (absent in files written before them)
  - ``link_energy_j`` (n_links) [J], attrs links, groups, sign_convention;
    ``link_flow_w`` (n_t x n_links) [W], same attrs, only when the run stored flows (``--store full``)
  - ``energy`` group, attrs heat_in_j, stored_j, lost_j [J], balance_rel_error [-]
  - ``checks/<check>`` groups with attrs node, limit_k, peak_k, peak_time_s, margin_k,
    status, caution_band_k, source; ``checks`` attr order
  - ``margins/<check>`` scalar datasets margin_k [K]
  - ``laps/`` index, phase, t_start_s, t_end_s, braking_energy_j, max_k and min_k
    (n_laps x n_lap_nodes, attr nodes; NaN where max_k_present/min_k_present is false),
    link_energy_j (n_laps x n_links) [J]
  - ``phases/`` name, kind, t_start_s, t_end_s, link_energy_j (n_phases x n_links) [J]

Version 1 files (every run before this layout) also held ``temperature/<node>``, a copy of each
column of ``temperature_k``, and always ``link_flow_w``, with no per-lap or per-phase link
energies; ``read_results_hdf5`` reads both versions.
"""
from __future__ import annotations

import math

import h5py
import numpy as np

from lapdata.echo import shown
from thermo.output.atomic import atomic_path
from thermo.output.errors import OutputError
from thermo.output.facts import facts_dict, facts_from_dict
from thermo.output.jsonable import decode_exact, encode_exact
from thermo.results import CheckResult, CornerResult, EnergyBalance, LapSpan, PhaseSpan, Results

FORMAT = "brakeheat-results"
FORMAT_VERSION = 2
READABLE_VERSIONS = (1, 2)
COMPRESS_MIN_ELEMENTS = 1024      # smaller datasets are stored plainly
SIGN_CONVENTION = "positive from the link's first end to its second end"
_STR = h5py.string_dtype()


def _strings(values) -> np.ndarray:
    return np.array([str(v) for v in values], dtype=_STR)


def _override(line: str) -> tuple[str, str]:
    """("dotted.key", "TOML value") from the "dotted.key = TOML value" the file stores."""
    key, _, value = line.partition(" = ")
    return key, value


def _name_ok(name: str, what: str, where: str) -> str:
    if not isinstance(name, str) or not name or "/" in name or name in (".", ".."):
        raise OutputError(f"{where}: {what} {shown(name)} cannot name an HDF5 object "
                          "(expected a non-empty name without '/')")
    return name


def _unique(names, what: str, where: str) -> None:
    seen = set()
    for name in names:
        _name_ok(name, what, where)
        if name in seen:
            raise OutputError(f"{where}: {what} {shown(name)} appears twice; expected unique names")
        seen.add(name)


def _dataset(group: h5py.Group, name: str, data, **attrs) -> h5py.Dataset:
    array = np.asarray(data)
    options = {}
    if array.dtype != object and array.size >= COMPRESS_MIN_ELEMENTS:
        # gzip level 1: on the 24-hour demo 0.45 s against 0.6 s at level 4, for a file 1 % larger (18.4 MB)
        options = {"compression": "gzip", "compression_opts": 1, "shuffle": True}
    dataset = group.create_dataset(name, data=array, **options)
    for key, value in attrs.items():
        dataset.attrs[key] = value
    return dataset


def _write_laps(group: h5py.Group, laps: tuple[LapSpan, ...]) -> None:
    columns: list[str] = []
    for lap in laps:
        for node in list(lap.max_k) + list(lap.min_k):
            if node not in columns:
                columns.append(node)
    shape = (len(laps), len(columns))
    for key in ("max_k", "min_k"):
        values = np.full(shape, np.nan)
        present = np.zeros(shape, dtype=bool)
        for i, lap in enumerate(laps):
            for node, kelvin in getattr(lap, key).items():
                j = columns.index(node)
                values[i, j] = kelvin
                present[i, j] = True
        _dataset(group, key, values, nodes=_strings(columns), units="K")
        _dataset(group, f"{key}_present", present, nodes=_strings(columns))
    _dataset(group, "index", np.array([lap.index for lap in laps], dtype=np.int64))
    _dataset(group, "phase", _strings(lap.phase for lap in laps))
    for key in ("t_start_s", "t_end_s"):
        _dataset(group, key, np.array([getattr(lap, key) for lap in laps], dtype=float), units="s")
    _dataset(group, "braking_energy_j", np.array([lap.braking_energy_j for lap in laps], dtype=float), units="J")


def _write_corner(group: h5py.Group, corner: CornerResult, where: str, series_in_file: bool = False) -> None:
    """One corner's group; ``series_in_file``: its series (time_s, temperature_k, speed_m_s,
    brake_power_w, link_flow_w) were streamed into the group already (``thermo.output.hdf5_stream``),
    and the corner's own series are not written."""
    _unique(corner.node_names, "node", where)
    _unique([c.name for c in corner.checks], "check", where)
    n_t = np.shape(corner.time_s)[0]
    if np.shape(corner.temperatures_k) != (n_t, len(corner.node_names)):
        raise OutputError(f"{where}: temperatures_k has shape {np.shape(corner.temperatures_k)}, "
                          f"expected ({n_t}, {len(corner.node_names)})")
    flows_ok = corner.link_flows_w is None or np.shape(corner.link_flows_w) == (n_t, len(corner.link_names))
    if not flows_ok or len(corner.link_groups) != len(corner.link_names) or \
            np.shape(corner.link_energy_j) != (len(corner.link_names),):
        raise OutputError(f"{where}: link_flows_w, link_groups and link_energy_j must match "
                          f"{len(corner.link_names)} links and {n_t} samples")
    group.attrs["name"] = corner.name
    group.attrs["nodes"] = _strings(corner.node_names)
    group.attrs["stop_time_s"] = math.nan if corner.stop_time_s is None else float(corner.stop_time_s)
    group.attrs["extras_json"] = encode_exact(facts_dict(corner.facts), f"{where} extras")
    links = dict(links=_strings(corner.link_names), groups=_strings(corner.link_groups))
    if not series_in_file:
        _write_series(group, corner, n_t, where, links)
    _dataset(group, "link_energy_j", corner.link_energy_j, units="J", sign_convention=SIGN_CONVENTION, **links)
    energy = group.create_group("energy")
    for key in ("heat_in_j", "stored_j", "lost_j"):
        energy.attrs[key] = float(getattr(corner.energy, key))
    energy.attrs["balance_rel_error"] = float(corner.energy.balance_rel_error)
    energy.attrs["units"] = "J"
    checks = group.create_group("checks", track_order=True)
    checks.attrs["order"] = _strings(c.name for c in corner.checks)
    margins = group.create_group("margins", track_order=True)
    for check in corner.checks:
        item = checks.create_group(check.name)
        for key in ("node", "status", "source"):
            item.attrs[key] = getattr(check, key)
        for key in ("limit_k", "peak_k", "peak_time_s", "margin_k", "caution_band_k"):
            item.attrs[key] = float(getattr(check, key))
        _dataset(margins, check.name, float(check.margin_k), units="K", node=check.node)
    _write_laps(group.create_group("laps"), corner.laps)
    _link_energies(group["laps"], corner.laps, len(corner.link_names), where, links)
    phases = group.create_group("phases")
    _dataset(phases, "name", _strings(p.name for p in corner.phases))
    _dataset(phases, "kind", _strings(p.kind for p in corner.phases))
    for key in ("t_start_s", "t_end_s"):
        _dataset(phases, key, np.array([getattr(p, key) for p in corner.phases], dtype=float), units="s")
    _link_energies(phases, corner.phases, len(corner.link_names), where, links)


def _write_series(group: h5py.Group, corner: CornerResult, n_t: int, where: str, links: dict) -> None:
    _dataset(group, "time_s", corner.time_s, units="s")
    _dataset(group, "temperature_k", corner.temperatures_k, units="K", nodes=_strings(corner.node_names))
    for key, values, units in (("speed_m_s", corner.speed_m_s, "m/s"), ("brake_power_w", corner.brake_power_w, "W")):
        if values is not None:
            if np.shape(values) != (n_t,):
                raise OutputError(f"{where}: {key} has shape {np.shape(values)}, expected ({n_t},)")
            _dataset(group, key, values, units=units)
    if corner.link_flows_w is not None:
        _dataset(group, "link_flow_w", corner.link_flows_w, units="W", sign_convention=SIGN_CONVENTION, **links)


def _link_energies(group: h5py.Group, spans, n_links: int, where: str, links: dict) -> None:
    """``link_energy_j`` (n_spans x n_links) of laps or phases, when every span carries it."""
    if not spans or any(span.link_energy_j is None for span in spans):
        return
    values = np.array([span.link_energy_j for span in spans], dtype=float)
    if values.shape != (len(spans), n_links):
        raise OutputError(f"{where}: a lap or phase carries {values.shape[-1]} link energies, expected {n_links}")
    _dataset(group, "link_energy_j", values, units="J", sign_convention=SIGN_CONVENTION, **links)


def _span_energies(r, group, count: int) -> list:
    """Each span's link energies (a tuple) from ``link_energy_j``, or None for each (version 1)."""
    if "link_energy_j" not in group:
        return [None] * count
    values = r.array(group, "link_energy_j")
    return [tuple(map(float, values[i])) for i in range(count)]


def write_results_hdf5(results: Results, path) -> None:
    """Write a run to ``path`` in the layout above, atomically (an old file is replaced only on success).

    Parameters
    ----------
    results : Results
        A finished run [-]
    path : str or os.PathLike
        Destination .h5 file [-]
    """
    _unique([c.name for c in results.corners], "corner", f"{path}")
    with atomic_path(path) as tmp:
        with h5py.File(tmp, "w", track_order=True) as f:
            write_results_into(f, results, path)


def write_results_into(f: h5py.File, results: Results, path, streamed=()) -> None:
    """The layout above into the open file ``f`` (``path`` names it in messages); the corners named
    in ``streamed`` already hold their series in ``/corners/<corner>`` (``thermo.output.hdf5_stream``)."""
    f.attrs["format"] = FORMAT
    f.attrs["format_version"] = FORMAT_VERSION
    for key in ("scenario_name", "scenario_text", "version", "solver", "solver_status", "caution"):
        f.attrs[key] = getattr(results, key)
    f.attrs["references"] = _strings(results.references)
    f.attrs["warnings"] = _strings(results.warnings)
    f.attrs["overrides"] = _strings(f"{key} = {value}" for key, value in results.overrides)
    f.attrs["corners"] = _strings(c.name for c in results.corners)
    if results.hydraulics is not None:
        f.attrs["hydraulics_json"] = encode_exact(results.hydraulics, f"{path} hydraulics")
    corners = f["corners"] if "corners" in f else f.create_group("corners", track_order=True)
    for corner in results.corners:
        group = corners[corner.name] if corner.name in streamed else corners.create_group(corner.name)
        _write_corner(group, corner, f"{path} corner {corner.name}", series_in_file=corner.name in streamed)


class _Reader:
    """Reads with messages that name the file and the object path."""

    def __init__(self, path):
        self.path = path

    def obj(self, parent, key):
        try:
            return parent[key]
        except KeyError:
            raise OutputError(f"{self.path}: missing '{parent.name.rstrip('/')}/{key}' "
                              f"(expected a {FORMAT} file)") from None

    def attr(self, obj, key):
        try:
            return obj.attrs[key]
        except KeyError:
            raise OutputError(f"{self.path}: '{obj.name}' lacks attribute '{key}'") from None

    def text(self, obj, key) -> str:
        return str(self.attr(obj, key))

    def texts(self, obj, key) -> tuple[str, ...]:
        return tuple(str(v) for v in np.asarray(self.attr(obj, key)).ravel())

    def array(self, parent, key) -> np.ndarray:
        return self.obj(parent, key)[()]

    def text_array(self, parent, key) -> list[str]:
        return list(self.obj(parent, key).asstr()[()])


def _plain(value):
    """numpy scalars as Python values, for messages and comparisons."""
    return value.item() if isinstance(value, np.generic) else value


def _read_laps(r: _Reader, group) -> tuple[LapSpan, ...]:
    index = r.array(group, "index")
    phase = r.text_array(group, "phase")
    start, end = r.array(group, "t_start_s"), r.array(group, "t_end_s")
    energy = r.array(group, "braking_energy_j")
    tables = {}
    for key in ("max_k", "min_k"):
        values, present = r.array(group, key), r.array(group, f"{key}_present")
        nodes = r.texts(r.obj(group, key), "nodes")
        tables[key] = [{n: float(values[i, j]) for j, n in enumerate(nodes) if present[i, j]}
                       for i in range(len(index))]
    links = _span_energies(r, group, len(index))
    return tuple(LapSpan(index=int(index[i]), phase=phase[i], t_start_s=float(start[i]), t_end_s=float(end[i]),
                         min_k=tables["min_k"][i], max_k=tables["max_k"][i], braking_energy_j=float(energy[i]),
                         link_energy_j=links[i])
                 for i in range(len(index)))


def _read_corner(r: _Reader, group) -> CornerResult:
    checks_group = r.obj(group, "checks")
    checks = []
    for name in r.texts(checks_group, "order"):
        item = r.obj(checks_group, name)
        checks.append(CheckResult(
            name=name, node=r.text(item, "node"), limit_k=float(r.attr(item, "limit_k")),
            peak_k=float(r.attr(item, "peak_k")), peak_time_s=float(r.attr(item, "peak_time_s")),
            margin_k=float(r.attr(item, "margin_k")), status=r.text(item, "status"),
            caution_band_k=float(r.attr(item, "caution_band_k")), source=r.text(item, "source")))
    phases_group = r.obj(group, "phases")
    names, kinds = r.text_array(phases_group, "name"), r.text_array(phases_group, "kind")
    p_start, p_end = r.array(phases_group, "t_start_s"), r.array(phases_group, "t_end_s")
    phase_links = _span_energies(r, phases_group, len(names))
    phases = tuple(PhaseSpan(names[i], kinds[i], float(p_start[i]), float(p_end[i]), phase_links[i])
                   for i in range(len(names)))
    energy = r.obj(group, "energy")
    flows = r.obj(group, "link_flow_w") if "link_flow_w" in group else None
    named = r.obj(group, "link_energy_j") if flows is None else flows
    stop = float(r.attr(group, "stop_time_s"))
    return CornerResult(
        name=r.text(group, "name"),
        node_names=r.texts(group, "nodes"),
        time_s=r.array(group, "time_s"),
        temperatures_k=r.array(group, "temperature_k"),
        link_names=r.texts(named, "links"),
        link_groups=r.texts(named, "groups"),
        link_flows_w=None if flows is None else flows[()],
        link_energy_j=r.array(group, "link_energy_j"),
        energy=EnergyBalance(*(float(r.attr(energy, k)) for k in ("heat_in_j", "stored_j", "lost_j"))),
        checks=tuple(checks),
        laps=_read_laps(r, r.obj(group, "laps")),
        phases=phases,
        stop_time_s=None if math.isnan(stop) else stop,
        facts=facts_from_dict(decode_exact(r.text(group, "extras_json")), f"{r.path}: '{group.name}' extras_json"),
        speed_m_s=r.array(group, "speed_m_s") if "speed_m_s" in group else None,
        brake_power_w=r.array(group, "brake_power_w") if "brake_power_w" in group else None,
    )


def read_results_hdf5(path) -> Results:
    """Read a results file written by :func:`write_results_hdf5` back into an equal ``Results``.

    Parameters
    ----------
    path : str or os.PathLike
        A .h5 file in the brakeheat-results layout [-]

    Returns
    -------
    Results
        The run as written: arrays bit-identical, every field equal [-]
    """
    try:
        handle = h5py.File(path, "r")
    except (OSError, ValueError) as exc:
        raise OutputError(f"{path}: cannot be opened as an HDF5 file ({exc})") from None
    r = _Reader(path)
    with handle as f:
        fmt, version = (_plain(f.attrs.get(key)) for key in ("format", "format_version"))
        if fmt != FORMAT:
            raise OutputError(f"{path}: attribute 'format' is {shown(fmt)}, expected {shown(FORMAT)}")
        if version not in READABLE_VERSIONS:
            raise OutputError(f"{path}: format_version {shown(version)} is not supported, expected one of "
                              f"{', '.join(map(str, READABLE_VERSIONS))}")
        corners_group = r.obj(f, "corners")
        corners = tuple(_read_corner(r, r.obj(corners_group, name)) for name in r.texts(f, "corners"))
        return Results(
            scenario_name=r.text(f, "scenario_name"), scenario_text=r.text(f, "scenario_text"),
            version=r.text(f, "version"), solver=r.text(f, "solver"), solver_status=r.text(f, "solver_status"),
            references=r.texts(f, "references"), corners=corners, caution=r.text(f, "caution"),
            warnings=r.texts(f, "warnings"),
            overrides=tuple(_override(line) for line in (r.texts(f, "overrides") if "overrides" in f.attrs else ())),
            hydraulics=decode_exact(r.text(f, "hydraulics_json")) if "hydraulics_json" in f.attrs else None)
