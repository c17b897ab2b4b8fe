"""Materials: the packaged data file, its validation, user additions and the Material record.

TOML format (one table per material; the table name is the material name)::

    [grey_cast_iron]
    description = "Pearlitic grey cast iron of brake-disc grade"    # required

    [grey_cast_iron.density]                                          # required
    value_kg_m3 = 7100.0
    source = "where the value comes from, or 'from memory'"

    [grey_cast_iron.specific_heat]                                    # required
    temperature_c = [20.0, 200.0, 400.0]      # strictly increasing [degC]
    value_j_kgk = [499.0, 545.0, 590.0]       # same length [J/(kg K)]
    source = "..."

    [grey_cast_iron.conductivity]                                     # required
    temperature_c = [20.0, 400.0]
    value_w_mk = [51.0, 44.0]                 # [W/(m K)]; through-thickness where anisotropic
    source = "..."

    [grey_cast_iron.conductivity_in_plane]                            # optional, same keys
    [grey_cast_iron.emissivity]                                       # optional
    value = 0.70                              # nominal, (0, 1]
    low = 0.63                                # optional range, both or neither
    high = 0.78
    temperature_c = [200.0, 600.0]            # optional table, with value_table
    value_table = [0.64, 0.78]
    source = "..."
    [grey_cast_iron.service_limit]                                    # optional
    value_c = 700.0                           # highest temperature for service [degC]
    basis = "what the limit is: strength halved, maker's continuous rating ..."   # optional
    source = "..."

Every section needs a non-empty ``source``. Unknown keys are errors (with a suggestion), as are
missing keys, tables of unequal length, non-increasing temperatures and non-positive values.
Tables are interpolated linearly in T and held constant beyond their ends
(:attr:`Material.property_data_end_k` says where the data of tables of two or more rows end).
Temperatures are degC only in the file; the Material holds kelvin.
"""
from __future__ import annotations

import functools
import importlib.resources
import math
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType
from typing import Mapping

import numpy as np

from lapdata.echo import shown
from lapdata.files import parse_toml, read_toml_file
from lapdata.suggest import did_you_mean
from lapdata.units import KELVIN_AT_0C
from thermo.errors import MaterialError
from thermo.network.elements import HeatCapacity

PACKAGED_FILE = "materials.toml"

_MATERIAL_KEYS = {"description", "density", "specific_heat", "conductivity", "conductivity_in_plane",
                  "emissivity", "service_limit"}
_REQUIRED_KEYS = {"description", "density", "specific_heat", "conductivity"}
_SECTION_KEYS = {
    "density": ({"value_kg_m3", "source"}, set()),
    "specific_heat": ({"temperature_c", "value_j_kgk", "source"}, set()),
    "conductivity": ({"temperature_c", "value_w_mk", "source"}, set()),
    "conductivity_in_plane": ({"temperature_c", "value_w_mk", "source"}, set()),
    "emissivity": ({"value", "source"}, {"low", "high", "temperature_c", "value_table"}),
    "service_limit": ({"value_c", "source"}, {"basis"}),
}

Table = tuple[tuple[float, ...], tuple[float, ...]]


@dataclass(frozen=True)
class Material:
    """A solid or liquid of the brake corner, with temperature-dependent properties (kelvin inside).

    Parameters
    ----------
    name : str
        Material name, as in the data file [-]
    density_kg_m3 : float
        Density [kg/m^3]
    specific_heat_table : tuple
        (temperatures, specific heats) [K], [J/(kg K)]
    conductivity_table : tuple
        (temperatures, conductivities), through-thickness [K], [W/(m K)]
    emissivity : float or None
        Nominal total hemispherical emissivity; None for an enclosed fluid [-]
    sources : dict
        Property name -> source text [-]
    description : str
        One line saying what the material is [-]
    emissivity_range : tuple or None
        (low, high) plausible emissivities [-]
    emissivity_table : tuple or None
        (temperatures, emissivities) [K], [-]
    conductivity_in_plane_table : tuple or None
        (temperatures, conductivities) in-plane [K], [W/(m K)]
    service_limit_k : float or None
        Highest temperature for service of a part of this material [K]
    service_limit_basis : str
        What that limit is (strength halved, maker's rating ...) [-]
    """

    name: str
    density_kg_m3: float
    specific_heat_table: Table
    conductivity_table: Table
    emissivity: float | None
    sources: Mapping[str, str] = field(hash=False)
    description: str
    emissivity_range: tuple[float, float] | None = None
    emissivity_table: Table | None = None
    conductivity_in_plane_table: Table | None = None
    service_limit_k: float | None = None
    service_limit_basis: str = ""

    def __post_init__(self):
        where = f"material '{self.name}'"
        if not (math.isfinite(self.density_kg_m3) and self.density_kg_m3 > 0):
            raise MaterialError(f"{where}: density_kg_m3 must be > 0, got {shown(self.density_kg_m3)}")
        for key, table, upper in (("specific_heat", self.specific_heat_table, math.inf),
                                  ("conductivity", self.conductivity_table, math.inf),
                                  ("conductivity_in_plane", self.conductivity_in_plane_table, math.inf),
                                  ("emissivity", self.emissivity_table, 1.0)):
            if table is not None:
                _check_table(where, key, table, upper)
        if self.emissivity is not None and not (0.0 < self.emissivity <= 1.0):
            raise MaterialError(f"{where}: emissivity must lie in (0, 1], got {shown(self.emissivity)}")
        if self.emissivity_range is not None:
            low, high = self.emissivity_range
            if not (0.0 < low <= high <= 1.0):
                raise MaterialError(f"{where}: emissivity range must satisfy 0 < low <= high <= 1, "
                                    f"got {shown(self.emissivity_range)}")
        present = {"density", "specific_heat", "conductivity"}
        present |= {"emissivity"} if self.emissivity is not None else set()
        present |= {"conductivity_in_plane"} if self.conductivity_in_plane_table is not None else set()
        if self.service_limit_k is not None:
            if not (math.isfinite(self.service_limit_k) and self.service_limit_k > 0):
                raise MaterialError(f"{where}: service limit must be a temperature above absolute zero, "
                                    f"got {shown(self.service_limit_k)} K")
            present.add("service_limit")
        for key in sorted(present):
            if not str(self.sources.get(key, "")).strip():
                raise MaterialError(f"{where}: property '{key}' needs a source (or 'from memory')")

    @property
    def service_limit_source(self) -> str:
        """Where the service limit comes from ('' when the material has none)."""
        return str(self.sources.get("service_limit", "")) if self.service_limit_k is not None else ""

    @property
    def property_data_ranges_k(self) -> dict[str, tuple[float, float]]:
        """(first, last) temperature [K] of each specific-heat or conductivity table of two or more rows."""
        tables = {"specific heat": self.specific_heat_table, "conductivity": self.conductivity_table,
                  "in-plane conductivity": self.conductivity_in_plane_table}
        return {name: (float(t[0][0]), float(t[0][-1])) for name, t in tables.items()
                if t is not None and len(t[0]) >= 2}

    @property
    def property_data_end_k(self) -> float | None:
        """Temperature [K] where the first of those tables ends (None: only one-row constants)."""
        ranges = self.property_data_ranges_k
        return min(hi for _, hi in ranges.values()) if ranges else None

    def specific_heat(self, temperature_k):
        """Specific heat c(T) [J/(kg K)], held constant beyond the table."""
        return np.interp(temperature_k, *self.specific_heat_table)

    def conductivity(self, temperature_k):
        """Through-thickness thermal conductivity k(T) [W/(m K)], held constant beyond the table."""
        return np.interp(temperature_k, *self.conductivity_table)

    def diffusivity(self, temperature_k):
        """Thermal diffusivity k / (rho c) [m^2/s]."""
        return self.conductivity(temperature_k) / (self.density_kg_m3 * self.specific_heat(temperature_k))

    def effusivity(self, temperature_k):
        """Thermal effusivity sqrt(k rho c) [W s^0.5/(m^2 K)]."""
        return np.sqrt(self.conductivity(temperature_k) * self.density_kg_m3 * self.specific_heat(temperature_k))

    def emissivity_at(self, temperature_k):
        """Emissivity at T from the table if there is one, else the nominal value [-]."""
        if self.emissivity_table is not None:
            return np.interp(temperature_k, *self.emissivity_table)
        if self.emissivity is None:
            raise MaterialError(f"material '{self.name}': has no emissivity (an enclosed fluid)")
        return np.full_like(np.asarray(temperature_k, dtype=float), self.emissivity)

    def heat_capacity(self, mass_kg: float) -> HeatCapacity:
        """The node heat capacity m c(T) of a part of this material."""
        return HeatCapacity(float(mass_kg), *self.specific_heat_table)


def _check_table(where: str, key: str, table, upper: float) -> None:
    temps, values = (np.asarray(part, dtype=float) for part in table)
    if temps.ndim != 1 or temps.size < 1 or temps.size != values.size:
        raise MaterialError(f"{where}: {key} table needs equal-length, non-empty temperature and value lists")
    if np.any(np.diff(temps) <= 0):
        raise MaterialError(f"{where}: {key} temperatures must be strictly increasing")
    if np.any(~np.isfinite(values)) or np.any(values <= 0) or np.any(values > upper):
        raise MaterialError(f"{where}: {key} values must be positive" + (f" and <= {upper:g}" if upper < math.inf else ""))


def _unknown(where: str, key: str, allowed) -> MaterialError:
    hint = did_you_mean(key, sorted(allowed)) or f"; expected one of {', '.join(sorted(allowed))}"
    return MaterialError(f"{where}: unknown key '{key}'{hint}")


def _table(where: str, section: dict, value_key: str) -> Table:
    temps, values = section["temperature_c"], section[value_key]
    if not (isinstance(temps, list) and isinstance(values, list)) or not temps or len(temps) != len(values):
        raise MaterialError(f"{where}: temperature_c and {value_key} must be equal-length, non-empty lists")
    try:
        return (tuple(float(t) + KELVIN_AT_0C for t in temps), tuple(float(v) for v in values))
    except (TypeError, ValueError):
        raise MaterialError(f"{where}: temperature_c and {value_key} must hold numbers") from None


def _number(where: str, value) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise MaterialError(f"{where}: expected a number, got {shown(value)}")
    return float(value)


def material_from_dict(name: str, data: dict, origin: str = "materials") -> Material:
    """Build one Material from its parsed TOML table (keys checked, degC converted to kelvin)."""
    where = f"{origin}: [{name}]"
    if not isinstance(data, dict):
        raise MaterialError(f"{where}: must be a table of properties")
    for key in data:
        if key not in _MATERIAL_KEYS:
            raise _unknown(where, key, _MATERIAL_KEYS)
    missing = sorted(_REQUIRED_KEYS - set(data))
    if missing:
        raise MaterialError(f"{where}: missing key(s) {', '.join(missing)}")
    sections = {}
    for key in _MATERIAL_KEYS - {"description"}:
        if key not in data:
            continue
        section, swhere = data[key], f"{origin}: [{name}.{key}]"
        if not isinstance(section, dict):
            raise MaterialError(f"{swhere}: must be a table")
        required, optional = _SECTION_KEYS[key]
        for skey in section:
            if skey not in required | optional:
                raise _unknown(swhere, skey, required | optional)
        absent = sorted(required - set(section))
        if absent:
            raise MaterialError(f"{swhere}: missing key(s) {', '.join(absent)}")
        if not isinstance(section["source"], str) or not section["source"].strip():
            raise MaterialError(f"{swhere}: source must be a non-empty string (or 'from memory')")
        sections[key] = (section, swhere)

    emissivity = emissivity_range = emissivity_table = None
    if "emissivity" in sections:
        section, swhere = sections["emissivity"]
        emissivity = _number(f"{swhere} value", section["value"])
        if ("low" in section) != ("high" in section):
            raise MaterialError(f"{swhere}: give both low and high, or neither")
        if "low" in section:
            emissivity_range = (_number(f"{swhere} low", section["low"]), _number(f"{swhere} high", section["high"]))
        if ("temperature_c" in section) != ("value_table" in section):
            raise MaterialError(f"{swhere}: give both temperature_c and value_table, or neither")
        if "temperature_c" in section:
            emissivity_table = _table(swhere, section, "value_table")
    limit_k, basis = None, ""
    if "service_limit" in sections:
        section, swhere = sections["service_limit"]
        limit_k = _number(f"{swhere} value_c", section["value_c"]) + KELVIN_AT_0C
        basis = section.get("basis", "")
        if not isinstance(basis, str):
            raise MaterialError(f"{swhere}: basis must be a string saying what the limit is")
    in_plane = None
    if "conductivity_in_plane" in sections:
        in_plane = _table(sections["conductivity_in_plane"][1], sections["conductivity_in_plane"][0], "value_w_mk")
    if not isinstance(data["description"], str) or not data["description"].strip():
        raise MaterialError(f"{where}: description must be a non-empty string")
    return Material(
        name=name,
        density_kg_m3=_number(f"{origin}: [{name}.density] value_kg_m3", data["density"]["value_kg_m3"]),
        specific_heat_table=_table(sections["specific_heat"][1], data["specific_heat"], "value_j_kgk"),
        conductivity_table=_table(sections["conductivity"][1], data["conductivity"], "value_w_mk"),
        emissivity=emissivity,
        sources={key: section["source"] for key, (section, _) in sections.items()},
        description=data["description"],
        emissivity_range=emissivity_range,
        emissivity_table=emissivity_table,
        conductivity_in_plane_table=in_plane,
        service_limit_k=limit_k,
        service_limit_basis=basis,
    )


def load_materials(path: str | Path | None = None) -> dict[str, Material]:
    """Read and validate a materials file; None reads the packaged one.

    A user file has the same format; combine it with the packaged set by :func:`merge_materials`.
    """
    if path is None:
        origin = PACKAGED_FILE
        text = importlib.resources.files("thermo.materials").joinpath(PACKAGED_FILE).read_text(encoding="utf-8")
    else:
        origin = str(path)
        data, _ = read_toml_file(path, "materials file", MaterialError)
    if path is None:
        data = parse_toml(text, origin, MaterialError)
    if not data:
        raise MaterialError(f"{origin}: holds no materials")
    return {name: material_from_dict(name, table, origin) for name, table in data.items()}


def merge_materials(base: Mapping[str, Material], added: Mapping[str, Material],
                    replace: bool = False) -> dict[str, Material]:
    """A new dict of ``base`` plus ``added``; a name in both is an error unless ``replace``."""
    clash = sorted(set(base) & set(added))
    if clash and not replace:
        raise MaterialError(f"materials: {', '.join(clash)} already defined; rename, or merge with replace=True")
    return {**base, **added}


@functools.lru_cache(maxsize=1)
def _packaged() -> Mapping[str, Material]:
    return MappingProxyType(load_materials())


def material_names(materials: Mapping[str, Material] | None = None) -> tuple[str, ...]:
    """Sorted material names, of the packaged set unless another is given."""
    return tuple(sorted(_packaged() if materials is None else materials))


def get_material(name: str, materials: Mapping[str, Material] | None = None) -> Material:
    """The material called ``name`` (packaged set unless another is given); MaterialError if unknown."""
    pool = _packaged() if materials is None else materials
    try:
        return pool[name]
    except KeyError:
        raise MaterialError(f"materials: unknown material '{name}'{did_you_mean(name, pool, n=3, cutoff=0.5)}") from None
