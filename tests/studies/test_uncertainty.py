"""brakeheat uncertainty: the [uncertainty] table, the sampling, the statistics, and a probability
with a known answer."""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from study_cases import SHRINK, small_copy
from thermo.scenario import load_scenario
from thermo.studies.engine import StudyError
from thermo.studies.uncertainty import exceedance, read_uncertainty, uncertainty, uncertainty_dict

BEARING_MEAN_C, BEARING_STD_K = 31.0, 1.0
CAUTION_BAND_K = 1.0

KNOWN = f"""
[uncertainty]
samples = 64
seed = 7
stints = 1

[[uncertainty.inputs]]
name = "bearing grease limit"
key = "limits.bearing_c"
distribution = "normal"
mean = {BEARING_MEAN_C}
std = {BEARING_STD_K}
"""


def _plan(tmp_path, table: str):
    path = small_copy(tmp_path, table)
    return read_uncertainty(load_scenario(path), path)


def test_clopper_pearson_interval_matches_its_closed_form():
    # with no success in n trials the exact upper bound is 1 - (alpha/2)^(1/n) (Clopper & Pearson,
    # Biometrika 26 (1934); the "rule of three" case), and with all n it mirrors
    p, (low, high) = exceedance(0, 10, 0.95)
    assert p == 0.0 and low == 0.0 and high == pytest.approx(1 - 0.025 ** (1 / 10), rel=1e-9)
    p, (low, high) = exceedance(10, 10, 0.95)
    assert p == 1.0 and high == 1.0 and low == pytest.approx(0.025 ** (1 / 10), rel=1e-9)


def test_samples_are_seeded_and_reproducible(tmp_path):
    plan = _plan(tmp_path, KNOWN)
    assert plan.values() == plan.values()
    other = read_uncertainty(load_scenario(tmp_path / "small.toml"), tmp_path / "small.toml", seed=8)
    assert other.values() != plan.values()
    sobol = read_uncertainty(load_scenario(tmp_path / "small.toml"), tmp_path / "small.toml", sampling="sobol")
    assert sobol.values() == sobol.values() and sobol.values() != plan.values()


def test_latin_hypercube_puts_one_sample_in_each_stratum(tmp_path):
    plan = _plan(tmp_path, KNOWN)
    u = plan.unit_samples()[:, 0]
    # the defining property of a Latin hypercube (McKay, Beckman & Conover, Technometrics 21 (1979)):
    # one sample in each of the n equal-probability strata
    assert sorted(np.floor(u * plan.samples).astype(int)) == list(range(plan.samples))


def test_a_distribution_is_truncated_to_the_range_its_key_allows(tmp_path):
    table = """
[uncertainty]
samples = 4000
[[uncertainty.inputs]]
key = "fluid.water_content_pct"
distribution = "normal"
mean = 0.5
std = 1.0
"""
    plan = _plan(tmp_path, table)
    x = np.array(plan.values())[:, 0]
    assert x.min() >= 0.0 and x.max() <= 10.0           # [fluid] water_content_pct allows 0 to 10
    # reference: scipy.stats.truncnorm, the normal truncated to [0, 10]
    ref = stats.truncnorm((0 - 0.5) / 1.0, (10 - 0.5) / 1.0, loc=0.5, scale=1.0)
    assert x.mean() == pytest.approx(ref.mean(), abs=0.01)
    assert np.percentile(x, 90) == pytest.approx(ref.ppf(0.9), abs=0.01)


def test_one_input_sets_all_its_keys(tmp_path):
    table = """
[uncertainty]
samples = 8
[[uncertainty.inputs]]
name = "convection"
keys = ["corners.front.airflow.disc_convection_multiplier", "corners.rear.airflow.disc_convection_multiplier"]
distribution = "lognormal"
median = 1.0
sigma = 0.2
"""
    plan = _plan(tmp_path, table)
    assert plan.keys == ("corners.front.airflow.disc_convection_multiplier", "corners.rear.airflow.disc_convection_multiplier")
    assert all(a == b for a, b in plan.values())


@pytest.mark.parametrize("inputs, message", [
    ('key = "fluid.water_content_pct"\ndistribution = "gamma"', "distribution must be one of"),
    ('key = "fluid.water_content_pct"\ndistribution = "normal"\nmean = 1', "'std' must be a finite number"),
    ('key = "fluid.water_content_pct"\ndistribution = "normal"\nmean = 1\nstd = -1', "std above 0"),
    ('key = "fluid.water_content_pct"\ndistribution = "uniform"\nlow = 2\nhigh = 1', "low must be below high"),
    ('key = "fluid.water_content_pct"\ndistribution = "triangular"\nlow = 0\nmode = 3\nhigh = 2', "mode must lie"),
    ('key = "fluid.water_contnt_pct"\ndistribution = "uniform"\nlow = 0\nhigh = 1', "did you mean"),
    ('key = "corners.front.piston.type"\ndistribution = "uniform"\nlow = 0\nhigh = 1', "must be a number key"),
    ('key = "fluid.water_content_pct"\ndistribution = "normal"\nmean = 50\nstd = 0.1', "almost no probability"),
    ('key = "fluid.water_content_pct"\nkeys = ["a.b"]\ndistribution = "uniform"\nlow = 0\nhigh = 1', "either key"),
    ('key = "fluid.water_content_pct"\ndistribution = "uniform"\nlow = 0\nhigh = 1\nstd = 3', "unknown key 'std'"),
])
def test_bad_inputs_are_one_clear_error(tmp_path, inputs, message):
    with pytest.raises(StudyError, match=message):
        _plan(tmp_path, f"[uncertainty]\n[[uncertainty.inputs]]\n{inputs}\n")


def test_a_scenario_without_the_table_says_so(tmp_path):
    with pytest.raises(StudyError, match=r"no \[uncertainty\] table"):
        _plan(tmp_path, "")
    with pytest.raises(StudyError, match="did you mean 'samples'"):
        _plan(tmp_path, "[uncertainty]\nsampels = 3\n[[uncertainty.inputs]]\nkey = \"fluid.water_content_pct\"\n"
                        "distribution = \"uniform\"\nlow = 0\nhigh = 1\n")


@pytest.fixture(scope="module")
def known(tmp_path_factory):
    path = small_copy(tmp_path_factory.mktemp("known"), KNOWN)
    plan, record = uncertainty(path, overrides=SHRINK + (("limits.bearing_caution_band_k", CAUTION_BAND_K),), workers=1)
    return path, plan, record, uncertainty_dict(plan, record)


def test_a_probability_with_a_known_answer_matches_the_normal_cdf(known):
    """One normally distributed input to a monotone margin: the bearing limit L ~ N(31, 1) degC
    against a peak P the input does not move, so P(exceeded) = P(L < P) = Phi((P - 31) / 1)."""
    path, plan, record, data = known
    entry = next(c for c in data["checks"] if c["corner"] == "front" and c["name"] == "bearing_grease")
    peak_c = entry["peak_c_percentiles"]["50"]
    assert entry["peak_c_percentiles"]["5"] == entry["peak_c_percentiles"]["95"] == peak_c
    expected = stats.norm.cdf((peak_c - BEARING_MEAN_C) / BEARING_STD_K)       # reference: the normal CDF
    low, high = entry["p_exceed_ci"]
    assert low <= expected <= high
    assert entry["p_exceed"] == pytest.approx(expected, abs=1.5 / plan.samples)   # a stratified sample is close
    # in the caution band or beyond: margin below the band, i.e. L < P + band
    expected = stats.norm.cdf((peak_c + CAUTION_BAND_K - BEARING_MEAN_C) / BEARING_STD_K)
    assert 0.1 < expected < 0.9
    low, high = entry["p_caution_ci"]
    assert low <= expected <= high and entry["p_caution"] == pytest.approx(expected, abs=1.5 / plan.samples)


def test_the_uncertainty_json_contract(known):
    _, plan, _, data = known
    assert {"scenario", "caution", "samples", "seed", "inputs", "checks", "sensitivity"} <= set(data)
    assert data["samples"] == 64 and data["seed"] == 7 and data["samples_done"] == 64
    for c in data["checks"]:
        assert {"corner", "name", "p_exceed", "p_exceed_ci", "p_caution", "margin_k_percentiles"} <= set(c)
        assert set(c["margin_k_percentiles"]) == {"5", "50", "95"}
        assert 0.0 <= c["p_exceed_ci"][0] <= c["p_exceed"] <= c["p_exceed_ci"][1] <= 1.0
    assert [h["corner"] for h in data["headline"]] == ["front", "rear"]
    bearing = next(s for s in data["sensitivity"] if s["corner"] == "front" and s["check"] == "bearing_grease")
    # the margin is limit - peak with the peak fixed: its ranks are the limit's ranks (rho = 1)
    assert bearing["inputs"][0]["rank_correlation"] == pytest.approx(1.0)
    assert bearing["inputs"][0]["p_value"] < 1e-6 and bearing["inputs"][0]["within_noise"] is False
    fluid = next(s for s in data["sensitivity"] if s["corner"] == "front" and s["check"] == "fluid_boiling_dry")
    assert fluid["inputs"][0]["rank_correlation"] is None            # the bearing limit does not move it
    assert fluid["inputs"][0]["p_value"] is None and fluid["inputs"][0]["within_noise"] is None
    assert not math.isnan(data["checks"][0]["p_exceed"])


def test_a_rank_correlation_within_sampling_noise_is_marked():
    from thermo.studies.uncertainty import _rank_correlation
    rng = np.random.default_rng(11)
    x = rng.uniform(0.0, 1.0, 48)
    moved = 3.0 * x + rng.normal(0.0, 0.3, 48)                  # the margin follows the input
    unmoved = rng.normal(0.0, 1.0, 48)                           # the margin ignores it
    for y in (moved, unmoved):
        got = _rank_correlation(x, y)
        # the p-value of Spearman's rho from the t distribution with n - 2 degrees of freedom,
        # t = r sqrt((n - 2) / (1 - r^2)) (J. H. Zar, Biostatistical Analysis, 5th ed., 2010, sec. 19.9;
        # from memory), the rho itself from the ranks' Pearson correlation
        r = stats.pearsonr(stats.rankdata(x), stats.rankdata(y)).statistic
        t = r * math.sqrt((x.size - 2) / (1.0 - r * r))
        p = 2.0 * stats.t.sf(abs(t), x.size - 2)
        assert got["rank_correlation"] == pytest.approx(r, abs=1e-4)
        assert got["p_value"] == pytest.approx(p, rel=1e-2)
        assert got["within_noise"] is bool(p >= 0.05)
    assert _rank_correlation(x, moved)["within_noise"] is False
    assert _rank_correlation(x, unmoved)["within_noise"] is True
    assert abs(_rank_correlation(x, unmoved)["rank_correlation"]) > 0.0
