"""One stop into a corner with (nearly) no cooling: the disc takes exactly gamma E.

Lumped single stop, Day, Braking of Road Vehicles (2014), section 8.4: the friction-ring
temperature rise is dT = gamma E / (m c), with E the stop's kinetic energy taken by the corner
(energy conservation: 1/2 m_eff (v1^2 - v2^2) with drag, rolling and engine braking off) and
gamma the disc's share (area-weighted effusivity form, Newcomb & Spurr, Braking of Road
Vehicles, 1967; Day 2014).
"""
from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from lapdata.units import KMH, STANDARD_GRAVITY
from thermo.corner.build import ROOM_K, build_corner
from thermo.corner.geometry import AirflowSettings
from thermo.duty.bias import FixedBias, front_power_share
from thermo.duty.corner_duty import CornerBrake, corner_heat_inputs
from thermo.duty.vehicle import VehicleParameters
from thermo.materials import get_material
from thermo.network import Schedule
from thermo.solver import SolverSettings, solve_network

TINY = 1e-9   # every cooling path and joint scaled down to this (they must stay > 0)


def insulated(design):
    """The design with every path out of the disc made negligible: no duct, tiny convection,
    tiny contact conductances, near-black-body-free (emissivity ~ 0) disc."""
    airflow = AirflowSettings(local_airflow_factor=design.airflow.local_airflow_factor, disc_convection_multiplier=TINY,
                              vane_convection_multiplier=TINY,
                              caliper_convection_multiplier=TINY, hub_convection_multiplier=TINY,
                              duct_effectiveness_multiplier=TINY, contact_conductance_multiplier=TINY)
    return replace(design, ducts=(), airflow=airflow, disc=replace(design.disc, emissivity_override=TINY))


def test_partition_is_the_area_weighted_effusivity_form(front):
    # Newcomb & Spurr (1967) / Day (2014): gamma = 1 / (1 + (A_p / A_d)(e_p / e_d)), e = sqrt(k rho c);
    # A_d: both faces of the swept ring, A_p: both pads
    disc, pad = get_material("grey_cast_iron"), get_material("pad_semi_metallic")
    e = lambda m: math.sqrt(m.conductivity(ROOM_K) * m.density_kg_m3 * m.specific_heat(ROOM_K))  # noqa: E731
    a_disc = 2 * math.pi / 4 * (0.380 ** 2 - 0.250 ** 2)
    a_pad = 2 * 9500e-6
    gamma = 1.0 / (1.0 + (a_pad / a_disc) * (e(pad) / e(disc)))
    assert build_corner(front, grid=None).heat_partition == pytest.approx(gamma, rel=1e-12)
    # check value of PHYSICS.md section 1: grey iron e_d = 13 440 against an organic pad e_p = 1414
    # with A_p/A_d = 0.18 gives gamma = 0.981 (computed from the formula)
    assert 1.0 / (1.0 + 0.18 * 1414.0 / 13440.0) == pytest.approx(0.981, abs=5e-4)


def test_lumped_single_stop_puts_gamma_e_into_the_disc(front):
    # the classic lumped stop takes the partition as given: a fixed share (the formula's), with the
    # pad held off the disc (no resting contact), so the disc takes exactly gamma E
    formula = build_corner(front, grid=None).heat_partition
    design = insulated(front)
    design = replace(design, pad=replace(design.pad, partition_override=formula, rest_contact_conductance_w_m2k=0.0))
    model = build_corner(design, grid=None)
    gamma = model.heat_partition
    vehicle = VehicleParameters(mass_kg=1098.0, fuel_kg=0.0, drag_cd_a_m2=0.0, downforce_cl_a_m2=0.0,
                                rolling_resistance_coefficient=0.0, rolling_radius_front_m=0.335,
                                rolling_radius_rear_m=0.345, air_density_kg_m3=1.17,
                                rotating_inertia_factor=0.04, engine_braking_force_n=0.0)
    v1, v2, decel = 200 * KMH, 80 * KMH, 1.5 * STANDARD_GRAVITY
    t_stop = (v1 - v2) / decel
    t = np.linspace(0.0, t_stop + 4.0, 1201)
    v = np.maximum(v1 - decel * t, v2)
    brake = CornerBrake(name="front_left", axle="front", side="left", partition=gamma,
                        piston_area_one_side_m2=design.piston.area_one_side_m2, pad_mu=design.pad_mu,
                        effective_radius_m=design.effective_radius_m, rolling_radius_m=0.335)
    duty = corner_heat_inputs(t, v, vehicle, FixedBias(0.6), [brake])["front_left"]
    # energy conservation: the car's kinetic energy, front power share from the torque bias and the
    # rolling radii, half of the axle to the left corner
    corner_share = front_power_share(0.6, 0.335, 0.345) * 0.5
    e_corner = corner_share * 0.5 * vehicle.mass_effective_kg * (v1 ** 2 - v2 ** 2)
    assert np.trapezoid(duty.brake_heat_w, t) == pytest.approx(e_corner, rel=1e-9)

    ambient = np.full_like(t, 301.15)
    schedule = Schedule(t, {"disc_heat_w": duty.disc_heat_w, "pad_heat_w": duty.pad_heat_w,
                            "pad_clamp": (duty.brake_heat_w > 0).astype(float),
                            "vehicle_speed_m_s": v, "ambient_k": ambient, "duct_air_k": ambient})
    T0 = np.full(len(model.network.node_names), 301.15)
    sol = solve_network(model.network, schedule, T0, SolverSettings(method="LSODA", rtol=1e-9, atol_k=1e-7))
    rise = sol.temperature("disc")[-1] - 301.15

    mass = next(n for n in model.network.nodes if n.name == "disc").heat_capacity.mass_kg
    iron = get_material("grey_cast_iron")
    # Day section 8.4: dT = gamma E / (m c). The iron's c rises linearly between its 20 and 200 degC
    # table points (materials.toml), so the mean c over the rise is c at the mean temperature:
    dT = 0.0
    for _ in range(50):
        dT = gamma * e_corner / (mass * iron.specific_heat(301.15 + dT / 2))
    assert 50.0 < dT < 150.0       # the stop stays inside that linear segment of c(T)
    assert rise == pytest.approx(dT, abs=0.01)
    assert sol.heat_in_j == pytest.approx(e_corner, rel=1e-6)
