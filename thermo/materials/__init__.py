"""Materials of the brake corner as package data (materials.toml), each property with its source."""
from thermo.materials.library import (
    Material, get_material, load_materials, material_from_dict, material_names, merge_materials,
)

__all__ = ["Material", "get_material", "load_materials", "material_from_dict", "material_names",
           "merge_materials"]
