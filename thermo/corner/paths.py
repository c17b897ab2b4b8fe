"""Convective heat paths of a brake corner as conductance functions G(speed, T_surface, T_air) [W/K].

Each class holds only geometry and coefficients and is called by the network with numpy arrays:
``path(vehicle_speed_m_s, surface_temperature_k, air_temperature_k) -> G``. Air properties are
taken at the film temperature. Forced and natural convection are combined with Churchill's
rule Nu^3 = Nu_F^3 + Nu_N^3, so every path falls back to natural convection when the car stops.
Paths that carry a finite air mass flow (vane passages, ducts, piston vent holes) are heat
exchangers in the effectiveness-NTU form G = eps m_dot c_p, eps = 1 - exp(-hA / (m_dot c_p))
(Kays & London, Compact Heat Exchangers, 3rd ed., 1984), so their heat removal never exceeds
m_dot c_p (T_surface - T_air).

A path fed by a duct also has ``table_key(grid)``: the values its table on a ``ConductanceGrid``
depends on, the duct's air mass flow at every (driver, boundary) point of the grid in place of the
duct itself (``thermo.corner.build`` caches tables by it: a duct's air temperature rise, or another
inlet area that leaves the passages the same pumped flow, changes no table).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from lapdata.units import STANDARD_GRAVITY
from thermo.correlations import air, forced, internal, natural

_FILM_FLOOR_K = 200.0


def _film(surface_k, air_k):
    return np.maximum(0.5 * (np.asarray(surface_k, float) + np.asarray(air_k, float)), _FILM_FLOOR_K)


def _natural_nusselt_vertical(length_m, surface_k, air_k, pressure_pa):
    film = _film(surface_k, air_k)
    nu = air.air_kinematic_viscosity(pressure_pa, film)
    alpha = air.air_thermal_diffusivity(pressure_pa, film)
    dt = np.abs(np.asarray(surface_k, float) - np.asarray(air_k, float))
    rayleigh = STANDARD_GRAVITY * air.air_thermal_expansion(film) * dt * length_m ** 3 / (nu * alpha)
    return natural.nusselt_vertical_plate_churchill_chu(np.maximum(rayleigh, 0.1), air.air_prandtl(film))


def _effectiveness_conductance(h_area_w_k, mass_flow_kg_s, cp_j_kgk):
    """eps m_dot c_p with eps = 1 - exp(-NTU): bounded by m_dot c_p (Kays & London)."""
    capacity_rate = np.asarray(mass_flow_kg_s, float) * cp_j_kgk
    with np.errstate(divide="ignore", invalid="ignore"):
        ntu = np.where(capacity_rate > 0, h_area_w_k / np.where(capacity_rate > 0, capacity_rate, 1.0), 0.0)
    return capacity_rate * (1.0 - np.exp(-ntu))


@dataclass(frozen=True)
class PlateInAirflow:
    """A surface in the wheel-well airflow (caliper, upright, hub, bell, backing plate).

    Forced: flat plate over ``length_m`` at local speed = airflow_factor x car speed (laminar and
    turbulent mean Nusselt, Incropera eq. 7.38 form); natural: Churchill & Chu vertical plate.
    """

    area_m2: float
    length_m: float
    airflow_factor: float
    multiplier: float
    pressure_pa: float

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        k_air = air.air_conductivity(film)
        local = self.airflow_factor * np.abs(np.asarray(speed_m_s, float))
        reynolds = local * self.length_m / air.air_kinematic_viscosity(self.pressure_pa, film)
        nu_forced = forced.nusselt_flat_plate_incropera(np.maximum(reynolds, 1.0), air.air_prandtl(film))
        nu_natural = _natural_nusselt_vertical(self.length_m, surface_k, air_k, self.pressure_pa)
        nusselt = forced.nusselt_mixed_churchill(nu_forced, nu_natural)
        return self.multiplier * nusselt * k_air / self.length_m * self.area_m2


@dataclass(frozen=True)
class RotatingDiscFaces:
    """Both faces of the friction ring: a disc rotating at the wheel speed in the wheel-well air.

    Rotational Reynolds number Re_w = w b^2 / nu with b the outer radius and w = v / r_roll; mean
    Nusselt from the rotating-disc correlation (laminar Cobb & Saunders 1956, turbulent above
    Re_w = 2.4e5). The cross-flow over the face at the local airflow speed (flat plate over the
    outer diameter) is taken instead where it is larger. Natural convection when stationary.
    ``face_correlation = "limpert"`` uses instead Limpert's disc form on the local air speed over
    the outer diameter (``forced.nusselt_brake_disc_limpert``). ``multiplier`` = 1 is the published
    correlations as they stand. Against measurement (tests/corner/test_corner_paths.py): the rise
    of the face h with rotor speed implied by McPhee & Johnson (2008) is met within 15 %; the
    stationary Churchill & Chu value reads up to twice the 3-5 W/(m^2 K) that Topouris et al.
    (2020) measured on stationary discs.
    """

    area_m2: float
    outer_radius_m: float
    rolling_radius_m: float
    airflow_factor: float
    multiplier: float
    pressure_pa: float
    face_correlation: str = "rotating"

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        k_air = air.air_conductivity(film)
        nu_air = air.air_kinematic_viscosity(self.pressure_pa, film)
        speed = np.abs(np.asarray(speed_m_s, float))
        length = 2 * self.outer_radius_m
        if self.face_correlation == "limpert":
            re_local = np.maximum(self.airflow_factor * speed * length / nu_air, 1.0)
            h_forced = forced.nusselt_brake_disc_limpert(re_local) * k_air / length
        else:
            omega = speed / self.rolling_radius_m
            re_rot = np.maximum(omega * self.outer_radius_m ** 2 / nu_air, 1.0)
            h_rot = forced.nusselt_rotating_disc_cobb_saunders(re_rot) * k_air / self.outer_radius_m
            re_cross = np.maximum(self.airflow_factor * speed * length / nu_air, 1.0)
            h_cross = forced.nusselt_flat_plate_incropera(re_cross, air.air_prandtl(film)) * k_air / length
            h_forced = np.maximum(h_rot, h_cross)
        h_natural = _natural_nusselt_vertical(length, surface_k, air_k, self.pressure_pa) * k_air / length
        h = forced.nusselt_mixed_churchill(h_forced, h_natural)  # the cube rule is linear-homogeneous in h
        return self.multiplier * h * self.area_m2


@dataclass(frozen=True)
class VanePassages:
    """Air pumped through the vane passages of a vented disc (a centrifugal fan).

    Through-flow speed u = pumping coefficient x rim speed omega r_o, so the air mass flow rises
    linearly with wheel speed. h from ``internal.nusselt_vented_disc_passage``: Gnielinski's
    developing-flow equation on the speed of the air relative to the rotating passage inlet,
    w = (u^2 + (omega r_i)^2)^(1/2), floored by Baehr-Stephan laminar developing flow on u; on a
    rotor rig this reproduces the measured, nearly linear rise of the passage h with speed
    (McPhee & Johnson 2008, tests/corner/test_corner_paths.py). ``multiplier`` = 1 is that
    correlation. The path is an effectiveness-NTU exchanger on the pumped air. When a disc-eye
    duct feeds the passages, the pumped share is what the duct does not already supply (total
    flow = max(pumped, ducted), documented). A stationary disc keeps a natural-convection floor
    on the wetted area.
    """

    wetted_area_m2: float
    flow_area_m2: float
    hydraulic_diameter_m: float
    passage_length_m: float
    outer_radius_m: float
    rolling_radius_m: float
    pumping_coefficient: float
    multiplier: float
    pressure_pa: float
    ducted: object = None          # a DuctGeometry feeding the disc eye, or None
    air_density_ref_kg_m3: float = 1.2

    def pumped_mass_flow(self, speed_m_s, air_k):
        rho = air.air_density(self.pressure_pa, np.asarray(air_k, float))
        omega = np.abs(np.asarray(speed_m_s, float)) / self.rolling_radius_m
        flow = rho * self.pumping_coefficient * omega * self.outer_radius_m * self.flow_area_m2
        if self.ducted is not None:
            flow = np.maximum(flow - self.ducted.mass_flow_kg_s(np.abs(speed_m_s), rho), 0.0)
        return flow

    def table_key(self, grid) -> tuple:
        """What this path's table on ``grid`` depends on: the passages without their duct, and the
        pumped mass flow at every (driver, boundary) point of the grid, to the bit [-]."""
        if self.ducted is None:
            return (self,)
        flow = self.pumped_mass_flow(*_driver_boundary(grid))
        return (replace(self, ducted=None), flow.tobytes())

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        mass_flow = self.pumped_mass_flow(speed_m_s, air_k)
        h_area = self.multiplier * passage_h_area(mass_flow, film, self, speed_m_s)
        forced_g = _effectiveness_conductance(h_area, mass_flow, air.air_specific_heat(film))
        k_air = air.air_conductivity(film)
        natural_g = (_natural_nusselt_vertical(self.passage_length_m, surface_k, air_k, self.pressure_pa)
                     * k_air / self.passage_length_m * self.wetted_area_m2 * 0.5)
        return np.maximum(forced_g, self.multiplier * natural_g)


def passage_h_area(mass_flow_kg_s, film_k, passages, speed_m_s=None) -> np.ndarray:
    """h A of the vane passages carrying a mass flow [W/K] (``internal.nusselt_vented_disc_passage``).

    The through-flow speed comes from the mass flow; the relative inlet speed adds the passage
    inlet's rotation omega r_i at the car speed ``speed_m_s`` (None: a passage at rest).
    """
    rho = air.air_density(passages.pressure_pa, film_k)
    velocity = np.asarray(mass_flow_kg_s, float) / (rho * passages.flow_area_m2)
    if speed_m_s is None:
        inlet_speed = 0.0
    else:
        omega = np.abs(np.asarray(speed_m_s, float)) / passages.rolling_radius_m
        inlet_speed = omega * (passages.outer_radius_m - passages.passage_length_m)
    relative = np.hypot(velocity, inlet_speed)
    nu_air = air.air_kinematic_viscosity(passages.pressure_pa, film_k)
    d_h = passages.hydraulic_diameter_m
    nusselt = internal.nusselt_vented_disc_passage(relative * d_h / nu_air, velocity * d_h / nu_air,
                                                 air.air_prandtl(film_k), d_h, passages.passage_length_m)
    return nusselt * air.air_conductivity(film_k) / d_h * passages.wetted_area_m2


def _duct_flow(duct, speed_m_s, air_k, pressure_pa):
    """(density of the duct air [kg/m^3], mass flow the duct delivers [kg/s]) at a car speed."""
    rho = air.air_density(pressure_pa, np.asarray(air_k, float))
    return rho, duct.mass_flow_kg_s(np.abs(np.asarray(speed_m_s, float)), rho)


def _driver_boundary(grid):
    """The grid's driver axis as a column and its boundary axis as a row: an air mass flow on them
    holds, element for element, the values a path computes on the whole grid."""
    return grid.axis("driver")[:, None], grid.axis("boundary")[None, :]


def _duct_flow_key(duct, grid, pressure_pa) -> bytes:
    """The duct's air mass flow at every (driver, boundary) point of ``grid``, as bytes [-]."""
    return _duct_flow(duct, *_driver_boundary(grid), pressure_pa)[1].tobytes()


@dataclass(frozen=True)
class DuctToDiscEye:
    """Duct air fed into the disc eye and carried through the vane passages (effectiveness-NTU)."""

    duct: object
    passages: VanePassages
    multiplier: float
    pressure_pa: float

    def table_key(self, grid) -> tuple:
        """What this path's table on ``grid`` depends on: the passages' geometry, the multiplier,
        the pressure and the duct's mass flow at every (driver, boundary) point of the grid [-]."""
        return (replace(self, duct=None, passages=replace(self.passages, ducted=None)),
                _duct_flow_key(self.duct, grid, self.pressure_pa))

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        _, mass_flow = _duct_flow(self.duct, speed_m_s, air_k, self.pressure_pa)
        h_area = self.multiplier * passage_h_area(mass_flow, film, self.passages, speed_m_s)
        return _effectiveness_conductance(h_area, mass_flow, air.air_specific_heat(film))


@dataclass(frozen=True)
class DuctJetOnSurface:
    """Duct air blown onto a surface (disc face, caliper): flat plate at the jet speed, effectiveness-NTU."""

    duct: object
    area_m2: float
    length_m: float
    multiplier: float
    pressure_pa: float

    def table_key(self, grid) -> tuple:
        """What this path's table on ``grid`` depends on: the jet's area, length and multiplier, the
        pressure, the duct's outlet area and its mass flow at every (driver, boundary) point [-]."""
        return (replace(self, duct=None), self.duct.outlet_area_m2, _duct_flow_key(self.duct, grid, self.pressure_pa))

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        rho, mass_flow = _duct_flow(self.duct, speed_m_s, air_k, self.pressure_pa)
        jet_speed = mass_flow / (rho * self.duct.outlet_area_m2)
        reynolds = np.maximum(jet_speed * self.length_m / air.air_kinematic_viscosity(self.pressure_pa, film), 1.0)
        h = forced.nusselt_flat_plate_incropera(reynolds, air.air_prandtl(film)) * air.air_conductivity(film) / self.length_m
        return _effectiveness_conductance(self.multiplier * h * self.area_m2, mass_flow, air.air_specific_heat(film))


@dataclass(frozen=True)
class PistonVentHoles:
    """Wheel-well air through radial holes in the piston wall, behind the crown (vented pistons).

    Hole speed = hole_flow_coefficient x local airflow speed; h from the internal-flow correlation
    in the holes (length = wall thickness) over the holes' walls and the inside of the piston cup;
    effectiveness-NTU on the air that passes. Natural convection inside the cup when stationary.
    """

    hole_count: int
    hole_diameter_m: float
    hole_length_m: float
    inner_area_m2: float
    airflow_factor: float
    hole_flow_coefficient: float
    multiplier: float
    pressure_pa: float

    def __call__(self, speed_m_s, surface_k, air_k):
        film = _film(surface_k, air_k)
        rho = air.air_density(self.pressure_pa, np.asarray(air_k, float))
        hole_area = self.hole_count * math.pi / 4 * self.hole_diameter_m ** 2
        velocity = self.hole_flow_coefficient * self.airflow_factor * np.abs(np.asarray(speed_m_s, float))
        mass_flow = rho * velocity * hole_area
        nu_air = air.air_kinematic_viscosity(self.pressure_pa, film)
        reynolds = np.maximum(velocity * self.hole_diameter_m / nu_air, 1.0)
        k_air = air.air_conductivity(film)
        nusselt = internal.nusselt_internal_vented_vane(reynolds, air.air_prandtl(film), self.hole_diameter_m,
                                                      max(self.hole_length_m, self.hole_diameter_m))
        wetted = self.inner_area_m2 + self.hole_count * math.pi * self.hole_diameter_m * self.hole_length_m
        h_area = self.multiplier * nusselt * k_air / self.hole_diameter_m * wetted
        forced_g = _effectiveness_conductance(h_area, mass_flow, air.air_specific_heat(film))
        length = math.sqrt(self.inner_area_m2)
        natural_g = _natural_nusselt_vertical(length, surface_k, air_k, self.pressure_pa) * k_air / length * self.inner_area_m2
        return np.maximum(forced_g, self.multiplier * natural_g)


@dataclass(frozen=True)
class ConductivityRatio:
    """k(T) / k(20 degC) of a solid, at the temperature of a conduction's first end [-].

    Used as the conductance function of a node-to-node link whose ``scale`` is the conductance at
    20 degC [W/K], so a conduction through a disc or pad layer follows the material's k(T) table
    (interpolated linearly, held beyond its ends, as ``Material.conductivity``). k is taken at the
    first end (the layer nearer the friction face): between neighbouring layers the two ends differ
    by tens of kelvin, a change of k of a few per cent at most for grey iron. One table serves
    every link of the material (it depends on neither the driver nor the second end).
    """

    temperatures_k: tuple[float, ...]
    conductivities_w_mk: tuple[float, ...]
    reference_k: float = 293.15

    @classmethod
    def of(cls, material) -> "ConductivityRatio":
        temps, values = material.conductivity_table
        return cls(tuple(float(t) for t in temps), tuple(float(k) for k in values))

    def __call__(self, driver, first_k, second_k):
        shape = np.broadcast_shapes(np.shape(driver) if driver is not None else (), np.shape(first_k), np.shape(second_k))
        k_ref = np.interp(self.reference_k, self.temperatures_k, self.conductivities_w_mk)
        ratio = np.interp(np.asarray(first_k, dtype=float), self.temperatures_k, self.conductivities_w_mk) / k_ref
        return np.broadcast_to(ratio, shape).copy()
