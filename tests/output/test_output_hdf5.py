"""The HDF5 results file: exact round trip, and a layout that plain h5py reads by path."""
import dataclasses
import math

import h5py
import numpy as np
import pytest

from thermo.output import OutputError, read_results_hdf5, write_results_hdf5


def assert_same(a, b, where="results"):
    """Every field equal; every array bit-identical with the same dtype and shape."""
    assert type(a) is type(b), where
    if isinstance(a, np.ndarray):
        assert a.dtype == b.dtype and a.shape == b.shape, where
        assert np.array_equal(a, b, equal_nan=a.dtype.kind == "f"), where
        assert a.tobytes() == b.tobytes(), where
    elif dataclasses.is_dataclass(a):
        for f in dataclasses.fields(a):
            assert_same(getattr(a, f.name), getattr(b, f.name), f"{where}.{f.name}")
    elif isinstance(a, (tuple, list)):
        assert len(a) == len(b), where
        for i, (x, y) in enumerate(zip(a, b)):
            assert_same(x, y, f"{where}[{i}]")
    elif isinstance(a, dict):
        assert list(a) == list(b), where
        for k in a:
            assert_same(a[k], b[k], f"{where}.{k}")
    elif isinstance(a, float) and math.isnan(a):
        assert math.isnan(b), where
    else:
        assert a == b, where


def test_round_trip_exact(results, tmp_path):
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    back = read_results_hdf5(path)
    assert_same(results, back)
    # spot checks that the comparison itself bites
    assert back.overrides == (("corners.front.piston.shim_thickness_mm", "1.0"), ("corners.front.pad.material", '"pad = odd"'))
    assert back.corners[1].name == "rear_left"
    assert back.corners[0].temperatures_k.shape == (2401, 8)


def test_assert_same_detects_one_bit(results):
    corner = results.corners[0]
    flipped = corner.temperatures_k.copy()
    flipped[100, 3] = np.nextafter(flipped[100, 3], np.inf)
    other = dataclasses.replace(results, corners=(dataclasses.replace(corner, temperatures_k=flipped),
                                                  results.corners[1]))
    with pytest.raises(AssertionError):
        assert_same(results, other)


def test_round_trip_variants(factory, tmp_path):
    """No stop, float32 arrays, every fact given (one NaN), laps with different node sets, no links, no laps."""
    from thermo.results import LapPadThickness
    corner = factory.corner(stop=False, dt=30.0, facts=factory.facts(
        pad_thickness_by_lap_m=(LapPadThickness(1, 0.0249), LapPadThickness(2, 0.0248)),
        heat_partition_realised=float("nan"), warnings=("pad worn", "disc hot"), correlations_used=("a", "b")))
    laps = list(corner.laps)
    laps[1] = dataclasses.replace(laps[1], max_k={"disc": 500.0}, min_k={"disc": 400.0, "pad": 350.0})
    corner = dataclasses.replace(corner, laps=tuple(laps), time_s=corner.time_s.astype(np.float32))
    bare = dataclasses.replace(factory.corner("rear_left", dt=30.0), link_names=(), link_groups=(),
                               link_flows_w=np.zeros((41, 0)), link_energy_j=np.zeros(0), laps=(), phases=(),
                               checks=(), facts=factory.facts(pad_thickness_m=(), link_to_boundary=()))
    results = dataclasses.replace(factory.results(), corners=(corner, bare), warnings=(), references=(),
                                  scenario_text="")
    path = tmp_path / "variants.h5"
    write_results_hdf5(results, path)
    back = read_results_hdf5(path)
    assert_same(results, back)
    assert back.corners[0].stop_time_s is None
    assert math.isnan(back.corners[0].facts.heat_partition_realised)
    assert back.corners[0].facts.pad_thickness_by_lap_m[1].lap == 2


def test_facts_are_stored_under_the_keys_users_read(results, tmp_path):
    """``extras_json`` keeps the keys README documents for it and for ``run --json``'s ``extras``."""
    import json
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    with h5py.File(path, "r") as f:
        block = json.loads(f["corners/front_left"].attrs["extras_json"])
    assert block == {"pad_thickness_m": [{"when": "start", "thickness_m": 0.025}, {"when": "end", "thickness_m": 0.0195}],
                     "pad_minimum_thickness_m": 0.006, "link_to_boundary": [True] * 5 + [False] * 2,
                     "heat_partition_disc": 0.9, "removed_with_pad_material_j": 0.0, "initial_temperature_k": 303.15,
                     "warnings": []}


def test_files_from_before_the_later_facts_are_read(results, tmp_path):
    """Files written before pad_thickness_by_lap_m, heat_partition_realised and correlations_used
    existed read with those facts None, and write back as they were."""
    import json
    from thermo.results import LapPadThickness
    corner = dataclasses.replace(results.corners[0], facts=dataclasses.replace(
        results.corners[0].facts, pad_thickness_by_lap_m=(LapPadThickness(1, 0.02),), heat_partition_realised=0.93,
        correlations_used=("air_density",)))
    path = tmp_path / "old.h5"
    write_results_hdf5(dataclasses.replace(results, corners=(corner,)), path)
    with h5py.File(path, "r+") as f:
        g = f["corners/front_left"]
        block = json.loads(g.attrs["extras_json"])
        for key in ("pad_thickness_by_lap_m", "heat_partition_realised", "correlations_used"):
            del block[key]
        g.attrs["extras_json"] = json.dumps(block)
    facts = read_results_hdf5(path).corners[0].facts
    assert facts.pad_thickness_by_lap_m is None and facts.heat_partition_realised is None and facts.correlations_used is None
    assert facts.pad_thickness_m == results.corners[0].facts.pad_thickness_m
    again = tmp_path / "again.h5"
    write_results_hdf5(read_results_hdf5(path), again)
    with h5py.File(path, "r") as f, h5py.File(again, "r") as g:
        assert json.loads(g["corners/front_left"].attrs["extras_json"]) == json.loads(f["corners/front_left"].attrs["extras_json"])


@pytest.mark.parametrize("change, message", [
    (lambda b: {**b, "colour": "red"}, "unknown key 'colour'"),
    (lambda b: {k: v for k, v in b.items() if k != "warnings"}, "key 'warnings' is missing"),
    (lambda b: {**b, "heat_partition_disc": "high"}, "heat_partition_disc: expected a number"),
    (lambda b: {**b, "link_to_boundary": [1, 0]}, "link_to_boundary: expected true or false"),
    (lambda b: {**b, "pad_thickness_m": [{"when": "end"}]}, "pad_thickness_m: expected objects with key 'thickness_m'"),
    (lambda b: [1, 2], "expected a JSON object of corner facts"),
])
def test_bad_facts_in_a_file_are_named(results, tmp_path, change, message):
    import json
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    with h5py.File(path, "r+") as f:
        g = f["corners/rear_left"]
        g.attrs["extras_json"] = json.dumps(change(json.loads(g.attrs["extras_json"])))
    with pytest.raises(OutputError, match=f"run.h5: '/corners/rear_left' extras_json.*{message}"):
        read_results_hdf5(path)


def test_plain_h5py_reads_by_path(results, tmp_path, factory):
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    corner = results.corners[0]
    with h5py.File(path, "r") as f:
        assert f.attrs["format"] == "brakeheat-results" and f.attrs["format_version"] == 2
        assert f.attrs["scenario_text"] == results.scenario_text
        assert list(f.attrs["references"]) == list(results.references)
        g = f["corners/front_left"]
        assert g["time_s"].attrs["units"] == "s"
        assert g["temperature_k"].attrs["units"] == "K"
        assert list(g["temperature_k"].attrs["nodes"]) == list(factory.NODES)
        fluid = list(g["temperature_k"].attrs["nodes"]).index("fluid")
        np.testing.assert_array_equal(g["temperature_k"][:, fluid], corner.temperature("fluid"))
        assert "temperature" not in g          # version 2: no per-node copies
        np.testing.assert_array_equal(g["link_flow_w"][()], corner.link_flows_w)
        assert list(g["link_flow_w"].attrs["groups"]) == list(corner.link_groups)
        assert g["link_flow_w"].attrs["units"] == "W"
        assert "first end" in g["link_flow_w"].attrs["sign_convention"]
        assert g["energy"].attrs["heat_in_j"] == 1.2e6
        assert g["checks/fluid_boiling_wet"].attrs["status"] == "exceeded"
        assert g["margins/fluid_boiling_wet"][()] == pytest.approx(-15.0)
        assert g["margins/fluid_boiling_wet"].attrs["units"] == "K"
        assert g["laps/max_k"].shape == (10, 8)
        assert list(g["laps/index"][()]) == list(range(1, 11))
        assert list(g["phases/kind"].asstr()[()]) == ["out_lap", "safety_car", "pit_stop", "soak"]
        assert g.attrs["stop_time_s"] == factory.STOP_S
        # large arrays are compressed (lossless gzip), small ones stored plainly
        assert g["temperature_k"].compression == "gzip"
        assert g["link_energy_j"].compression is None


def test_not_ours_is_rejected(tmp_path):
    other = tmp_path / "other.h5"
    with h5py.File(other, "w") as f:
        f.attrs["format"] = "something-else"
    with pytest.raises(OutputError, match="expected 'brakeheat-results'"):
        read_results_hdf5(other)
    text = tmp_path / "notes.h5"
    text.write_text("not hdf5")
    with pytest.raises(OutputError, match="cannot be opened"):
        read_results_hdf5(text)


def test_newer_format_version_rejected(results, tmp_path):
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    with h5py.File(path, "r+") as f:
        f.attrs["format_version"] = 3
    with pytest.raises(OutputError, match="format_version 3"):
        read_results_hdf5(path)


def test_missing_dataset_named(results, tmp_path):
    path = tmp_path / "run.h5"
    write_results_hdf5(results, path)
    with h5py.File(path, "r+") as f:
        del f["corners/rear_left/link_energy_j"]
    with pytest.raises(OutputError, match="/corners/rear_left/link_energy_j"):
        read_results_hdf5(path)


@pytest.mark.parametrize("change, message", [
    (lambda c: dataclasses.replace(c, node_names=c.node_names[:-1] + ("hub/bearing",)), "'hub/bearing'"),
    (lambda c: dataclasses.replace(c, checks=c.checks + c.checks[:1]), "appears twice"),
    (lambda c: dataclasses.replace(c, temperatures_k=c.temperatures_k[:, :5]), "temperatures_k has shape"),
])
def test_unwritable_results_raise(results, tmp_path, change, message):
    bad = dataclasses.replace(results, corners=(change(results.corners[0]),))
    with pytest.raises(OutputError, match=message):
        write_results_hdf5(bad, tmp_path / "bad.h5")
    assert list(tmp_path.iterdir()) == []


def test_a_run_without_flows_stores_energies_per_lap_and_phase(results, tmp_path):
    """Version 2: link flows only when stored; each lap's and phase's link energies are kept."""
    from dataclasses import replace
    corner = results.corners[0]
    n = len(corner.link_names)
    laps = tuple(replace(lap, link_energy_j=tuple(float(i + k) for k in range(n))) for i, lap in enumerate(corner.laps))
    phases = tuple(replace(p, link_energy_j=tuple(2.0 * k for k in range(n))) for p in corner.phases)
    lean = replace(results, corners=(replace(corner, link_flows_w=None, laps=laps, phases=phases),) + results.corners[1:])
    path = tmp_path / "lean.h5"
    write_results_hdf5(lean, path)
    with h5py.File(path, "r") as f:
        g = f["corners/front_left"]
        assert "link_flow_w" not in g
        assert g["laps/link_energy_j"].shape == (len(laps), n)
        assert list(g["link_energy_j"].attrs["links"]) == list(corner.link_names)
    back = read_results_hdf5(path)
    assert back.corners[0].link_flows_w is None
    assert back.corners[0].laps == laps and back.corners[0].phases == phases
    assert back.corners[0].link_names == corner.link_names


def test_version_1_files_are_still_read(results, tmp_path):
    """A file in the version-1 layout (per-node copies, no per-lap link energies) reads as before."""
    path = tmp_path / "v1.h5"
    write_results_hdf5(results, path)
    with h5py.File(path, "r+") as f:
        f.attrs["format_version"] = 1
        for corner in results.corners:
            g = f[f"corners/{corner.name}"]
            copies = g.create_group("temperature")
            for j, node in enumerate(corner.node_names):
                copies.create_dataset(node, data=corner.temperatures_k[:, j])
    back = read_results_hdf5(path)
    assert_same(results, back)
