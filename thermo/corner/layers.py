"""Layers through a heated solid (disc cheek, pad) chosen from the braking pulse's penetration depth.

A friction face heated for a time t is disturbed to a depth of about sqrt(alpha t) (Carslaw &
Jaeger, Conduction of Heat in Solids, 2nd ed., 1959, section 2.9). The first layer is a share of
that depth for a one-second pulse; each layer inwards is ``growth`` times thicker than the one
before, until the solid is filled. The face temperature is extrapolated linearly from the first
two layer nodes (a second-order estimate of the boundary value): with the defaults below it
reproduces the constant-flux solution of a slab heated on one face within 2 % between 1 and
4 s (tests/corner/test_corner_layers.py, against Carslaw & Jaeger's series solution).
"""
from __future__ import annotations

import math

import numpy as np

PULSE_S = 1.0                 # the shortest braking pulse the first layer must resolve [s]
FIRST_LAYER_SHARE = 0.3       # first layer thickness / sqrt(alpha PULSE_S)
GROWTH = 1.5                  # each layer this much thicker than the one nearer the face
MAX_LAYERS = 8


def penetration_depth_m(diffusivity_m2_s: float, time_s: float = PULSE_S) -> float:
    """Depth sqrt(alpha t) a surface heating of duration t reaches [m]."""
    return math.sqrt(diffusivity_m2_s * time_s)


def graded_layers(total_m: float, first_m: float, max_layers: int = MAX_LAYERS, growth: float = GROWTH) -> np.ndarray:
    """Layer thicknesses from the heated face inwards, summing to ``total_m`` [m].

    The first layer is ``first_m`` (or the whole solid if thinner), then each ``growth`` times the
    one before. The last layer takes what is left (merged into the one before when it would be
    thinner than half of it). Where ``max_layers`` layers cannot fill the solid at this growth,
    the growth is raised until they do.
    """
    if first_m >= total_m or max_layers <= 1:
        return np.array([total_m])
    if first_m * (growth ** max_layers - 1) / (growth - 1) < total_m:
        return layers_of_count(total_m, first_m, max_layers)
    dx, filled = [], 0.0
    while filled < total_m * (1 - 1e-12) and len(dx) < max_layers:
        d = min(first_m * growth ** len(dx), total_m - filled)
        dx.append(d)
        filled += d
    if len(dx) > 2 and dx[-1] < 0.5 * dx[-2]:
        dx[-2] += dx.pop()
    out = np.array(dx)
    return out * (total_m / out.sum())


def layers_of_count(total_m: float, first_m: float, count: int) -> np.ndarray:
    """Exactly ``count`` layers from the face inwards, the first ``first_m`` and each the same
    factor thicker than the one before, summing to ``total_m`` [m]. Where even layers are already
    thinner than ``first_m``, the layers are even.

    Written in scalar steps (``math.pow`` of a float exponent, sums in order) so that the compiled
    stint kernel (``thermo.chain.stint_kernel``), which compiles this very function to wear a pad
    between laps, gives the same layers to the bit (numpy's array power and an integer exponent in
    numba each round differently in the last bit; tested)."""
    if count <= 1:
        return np.full(1, total_m)
    if first_m * count >= total_m:
        return np.full(count, total_m / count)
    lo, hi = 1.0, 2.0
    while first_m * (math.pow(hi, float(count)) - 1) / (hi - 1) < total_m:
        hi *= 2.0
    for _ in range(200):
        g = 0.5 * (lo + hi)
        if g == 1.0 or first_m * (math.pow(g, float(count)) - 1) / (g - 1) < total_m:
            new_lo, new_hi = g, hi
        else:
            new_lo, new_hi = lo, g
        if new_lo == lo and new_hi == hi:
            break                   # a fixed point in floating point: further halvings change nothing
        lo, hi = new_lo, new_hi
    out = np.empty(count)
    total = 0.0
    for i in range(count):
        out[i] = first_m * math.pow(hi, float(i))
        total += out[i]
    return out * (total_m / total)


def first_layer_m(diffusivity_m2_s: float) -> float:
    """The first layer: a share of the one-second penetration depth [m]."""
    return FIRST_LAYER_SHARE * penetration_depth_m(diffusivity_m2_s)


def auto_layers(total_m: float, diffusivity_m2_s: float, max_layers: int = MAX_LAYERS) -> np.ndarray:
    """Graded layers, the first a share of the one-second penetration depth, as many as needed [m]."""
    return graded_layers(total_m, first_layer_m(diffusivity_m2_s), max_layers)


def face_extrapolation(thicknesses_m: np.ndarray) -> tuple[float, float]:
    """Weights (w1, w2) with T_face = w1 T_1 + w2 T_2, linear through the first two layer centres."""
    if len(thicknesses_m) < 2:
        return 1.0, 0.0
    r = thicknesses_m[0] / (thicknesses_m[0] + thicknesses_m[1])
    return 1.0 + r, -r


def worn_pad_profile(old_dx_m: np.ndarray, old_t_k: np.ndarray, new_dx_m: np.ndarray) -> np.ndarray:
    """Pad layer temperatures after wear [K]: each new layer centre takes the old profile's
    temperature at the same depth from the backing plate (linear between old centres), so the
    material worn off the friction face takes the face's heat with it. (Compiled as it stands by
    ``thermo.chain.stint_kernel``.)"""
    old_x, new_x = depth_from_back(np.asarray(old_dx_m)), depth_from_back(np.asarray(new_dx_m))
    return np.interp(new_x, old_x[::-1], np.asarray(old_t_k)[::-1])


def depth_from_back(dx_m: np.ndarray) -> np.ndarray:
    """Depth of each layer centre from the solid's back face, the layers given face first [m]
    (so decreasing). The total is the running sum's last (a sum in order, as compiled too)."""
    through = np.cumsum(dx_m)
    return through[-1] - (through - dx_m / 2)
