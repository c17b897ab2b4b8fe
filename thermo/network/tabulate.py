"""Convective conductances tabulated once on a regular grid, looked up by trilinear interpolation.

A convection link's conductance G(driver, T_node, T_boundary) built from correlations costs tens
of numpy calls; evaluated on every right-hand side call it dominates the solve. ``ConductanceGrid``
fixes regular axes; ``TabulatedConductance`` holds one link's table on them and is itself a valid
``Convection.conductance``. The assembler looks up every tabulated link of a network in one
vectorised gather, and the fast integrator reads the stacked tables directly. Points outside the
grid fall back to the exact function, so the table changes speed, never the range of validity.
Interpolation error is measured in tests/network/test_network_tabulate.py.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable

import numpy as np

from thermo.errors import ModelError
from thermo.network.laws import trilinear


@dataclass(frozen=True)
class ConductanceGrid:
    """Regular axes: driver (e.g. speed [m/s]), node temperature [K], boundary temperature [K]."""

    driver_min: float = 0.0
    driver_max: float = 120.0
    driver_step: float = 1.0
    node_min_k: float = 200.0
    node_max_k: float = 1800.0
    node_step_k: float = 10.0
    boundary_min_k: float = 233.15
    boundary_max_k: float = 343.15
    boundary_step_k: float = 10.0

    def __post_init__(self):
        for lo, hi, step, name in ((self.driver_min, self.driver_max, self.driver_step, "driver"),
                                   (self.node_min_k, self.node_max_k, self.node_step_k, "node"),
                                   (self.boundary_min_k, self.boundary_max_k, self.boundary_step_k, "boundary")):
            if not (np.isfinite(lo) and np.isfinite(hi) and hi > lo and step > 0):
                raise ModelError(f"conductance grid: the {name} axis needs max > min and step > 0")

    def axis(self, which: str) -> np.ndarray:
        lo, hi, step = {"driver": (self.driver_min, self.driver_max, self.driver_step),
                        "node": (self.node_min_k, self.node_max_k, self.node_step_k),
                        "boundary": (self.boundary_min_k, self.boundary_max_k, self.boundary_step_k)}[which]
        n = int(np.ceil((hi - lo) / step - 1e-9)) + 1
        return lo + step * np.arange(n)

    @property
    def shape(self) -> tuple[int, int, int]:
        return (self.axis("driver").size, self.axis("node").size, self.axis("boundary").size)


@dataclass(frozen=True, eq=False)
class TabulatedConductance:
    """One convection link's G on a ConductanceGrid; callable like the function it tabulates."""

    function: Callable
    grid: ConductanceGrid
    table: np.ndarray = field(repr=False)

    @classmethod
    def build(cls, function: Callable, grid: ConductanceGrid) -> "TabulatedConductance":
        """Tabulate ``function`` on ``grid``.

        The function is called once on the open grid: the driver axis shaped (n_driver, 1, 1), the
        node axis (1, n_node, 1) and the boundary axis (1, 1, n_boundary). A function written
        with numpy's element-wise operations (every convection path is) then works out each
        intermediate only on the axes it depends on (air properties at the film temperature on
        node x boundary, an air mass flow on driver x boundary) and the full grid only where
        all three meet. Each point's value is the same, bit for bit, as on the full mesh grid
        (tests/corner/test_corner_tables.py checks every convection path of the corner); the
        result is broadcast to the full grid.
        """
        shape = grid.shape
        d = grid.axis("driver")[:, None, None]
        n = grid.axis("node")[None, :, None]
        b = grid.axis("boundary")[None, None, :]
        table = np.asarray(function(d, n, b), dtype=float)
        try:
            full = np.broadcast_shapes(table.shape, shape) == shape
        except ValueError:
            full = False
        if not full:
            raise ModelError("conductance table: the function must give one G per grid point (element-wise on its arguments)")
        if not np.all(np.isfinite(table)) or np.any(table < 0):     # checked before broadcasting: the same values
            raise ModelError("conductance table: the function must give finite G >= 0 on the whole grid")
        table = np.ascontiguousarray(table) if table.shape == shape else np.array(np.broadcast_to(table, shape), order="C")
        table.flags.writeable = False
        return cls(function, grid, table)

    def __call__(self, driver, node_k, boundary_k):
        return lookup(self.grid, self.table[None], driver, node_k, boundary_k, (self.function,))[..., 0]


def _fractional_index(value, lo, step, n):
    x = (np.asarray(value, dtype=float) - lo) / step
    inside = (x >= 0) & (x <= n - 1)
    i = np.clip(np.floor(x).astype(int), 0, n - 2)
    return i, np.clip(x - i, 0.0, 1.0), inside


def lookup(grid: ConductanceGrid, tables: np.ndarray, driver, node_k, boundary_k, functions=()) -> np.ndarray:
    """Trilinear lookup of several links' tables at once.

    tables : (n_links, n_driver, n_node, n_boundary); driver, node_k, boundary_k broadcast to (..., n_links)
    or are scalars per link. Returns G with shape (..., n_links). Points outside the grid are
    evaluated exactly with ``functions[k]`` when given, else raise ModelError.
    """
    nd, nn, nb = tables.shape[1:]
    d = np.asarray(0.0 if driver is None else driver, dtype=float)
    shape = np.broadcast_shapes(d.shape, np.shape(node_k), np.shape(boundary_k))
    if shape == () or shape[-1] != tables.shape[0]:
        shape = shape + (tables.shape[0],) if (shape == () or shape[-1] != tables.shape[0]) else shape
    d, tn, tb = (np.broadcast_to(np.asarray(x, dtype=float), shape) for x in (d, node_k, boundary_k))
    i, fi, ok_i = _fractional_index(d, grid.driver_min, grid.driver_step, nd)
    j, fj, ok_j = _fractional_index(tn, grid.node_min_k, grid.node_step_k, nn)
    k, fk, ok_k = _fractional_index(tb, grid.boundary_min_k, grid.boundary_step_k, nb)
    link = np.broadcast_to(np.arange(tables.shape[0]), shape)
    corners = [tables[link, i + di, j + dj, k + dk] for di in (0, 1) for dj in (0, 1) for dk in (0, 1)]
    out = trilinear(*corners, fi, fj, fk)[0]           # the kernels' interpolation (thermo.network.laws)
    outside = ~(ok_i & ok_j & ok_k)
    if np.any(outside):
        if not functions:
            raise ModelError("conductance table: a point lies outside the tabulated grid")
        for col in np.unique(np.nonzero(outside)[-1]):
            rows = outside[..., col]
            out[..., col][rows] = functions[col](d[..., col][rows], tn[..., col][rows], tb[..., col][rows])
    return out
