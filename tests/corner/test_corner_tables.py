"""The corner's conductance tables: built on the open grid, they equal the paths evaluated point by
point on the full mesh grid, bit for bit; the per-process cache of tables is keyed by every value a
table depends on.

The reference here is the path functions themselves (the model's definition of G); the tables are
only a faster way to hold the same numbers, so the check is exact equality.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from thermo.corner import build, paths
from thermo.corner.build import build_corner
from thermo.network import Convection
from thermo.network.tabulate import ConductanceGrid, TabulatedConductance
from thermo.scenario import load_scenario

DEMO = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
# a coarser grid than the scenario's keeps the mesh-grid reference cheap; its node axis still
# spans 200-1800 K and its boundary axis the wheel-well air
GRID = ConductanceGrid(driver_max=90.0, driver_step=3.0, node_step_k=40.0)
VARIANTS = {
    "demo": [],
    "duct 8700 mm2": [("corners.front.ducts.main.inlet_area_mm2", 8700.0)],
    "vented pistons": [("corners.front.piston.type", "vented"), ("corners.front.piston.vent_hole_count", 4),
                       ("corners.front.piston.vent_hole_diameter_mm", 5.0)],
    "limpert faces": [("corners.front.disc.face_correlation", "limpert")],
    "duct on caliper": [("corners.front.ducts.main.target", "caliper")],
    "duct on disc face, volume flow": [("corners.front.ducts.main.target", "disc_face"),
                                       ("corners.front.ducts.main.flow", "volume_flow"),
                                       ("corners.front.ducts.main.volume_flow_m3_s", 0.05)],
    "solid disc, duct velocity": [("corners.front.disc.vented", False), ("corners.front.ducts.main.flow", "duct_velocity"),
                                  ("corners.front.ducts.main.duct_velocity_m_s", 30.0)],
    "multipliers": [("corners.front.airflow.vane_convection_multiplier", 1.7),
                    ("corners.front.airflow.duct_effectiveness_multiplier", 0.6)],
}


def _mesh_reference(function, grid):
    d, n, b = np.meshgrid(grid.axis("driver"), grid.axis("node"), grid.axis("boundary"), indexing="ij")
    return np.asarray(function(d, n, b), dtype=float)


@pytest.mark.parametrize("variant", sorted(VARIANTS))
def test_tables_equal_the_paths_on_the_mesh_grid_bit_for_bit(variant):
    scenario = load_scenario(DEMO, overrides=VARIANTS[variant])
    kinds = set()
    for design in scenario.corners:
        model = build_corner(design, scenario.ambient.pressure_pa, GRID)
        for link in model.network.links:
            if not isinstance(link, Convection):
                continue
            tabulated = link.conductance
            assert isinstance(tabulated, TabulatedConductance)
            kinds.add(type(tabulated.function).__name__)
            reference = _mesh_reference(tabulated.function, GRID)
            assert tabulated.table.shape == GRID.shape
            assert tabulated.table.flags.c_contiguous and not tabulated.table.flags.writeable
            assert np.array_equal(tabulated.table, reference), (variant, design.name, link.name)
    assert {"PlateInAirflow", "RotatingDiscFaces", "ConductivityRatio", "ClampShare"} <= kinds


def test_every_convection_path_class_is_covered_above():
    seen = set()
    for overrides in VARIANTS.values():
        scenario = load_scenario(DEMO, overrides=overrides)
        for design in scenario.corners:
            for link in build_corner(design, scenario.ambient.pressure_pa, None).network.links:
                if isinstance(link, Convection):
                    seen.add(type(link.conductance).__name__)
    classes = {name for name, obj in vars(paths).items() if isinstance(obj, type) and obj.__module__ == paths.__name__}
    assert classes <= seen | {"ClampShare"}, classes - seen


def test_a_function_that_is_not_element_wise_is_refused():
    from thermo.errors import ModelError
    with pytest.raises(ModelError, match="one G per grid point"):
        TabulatedConductance.build(lambda v, a, b: np.ones(3), GRID)


def _front_tables(overrides):
    scenario = load_scenario(DEMO, overrides=overrides)
    design = next(d for d in scenario.corners if d.name == "front")
    model = build_corner(design, scenario.ambient.pressure_pa, GRID)
    return {link.name: link.conductance for link in model.network.links if isinstance(link, Convection)}


def _assert_exact(tabulated):
    assert np.array_equal(tabulated.table, _mesh_reference(tabulated.function, GRID))


def test_cache_gives_designs_differing_in_duct_inlet_area_their_own_duct_table():
    build.forget_tables()
    small = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 8000.0)])
    large = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 11000.0)])
    duct_small, duct_large = small["duct_1_disc_eye"], large["duct_1_disc_eye"]
    assert duct_small.function != duct_large.function
    assert not np.array_equal(duct_small.table, duct_large.table)
    assert np.all(duct_large.table >= duct_small.table)        # more duct air never cools less
    for tabulated in (duct_small, duct_large):
        _assert_exact(tabulated)
    # paths that hold no duct are the same object for both (the inlet area is not theirs)
    for name in ("disc_face_convection", "caliper_convection", "hub_convection"):
        assert small[name] is large[name]


def test_vane_table_shared_only_while_the_duct_leaves_the_same_pumped_flow():
    build.forget_tables()
    # demo: the duct supplies more air than the vanes pump at every speed, so none is pumped with
    # either inlet area; the two paths differ (their duct) but their tables hold the same numbers
    a = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 8000.0)])["disc_vane_convection"]
    b = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 11000.0)])["disc_vane_convection"]
    speed, air_k = GRID.axis("driver")[:, None], GRID.axis("boundary")[None, :]
    assert np.all(a.function.pumped_mass_flow(speed, air_k) == 0.0)
    assert np.all(b.function.pumped_mass_flow(speed, air_k) == 0.0)
    assert a.function != b.function and a.function.ducted != b.function.ducted
    assert a.table is b.table
    _assert_exact(a)
    _assert_exact(b)
    # small inlets leave the vanes part of their pumped flow, a different part for each area
    c = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 100.0)])["disc_vane_convection"]
    d = _front_tables([("corners.front.ducts.main.inlet_area_mm2", 200.0)])["disc_vane_convection"]
    assert np.any(c.function.pumped_mass_flow(speed, air_k) > 0.0)
    assert c.table is not d.table and not np.array_equal(c.table, d.table)
    assert not np.array_equal(c.table, a.table)
    _assert_exact(c)
    _assert_exact(d)


def test_duct_air_rise_changes_no_table():
    build.forget_tables()
    base = _front_tables([])
    warmer = _front_tables([("corners.front.ducts.main.air_rise_k", 12.0)])
    assert base["duct_1_disc_eye"].function != warmer["duct_1_disc_eye"].function
    for name in base:
        assert warmer[name].table is base[name].table, name


def test_forget_tables_empties_both_levels():
    build.forget_tables()
    first = _front_tables([])["duct_1_disc_eye"]
    assert build.tables_cached() > 0
    build.forget_tables()
    assert build.tables_cached() == 0
    again = _front_tables([])["duct_1_disc_eye"]
    assert again is not first and again.table is not first.table
    assert np.array_equal(again.table, first.table)
