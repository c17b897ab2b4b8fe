"""The pad wear law: how much friction material a lap takes off (``[pad_wear]`` of a scenario)."""
from __future__ import annotations

import math


def worn_thickness_m(thickness_m, wear_coefficient_m3_per_j, energy_j, pads_area_m2, pad_k, reference_k, scale_k,
                     min_thickness_m):
    """Pad thickness after a lap [m]: dh = k E f(T) / A_pads, f(T) = exp((T - T_ref)/T_scale) above
    T_ref and 1 below, the pad held at ``min_thickness_m``.

    ``wear_coefficient_m3_per_j`` k [m^3/J]; ``energy_j`` E the lap's friction energy at the corner
    [J]; ``pads_area_m2`` A_pads, both pads' faces [m^2]; ``pad_k`` T the pad's temperature weighted by
    its heat over the lap [K]; ``reference_k``, ``scale_k`` [K]. Wear in proportion to friction work,
    rising with temperature: an illustrative law whose coefficients must be calibrated against
    measured wear (``thermo.scenario.model.PadWear``). Plain arithmetic on scalars: the stint kernel
    compiles it (``thermo.chain.stint_kernel``). ``math.exp``, the C library's, as the compiled code
    calls it: numpy's own exp (vectorised on CPUs that have AVX-512) differs from it in the last bit
    for about one argument in twenty, and a lap worn in Python would not be the lap worn in the kernel."""
    wear = wear_coefficient_m3_per_j * energy_j / pads_area_m2 * math.exp(max(pad_k - reference_k, 0.0) / scale_k)
    return max(thickness_m - wear, min_thickness_m)


def heat_weighted_pad_k(temps_k, pad_weights, pad_nodes, heat_w):
    """The pad's temperature weighted by its heat over a lap [K]: sum_r q_r T_r / sum_r q_r, T_r = sum_i
    w_i T[r, pad_nodes[i]] the pad's mean (``pad_weights`` w_i, its output weights over its layers)
    at recorded row r, q_r the pad's heat there (``heat_w`` [W]); ``temps_k`` (rows, nodes) [K].

    Plain loops, so that every run that wears a pad sums in one order: ``CornerRun`` and
    ``CornerLanes`` call this function as the stint kernel compiles it (``thermo.chain.stint_kernel``)."""
    heat = 0.0
    weighted = 0.0
    for r in range(heat_w.size):
        pad_k = 0.0
        for i in range(pad_nodes.size):
            pad_k += pad_weights[i] * temps_k[r, pad_nodes[i]]
        heat += heat_w[r]
        weighted += heat_w[r] * pad_k
    return weighted / max(heat, 1e-12)
