"""The layered disc resolves the friction-surface temperature.

Constant flux q into a semi-infinite solid: T_s - T_i = 2 q sqrt(t / pi) / e, e = sqrt(k rho c)
(Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed., 1959; Incropera, Fundamentals of Heat
and Mass Transfer, Table 5.1). A 9 mm grey-iron cheek (L^2/alpha ~ 5.6 s) behaves as semi-infinite
for t up to ~2 s, which is where the layered disc must reproduce it.
"""
from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from thermo.corner.build import ROOM_K, build_corner, layer_thicknesses
from thermo.materials import get_material
from thermo.network import Schedule
from thermo.solver import SolverSettings, solve_network

from test_corner_lumped_stop import insulated

FLUX_W_M2 = 2.0e5     # small, so that c(T) of the iron stays within 1 % of its start value
T0_K = 301.15


def _surface_rise(front, layers, times):
    design = insulated(replace(front, disc=replace(front.disc, layers=layers)))
    model = build_corner(design, grid=None)
    t = np.linspace(0.0, max(times), 401)
    heat = np.full_like(t, FLUX_W_M2 * 2 * design.disc.ring_area_m2)   # both faces
    amb = np.full_like(t, T0_K)
    schedule = Schedule(t, {"disc_heat_w": heat, "pad_heat_w": 0 * heat, "vehicle_speed_m_s": 0 * heat,
                            "ambient_k": amb, "duct_air_k": amb})
    sol = solve_network(model.network, schedule, np.full(len(model.network.node_names), T0_K),
                        SolverSettings(method="LSODA", rtol=1e-8, atol_k=1e-7), output_times=times)
    return sol.temperature("disc_layer_1") - T0_K


@pytest.mark.parametrize("layers", [6, 12])
def test_layered_surface_follows_the_semi_infinite_solution(front, layers):
    iron = get_material("grey_cast_iron")
    e = math.sqrt(iron.conductivity(ROOM_K) * iron.density_kg_m3 * iron.specific_heat(ROOM_K))
    assert e == pytest.approx(13440.0, rel=1e-3)      # PHYSICS.md section 1 check value
    times = np.array([0.5, 1.0, 2.0])
    analytic = 2 * FLUX_W_M2 * np.sqrt(times / math.pi) / e
    assert analytic[2] == pytest.approx(23.74, abs=0.01)   # 2 x 2e5 x sqrt(2/pi) / 13440
    assert _surface_rise(front, layers, times) == pytest.approx(analytic, rel=0.03)


def test_three_layers_are_too_coarse_for_the_first_second(front):
    """The check above can fail: three graded layers (first layer 1.3 mm) lag the analytic surface."""
    iron = get_material("grey_cast_iron")
    e = math.sqrt(iron.conductivity(ROOM_K) * iron.density_kg_m3 * iron.specific_heat(ROOM_K))
    rise = _surface_rise(front, 3, np.array([1.0]))[0]
    assert rise < 0.9 * 2 * FLUX_W_M2 * math.sqrt(1.0 / math.pi) / e


def test_layer_thicknesses_are_graded_and_fill_the_cheek():
    dx = layer_thicknesses(0.009, 6)
    assert dx.sum() == pytest.approx(0.009, rel=1e-12)
    assert np.all(np.diff(dx) > 0)
    assert dx[1] / dx[0] == pytest.approx(1.8, rel=1e-12)
