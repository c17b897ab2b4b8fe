"""A pad that wears takes new values, not a new corner: ``worn_corner`` must give exactly the model
``build_corner`` builds for the worn design, and its kernel arrays (``kernel_network_like``)
exactly those ``batch_network`` makes of that model. The reference is the full build itself, so
any value of the pad that ``pad_terms`` missed shows here as a difference."""
from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from thermo.corner.build import build_corner, worn_corner
from thermo.network import Conduction, Convection, Radiation
from thermo.network.assemble import compile_network
from thermo.scenario import load_scenario
from thermo.solver.kernel_arrays import batch_network, kernel_network, kernel_network_like

DEMO = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
CASES = {
    "demo pads (semi-metallic, layered)": [],
    "fixed heat partition": [("corners.front.pad.heat_partition", 0.8)],
    # no pad material of the library has a k(T) table; carbon-ceramic has one, so the conduction
    # between the pad's layers follows it (a tabulated link whose scale is the geometry)
    "a friction material with k(T)": [("corners.front.pad.material", "carbon_ceramic")],
    "one lumped pad node": [("corners.front.pad.layers", 1)],
}
SHARES = (0.97, 0.8, 0.6, 0.45, 0.3)      # worn thickness / new thickness


def _front(overrides):
    scenario = load_scenario(DEMO, overrides)
    return next(d for d in scenario.corners if d.name == "front")


def _value(link):
    if isinstance(link, Conduction):
        return link.conductance_w_k
    if isinstance(link, Radiation):
        return link.coefficient_w_k4
    return link.scale


def _assert_same_model(worn, built):
    assert worn.design == built.design
    assert worn.network.node_names == built.network.node_names
    for a, b in zip(worn.network.nodes, built.network.nodes):
        assert a.heat_capacity.mass_kg == pytest.approx(b.heat_capacity.mass_kg, rel=1e-12), a.name
        assert a.heat_capacity.specific_heat_j_kgk == b.heat_capacity.specific_heat_j_kgk
    assert [link.name for link in worn.network.links] == [link.name for link in built.network.links]
    for a, b in zip(worn.network.links, built.network.links):
        assert type(a) is type(b) and (a.a, a.b) == (b.a, b.b), a.name
        assert _value(a) == pytest.approx(_value(b), rel=1e-12), a.name
        if isinstance(a, Convection):
            assert np.array_equal(a.conductance.table, b.conductance.table), a.name
    assert [(s.node, s.signal) for s in worn.network.sources] == [(s.node, s.signal) for s in built.network.sources]
    assert [s.fraction for s in worn.network.sources] == pytest.approx([s.fraction for s in built.network.sources],
                                                                       rel=1e-12)
    np.testing.assert_allclose(worn.output_weights, built.output_weights, rtol=1e-12, atol=1e-15)


@pytest.mark.parametrize("case", list(CASES))
def test_a_worn_pad_gives_the_corner_a_full_build_gives(case):
    """Worn lap by lap (2 % a step, as a run wears it) down to 30 %, and renewed."""
    design = _front(CASES[case])
    model = build_corner(design)
    layers = len(model.pad_nodes)
    compared = rebuilt = 0
    for thickness in list(np.linspace(0.98, 0.3, 35) * design.pad.thickness_m) + [design.pad.thickness_m]:
        built = build_corner(replace(design, pad=replace(design.pad, thickness_m=thickness, layers=layers)))
        worn = worn_corner(model, thickness)
        if worn is None:
            # the only change of shape there is: the pads' edges leave from another layer
            edge = lambda m: next(link.a for link in m.network.links if link.name == "pad_edge_convection")
            assert edge(built) != edge(model)
            rebuilt += 1
            model = built
            continue
        compared += 1
        _assert_same_model(worn, built)
        # and the kernel's arrays, taken by values only from the previous pad's, are the full build's
        old_net = compile_network(model.network)
        kernel_network(old_net)
        like = kernel_network_like(old_net, compile_network(worn.network))
        ref = batch_network([built.network])
        assert like is not None
        for field in ("par", "mass", "base", "seg_lo", "seg_hi", "seg_slope", "src"):
            np.testing.assert_allclose(getattr(like, field), getattr(ref, field), rtol=1e-12, atol=0, err_msg=field)
        np.testing.assert_array_equal(like.tables[like.tix[0]], ref.tables[ref.tix[0]])
        model = worn
    assert compared >= 30 and rebuilt <= 4


def test_networks_of_another_shape_get_no_borrowed_arrays():
    design = _front([])
    a = compile_network(build_corner(design).network)
    kernel_network(a)
    other = compile_network(build_corner(_front([("corners.front.pad.layers", 2)])).network)
    assert kernel_network_like(a, other) is None
    assert not hasattr(other, "_kernel_network")
