"""Forced-convection Nusselt numbers: rotating disc, flat plate, cylinder in crossflow, internal flow.

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
INTERNAL_LAMINAR_RE = 2300.0          # Gnielinski (2013), onset of transition in a tube
INTERNAL_TURBULENT_RE = 1.0e4         # Gnielinski (2013), fully turbulent from here
NU_LAMINAR_FULLY_DEVELOPED_T = 3.66   # circular tube, constant wall temperature (Incropera eq. 8.55)
NU_LAMINAR_FULLY_DEVELOPED_BAEHR = 3.657   # the same limit to the digits Baehr & Stephan give


@correlation(re_w=(0.0, ROTATING_DISC_TRANSITION_RE))
def nusselt_rotating_disc_laminar_cobb_saunders(re_w):
    """Mean Nusselt number of a disc rotating in still air, laminar boundary layer.

    Parameters
    ----------
    re_w : float or array  Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array  Mean Nusselt number h b / k on the outer radius [-]

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
    re_w : float or array  Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array  Mean Nusselt number h b / k on the outer radius [-]

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
    re_w : float or array  Rotational Reynolds number omega b^2 / nu, b the outer radius [-]

    Returns
    -------
    float or array  Mean Nusselt number h b / k on the outer radius [-]

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
    re : float or array  Reynolds number v D / nu on the outer diameter D and air speed v [-]

    Returns
    -------
    float or array  Mean Nusselt number h D / k on the outer diameter [-]

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
    re : float or array  Reynolds number u L / nu on the plate length [-]
    pr : float or array  Prandtl number at the film temperature [-]

    Returns
    -------
    float or array  Mean Nusselt number h L / k [-]

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
    re : float or array  Reynolds number u L / nu on the plate length [-]
    pr : float or array  Prandtl number at the film temperature [-]

    Returns
    -------
    float or array  Mean Nusselt number h L / k [-]

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
    re : float or array  Reynolds number u L / nu on the plate length [-]
    pr : float or array  Prandtl number at the film temperature [-]

    Returns
    -------
    float or array  Mean Nusselt number h L / k [-]

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
    re : float or array  Reynolds number u D / nu on the diameter [-]
    pr : float or array  Prandtl number at the film temperature [-]

    Returns
    -------
    float or array  Mean Nusselt number h D / k [-]

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


@correlation(re=(INTERNAL_TURBULENT_RE, 5.0e6), pr=(0.6, 160.0))
def nusselt_internal_turbulent_dittus_boelter(re, pr, heating=True):
    """Nusselt number of fully developed turbulent flow in a smooth tube, Dittus-Boelter.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    heating : bool  True when the wall heats the fluid (n = 0.4), False when it cools it (n = 0.3) [-]

    Returns
    -------
    float or array  Nusselt number h d_h / k [-]

    Notes
    -----
    Nu = 0.023 Re^0.8 Pr^n (Incropera eq. 8.60), Re >= 1e4, 0.6 <= Pr <= 160, L/D >= 10.

    References
    ----------
    .. [1] Dittus, F. W., Boelter, L. M. K. University of California Publications in Engineering
       2 (1930): 443-461; reprinted in Int. Commun. Heat Mass Transfer 12 (1985): 3-22.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 8.60.
    """
    n = 0.4 if heating else 0.3
    return 0.023 * np.asarray(re, dtype=float) ** 0.8 * np.asarray(pr, dtype=float) ** n


@correlation(re=(3000.0, 5.0e6))
def friction_factor_smooth_petukhov(re):
    """Darcy friction factor of turbulent flow in a smooth tube, Petukhov.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]

    Returns
    -------
    float or array  Darcy friction factor [-]

    Notes
    -----
    f = (0.790 ln Re - 1.64)^-2 (Incropera eq. 8.21), 3000 <= Re <= 5e6.

    References
    ----------
    .. [1] Petukhov, B. S. "Heat transfer and friction in turbulent pipe flow with variable
       physical properties." Advances in Heat Transfer 6 (1970): 503-564.
    """
    return (0.790 * np.log(np.asarray(re, dtype=float)) - 1.64) ** -2


def _gnielinski(re, pr, f):
    return (f / 8.0) * (re - 1000.0) * pr / (1.0 + 12.7 * np.sqrt(f / 8.0) * (pr ** (2.0 / 3.0) - 1.0))


@correlation(re=(3000.0, 5.0e6), pr=(0.5, 2000.0), friction_factor=(0.005, 0.1))
def nusselt_internal_turbulent_gnielinski(re, pr, friction_factor=None):
    """Nusselt number of fully developed turbulent tube flow, Gnielinski.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    friction_factor : float or array or None  Darcy friction factor; None uses Petukhov's smooth-tube value [-]

    Returns
    -------
    float or array  Nusselt number h d_h / k [-]

    Notes
    -----
    Nu = (f/8)(Re - 1000) Pr / [1 + 12.7 (f/8)^0.5 (Pr^(2/3) - 1)] (Incropera eq. 8.62),
    3000 <= Re <= 5e6, 0.5 <= Pr <= 2000.

    References
    ----------
    .. [1] Gnielinski, V. "New equations for heat and mass transfer in turbulent pipe and
       channel flow." International Chemical Engineering 16 (1976): 359-368.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eqs. 8.21 and 8.62.
    """
    re = np.asarray(re, dtype=float)
    f = (0.790 * np.log(re) - 1.64) ** -2 if friction_factor is None else np.asarray(friction_factor, dtype=float)
    return _gnielinski(re, np.asarray(pr, dtype=float), f)


def _sieder_tate(re, pr, d_h, length, viscosity_ratio):
    nu = 1.86 * np.cbrt(re * pr * d_h / length)
    return nu if viscosity_ratio is None else nu * np.asarray(viscosity_ratio, dtype=float) ** 0.14


@correlation(re=(0.0, INTERNAL_LAMINAR_RE), pr=(0.48, 16700.0), viscosity_ratio=(0.0044, 9.75))
def nusselt_internal_laminar_entry_sieder_tate(re, pr, d_h, length, viscosity_ratio=None):
    """Mean Nusselt number of laminar flow in a tube, combined entry region, Sieder-Tate.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    d_h : float  Hydraulic diameter of the passage [m]
    length : float  Passage length [m]
    viscosity_ratio : float or array or None  Bulk over wall viscosity mu_b / mu_w; None omits the term [-]

    Returns
    -------
    float or array  Mean Nusselt number h d_h / k [-]

    Notes
    -----
    Nu = 1.86 (Re Pr d_h / L)^(1/3) (mu_b / mu_w)^0.14 (Incropera eq. 8.57), Re < 2300,
    0.48 < Pr < 16700, 0.0044 < mu_b/mu_w < 9.75. Where the bracket falls below about 2 the
    fully developed 3.66 is the better value (Incropera).

    References
    ----------
    .. [1] Sieder, E. N., Tate, G. E. "Heat transfer and pressure drop of liquids in tubes."
       Industrial and Engineering Chemistry 28 (1936): 1429-1435.
    """
    return _sieder_tate(np.asarray(re, dtype=float), np.asarray(pr, dtype=float), d_h, length,
                        viscosity_ratio)


@correlation(re=(0.0, 5.0e6), pr=(0.5, 2000.0))
def nusselt_internal_vented_vane(re, pr, d_h, length):
    """Mean Nusselt number in a vented-disc vane passage: laminar, transition or turbulent by Re.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the passage hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    d_h : float  Hydraulic diameter of the vane passage [m]
    length : float  Radial length of the vane passage [m]

    Returns
    -------
    float or array  Mean Nusselt number h d_h / k [-]

    Notes
    -----
    - Re <= 2300: max(Sieder-Tate 1.86 (Re Pr d_h/L)^(1/3), 3.66), entry region floored at the
      fully developed constant-wall-temperature value.
    - Re >= 1e4: Gnielinski with Petukhov's smooth-tube friction factor.
    - Between: Gnielinski's (2013) interpolation Nu = (1 - g) Nu_lam(2300) + g Nu_turb(1e4),
      g = (Re - 2300) / (1e4 - 2300).
    The vane passage is treated as a straight tube of diameter d_h: rotation and inlet effects
    are not modelled (a calibration multiplier belongs to the caller).

    References
    ----------
    .. [1] Gnielinski, V. "On heat transfer in tubes." International Journal of Heat and Mass
       Transfer 63 (2013): 134-140.
    .. [2] Sieder, E. N., Tate, G. E. Industrial and Engineering Chemistry 28 (1936): 1429-1435.
    .. [3] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eqs. 8.55, 8.57, 8.62.
    """
    re = np.maximum(np.asarray(re, dtype=float), 0.0)
    pr = np.asarray(pr, dtype=float)

    def laminar(r):
        return np.maximum(_sieder_tate(r, pr, d_h, length, None), NU_LAMINAR_FULLY_DEVELOPED_T)

    def turbulent(r):
        return _gnielinski(r, pr, (0.790 * np.log(r) - 1.64) ** -2)

    nu_lam_edge = laminar(INTERNAL_LAMINAR_RE)
    nu_turb_edge = turbulent(INTERNAL_TURBULENT_RE)
    share = (re - INTERNAL_LAMINAR_RE) / (INTERNAL_TURBULENT_RE - INTERNAL_LAMINAR_RE)
    with np.errstate(divide="ignore", invalid="ignore"):
        turb = turbulent(np.maximum(re, INTERNAL_TURBULENT_RE))
    return np.where(re <= INTERNAL_LAMINAR_RE, laminar(re),
                    np.where(re >= INTERNAL_TURBULENT_RE, turb,
                             (1.0 - share) * nu_lam_edge + share * nu_turb_edge))


def _baehr_stephan(re, pr, d_h, length):
    graetz = np.maximum(re * pr * d_h / length, 1.0e-12)
    return ((NU_LAMINAR_FULLY_DEVELOPED_BAEHR / np.tanh(2.264 * graetz ** (-1.0 / 3.0) + 1.7 * graetz ** (-2.0 / 3.0))
             + 0.0499 * graetz * np.tanh(1.0 / graetz))
            / np.tanh(2.432 * pr ** (1.0 / 6.0) * graetz ** (-1.0 / 6.0)))


def _gnielinski_developing(re, pr, d_h, length):
    re = np.maximum(re, 1001.0)                  # (Re - 1000) > 0; the caller floors the result
    f = (0.790 * np.log(re) - 1.64) ** -2
    return _gnielinski(re, pr, f) * (1.0 + (d_h / length) ** (2.0 / 3.0))


@correlation(re=(0.0, INTERNAL_LAMINAR_RE), pr=(0.1, 1000.0))
def nusselt_internal_laminar_developing_baehr_stephan(re, pr, d_h, length):
    """Mean Nusselt number of laminar tube flow, velocity and temperature developing together.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    d_h : float  Hydraulic diameter of the passage [m]
    length : float  Passage length [m]

    Returns
    -------
    float or array  Mean Nusselt number h d_h / k over the length [-]

    Notes
    -----
    With Gz = Re Pr d_h / L:
    Nu = [3.657 / tanh(2.264 Gz^(-1/3) + 1.7 Gz^(-2/3)) + 0.0499 Gz tanh(1/Gz)]
    / tanh(2.432 Pr^(1/6) Gz^(-1/6)), constant wall temperature, Re < 2300. Tends to the fully
    developed 3.657 in a long tube; in a short passage the developing velocity profile gives the
    (Re Pr d_h / L)^(1/2) growth of a flat-plate boundary layer. The Pr range is from memory.

    Examples
    --------
    A long tube reaches the fully developed value 3.657:

    >>> round(float(nusselt_internal_laminar_developing_baehr_stephan(10.0, 0.7, 0.01, 100.0)), 2)
    3.66

    References
    ----------
    .. [1] Baehr, H. D., Stephan, K. Heat and Mass Transfer, 3rd ed., Springer, 2011, section 3.7
       (section number from memory).
    """
    re = np.maximum(np.asarray(re, dtype=float), 0.0)
    return _baehr_stephan(re, np.asarray(pr, dtype=float), d_h, length)


@correlation(re=(INTERNAL_LAMINAR_RE, 1.0e6), pr=(0.6, 1.0e5))
def nusselt_internal_developing_gnielinski(re, pr, d_h, length):
    """Mean Nusselt number of turbulent flow in a short tube (entry region included), Gnielinski.

    Parameters
    ----------
    re : float or array  Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array  Prandtl number at the bulk temperature [-]
    d_h : float  Hydraulic diameter of the passage [m]
    length : float  Passage length [m]

    Returns
    -------
    float or array  Mean Nusselt number h d_h / k over the length [-]

    Notes
    -----
    Nu = (f/8)(Re - 1000) Pr / [1 + 12.7 (f/8)^(1/2) (Pr^(2/3) - 1)] x [1 + (d_h/L)^(2/3)],
    f = (0.790 ln Re - 1.64)^-2 (Petukhov, Incropera eq. 8.21; Filonenko's (1.82 log10 Re - 1.64)^-2
    differs by under 0.2 %). The bracket
    [1 + (d_h/L)^(2/3)] is Gnielinski's mean entry-length enhancement of a tube with a sharp
    inlet; 2300 < Re < 1e6, 0.6 < Pr < 1e5 (range as stated by Gnielinski, from memory).

    Examples
    --------
    Long tube (d_h/L -> 0) at Re 1e5, Pr 0.7: the fully developed Gnielinski value (the same as
    ``ht.conv_internal.turbulent_Gnielinski`` with this friction factor).

    >>> round(float(nusselt_internal_developing_gnielinski(1.0e5, 0.7, 0.01, 1.0e6)), 1)
    178.6

    References
    ----------
    .. [1] Gnielinski, V. "New equations for heat and mass transfer in turbulent pipe and
       channel flow." International Chemical Engineering 16 (1976): 359-368.
    .. [2] Gnielinski, V. "On heat transfer in tubes." International Journal of Heat and Mass
       Transfer 63 (2013): 134-140.
    """
    return _gnielinski_developing(np.asarray(re, dtype=float), np.asarray(pr, dtype=float), d_h, length)


@correlation(re_relative=(0.0, 1.0e6), re_through=(0.0, 1.0e6), pr=(0.6, 2.0))
def nusselt_vented_disc_passage(re_relative, re_through, pr, d_h, length):
    """Mean Nusselt number in the vane passages of a rotating vented disc (documented combination).

    Parameters
    ----------
    re_relative : float or array  Reynolds number w d_h / nu on the air speed relative to the rotating passage at its inlet, w = (u^2 + (omega r_i)^2)^(1/2) [-]
    re_through : float or array  Reynolds number u d_h / nu on the radial through-flow speed u [-]
    pr : float or array  Prandtl number at the film temperature [-]
    d_h : float  Hydraulic diameter of one passage [m]
    length : float  Radial length of the passage [m]

    Returns
    -------
    float or array  Mean Nusselt number h d_h / k on the passage walls [-]

    Notes
    -----
    Nu = max(Gnielinski developing flow at Re_relative, Baehr-Stephan laminar developing flow
    at Re_through). Air enters a vane passage with almost no swirl, so the walls of the rotating
    passage meet it at the relative speed w, mostly the inlet speed omega r_i: the entry
    separates and recirculates on the suction side of the vanes (PIV of McPhee & Johnson [3]),
    and the passage, a few hydraulic diameters long, is all entry region. Gnielinski's equation
    with its entry factor, on w, gives an h nearly proportional to omega over 1500 < Re_relative
    < 7000, as measured by McPhee & Johnson (h = 27.0, 52.7, 78.3 W/(m^2 K) at 342, 684,
    1025 rpm); the laminar term on the through-flow is the floor at low speed. This combination
    is brakeheat's own, tested against [3] in tests/corner/test_corner_paths.py; the two
    correlations it combines are published [1, 2].

    Examples
    --------
    >>> round(float(nusselt_vented_disc_passage(4000.0, 1200.0, 0.7, 0.011, 0.055)), 1)
    18.1

    References
    ----------
    .. [1] Gnielinski, V. "New equations for heat and mass transfer in turbulent pipe and
       channel flow." International Chemical Engineering 16 (1976): 359-368.
    .. [2] Baehr, H. D., Stephan, K. Heat and Mass Transfer, 3rd ed., Springer, 2011.
    .. [3] McPhee, A. D., Johnson, D. A. "Experimental heat transfer and flow analysis of a
       vented brake rotor." International Journal of Thermal Sciences 47 (2008): 458-467.
    """
    pr = np.asarray(pr, dtype=float)
    re_rel = np.maximum(np.asarray(re_relative, dtype=float), 0.0)
    turbulent = np.where(re_rel > 1001.0, _gnielinski_developing(re_rel, pr, d_h, length), 0.0)
    laminar = _baehr_stephan(np.maximum(np.asarray(re_through, dtype=float), 0.0), pr, d_h, length)
    return np.maximum(turbulent, laminar)


@correlation(nu_forced=(0.0, np.inf), nu_natural=(0.0, np.inf), exponent=(1.0, 4.0))
def nusselt_mixed_churchill(nu_forced, nu_natural, exponent=3.0):
    """Nusselt number of combined forced and natural convection, assisting or transverse flow.

    Parameters
    ----------
    nu_forced : float or array  Nusselt number of forced convection alone [-]
    nu_natural : float or array  Nusselt number of natural convection alone, same length scale [-]
    exponent : float  Blending exponent n; 3 is usual, 3.5 or 4 for transverse flow over plates and cylinders [-]

    Returns
    -------
    float or array  Combined Nusselt number [-]

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
