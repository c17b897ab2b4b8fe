"""`brakeheat fit` on a synthetic stint made by the model with known parameters (tests/fit/make_demo_stint.py).

The reference is the known truth the data were generated with; "within the reported uncertainty"
is |fitted - true| < 3 std errors (a Gaussian 99.7 % interval; Bates & Watts 1988, ch. 2, for the
linearised standard errors).
"""
import pytest

from conftest import CHANNELS, TRUE_CALIPER_OFFSET_K, TRUTH, run_cli
from thermo.scenario import load_scenario


def _param(summary, name):
    return next(p for p in summary["parameters"] if p["name"] == name)


def test_known_parameters_recovered_within_their_std_error(cli_fit):
    summary, _, _ = cli_fit
    disc = _param(summary, "disc_convection")
    offset = _param(summary, "temp_caliper_front.offset_k")
    assert 0 < disc["std_error"] < 0.3
    assert abs(disc["value"] - TRUTH[0][1]) < 3 * disc["std_error"]
    assert abs(disc["value"] - 2.0) > 3 * disc["std_error"]      # it moved off its prior of 2.0
    assert abs(offset["value"] - TRUE_CALIPER_OFFSET_K) < 3 * offset["std_error"]


def test_rms_per_channel_near_the_added_noise(cli_fit):
    summary, _, _ = cli_fit
    for ch in CHANNELS:   # the synthetic noise std; a right model leaves residuals of about that size
        assert 0.6 * ch.noise_k < summary["rms_k"][ch.channel] < 1.5 * ch.noise_k
        assert 0.6 * ch.noise_k < summary["holdout_rms_k"][ch.channel] < 1.5 * ch.noise_k
    assert summary["holdout_laps"] == [2]


def test_calibrated_scenario_runs_with_the_fitted_values(cli_fit):
    summary, out, calibrated = cli_fit
    disc = _param(summary, "disc_convection")
    scenario = load_scenario(calibrated)
    front = next(c for c in scenario.corners if c.name == "front")
    assert front.airflow.disc_convection_multiplier == pytest.approx(disc["value"], rel=1e-5)
    assert scenario.calibration.channels[1].offset_k == pytest.approx(
        _param(summary, "temp_caliper_front.offset_k")["value"], rel=1e-5)
    text = calibrated.read_text(encoding="utf-8")
    assert text.count("[calibrated]") == 1 and "(1 s.e.)" in text
    for ch in CHANNELS:
        assert (out / f"fit_{ch.channel}.png").stat().st_size > 10_000
    assert (out / "fit.json").is_file()


def test_the_calibrated_scenario_joins_the_output_set_and_json_alone_writes_nothing(cli_fit, stint, tmp_path):
    """Issue 17: with --out the calibrated scenario is written into that folder and listed in its
    manifest (never beside the scenario); `fit --json` alone writes no file."""
    import json
    from thermo.output.manifest import verify_manifest
    summary, out, calibrated = cli_fit
    assert summary["calibrated_scenario"] == str(calibrated) and calibrated.parent == out
    assert "fit_calibrated.toml" in {f["name"] for f in json.loads((out / "manifest.json").read_text())["files"]}
    assert verify_manifest(out) == []
    scenario, log = stint
    assert not scenario.with_name("fit_calibrated.toml").exists()
    before = sorted(p.name for p in scenario.parent.iterdir())
    code, text = run_cli(["fit", str(scenario), "--measured", str(log), "--json"])
    assert code == 0 and json.loads(text)["calibrated_scenario"] is None
    assert sorted(p.name for p in scenario.parent.iterdir()) == before
