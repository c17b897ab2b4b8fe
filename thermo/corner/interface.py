"""The pad-disc interface: where friction heat is made, and how the two bodies share it.

Friction heat is generated at the interface between the pad and the disc. With the interface
taken as a surface of no heat capacity at temperature T_i, joined to the disc's first layer
through R_d (half that layer, conduction) and to the pad's first layer through R_p, the heat
balance Q = (T_i - T_d)/R_d + (T_i - T_p)/R_p eliminates T_i exactly:

    Q_disc = R_p/(R_d + R_p) Q + (T_p - T_d)/(R_d + R_p),   Q_pad = Q - Q_disc.

So the split follows the two bodies' instantaneous thermal resistances to the interface: a fixed
share ``R_p/(R_d + R_p)`` of the friction heat plus a conduction between the two layers while the
pad is clamped. A hot pad hands heat back to a cooler disc. For two bodies starting at one
temperature and resolved finely near the face, the split tends to the area-weighted effusivity
form of Newcomb & Spurr (tests/corner/test_corner_interface.py). Between applications the pad
rests on the disc through a contact conductance in series with the same two half-layers.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np


def half_layer_resistance(thickness_m: float, conductivity_w_mk: float, area_m2: float) -> float:
    """Conduction resistance from a layer's centre to its face, (dx/2)/(k A) [K/W]."""
    return 0.5 * thickness_m / (conductivity_w_mk * area_m2)


def interface_disc_share(r_disc_k_w: float, r_pad_k_w: float) -> float:
    """Share of the friction heat that goes straight into the disc layer, R_p / (R_d + R_p) [-]."""
    return r_pad_k_w / (r_disc_k_w + r_pad_k_w)


def applied_conductance(r_disc_k_w: float, r_pad_k_w: float) -> float:
    """Conductance between the disc and pad layers while clamped, 1/(R_d + R_p) [W/K]."""
    return 1.0 / (r_disc_k_w + r_pad_k_w)


def rest_conductance(r_disc_k_w: float, r_pad_k_w: float, contact_w_m2k: float, pad_area_m2: float) -> float:
    """Conductance between the layers while the pad rests on the disc: contact in series [W/K]."""
    if contact_w_m2k <= 0:
        return 0.0
    return 1.0 / (r_disc_k_w + r_pad_k_w + 1.0 / (contact_w_m2k * pad_area_m2))


@dataclass(frozen=True)
class ClampShare:
    """G(clamp, T_pad, T_disc) = clamp, clamp in [0, 1] [-]: the clamped part of the interface
    conductance per W/K of (G_applied - G_rest), which the link's scale carries.

    ``clamp`` is the schedule signal ``pad_clamp``: 1 while the brake is applied (friction heat
    above zero), 0 between applications, linear in between like every signal.
    """

    def __call__(self, clamp, pad_k, disc_k):
        shape = np.broadcast_shapes(np.shape(clamp), np.shape(pad_k), np.shape(disc_k))
        return np.clip(np.broadcast_to(np.asarray(clamp, dtype=float), shape), 0.0, 1.0)
