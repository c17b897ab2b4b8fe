"""Heat into each brake corner: the car's braking power split by axle, side and disc/pad."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from lapdata.echo import shown
from lapdata.errors import LapDataError
from lapdata.suggest import did_you_mean
from lapdata.trace import LapTrace
from thermo.duty.bias import FixedBias, HydraulicBias, front_power_share, split_left_right
from thermo.duty.power import (
    DEFAULT_SMOOTHING_WINDOW_S, Caliper, braking_power_pressure_method, check_channel, check_time,
    checked_braking_power,
)
from thermo.duty.vehicle import VehicleParameters, check_number
from thermo.errors import ScenarioError

AXLES = ("front", "rear")
SIDES = ("left", "right")
_RADIUS_TOLERANCE = 1e-9  # relative: a corner's rolling radius must be its axle's


@dataclass(frozen=True, kw_only=True)
class CornerBrake:
    """One corner's brake as the duty step needs it.

    Parameters
    ----------
    name : str
        Corner name, e.g. ``front_left``
    axle : str
        'front' or 'rear'
    side : str
        'left' or 'right'
    partition : float
        Disc share gamma of the friction heat, 0 to 1 (the pad takes 1 - gamma) [-]
    piston_area_one_side_m2 : float
        Summed piston area on one side of the caliper [m^2]
    pad_mu : float
        Pad-disc friction coefficient [-]
    effective_radius_m : float
        Effective friction radius [m]
    rolling_radius_m : float
        Rolling radius of this wheel; must equal the vehicle's for this
        axle [m]
    """

    name: str
    axle: str
    side: str
    partition: float
    piston_area_one_side_m2: float
    pad_mu: float
    effective_radius_m: float
    rolling_radius_m: float

    def __post_init__(self):
        if not isinstance(self.name, str) or not self.name:
            raise ScenarioError(f"CornerBrake.name must be a non-empty string, got {shown(self.name)}")
        owner = f"CornerBrake {shown(self.name)}"
        if self.axle not in AXLES:
            raise ScenarioError(f"{owner}: axle must be 'front' or 'rear', got {shown(self.axle)}")
        if self.side not in SIDES:
            raise ScenarioError(f"{owner}: side must be 'left' or 'right', got {shown(self.side)}")
        check_number(owner, "partition", self.partition, minimum=0.0, maximum=1.0)
        check_number(owner, "rolling_radius_m", self.rolling_radius_m, positive=True)
        try:
            self.caliper
        except ScenarioError as error:
            raise ScenarioError(f"{owner}: {error}") from None

    @property
    def caliper(self) -> Caliper:
        """Piston area, pad friction and effective radius, for the pressure method."""
        return Caliper(self.piston_area_one_side_m2, self.pad_mu, self.effective_radius_m)


@dataclass(frozen=True)
class CornerDuty:
    """Heat input of one corner against time (arrays are read-only).

    Parameters
    ----------
    name : str
        Corner name
    time_s : ndarray
        Sample times [s]
    disc_heat_w : ndarray
        Friction heat into the disc [W]
    pad_heat_w : ndarray
        Friction heat into the pad [W]
    wheel_speed_rad_s : ndarray
        Wheel (and disc) angular speed [rad/s]
    vehicle_speed_mps : ndarray
        Vehicle speed [m/s]
    """

    name: str
    time_s: np.ndarray
    disc_heat_w: np.ndarray
    pad_heat_w: np.ndarray
    wheel_speed_rad_s: np.ndarray
    vehicle_speed_mps: np.ndarray

    def __post_init__(self):
        t = check_time(self.time_s)
        object.__setattr__(self, "time_s", _frozen(t))
        for key in ("disc_heat_w", "pad_heat_w", "wheel_speed_rad_s", "vehicle_speed_mps"):
            array = check_channel(f"CornerDuty {shown(self.name)} {key}", getattr(self, key), t.size,
                                  nonnegative=True)
            object.__setattr__(self, key, _frozen(array))

    @classmethod
    def _made(cls, name: str, time_s: np.ndarray, disc_heat_w: np.ndarray, pad_heat_w: np.ndarray,
              wheel_speed_rad_s: np.ndarray, vehicle_speed_mps: np.ndarray) -> "CornerDuty":
        """A duty from read-only arrays that ``corner_heat_inputs`` checked or made from checked
        ones (times by ``check_time``, the rest finite and >= 0): the same object as the
        constructor's, without checking and copying them again."""
        duty = object.__new__(cls)
        for key, value in (("name", name), ("time_s", time_s), ("disc_heat_w", disc_heat_w),
                           ("pad_heat_w", pad_heat_w), ("wheel_speed_rad_s", wheel_speed_rad_s),
                           ("vehicle_speed_mps", vehicle_speed_mps)):
            object.__setattr__(duty, key, value)
        return duty

    @property
    def brake_heat_w(self) -> np.ndarray:
        """Disc plus pad heat [W]."""
        return self.disc_heat_w + self.pad_heat_w


def _frozen(array):
    copy = np.array(array, dtype=float)
    copy.flags.writeable = False
    return copy


def _read_only(array: np.ndarray) -> np.ndarray:
    """A float array made here (no one else holds it), set read-only without a copy."""
    array.flags.writeable = False
    return array


def _check_corners(corners: Sequence[CornerBrake], vehicle: VehicleParameters):
    names, places = set(), set()
    for corner in corners:
        if not isinstance(corner, CornerBrake):
            raise ScenarioError(f"corners: expected CornerBrake objects, got {type(corner).__name__}")
        if corner.name in names:
            raise ScenarioError(f"corners: the name {shown(corner.name)} is used twice")
        if (corner.axle, corner.side) in places:
            raise ScenarioError(f"corners: two corners at {corner.axle} {corner.side}")
        names.add(corner.name)
        places.add((corner.axle, corner.side))
        axle_radius = vehicle.rolling_radius_m(corner.axle)
        if abs(corner.rolling_radius_m - axle_radius) > _RADIUS_TOLERANCE * axle_radius:
            raise ScenarioError(
                f"CornerBrake {shown(corner.name)}: rolling_radius_m {corner.rolling_radius_m} differs from "
                f"VehicleParameters.rolling_radius_{corner.axle}_m {axle_radius}")
    if not names:
        raise ScenarioError("corners: expected at least one CornerBrake")


def _duty(corner, t, v, brake_power):
    """One corner's duty from checked, read-only ``t`` and ``v`` (shared by every corner) and its
    brake power. The power and the wheel speed are checked here (finite, >= 0); the disc and pad
    shares of a finite power >= 0 (partition 0 to 1) are then finite and >= 0 too."""
    owner = f"CornerDuty {shown(corner.name)}"
    power = check_channel(f"{owner} brake power", brake_power, t.size, nonnegative=True)
    wheel = check_channel(f"{owner} wheel_speed_rad_s", v / corner.rolling_radius_m, t.size, nonnegative=True)
    return CornerDuty._made(corner.name, t, _read_only(corner.partition * power),
                            _read_only((1.0 - corner.partition) * power), _read_only(wheel), v)


def _energy_duties(t, v, vehicle, bias, corners, options):
    for key in ("pressure_front_pa", "pressure_rear_pa"):
        if options[key] is not None:
            raise ScenarioError(f"{key} is used only by method='pressure', not by method='energy'")
    if not isinstance(bias, (FixedBias, HydraulicBias)):
        raise ScenarioError(f"bias: method='energy' needs a FixedBias or HydraulicBias, got {shown(bias)}")
    window = options["smoothing_window_s"]
    power = checked_braking_power(
        t, v, vehicle, grade_rad=options["grade_rad"], accel_mps2=options["accel_mps2"],
        smoothing_window_s=DEFAULT_SMOOTHING_WINDOW_S if window is None else window)
    share = front_power_share(bias.front_share, vehicle.rolling_radius_front_m,
                              vehicle.rolling_radius_rear_m)
    axle_power = {"front": power * share, "rear": power * (1.0 - share)}
    duties = {}
    for corner in corners:
        left_share = options[f"left_share_{corner.axle}"]
        left, right = split_left_right(axle_power[corner.axle], 0.5 if left_share is None else left_share)
        duties[corner.name] = _duty(corner, t, v, left if corner.side == "left" else right)
    return duties


def _pressure_duties(t, v, vehicle, bias, corners, options):
    used_by_energy = ("grade_rad", "accel_mps2", "smoothing_window_s", "left_share_front",
                      "left_share_rear")
    for key in used_by_energy:
        if options[key] is not None:
            raise ScenarioError(f"{key} is used only by method='energy', not by method='pressure'")
    if bias is not None:
        raise ScenarioError("bias: with method='pressure' the pressure channels set the bias; "
                            "pass bias=None")
    duties = {}
    for corner in corners:
        key = f"pressure_{corner.axle}_pa"
        if options[key] is None:
            raise ScenarioError(f"{key}: method='pressure' needs it for corner {shown(corner.name)}")
        pressure = check_channel(key, options[key], t.size)
        power = braking_power_pressure_method(pressure, v, corner.caliper, corner.rolling_radius_m)
        duties[corner.name] = _duty(corner, t, v, power)
    return duties


METHODS = {"energy": _energy_duties, "pressure": _pressure_duties}


def corner_heat_inputs(time_s, speed_mps, vehicle: VehicleParameters, bias,
                       corners: Sequence[CornerBrake], *, method: str = "energy",
                       pressure_front_pa=None, pressure_rear_pa=None, left_share_front=None,
                       left_share_rear=None, grade_rad=None, accel_mps2=None,
                       smoothing_window_s=None) -> dict[str, CornerDuty]:
    """Heat into the disc and pad of each corner against time.

    Parameters
    ----------
    time_s : ndarray
        Sample times, strictly increasing [s]
    speed_mps : ndarray
        Vehicle speed [m/s]
    vehicle : VehicleParameters
        The car (mass and resistances; rolling radii for the power split)
    bias : FixedBias or HydraulicBias or None
        Torque bias for method='energy'; must be None for
        method='pressure' (the pressures set the bias)
    corners : sequence of CornerBrake
        The corners to compute (any subset of the four)
    method : str
        'energy' (speed trace) or 'pressure' (line pressure per axle)
    pressure_front_pa, pressure_rear_pa : ndarray or None
        Line pressures, method='pressure' [Pa]
    left_share_front, left_share_rear : float or None
        Left corner's share of its axle, energy
        method; None is 0.5 [-]
    grade_rad : float or ndarray or None
        Road grade, positive uphill, energy method [rad]
    accel_mps2 : ndarray or None
        Measured acceleration, energy method; None derives it [m/s^2]
    smoothing_window_s : float or None
        Energy method filter window; None is
        ``DEFAULT_SMOOTHING_WINDOW_S`` [s]

    Returns
    -------
    dict
        Corner name to :class:`CornerDuty`

    Notes
    -----
    Energy method: car power P from :func:`braking_power_energy_method` (sample values whose
    trapezoid integral is the braking energy); front power share from the torque bias and the
    rolling radii (:func:`front_power_share`); left/right by the given shares; disc gets
    gamma P_corner, pad (1 - gamma) P_corner. Pressure method: each corner's P = T v / r_roll
    from its own axle's pressure (instantaneous sample values). An option that the chosen
    method does not use is an error, never ignored.
    """
    if method not in METHODS:
        hint = did_you_mean(method, METHODS)
        raise ScenarioError(f"method: unknown {shown(method)}, expected one of {sorted(METHODS)}{hint}")
    if not isinstance(vehicle, VehicleParameters):
        raise ScenarioError(f"vehicle: expected VehicleParameters, got {type(vehicle).__name__}")
    t = _frozen(check_time(time_s))
    v = _frozen(check_channel("speed_mps", speed_mps, t.size, nonnegative=True))
    corners = tuple(corners)
    _check_corners(corners, vehicle)
    options = dict(pressure_front_pa=pressure_front_pa, pressure_rear_pa=pressure_rear_pa,
                   left_share_front=left_share_front, left_share_rear=left_share_rear,
                   grade_rad=grade_rad, accel_mps2=accel_mps2,
                   smoothing_window_s=smoothing_window_s)
    return METHODS[method](t, v, vehicle, bias, corners, options)


def corner_heat_inputs_from_trace(trace: LapTrace, vehicle: VehicleParameters, bias,
                                  corners: Sequence[CornerBrake], *, method: str = "energy",
                                  use_measured_accel: bool = False, **options) -> dict[str, CornerDuty]:
    """:func:`corner_heat_inputs` on a :class:`LapTrace`.

    With method='pressure' the trace's pressure channels are used (LapDataError naming the
    trace's source if it has none); ``use_measured_accel`` takes ``accel_long_mps2`` for the
    energy method. Other keyword options are passed on unchanged.
    """
    if method == "pressure":
        if not trace.has_pressure:
            raise LapDataError(f"{trace.source}: method='pressure' needs pressure_front_pa and "
                               "pressure_rear_pa channels")
        options.update(pressure_front_pa=trace.pressure_front_pa,
                       pressure_rear_pa=trace.pressure_rear_pa)
    if use_measured_accel:
        if trace.accel_long_mps2 is None:
            raise LapDataError(f"{trace.source}: use_measured_accel needs an accel_long_mps2 channel")
        options.update(accel_mps2=trace.accel_long_mps2)
    return corner_heat_inputs(trace.time_s, trace.speed_mps, vehicle, bias, corners, method=method,
                              **options)
