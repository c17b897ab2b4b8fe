"""thermo.output."""
