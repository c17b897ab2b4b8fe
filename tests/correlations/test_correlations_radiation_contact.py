"""Radiation coefficients and view factors against hand calculations and limiting analytic cases;
contact and slab conductances against their defining formulas."""
import numpy as np
import pytest

from lapdata.units import STEFAN_BOLTZMANN
from thermo.correlations import contact, radiation
from thermo.errors import CorrelationError


def test_two_surface_coefficient_hand_calculation():
    # Incropera two-surface enclosure, q = sigma (T1^4 - T2^4) / [(1-e1)/(e1 A1) + 1/(A1 F12) + (1-e2)/(e2 A2)]
    # hand: 0.3/0.035 + 1/0.02 + 0.7/0.06 = 8.571429 + 50 + 11.666667 = 70.238095 m^-2
    coef = radiation.radiation_coefficient_grey_two_surface(0.7, 0.3, 0.05, 0.2, 0.4)
    assert coef == pytest.approx(5.670374419e-8 / 70.238095, rel=1e-7)
    q = coef * (700.0 ** 4 - 400.0 ** 4)
    # hand: sigma/70.238095 = 8.07312e-10 W/K^4; 700^4 - 400^4 = 2.145e11 K^4 -> 173.17 W
    assert q == pytest.approx(173.17, abs=0.01)


def test_two_surface_infinite_parallel_planes():
    # Incropera Table 13.3, large parallel planes: q/A = sigma (T1^4 - T2^4) / (1/e1 + 1/e2 - 1)
    coef = radiation.radiation_coefficient_grey_two_surface(0.8, 0.6, 2.0, 2.0, 1.0)
    assert coef == pytest.approx(2.0 * STEFAN_BOLTZMANN / (1 / 0.8 + 1 / 0.6 - 1), rel=1e-12)


def test_two_surface_tends_to_small_body_in_large_enclosure():
    # Incropera Table 13.3 small convex object in a large cavity: q = e1 sigma A1 (T1^4 - T2^4)
    big = radiation.radiation_coefficient_grey_two_surface(0.7, 0.5, 0.01, 1.0e6, 1.0)
    assert big == pytest.approx(radiation.radiation_coefficient_to_surroundings(0.7, 0.01), rel=1e-6)
    assert radiation.radiation_coefficient_to_surroundings(0.7, 0.01) == pytest.approx(0.7 * 0.01 * 5.670374419e-8)


def test_two_surface_rejects_impossible_inputs():
    with pytest.raises(CorrelationError, match="eps1"):
        radiation.radiation_coefficient_grey_two_surface(0.0, 0.5, 1.0, 1.0, 0.5)
    with pytest.raises(CorrelationError, match="view21"):   # reciprocity: F21 = 2*0.8/1 > 1
        radiation.radiation_coefficient_grey_two_surface(0.5, 0.5, 2.0, 1.0, 0.8)
    with pytest.raises(CorrelationError, match="view12"):
        radiation.radiation_coefficient_grey_two_surface(0.5, 0.5, 1.0, 1.0, 1.2)


def test_coaxial_discs_equal_radius_equal_distance():
    # Incropera Table 13.2 formula at r_i = r_j = L: S = 3, F = (3 - sqrt 5)/2 = 0.381966
    # (0.38 on Incropera Fig. 13.5 at r/L = 1  # from memory)
    assert radiation.view_factor_coaxial_parallel_discs(0.1, 0.1, 0.1) == pytest.approx((3 - 5 ** 0.5) / 2, rel=1e-12)


def test_coaxial_discs_small_emitter_limit_and_reciprocity():
    # analytic: a small element facing a coaxial disc of radius R at distance L sees R^2/(R^2+L^2)
    # (Incropera Table 13.1 / Howell catalogue, differential element to parallel disc)
    assert radiation.view_factor_coaxial_parallel_discs(1.0e-6, 0.2, 0.1) == pytest.approx(0.04 / 0.05, rel=1e-9)
    ri, rj, gap = 0.15, 0.2, 0.03
    fij = radiation.view_factor_coaxial_parallel_discs(ri, rj, gap)
    fji = radiation.view_factor_coaxial_parallel_discs(rj, ri, gap)
    assert ri ** 2 * fij == pytest.approx(rj ** 2 * fji, rel=1e-12)   # reciprocity A_i F_ij = A_j F_ji
    assert 0.9 < fij < 1.0 and fji < (ri / rj) ** 2 + 1e-12         # summation rule bound


def test_linearised_conductance_matches_the_quartic_exchange():
    coef, t1, t2 = 3.0e-9, 800.0, 350.0
    g = radiation.radiation_conductance_linearised(coef, t1, t2)
    assert g * (t1 - t2) == pytest.approx(coef * (t1 ** 4 - t2 ** 4), rel=1e-12)   # algebraic identity


def test_user_given_view_factor_route():
    assert radiation.view_factor_user_given(0.35, "CAD model of the demo corner") == 0.35
    with pytest.raises(CorrelationError, match="source"):
        radiation.view_factor_user_given(0.35, "")
    with pytest.raises(CorrelationError, match="view_factor"):
        radiation.view_factor_user_given(1.5, "guess")


def test_contact_and_slab_conductance():
    # G = h A (Incropera section 3.1.4); G = k A / L (Incropera eq. 3.6)
    assert contact.conductance_contact(2000.0, 3.0e-4) == pytest.approx(0.6)
    assert contact.conductance_slab(0.3, 1.0e-3, 1.0e-3) == pytest.approx(0.3)
    with pytest.raises(CorrelationError, match="thickness"):
        contact.conductance_slab(1.0, 1.0, 0.0)


def test_series_parallel_combination_of_a_shim_stack():
    # crown contact, shim slab, backing-plate contact in series: 1/(1/0.6 + 1/0.3 + 1/0.6) = 0.15 W/K
    g1 = contact.conductance_contact(2000.0, 3.0e-4)
    g2 = contact.conductance_slab(0.3, 1.0e-3, 1.0e-3)
    assert contact.conductance_series(g1, g2, g1) == pytest.approx(0.15)
    assert contact.conductance_parallel(g1, g2, 0.0) == pytest.approx(0.9)
    np.testing.assert_allclose(contact.conductance_series(np.array([1.0, 2.0]), 2.0), [2 / 3, 1.0])


def test_contact_coefficient_table():
    for kind, entry in contact.CONTACT_COEFFICIENTS.items():
        assert entry.low_w_m2k <= entry.h_w_m2k <= entry.high_w_m2k, kind
        assert entry.source.strip() and ("from memory" in entry.source or "common practice" in entry.source)
    # Incropera Table 3.1(b) aluminium interface with air, R''_tc = 2.75e-4 m^2K/W  # from memory
    assert contact.contact_coefficient("aluminium_aluminium_air").h_w_m2k == pytest.approx(1 / 2.75e-4, rel=0.02)
    with pytest.raises(CorrelationError, match="bearing_race_press_fit"):
        contact.contact_coefficient("bearing_race_pressfit")
