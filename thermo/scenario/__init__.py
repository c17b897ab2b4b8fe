"""Scenario files: TOML in, a checked Scenario (SI inside) out."""
from thermo.scenario.model import Scenario
from thermo.scenario.reader import load_scenario, scenario_from_dict

__all__ = ["Scenario", "load_scenario", "scenario_from_dict"]
