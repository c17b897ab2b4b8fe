"""How the friction heat divides between disc and pad: effusivity and the partition formulas.

Each function is pure and vectorised; inputs outside a formula's domain (non-positive
properties, a pad larger than its swept ring) raise :class:`thermo.errors.CorrelationError`
naming the parameter, whatever the validity policy. ``.reference`` carries each References.
"""
from __future__ import annotations

import numpy as np

from lapdata.echo import shown
from thermo.correlations.validity import correlation
from thermo.errors import CorrelationError


def _positive(name, value):
    array = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(array)) or np.any(array <= 0.0):
        raise CorrelationError(f"{name} must be positive and finite, got {shown(value)}")
    return array


def _scalar_or_array(array):
    return float(array) if np.ndim(array) == 0 else array


@correlation()
def effusivity(conductivity_w_mk, density_kg_m3, specific_heat_j_kgk):
    """Thermal effusivity of a material, the quantity that sets how a surface takes up heat.

    Parameters
    ----------
    conductivity_w_mk : float or array_like
        Thermal conductivity [W/(m K)]
    density_kg_m3 : float or array_like
        Density [kg/m^3]
    specific_heat_j_kgk : float or array_like
        Specific heat capacity [J/(kg K)]

    Returns
    -------
    float or ndarray
        Effusivity e = sqrt(k rho c) [W s^0.5 / (m^2 K)]

    Notes
    -----
    e = sqrt(k rho c). A semi-infinite solid under a constant surface flux q warms at its
    surface by 2 q sqrt(t/pi) / e [1]_, so of two bodies held at the same surface temperature
    the one with the larger effusivity takes the larger share of the heat. Valid for any
    positive k, rho, c (all three must be positive).

    References
    ----------
    .. [1] Carslaw, H.S., Jaeger, J.C., Conduction of Heat in Solids, 2nd ed., Oxford, 1959.

    Examples
    --------
    Grey cast iron, k 51, rho 7100, c 499:

    >>> round(effusivity(51.0, 7100.0, 499.0), -1)
    13440.0
    """
    k = _positive("conductivity_w_mk", conductivity_w_mk)
    rho = _positive("density_kg_m3", density_kg_m3)
    c = _positive("specific_heat_j_kgk", specific_heat_j_kgk)
    return _scalar_or_array(np.sqrt(k * rho * c))


@correlation()
def heat_partition_effusivity(e_disc, e_pad):
    """Share of the friction heat that enters the disc, per unit of contact area (Charron).

    Parameters
    ----------
    e_disc : float or array_like
        Effusivity of the disc material [W s^0.5 / (m^2 K)]
    e_pad : float or array_like
        Effusivity of the pad material [W s^0.5 / (m^2 K)]

    Returns
    -------
    float or ndarray
        Disc share gamma of the heat, between 0 and 1 [-]

    Notes
    -----
    gamma = e_d / (e_d + e_p). Two semi-infinite bodies in sliding contact whose surfaces are at
    the same temperature, heated over the same area [1]_ [2]_. Valid while the heat has not
    reached the far side of either body (heating time short against L^2/alpha of disc and pad)
    and when the pad covers the whole rubbing path; for a pad covering only part of the disc
    ring use :func:`heat_partition_area_weighted`.

    References
    ----------
    .. [1] Charron, F., Partage de la chaleur entre deux corps frottants, Publ. Sci. Tech.
       Ministere de l'Air 182, 1943 (details from memory).
    .. [2] Limpert, R., Brake Design and Safety, SAE International (chapter on brake
       temperatures).

    Examples
    --------
    Grey iron against an organic pad (k 1, rho 2000, c 1000):

    >>> round(heat_partition_effusivity(13440.0, 1414.2), 3)
    0.905
    """
    e_d = _positive("e_disc", e_disc)
    e_p = _positive("e_pad", e_pad)
    return _scalar_or_array(e_d / (e_d + e_p))


@correlation()
def heat_partition_area_weighted(e_disc, e_pad, area_disc_m2, area_pad_m2):
    """Share of the friction heat that enters the disc, weighted by swept and pad areas.

    Parameters
    ----------
    e_disc : float or array_like
        Effusivity of the disc material [W s^0.5 / (m^2 K)]
    e_pad : float or array_like
        Effusivity of the pad material [W s^0.5 / (m^2 K)]
    area_disc_m2 : float or array_like
        Swept (rubbing) ring area of the disc, one face [m^2]
    area_pad_m2 : float or array_like
        Contact area of one pad [m^2]

    Returns
    -------
    float or ndarray
        Disc share gamma of the heat, between 0 and 1 [-]

    Notes
    -----
    gamma = 1 / (1 + (A_p / A_d) (e_p / e_d)) [1]_ [2]_. The disc takes up heat over its whole
    swept ring while the pad does so only over its own face. Reduces to
    e_d / (e_d + e_p) when A_p = A_d. Same assumptions as the per-area form (semi-infinite
    bodies, equal surface temperatures, short heating); A_p may not exceed A_d (a pad cannot
    cover more than the ring it sweeps), which is checked.

    References
    ----------
    .. [1] Newcomb, T.P., Spurr, R.T., Braking of Road Vehicles, Chapman and Hall, 1967.
    .. [2] Day, A.J., Braking of Road Vehicles, Butterworth-Heinemann, 2014.

    Examples
    --------
    Grey iron against an organic pad, pad area 18 % of the swept ring:

    >>> round(heat_partition_area_weighted(13440.0, 1414.2, 1.0, 0.18), 3)
    0.981
    """
    e_d = _positive("e_disc", e_disc)
    e_p = _positive("e_pad", e_pad)
    a_d = _positive("area_disc_m2", area_disc_m2)
    a_p = _positive("area_pad_m2", area_pad_m2)
    if np.any(a_p > a_d):
        raise CorrelationError(
            f"area_pad_m2 ({shown(area_pad_m2)}) must not exceed area_disc_m2 ({shown(area_disc_m2)}): "
            "a pad cannot cover more than the ring it sweeps"
        )
    return _scalar_or_array(1.0 / (1.0 + (a_p / a_d) * (e_p / e_d)))
