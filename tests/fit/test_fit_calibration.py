"""The [calibration] table is checked on every scenario load: values in SI, bad keys named."""
import pytest

from conftest import CALIBRATION, make_folder
from thermo.errors import ScenarioError
from thermo.scenario import load_scenario


def test_parsed_values_in_si(tmp_path):
    peak = '\n[[calibration.peaks]]\ncorner = "front"\nnode = "caliper"\nkind = "reached"\ntemperature_c = 180\n'
    cal = load_scenario(make_folder(tmp_path, CALIBRATION + peak)).calibration
    assert cal.holdout_laps == (2,)
    assert [c.channel for c in cal.channels] == ["temp_disc_front", "temp_caliper_front"]
    assert cal.channels[1].fit_offset and cal.channels[1].lag_s == 3.0
    assert cal.parameters[0].override_keys == ("corners.front.airflow.disc_convection_multiplier",)
    assert cal.peaks[0].temperature_k == pytest.approx(453.15)   # 180 degC; 0 degC = 273.15 K (SI brochure)
    assert cal.peaks[0].name == "front caliper reached 180 degC"


def test_no_calibration_table_is_none():
    from pathlib import Path
    assert load_scenario(Path(__file__).parents[1] / "data" / "small.toml").calibration is None


@pytest.mark.parametrize("edit, message", [
    (("lag_s = 0.3", "lagg_s = 0.3"), "unknown key 'lagg_s'.*did you mean 'lag_s'"),
    (('node = "disc"', 'node = "disc_surface"'), "disc_surface.*layered disc"),
    (('corner = "front"\nnode = "caliper"', 'corner = "middle"\nnode = "caliper"'), "unknown corner 'middle'"),
    (("prior = 2.0", "prior = 5.0"), "prior 5 must lie within"),
    (('key = "airflow.disc_convection_multiplier"', 'key = "airflow.disc_convection"'), "is not allowed"),
    (("holdout_laps = [2]", "holdout_laps = [0]"), "holdout_laps must be a list of lap numbers"),
])
def test_bad_tables_name_the_key(tmp_path, edit, message):
    old, new = edit
    assert old in CALIBRATION
    with pytest.raises(ScenarioError, match=message):
        load_scenario(make_folder(tmp_path, CALIBRATION.replace(old, new, 1)))
