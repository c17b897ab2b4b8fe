"""thermo.solver."""
