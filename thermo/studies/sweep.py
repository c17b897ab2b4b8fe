"""A sweep: the scenario run at every point of a grid (or a zip) of values of some of its keys.

``--vary KEY=SPEC`` takes any dotted key ``--set`` takes; SPEC is

- a TOML list: ``[5000, 7000, 9000]`` or ``["pad_semi_metallic", "pad_carbon_ceramic"]``;
- a range ``LOW:HIGH:COUNT``, evenly spaced, or ``LOW:HIGH:COUNT:log``, evenly spaced in the
  logarithm (both ends included; ``lin`` may be written for the even spacing);
- one value.

Several keys make a full grid (every combination, the last key varying fastest), or with ``zip``
go together point by point (lists of one length). Every value of every key is checked against
the scenario before anything runs; a combination the scenario refuses (an inner diameter above
the outer one, say) is a failed point, named in the table, and the others still run.
"""
from __future__ import annotations

import itertools
import math
from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from thermo.errors import BrakeheatError
from thermo.studies.engine import StudyError

MAX_POINTS = 1_000_000
MAX_COUNT = 100_000


@dataclass(frozen=True)
class Varied:
    """One varied key and its values, in the key's own TOML unit."""

    key: str
    values: tuple
    spec: str             # as given, for the record


def parse_vary(text: str) -> Varied:
    """'KEY=SPEC' (see the module notes) -> Varied."""
    from thermo.scenario.overrides import parse_value
    from thermo.scenario.schema import key_field
    if "=" not in text:
        raise StudyError(f"--vary {shown(text)}: expected KEY=SPEC, e.g. corners.front.ducts.main.inlet_area_mm2=4000:12000:9")
    key, spec = (s.strip() for s in text.split("=", 1))
    if not key or not all(part.replace("_", "").replace("-", "").isalnum() for part in key.split(".")):
        raise StudyError(f"--vary {shown(text)}: the key must be dotted names, e.g. corners.front.pad.thickness_mm")
    declared = key_field(key)
    if ":" in spec and not spec.startswith(("[", '"', "'")):
        values = _range_values(key, spec)
    else:
        try:
            value = parse_value(spec, f"--vary {key}")
        except BrakeheatError as error:
            raise StudyError(str(error)) from None
        values = tuple(value) if isinstance(value, list) else (value,)
    if not values:
        raise StudyError(f"--vary {key}: the list is empty; give at least one value")
    if declared is not None and declared.kind is int:
        values = tuple(_whole(key, v) for v in values)
    return Varied(key, values, spec)


def _range_values(key: str, spec: str) -> tuple:
    parts = spec.split(":")
    if len(parts) not in (3, 4) or (len(parts) == 4 and parts[3] not in ("lin", "log")):
        raise StudyError(f"--vary {key}={shown(spec)}: a range is LOW:HIGH:COUNT or LOW:HIGH:COUNT:log "
                         "(or :lin), e.g. 4000:12000:9")
    try:
        low, high = float(parts[0]), float(parts[1])
        count = int(parts[2])
    except ValueError:
        raise StudyError(f"--vary {key}={shown(spec)}: LOW and HIGH must be numbers and COUNT a whole number") from None
    if not (math.isfinite(low) and math.isfinite(high)):
        raise StudyError(f"--vary {key}={shown(spec)}: LOW and HIGH must be finite numbers")
    if not 1 <= count <= MAX_COUNT:
        raise StudyError(f"--vary {key}={shown(spec)}: COUNT must be from 1 to {MAX_COUNT}, got {count}")
    if len(parts) == 4 and parts[3] == "log":
        if low <= 0 or high <= 0:
            raise StudyError(f"--vary {key}={shown(spec)}: a log range needs LOW and HIGH above 0")
        values = np.geomspace(low, high, count)
    else:
        values = np.linspace(low, high, count)
    return tuple(float(v) for v in values)


def _whole(key: str, value):
    """A value of a whole-number key: a float that is whole becomes an int."""
    if isinstance(value, float) and value.is_integer():
        return int(value)
    if isinstance(value, int) and not isinstance(value, bool):
        return value
    raise StudyError(f"--vary {key}: {shown(value)} is not a whole number, and this key takes whole numbers")


def sweep_values(varied: list[Varied], zip_keys: bool = False) -> list[list]:
    """Each point's values (one per varied key): the full grid, or point by point with ``zip_keys``."""
    if not varied:
        raise StudyError("sweep: give at least one --vary KEY=SPEC")
    keys = [v.key for v in varied]
    if len(set(keys)) != len(keys):
        twice = next(k for k in keys if keys.count(k) > 1)
        raise StudyError(f"--vary {twice}: the key is given twice; give each key once")
    if zip_keys:
        lengths = {v.key: len(v.values) for v in varied}
        if len(set(lengths.values())) > 1:
            raise StudyError("--zip: every --vary needs the same number of values, got "
                             + ", ".join(f"{k}: {n}" for k, n in lengths.items()))
        return [list(row) for row in zip(*(v.values for v in varied))]
    total = math.prod(len(v.values) for v in varied)
    if total > MAX_POINTS:
        raise StudyError(f"sweep: the grid has {total} points, more than {MAX_POINTS}; sweep fewer values or use --zip")
    return [list(row) for row in itertools.product(*(v.values for v in varied))]


def check_values(path, overrides, varied: list[Varied]) -> None:
    """Read the scenario once with each value of each key (alone) set, so that a value the scenario
    refuses stops the sweep before anything runs, naming the key and the value."""
    from thermo.scenario import load_scenario
    load_scenario(path, overrides)
    for v in varied:
        for value in dict.fromkeys(map(repr, v.values)).keys():
            actual = next(x for x in v.values if repr(x) == value)
            try:
                load_scenario(path, list(overrides) + [(v.key, actual)])
            except BrakeheatError as error:
                raise StudyError(f"--vary {v.key}={shown(actual)}: {error}") from None


def sweep(path, vary, *, zip_keys=False, overrides=(), stints=0, settle=False, keep_series=False,
          scheduler=None, workers=None, chunk_size=None, checkpoint=None, resume=False, progress=None,
          one_by_one=False):
    """Run a scenario at every point of a sweep.

    Parameters
    ----------
    path : str or Path
        Scenario TOML file [-]
    vary : sequence of str or Varied
        "KEY=SPEC" texts (see the module notes) or ``Varied`` [-]
    zip_keys : bool
        The keys go together point by point instead of a full grid [-]
    overrides : sequence of (str, object)
        Applied to every point first (``--set``) [-]
    stints : int
        Run the plan up to and including its n-th pit stop (0: the whole plan) [-]
    settle : bool
        Also each corner's laps to settle [-]
    keep_series : bool
        Keep each point's temperature series (memory grows with the points) [-]
    scheduler, workers, chunk_size : see ``thermo.studies.engine`` [-]
    checkpoint : str or Path or None
        The study file (sweep.h5) rewritten after each chunk [-]
    resume : bool
        Continue the study in ``checkpoint`` without redoing its finished points [-]
    progress : callable or None
        ``progress(points_done, points_total)`` [-]
    one_by_one : bool
        Run every point alone as ``brakeheat run`` runs it, not side by side in the kernel's lanes
        (``thermo.studies.lanes``) [-]

    Returns
    -------
    StudyRecord
        Every point's values and result (``sweep_dict`` makes the JSON) [-]
    """
    from thermo.studies.engine import run_study
    from thermo.studies.points import StudyJob
    varied = [v if isinstance(v, Varied) else parse_vary(v) for v in vary]
    values = sweep_values(varied, zip_keys)
    check_values(path, overrides, varied)
    definition = {"vary": [{"key": v.key, "spec": v.spec} for v in varied], "zip": bool(zip_keys),
                  "overrides": [[k, v] for k, v in overrides], "stints": int(stints), "settle": bool(settle)}
    if one_by_one:
        definition["one_by_one"] = True         # recorded only when asked: studies from before keep resuming
    job = StudyJob(str(path), tuple(overrides), tuple(v.key for v in varied), int(stints), bool(settle), bool(keep_series),
                   lanes=not one_by_one)
    return run_study("sweep", path, job, values, definition, scheduler=scheduler, workers=workers,
                     chunk_size=chunk_size, checkpoint=checkpoint, resume=resume, progress=progress)


def sweep_dict(record) -> dict:
    """JSON-ready, as ``sweep --json`` prints it: scenario, caution, varied (the keys), points
    (each {"values": {key: value}, "corners": [{"name", "peak_c", "checks": [...]}]}, in the sweep's
    order; a failed point has "error" and no corners), with version, stints and failed (the count)."""
    import thermo
    points = [p for p in record.points if p is not None]
    return {"scenario": record.scenario, "version": thermo.__version__, "caution": thermo.CAUTION,
            "varied": list(record.keys), "stints": record.definition.get("stints", 0),
            "points_total": len(record.values), "points_done": len(points),
            "failed": sum("error" in p for p in points), "points": points}
