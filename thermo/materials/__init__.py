"""thermo.materials."""
