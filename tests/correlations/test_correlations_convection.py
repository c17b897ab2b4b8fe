"""Forced and natural convection against the `ht` package (individual correlation functions),
textbook worked examples, and hand evaluations of the published formulas."""
import warnings

import numpy as np
import pytest
from fluids.friction import friction_factor
from ht import conv_external, conv_free_immersed, conv_internal

from thermo.correlations import forced, internal, natural, set_validity_policy


@pytest.fixture(autouse=True)
def strict_validity():
    # inside validity every call must be silent; outside, an error, so a range slip fails the test
    with set_validity_policy("raise"):
        yield


def test_churchill_bernstein_incropera_example_7_3():
    # Incropera, Fundamentals of Heat and Mass Transfer, Example 7.3 (as reproduced by ht): Nu 40.64
    assert forced.nusselt_cylinder_crossflow_churchill_bernstein(6071.0, 0.7) == pytest.approx(40.64, abs=0.005)


@pytest.mark.parametrize("re", [1.0, 50.0, 6071.0, 1.0e5, 1.0e6])
@pytest.mark.parametrize("pr", [0.7, 5.0])
def test_churchill_bernstein_against_ht(re, pr):
    # oracle: ht.conv_external.Nu_cylinder_Churchill_Bernstein
    assert forced.nusselt_cylinder_crossflow_churchill_bernstein(re, pr) == pytest.approx(
        conv_external.Nu_cylinder_Churchill_Bernstein(re, pr), rel=1e-12)


@pytest.mark.parametrize("re", [1.0e3, 1.0e5, 4.9e5])
def test_flat_plate_laminar_against_ht(re):
    # oracle: ht.conv_external.Nu_horizontal_plate_laminar_Baehr (0.664 Re^0.5 Pr^(1/3) for 0.6 < Pr < 10)
    assert forced.nusselt_flat_plate_laminar_pohlhausen(re, 0.7) == pytest.approx(
        conv_external.Nu_horizontal_plate_laminar_Baehr(re, 0.7), rel=1e-12)


def test_flat_plate_mixed_hand_value():
    # Incropera eq. 7.38: (0.037 Re^0.8 - 871) Pr^(1/3); Re 1e6, Pr 0.7 -> (0.037*63095.73 - 871)*0.887904
    expected = (0.037 * 1.0e6 ** 0.8 - 871.0) * 0.7 ** (1.0 / 3.0)
    assert expected == pytest.approx(1299.4, abs=0.1)   # hand-evaluated value of the formula
    assert forced.nusselt_flat_plate_mixed_incropera(1.0e6, 0.7) == pytest.approx(1299.4, abs=0.1)


def test_flat_plate_mixed_tends_to_fully_turbulent_at_high_re():
    # at Re 1e8 the laminar part is negligible: within 3 % of Kreith's fully turbulent 0.036 Re^0.8
    # Pr^(1/3) (ht.conv_external.Nu_horizontal_plate_turbulent_Kreith)
    ours = forced.nusselt_flat_plate_mixed_incropera(1.0e8, 0.7)
    assert ours == pytest.approx(conv_external.Nu_horizontal_plate_turbulent_Kreith(1.0e8, 0.7), rel=0.03)


def test_flat_plate_chooser_switches_at_5e5():
    below = forced.nusselt_flat_plate_incropera(np.array([4.0e5, 6.0e5]), 0.7)
    assert below[0] == pytest.approx(forced.nusselt_flat_plate_laminar_pohlhausen(4.0e5, 0.7))
    assert below[1] == pytest.approx(forced.nusselt_flat_plate_mixed_incropera(6.0e5, 0.7))


@pytest.mark.parametrize("re", [1.0e4, 1.0e5, 1.0e6])
@pytest.mark.parametrize("heating", [True, False])
def test_dittus_boelter_against_ht(re, heating):
    # oracle: ht.conv_internal.turbulent_Dittus_Boelter (revised coefficient 0.023)
    assert internal.nusselt_internal_turbulent_dittus_boelter(re, 0.7, heating=heating) == pytest.approx(
        conv_internal.turbulent_Dittus_Boelter(re, 0.7, heating=heating), rel=1e-12)


@pytest.mark.parametrize("re", [5.0e3, 1.0e5, 1.0e6])
def test_gnielinski_against_ht(re):
    # oracle: ht.conv_internal.turbulent_Gnielinski with the same friction factor
    f = float(internal.friction_factor_smooth_petukhov(re))
    assert internal.nusselt_internal_turbulent_gnielinski(re, 0.7) == pytest.approx(
        conv_internal.turbulent_Gnielinski(re, 0.7, f), rel=1e-12)
    assert internal.nusselt_internal_turbulent_gnielinski(re, 0.7, friction_factor=0.02) == pytest.approx(
        conv_internal.turbulent_Gnielinski(re, 0.7, 0.02), rel=1e-12)


def test_gnielinski_ht_docstring_example():
    # ht docstring example: turbulent_Gnielinski(Re=1E5, Pr=1.2, fd=0.0185) = 254.6268
    assert internal.nusselt_internal_turbulent_gnielinski(1.0e5, 1.2, friction_factor=0.0185) == pytest.approx(
        254.62682749359632, rel=1e-10)


@pytest.mark.parametrize("re", [1.0e4, 1.0e5, 1.0e6])
def test_petukhov_against_colebrook_smooth(re):
    # oracle: fluids.friction.friction_factor (Colebrook, smooth pipe); Petukhov agrees within ~2 %
    assert internal.friction_factor_smooth_petukhov(re) == pytest.approx(friction_factor(re, eD=0.0), rel=0.025)


@pytest.mark.parametrize("re, pr, d, length", [(500.0, 0.7, 0.006, 0.06), (2000.0, 0.72, 0.008, 0.05)])
def test_sieder_tate_against_ht(re, pr, d, length):
    # oracle: ht.conv_internal.laminar_entry_Seider_Tate, with and without the viscosity term
    assert internal.nusselt_internal_laminar_entry_sieder_tate(re, pr, d, length) == pytest.approx(
        conv_internal.laminar_entry_Seider_Tate(re, pr, length, d), rel=1e-12)
    assert internal.nusselt_internal_laminar_entry_sieder_tate(re, pr, d, length, viscosity_ratio=0.8) == pytest.approx(
        conv_internal.laminar_entry_Seider_Tate(re, pr, length, d, mu=0.8, mu_w=1.0), rel=1e-12)


def test_vented_vane_regimes():
    d, length, pr = 0.008, 0.06, 0.7
    re = np.array([0.0, 100.0, 1500.0, 2300.0, 6150.0, 1.0e4, 5.0e4])
    nu = internal.nusselt_internal_vented_vane(re, pr, d, length)
    # laminar: Sieder-Tate floored at the fully developed 3.66 (Incropera eq. 8.55)
    assert nu[0] == pytest.approx(3.66)
    assert nu[2] == pytest.approx(conv_internal.laminar_entry_Seider_Tate(1500.0, pr, length, d))
    # turbulent: Gnielinski with Petukhov's f (ht.conv_internal.turbulent_Gnielinski)
    f = float(internal.friction_factor_smooth_petukhov(5.0e4))
    assert nu[6] == pytest.approx(conv_internal.turbulent_Gnielinski(5.0e4, pr, f), rel=1e-12)
    # transition: Gnielinski (2013) linear interpolation; 6150 is half way from 2300 to 1e4
    assert nu[4] == pytest.approx(0.5 * (nu[3] + nu[5]), rel=1e-12)
    assert np.all(np.diff(nu) >= 0)   # continuous and rising in Re across the regimes


def test_rotating_disc_cobb_saunders():
    # Cobb & Saunders (1956): 0.36 Re^0.5 laminar, 0.015 Re^0.8 turbulent  # constants from memory
    assert forced.nusselt_rotating_disc_laminar_cobb_saunders(1.0e5) == pytest.approx(0.36 * 316.2278, rel=1e-6)
    assert forced.nusselt_rotating_disc_turbulent_cobb_saunders(1.0e6) == pytest.approx(0.015 * 63095.734, rel=1e-6)
    nu = forced.nusselt_rotating_disc_cobb_saunders(np.array([1.0e5, 1.0e6]))
    np.testing.assert_allclose(nu, [0.36 * 1.0e5 ** 0.5, 0.015 * 1.0e6 ** 0.8])


def test_mixed_convection_rule():
    # Churchill's combined free and forced rule, n = 3 (Incropera section 9.9): (3^3 + 4^3)^(1/3)
    assert forced.nusselt_mixed_churchill(3.0, 4.0) == pytest.approx(91.0 ** (1.0 / 3.0))
    assert forced.nusselt_mixed_churchill(10.0, 0.0) == pytest.approx(10.0)


@pytest.mark.parametrize("ra", [1.0, 1.0e4, 1.0e8, 1.0e11])
def test_vertical_plate_against_ht(ra):
    # oracle: ht.conv_free_immersed.Nu_vertical_plate_Churchill (takes Gr = Ra/Pr)
    pr = 0.71
    assert natural.nusselt_vertical_plate_churchill_chu(ra, pr) == pytest.approx(
        conv_free_immersed.Nu_vertical_plate_Churchill(pr, ra / pr), rel=1e-12)


def test_vertical_plate_incropera_example_9_2():
    # Incropera Example 9.2 (as reproduced in ht's docstring): Pr 0.69, Gr 2.63e9 -> Nu 147.16
    assert natural.nusselt_vertical_plate_churchill_chu(0.69 * 2.63e9, 0.69) == pytest.approx(147.16, abs=0.01)


@pytest.mark.parametrize("ra", [1.0e-3, 1.0, 1.0e6, 1.0e11])
def test_horizontal_cylinder_against_ht(ra):
    # oracle: ht.conv_free_immersed.Nu_horizontal_cylinder_Churchill_Chu
    pr = 0.71
    assert natural.nusselt_horizontal_cylinder_churchill_chu(ra, pr) == pytest.approx(
        conv_free_immersed.Nu_horizontal_cylinder_Churchill_Chu(pr, ra / pr), rel=1e-12)


@pytest.mark.parametrize("ra", [1.0e5, 1.0e7, 1.0e9])
def test_horizontal_plates_against_ht(ra):
    # oracle: ht.conv_free_immersed.Nu_horizontal_plate_McAdams (buoyancy=True: upper face of a
    # hot plate; False: lower face)
    pr = 0.71
    assert natural.nusselt_horizontal_plate_upper_hot_mcadams(ra) == pytest.approx(
        conv_free_immersed.Nu_horizontal_plate_McAdams(pr, ra / pr, buoyancy=True), rel=1e-12)
    assert natural.nusselt_horizontal_plate_lower_hot_mcadams(ra) == pytest.approx(
        conv_free_immersed.Nu_horizontal_plate_McAdams(pr, ra / pr, buoyancy=False), rel=1e-12)


def test_rayleigh_number_hand_value():
    # Ra = g beta dT L^3 / (nu alpha): 9.80665 * (1/350) * 100 * 0.1^3 / (20.92e-6 * 29.9e-6)
    # (air at 350 K, Incropera Table A.4 nu and alpha  # from memory)
    expected = 9.80665 / 350.0 * 100.0 * 1.0e-3 / (20.92e-6 * 29.9e-6)
    assert natural.rayleigh_number(1.0 / 350.0, -100.0, 0.1, 20.92e-6, 29.9e-6) == pytest.approx(expected)
    assert expected == pytest.approx(4.479e6, rel=1e-3)


def test_arrays_go_through():
    ra = np.logspace(2, 10, 5)
    out = natural.nusselt_vertical_plate_churchill_chu(ra, 0.7)
    assert out.shape == (5,) and np.all(np.diff(out) > 0)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        forced.nusselt_flat_plate_incropera(np.linspace(1e3, 1e7, 9), 0.7)


@pytest.mark.parametrize("re", [10.0, 300.0, 1000.0, 2299.0])
@pytest.mark.parametrize("length", [0.03, 0.065, 1.0])
def test_baehr_stephan_developing_laminar_against_ht(re, length):
    # oracle: ht.conv_internal.laminar_entry_Baehr_Stephan (Baehr & Stephan, Heat and Mass Transfer)
    assert internal.nusselt_internal_laminar_developing_baehr_stephan(re, 0.7, 0.012, length) == pytest.approx(
        conv_internal.laminar_entry_Baehr_Stephan(re, 0.7, length, 0.012), rel=1e-12)


@pytest.mark.parametrize("re", [2300.0, 6000.0, 1.0e5])
def test_gnielinski_developing_is_gnielinski_times_the_entry_factor(re):
    # oracle: ht.conv_internal.turbulent_Gnielinski with Petukhov's f (Incropera eq. 8.21), times
    # Gnielinski's (1976) mean entry factor 1 + (d/L)^(2/3) for d/L = 0.2 (hand value: 1.34200)
    f = (0.790 * np.log(re) - 1.64) ** -2
    factor = 1.0 + 0.2 ** (2.0 / 3.0)
    assert factor == pytest.approx(1.34200, abs=1e-5)
    assert internal.nusselt_internal_developing_gnielinski(re, 0.7, 0.01, 0.05) == pytest.approx(
        conv_internal.turbulent_Gnielinski(re, 0.7, f) * factor, rel=1e-9)


def test_vented_disc_passage_takes_the_larger_of_its_two_published_parts():
    # definition of the combination: max(Gnielinski developing on Re_relative, Baehr-Stephan on Re_through)
    d_h, length = 0.011, 0.055
    turbulent = internal.nusselt_internal_developing_gnielinski(5000.0, 0.7, d_h, length)
    laminar = internal.nusselt_internal_laminar_developing_baehr_stephan(1500.0, 0.7, d_h, length)
    assert internal.nusselt_vented_disc_passage(5000.0, 1500.0, 0.7, d_h, length) == pytest.approx(max(turbulent, laminar))
    # at rest both Reynolds numbers are zero: the fully developed laminar 3.657 (Baehr & Stephan limit)
    assert internal.nusselt_vented_disc_passage(0.0, 0.0, 0.7, d_h, length) == pytest.approx(3.657, rel=1e-3)
