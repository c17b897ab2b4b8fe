"""thermo.scenario."""
