"""thermo.corner."""
