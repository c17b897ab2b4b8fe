"""Grey-body radiation coefficients and the view factors they need.

A coefficient C [W/K^4] gives the net exchange q = C (T1^4 - T2^4), the form of
:class:`thermo.network.Radiation`. Impossible inputs (emissivity outside (0, 1], a view factor
outside [0, 1], a negative area) raise :class:`CorrelationError` whatever the validity policy:
they are errors, not extrapolations.
"""
from __future__ import annotations

import numpy as np

from lapdata.echo import shown
from lapdata.units import STEFAN_BOLTZMANN
from thermo.correlations.validity import correlation
from thermo.errors import CorrelationError


def _require(name: str, quantity: str, value, low: float, high: float, low_open: bool = False) -> None:
    arr = np.asarray(value, dtype=float)
    bad = ~np.isfinite(arr) | (arr > high) | ((arr <= low) if low_open else (arr < low))
    if np.any(bad):
        bracket = "(" if low_open else "["
        raise CorrelationError(f"{name}: {quantity} must lie in {bracket}{low:g}, {high:g}], got {shown(value)}")


@correlation()
def radiation_coefficient_grey_two_surface(eps1, eps2, area1, area2, view12):
    """Exchange coefficient of two grey diffuse surfaces forming an enclosure.

    Parameters
    ----------
    eps1 : float
        Emissivity of surface 1 [-]
    eps2 : float
        Emissivity of surface 2 [-]
    area1 : float
        Area of surface 1 [m^2]
    area2 : float
        Area of surface 2 [m^2]
    view12 : float
        View factor from surface 1 to surface 2 [-]

    Returns
    -------
    float
        Coefficient C with q_12 = C (T1^4 - T2^4) [W/K^4]

    Notes
    -----
    C = sigma / [(1 - eps1)/(eps1 A1) + 1/(A1 F12) + (1 - eps2)/(eps2 A2)], the two-surface
    radiation network of surface and space resistances (Incropera section 13.3). It assumes the
    two surfaces exchange only with each other; where they also see the surroundings (an open
    wheel), it overstates the exchange through the surface resistances. Reciprocity
    A1 F12 = A2 F21 is checked (F21 <= 1).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 13.3, two-surface enclosure.
    """
    name = "radiation_coefficient_grey_two_surface"
    _require(name, "eps1", eps1, 0.0, 1.0, low_open=True)
    _require(name, "eps2", eps2, 0.0, 1.0, low_open=True)
    _require(name, "area1", area1, 0.0, np.inf, low_open=True)
    _require(name, "area2", area2, 0.0, np.inf, low_open=True)
    _require(name, "view12", view12, 0.0, 1.0, low_open=True)
    _require(name, "view21 = area1 view12 / area2", np.asarray(area1) * np.asarray(view12) / np.asarray(area2),
             0.0, 1.0 + 1e-12)
    resistance = (1.0 - eps1) / (eps1 * area1) + 1.0 / (area1 * view12) + (1.0 - eps2) / (eps2 * area2)
    return STEFAN_BOLTZMANN / resistance


@correlation()
def radiation_coefficient_to_surroundings(eps, area):
    """Exchange coefficient of a small grey body in large isothermal surroundings.

    Parameters
    ----------
    eps : float
        Emissivity of the body's surface [-]
    area : float
        Radiating area of the body [m^2]

    Returns
    -------
    float
        Coefficient C with q = C (T^4 - T_sur^4) [W/K^4]

    Notes
    -----
    C = eps sigma A (Incropera eq. 1.7), the limit of the two-surface enclosure as
    A1/A2 -> 0 with F12 = 1.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 1.7.
    """
    _require("radiation_coefficient_to_surroundings", "eps", eps, 0.0, 1.0, low_open=True)
    _require("radiation_coefficient_to_surroundings", "area", area, 0.0, np.inf)
    return float(eps) * STEFAN_BOLTZMANN * float(area)


@correlation()
def radiation_conductance_linearised(coefficient_w_k4, t1_k, t2_k):
    """Conductance equivalent to a radiation coefficient at two temperatures.

    Parameters
    ----------
    coefficient_w_k4 : float or array
        Coefficient C of q = C (T1^4 - T2^4) [W/K^4]
    t1_k : float or array
        Temperature of surface 1 [K]
    t2_k : float or array
        Temperature of surface 2 [K]

    Returns
    -------
    float or array
        G with q = G (T1 - T2) [W/K]

    Notes
    -----
    G = C (T1^2 + T2^2)(T1 + T2), exact for the pair of temperatures given (Incropera eq. 1.9).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 1.9.
    """
    t1 = np.asarray(t1_k, dtype=float)
    t2 = np.asarray(t2_k, dtype=float)
    return np.asarray(coefficient_w_k4, dtype=float) * (t1 * t1 + t2 * t2) * (t1 + t2)


@correlation()
def view_factor_coaxial_parallel_discs(radius_i, radius_j, distance):
    """View factor from disc i to a parallel coaxial disc j.

    Parameters
    ----------
    radius_i : float or array
        Radius of the emitting disc i [m]
    radius_j : float or array
        Radius of the receiving disc j [m]
    distance : float or array
        Distance between the disc planes [m]

    Returns
    -------
    float or array
        View factor F_ij [-]

    Notes
    -----
    R_i = r_i/L, R_j = r_j/L, S = 1 + (1 + R_j^2)/R_i^2,
    F_ij = (S - [S^2 - 4 (r_j/r_i)^2]^(1/2)) / 2 (Incropera Table 13.2). Exact for any
    positive radii and distance. For r_i -> 0 it tends to R_j^2 / (1 + R_j^2), the factor
    from a small element to a coaxial disc.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, Table 13.2.
    """
    name = "view_factor_coaxial_parallel_discs"
    _require(name, "radius_i", radius_i, 0.0, np.inf, low_open=True)
    _require(name, "radius_j", radius_j, 0.0, np.inf, low_open=True)
    _require(name, "distance", distance, 0.0, np.inf, low_open=True)
    ri = np.asarray(radius_i, dtype=float) / np.asarray(distance, dtype=float)
    rj = np.asarray(radius_j, dtype=float) / np.asarray(distance, dtype=float)
    s = 1.0 + (1.0 + rj * rj) / (ri * ri)
    ratio2 = (rj / ri) ** 2
    # the difference of two close numbers loses digits for a small disc i: use the conjugate form
    return 2.0 * ratio2 / (s + np.sqrt(s * s - 4.0 * ratio2))


@correlation()
def view_factor_user_given(view_factor, source):
    """A view factor the user supplies (CAD, a catalogue, a measurement), checked and passed on.

    Parameters
    ----------
    view_factor : float
        View factor F_12 from the emitting surface to the receiving one [-]
    source : str
        Where the value comes from (kept for the run's list of references) [-]

    Returns
    -------
    float
        The same view factor [-]

    Notes
    -----
    The route for geometries this module has no formula for (disc to caliper bridge, disc to
    rim): enter F_12 with its source. Requires 0 <= F_12 <= 1 and a non-empty source.

    References
    ----------
    .. [1] Howell, J. R. A Catalog of Radiation Heat Transfer Configuration Factors (online
       catalogue, University of Texas at Austin), the usual place to look one up.
    """
    if not isinstance(source, str) or not source.strip():
        raise CorrelationError("view_factor_user_given: source must name where the view factor comes from")
    _require("view_factor_user_given", "view_factor", view_factor, 0.0, 1.0)
    return float(view_factor)
