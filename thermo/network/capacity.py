"""The heat capacities of all nodes at once, vectorised for the right-hand side.

Each node's specific heat is piecewise linear in T and constant beyond its table (as
``HeatCapacity`` defines it). Written as a base value plus clipped ramps,

    C_i(T) = m_i [c_i0 + sum_j s_j (clip(T, lo_j, hi_j) - lo_j)],

every node is evaluated by one numpy expression, with no loop over nodes. The segment's ramp and
its integral are ``thermo.network.laws.capacity_segment``, the function the compiled kernels use.
"""
from __future__ import annotations

import numpy as np

from thermo.network.elements import REFERENCE_TEMPERATURE_K
from thermo.network.laws import capacity_segment


class CapacityTable:
    """C(T), dC/dT and enthalpy H(T) of ``n`` nodes in one call each.

    Parameters
    ----------
    capacities : sequence of HeatCapacity
        One per node, in node order
    """

    def __init__(self, capacities):
        caps = tuple(capacities)
        self.n = len(caps)
        self.mass_kg = np.array([c.mass_kg for c in caps], dtype=float)
        self.base_j_kgk = np.array([c.specific_heat_j_kgk[0] for c in caps], dtype=float)
        node, lo, hi, slope = [], [], [], []
        for i, c in enumerate(caps):
            t = np.asarray(c.temperatures_k, dtype=float)
            v = np.asarray(c.specific_heat_j_kgk, dtype=float)
            for j in range(t.size - 1):
                node.append(i)
                lo.append(t[j])
                hi.append(t[j + 1])
                slope.append((v[j + 1] - v[j]) / (t[j + 1] - t[j]))
        self.seg_node = np.array(node, dtype=int)
        self.seg_lo = np.array(lo, dtype=float)
        self.seg_hi = np.array(hi, dtype=float)
        self.seg_slope = np.array(slope, dtype=float)
        self.reference_k = np.array([c.temperatures_k[0] for c in caps], dtype=float)
        self.is_constant = self.seg_node.size == 0 or bool(np.all(self.seg_slope == 0.0))
        self._capacities = caps
        self._segment_to_node = np.zeros((self.seg_node.size, self.n))
        self._segment_to_node[np.arange(self.seg_node.size), self.seg_node] = 1.0

    def capacity(self, temperature_k: np.ndarray) -> np.ndarray:
        """m c(T) of every node [J/K], for T of shape (..., n) [K]."""
        T = np.asarray(temperature_k, dtype=float)
        if self.is_constant:
            return np.broadcast_to(self.mass_kg * self.base_j_kgk, T.shape).copy()
        c = np.broadcast_to(self.base_j_kgk, T.shape).copy()
        if self.seg_node.size:
            self._accumulate(c, self.seg_slope * capacity_segment(T[..., self.seg_node], self.seg_lo, self.seg_hi)[0])
        return self.mass_kg * c

    def capacity_slope(self, temperature_k: np.ndarray) -> np.ndarray:
        """d(m c)/dT of every node [J/K^2], zero beyond each table."""
        T = np.asarray(temperature_k, dtype=float)
        s = np.zeros(T.shape)
        if not self.is_constant:
            x = T[..., self.seg_node]
            inside = (x > self.seg_lo) & (x < self.seg_hi)
            self._accumulate(s, np.where(inside, self.seg_slope, 0.0))
        return self.mass_kg * s

    def enthalpy(self, temperature_k: np.ndarray) -> np.ndarray:
        """Stored heat of every node relative to 20 degC [J], the exact integral of C(T)."""
        T = np.asarray(temperature_k, dtype=float)
        h = self.base_j_kgk * (T - REFERENCE_TEMPERATURE_K)
        if not self.is_constant:
            ramp = self._ramp_integral(T[..., self.seg_node]) - self._ramp_integral(REFERENCE_TEMPERATURE_K)
            h = h + (self.seg_slope * ramp) @ self._segment_to_node
        return self.mass_kg * h

    def _ramp_integral(self, x):
        """Integral of (clip(s, lo, hi) - lo) ds from below lo up to x, per segment [K^2]."""
        return capacity_segment(x, self.seg_lo, self.seg_hi)[1]

    def _accumulate(self, out: np.ndarray, per_segment: np.ndarray) -> None:
        out += per_segment @ self._segment_to_node
