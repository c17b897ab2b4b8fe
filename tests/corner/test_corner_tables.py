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

from thermo.corner import paths
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
