"""The car as the brakes see it: mass, rotating inertia, drag, downforce, rolling resistance."""
from __future__ import annotations

import copy
import math
from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from lapdata.units import STANDARD_GRAVITY
from thermo.errors import ScenarioError


def check_number(owner: str, name: str, value, *, minimum=None, positive=False, maximum=None):
    """Raise ScenarioError naming ``owner.name`` unless value is a finite number in range."""
    if isinstance(value, bool) or not isinstance(value, (int, float, np.floating, np.integer)):
        raise ScenarioError(f"{owner}.{name} must be a number, got {shown(value)}")
    if not math.isfinite(value):
        raise ScenarioError(f"{owner}.{name} must be finite, got {shown(value)}")
    if positive and value <= 0:
        raise ScenarioError(f"{owner}.{name} must be positive, got {shown(value)}")
    if minimum is not None and value < minimum:
        raise ScenarioError(f"{owner}.{name} must be at least {minimum}, got {shown(value)}")
    if maximum is not None and value > maximum:
        raise ScenarioError(f"{owner}.{name} must be at most {maximum}, got {shown(value)}")


@dataclass(frozen=True, kw_only=True)
class VehicleParameters:
    """Longitudinal parameters of the car for the energy method.

    Parameters
    ----------
    mass_kg : float
        Car with driver, without fuel [kg]
    fuel_kg : float
        Fuel on board [kg]
    drag_cd_a_m2 : float
        Drag coefficient times frontal area, C_d A [m^2]
    downforce_cl_a_m2 : float
        Downforce coefficient times area, C_L A, positive down [m^2]
    rolling_resistance_coefficient : float
        Tyre rolling resistance coefficient C_rr [-]
    rolling_radius_front_m : float
        Loaded rolling radius of the front tyres [m]
    rolling_radius_rear_m : float
        Loaded rolling radius of the rear tyres [m]
    air_density_kg_m3 : float
        Ambient air density [kg/m^3]
    rotating_inertia_factor : float
        Rotating parts as a share of the mass,
        m_eff = m (1 + factor); default 0.04 [-]
    engine_braking_force_n : float
        Engine overrun force at the tyres, constant while braking;
        default 0 [N]
    """

    mass_kg: float
    fuel_kg: float
    drag_cd_a_m2: float
    downforce_cl_a_m2: float
    rolling_resistance_coefficient: float
    rolling_radius_front_m: float
    rolling_radius_rear_m: float
    air_density_kg_m3: float
    rotating_inertia_factor: float = 0.04
    engine_braking_force_n: float = 0.0

    def __post_init__(self):
        owner = "VehicleParameters"
        check_number(owner, "mass_kg", self.mass_kg, positive=True)
        check_number(owner, "fuel_kg", self.fuel_kg, minimum=0.0)
        check_number(owner, "drag_cd_a_m2", self.drag_cd_a_m2, minimum=0.0)
        # negative C_L A (lift) is allowed: it only lowers the tyres' normal load
        check_number(owner, "downforce_cl_a_m2", self.downforce_cl_a_m2)
        check_number(owner, "rolling_resistance_coefficient", self.rolling_resistance_coefficient,
                     minimum=0.0, maximum=1.0)
        check_number(owner, "rolling_radius_front_m", self.rolling_radius_front_m, positive=True)
        check_number(owner, "rolling_radius_rear_m", self.rolling_radius_rear_m, positive=True)
        check_number(owner, "air_density_kg_m3", self.air_density_kg_m3, positive=True)
        check_number(owner, "rotating_inertia_factor", self.rotating_inertia_factor,
                     minimum=0.0, maximum=1.0)
        check_number(owner, "engine_braking_force_n", self.engine_braking_force_n, minimum=0.0)

    @property
    def mass_total_kg(self) -> float:
        """Car, driver and fuel [kg]."""
        return self.mass_kg + self.fuel_kg

    @property
    def mass_effective_kg(self) -> float:
        """Translating mass plus the equivalent mass of the rotating parts, m (1 + factor) [kg]."""
        return self.mass_total_kg * (1.0 + self.rotating_inertia_factor)

    def with_fuel(self, fuel_kg: float) -> "VehicleParameters":
        """The same car with another fuel load [kg] (only the fuel is checked again: the rest was
        checked when this car was made)."""
        check_number("VehicleParameters", "fuel_kg", fuel_kg, minimum=0.0)
        car = copy.copy(self)
        object.__setattr__(car, "fuel_kg", fuel_kg)
        return car

    def rolling_radius_m(self, axle: str) -> float:
        """Rolling radius of the 'front' or 'rear' axle [m]."""
        if axle == "front":
            return self.rolling_radius_front_m
        if axle == "rear":
            return self.rolling_radius_rear_m
        raise ScenarioError(f"axle must be 'front' or 'rear', got {shown(axle)}")



def drag_force_n(speed_mps, vehicle: VehicleParameters):
    """Aerodynamic drag 1/2 rho C_d A v^2 [N] at speed [m/s]."""
    v = np.asarray(speed_mps, dtype=float)
    return 0.5 * vehicle.air_density_kg_m3 * vehicle.drag_cd_a_m2 * v * v


def downforce_n(speed_mps, vehicle: VehicleParameters):
    """Aerodynamic downforce 1/2 rho C_L A v^2 [N] at speed [m/s]."""
    v = np.asarray(speed_mps, dtype=float)
    return 0.5 * vehicle.air_density_kg_m3 * vehicle.downforce_cl_a_m2 * v * v


def rolling_resistance_force_n(speed_mps, vehicle: VehicleParameters, grade_rad=0.0):
    """Tyre rolling resistance C_rr (m g cos(grade) + downforce) [N].

    The normal load includes the aerodynamic downforce; grade is positive uphill [rad].
    """
    weight_normal = vehicle.mass_total_kg * STANDARD_GRAVITY * np.cos(grade_rad)
    return vehicle.rolling_resistance_coefficient * (weight_normal + downforce_n(speed_mps, vehicle))
