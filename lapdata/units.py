"""Unit conversion constants: the one place that holds them for the whole project.

Everything inside brakeheat is SI (temperatures in kelvin). Other units appear only at the
edges (CSV headers, TOML keys, printed tables) and are converted with these constants.
"""

KELVIN_AT_0C = 273.15            # K at 0 degC
KMH = 1.0 / 3.6                  # m/s per km/h
MPH = 0.44704                    # m/s per mph (exact by definition of the international mile)
KM = 1000.0                      # m per km
MM = 1.0e-3                      # m per mm
MM2 = 1.0e-6                     # m^2 per mm^2
CM3 = 1.0e-6                     # m^3 per cm^3
LITRE = 1.0e-3                   # m^3 per litre
BAR = 1.0e5                      # Pa per bar
KPA = 1.0e3                      # Pa per kPa
PSI = 6894.757293168             # Pa per psi
STANDARD_GRAVITY = 9.80665       # m/s^2 per g (CGPM 1901)
MINUTE = 60.0                    # s per minute
HOUR = 3600.0                    # s per hour
STEFAN_BOLTZMANN = 5.670374419e-8  # W m^-2 K^-4 (CODATA 2018, exact)


def celsius_to_kelvin(temperature_c):
    """Degrees Celsius [degC] to kelvin [K]."""
    return temperature_c + KELVIN_AT_0C


def kelvin_to_celsius(temperature_k):
    """Kelvin [K] to degrees Celsius [degC]."""
    return temperature_k - KELVIN_AT_0C
