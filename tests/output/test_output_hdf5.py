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
    """No stop, float32 arrays, awkward extras, laps with different node sets, no links, no laps."""
    corner = factory.corner(stop=False, dt=30.0, extras={
        "pad_thickness_m": (0.025, 0.0195), "wear_per_lap_m": np.arange(3, dtype=np.float32) * 1e-5,
        "flag": True, "none": None, "nan": float("nan"), "count": np.int64(7), "nested": [{"a": (1, 2)}]})
    laps = list(corner.laps)
    laps[1] = dataclasses.replace(laps[1], max_k={"disc": 500.0}, min_k={"disc": 400.0, "pad": 350.0})
    corner = dataclasses.replace(corner, laps=tuple(laps), time_s=corner.time_s.astype(np.float32))
    bare = dataclasses.replace(factory.corner("rear_left", dt=30.0), link_names=(), link_groups=(),
                               link_flows_w=np.zeros((41, 0)), link_energy_j=np.zeros(0), laps=(), phases=(),
                               checks=(), extras={})
    results = dataclasses.replace(factory.results(), corners=(corner, bare), warnings=(), references=(),
                                  scenario_text="")
    path = tmp_path / "variants.h5"
    write_results_hdf5(results, path)
    back = read_results_hdf5(path)
    assert_same(results, back)
    assert back.corners[0].stop_time_s is None
    assert back.corners[0].extras["count"].dtype == np.int64


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
