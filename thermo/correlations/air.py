"""Dry-air properties at pressure p and temperature T: fast, vectorised numpy, no CoolProp at run time.

Density from the ideal-gas law, viscosity from Sutherland's law, conductivity and specific heat
interpolated in T in a table at 1 atm (pressure has little effect on either at the pressures of
a wheel well). Valid 200-1200 K. Also the ISA troposphere for running at altitude.
"""
from __future__ import annotations

import numpy as np

from thermo.correlations.validity import correlation

GAS_CONSTANT_AIR = 287.05          # J/(kg K), specific gas constant of dry air (ISA value)
SEA_LEVEL_PRESSURE_PA = 101325.0   # Pa, ISA sea level
SEA_LEVEL_TEMPERATURE_K = 288.15   # K, ISA sea level
ISA_LAPSE_RATE_K_M = 0.0065        # K/m, ISA troposphere

SUTHERLAND_C1 = 1.458e-6           # kg/(m s K^0.5)  # from memory (constants of the usual form)
SUTHERLAND_S = 110.4               # K               # from memory

T_RANGE_K = (200.0, 1200.0)
P_RANGE_PA = (1.0e3, 2.0e6)

# Incropera et al., Fundamentals of Heat and Mass Transfer, Table A.4 (air at 1 atm).
# Rows 300, 400 and 600 K are the published values quoted in PHYSICS.md; the other rows are
# from memory (checked in tests against CoolProp, within about 2 %).
_TABLE_T_K = np.array([200., 250., 300., 350., 400., 450., 500., 550., 600., 650., 700., 750., 800.,
                       850., 900., 950., 1000., 1100., 1200.])
_TABLE_CP_J_KGK = np.array([1007., 1006., 1007., 1009., 1014., 1021., 1030., 1040., 1051., 1063.,
                            1075., 1087., 1099., 1110., 1121., 1131., 1141., 1159., 1175.])
_TABLE_K_W_MK = 1.0e-3 * np.array([18.1, 22.3, 26.3, 30.0, 33.8, 37.3, 40.7, 43.9, 46.9, 49.7, 52.4,
                                   54.9, 57.3, 59.6, 62.0, 64.3, 66.7, 71.5, 76.3])


@correlation(pressure_pa=P_RANGE_PA, temperature_k=T_RANGE_K)
def air_density(pressure_pa, temperature_k):
    """Density of dry air from the ideal-gas law.

    Parameters
    ----------
    pressure_pa : float or array
        Absolute pressure [Pa]
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Density [kg/m^3]

    Notes
    -----
    rho = p / (R T), R = 287.05 J/(kg K). Valid 200-1200 K, 1 kPa-2 MPa (compressibility of air
    differs from 1 by well under 1 % there).

    References
    ----------
    .. [1] ISO 2533:1975, Standard Atmosphere (R = 287.05287 J/(kg K)); ideal-gas law.
    """
    return np.asarray(pressure_pa, dtype=float) / (GAS_CONSTANT_AIR * np.asarray(temperature_k, dtype=float))


@correlation(temperature_k=T_RANGE_K)
def air_viscosity_sutherland(temperature_k):
    """Dynamic viscosity of dry air, Sutherland's law.

    Parameters
    ----------
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Dynamic viscosity [Pa s]

    Notes
    -----
    mu = C1 T^1.5 / (T + S), C1 = 1.458e-6 kg/(m s K^0.5), S = 110.4 K (constants from memory).
    Valid 200-1200 K; within 2 % of Incropera Table A.4 to 900 K, about 5 % low at 1200 K.

    References
    ----------
    .. [1] Sutherland, W. "The viscosity of gases and molecular force." Philosophical Magazine
       36 (1893): 507-531.
    """
    t = np.asarray(temperature_k, dtype=float)
    return SUTHERLAND_C1 * t ** 1.5 / (t + SUTHERLAND_S)


@correlation(temperature_k=T_RANGE_K)
def air_conductivity(temperature_k):
    """Thermal conductivity of dry air, interpolated in a table at 1 atm.

    Parameters
    ----------
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Thermal conductivity [W/(m K)]

    Notes
    -----
    Linear interpolation in Incropera Table A.4, 200-1200 K (rows other than 300, 400 and 600 K
    from memory). Pressure dependence neglected.

    References
    ----------
    .. [1] Incropera, F. P., DeWitt, D. P., Bergman, T. L., Lavine, A. S. Fundamentals of Heat
       and Mass Transfer, 6th ed., Wiley, 2007, Table A.4.
    """
    return np.interp(np.asarray(temperature_k, dtype=float), _TABLE_T_K, _TABLE_K_W_MK)


@correlation(temperature_k=T_RANGE_K)
def air_specific_heat(temperature_k):
    """Specific heat at constant pressure of dry air, interpolated in a table at 1 atm.

    Parameters
    ----------
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Specific heat c_p [J/(kg K)]

    Notes
    -----
    Linear interpolation in Incropera Table A.4, 200-1200 K (rows other than 300, 400 and 600 K
    from memory). Pressure dependence neglected.

    References
    ----------
    .. [1] Incropera, F. P., DeWitt, D. P., Bergman, T. L., Lavine, A. S. Fundamentals of Heat
       and Mass Transfer, 6th ed., Wiley, 2007, Table A.4.
    """
    return np.interp(np.asarray(temperature_k, dtype=float), _TABLE_T_K, _TABLE_CP_J_KGK)


@correlation(temperature_k=T_RANGE_K)
def air_prandtl(temperature_k):
    """Prandtl number of dry air, mu c_p / k from the functions of this module.

    Parameters
    ----------
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Prandtl number [-]

    Notes
    -----
    Pr = mu c_p / k with Sutherland viscosity and tabulated c_p, k. Valid 200-1200 K.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, Table A.4 (c_p, k); Sutherland, Phil. Mag. 36 (1893) (mu).
    """
    t = np.asarray(temperature_k, dtype=float)
    return (SUTHERLAND_C1 * t ** 1.5 / (t + SUTHERLAND_S)) * np.interp(t, _TABLE_T_K, _TABLE_CP_J_KGK) \
        / np.interp(t, _TABLE_T_K, _TABLE_K_W_MK)


@correlation(pressure_pa=P_RANGE_PA, temperature_k=T_RANGE_K)
def air_kinematic_viscosity(pressure_pa, temperature_k):
    """Kinematic viscosity of dry air, mu / rho.

    Parameters
    ----------
    pressure_pa : float or array
        Absolute pressure [Pa]
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Kinematic viscosity [m^2/s]

    Notes
    -----
    nu = mu(T) R T / p (Sutherland viscosity, ideal-gas density). Valid 200-1200 K.

    References
    ----------
    .. [1] Sutherland, W. Philosophical Magazine 36 (1893): 507-531; ideal-gas law.
    """
    t = np.asarray(temperature_k, dtype=float)
    mu = SUTHERLAND_C1 * t ** 1.5 / (t + SUTHERLAND_S)
    return mu * GAS_CONSTANT_AIR * t / np.asarray(pressure_pa, dtype=float)


@correlation(pressure_pa=P_RANGE_PA, temperature_k=T_RANGE_K)
def air_thermal_diffusivity(pressure_pa, temperature_k):
    """Thermal diffusivity of dry air, k / (rho c_p).

    Parameters
    ----------
    pressure_pa : float or array
        Absolute pressure [Pa]
    temperature_k : float or array
        Temperature [K]

    Returns
    -------
    float or array
        Thermal diffusivity [m^2/s]

    Notes
    -----
    alpha = k R T / (p c_p) with tabulated k, c_p and ideal-gas density. Valid 200-1200 K.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, Table A.4.
    """
    t = np.asarray(temperature_k, dtype=float)
    rho = np.asarray(pressure_pa, dtype=float) / (GAS_CONSTANT_AIR * t)
    return np.interp(t, _TABLE_T_K, _TABLE_K_W_MK) / (rho * np.interp(t, _TABLE_T_K, _TABLE_CP_J_KGK))


@correlation(temperature_k=T_RANGE_K)
def air_thermal_expansion(temperature_k):
    """Volumetric thermal expansion coefficient of an ideal gas, 1/T.

    Parameters
    ----------
    temperature_k : float or array
        Temperature (film temperature for free convection) [K]

    Returns
    -------
    float or array
        Expansion coefficient beta [1/K]

    Notes
    -----
    beta = -(1/rho)(d rho/d T)_p = 1/T for an ideal gas. Valid 200-1200 K.

    References
    ----------
    .. [1] Incropera, F. P., et al. Fundamentals of Heat and Mass Transfer, 6th ed., Wiley,
       2007, eq. 9.10.
    """
    return 1.0 / np.asarray(temperature_k, dtype=float)


@correlation(altitude_m=(-500.0, 11000.0))
def pressure_at_altitude(altitude_m):
    """Static pressure of the ISA troposphere at a geopotential altitude.

    Parameters
    ----------
    altitude_m : float or array
        Geopotential altitude above mean sea level [m]

    Returns
    -------
    float or array
        Pressure [Pa]

    Notes
    -----
    p = 101325 (1 - 2.25577e-5 h)^5.25588 (h in m), the ISA troposphere with lapse 6.5 K/km.
    Valid -500 to 11000 m.

    References
    ----------
    .. [1] ISO 2533:1975, Standard Atmosphere; identical to the U.S. Standard Atmosphere 1976
       below 11 km.
    """
    h = np.asarray(altitude_m, dtype=float)
    return SEA_LEVEL_PRESSURE_PA * (1.0 - 2.25577e-5 * h) ** 5.25588


@correlation(altitude_m=(-500.0, 11000.0), temperature_k=T_RANGE_K)
def air_density_at_altitude(altitude_m, temperature_k=None):
    """Density of dry air at ISA pressure for an altitude, at ISA or a given temperature.

    Parameters
    ----------
    altitude_m : float or array
        Geopotential altitude above mean sea level [m]
    temperature_k : float or array or None
        Air temperature; None takes the ISA value 288.15 - 0.0065 h [K]

    Returns
    -------
    float or array
        Density [kg/m^3]

    Notes
    -----
    rho = p_ISA(h) / (R T). With the ISA temperature this is the ISA density (1.1117 kg/m^3 at
    1000 m). Valid -500 to 11000 m.

    References
    ----------
    .. [1] ISO 2533:1975, Standard Atmosphere; U.S. Standard Atmosphere 1976.
    """
    h = np.asarray(altitude_m, dtype=float)
    t = SEA_LEVEL_TEMPERATURE_K - ISA_LAPSE_RATE_K_M * h if temperature_k is None \
        else np.asarray(temperature_k, dtype=float)
    return SEA_LEVEL_PRESSURE_PA * (1.0 - 2.25577e-5 * h) ** 5.25588 / (GAS_CONSTANT_AIR * t)
