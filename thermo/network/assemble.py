"""A heat network compiled once into index arrays: link flows, the right-hand side and its Jacobian.

The node energy balance is

    C_i(T_i) dT_i/dt = q_i(t) + sum_l D_il f_l,    D_il = -1 at a link's first end, +1 at its second,

with f_l the flow of link l, positive from its first end to its second [W]:
conduction f = G (T_a - T_b), radiation f = c (T_a^4 - T_b^4), convection f = G(v, T_a, T_b) (T_a - T_b),
each written once in ``thermo.network.laws`` (the compiled kernels use the same functions).
Temperatures of the links' second ends are looked up in the extended vector [node T..., boundary T...].
"""
from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np

from thermo.errors import ModelError
from thermo.network.capacity import CapacityTable
from thermo.network.elements import Conduction, Convection, Network, Radiation
from thermo.network.laws import conduction_flow, convection_flow, radiation_flow
from thermo.network.schedule import Schedule
from thermo.network.tabulate import TabulatedConductance, lookup


@functools.lru_cache(maxsize=64)
def _stacked_tables(functions: tuple) -> np.ndarray:
    """The tables of tabulated conductances stacked (n_links, ...); cached, since a chain rebuilds
    a corner with the same convection paths every lap when pads wear (the tables never change)."""
    return np.stack([fn.table for fn in functions])


@dataclass(frozen=True)
class Inputs:
    """The schedule's signals a network needs at one time."""

    boundary_k: np.ndarray      # (n_boundaries,) boundary temperatures [K]
    drivers: np.ndarray         # (n_drivers,) driver values [driver unit]
    source_w: np.ndarray        # (n_nodes,) heat into each node [W]


class CompiledNetwork:
    """A ``Network`` turned into arrays, built once by ``compile_network``.

    Attributes
    ----------
    node_names, boundary_names, link_names, link_groups : tuple of str
    link_a : ndarray of int
        Node index of each link's first end
    link_b : ndarray of int
        Index of each link's second end in [nodes..., boundaries...]
    link_to_boundary : ndarray of bool
        True where a link's second end is a boundary
    incidence : ndarray (n_nodes, n_links)
        D above
    driver_names, source_signals : tuple of str
        Signals feeding drivers and heat sources
    """

    def __init__(self, network: Network):
        self.network = network
        self.node_names = network.node_names
        self.boundary_names = network.boundary_names
        self.link_names = network.link_names
        self.link_groups = tuple(link.group for link in network.links)
        self.n_nodes = len(self.node_names)
        self.n_boundaries = len(self.boundary_names)
        self.n_links = len(self.link_names)
        ends = {name: i for i, name in enumerate(self.node_names + self.boundary_names)}
        for link in network.links:
            if link.a == link.b:
                raise ModelError(f"network: link '{link.name}' joins '{link.a}' to itself")
        self.link_a = np.array([ends[link.a] for link in network.links], dtype=int)
        self.link_b = np.array([ends[link.b] for link in network.links], dtype=int)
        self.link_to_boundary = self.link_b >= self.n_nodes
        self.incidence = np.zeros((self.n_nodes, self.n_links))
        self.incidence[self.link_a, np.arange(self.n_links)] = -1.0
        to_node = np.flatnonzero(~self.link_to_boundary)
        self.incidence[self.link_b[to_node], to_node] = 1.0
        self._to_node = to_node

        kinds = [type(link) for link in network.links]
        self.cond_idx = np.array([i for i, k in enumerate(kinds) if k is Conduction], dtype=int)
        self.cond_g = np.array([network.links[i].conductance_w_k for i in self.cond_idx], dtype=float)
        self.rad_idx = np.array([i for i, k in enumerate(kinds) if k is Radiation], dtype=int)
        self.rad_c = np.array([network.links[i].coefficient_w_k4 for i in self.rad_idx], dtype=float)
        self.conv_idx = np.array([i for i, k in enumerate(kinds) if k is Convection], dtype=int)
        self.conv_scale = np.array([network.links[i].scale for i in self.conv_idx], dtype=float)
        unknown = [network.links[i].name for i, k in enumerate(kinds) if k not in (Conduction, Radiation, Convection)]
        if unknown:
            raise ModelError(f"network: link '{unknown[0]}' is of no known kind (conduction, convection, radiation)")

        self.boundary_signals = tuple(b.temperature_signal for b in network.boundaries)
        drivers = []
        for i in self.conv_idx:
            d = network.links[i].driver
            if d is not None and d not in drivers:
                drivers.append(d)
        self.driver_names = tuple(drivers)
        self._conv = tuple(
            (int(i), network.links[i].conductance,
             -1 if network.links[i].driver is None else self.driver_names.index(network.links[i].driver))
            for i in self.conv_idx)
        fns = [fn for _, fn, _ in self._conv]
        # every convection link tabulated on one grid: look them all up in one gather
        self._tabulated = None       # the tabulated conductances, when every convection link has one on one grid
        if fns and all(isinstance(fn, TabulatedConductance) for fn in fns) and len({fn.grid for fn in fns}) == 1:
            self.conv_grid = fns[0].grid
            self._tabulated = tuple(fns)
            self.conv_driver_index = np.array([di for _, _, di in self._conv], dtype=int)
            self._conv_exact = tuple(fn.function for fn in fns)
        signals = []
        for s in network.sources:
            if s.signal not in signals:
                signals.append(s.signal)
        self.source_signals = tuple(signals)
        node_index = {name: i for i, name in enumerate(self.node_names)}
        self.source_matrix = np.zeros((self.n_nodes, len(signals)))
        for s in network.sources:
            self.source_matrix[node_index[s.node], signals.index(s.signal)] += s.fraction
        self.capacities = CapacityTable(n.heat_capacity for n in network.nodes)
        self._bound: tuple | None = None
        self._required: frozenset | None = None     # the names of required_signals, made on first use

    @property
    def tabulated(self) -> bool:
        """Whether every convection link reads a table, all on one grid (``conv_grid``)."""
        return self._tabulated is not None

    @property
    def conv_tables(self) -> np.ndarray | None:
        """The convection links' tables stacked (n_conv, n_driver, n_node, n_boundary) [W/K], or
        None unless ``tabulated``; stacked on first use (a network run only side by side with
        others, whose tables are stacked together, never needs its own stack)."""
        return None if self._tabulated is None else _stacked_tables(self._tabulated)

    # ------------------------------------------------------------------ signals

    def required_signals(self) -> dict[str, str]:
        """Every schedule signal the network reads, with what reads it."""
        need: dict[str, str] = {}
        for b in self.network.boundaries:
            need.setdefault(b.temperature_signal, f"temperature [K] of boundary '{b.name}'")
        for i in self.conv_idx:
            link = self.network.links[i]
            if link.driver is not None:
                need.setdefault(link.driver, f"driver of convection link '{link.name}'")
        for s in self.network.sources:
            need.setdefault(s.signal, f"heat source [W] into node '{s.node}'")
        return need

    def check_schedule(self, schedule: Schedule) -> None:
        """Raise ``ModelError`` naming the first signal the network needs and the schedule lacks."""
        if self._required is None:
            self._required = frozenset(self.required_signals())
        if self._required.issubset(schedule.signals):
            return
        for name, role in self.required_signals().items():
            if name not in schedule.signals:
                have = ", ".join(schedule.names) or "none"
                raise ModelError(f"schedule lacks signal '{name}', the {role} (it has: {have})")

    def inputs_at(self, t: float, schedule: Schedule) -> Inputs:
        """Boundary temperatures, drivers and node heat sources at time ``t`` [s]."""
        if self._bound is None or self._bound[0] is not schedule:
            self.check_schedule(schedule)
            rows = schedule.indices(self.boundary_signals + self.driver_names + self.source_signals)
            self._bound = (schedule, rows)
        values = schedule.rows_at(t, self._bound[1])
        nb, nd = self.n_boundaries, len(self.driver_names)
        return Inputs(values[:nb], values[nb:nb + nd], self.source_matrix @ values[nb + nd:])

    def inputs_series(self, times, schedule: Schedule) -> tuple[np.ndarray, np.ndarray]:
        """Boundary temperatures (n_t, n_boundaries) [K] and drivers (n_t, n_drivers) at many times."""
        self.check_schedule(schedule)
        t = np.asarray(times, dtype=float)
        both = schedule.columns(self.boundary_signals + self.driver_names, t)
        nb = self.n_boundaries
        return np.ascontiguousarray(both[..., :nb]), np.ascontiguousarray(both[..., nb:])

    # ------------------------------------------------------------------ flows
    def _ends(self, T_nodes, boundary_k):
        T = np.asarray(T_nodes, dtype=float)
        if T.ndim == 1:
            ext = np.concatenate((T, np.asarray(boundary_k, dtype=float)))
            return ext[self.link_a], ext[self.link_b]
        B = np.broadcast_to(np.asarray(boundary_k, dtype=float), T.shape[:-1] + (self.n_boundaries,))
        ext = np.concatenate([T, B], axis=-1)
        return ext[..., self.link_a], ext[..., self.link_b]

    def convection_conductances(self, T_nodes, boundary_k, driver_values) -> np.ndarray:
        """G [W/K] of each convection link (in ``conv_idx`` order), shape (..., n_convection)."""
        return self._unscaled_conductances(T_nodes, boundary_k, driver_values) * self.conv_scale

    def _unscaled_conductances(self, T_nodes, boundary_k, driver_values) -> np.ndarray:
        """G [W/K] of each convection link before its multiplier ``conv_scale`` (checked as scaled)."""
        Ta, Tb = self._ends(T_nodes, boundary_k)
        drv = np.asarray(driver_values, dtype=float)
        if self._tabulated is not None:
            li = self.conv_idx
            dv = np.where(self.conv_driver_index >= 0, drv[..., np.maximum(self.conv_driver_index, 0)], 0.0) \
                if drv.shape[-1:] != (0,) else np.zeros(Ta.shape[:-1] + (li.size,))
            out = lookup(self.conv_grid, self.conv_tables, dv, Ta[..., li], Tb[..., li], self._conv_exact)
        else:
            out = np.empty(Ta.shape[:-1] + (len(self._conv),))
            for k, (li, fn, di) in enumerate(self._conv):
                out[..., k] = fn(None if di < 0 else drv[..., di], Ta[..., li], Tb[..., li])
        scaled = out * self.conv_scale
        ok = np.isfinite(scaled) & (scaled >= 0)
        if not np.all(ok):
            bad = int(np.argmax(~ok.reshape(-1, len(self._conv)).all(axis=0)))
            raise ModelError(f"network: convection link '{self.link_names[self.conv_idx[bad]]}' returned a conductance "
                             "that is negative or not finite")
        return out

    def _link_laws(self, Ta, Tb, g, slopes=True):
        """Flows f and (``slopes``) df/dT_a, df/dT_b of every link (``thermo.network.laws``), convection
        with its unscaled conductances ``g`` held constant in T (the scipy Jacobian's choice)."""
        laws = [(self.cond_idx, conduction_flow, (self.cond_g,)), (self.rad_idx, radiation_flow, (self.rad_c,))]
        if g is not None:
            laws.append((self.conv_idx, convection_flow, (self.conv_scale, g, 0.0, 0.0)))
        out = [np.empty(Ta.shape) for _ in range(3 if slopes else 1)]
        for idx, law, params in laws:
            values = law(*params, Ta[..., idx], Tb[..., idx])
            for array, value in zip(out, values):
                array[..., idx] = value
        return tuple(out)

    def flows(self, T_nodes, boundary_k, driver_values) -> np.ndarray:
        """Flow of every link, positive from its first end to its second [W].

        Parameters
        ----------
        T_nodes : array_like (..., n_nodes)
            Node temperatures [K]
        boundary_k : array_like (..., n_boundaries)
            Boundary temperatures, in ``boundary_names`` order [K]
        driver_values : array_like (..., n_drivers)
            Driver signals, in ``driver_names`` order [driver unit]
        """
        Ta, Tb = self._ends(T_nodes, boundary_k)
        g = self._unscaled_conductances(T_nodes, boundary_k, driver_values) if self._conv else None
        return self._link_laws(Ta, Tb, g, slopes=False)[0]

    def flows_and_jacobian(self, T_nodes, boundary_k, driver_values) -> tuple[np.ndarray, np.ndarray]:
        """``flows`` and ``flow_jacobian`` of one state (n_nodes,) together, convection evaluated once."""
        Ta, Tb = self._ends(T_nodes, boundary_k)
        g = self._unscaled_conductances(T_nodes, boundary_k, driver_values) if self._conv else None
        f, dfa, dfb = self._link_laws(Ta, Tb, g)
        return f, self._jacobian_from(dfa, dfb)

    def flow_jacobian(self, T_nodes, boundary_k, driver_values) -> np.ndarray:
        """d(flow)/d(node temperature), shape (n_links, n_nodes) [W/K].

        Convection conductances are held at their current value: the temperature dependence of G
        is left out of the Jacobian only (the flows themselves use it in full).
        """
        Ta, Tb = self._ends(T_nodes, boundary_k)
        g = self._unscaled_conductances(T_nodes, boundary_k, driver_values) if self._conv else None
        _, dfa, dfb = self._link_laws(Ta, Tb, g)
        return self._jacobian_from(dfa, dfb)

    def _jacobian_from(self, dfa, dfb) -> np.ndarray:
        F = np.zeros((self.n_links, self.n_nodes))
        F[np.arange(self.n_links), self.link_a] = dfa
        F[self._to_node, self.link_b[self._to_node]] += dfb[self._to_node]
        return F

    # ------------------------------------------------------------------ the ODE
    def rhs(self, t: float, T, schedule: Schedule) -> np.ndarray:
        """dT/dt of every node [K/s] at time ``t`` [s]."""
        u = self.inputs_at(t, schedule)
        T = np.asarray(T, dtype=float)
        net = u.source_w + self.incidence @ self.flows(T, u.boundary_k, u.drivers)
        return net / self.capacities.capacity(T)

    def jacobian(self, t: float, T, schedule: Schedule) -> np.ndarray:
        """d(dT/dt)/dT, shape (n_nodes, n_nodes) [1/s].

        J = (D dF/dT) / C(T) - diag(net C'(T) / C(T)^2), with net the node's heat balance [W].
        Convection G is held constant in T here (see ``flow_jacobian``).
        """
        u = self.inputs_at(t, schedule)
        T = np.asarray(T, dtype=float)
        net = u.source_w + self.incidence @ self.flows(T, u.boundary_k, u.drivers)
        C = self.capacities.capacity(T)
        J = (self.incidence @ self.flow_jacobian(T, u.boundary_k, u.drivers)) / C[:, None]
        J[np.diag_indices(self.n_nodes)] -= net * self.capacities.capacity_slope(T) / C ** 2
        return J

    def jacobian_sparsity(self) -> np.ndarray:
        """Boolean (n_nodes, n_nodes): True where the Jacobian may be non-zero."""
        S = np.eye(self.n_nodes, dtype=bool)
        a, b = self.link_a[self._to_node], self.link_b[self._to_node]
        S[a, b] = S[b, a] = True
        return S


def compile_network(network: Network) -> CompiledNetwork:
    """Compile ``network`` into the arrays its right-hand side and Jacobian use."""
    if isinstance(network, CompiledNetwork):
        return network
    if not isinstance(network, Network):
        raise ModelError(f"compile_network needs a Network, got {type(network).__name__}")
    return CompiledNetwork(network)
