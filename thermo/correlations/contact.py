"""Conductances of contacts and slabs, their series and parallel combination, typical contact h_c.

A piston crown on a pad backing plate with an insulating shim is three conductances in series:
contact (backing plate to shim), slab (the shim), contact (shim to crown).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from lapdata.suggest import did_you_mean
from thermo.correlations.validity import correlation
from thermo.errors import CorrelationError


def _positive(name: str, quantity: str, value, allow_zero: bool = False) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    bad = ~np.isfinite(arr) | ((arr < 0.0) if allow_zero else (arr <= 0.0))
    if np.any(bad):
        expected = ">= 0" if allow_zero else "> 0"
        raise CorrelationError(f"{name}: {quantity} must be a finite number {expected}, got {shown(value)}")
    return arr


@correlation()
def conductance_contact(h_contact_w_m2k, area_m2):
    """Conductance of a contact interface from its contact coefficient and nominal area.

    Parameters
    ----------
    h_contact_w_m2k : float or array
        Contact conductance coefficient h_c = 1/R''_tc [W/(m^2 K)]
    area_m2 : float or array
        Nominal (apparent) contact area [m^2]

    Returns
    -------
    float or array
        Conductance G = h_c A [W/K]

    Notes
    -----
    G = h_c A = A / R''_tc (Incropera section 3.1.4).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 3.1.4 (thermal contact resistance).
    """
    return _positive("conductance_contact", "h_contact_w_m2k", h_contact_w_m2k, allow_zero=True) \
        * _positive("conductance_contact", "area_m2", area_m2)


@correlation()
def conductance_slab(k, area, thickness):
    """Conductance of a plane slab through its thickness.

    Parameters
    ----------
    k : float or array
        Thermal conductivity of the slab [W/(m K)]
    area : float or array
        Area normal to the heat flow [m^2]
    thickness : float or array
        Thickness along the heat flow [m]

    Returns
    -------
    float or array
        Conductance G = k A / L [W/K]

    Notes
    -----
    G = k A / L, steady one-dimensional conduction (Incropera eq. 3.6).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 3.6.
    """
    return _positive("conductance_slab", "k", k) * _positive("conductance_slab", "area", area) \
        / _positive("conductance_slab", "thickness", thickness)


@correlation()
def conductance_series(*conductances_w_k):
    """Conductance of conductances in series, 1 / sum(1/G_i).

    Parameters
    ----------
    conductances_w_k : float or array
        Two or more conductances, each > 0 [W/K]

    Returns
    -------
    float or array
        Series conductance [W/K]

    Notes
    -----
    Resistances add in series (Incropera eq. 3.19).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 3.1.3.
    """
    if not conductances_w_k:
        raise CorrelationError("conductance_series: needs at least one conductance")
    total = sum(1.0 / _positive("conductance_series", f"conductance {i}", g) for i, g in enumerate(conductances_w_k))
    return 1.0 / total


@correlation()
def conductance_parallel(*conductances_w_k):
    """Conductance of conductances in parallel, sum(G_i).

    Parameters
    ----------
    conductances_w_k : float or array
        One or more conductances, each >= 0 [W/K]

    Returns
    -------
    float or array
        Parallel conductance [W/K]

    Notes
    -----
    Conductances add in parallel (Incropera section 3.1.3).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 3.1.3.
    """
    if not conductances_w_k:
        raise CorrelationError("conductance_parallel: needs at least one conductance")
    return sum(_positive("conductance_parallel", f"conductance {i}", g, allow_zero=True)
               for i, g in enumerate(conductances_w_k))


@dataclass(frozen=True)
class ContactCoefficient:
    """A typical contact conductance coefficient with its plausible range and its source."""

    kind: str
    h_w_m2k: float
    low_w_m2k: float
    high_w_m2k: float
    source: str
    description: str


_INCROPERA_31 = ("Incropera 6th ed. Table 3.1 (R''_tc of metallic interfaces; values from memory); "
                 "joint values of the trade, no single published source")

#: Typical contact coefficients h_c [W/(m^2 K)] of the interfaces of a brake corner. Starting
#: values, to be calibrated: h_c depends on pressure, roughness, flatness and interstitial fluid.
CONTACT_COEFFICIENTS: dict[str, ContactCoefficient] = {c.kind: c for c in (
    ContactCoefficient(
        "steel_aluminium_bolted", 3000.0, 1000.0, 10000.0,
        "from memory: " + _INCROPERA_31,
        "bolted steel-to-aluminium joint in air (caliper to upright, hub flange), moderate clamp"),
    ContactCoefficient(
        "aluminium_aluminium_air", 3600.0, 2000.0, 7000.0,
        "from memory: Incropera 6th ed. Table 3.1(b), aluminium interface, air gap, "
        "R''_tc = 2.75e-4 m^2K/W at 1e5 Pa contact pressure",
        "aluminium to aluminium, light contact, air in the gaps"),
    ContactCoefficient(
        "piston_crown_steel_backing_plate", 1500.0, 500.0, 5000.0,
        "from memory; common practice, no published source",
        "bare piston crown on the steel pad backing plate; small, rough annular contact, "
        "clamp pressure varies with line pressure"),
    ContactCoefficient(
        "shim_interface", 1000.0, 300.0, 3000.0,
        "from memory; common practice, no published source",
        "each face of an insulating shim or crown insert (add the shim's own slab conductance "
        "and a contact on each side, in series)"),
    ContactCoefficient(
        "bearing_race_press_fit", 5000.0, 2000.0, 20000.0,
        "from memory; common practice, no published source",
        "press-fitted bearing outer race in its housing, or inner race on the spindle"),
    ContactCoefficient(
        "stainless_steel_vacuum_light", 1000.0, 400.0, 1700.0,
        "from memory: Incropera 6th ed. Table 3.1(a), stainless steel in vacuum at 1e5 Pa, "
        "R''_tc = 6-25e-4 m^2K/W",
        "lower bound for steel-on-steel contacts with little clamp (no interstitial air)"),
)}


def contact_coefficient(kind: str) -> ContactCoefficient:
    """The typical contact coefficient of an interface kind (CorrelationError with close matches)."""
    try:
        return CONTACT_COEFFICIENTS[kind]
    except KeyError:
        hint = did_you_mean(kind, CONTACT_COEFFICIENTS, n=3)
        raise CorrelationError(f"contact coefficient: unknown interface kind '{kind}'{hint} "
                               f"(known: {', '.join(sorted(CONTACT_COEFFICIENTS))})") from None
