"""`brakeheat run` end to end on the shrunk small scenario: report, JSON contract, files in --out DIR.

The JSON and HDF5 contracts are README's ("What a run produces", "The results file results.h5").
"""
from __future__ import annotations

import json

import h5py
import numpy as np
import pytest

from thermo.limits import boiling_drop_share

import thermo
from thermo.output.hdf5 import read_results_hdf5
from thermo.output.summary import summary_dict
from conftest import EXCEED, SHRINK, SMALL, cli

NODES = ("disc", "pad", "piston", "fluid", "caliper", "upright", "bearing", "hub")
CHECKS = ("fluid_boiling_dry", "fluid_boiling_wet", "fluid_boiling_at_water_content", "bearing_grease",
          "piston_seal", "caliper_body", "disc_max", "pad_max")
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"   # PNG specification (ISO/IEC 15948:2004), section 5.2
KELVIN_AT_0C = 273.15                  # SI Brochure, 9th ed.: T/K = t/degC + 273.15


def test_first_run_exits_0_although_a_limit_is_exceeded(small_runs):
    code, out, err = small_runs["first"]
    assert code == 0, err
    statuses = {c["name"]: c["status"] for corner in small_runs["json"]["corners"] for c in corner["checks"]}
    assert statuses["bearing_grease"] == "exceeded"


def test_fail_on_exceeded_exits_3_and_still_reports(small_runs):
    code, out, err = small_runs["second"]
    assert code == 3, err
    assert "bearing_grease" in out and thermo.CAUTION in out


def test_text_report_names_corners_checks_and_caution(small_runs):
    report = small_runs["second"][1]
    for corner in ("front", "rear"):
        assert corner in report
    for check in CHECKS:
        assert check in report, check
    assert thermo.CAUTION in report
    assert "EXCEEDED" in report            # the exceeded bearing check stands out


def test_json_contract(small_runs):
    data = small_runs["json"]
    assert data["scenario"] == "small test scenario"
    # the --set overrides of the run, in order, as TOML text (the scenario text alone is not this run)
    assert [o["key"] for o in data["overrides"]][:3] == ["plan.phases.1.count", "plan.phases.4.count",
                                                         "plan.phases.5.duration_s"]
    assert {"key": "limits.bearing_c", "value": "30"} in data["overrides"]
    assert data["caution"] == thermo.CAUTION
    assert [c["name"] for c in data["corners"]] == ["front", "rear"]
    for corner in data["corners"]:
        assert set(NODES) <= set(corner["peak_c"]) and set(NODES) <= set(corner["peak_time_s"])
        assert set(corner["peak_c"]) == set(corner["peak_time_s"])
        names = [c["name"] for c in corner["checks"]]
        assert names[:len(CHECKS)] == list(CHECKS)          # the stable checks first, in their order
        assert "piston_material" in names and all(n.endswith("_material") for n in names[len(CHECKS):])
        assert all(c["node"] == "fluid_at_piston" for c in corner["checks"] if c["name"].startswith("fluid_"))
        for check in corner["checks"]:
            assert {"name", "limit_c", "peak_c", "margin_k", "status"} <= set(check)
            assert check["margin_k"] == pytest.approx(check["limit_c"] - check["peak_c"], abs=0.011)
            assert check["peak_c"] == pytest.approx(corner["peak_c"][check["node"]], abs=0.006)
            band = "exceeded" if check["margin_k"] < 0 else None
            assert band is None or check["status"] == band
        energy = corner["energy"]
        # first law: heat in = stored + lost (CONVENTIONS.md physical invariant)
        assert energy["heat_in_j"] == pytest.approx(energy["stored_j"] + energy["lost_j"], rel=1e-5)
        assert abs(energy["balance_rel_error"]) < 1e-5
        assert energy["heat_in_j"] > 1e5
        soak = corner["soak"]
        assert set(soak) >= {"peak_c", "peak_after_stop_s"}
        for node, after in soak["peak_after_stop_s"].items():
            assert 0.0 <= after <= 60.0 + 1e-9, node          # the soak lasts 60 s
            assert soak["peak_c"][node] <= corner["peak_c"][node] + 0.006
        # limits in the JSON are the scenario's (degC), with the override
        limits = {c["name"]: c["limit_c"] for c in corner["checks"]}
        assert limits["bearing_grease"] == 30.0 and limits["fluid_boiling_dry"] == 312.0
        assert limits["fluid_boiling_wet"] == 204.0
        # Keen's curve (TRRL LR 903, 1979) scaled between dry (0 %) and wet (3.7 % water, FMVSS 116
        # S7.2 humidification), at 0.5 %: below the straight line (312 - 108 x 0.5 / 3.7 = 297.4)
        assert limits["fluid_boiling_at_water_content"] == pytest.approx(312 - (312 - 204) * boiling_drop_share(0.5), abs=0.01)
        assert limits["fluid_boiling_at_water_content"] < 312 - (312 - 204) * 0.5 / 3.7


def test_out_dir_files(small_runs):
    folder = small_runs["folder"]
    names = sorted(p.name for p in folder.iterdir())
    assert "results.h5" in names and "summary.json" in names
    pngs = sorted(folder.glob("*.png"))
    assert len(pngs) >= 3                     # temperatures per corner, lap peaks, heat paths
    for png in pngs:
        data = png.read_bytes()
        assert data[:8] == PNG_SIGNATURE and len(data) > 2000, png.name
    assert not [n for n in names if n.endswith(".tmp") or n.startswith(".")], names


def test_summary_json_equals_json_output(small_runs):
    summary_bytes = small_runs["after_first"]["summary.json"][2]
    assert json.loads(summary_bytes) == small_runs["json"]


def test_hdf5_with_plain_h5py_agrees_with_summary(small_runs):
    data = small_runs["json"]
    with h5py.File(small_runs["folder"] / "results.h5", "r") as f:
        assert f.attrs["format"] == "brakeheat-results" and int(f.attrs["format_version"]) == 2
        assert [str(n) for n in f.attrs["corners"]] == ["front", "rear"]
        for corner in data["corners"]:
            g = f[f"corners/{corner['name']}"]
            time_s = g["time_s"][()]
            assert g["time_s"].attrs["units"] == "s"
            columns = [str(n) for n in g["temperature_k"].attrs["nodes"]]
            assert g["temperature_k"].attrs["units"] == "K" and "temperature" not in g   # no per-node copies (v2)
            assert "link_flow_w" not in g and g["laps/link_energy_j"].shape[1] == g["link_energy_j"].size
            for node in NODES:
                series = g["temperature_k"][:, columns.index(node)]
                assert series.max() - KELVIN_AT_0C == pytest.approx(corner["peak_c"][node], abs=0.006)
                assert time_s[np.argmax(series)] == pytest.approx(corner["peak_time_s"][node], abs=0.006)
            for check in corner["checks"]:
                attrs = g[f"checks/{check['name']}"].attrs
                assert attrs["margin_k"] == pytest.approx(check["margin_k"], abs=0.006)
                assert attrs["limit_k"] - KELVIN_AT_0C == pytest.approx(check["limit_c"], abs=0.006)
            e = g["energy"].attrs
            assert e["heat_in_j"] == pytest.approx(corner["energy"]["heat_in_j"], abs=0.06)


def test_hdf5_round_trip_gives_the_same_summary(small_runs):
    results = read_results_hdf5(small_runs["folder"] / "results.h5")
    assert summary_dict(results) == small_runs["json"]
    with h5py.File(small_runs["folder"] / "results.h5", "r") as f:
        for corner in results.corners:
            np.testing.assert_array_equal(corner.temperatures_k, f[f"corners/{corner.name}/temperature_k"][()])


def test_second_run_replaces_files_atomically(small_runs):
    first, second = small_runs["after_first"], small_runs["after_second"]
    assert set(first) == set(second)          # same files, no temporary file left over
    for name in ("results.h5", "summary.json"):
        inode_1, mtime_1, _ = first[name]
        inode_2, mtime_2, _ = second[name]
        assert (inode_1, mtime_1) != (inode_2, mtime_2), name   # a new file renamed into place
    assert second["summary.json"][2] == first["summary.json"][2]  # same scenario, same results
    assert not [n for n in second if n.endswith(".tmp")]


def test_demo_print_scenario(tmp_path):
    from pathlib import Path
    code, out, err = cli(["demo", "--print-scenario"])
    assert code == 0 and err == ""
    path = Path(out.strip())
    assert path.is_file() and path.name == "demo.toml"
    assert "[corners.front]" in path.read_text(encoding="utf-8")


def test_version():
    code, out, err = cli(["--version"])
    assert code == 0 and out.strip() == f"brakeheat {thermo.__version__}"


def test_store_full_keeps_every_step_and_the_link_flows(small_runs, tmp_path):
    """README "The results file": link flows at full resolution only with --store full; the
    standard store keeps the same peaks, margins and per-lap link energies."""
    code, _, err = cli(["run", str(SMALL), *SHRINK, "--quiet", "--store", "full", "--out", str(tmp_path / "full")])
    assert code == 0, err
    full = read_results_hdf5(tmp_path / "full" / "results.h5")
    standard = read_results_hdf5(small_runs["folder"] / "results.h5")
    for a, b in zip(full.corners, standard.corners):
        assert a.link_flows_w is not None and a.link_flows_w.shape == (a.time_s.size, len(a.link_names))
        assert b.link_flows_w is None and b.time_s.size < a.time_s.size
        assert [c.peak_k for c in a.checks] == [c.peak_k for c in b.checks]
        np.testing.assert_allclose([lap.link_energy_j for lap in a.laps], [lap.link_energy_j for lap in b.laps])
        # the laps' and phases' link energies add up to the run's (first law, bookkeeping)
        np.testing.assert_allclose(np.sum([p.link_energy_j for p in b.phases], axis=0), b.link_energy_j, rtol=1e-9)


def test_store_full_streams_every_row_into_the_file(tmp_path):
    """`--store full --out DIR` streams each row into results.h5 as the run makes it
    (thermo.output.hdf5_stream) instead of holding them: the file reads back with the series, bit
    for bit, of a run that kept every row in memory, and with every other field equal."""
    import dataclasses
    from thermo.chain import run_scenario
    from thermo.scenario import load_scenario
    shrink = [(key, int(value)) for key, value in (item.split("=") for item in SHRINK[1::2])]
    in_memory = run_scenario(load_scenario(SMALL, shrink), store="full")
    code, _, err = cli(["run", str(SMALL), *SHRINK, "--quiet", "--store", "full", "--out", str(tmp_path / "full")])
    assert code == 0, err
    streamed = read_results_hdf5(tmp_path / "full" / "results.h5")
    series = ("time_s", "temperatures_k", "link_flows_w", "speed_m_s", "brake_power_w", "link_energy_j")
    for a, b in zip(streamed.corners, in_memory.corners, strict=True):
        for key in series:
            assert getattr(a, key).tobytes() == getattr(b, key).tobytes(), key
        assert dataclasses.replace(a, **{k: None for k in series}) == dataclasses.replace(b, **{k: None for k in series})
    assert dataclasses.replace(streamed, corners=()) == dataclasses.replace(in_memory, corners=())


@pytest.mark.parametrize("argv", [["run", str(SMALL), "--json"], ["demo", "--compare", "--json"]])
def test_store_full_without_a_results_file_is_one_line_and_exit_1(argv):
    """--store says what results.h5 keeps: without --out (or with demo --compare, which writes no
    results.h5) it would be ignored, so it is refused before anything runs."""
    code, out, err = cli([*argv, "--store", "full"])
    assert code == 1 and out == ""
    assert len(err.splitlines()) == 1 and err.startswith("brakeheat: error: --store") and "Traceback" not in err


def test_laps_and_checks_csv_hold_the_summary_numbers(small_runs, tmp_path):
    """--out writes laps.csv and checks.csv (issue 17, exports); read back with Python's csv
    module they agree with the JSON summary; --csv FILE writes the per-lap table alone."""
    import csv
    folder = small_runs["folder"]
    laps = list(csv.DictReader((folder / "laps.csv").open(encoding="utf-8")))
    checks = list(csv.DictReader((folder / "checks.csv").open(encoding="utf-8")))
    data = small_runs["json"]
    assert len(laps) == sum(len(c["laps"]) for c in data["corners"])
    assert len(checks) == sum(len(c["checks"]) for c in data["corners"])
    by_corner = {c["name"]: c for c in data["corners"]}
    for row in laps:
        lap = by_corner[row["corner"]]["laps"][int(row["lap"]) - 1]
        assert row["phase"] == lap["phase"]
        for node, value in lap["max_c"].items():
            assert float(row[f"{node} max [degC]"]) == pytest.approx(value, abs=0.006)
        assert float(row["braking_energy [kJ]"]) == pytest.approx(lap["braking_energy_j"] / 1e3, abs=1e-3)
        assert float(row["pad_thickness [mm]"]) > 0
    for row in checks:
        check = next(c for c in by_corner[row["corner"]]["checks"] if c["name"] == row["check"])
        assert float(row["margin [K]"]) == pytest.approx(check["margin_k"], abs=0.006)
        assert row["status"] == check["status"] and row["node"] == check["node"]
    assert all(" [" in h for h in laps[0] if h not in ("corner", "lap", "phase"))   # name [unit] headers
    manifest = json.loads((folder / "manifest.json").read_text())
    assert {"laps.csv", "checks.csv"} <= {f["name"] for f in manifest["files"]}
    code, _, err = cli(["run", str(SMALL), *SHRINK, "--quiet", "--csv", str(tmp_path / "laps_only.csv")])
    assert code == 0, err
    assert (tmp_path / "laps_only.csv").read_text(encoding="utf-8") == (folder / "laps.csv").read_text(encoding="utf-8")


def test_corners_side_by_side_give_the_same_json(small_runs):
    # the session's run solved its two corners one after another (the default); side by side they
    # must give the same summary to the digit
    code, out, err = cli(["run", SMALL, "--json", "--quiet", "--threads", "2", *SHRINK, *EXCEED])
    assert code == 0, err
    assert json.loads(out) == small_runs["json"]


@pytest.mark.parametrize("value", ["0", "-1", "two"])
def test_threads_must_be_a_whole_number_of_at_least_one(value):
    code, out, err = cli(["run", SMALL, "--json", "--threads", value])
    assert code == 2 and out == "" and "argument --threads: expected a whole number of at least 1" in err


def test_the_json_summary_reaches_stdout_in_one_write(monkeypatch):
    """``--json`` prints with one write (token by token, an unbuffered stdout made a system call of
    each: 260 000 for the 24-hour demo), the bytes ``json.dumps(indent=2)`` gives and a newline; a
    value JSON cannot hold raises before anything is written."""
    import sys
    from thermo.cli.stdout_json import print_json
    writes = []
    monkeypatch.setattr(sys, "stdout", type("Counting", (), {"write": lambda self, text: writes.append(text)})())
    data = {"corners": [{"name": "front", "peaks_k": [373.15, 412.5], "ok": True, "stop_time_s": None}]}
    print_json(data)
    assert writes == [json.dumps(data, indent=2) + "\n"]
    with pytest.raises(ValueError):
        print_json({"peak_k": float("nan")})
    assert len(writes) == 1
