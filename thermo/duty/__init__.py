"""thermo.duty."""
