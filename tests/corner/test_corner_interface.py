"""The pad-disc interface: the friction heat split by the two bodies' resistances.

Reference: two semi-infinite bodies heated at their common face from one start temperature share
the heat by their effusivities, per unit area e_d / (e_d + e_p); over areas A_d (disc, both faces
of the swept ring) and A_p (both pads) gamma = 1 / (1 + (A_p/A_d)(e_p/e_d)) (Newcomb & Spurr,
Braking of Road Vehicles, 1967; Day, Braking of Road Vehicles, 2014; Carslaw & Jaeger, Conduction
of Heat in Solids, 1959, section 2.9 for each body's response to a constant flux).
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from thermo.corner import interface
from thermo.corner.build import build_corner
from thermo.network import Schedule
from thermo.solver import SolverSettings, solve_network

from test_corner_lumped_stop import insulated

T0_K = 301.15


def _schedule(t, heat_w, clamp):
    amb = np.full_like(t, T0_K)
    return Schedule(t, {"disc_heat_w": heat_w, "pad_heat_w": 0 * heat_w, "pad_clamp": clamp,
                        "vehicle_speed_m_s": 0 * heat_w, "ambient_k": amb, "duct_air_k": amb})


def _auto_layers(design):
    return replace(design, disc=replace(design.disc, layers=0), pad=replace(design.pad, layers=0))


def _disc_energy(model, sol, start_k):
    nodes = [n for n in model.network.nodes if n.name.startswith("disc_layer_")]
    return sum(n.heat_capacity.enthalpy(sol.temperature(n.name)[-1]) - n.heat_capacity.enthalpy(start_k) for n in nodes)


def test_elimination_of_the_interface_is_exact():
    # Q = (Ti - Td)/Rd + (Ti - Tp)/Rp solved for Ti, then the disc's share: the closed form used
    r_d, r_p, q, t_d, t_p = 2e-4, 3e-2, 5e4, 700.0, 760.0
    t_i = (q + t_d / r_d + t_p / r_p) / (1 / r_d + 1 / r_p)
    into_disc = (t_i - t_d) / r_d
    closed = interface.interface_disc_share(r_d, r_p) * q + interface.applied_conductance(r_d, r_p) * (t_p - t_d)
    assert closed == pytest.approx(into_disc, rel=1e-12)
    # resting: no heat made, the contact conductance in series with both half-layers
    g = interface.rest_conductance(r_d, r_p, 400.0, 0.02)
    assert g == pytest.approx(1.0 / (r_d + r_p + 1.0 / (400.0 * 0.02)), rel=1e-12)
    assert interface.rest_conductance(r_d, r_p, 0.0, 0.02) == 0.0


@pytest.mark.parametrize("stop_s", [1.0, 2.0, 4.0])
def test_short_stop_from_one_temperature_splits_by_effusivity(front, stop_s):
    design = _auto_layers(insulated(front))
    model = build_corner(design, grid=None)
    gamma = model.heat_partition                       # the area-weighted effusivity form
    assert 0.95 < gamma < 0.99
    t = np.linspace(0.0, stop_s, 401)
    q = np.full_like(t, 2.0e5)
    sol = solve_network(model.network, _schedule(t, q, np.ones_like(t)), np.full(len(model.network.node_names), T0_K),
                        SolverSettings(method="LSODA", rtol=1e-9, atol_k=1e-8))
    share = _disc_energy(model, sol, T0_K) / (2.0e5 * stop_s)
    # the realised share within 1 % of the semi-infinite bodies' split (the discretisation's error)
    assert share == pytest.approx(gamma, rel=0.01)


def test_with_the_default_layers_the_direct_share_is_the_effusivity_form(front):
    # first layers of 0.3 sqrt(alpha x 1 s) on both sides make R_d / R_p = (A_p e_p) / (A_d e_d):
    # the share the sources put into the disc is then exactly Newcomb & Spurr's gamma (algebra)
    model = build_corner(_auto_layers(insulated(front)), grid=None)
    direct = sum(s.fraction for s in model.network.sources if s.node == model.disc_face_node) / 2   # two signals
    assert direct == pytest.approx(model.heat_partition, rel=1e-12)


@pytest.mark.parametrize("first_layer_factor", [0.3, 3.0])
@pytest.mark.parametrize("stop_s", [1.0, 4.0])
def test_the_clamped_exchange_restores_the_effusivity_split(front, monkeypatch, first_layer_factor, stop_s):
    """A pad whose first layer is 0.3 or 3 times the default puts a direct share of 0.91 or 0.99
    into the disc; the clamped conduction between the two first layers brings the heat the disc
    actually takes back to the semi-infinite bodies' split (Newcomb & Spurr 1967, as above)."""
    from thermo.corner import build, layers

    def pad_layers(design):
        material = build.get_material(design.pad.material)
        first = first_layer_factor * layers.first_layer_m(build._diffusivity(material))
        return layers.graded_layers(design.pad.thickness_m, first, build.PAD_MAX_LAYERS)
    monkeypatch.setattr(build, "pad_layers", pad_layers)
    model = build_corner(_auto_layers(insulated(front)), grid=None)
    gamma = model.heat_partition
    direct = sum(s.fraction for s in model.network.sources if s.node == model.disc_face_node) / 2
    assert abs(direct - gamma) > 0.015                      # the sources alone would miss the split
    t = np.linspace(0.0, stop_s, 401)
    q = np.full_like(t, 2.0e5)
    sol = solve_network(model.network, _schedule(t, q, np.ones_like(t)), np.full(len(model.network.node_names), T0_K),
                        SolverSettings(method="LSODA", rtol=1e-9, atol_k=1e-8))
    share = _disc_energy(model, sol, T0_K) / (2.0e5 * stop_s)
    assert share == pytest.approx(gamma, abs=0.004)         # measured 0.0003 to 0.0026
    assert 1.0 - share == pytest.approx(1.0 - gamma, rel=0.1)   # the pad's share too


def test_a_hot_pad_hands_heat_back_to_the_disc(front):
    """Clamped on a cooler disc with no friction heat: heat flows from the pad into the disc; with
    the pad resting, the flow is smaller (contact in series), and it never reverses the order."""
    design = _auto_layers(insulated(front))
    model = build_corner(design, grid=None)
    names = model.network.node_names
    start = np.full(len(names), T0_K)
    pads = [i for i, n in enumerate(names) if n.startswith("pad_layer_")]
    start[pads] = 700.0
    t = np.linspace(0.0, 5.0, 201)
    gained = {}
    for clamp in (1.0, 0.0):
        sol = solve_network(model.network, _schedule(t, 0 * t, np.full_like(t, clamp)), start,
                            SolverSettings(method="LSODA", rtol=1e-9, atol_k=1e-8))
        gained[clamp] = _disc_energy(model, sol, T0_K)
        out = model.outputs(sol.temperatures_k)
        face, pad = out[:, model.output_nodes.index("disc_surface")], out[:, model.output_nodes.index("pad_surface")]
        assert np.all(face <= pad + 1e-6)            # second law: the cooler body stays the cooler
    assert gained[1.0] > gained[0.0] > 0.0


def test_a_fixed_partition_still_rests_the_pad_on_the_disc(front):
    design = insulated(front)
    design = replace(design, pad=replace(design.pad, partition_override=0.9))
    links = {link.name: link for link in build_corner(design, grid=None).network.links}
    contact = links["pad_disc_interface"]
    assert contact.group == "pad_interface" and contact.conductance_w_k > 0
