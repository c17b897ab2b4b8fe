"""The corner network built from the small scenario's geometry: nodes, masses, topology."""
from __future__ import annotations

import math
from dataclasses import replace

import pytest

from thermo.corner.build import build_corner
from thermo.materials import get_material
from thermo.network import Conduction

SEVEN_NAMED = ("disc", "pad", "piston", "fluid", "caliper", "upright", "bearing")


def _mass(model, node):
    return next(n for n in model.network.nodes if n.name == node).heat_capacity.mass_kg


def test_the_seven_named_nodes_and_the_hub_are_outputs(front):
    model = build_corner(front, grid=None)
    for node in SEVEN_NAMED + ("hub",):
        assert node in model.output_nodes
    assert model.disc_check_node == "disc"
    layered = build_corner(replace(front, disc=replace(front.disc, layers=4)), grid=None)
    assert layered.output_nodes[:2] == ("disc", "disc_surface")
    assert layered.disc_check_node == "disc_surface"


def test_vented_disc_mass_from_geometry_matches_a_hand_calculation(front):
    # hand calculation for the front disc of tests/data/small.toml (380/250 mm, 36 mm overall,
    # two 9 mm cheeks, 48 rectangular vanes 4 mm thick spanning the 65 mm radial width and the
    # 18 mm passage height), grey iron 7100 kg/m^3 (PHYSICS.md section 5, handbook range):
    ring_face = math.pi / 4 * (0.380 ** 2 - 0.250 ** 2)     # 0.064324 m^2
    cheeks = 2 * ring_face * 0.009                           # 1.15783e-3 m^3
    vanes = 48 * 0.004 * 0.065 * 0.018                       # 2.2464e-4 m^3
    hand_kg = (cheeks + vanes) * 7100.0                      # 9.8155 kg
    assert hand_kg == pytest.approx(9.8155, abs=5e-4)
    model = build_corner(front, grid=None)
    assert _mass(model, "disc") == pytest.approx(hand_kg, rel=1e-9)
    # the layered disc redistributes the same metal: mass is conserved by the layering
    for layers in (3, 6):
        layered = build_corner(replace(front, disc=replace(front.disc, layers=layers)), grid=None)
        total = sum(_mass(layered, f"disc_layer_{i + 1}") for i in range(layers))
        assert total == pytest.approx(hand_kg, rel=1e-12)


def test_solid_disc_mass_is_the_full_ring(front):
    solid = replace(front.disc, vented=False, cheek_thickness_m=0.0, vane_count=0, vane_thickness_m=0.0,
                    thickness_m=0.028)
    model = build_corner(replace(front, disc=solid), grid=None)
    # hand calculation: pi/4 (0.380^2 - 0.250^2) x 0.028 m x 7100 kg/m^3 = 12.787 kg
    assert _mass(model, "disc") == pytest.approx(12.787, abs=1e-3)


def test_pad_and_piston_masses_from_geometry(front):
    model = build_corner(front, grid=None)
    pad = get_material(front.pad.material)
    # two pads of 9500 mm^2 x 24 mm: 2 x 9.5e-3 x 0.024 = 4.56e-4 m^3
    assert _mass(model, "pad") == pytest.approx(4.56e-4 * pad.density_kg_m3, rel=1e-12)
    # one piston cup of diameter d: crown pi/4 d^2 x 4 mm plus wall pi/4 (d^2 - (d - 6 mm)^2) x 22 mm;
    # d = 30, 32, 36 mm on each of the two sides
    cup = sum(math.pi / 4 * d ** 2 * 0.004 + math.pi / 4 * (d ** 2 - (d - 0.006) ** 2) * 0.022
              for d in (0.030, 0.032, 0.036))
    # by hand: crowns pi/4 (0.03^2 + 0.032^2 + 0.036^2) 0.004 = 1.0116e-5; walls
    # pi/4 (3.24e-4 + 3.48e-4 + 3.96e-4) 0.022 = 1.8454e-5; one side 2.8570e-5 m^3
    assert cup == pytest.approx(2.8570e-5, rel=1e-4)
    assert _mass(model, "piston") == pytest.approx(2 * cup * get_material("aluminium_2618_t61").density_kg_m3,
                                                   rel=1e-12)


def test_bearing_is_reached_only_through_hub_and_upright(front):
    """The bearing has no source and no path to the air: it heats by conduction from the hub and
    upright only (so its peak lags; see tests/chain/test_chain_soak.py)."""
    model = build_corner(front, grid=None)
    touching = [link for link in model.network.links if "bearing" in (link.a, link.b)]
    assert {link.name for link in touching} == {"hub_to_bearing", "bearing_to_upright"}
    assert all(isinstance(link, Conduction) for link in touching)
    assert all(source.node != "bearing" for source in model.network.sources)


# issue 16, geometry sanity from the trade: warnings, not errors (common practice, no published
# source: a pad's outer edge within about 0.5 mm of the disc's, its inner edge on the friction ring)
@pytest.mark.parametrize("offset_mm, height_mm, expected", [
    (0.0, 0.0, []),                                   # nothing given: nothing to check
    (0.4, 0.0, []),                                   # within the tolerance
    (0.8, 0.0, ["overhangs the disc's outer edge"]),
    (-0.8, 0.0, ["stops short of the disc's outer edge"]),
    (0.0, 60.0, []),                                  # demo-like front: ring (380 - 250) / 2 = 65 mm high
    (0.0, 66.0, ["inside the friction ring's inner diameter"]),   # inner edge 190 - 66 = 124 < 125 - 0.5 mm
    (0.0, 30.0, ["wider than the pad's radial height"]),          # the 36 mm piston on a 30 mm pad
])
def test_pad_alignment_warnings(front, offset_mm, height_mm, expected):
    pad = replace(front.pad, outer_edge_offset_m=offset_mm * 1e-3, radial_height_m=height_mm * 1e-3)
    design = replace(front, pad=pad, disc=replace(front.disc, outer_diameter_m=0.380, inner_diameter_m=0.250))
    warnings = design.alignment_warnings()
    assert len(warnings) == len(expected)
    for line, words in zip(warnings, expected):
        assert words in line and "\n" not in line
