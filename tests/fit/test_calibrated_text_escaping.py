"""The calibrated scenario `fit` writes stays the scenario it was, whatever the file names hold (issue 13).

A measured file's path with a newline used to add a line (and so a key) to the TOML written;
a pinned plan path with a quote could end its string early.
"""
import tomllib
from types import SimpleNamespace

from thermo.fit.calibrated import calibrated_text

BASE = '[scenario]\nname = "x"\n'
RESULT = SimpleNamespace(values=[SimpleNamespace(override_keys=("corners.front.airflow.disc_convection_multiplier",),
                                                 value=1.25, std_error=0.05, kind="multiplier")])


def test_a_newline_in_the_measured_path_adds_no_key():
    text = calibrated_text(BASE, RESULT, "2026-12-02", measured="log.csv\n[car]\nmass_kg = 1")
    parsed = tomllib.loads(text)
    assert set(parsed) == {"scenario", "calibrated"}
    assert parsed["calibrated"] == {"corners.front.airflow.disc_convection_multiplier": 1.25}


def test_pinned_paths_with_quotes_backslashes_and_control_characters_round_trip():
    odd = 'C:\\laps\\"quoted"\x7f\ttab.csv'
    text = calibrated_text(BASE, RESULT, "2026-12-02", measured="log.csv", pinned=[("plan.trace", odd)])
    assert tomllib.loads(text)["calibrated"]["plan.trace"] == odd
