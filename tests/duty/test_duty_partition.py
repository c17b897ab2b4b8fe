"""Disc/pad heat partition against the formulas' check values in PHYSICS.md and Carslaw & Jaeger."""
import numpy as np
import pytest

from thermo.correlations.partition import (
    effusivity, heat_partition_area_weighted, heat_partition_effusivity,
)
from thermo.errors import CorrelationError

E_IRON = effusivity(51.0, 7100.0, 499.0)      # grey cast iron, PHYSICS.md section 1
E_ORGANIC = effusivity(1.0, 2000.0, 1000.0)   # organic pad, PHYSICS.md section 1


def test_effusivity_values():
    # e = sqrt(k rho c): sqrt(51 * 7100 * 499) = 13442, sqrt(1 * 2000 * 1000) = 1414.2
    assert E_IRON == pytest.approx(13442.0, abs=1.0)
    assert E_IRON == pytest.approx(13440.0, rel=2e-4)  # PHYSICS.md quotes "about 13 440"
    assert E_ORGANIC == pytest.approx(1414.21, abs=0.01)


def test_partition_per_area_charron():
    # Charron (1943) as given in Limpert, Brake Design and Safety: gamma = e_d / (e_d + e_p);
    # check value 0.905 computed from the formula in PHYSICS.md
    assert heat_partition_effusivity(E_IRON, E_ORGANIC) == pytest.approx(0.905, abs=5e-4)
    # same material both sides (carbon on carbon): half each
    e_carbon = effusivity(20.0, 1800.0, 700.0)
    assert heat_partition_effusivity(e_carbon, e_carbon) == pytest.approx(0.5, abs=1e-15)


def test_partition_area_weighted_newcomb_spurr_day():
    # Newcomb & Spurr, Braking of Road Vehicles (1967); Day, Braking of Road Vehicles (2014):
    # gamma = 1 / (1 + (A_p / A_d)(e_p / e_d)); check value 0.981 for A_p / A_d = 0.18 (PHYSICS.md)
    assert heat_partition_area_weighted(E_IRON, E_ORGANIC, 1.0, 0.18) == pytest.approx(0.981, abs=5e-4)
    assert heat_partition_area_weighted(E_IRON, E_ORGANIC, 0.05, 0.009) == pytest.approx(
        0.981, abs=5e-4)  # only the ratio matters
    # reduces to the per-area form when A_p = A_d
    assert heat_partition_area_weighted(E_IRON, E_ORGANIC, 0.03, 0.03) == pytest.approx(
        heat_partition_effusivity(E_IRON, E_ORGANIC), rel=1e-14)


def test_partition_equalises_surface_temperatures():
    # Carslaw & Jaeger (1959), Incropera Table 5.1: constant flux q into a semi-infinite solid
    # raises its surface by 2 q sqrt(t/pi) / e. With the per-area partition both surfaces rise alike.
    q, t = 1.0e6, 4.0
    gamma = heat_partition_effusivity(E_IRON, E_ORGANIC)
    rise_disc = 2 * gamma * q * np.sqrt(t / np.pi) / E_IRON
    rise_pad = 2 * (1 - gamma) * q * np.sqrt(t / np.pi) / E_ORGANIC
    assert rise_disc == pytest.approx(rise_pad, rel=1e-12)
    # PHYSICS.md section 2 check value: all of 1 MW/m^2 into iron (e = 13 440) for 4 s: 167.9 K
    assert 2 * q * np.sqrt(t / np.pi) / 13440.0 == pytest.approx(167.9, abs=0.05)


def test_partition_is_vectorised():
    areas = np.array([0.1, 0.18, 0.5])
    gamma = heat_partition_area_weighted(E_IRON, E_ORGANIC, 1.0, areas)
    assert gamma.shape == (3,)
    assert np.all(np.diff(gamma) < 0)  # more pad area, less heat into the disc
    assert gamma[1] == pytest.approx(0.981, abs=5e-4)


def test_bad_inputs_raise_naming_the_parameter():
    with pytest.raises(CorrelationError, match="density_kg_m3"):
        effusivity(51.0, -7100.0, 499.0)
    with pytest.raises(CorrelationError, match="e_pad"):
        heat_partition_effusivity(E_IRON, 0.0)
    with pytest.raises(CorrelationError, match="area_pad_m2.*must not exceed"):
        heat_partition_area_weighted(E_IRON, E_ORGANIC, 0.01, 0.02)
    with pytest.raises(CorrelationError, match="specific_heat_j_kgk"):
        effusivity(51.0, 7100.0, np.nan)


def test_every_function_has_a_reference():
    from thermo.correlations import correlation_reference
    for name, author in (("effusivity", "Carslaw"), ("heat_partition_effusivity", "Charron"),
                         ("heat_partition_area_weighted", "Newcomb")):
        assert author in correlation_reference(name)
