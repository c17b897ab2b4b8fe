"""Build a lap without logged data: a track description, a car envelope and a quasi-steady lap.

Model (point mass, no combined braking and cornering): on a distance grid the speed limit is
the corner speed inside corners and the top speed elsewhere; a forward pass accelerates from
each point as hard as power, traction and drag allow, a backward pass brakes into each limit as
hard as tyres (with downforce) and drag allow, and the lower speed wins at each point. Passes
with constant acceleration over a step are exact on the grid (``v2^2 = v1^2 + 2 a ds``); the
acceleration is evaluated at the step's entry speed. The lap is closed (a flying lap) by running
three laps in a row and keeping the middle one.

Track TOML format (read by :func:`read_track_toml`)::

    name = "Kestrel Valley Raceway"
    [[segments]]
    kind = "straight"        # or "corner"
    length_m = 850.0
    name = "Pit straight"    # optional
    [[segments]]
    kind = "corner"
    length_m = 120.0
    radius_m = 40.0          # a corner gives radius_m or min_speed_kmh, not both
"""
from __future__ import annotations

import math
from dataclasses import dataclass, fields
from pathlib import Path

import numpy as np

from lapdata.echo import has_control_characters, shown
from lapdata.errors import LapDataError
from lapdata.files import read_toml_file
from lapdata.suggest import did_you_mean
from lapdata.trace import LapTrace
from lapdata.units import KMH, STANDARD_GRAVITY

GRID_STEP_M = 0.5
# Physical ranges of a track description. Wide: they catch unit slips (a radius typed in km, a
# length in mm) and nonsense, not circuits.   # common practice, no published source
SEGMENT_LENGTH_MAX_M = 30_000.0      # one segment; the longest straights are a few km
LAP_LENGTH_MAX_M = 100_000.0         # the longest road circuits are about 25 km
RADIUS_RANGE_M = (5.0, 100_000.0)    # a tight hairpin to a barely curved straight
MIN_SPEED_RANGE_KMH = (5.0, 500.0)
LAP_TIME_MAX_S = 4 * 3600.0          # a built lap slower than this is a unit slip
_KINDS = ("straight", "corner")


def _at_most(owner: str, name: str, value: float, high: float) -> None:
    if value > high:
        raise LapDataError(f"{owner}: {name} = {shown(value)}: expected at most {high:g}")


def _positive(owner: str, name: str, value, *, allow_zero: bool = False) -> None:
    ok = isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)
    if not ok or value < 0.0 or (value == 0.0 and not allow_zero):
        bound = ">= 0" if allow_zero else "> 0"
        raise LapDataError(f"{owner}: {name} = {shown(value)}: expected a finite number {bound}")


@dataclass(frozen=True)
class TrackSegment:
    """A straight, or a corner with either its radius or its minimum speed."""

    kind: str
    length_m: float
    radius_m: float | None = None
    min_speed_kmh: float | None = None
    name: str = ""

    def __post_init__(self):
        if not isinstance(self.name, str) or has_control_characters(self.name):
            raise LapDataError(f"segment: name = {shown(self.name)}: expected plain text (no line breaks or control characters)")
        owner = f"segment {shown(self.name)}" if self.name else "segment"
        if self.kind not in _KINDS:
            hint = did_you_mean(self.kind, _KINDS)
            raise LapDataError(f"{owner}: kind = {shown(self.kind)}: expected 'straight' or 'corner'{hint}")
        _positive(owner, "length_m", self.length_m)
        _at_most(owner, "length_m", self.length_m, SEGMENT_LENGTH_MAX_M)
        if self.kind == "straight" and (self.radius_m is not None or self.min_speed_kmh is not None):
            raise LapDataError(f"{owner}: a straight takes no radius_m or min_speed_kmh")
        if self.kind == "corner" and (self.radius_m is None) == (self.min_speed_kmh is None):
            raise LapDataError(f"{owner}: a corner needs radius_m or min_speed_kmh (exactly one of them)")
        for key, (low, high) in (("radius_m", RADIUS_RANGE_M), ("min_speed_kmh", MIN_SPEED_RANGE_KMH)):
            value = getattr(self, key)
            if value is not None:
                _positive(owner, key, value)
                if not low <= value <= high:
                    raise LapDataError(f"{owner}: {key} = {shown(value)}: expected {low:g} to {high:g}")


@dataclass(frozen=True)
class TrackDescription:
    """A named closed circuit: its segments in driving order."""

    name: str
    segments: tuple

    def __post_init__(self):
        if not isinstance(self.name, str) or not self.name.strip() or has_control_characters(self.name):
            raise LapDataError(f"track: name = {shown(self.name)}: expected a non-empty plain text")
        if not isinstance(self.segments, tuple) or not self.segments:
            raise LapDataError(f"track '{self.name}': segments: expected a non-empty tuple of TrackSegment")
        for i, seg in enumerate(self.segments):
            if not isinstance(seg, TrackSegment):
                raise LapDataError(f"track '{self.name}': segment {i + 1}: expected a TrackSegment")
        if self.length_m > LAP_LENGTH_MAX_M:
            raise LapDataError(f"track '{self.name}': the lap is {self.length_m / 1000:g} km long: expected at most "
                               f"{LAP_LENGTH_MAX_M / 1000:g} km")

    @property
    def length_m(self) -> float:
        """Lap length [m]."""
        return float(sum(s.length_m for s in self.segments))


@dataclass(frozen=True)
class CarEnvelope:
    """What the car can do, for the lap builder (SI except the named edge units).

    Attributes
    ----------
    mass_kg : float
        Mass with driver [kg]
    braking_decel_g : float
        Mechanical braking grip at low speed, a friction coefficient [g]
    lateral_grip_g : float
        Lateral grip at low speed, a friction coefficient [g]
    power_w : float
        Power at the wheels [W]
    traction_accel_g : float
        Traction-limited acceleration [g]
    downforce_cl_a_m2 : float
        Lift coefficient times area, ClA (downforce positive) [m^2]
    drag_cd_a_m2 : float
        Drag coefficient times area, CdA [m^2]
    air_density_kg_m3 : float
        Air density [kg/m^3]
    top_speed_kmh : float or None
        Speed cap (gearing, limiter); None for drag-limited only [km/h]
    """

    mass_kg: float
    braking_decel_g: float
    lateral_grip_g: float
    power_w: float
    traction_accel_g: float
    downforce_cl_a_m2: float
    drag_cd_a_m2: float
    air_density_kg_m3: float = 1.2
    top_speed_kmh: float | None = None

    def __post_init__(self):
        for f in fields(self):
            value = getattr(self, f.name)
            if f.name == "top_speed_kmh" and value is None:
                continue
            _positive("car envelope", f.name, value,
                      allow_zero=f.name in ("downforce_cl_a_m2", "drag_cd_a_m2"))

    def braking_decel_mps2(self, speed_mps: float) -> float:
        """Deceleration at full braking, ``mu (m g + q ClA) / m + q CdA / m``, q = rho v^2 / 2 [m/s^2]."""
        q = 0.5 * self.air_density_kg_m3 * speed_mps * speed_mps
        m = self.mass_kg
        return (self.braking_decel_g * (m * STANDARD_GRAVITY + q * self.downforce_cl_a_m2)
                + q * self.drag_cd_a_m2) / m

    def drive_accel_mps2(self, speed_mps: float) -> float:
        """Acceleration at full throttle, ``(min(P / v, m a_traction) - q CdA) / m`` [m/s^2]."""
        traction = self.traction_accel_g * STANDARD_GRAVITY * self.mass_kg
        force = min(self.power_w / speed_mps, traction) if speed_mps > 0.0 else traction
        q = 0.5 * self.air_density_kg_m3 * speed_mps * speed_mps
        return (force - q * self.drag_cd_a_m2) / self.mass_kg

    def corner_speed_mps(self, radius_m: float) -> float:
        """Steady cornering speed: ``v^2 / R = mu (g + q ClA / m)``, inf when downforce outgrows it [m/s]."""
        k = self.lateral_grip_g * 0.5 * self.air_density_kg_m3 * self.downforce_cl_a_m2 / self.mass_kg
        denominator = 1.0 / radius_m - k
        return math.inf if denominator <= 0.0 else math.sqrt(self.lateral_grip_g * STANDARD_GRAVITY / denominator)


def read_track_toml(path: str | Path) -> TrackDescription:
    """Read a track description from TOML (format in the module docstring).

    Unknown keys are errors with a suggestion; each value is checked by the dataclasses.
    """
    source = str(path)
    doc, _ = read_toml_file(path, "track file")
    _known_keys(source, "top level", doc, ("name", "segments"))
    if "name" not in doc or "segments" not in doc:
        raise LapDataError(f"{source}: expected keys 'name' and [[segments]]")
    segs = doc["segments"]
    if not isinstance(segs, list) or not all(isinstance(s, dict) for s in segs):
        raise LapDataError(f"{source}: segments: expected an array of tables [[segments]]")
    allowed = tuple(f.name for f in fields(TrackSegment))
    built = []
    for i, seg in enumerate(segs):
        where = f"segment {i + 1}"
        _known_keys(source, where, seg, allowed)
        for key in ("kind", "length_m"):
            if key not in seg:
                raise LapDataError(f"{source}: {where}: missing key '{key}'")
        try:
            built.append(TrackSegment(**seg))
        except LapDataError as exc:
            raise LapDataError(f"{source}: {where}: {exc}") from None
    try:
        return TrackDescription(name=doc["name"], segments=tuple(built))
    except LapDataError as exc:
        raise LapDataError(f"{source}: {exc}") from None


def _known_keys(source: str, where: str, table: dict, allowed: tuple) -> None:
    for key in table:
        if key not in allowed:
            raise LapDataError(f"{source}: {where}: unknown key {shown(key)}{did_you_mean(key, allowed)}: "
                               f"expected one of {', '.join(allowed)}")


def build_speed_trace(track: TrackDescription, envelope: CarEnvelope, *, sample_hz: float = 20.0,
                      pace: float = 1.0, speed_limit_kmh: float | None = None) -> LapTrace:
    """Quasi-steady flying lap of a track, sampled uniformly in time.

    Parameters
    ----------
    track : TrackDescription
        The circuit [-]
    envelope : CarEnvelope
        The car's limits [-]
    sample_hz : float
        Output sample rate [Hz]
    pace : float
        Fraction of the limit speed driven, 0 < pace <= 1: every speed of the limit lap
        is multiplied by ``pace`` at the same distance, so the lap time is divided by it and every
        acceleration multiplied by ``pace**2`` [-]
    speed_limit_kmh : float or None
        Absolute cap applied after ``pace`` everywhere (a pit lane) [km/h]

    Returns
    -------
    LapTrace
        Time, distance, speed and the model's longitudinal acceleration, samples at
        ``k / sample_hz`` up to the lap time; no pressure channels [-]
    """
    _positive("build_speed_trace", "sample_hz", sample_hz)
    _positive("build_speed_trace", "pace", pace)
    if pace > 1.0:
        raise LapDataError(f"build_speed_trace: pace = {shown(pace)}: expected 0 < pace <= 1")
    if speed_limit_kmh is not None:
        _positive("build_speed_trace", "speed_limit_kmh", speed_limit_kmh)
    limit, step = _speed_limits(track, envelope)
    n = limit.size
    speed = _passes(np.tile(limit, 3), np.tile(step, 3), envelope)[n:2 * n + 1]
    speed = pace * speed
    if speed_limit_kmh is not None:
        speed = np.minimum(speed, speed_limit_kmh * KMH)
    distance = np.concatenate([[0.0], np.cumsum(step)])
    time = np.concatenate([[0.0], np.cumsum(2.0 * step / (speed[1:] + speed[:-1]))])
    if time[-1] > LAP_TIME_MAX_S:
        raise LapDataError(f"track '{track.name}': the built lap takes {time[-1] / 3600:.3g} h: expected at most "
                           f"{LAP_TIME_MAX_S / 3600:g} h (check the car's power, grip and the corners' speeds)")
    accel_mid = np.diff(speed**2) / (2.0 * step)
    accel = np.interp(distance, 0.5 * (distance[1:] + distance[:-1]), accel_mid)
    t_out = np.arange(int(np.floor(time[-1] * sample_hz * (1 + 1e-12))) + 1) / sample_hz
    return LapTrace(time_s=t_out, distance_m=np.interp(t_out, time, distance),
                    speed_mps=np.interp(t_out, time, speed), accel_long_mps2=np.interp(t_out, time, accel),
                    source=f"track '{track.name}' (built)")


def _speed_limits(track: TrackDescription, envelope: CarEnvelope) -> tuple[np.ndarray, np.ndarray]:
    """Speed limit [m/s] and length [m] of each grid step of one lap (about GRID_STEP_M each)."""
    top = math.inf if envelope.top_speed_kmh is None else envelope.top_speed_kmh * KMH
    limits, steps = [], []
    for seg in track.segments:
        if seg.kind == "straight":
            v = top
        elif seg.min_speed_kmh is not None:
            v = min(seg.min_speed_kmh * KMH, top)
        else:
            v = min(envelope.corner_speed_mps(seg.radius_m), top)
        count = max(int(round(seg.length_m / GRID_STEP_M)), 1)
        limits.append(np.full(count, v))
        steps.append(np.full(count, seg.length_m / count))
    limit = np.concatenate(limits)
    if not np.any(np.isfinite(limit)) and envelope.drag_cd_a_m2 == 0.0:
        raise LapDataError(f"track '{track.name}': no corner, no top_speed_kmh and no drag: "
                           f"expected something that limits the speed")
    return limit, np.concatenate(steps)


def _passes(limit: np.ndarray, step: np.ndarray, envelope: CarEnvelope) -> np.ndarray:
    """Speeds at nodes 0..N: forward (drive-limited) then backward (brake-limited) pass.

    Step i joins nodes i and i+1 and carries limit[i]; a node takes the lower limit of its two
    steps.
    """
    n = limit.size
    node_limit = np.minimum(np.concatenate([limit, limit[-1:]]), np.concatenate([limit[:1], limit]))
    lowest = float(np.min(limit))
    v = np.empty(n + 1)
    v[0] = lowest if math.isfinite(lowest) else 0.0
    for i in range(n):
        u = float(v[i])
        # clipped at zero: the forward pass never starts above the drag-limited top speed
        a = max(envelope.drive_accel_mps2(u), 0.0)
        v[i + 1] = min(node_limit[i + 1], math.sqrt(u * u + 2.0 * a * step[i]))
    for i in range(n - 1, -1, -1):
        w = float(v[i + 1])
        v[i] = min(v[i], math.sqrt(w * w + 2.0 * envelope.braking_decel_mps2(w) * step[i]))
    return v
