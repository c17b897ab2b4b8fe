"""Brake bias: how the braking divides between the axles, and between left and right."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from thermo.duty.power import braking_torque_pressure_method
from thermo.duty.vehicle import check_number


@dataclass(frozen=True)
class FixedBias:
    """A front share of the brake torque given directly.

    Parameters
    ----------
    front_share : float
        Front axle's share of the total brake torque, 0 to 1 [-]

    Notes
    -----
    A torque share, like :class:`HydraulicBias`; with equal front and rear rolling radii it is
    also the share of brake force and of brake power.
    """

    front_share: float

    def __post_init__(self):
        check_number("FixedBias", "front_share", self.front_share, minimum=0.0, maximum=1.0)


@dataclass(frozen=True, kw_only=True)
class HydraulicBias:
    """Front share of the brake torque from the master cylinders, balance bar and calipers.

    Parameters
    ----------
    master_cylinder_front_m2 : float
        Bore area of the front master cylinder [m^2]
    master_cylinder_rear_m2 : float
        Bore area of the rear master cylinder [m^2]
    balance_bar_front_share : float
        Share of the pushrod force the balance bar sends to the
        front master cylinder, 0 to 1 [-]
    piston_area_front_m2 : float
        Summed piston area on one side of one front caliper [m^2]
    piston_area_rear_m2 : float
        Summed piston area on one side of one rear caliper [m^2]
    pad_mu_front : float
        Front pad friction coefficient [-]
    pad_mu_rear : float
        Rear pad friction coefficient [-]
    effective_radius_front_m : float
        Front effective friction radius [m]
    effective_radius_rear_m : float
        Rear effective friction radius [m]

    Notes
    -----
    p_f = beta F / A_mf, p_r = (1 - beta) F / A_mr; T_axle = 2 (2 mu p A_pistons r_eff);
    share = T_f / (T_f + T_r), independent of the pushrod force F. This is the torque share;
    rolling radii do not enter it (see :func:`front_power_share` for the power share).
    """

    master_cylinder_front_m2: float
    master_cylinder_rear_m2: float
    balance_bar_front_share: float
    piston_area_front_m2: float
    piston_area_rear_m2: float
    pad_mu_front: float
    pad_mu_rear: float
    effective_radius_front_m: float
    effective_radius_rear_m: float

    def __post_init__(self):
        owner = "HydraulicBias"
        for name in ("master_cylinder_front_m2", "master_cylinder_rear_m2", "piston_area_front_m2",
                     "piston_area_rear_m2", "effective_radius_front_m", "effective_radius_rear_m"):
            check_number(owner, name, getattr(self, name), positive=True)
        for name in ("pad_mu_front", "pad_mu_rear"):
            check_number(owner, name, getattr(self, name), positive=True, maximum=1.0)
        check_number(owner, "balance_bar_front_share", self.balance_bar_front_share,
                     minimum=0.0, maximum=1.0)

    def line_pressures_pa(self, pushrod_force_n):
        """Front and rear line pressures [Pa] for a pedal pushrod force [N]."""
        force = np.asarray(pushrod_force_n, dtype=float)
        front = self.balance_bar_front_share * force / self.master_cylinder_front_m2
        rear = (1.0 - self.balance_bar_front_share) * force / self.master_cylinder_rear_m2
        return front, rear

    def axle_torques_nm(self, pushrod_force_n):
        """Front and rear axle brake torques, two calipers each [N m], for a pushrod force [N]."""
        p_front, p_rear = self.line_pressures_pa(pushrod_force_n)
        front = 2.0 * braking_torque_pressure_method(
            p_front, self.piston_area_front_m2, self.pad_mu_front, self.effective_radius_front_m)
        rear = 2.0 * braking_torque_pressure_method(
            p_rear, self.piston_area_rear_m2, self.pad_mu_rear, self.effective_radius_rear_m)
        return front, rear

    @property
    def front_share(self) -> float:
        """Front axle's share of the total brake torque [-]."""
        front, rear = self.axle_torques_nm(1.0)
        return float(front / (front + rear))


def front_power_share(torque_front_share: float, rolling_radius_front_m: float,
                      rolling_radius_rear_m: float) -> float:
    """Front axle's share of the brake power (and tyre force) for a given torque share.

    Parameters
    ----------
    torque_front_share : float
        Front share of the brake torque, 0 to 1 [-]
    rolling_radius_front_m : float
        Front rolling radius [m]
    rolling_radius_rear_m : float
        Rear rolling radius [m]

    Returns
    -------
    float
        Front share of the brake power [-]

    Notes
    -----
    A wheel turns at v / r, so its brake power is T v / r and its tyre force T / r:
    share_P = (s / r_f) / (s / r_f + (1 - s) / r_r). Equals s when r_f = r_r.
    """
    check_number("front_power_share", "torque_front_share", torque_front_share,
                 minimum=0.0, maximum=1.0)
    check_number("front_power_share", "rolling_radius_front_m", rolling_radius_front_m, positive=True)
    check_number("front_power_share", "rolling_radius_rear_m", rolling_radius_rear_m, positive=True)
    front = torque_front_share / rolling_radius_front_m
    rear = (1.0 - torque_front_share) / rolling_radius_rear_m
    return float(front / (front + rear))


def split_left_right(power_axle, left_share: float = 0.5):
    """Split an axle's brake power between its left and right corners.

    Parameters
    ----------
    power_axle : float or ndarray
        Brake power of the axle [W]
    left_share : float
        Left corner's share, 0 to 1 [-]

    Returns
    -------
    tuple
        (left, right) brake power [W]; they sum to ``power_axle``
    """
    check_number("split_left_right", "left_share", left_share, minimum=0.0, maximum=1.0)
    power = np.asarray(power_axle, dtype=float)
    left = power * left_share
    return left, power - left
