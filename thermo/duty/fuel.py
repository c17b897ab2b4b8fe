"""Fuel burn over a stint: the car gets lighter lap by lap, and so does each lap's braking."""
from __future__ import annotations

import numpy as np

from lapdata.echo import shown
from thermo.duty.power import DEFAULT_SMOOTHING_WINDOW_S, brake_energy_per_interval
from thermo.duty.vehicle import VehicleParameters, check_number
from thermo.errors import ScenarioError

_ROUNDING_KG = 1e-9  # fuel left within this of zero counts as exactly empty


def fuel_mass_by_lap(fuel_start_kg: float, consumption_kg_per_lap: float, n_laps: int) -> np.ndarray:
    """Fuel on board at the start of each lap of a stint.

    Parameters
    ----------
    fuel_start_kg : float
        Fuel at the start of lap 1 [kg]
    consumption_kg_per_lap : float
        Fuel burnt per lap [kg]
    n_laps : int
        Laps in the stint

    Returns
    -------
    ndarray
        Fuel at the start of laps 1..n_laps [kg]

    Raises
    ------
    ScenarioError
        If the fuel runs out before the end of the stint, naming the lap.
    """
    check_number("fuel_mass_by_lap", "fuel_start_kg", fuel_start_kg, minimum=0.0)
    check_number("fuel_mass_by_lap", "consumption_kg_per_lap", consumption_kg_per_lap, minimum=0.0)
    if isinstance(n_laps, bool) or not isinstance(n_laps, (int, np.integer)) or n_laps < 1:
        raise ScenarioError(f"fuel_mass_by_lap.n_laps must be a whole number >= 1, got {shown(n_laps)}")
    at_end = fuel_start_kg - consumption_kg_per_lap * np.arange(1, n_laps + 1)
    short = at_end < -_ROUNDING_KG
    if np.any(short):
        lap = int(np.argmax(short)) + 1
        raise ScenarioError(
            f"fuel runs out on lap {lap} of {n_laps}: {fuel_start_kg} kg at the start, "
            f"{consumption_kg_per_lap} kg per lap")
    return fuel_start_kg - consumption_kg_per_lap * np.arange(n_laps)


def braking_energy_by_lap(time_s, speed_mps, vehicle: VehicleParameters, fuel_kg_by_lap, *,
                          grade_rad=None, smoothing_window_s=DEFAULT_SMOOTHING_WINDOW_S) -> np.ndarray:
    """Whole-car braking energy of one lap's trace driven at each fuel load (energy method).

    Parameters
    ----------
    time_s : ndarray
        Sample times of one lap [s]
    speed_mps : ndarray
        Vehicle speed over that lap [m/s]
    vehicle : VehicleParameters
        The car (its own fuel_kg is replaced lap by lap)
    fuel_kg_by_lap : ndarray
        Fuel for each lap, e.g. from :func:`fuel_mass_by_lap` [kg]
    grade_rad : float or ndarray or None
        Road grade, positive uphill [rad]
    smoothing_window_s : float
        Filter window of the energy method [s]

    Returns
    -------
    ndarray
        Braking energy of each lap [J]
    """
    fuel = np.atleast_1d(np.asarray(fuel_kg_by_lap, dtype=float))
    return np.array([
        float(np.sum(brake_energy_per_interval(time_s, speed_mps, vehicle.with_fuel(float(f)),
                                               grade_rad=grade_rad,
                                               smoothing_window_s=smoothing_window_s)))
        for f in fuel])
