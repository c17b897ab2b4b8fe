"""Natural-convection Nusselt numbers: vertical plate, horizontal cylinder, horizontal plates.

Properties at the film temperature; beta = 1/T_film for air. Equation numbers of Incropera
(6th ed.) are from memory; the formulas are checked in tests against the `ht` package.
"""
from __future__ import annotations

import numpy as np

from lapdata.units import STANDARD_GRAVITY
from thermo.correlations.validity import correlation


@correlation(length_m=(0.0, np.inf), kinematic_viscosity_m2_s=(0.0, np.inf),
             thermal_diffusivity_m2_s=(0.0, np.inf))
def rayleigh_number(expansion_1_k, delta_t_k, length_m, kinematic_viscosity_m2_s,
                    thermal_diffusivity_m2_s, gravity_m_s2=STANDARD_GRAVITY):
    """Rayleigh number g beta |dT| L^3 / (nu alpha).

    Parameters
    ----------
    expansion_1_k : float or array
        Volumetric expansion coefficient beta (1/T_film for a gas) [1/K]
    delta_t_k : float or array
        Surface minus fluid temperature; its magnitude is used [K]
    length_m : float or array
        Characteristic length (height, diameter or area/perimeter) [m]
    kinematic_viscosity_m2_s : float or array
        Kinematic viscosity of the fluid [m^2/s]
    thermal_diffusivity_m2_s : float or array
        Thermal diffusivity of the fluid [m^2/s]
    gravity_m_s2 : float
        Gravitational acceleration [m/s^2]

    Returns
    -------
    float or array
        Rayleigh number [-]

    Notes
    -----
    Ra = Gr Pr = g beta |T_s - T_inf| L^3 / (nu alpha) (Incropera eq. 9.25).

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, section 9.4.
    """
    return gravity_m_s2 * np.asarray(expansion_1_k, dtype=float) * np.abs(np.asarray(delta_t_k, dtype=float)) \
        * np.asarray(length_m, dtype=float) ** 3 / (np.asarray(kinematic_viscosity_m2_s, dtype=float)
                                                    * np.asarray(thermal_diffusivity_m2_s, dtype=float))


@correlation(ra=(0.1, 1.0e12), pr=(0.001, np.inf))
def nusselt_vertical_plate_churchill_chu(ra, pr):
    """Mean Nusselt number of an isothermal vertical plate in free convection, full range.

    Parameters
    ----------
    ra : float or array
        Rayleigh number on the plate height [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k on the height [-]

    Notes
    -----
    Nu = {0.825 + 0.387 Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}^2 (Incropera eq. 9.26),
    laminar and turbulent, 0.1 < Ra < 1e12.

    References
    ----------
    .. [1] Churchill, S. W., Chu, H. H. S. "Correlating equations for laminar and turbulent free
       convection from a vertical plate." International Journal of Heat and Mass Transfer 18
       (1975): 1323-1329.
    """
    ra = np.asarray(ra, dtype=float)
    pr = np.asarray(pr, dtype=float)
    return (0.825 + 0.387 * ra ** (1.0 / 6.0) / (1.0 + (0.492 / pr) ** (9.0 / 16.0)) ** (8.0 / 27.0)) ** 2


@correlation(ra=(1.0e-5, 1.0e12), pr=(0.001, np.inf))
def nusselt_horizontal_cylinder_churchill_chu(ra, pr):
    """Mean Nusselt number of an isothermal horizontal cylinder in free convection.

    Parameters
    ----------
    ra : float or array
        Rayleigh number on the diameter [-]
    pr : float or array
        Prandtl number at the film temperature [-]

    Returns
    -------
    float or array
        Mean Nusselt number h D / k [-]

    Notes
    -----
    Nu = {0.60 + 0.387 Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}^2 (Incropera eq. 9.34),
    1e-5 < Ra < 1e12.

    References
    ----------
    .. [1] Churchill, S. W., Chu, H. H. S. "Correlating equations for laminar and turbulent free
       convection from a horizontal cylinder." International Journal of Heat and Mass Transfer
       18 (1975): 1049-1053.
    """
    ra = np.asarray(ra, dtype=float)
    pr = np.asarray(pr, dtype=float)
    return (0.60 + 0.387 * ra ** (1.0 / 6.0) / (1.0 + (0.559 / pr) ** (9.0 / 16.0)) ** (8.0 / 27.0)) ** 2


@correlation(ra=(1.0e4, 1.0e11))
def nusselt_horizontal_plate_upper_hot_mcadams(ra):
    """Mean Nusselt number of the upper face of a hot (or lower face of a cold) horizontal plate.

    Parameters
    ----------
    ra : float or array
        Rayleigh number on L = area / perimeter [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k, L = area / perimeter [-]

    Notes
    -----
    Nu = 0.54 Ra^(1/4) for 1e4 <= Ra <= 1e7, Nu = 0.15 Ra^(1/3) for 1e7 <= Ra <= 1e11,
    Pr >= 0.7 (Incropera eqs. 9.30-9.31).

    References
    ----------
    .. [1] McAdams, W. H. Heat Transmission, 3rd ed., McGraw-Hill, 1954.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eqs. 9.30-9.31.
    """
    ra = np.asarray(ra, dtype=float)
    return np.where(ra <= 1.0e7, 0.54 * ra ** 0.25, 0.15 * np.cbrt(ra))


@correlation(ra=(1.0e5, 1.0e10))
def nusselt_horizontal_plate_lower_hot_mcadams(ra):
    """Mean Nusselt number of the lower face of a hot (or upper face of a cold) horizontal plate.

    Parameters
    ----------
    ra : float or array
        Rayleigh number on L = area / perimeter [-]

    Returns
    -------
    float or array
        Mean Nusselt number h L / k, L = area / perimeter [-]

    Notes
    -----
    Nu = 0.27 Ra^(1/4) for 1e5 <= Ra <= 1e10 (McAdams; Incropera 6th ed. eq. 9.32). Later
    editions give 0.52 Ra^(1/5) for 1e4 < Ra < 1e9 (from memory), 8 % higher at Ra = 1e5 and
    30 % lower at 1e9: an uncertainty to carry.

    References
    ----------
    .. [1] McAdams, W. H. Heat Transmission, 3rd ed., McGraw-Hill, 1954.
    .. [2] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 9.32.
    """
    return 0.27 * np.asarray(ra, dtype=float) ** 0.25
