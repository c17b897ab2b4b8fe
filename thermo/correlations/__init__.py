"""thermo.correlations."""
