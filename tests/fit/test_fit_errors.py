"""Bad measured files give one clear error naming the file and what was expected."""
import pytest

from conftest import CALIBRATION, make_folder, run_cli
from thermo.fit import FitError, fit_scenario
from thermo.scenario import load_scenario


def _log_with(stint, path, edit=None):
    text = stint[1].read_text(encoding="utf-8")
    if edit:
        text = edit(text)
    path.write_text(text, encoding="utf-8")
    return path


def _add_column(text):
    lines = text.splitlines()
    head = next(i for i, line in enumerate(lines) if line.startswith("time"))
    lines[head] += ",temp_bearing_front [degC]"
    for i in range(head + 1, len(lines)):
        lines[i] += ",40.0"
    return "\n".join(lines) + "\n"


def test_unmapped_channel(stint, tmp_path):
    scenario = load_scenario(make_folder(tmp_path))
    log = _log_with(stint, tmp_path / "log.csv", _add_column)
    with pytest.raises(FitError, match=r"log.csv: column temp_bearing_front is not mapped.*calibration.channels.temp_bearing_front"):
        fit_scenario(scenario, log)


def test_mapped_channel_missing_from_the_log(stint, tmp_path):
    extra = '\n[calibration.channels.temp_fluid_front]\ncorner = "front"\nnode = "fluid"\n'
    scenario = load_scenario(make_folder(tmp_path, CALIBRATION + extra))
    with pytest.raises(FitError, match=r"no column 'temp_fluid_front \[degC\]'"):
        fit_scenario(scenario, _log_with(stint, tmp_path / "log.csv"))


def test_time_base_that_does_not_overlap_the_run(stint, tmp_path):
    text = CALIBRATION.replace("sample_s = 1.0", "sample_s = 1.0\ntime_offset_s = 5000")
    scenario = load_scenario(make_folder(tmp_path, text))
    with pytest.raises(FitError, match=r"time_offset_s = 5000\) does not overlap the run, 0.0 to"):
        fit_scenario(scenario, _log_with(stint, tmp_path / "log.csv"))


def test_holdout_lap_not_in_the_log(stint, tmp_path):
    scenario = load_scenario(make_folder(tmp_path, CALIBRATION.replace("holdout_laps = [2]", "holdout_laps = [7]")))
    with pytest.raises(FitError, match=r"holdout_laps \[7\] are not in the logged run, which has laps 1 to 2"):
        fit_scenario(scenario, _log_with(stint, tmp_path / "log.csv"))


def test_cli_turns_it_into_one_line_and_exit_1(stint, tmp_path, capsys):
    scenario = make_folder(tmp_path)
    log = _log_with(stint, tmp_path / "log.csv", _add_column)
    assert run_cli(["fit", str(scenario), "--measured", str(log)])[0] == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "temp_bearing_front is not mapped" in err[0]
