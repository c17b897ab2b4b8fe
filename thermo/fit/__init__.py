"""Calibrate a scenario's uncertain heat-path parameters against measured temperatures (`brakeheat fit`)."""
from thermo.fit.errors import FitError
from thermo.fit.estimate import FitResult, fit_scenario

__all__ = ["FitError", "FitResult", "fit_scenario"]
