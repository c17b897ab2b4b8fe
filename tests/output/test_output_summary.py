"""The JSON summary: the promised keys (a contract with users' scripts) and their values."""
import dataclasses
import json
import math

import numpy as np
import pytest

from thermo.output import summary_dict, write_summary_json
from thermo.output.summary import summary_json

TOP_KEYS = {"scenario", "version", "solver", "solver_status", "caution", "overrides", "warnings", "references", "corners"}
CORNER_KEYS = {"name", "peak_c", "peak_time_s", "checks", "energy", "heat_paths", "soak", "laps", "extras"}
CHECK_KEYS = {"name", "node", "limit_c", "peak_c", "margin_k", "status", "peak_time_s", "source", "still_rising"}
ENERGY_KEYS = {"heat_in_j", "stored_j", "lost_j", "balance_rel_error"}
SOAK_KEYS = {"peak_c", "peak_after_stop_s", "worst_after_stop", "still_rising"}
LAP_KEYS = {"index", "phase", "t_start_s", "t_end_s", "braking_energy_j", "max_c", "min_c"}
# BIPM, The International System of Units (SI Brochure, 9th ed., 2019), 2.3.1: t/degC = T/K - 273.15
K_AT_0C = 273.15


def test_contract_keys(results, factory):
    summary = summary_dict(results)
    assert TOP_KEYS <= set(summary)
    assert len(summary["corners"]) == 2
    for corner in summary["corners"]:
        assert CORNER_KEYS <= set(corner)
        assert set(corner["peak_c"]) == set(factory.NODES) == set(corner["peak_time_s"])
        assert set(corner["energy"]) >= ENERGY_KEYS
        assert SOAK_KEYS <= set(corner["soak"])
        assert set(corner["soak"]["peak_c"]) == set(factory.NODES)
        assert [set(c) for c in corner["checks"]] == [CHECK_KEYS] * 3
        assert all(set(lap) >= LAP_KEYS for lap in corner["laps"])


def test_header_values(results):
    summary = summary_dict(results)
    assert summary["scenario"] == "invented_car_at_invented_circuit"
    assert summary["solver"] == "LSODA" and summary["solver_status"] == "success"
    assert summary["caution"].startswith("CAUTION")
    assert summary["warnings"] == list(results.warnings)
    assert summary["references"] == list(results.references)
    # the run says which overrides it applied on top of its scenario text
    assert summary["overrides"] == [{"key": "corners.front.piston.shim_thickness_mm", "value": "1.0"},
                                    {"key": "corners.front.pad.material", "value": '"pad = odd"'}]


def test_peaks_equal_max_of_series(results, factory):
    for corner, out in zip(results.corners, summary_dict(results)["corners"]):
        for j, node in enumerate(corner.node_names):
            series = corner.temperatures_k[:, j]
            assert out["peak_c"][node] == pytest.approx(series.max() - K_AT_0C, abs=0.005)
            assert out["peak_time_s"][node] == pytest.approx(corner.time_s[np.argmax(series)], abs=0.005)
    # analytic: a Gaussian bump of height `rise` over 30 degC ambient peaks at 30 + rise, at its centre
    front = summary_dict(results)["corners"][0]
    for node, (rise, t0, _) in factory.BUMPS.items():
        assert front["peak_c"][node] == pytest.approx(30.0 + rise, abs=0.005)
        assert front["peak_time_s"][node] == pytest.approx(t0, abs=0.005)


def test_checks_margin_is_limit_minus_peak(results):
    checks = summary_dict(results)["corners"][0]["checks"]
    for check in checks:
        assert check["margin_k"] == pytest.approx(check["limit_c"] - check["peak_c"], abs=0.011)
    by_name = {c["name"]: c for c in checks}
    # FMVSS No. 116 (49 CFR 571.116) S5.1.1/S5.1.2: DOT 4 ERBP 230 degC dry, 155 degC wet
    assert by_name["fluid_boiling_dry"]["limit_c"] == pytest.approx(230.0)
    assert by_name["fluid_boiling_wet"]["limit_c"] == pytest.approx(155.0)
    # fluid peak 30 + 140 = 170 degC (analytic bump height)
    assert by_name["fluid_boiling_dry"]["margin_k"] == pytest.approx(60.0)
    assert by_name["fluid_boiling_wet"]["margin_k"] == pytest.approx(-15.0)
    assert by_name["fluid_boiling_wet"]["status"] == "exceeded"
    assert by_name["bearing_grease"]["status"] == "caution"
    assert by_name["bearing_grease"]["source"] == "common practice"


def test_energy_and_heat_paths(results, factory):
    corner = summary_dict(results)["corners"][0]
    assert corner["energy"]["heat_in_j"] == 1.2e6
    assert corner["energy"]["balance_rel_error"] == 0.0
    paths = corner["heat_paths"]
    # internal_* groups carry heat inside the corner and are no way out
    assert set(paths) == {"disc_convection", "disc_radiation", "caliper_convection", "upright_convection", "duct"}
    out_j = {g: e for _, g, e in factory.LINKS if not g.startswith("internal")}
    total = sum(out_j.values())
    for group, share in paths.items():
        assert share == pytest.approx(out_j[group] / total, abs=1e-4)
    assert sum(paths.values()) == pytest.approx(1.0, abs=1e-3)


def test_balance_error_reported(factory):
    from dataclasses import replace
    from thermo.results import EnergyBalance
    r = factory.results()
    bad = replace(r.corners[0], energy=EnergyBalance(heat_in_j=1000.0, stored_j=400.0, lost_j=590.0))
    r = replace(r, corners=(bad,))
    assert summary_dict(r)["corners"][0]["energy"]["balance_rel_error"] == pytest.approx(0.01)


def test_soak_values(results, factory):
    soak = summary_dict(results)["corners"][0]["soak"]
    stop = factory.STOP_S
    for node in ("fluid", "piston", "hub", "upright", "bearing"):
        rise, t0, _ = factory.BUMPS[node]
        assert soak["peak_after_stop_s"][node] == pytest.approx(t0 - stop, abs=0.005)
        assert soak["peak_c"][node] == pytest.approx(30.0 + rise, abs=0.005)
    # the caliper peaked before the stop: after it, the highest value is the one at the stop
    rise, t0, width = factory.BUMPS["caliper"]
    assert soak["peak_after_stop_s"]["caliper"] == 0.0
    assert soak["peak_c"]["caliper"] == pytest.approx(30.0 + rise * math.exp(-((stop - t0) / width) ** 2), abs=0.005)
    assert soak["worst_after_stop"] == ["fluid", "piston", "hub", "upright", "bearing"]
    assert list(soak["peak_c"])[:6] == ["fluid", "piston", "caliper", "hub", "upright", "bearing"]


def test_no_soak_key_without_stop(factory):
    corner = summary_dict(factory.results(stop=False))["corners"][0]
    assert "soak" not in corner


def test_laps_values(results):
    corner, out = results.corners[0], summary_dict(results)["corners"][0]
    assert [lap["index"] for lap in out["laps"]] == list(range(1, len(corner.laps) + 1))
    for lap, lap_out in zip(corner.laps, out["laps"]):
        inside = (corner.time_s >= lap.t_start_s) & (corner.time_s <= lap.t_end_s)
        fluid = corner.temperature("fluid")[inside]
        assert lap_out["max_c"]["fluid"] == pytest.approx(fluid.max() - K_AT_0C, abs=0.005)
        assert lap_out["min_c"]["fluid"] == pytest.approx(fluid.min() - K_AT_0C, abs=0.005)
        assert lap_out["phase"] == lap.phase
        assert lap_out["braking_energy_j"] == pytest.approx(lap.braking_energy_j)


def test_extras_block_of_the_facts_and_nan_never_emitted(factory):
    from dataclasses import replace

    from thermo.results import LapPadThickness
    facts = factory.facts(pad_thickness_by_lap_m=(LapPadThickness(1, 0.024),), heat_partition_realised=float("nan"),
                          warnings=("pad worn",), correlations_used=("air_density",))
    r = factory.results(facts=facts)
    bad_check = replace(r.corners[0].checks[0], peak_time_s=float("nan"))
    r = replace(r, corners=(replace(r.corners[0], checks=(bad_check,)),))
    text = summary_json(r)

    def refuse(constant):  # RFC 8259 section 6: NaN and Infinity are not JSON numbers
        raise AssertionError(f"non-standard JSON constant {constant}")
    parsed = json.loads(text, parse_constant=refuse)
    extras_out = parsed["corners"][0]["extras"]
    # the keys and their order are README's ("What a run produces"); a NaN share becomes null
    assert list(extras_out) == ["pad_thickness_m", "pad_thickness_by_lap_m", "pad_minimum_thickness_m", "link_to_boundary",
                                "heat_partition_disc", "heat_partition_realised", "removed_with_pad_material_j",
                                "initial_temperature_k", "warnings", "correlations_used"]
    assert extras_out["pad_thickness_m"] == [{"when": "start", "thickness_m": 0.025}, {"when": "end", "thickness_m": 0.0195}]
    assert extras_out["pad_thickness_by_lap_m"] == [{"lap": 1, "thickness_m": 0.024}]
    assert extras_out["heat_partition_realised"] is None and extras_out["warnings"] == ["pad worn"]
    assert parsed["corners"][0]["checks"][0]["peak_time_s"] is None


def test_write_summary_json(results, tmp_path):
    path = tmp_path / "run.json"
    write_summary_json(results, path)
    assert json.loads(path.read_text(encoding="utf-8")) == summary_dict(results)
    assert [p.name for p in tmp_path.iterdir()] == ["run.json"]


def test_still_rising_flags_in_the_json(results, factory):
    # the fixture's bumps all peak and fall inside the soak: nothing is still rising
    front = summary_dict(results)["corners"][0]
    assert front["soak"]["still_rising"] == []
    assert [c["still_rising"] for c in front["checks"]] == [False] * 3
    rising = summary_dict(dataclasses.replace(results, corners=(factory.rising_fluid_corner(),)))["corners"][0]
    assert rising["soak"]["still_rising"] == ["fluid"]
    by_name = {c["name"]: c for c in rising["checks"]}
    assert by_name["fluid_boiling_dry"]["still_rising"] and not by_name["bearing_grease"]["still_rising"]
    assert json.loads(summary_json(dataclasses.replace(results, corners=(factory.rising_fluid_corner(),))))
