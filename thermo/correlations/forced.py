"""Forced-convection Nusselt numbers: rotating disc, flat plate, cylinder in crossflow; mixed convection.

Internal flow (pipes, vane passages, piston vent holes) is in ``thermo.correlations.internal``.

Each function returns a mean Nusselt number on the length stated in its docstring; the caller
evaluates properties at the film temperature and forms h = Nu k / L. All accept numpy arrays.
Equation numbers of Incropera (6th ed.) are from memory except eq. 7.38 (given in the brief);
the formulas themselves are checked in tests against the `ht` package.
"""
from __future__ import annotations

import numpy as np

from thermo.correlations.validity import correlation

ROTATING_DISC_TRANSITION_RE = 2.4e5   # Cobb & Saunders (1956), PHYSICS.md
FLAT_PLATE_TRANSITION_RE = 5.0e5      # Incropera, section 7.2


@correlation(re_w=(0.0, ROTATING_DISC_TRANSITION_RE))
def nusselt_rotating_disc_laminar_cobb_saunders(re_w):
    """Mean Nusselt number of a disc rotating in still air, laminar boundary layer.

    Parameters
    ----------
    re_w : float or array
        Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array
        Mean Nusselt number h b / k on the outer radius [-]

    Notes
    -----
    Nu = 0.36 Re_w^0.5 for Re_w < 2.4e5 (constants from memory, PHYSICS.md). Laminar theory gives
    the Re_w^0.5 form down to Re_w = 0; at low Re_w natural convection dominates, so combine with
    :func:`nusselt_mixed_churchill`. Air only (Pr about 0.72).

    References
    ----------
    .. [1] Cobb, E. C., Saunders, O. A. "Heat transfer from a rotating disk." Proceedings of the
       Royal Society A 236 (1956): 343-351.
    """
    return 0.36 * np.sqrt(np.asarray(re_w, dtype=float))


@correlation(re_w=(ROTATING_DISC_TRANSITION_RE, 1.0e7))
def nusselt_rotating_disc_turbulent_cobb_saunders(re_w):
    """Mean Nusselt number of a disc rotating in still air, turbulent boundary layer.

    Parameters
    ----------
    re_w : float or array
        Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array
        Mean Nusselt number h b / k on the outer radius [-]

    Notes
    -----
    Nu = 0.015 Re_w^0.8 for Re_w > 2.4e5 (the usual turbulent form; constants and the upper
    limit 1e7 from memory, not confirmed against the paper). Air only (Pr about 0.72). The value
    jumps at the transition (176 laminar against 299 turbulent at 2.4e5), as in the source.

    References
    ----------
    .. [1] Cobb, E. C., Saunders, O. A. "Heat transfer from a rotating disk." Proceedings of the
       Royal Society A 236 (1956): 343-351 (turbulent constants from memory).
    """
    return 0.015 * np.asarray(re_w, dtype=float) ** 0.8


@correlation(re_w=(0.0, 1.0e7))
def nusselt_rotating_disc_cobb_saunders(re_w):
    """Mean Nusselt number of a rotating disc, laminar or turbulent form chosen by Re_w.

    Parameters
    ----------
    re_w : float or array
        Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array
        Mean Nusselt number h b / k on the outer radius [-]

    Notes
    -----
    0.36 Re_w^0.5 for Re_w < 2.4e5, else 0.015 Re_w^0.8 (see the two single-regime functions).

    References
    ----------
    .. [1] Cobb, E. C., Saunders, O. A. "Heat transfer from a rotating disk." Proceedings of the
       Royal Society A 236 (1956): 343-351.
    """
    re = np.asarray(re_w, dtype=float)
    return np.where(re < ROTATING_DISC_TRANSITION_RE, 0.36 * np.sqrt(np.maximum(re, 0.0)),
                    0.015 * np.maximum(re, 0.0) ** 0.8)


@correlation(re=(0.0, 1.0e7))
def nusselt_brake_disc_limpert(re):
    """Mean Nusselt number of a brake disc face in its airflow, in the form Limpert gives.

    Parameters
    ----------
    re : float or array
        Reynolds number v D / nu on the outer diameter D and air speed v [-]

    Returns
    -------
    float or array
        Mean Nusselt number h D / k on the outer diameter [-]

    Notes
    -----
    Nu = 0.70 Re^0.55 for Re < 2.4e5 (laminar), Nu = 0.04 Re^0.8 above (turbulent). Which
    velocity the source's Re uses is ambiguous (the car's or the disc's rim speed); brakeheat
    uses the local air speed over the disc (car speed x local airflow factor) and documents it.
    Constants as quoted in the project's physics reference (equation numbers from memory).

    References
    ----------
    .. [1] Limpert, R. Brake Design and Safety, 2nd ed., SAE International, 1999, ch. 3.
    """
    r = np.maximum(np.asarray(re, dtype=float), 0.0)
    return np.where(r < ROTATING_DISC_TRANSITION_RE, 0.70 * r ** 0.55, 0.04 * r ** 0.8)


@correlation(re=(0.0, FLAT_PLATE_TRANSITION_RE), pr=(0.6, 50.0))
def nusselt_flat_plate_laminar_pohlhausen(re, pr):
    """Mean Nusselt number of an isothermal flat plate in parallel flow, laminar.

    Parameters
    ----------
    re : float or array
        Reynolds number u L / nu on the plate length [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k [-]

    Notes
    -----
    Nu = 0.664 Re^0.5 Pr^(1/3) (Incropera eq. 7.30), Re < 5e5, Pr >= 0.6.

    References
    ----------
    .. [1] Pohlhausen, E. "Der Waermeaustausch zwischen festen Koerpern und Fluessigkeiten mit
       kleiner Reibung und kleiner Waermeleitung." ZAMM 1 (1921): 115-121.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 7.30.
    """
    return 0.664 * np.sqrt(np.asarray(re, dtype=float)) * np.cbrt(np.asarray(pr, dtype=float))


@correlation(re=(FLAT_PLATE_TRANSITION_RE, 1.0e8), pr=(0.6, 60.0))
def nusselt_flat_plate_mixed_incropera(re, pr):
    """Mean Nusselt number of an isothermal flat plate, laminar leading part then turbulent.

    Parameters
    ----------
    re : float or array
        Reynolds number u L / nu on the plate length [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k [-]

    Notes
    -----
    Nu = (0.037 Re^0.8 - 871) Pr^(1/3) (Incropera eq. 7.38, transition at Re_x,c = 5e5),
    5e5 < Re < 1e8, 0.6 < Pr < 60.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eqs. 7.38-7.39.
    """
    return (0.037 * np.asarray(re, dtype=float) ** 0.8 - 871.0) * np.cbrt(np.asarray(pr, dtype=float))


@correlation(re=(0.0, 1.0e8), pr=(0.6, 50.0))
def nusselt_flat_plate_incropera(re, pr):
    """Mean Nusselt number of an isothermal flat plate, laminar or mixed form chosen by Re.

    Parameters
    ----------
    re : float or array
        Reynolds number u L / nu on the plate length [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k [-]

    Notes
    -----
    0.664 Re^0.5 Pr^(1/3) below Re = 5e5, (0.037 Re^0.8 - 871) Pr^(1/3) above (the two differ
    by 1.4 % at 5e5).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eqs. 7.30 and 7.38.
    """
    re = np.maximum(np.asarray(re, dtype=float), 0.0)
    pr3 = np.cbrt(np.asarray(pr, dtype=float))
    return np.where(re < FLAT_PLATE_TRANSITION_RE, 0.664 * np.sqrt(re) * pr3,
                    (0.037 * re ** 0.8 - 871.0) * pr3)


@correlation(re=(0.0, 1.0e7), derived={"re*pr": (lambda a: np.asarray(a["re"]) * np.asarray(a["pr"]), 0.2, np.inf)})
def nusselt_cylinder_crossflow_churchill_bernstein(re, pr):
    """Mean Nusselt number of a circular cylinder in crossflow, all Reynolds numbers.

    Parameters
    ----------
    re : float or array
        Reynolds number u D / nu on the diameter [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h D / k [-]

    Notes
    -----
    Nu = 0.3 + 0.62 Re^0.5 Pr^(1/3) / [1 + (0.4/Pr)^(2/3)]^(1/4) [1 + (Re/282000)^(5/8)]^(4/5),
    valid for Re Pr > 0.2 (Incropera eq. 7.54).

    Examples
    --------
    Example 7.3 of Incropera (6th ed.):

    >>> round(float(nusselt_cylinder_crossflow_churchill_bernstein(6071.0, 0.7)), 2)
    40.64

    References
    ----------
    .. [1] Churchill, S. W., Bernstein, M. "A correlating equation for forced convection from
       gases and liquids to a circular cylinder in crossflow." Journal of Heat Transfer 99
       (1977): 300-306.
    """
    re = np.asarray(re, dtype=float)
    pr = np.asarray(pr, dtype=float)
    return 0.3 + 0.62 * np.sqrt(re) * np.cbrt(pr) / (1.0 + (0.4 / pr) ** (2.0 / 3.0)) ** 0.25 \
        * (1.0 + (re / 282000.0) ** 0.625) ** 0.8


@correlation(nu_forced=(0.0, np.inf), nu_natural=(0.0, np.inf), exponent=(1.0, 4.0))
def nusselt_mixed_churchill(nu_forced, nu_natural, exponent=3.0):
    """Nusselt number of combined forced and natural convection, assisting or transverse flow.

    Parameters
    ----------
    nu_forced : float or array
        Nusselt number of forced convection alone [-]
    nu_natural : float or array
        Nusselt number of natural convection alone, same length scale [-]
    exponent : float
        Blending exponent n; 3 is usual, 3.5 or 4 for transverse flow over plates and cylinders [-]

    Returns
    -------
    float or array
        Combined Nusselt number [-]

    Notes
    -----
    Nu^n = Nu_F^n + Nu_N^n: Churchill's "combined free and forced convection" rule
    (Incropera section 9.9). Opposing flow (Nu^n = Nu_F^n - Nu_N^n) is not covered.

    References
    ----------
    .. [1] Churchill, S. W. "A comprehensive correlating equation for laminar, assisting, forced
       and free convection." AIChE Journal 23 (1977): 10-16.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 9.9.
    """
    n = float(exponent)
    return (np.asarray(nu_forced, dtype=float) ** n + np.asarray(nu_natural, dtype=float) ** n) ** (1.0 / n)
