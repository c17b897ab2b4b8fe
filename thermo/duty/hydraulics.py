"""Brake hydraulics: piston areas, clamp force, brake torque and fluid displaced per unit of line
pressure or piston travel, the front share, line pressures and pedal travel.

Rigid hydraulics throughout: the line, hoses and caliper body do not swell, the fluid does not
compress and the seals do not roll the pistons back, so every figure here is the ideal one
(README "Hydraulics" says what that leaves out). An opposed caliper is assumed, as everywhere in
brakeheat: the pistons of each side push one pad, and both sides move by the same piston travel.

Formulas (any hydraulics text; e.g. R. Limpert, Brake Design and Safety, 3rd ed., SAE 2011,
chapter 5, from memory):
- piston area of one side A_s = sum(pi d^2 / 4), of the caliper A_c = 2 A_s;
- clamp force on each pad F = p A_s; brake torque T = 2 mu F r_eff (two friction faces);
- fluid displaced by a piston travel x: V = A_c x;
- balance bar with front share b: F_front = b F_rod, F_rear = (1 - b) F_rod, and (rigid bar) the
  pushrod moves s_rod = b s_front + (1 - b) s_rear;
- line pressure p = F / A_mc; pushrod force F_rod = pedal ratio x pedal force.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from thermo.duty.vehicle import check_number

PA_PER_BAR = 1.0e5                  # definition of the bar (SI Brochure, 9th ed., Table 8)
KNOCK_BACK_DEFAULT_MM = 0.1         # common practice, no published source: a few hundredths to tenths of a mm
PEDAL_RATIO_DEFAULT = 4.0           # common practice, no published source: race pedal boxes run about 3:1 to 6:1


def piston_area_m2(diameters_m) -> float:
    """Summed area of pistons of the given diameters, sum(pi d^2 / 4) [m^2]."""
    for d in diameters_m:
        check_number("piston_area_m2", "diameter", d, positive=True)
    return float(sum(math.pi / 4.0 * d * d for d in diameters_m))


def bore_diameter_m(area_m2: float) -> float:
    """The bore diameter of a circular area, sqrt(4 A / pi) [m]."""
    check_number("bore_diameter_m", "area_m2", area_m2, positive=True)
    return math.sqrt(4.0 * area_m2 / math.pi)


def leading_trailing_area_ratio(diameters_m) -> float:
    """Area of the leading piston over that of the trailing one [-].

    The diameters are listed from the leading edge of the caliper (where the disc enters it) to
    the trailing edge, as a scenario writes them; one piston gives 1. A stepped caliper (smaller
    leading pistons, ratio below 1) evens the pad's taper wear.
    """
    return piston_area_m2(diameters_m[:1]) / piston_area_m2(diameters_m[-1:])


def brake_torque_nm_per_pa(area_one_side_m2: float, pad_mu: float, effective_radius_m: float) -> float:
    """Brake torque of one caliper per pascal of line pressure, 2 mu A_s r_eff [N m / Pa]."""
    check_number("brake_torque_nm_per_pa", "area_one_side_m2", area_one_side_m2, positive=True)
    check_number("brake_torque_nm_per_pa", "pad_mu", pad_mu, positive=True)
    check_number("brake_torque_nm_per_pa", "effective_radius_m", effective_radius_m, positive=True)
    return 2.0 * pad_mu * area_one_side_m2 * effective_radius_m


def pressure_ratio_for_share(front_share: float, torque_per_pa_front: float, torque_per_pa_rear: float) -> float:
    """Front over rear line pressure that gives a front share of the brake torque [-].

    With each axle's torque T = n tau p (n calipers of torque tau per pascal, the same n front and
    rear): share = tau_f p_f / (tau_f p_f + tau_r p_r), so p_f / p_r = share / (1 - share) x tau_r / tau_f.
    """
    check_number("pressure_ratio_for_share", "front_share", front_share, minimum=0.0, maximum=1.0)
    if front_share >= 1.0:
        return math.inf
    return front_share / (1.0 - front_share) * torque_per_pa_rear / torque_per_pa_front


def pushrod_travel_m(front_share_of_bar: float, stroke_front_m: float, stroke_rear_m: float) -> float:
    """Travel of the pushrod (the balance bar's pivot) for given master cylinder strokes [m]:
    b s_front + (1 - b) s_rear for a rigid bar that sends the share b of the force forward."""
    check_number("pushrod_travel_m", "front_share_of_bar", front_share_of_bar, minimum=0.0, maximum=1.0)
    return front_share_of_bar * stroke_front_m + (1.0 - front_share_of_bar) * stroke_rear_m


@dataclass(frozen=True)
class CaliperHydraulics:
    """One corner's caliper(s): what a bar of line pressure and a millimetre of piston travel do.

    ``calipers`` is 2 for an axle corner (it stands for both wheels of the axle) and 1 for a
    wheel corner; per-caliper figures are for one caliper.
    """

    name: str
    axle: str
    calipers: int
    area_one_side_m2: float
    leading_trailing_area_ratio: float
    torque_nm_per_pa: float

    @property
    def area_caliper_m2(self) -> float:
        return 2.0 * self.area_one_side_m2

    @property
    def clamp_force_n_per_pa(self) -> float:
        return self.area_one_side_m2

    @property
    def displacement_m3_per_m(self) -> float:
        """Fluid one caliper takes per metre of travel of all its pistons [m^3/m]."""
        return self.area_caliper_m2


def caliper_hydraulics(name: str, axle: str, calipers: int, diameters_m, pad_mu: float,
                       effective_radius_m: float) -> CaliperHydraulics:
    """The hydraulic figures of a corner's caliper from its piston diameters (one side) [SI]."""
    area = piston_area_m2(diameters_m)
    return CaliperHydraulics(name, axle, calipers, area, leading_trailing_area_ratio(diameters_m),
                             brake_torque_nm_per_pa(area, pad_mu, effective_radius_m))


def axle_torque_nm_per_pa(corners, axle: str) -> float:
    """Brake torque of an axle per pascal of its line pressure, all its calipers [N m / Pa]."""
    return sum(c.calipers * c.torque_nm_per_pa for c in corners if c.axle == axle)


def axle_displacement_m3_per_m(corners, axle: str) -> float:
    """Fluid all of an axle's calipers take per metre of piston travel [m^3/m]."""
    return sum(c.calipers * c.displacement_m3_per_m for c in corners if c.axle == axle)


@dataclass(frozen=True)
class MasterCylinders:
    """Master cylinder bores, the balance bar and the pedal."""

    area_front_m2: float
    area_rear_m2: float
    balance_bar_front_share: float
    pedal_ratio: float

    def line_pressure_pa_per_n(self) -> tuple[float, float]:
        """Front and rear line pressure per newton on the pedal [Pa/N]."""
        return (self.pedal_ratio * self.balance_bar_front_share / self.area_front_m2,
                self.pedal_ratio * (1.0 - self.balance_bar_front_share) / self.area_rear_m2)

    def pedal_travel_m(self, volume_front_m3: float, volume_rear_m3: float) -> float:
        """Pedal travel that pushes the given volumes into the front and rear circuits [m]."""
        rod = pushrod_travel_m(self.balance_bar_front_share, volume_front_m3 / self.area_front_m2,
                               volume_rear_m3 / self.area_rear_m2)
        return self.pedal_ratio * rod

    def front_share(self, corners) -> float:
        """Front share of the brake torque these master cylinders give with these calipers [-]."""
        p_front, p_rear = self.line_pressure_pa_per_n()
        front = axle_torque_nm_per_pa(corners, "front") * p_front
        rear = axle_torque_nm_per_pa(corners, "rear") * p_rear
        return front / (front + rear)


def balance_bar_for_share(front_share: float, corners, area_front_m2: float, area_rear_m2: float) -> float:
    """The balance bar's front share that gives a front share of the brake torque [-].

    share = b tau_f / A_f / (b tau_f / A_f + (1 - b) tau_r / A_r) solved for b, with tau the axle
    torque per pascal: b = s k_r / (s k_r + (1 - s) k_f), k = tau / A.
    """
    check_number("balance_bar_for_share", "front_share", front_share, minimum=0.0, maximum=1.0)
    k_front = axle_torque_nm_per_pa(corners, "front") / area_front_m2
    k_rear = axle_torque_nm_per_pa(corners, "rear") / area_rear_m2
    return front_share * k_rear / (front_share * k_rear + (1.0 - front_share) * k_front)


def rear_area_for_share(front_share: float, corners, area_front_m2: float, bar_front_share: float) -> float:
    """The rear master cylinder bore area that gives a front share of the brake torque [m^2]:
    A_r = (1 - b) tau_r A_f (s) / (b tau_f (1 - s)) from the share above solved for A_r."""
    check_number("rear_area_for_share", "front_share", front_share, minimum=0.0, maximum=1.0)
    tau_f, tau_r = axle_torque_nm_per_pa(corners, "front"), axle_torque_nm_per_pa(corners, "rear")
    return (1.0 - bar_front_share) * tau_r * area_front_m2 * front_share / (bar_front_share * tau_f * (1.0 - front_share))
