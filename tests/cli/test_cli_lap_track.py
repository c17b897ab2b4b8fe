"""`brakeheat lap TRACK.toml` (issue 17): the lap built from a track description with a scenario's car
envelope, shown as for a trace; --out writes its speed trace in the trace CSV format, which reads back."""
from __future__ import annotations

import json
import math
import shutil

import numpy as np
import pytest

from lapdata.reader import read_trace_csv
from thermo.chain.plan import base_lap
from thermo.cli.options import demo_scenario_path
from thermo.output.manifest import verify_manifest
from thermo.scenario import load_scenario
from conftest import ROOT, SMALL, cli
from test_cli_errors import assert_one_line_error

CIRCUIT = ROOT / "scenarios" / "demo_circuit.toml"
KMH = 1 / 3.6                 # m/s per km/h (SI Brochure, 9th ed.)
G = 9.80665                   # standard gravity (CGPM 1901)


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    out = tmp_path_factory.mktemp("lap_out")
    code, text, err = cli(["lap", CIRCUIT, "--json", "--out", out])
    assert code == 0, err
    return json.loads(text), out


def test_the_built_lap_is_the_one_a_run_uses(built):
    data, _ = built
    run_lap = base_lap(load_scenario(demo_scenario_path()))     # demo.toml builds its laps from demo_circuit.toml
    assert data["duration_s"] == pytest.approx(run_lap.duration_s, abs=1e-3)
    assert data["built"]["top_speed_kmh"] == pytest.approx(run_lap.speed_mps.max() / KMH, abs=0.05)
    assert [s["name"] for s in data["built"]["segments"]][:2] == ["Harrier straight", "Mill hairpin"]
    assert len(data["zones"]) == 6          # six corners slower than the straights before them
    assert [c["name"] for c in data["corners"]] == ["front", "rear"]


def test_corner_speeds_follow_the_track_and_steady_cornering(built):
    data, _ = built
    segments = {s["name"]: s for s in data["built"]["segments"]}
    # a corner given by its speed is driven at that speed; it is the slowest on this circuit
    assert segments["Mill hairpin"]["v_min_kmh"] == pytest.approx(75.0, abs=0.05)
    assert data["built"]["min_speed_kmh"] == pytest.approx(75.0, abs=0.05)
    # steady cornering with downforce: v^2 / R = mu (g + rho v^2 ClA / (2 m))  (point mass; e.g.
    # Milliken & Milliken, Race Car Vehicle Dynamics, 1995, ch. 2), solved for v
    car = load_scenario(demo_scenario_path()).envelope
    for name, radius in (("Chapel bend", 32.0), ("Quarry corner", 25.0), ("Orchard left", 60.0)):
        k = car.lateral_grip_g * car.air_density_kg_m3 * car.downforce_cl_a_m2 / (2 * car.mass_kg)
        v = math.sqrt(car.lateral_grip_g * G / (1 / radius - k))
        assert segments[name]["v_min_kmh"] == pytest.approx(v / KMH, abs=0.3), name


def test_out_writes_the_speed_trace_that_reads_back(built):
    data, out = built
    assert verify_manifest(out) == []
    back = read_trace_csv(out / "lap_trace.csv")
    lap = base_lap(load_scenario(demo_scenario_path()))
    # written with 4 decimals of s and km/h, 3 of m: read back to within half the last decimal
    assert np.allclose(back.time_s, lap.time_s, atol=5e-5, rtol=0)
    assert np.allclose(back.distance_m, lap.distance_m - lap.distance_m[0], atol=5e-4, rtol=0)
    assert np.allclose(back.speed_mps / KMH, lap.speed_mps / KMH, atol=5e-5, rtol=0)
    assert np.allclose(back.accel_long_mps2, lap.accel_long_mps2, atol=5e-5, rtol=0)
    # and the lap command reads it as it read the track: the same zones and energies
    code, text, err = cli(["lap", out / "lap_trace.csv", "--json"])
    assert code == 0, err
    again = json.loads(text)
    assert len(again["zones"]) == len(data["zones"])
    for a, b in zip(again["zones"], data["zones"]):
        assert a == pytest.approx(b, rel=1e-3, abs=0.11)
    assert again["energy_per_lap_j"] == pytest.approx(data["energy_per_lap_j"], rel=1e-4)


def test_text_shows_the_built_lap():
    code, out, err = cli(["lap", CIRCUIT, "--scenario", SMALL])
    assert code == 0, err
    assert "built from" in out and "top speed" in out and "minimum speed" in out
    assert "Segments of the built lap" in out and "Braking zones" in out and "CAUTION" in out


def test_a_trace_json_has_no_built_block_and_out_copies_it(tmp_path):
    demo_lap = ROOT / "scenarios" / "demo_lap.csv"
    code, out, err = cli(["lap", demo_lap, "--json", "--out", tmp_path])
    assert code == 0, err
    assert "built" not in json.loads(out)
    original, copy = read_trace_csv(demo_lap), read_trace_csv(tmp_path / "lap_trace.csv")
    assert np.allclose(copy.pressure_front_pa, original.pressure_front_pa, atol=5.0)     # 4 decimals of bar
    assert np.allclose(copy.speed_mps, original.speed_mps, atol=1e-5)


@pytest.mark.parametrize("text, fragments", [
    ('name = "x"\n[[segments]]\nkind = "straight"\nlenght_m = 10\n', ("segment 1", "unknown key 'lenght_m'",
                                                                       "did you mean 'length_m'")),
    ('name = "x\n', ("not valid TOML",)),
    ('name = "x"\nsegmnets = []\n', ("unknown key 'segmnets'",)),
    ('name = "x"\n[[segments]]\nkind = "corner"\nlength_m = 10\n', ("segment 1", "radius_m or min_speed_kmh")),
])
def test_bad_track_is_one_line(tmp_path, text, fragments):
    track = tmp_path / "track.toml"
    track.write_text(text, encoding="utf-8")
    assert_one_line_error(*cli(["lap", track]), str(track), *fragments)
    assert not (tmp_path / "out").exists()


def test_track_options_that_do_not_apply_are_errors(tmp_path):
    assert_one_line_error(*cli(["lap", CIRCUIT, "--repair"]), "--repair", "track description")
    scenario = tmp_path / "pressure.toml"
    text = demo_scenario_path().read_text(encoding="utf-8")
    scenario.write_text(text.replace('power_method = "energy"', 'power_method = "pressure"'), encoding="utf-8")
    shutil.copy(CIRCUIT, tmp_path / CIRCUIT.name)
    assert_one_line_error(*cli(["lap", CIRCUIT, "--scenario", scenario]), str(scenario), "power_method",
                          "logged trace CSV")
    assert_one_line_error(*cli(["lap", CIRCUIT, "--out", CIRCUIT]), "--out", "is a file")
