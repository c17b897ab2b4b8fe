"""Forced convection inside passages: tubes and ducts (Dittus-Boelter, Gnielinski, Sieder-Tate,
Baehr & Stephan), piston vent holes and the vane passages of a vented disc.

Each function returns a mean Nusselt number on the hydraulic diameter stated in its docstring;
the caller evaluates properties at the film temperature and forms h = Nu k / d_h. All accept
numpy arrays. The formulas are checked in tests against the `ht` package.
"""
from __future__ import annotations

import numpy as np

from thermo.correlations.validity import correlation

INTERNAL_LAMINAR_RE = 2300.0          # Gnielinski (2013), onset of transition in a tube
INTERNAL_TURBULENT_RE = 1.0e4         # Gnielinski (2013), fully turbulent from here
NU_LAMINAR_FULLY_DEVELOPED_T = 3.66   # circular tube, constant wall temperature (Incropera eq. 8.55)
NU_LAMINAR_FULLY_DEVELOPED_BAEHR = 3.657   # the same limit to the digits Baehr & Stephan give


@correlation(re=(INTERNAL_TURBULENT_RE, 5.0e6), pr=(0.6, 160.0))
def nusselt_internal_turbulent_dittus_boelter(re, pr, heating=True):
    """Nusselt number of fully developed turbulent flow in a smooth tube, Dittus-Boelter.

    Parameters
    ----------
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    heating : bool
        True when the wall heats the fluid (n = 0.4), False when it cools it (n = 0.3) [-]

    Returns
    -------
    float or array
        Nusselt number h d_h / k [-]

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
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]

    Returns
    -------
    float or array
        Darcy friction factor [-]

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
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    friction_factor : float or array or None
        Darcy friction factor; None uses Petukhov's smooth-tube value [-]

    Returns
    -------
    float or array
        Nusselt number h d_h / k [-]

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
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    d_h : float
        Hydraulic diameter of the passage [m]
    length : float
        Passage length [m]
    viscosity_ratio : float or array or None
        Bulk over wall viscosity mu_b / mu_w; None omits the term [-]

    Returns
    -------
    float or array
        Mean Nusselt number h d_h / k [-]

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
    re : float or array
        Reynolds number u d_h / nu on the passage hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    d_h : float
        Hydraulic diameter of the vane passage [m]
    length : float
        Radial length of the vane passage [m]

    Returns
    -------
    float or array
        Mean Nusselt number h d_h / k [-]

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
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    d_h : float
        Hydraulic diameter of the passage [m]
    length : float
        Passage length [m]

    Returns
    -------
    float or array
        Mean Nusselt number h d_h / k over the length [-]

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
    re : float or array
        Reynolds number u d_h / nu on the hydraulic diameter [-]
    pr : float or array
        Prandtl number at the bulk temperature [-]
    d_h : float
        Hydraulic diameter of the passage [m]
    length : float
        Passage length [m]

    Returns
    -------
    float or array
        Mean Nusselt number h d_h / k over the length [-]

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
    re_relative : float or array
        Reynolds number w d_h / nu on the air speed relative to the rotating passage at its inlet, w = (u^2 + (omega r_i)^2)^(1/2) [-]
    re_through : float or array
        Reynolds number u d_h / nu on the radial through-flow speed u [-]
    pr : float or array
        Prandtl number at the film temperature [-]
    d_h : float
        Hydraulic diameter of one passage [m]
    length : float
        Radial length of the passage [m]

    Returns
    -------
    float or array
        Mean Nusselt number h d_h / k on the passage walls [-]

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
