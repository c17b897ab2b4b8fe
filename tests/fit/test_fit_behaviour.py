"""A parameter the data cannot see is flagged; a peak-only reading pulls the fit its way."""

from conftest import CALIBRATION, make_folder
from thermo.fit import fit_scenario
from thermo.scenario import load_scenario


def _copy_log(stint, folder):
    log = folder / "log.csv"
    log.write_text(stint[1].read_text(encoding="utf-8"), encoding="utf-8")
    return log


def test_parameter_the_data_cannot_see_is_flagged(stint, tmp_path):
    hub = ('\n[calibration.parameters.hub_convection]\nkey = "airflow.hub_convection_multiplier"\n'
           'prior = 1.0\nlower = 0.2\nupper = 5.0\n')
    text = CALIBRATION.replace("max_evaluations = 10", "max_evaluations = 3") + hub
    result = fit_scenario(load_scenario(make_folder(tmp_path, text)), _copy_log(stint, tmp_path))
    hub_value = next(v for v in result.values if v.name == "hub_convection")
    disc_value = next(v for v in result.values if v.name == "disc_convection")
    assert hub_value.std_error > 0.5 * hub_value.value
    assert disc_value.std_error > 0      # finite: the disc channel does see the disc cooling
    assert any(w.startswith("hub_convection is") and "identif" in w for w in result.warnings)


def test_not_reached_paint_pushes_cooling_up(stint, cli_fit, tmp_path):
    summary, _, _ = cli_fit
    free = next(p for p in summary["parameters"] if p["name"] == "disc_convection")
    # the disc's model peak with the free fit, less 25 K: a paint that "did not turn" there
    scenario = load_scenario(make_folder(tmp_path / "a"))
    from thermo.fit.stint import runner_for
    from thermo.fit.measured import read_log
    runner = runner_for(scenario, read_log(stint[1]), ("front",))
    peak_k = runner.run([(free["override_keys"][0], free["value"])]).node("front", "disc")[1].max()
    paint = (f'\n[[calibration.peaks]]\ncorner = "front"\nnode = "disc"\nkind = "not_reached"\n'
             f'temperature_c = {peak_k - 273.15 - 25:.1f}\ntolerance_k = 0.5\n')
    text = CALIBRATION.replace("max_evaluations = 10", "max_evaluations = 6") + paint
    result = fit_scenario(load_scenario(make_folder(tmp_path / "b", text)), _copy_log(stint, tmp_path / "b"))
    bound = next(v for v in result.values if v.name == "disc_convection")
    assert bound.value > free["value"] + 2 * free["std_error"]
    assert result.peaks[0].predicted_peak_k < peak_k - 10
