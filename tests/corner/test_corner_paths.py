"""Duct and vane heat paths: the effectiveness-NTU bound, the hand-calculated effectiveness, and
duct flow given as area, volume flow or duct velocity.

Effectiveness-NTU: Q = eps m_dot c_p (T_surface - T_in), eps = 1 - exp(-NTU), NTU = hA/(m_dot c_p)
(Kays & London, Compact Heat Exchangers, 3rd ed., 1984), so a duct never removes more than
m_dot c_p (T_surface - T_in).
"""
from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import CoolProp.CoolProp as CP
import numpy as np
import pytest

from thermo.corner import paths
from thermo.corner.build import build_corner
from thermo.correlations import air
from thermo.errors import ScenarioError
from thermo.scenario import load_scenario

SMALL = Path(__file__).resolve().parents[1] / "data" / "small.toml"
SPEEDS = np.array([2.0, 10.0, 25.0, 45.0, 70.0, 90.0])              # [m/s]
SURFACES = np.array([320.0, 450.0, 650.0, 900.0, 1100.0])          # [K]
AIR_IN_K = 306.15


def _duct_path(model):
    link = next(link for link in model.network.links if link.group == "duct")
    return link.conductance


def _grid():
    v, ts = np.meshgrid(SPEEDS, SURFACES, indexing="ij")
    return v.ravel(), ts.ravel(), np.full(v.size, AIR_IN_K)


def _coolprop_capacity_rate(duct, speed, surface_k, pressure_pa):
    """m_dot c_p with the density at the inlet air and c_p at the film temperature from CoolProp."""
    rho = np.array([CP.PropsSI("D", "T", AIR_IN_K, "P", pressure_pa, "Air")] * speed.size)
    cp = np.array([CP.PropsSI("C", "T", 0.5 * (ts + AIR_IN_K), "P", pressure_pa, "Air") for ts in surface_k])
    return duct.mass_flow_kg_s(speed, rho) * cp


@pytest.mark.parametrize("multiplier", [1.0, 2.5, 10.0, 1.0e6])
def test_duct_never_removes_more_than_mdot_cp(front, multiplier):
    design = replace(front, airflow=replace(front.airflow, duct_effectiveness_multiplier=multiplier))
    model = build_corner(design, 101300.0, grid=None)
    g = _duct_path(model)(*_grid())
    bound = _coolprop_capacity_rate(front.ducts[0], _grid()[0], _grid()[1], 101300.0)
    # CoolProp (reference library) for air density and c_p; 1 % allowance for the project's own
    # ideal-gas density and Incropera Table A.4 c_p against CoolProp's
    assert np.all(g <= 1.01 * bound)
    assert np.all(g > 0)
    if multiplier == 1.0e6:
        # NTU -> infinity: eps -> 1, the duct air leaves at the surface temperature
        assert g == pytest.approx(bound, rel=0.01)


def test_effectiveness_is_one_minus_exp_minus_ntu_by_hand():
    # hand calculation: hA = 30 W/K, m_dot = 0.02 kg/s, c_p = 1007 J/(kg K) (Incropera Table A.4,
    # 300 K): C = 20.14 W/K, NTU = 1.48957, eps = 1 - exp(-1.48957) = 0.774531, G = 15.59906 W/K
    g = paths._effectiveness_conductance(30.0, 0.02, 1007.0)
    assert g == pytest.approx(15.59906, rel=1e-6)
    # limits: small NTU -> G = hA; large NTU -> G = m_dot c_p; zero flow -> no heat carried
    assert paths._effectiveness_conductance(1e-6, 0.02, 1007.0) == pytest.approx(1e-6, rel=1e-6)
    assert paths._effectiveness_conductance(1e6, 0.02, 1007.0) == pytest.approx(20.14, rel=1e-12)
    assert paths._effectiveness_conductance(30.0, 0.0, 1007.0) == 0.0


def test_disc_eye_duct_conductance_is_the_ntu_form_of_its_own_h(front):
    model = build_corner(front, 101300.0, grid=None)
    path = _duct_path(model)
    assert isinstance(path, paths.DuctToDiscEye)
    v, ts, ta = _grid()
    film = np.maximum(0.5 * (ts + ta), 200.0)
    mdot = front.ducts[0].mass_flow_kg_s(v, air.air_density(101300.0, ta))
    h_area = front.airflow.duct_effectiveness_multiplier * paths.passage_h_area(mdot, film, path.passages)
    c_rate = mdot * air.air_specific_heat(film)
    expected = c_rate * (1.0 - np.exp(-h_area / c_rate))          # Kays & London eps-NTU
    assert path(v, ts, ta) == pytest.approx(expected, rel=1e-12)
    # the mass flow is rho v A_inlet C_eff (PHYSICS.md section 3): 9000 mm^2, C_eff 0.6
    rho = air.air_density(101300.0, AIR_IN_K)
    assert front.ducts[0].mass_flow_kg_s(50.0, rho) == pytest.approx(rho * 50.0 * 9000e-6 * 0.6, rel=1e-12)


def test_duct_flow_as_volume_flow_or_velocity_gives_the_same_conductance():
    # area mode: m_dot = rho v A C_eff = rho x 9000 mm^2 x 0.6 x v. The same air as a volume flow at
    # the reference speed of 200 km/h: Q = 55.556 m/s x 5.4e-3 m^2 = 0.3 m^3/s; as an outlet velocity
    # over 4000 mm^2: u = 0.3 / 4e-3 = 75 m/s (hand calculation)
    base = [("corners.front.ducts.main.reference_speed_kmh", 200.0)]
    area = load_scenario(SMALL, base)
    volume = load_scenario(SMALL, base + [("corners.front.ducts.main.flow", "volume_flow"),
                                          ("corners.front.ducts.main.volume_flow_m3_s", 0.3)])
    velocity = load_scenario(SMALL, base + [("corners.front.ducts.main.flow", "duct_velocity"),
                                            ("corners.front.ducts.main.duct_velocity_m_s", 75.0),
                                            ("corners.front.ducts.main.outlet_area_mm2", 4000.0)])
    v, ts, ta = _grid()
    g = [_duct_path(build_corner(sc.corners[0], 101300.0, grid=None))(v, ts, ta) for sc in (area, volume, velocity)]
    assert g[1] == pytest.approx(g[0], rel=1e-9)
    assert g[2] == pytest.approx(g[0], rel=1e-9)


def test_duct_flow_mode_without_its_value_is_an_error():
    with pytest.raises(ScenarioError, match="volume_flow_m3_s"):
        load_scenario(SMALL, [("corners.front.ducts.main.flow", "volume_flow")])


def test_vane_passages_carry_no_more_than_their_pumped_air(front):
    design = replace(front, ducts=())
    model = build_corner(design, 101300.0, grid=None)
    path = next(link for link in model.network.links if link.name == "disc_vane_convection").conductance
    v, ts, ta = _grid()
    g = path(v, ts, ta)
    film = np.maximum(0.5 * (ts + ta), 200.0)
    c_rate = path.pumped_mass_flow(v, ta) * air.air_specific_heat(film)
    moving = v >= 10.0            # at walking pace the natural-convection floor takes over
    assert np.all(g[moving] <= c_rate[moving] * (1 + 1e-12))      # Kays & London bound
    # pumped flow = rho x coefficient x rim speed x passage inlet area (linear in wheel speed)
    assert path.pumped_mass_flow(60.0, AIR_IN_K) == pytest.approx(2 * path.pumped_mass_flow(30.0, AIR_IN_K), rel=1e-12)


def test_limpert_disc_form_against_its_formula_and_it_cools_more_than_the_rotating_disc():
    import numpy as np
    from thermo.correlations.forced import nusselt_brake_disc_limpert
    from thermo.corner.paths import RotatingDiscFaces
    # Limpert, Brake Design and Safety (1999), as quoted in the physics reference:
    # 0.70 Re^0.55 laminar, 0.04 Re^0.8 above Re 2.4e5
    assert nusselt_brake_disc_limpert(1.0e5) == np.float64(0.70 * 1.0e5 ** 0.55)
    assert nusselt_brake_disc_limpert(1.0e6) == np.float64(0.04 * 1.0e6 ** 0.8)
    args = (0.128, 0.19, 0.335, 0.5, 1.0, 101325.0)
    speeds = np.array([20.0, 50.0, 80.0])
    rotating = RotatingDiscFaces(*args)(speeds, 900.0, 300.0)
    limpert = RotatingDiscFaces(*args, face_correlation="limpert")(speeds, 900.0, 300.0)
    # the two readings differ by about 3x at speed (physics reference, section 3)
    assert np.all(limpert > 1.5 * rotating)
