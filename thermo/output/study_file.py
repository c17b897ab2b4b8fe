"""A study's HDF5 file (sweep.h5, uncertainty.h5): written whole after every finished chunk, each
time atomically, so that an interrupted study leaves a valid file saying how many points it
holds, and ``--resume`` can continue it.

Layout (format "brakeheat-study", format_version 1):

- root attrs: format, format_version, kind ("sweep" or "uncertainty"), brakeheat_version,
  scenario (its name), scenario_text (the file as read), definition_json (what the study is:
  keys, values or distributions, overrides, stints, settle, seed ...; ``--resume`` continues only
  the same study), keys (string array), points_total, points_done, complete (bool), caution,
  statistics_json (uncertainty only, once complete: what ``uncertainty --json`` prints)
- ``done`` (P) bool: which points have run
- ``values`` (P x K) float: each point's value of each key (NaN where a value is not a number);
  ``values_json`` (P) strings: the same values as JSON lists (text values included)
- ``points_json`` (P) strings: each finished point as ``sweep --json`` prints it ("" if not run)
- ``corners/<corner>/peak_c`` (P x n_nodes) [degC], attr nodes;
  ``corners/<corner>/checks/{limit_c, peak_c, margin_k}`` (P x n_checks) [degC, degC, K] and
  ``status`` (P x n_checks) strings, attrs names and nodes; NaN and "" where a point has not run
  or failed
"""
from __future__ import annotations

import json
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from lapdata.echo import shown
from thermo.output.atomic import atomic_path
from thermo.output.errors import OutputError

FORMAT = "brakeheat-study"
FORMAT_VERSION = 1


@dataclass
class StudyRecord:
    """A study's definition and its points so far (``points[i]`` None: not run yet)."""

    kind: str
    scenario: str
    scenario_text: str
    definition: dict
    keys: tuple
    values: list
    points: list = field(default_factory=list)
    statistics: dict | None = None

    def __post_init__(self):
        if not self.points:
            self.points = [None] * len(self.values)

    @property
    def done(self) -> int:
        return sum(p is not None for p in self.points)

    @property
    def complete(self) -> bool:
        return self.done == len(self.values)


def _number(value) -> float:
    return float(value) if isinstance(value, (int, float)) and not isinstance(value, bool) else np.nan


def _corner_tables(points: list) -> dict:
    """Per corner (first point that ran decides names and order): nodes, check names and nodes."""
    layout = {}
    for p in points:
        for c in (p or {}).get("corners", []):
            if c["name"] not in layout:
                layout[c["name"]] = (list(c["peak_c"]), [k["name"] for k in c["checks"]], [k["node"] for k in c["checks"]])
    return layout


def write_study_hdf5(record: StudyRecord, path) -> None:
    """Write the whole study record to ``path`` atomically (temporary file, then rename)."""
    import h5py
    import thermo
    text = h5py.string_dtype()
    P, K = len(record.values), len(record.keys)
    with atomic_path(path) as tmp, h5py.File(tmp, "w") as f:
        attrs = {"format": FORMAT, "format_version": FORMAT_VERSION, "kind": record.kind,
                 "brakeheat_version": thermo.__version__, "scenario": record.scenario,
                 "scenario_text": record.scenario_text, "definition_json": json.dumps(record.definition, sort_keys=True),
                 "points_total": P, "points_done": record.done, "complete": record.complete, "caution": thermo.CAUTION}
        for key, value in attrs.items():
            f.attrs[key] = value
        f.attrs["keys"] = np.array(list(record.keys), dtype=text)
        if record.statistics is not None:
            f.attrs["statistics_json"] = json.dumps(record.statistics, allow_nan=False)
        f.create_dataset("done", data=np.array([p is not None for p in record.points], dtype=bool))
        f.create_dataset("values", data=np.array([[_number(v) for v in row] for row in record.values],
                                                 dtype=float).reshape(P, K))
        f.create_dataset("values_json", data=np.array([json.dumps(list(row)) for row in record.values], dtype=text))
        f.create_dataset("points_json", data=np.array(["" if p is None else json.dumps(p, allow_nan=False)
                                                       for p in record.points], dtype=text))
        corners = f.create_group("corners")
        for name, (nodes, checks, check_nodes) in _corner_tables(record.points).items():
            g = corners.create_group(name)
            peak = np.full((P, len(nodes)), np.nan)
            tables = {k: np.full((P, len(checks)), np.nan) for k in ("limit_c", "peak_c", "margin_k")}
            status = np.full((P, len(checks)), "", dtype=object)
            for i, p in enumerate(record.points):
                c = next((c for c in (p or {}).get("corners", []) if c["name"] == name), None)
                if c is None:
                    continue
                peak[i] = [c["peak_c"].get(n, np.nan) for n in nodes]
                by_name = {k["name"]: k for k in c["checks"]}
                for j, check in enumerate(checks):
                    if check in by_name:
                        for key, table in tables.items():
                            table[i, j] = by_name[check][key]
                        status[i, j] = by_name[check]["status"]
            d = g.create_dataset("peak_c", data=peak)
            d.attrs["nodes"] = np.array(nodes, dtype=text)
            cg = g.create_group("checks")
            for key, table in tables.items():
                cg.create_dataset(key, data=table)
            cg.create_dataset("status", data=status.astype(str).astype(object), dtype=text)
            cg.attrs["names"] = np.array(checks, dtype=text)
            cg.attrs["nodes"] = np.array(check_nodes, dtype=text)


def read_study_hdf5(path) -> StudyRecord:
    """A study file back as a ``StudyRecord`` (its finished points and its definition)."""
    import h5py
    try:
        handle = h5py.File(path, "r")
    except (OSError, ValueError) as exc:
        raise OutputError(f"{path}: cannot be opened as an HDF5 file ({exc})") from None
    with handle as f:
        fmt = f.attrs.get("format")
        if fmt != FORMAT or f.attrs.get("format_version") != FORMAT_VERSION:
            raise OutputError(f"{path}: not a brakeheat study file (format {shown(fmt)}, expected {FORMAT} "
                              f"version {FORMAT_VERSION})")
        try:
            values = [json.loads(v) for v in f["values_json"].asstr()[()]]
            points = [json.loads(p) if p else None for p in f["points_json"].asstr()[()]]
            statistics = json.loads(f.attrs["statistics_json"]) if "statistics_json" in f.attrs else None
            return StudyRecord(kind=str(f.attrs["kind"]), scenario=str(f.attrs["scenario"]),
                               scenario_text=str(f.attrs["scenario_text"]),
                               definition=json.loads(f.attrs["definition_json"]),
                               keys=tuple(str(k) for k in f.attrs["keys"]), values=values, points=points,
                               statistics=statistics)
        except (KeyError, ValueError, TypeError) as exc:
            raise OutputError(f"{path}: a damaged study file ({exc})") from None


def resumable(path: Path, record: StudyRecord) -> StudyRecord:
    """The finished points of the study file at ``path`` carried into ``record`` (the same study:
    same kind, scenario text and definition, else a one-line error saying what differs)."""
    old = read_study_hdf5(path)
    for what, mine, theirs in (("kind", record.kind, old.kind), ("scenario text", record.scenario_text, old.scenario_text),
                               ("definition", record.definition, old.definition), ("points", record.values, old.values)):
        if mine != theirs:
            raise OutputError(f"{path}: --resume: the file holds a different study (its {what} differs); "
                              "remove the file or write to another --out folder")
    record.points = old.points
    return record
