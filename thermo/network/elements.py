"""The pieces of a lumped heat network, as small frozen dataclasses that validate themselves.

Temperatures are in kelvin, heat flows in watts, conductances in W/K. A link's flow is positive
from its first end (``a`` or ``node``) to its second (``b`` or ``boundary``).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable, Union

import numpy as np

from lapdata.echo import shown
from thermo.errors import ModelError

REFERENCE_TEMPERATURE_K = 293.15  # enthalpy is counted from 20 degC


@dataclass(frozen=True)
class HeatCapacity:
    """Heat capacity m c(T) of a node, with c piecewise linear in T (held constant beyond the table).

    Parameters
    ----------
    mass_kg : float
        Mass of the node [kg]
    temperatures_k : tuple of float
        Table temperatures, strictly increasing [K]
    specific_heat_j_kgk : tuple of float
        Specific heat at those temperatures [J/(kg K)]
    """

    mass_kg: float
    temperatures_k: tuple[float, ...]
    specific_heat_j_kgk: tuple[float, ...]

    def __post_init__(self):
        t = np.asarray(self.temperatures_k, dtype=float)
        c = np.asarray(self.specific_heat_j_kgk, dtype=float)
        if not (np.isfinite(self.mass_kg) and self.mass_kg > 0):
            raise ModelError(f"heat capacity: mass_kg must be a positive number, got {shown(self.mass_kg)}")
        if t.ndim != 1 or t.size < 1 or t.size != c.size:
            raise ModelError("heat capacity: temperatures_k and specific_heat_j_kgk must be equal-length lists")
        if t.size > 1 and np.any(np.diff(t) <= 0):
            raise ModelError("heat capacity: temperatures_k must be strictly increasing")
        if np.any(~np.isfinite(c)) or np.any(c <= 0):
            raise ModelError("heat capacity: specific heats must be positive numbers")

    @classmethod
    def constant(cls, mass_kg: float, specific_heat_j_kgk: float) -> "HeatCapacity":
        """A node of constant specific heat."""
        return cls(float(mass_kg), (REFERENCE_TEMPERATURE_K,), (float(specific_heat_j_kgk),))

    def specific_heat(self, temperature_k):
        """Specific heat c(T) [J/(kg K)]."""
        return np.interp(temperature_k, self.temperatures_k, self.specific_heat_j_kgk)

    def capacity(self, temperature_k):
        """Heat capacity m c(T) [J/K]."""
        return self.mass_kg * self.specific_heat(temperature_k)

    def capacity_slope(self, temperature_k):
        """d(m c)/dT [J/K^2]: zero beyond the table ends."""
        t = np.asarray(self.temperatures_k)
        if t.size == 1:
            return np.zeros_like(np.asarray(temperature_k, dtype=float))
        slopes = np.diff(self.specific_heat_j_kgk) / np.diff(t)
        idx = np.clip(np.searchsorted(t, temperature_k) - 1, 0, slopes.size - 1)
        inside = (np.asarray(temperature_k) > t[0]) & (np.asarray(temperature_k) < t[-1])
        return self.mass_kg * np.where(inside, slopes[idx], 0.0)

    def enthalpy(self, temperature_k):
        """Stored heat relative to 20 degC, the exact integral of m c(T) dT [J]."""
        return table_enthalpy(self.mass_kg, self.temperatures_k, self.specific_heat_j_kgk, temperature_k)


def table_enthalpy(mass_kg: float, temperatures_k, specific_heat_j_kgk, temperature_k):
    """``HeatCapacity(mass_kg, temperatures_k, specific_heat_j_kgk).enthalpy(temperature_k)`` without
    making (and checking) a ``HeatCapacity``: for a node whose mass changes often (a pad that
    wears lap by lap) [J]. ``mass_kg`` and ``temperature_k`` may be arrays of several nodes of one
    material (elementwise the same arithmetic as one node at a time)."""
    return (_integral(mass_kg, temperatures_k, specific_heat_j_kgk, temperature_k)
            - _integral(mass_kg, temperatures_k, specific_heat_j_kgk, REFERENCE_TEMPERATURE_K))


def _integral(mass_kg, temperatures_k, specific_heat_j_kgk, temperature_k):
    """m times the integral of c(T) from the table's first temperature (linear beyond the table) [J]."""
    t = np.asarray(temperatures_k, dtype=float)
    c = np.asarray(specific_heat_j_kgk, dtype=float)
    x = np.asarray(temperature_k, dtype=float)
    if t.size == 1:
        return mass_kg * c[0] * x
    # cumulative integral at the table points, from t[0]
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (c[1:] + c[:-1]) * np.diff(t))])
    below = c[0] * (x - t[0])
    above = cum[-1] + c[-1] * (x - t[-1])
    xi = np.clip(x, t[0], t[-1])
    k = np.clip(np.searchsorted(t, xi) - 1, 0, t.size - 2)
    ci = c[k] + (c[k + 1] - c[k]) * (xi - t[k]) / (t[k + 1] - t[k])
    inside = cum[k] + 0.5 * (c[k] + ci) * (xi - t[k])
    value = np.where(x < t[0], below, np.where(x > t[-1], above, inside))
    return mass_kg * value


@dataclass(frozen=True)
class Node:
    """A lumped mass at one temperature."""

    name: str
    heat_capacity: HeatCapacity


@dataclass(frozen=True)
class Boundary:
    """A fixed-temperature sink or source (ambient air, duct air), its temperature a schedule signal [K]."""

    name: str
    temperature_signal: str


@dataclass(frozen=True)
class Conduction:
    """A fixed conductance between two nodes or a node and a boundary: q = G (T_a - T_b)."""

    name: str
    a: str
    b: str
    conductance_w_k: float
    group: str = ""


@dataclass(frozen=True)
class Convection:
    """A conductance between a node and a boundary (or a second node) that depends on a driver
    signal and temperature.

    ``conductance(driver_value, node_temperature_k, boundary_temperature_k) -> G [W/K]`` must accept
    numpy arrays (it is tabulated and vectorised). ``driver`` names the schedule signal (for example a
    speed [m/s]); ``None`` means the conductance depends on temperatures only.
    q = G (T_node - T_boundary). A link between two nodes is tabulated like any other; the fast
    kernels read it without leaving the table only when G does not depend on the second end's
    temperature (the table's boundary axis spans air temperatures).
    """

    name: str
    node: str
    boundary: str
    driver: str | None
    conductance: Callable[..., np.ndarray]
    group: str = ""
    scale: float = 1.0      # G = scale x conductance(...): links that differ only by area share one table

    @property
    def a(self) -> str:
        return self.node

    @property
    def b(self) -> str:
        return self.boundary


@dataclass(frozen=True)
class Radiation:
    """Grey-body exchange q = coefficient (T_a^4 - T_b^4), coefficient = sigma eps_eff A F [W/K^4]."""

    name: str
    a: str
    b: str
    coefficient_w_k4: float
    group: str = ""


Link = Union[Conduction, Convection, Radiation]


@dataclass(frozen=True)
class HeatSource:
    """Heat into a node: fraction x the schedule signal named ``signal`` [W]."""

    node: str
    signal: str
    fraction: float = 1.0


@dataclass(frozen=True)
class Network:
    """Nodes, boundaries, links and sources. Validates that every name is unique and every end exists."""

    nodes: tuple[Node, ...]
    boundaries: tuple[Boundary, ...]
    links: tuple[Link, ...]
    sources: tuple[HeatSource, ...] = field(default_factory=tuple)

    def __post_init__(self):
        object.__setattr__(self, "nodes", tuple(self.nodes))
        object.__setattr__(self, "boundaries", tuple(self.boundaries))
        object.__setattr__(self, "links", tuple(self.links))
        object.__setattr__(self, "sources", tuple(self.sources))
        names = [n.name for n in self.nodes] + [b.name for b in self.boundaries]
        if len(set(names)) != len(names):
            dup = sorted({n for n in names if names.count(n) > 1})
            raise ModelError(f"network: node and boundary names must be unique, repeated: {', '.join(dup)}")
        if not self.nodes:
            raise ModelError("network: needs at least one node")
        link_names = [link.name for link in self.links]
        if len(set(link_names)) != len(link_names):
            dup = sorted({n for n in link_names if link_names.count(n) > 1})
            raise ModelError(f"network: link names must be unique, repeated: {', '.join(dup)}")
        known = set(names)
        node_names = {n.name for n in self.nodes}
        for link in self.links:
            for end in (link.a, link.b):
                if end not in known:
                    raise ModelError(f"network: link '{link.name}' names '{end}', which is no node or boundary")
            if link.a not in node_names:
                raise ModelError(f"network: link '{link.name}' must start at a node, not boundary '{link.a}'")
            if isinstance(link, (Conduction,)) and not (np.isfinite(link.conductance_w_k) and link.conductance_w_k >= 0):
                raise ModelError(f"network: link '{link.name}' needs a conductance >= 0 W/K, got {shown(link.conductance_w_k)}")
            if isinstance(link, Convection) and not (np.isfinite(link.scale) and link.scale >= 0):
                raise ModelError(f"network: link '{link.name}' needs a scale >= 0, got {shown(link.scale)}")
            if isinstance(link, Radiation) and not (np.isfinite(link.coefficient_w_k4) and link.coefficient_w_k4 >= 0):
                raise ModelError(f"network: link '{link.name}' needs a coefficient >= 0 W/K^4")
        for source in self.sources:
            if source.node not in node_names:
                raise ModelError(f"network: heat source '{source.signal}' feeds '{source.node}', which is no node")

    @property
    def node_names(self) -> tuple[str, ...]:
        return tuple(n.name for n in self.nodes)

    @property
    def boundary_names(self) -> tuple[str, ...]:
        return tuple(b.name for b in self.boundaries)

    @property
    def link_names(self) -> tuple[str, ...]:
        return tuple(link.name for link in self.links)
