"""Pad wear takes the friction face: the rest of the pad keeps its temperature at its depth."""
from __future__ import annotations

import numpy as np
import pytest

from chain_runs import laps_one_at_a_time, send_laps_off_the_tables
from thermo.chain.corner_run import worn_pad_profile


def test_the_worn_slice_is_the_face_and_the_back_keeps_its_temperature():
    old_dx = np.array([1.0, 2.0, 3.0]) * 1e-3          # face first; centres 5.5, 4.0, 1.5 mm from the back
    old_t = np.array([900.0, 600.0, 300.0])
    new_dx = np.array([0.6, 2.0, 3.0]) * 1e-3          # 0.4 mm worn off the face; centres 5.3, 4.0, 1.5 mm
    new_t = worn_pad_profile(old_dx, old_t, new_dx)
    # linear between the old centres at the same depth from the backing plate (worked by hand):
    # 5.3 mm lies 1.3/1.5 of the way from 600 K (4.0 mm) to 900 K (5.5 mm)
    assert new_t == pytest.approx([600.0 + 300.0 * 1.3 / 1.5, 600.0, 300.0], rel=1e-12)
    # what is left is cooler on average than what was there: the hot face material has gone
    assert np.average(new_t, weights=new_dx) < np.average(old_t, weights=old_dx)


def test_a_lumped_pad_keeps_its_temperature():
    assert worn_pad_profile(np.array([0.02]), np.array([650.0]), np.array([0.019])) == pytest.approx([650.0])


def test_a_pad_worn_by_values_runs_as_a_pad_built_anew(monkeypatch):
    """The run wears its pads by writing the new pad's values into its own kernel arrays
    (``PadKernel``), and makes the corner's model only for its result; building the corner anew
    every lap, as the run did before, must give the same run. Demo car, layered pads worn fast
    (6 mm^3/kJ) so that the pads' edges move to another layer on the way, a pit stop with new
    pads, the fast solver."""
    import copy
    import tomllib
    from pathlib import Path

    from thermo.chain import corner_run, run_scenario
    from thermo.chain.pad_rows import PadKernel
    from thermo.chain.setup import corner_setups
    from thermo.corner.build import pad_layers
    from thermo.corner.pad_terms import pad_terms
    from thermo.scenario.reader import scenario_from_dict

    demo = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
    text = demo.read_text(encoding="utf-8")
    raw = copy.deepcopy(tomllib.loads(text))
    raw["plan"]["phases"] = [{"type": "laps", "count": 8},
                             {"type": "in_lap", "pace": 0.8, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 200},
                             {"type": "pit_stop", "duration_s": 30, "pad_change": True},
                             {"type": "laps", "count": 1}, {"type": "soak", "duration_s": 120}]
    raw.pop("uncertainty", None)
    scenario = scenario_from_dict(raw, path=demo, text=text, overrides=[
        ("pad_wear.wear_coefficient_mm3_per_kj", 6.0), ("solver.method", "fast"), ("solver.output_s", 0.0)])
    by_values = run_scenario(scenario)
    # by values, the edges moving to another layer on the way (the layer each lap's thickness puts them on)
    design, setup = scenario.corners[0], corner_setups(scenario)[0]
    pk, count = PadKernel(setup.network, setup.model), len(pad_layers(design))
    worn = [row.thickness_m for row in by_values.corners[0].facts.pad_thickness_by_lap_m]
    edges = {pad_terms(design, pad_layers(design, t, count), pk.materials, pk.disc_face_resistance, t).mid_layer
             for t in worn}
    assert len(set(worn)) > 5 and len(edges) >= 2
    built = []
    monkeypatch.setattr(corner_run, "_pad_kernel", lambda setup: None)
    monkeypatch.setattr(corner_run, "worn_corner", lambda model, thickness: built.append(thickness))
    anew = run_scenario(scenario)
    assert len(built) > 10                                  # every wear step was built anew
    for a, b in zip(by_values.corners, anew.corners):
        worn = [x.thickness_m for x in a.facts.pad_thickness_m]
        assert worn[0] < 0.6 * scenario.corners[0].pad.thickness_m or a.name == "rear"
        np.testing.assert_array_equal(a.temperatures_k, b.temperatures_k)
        np.testing.assert_array_equal(a.link_energy_j, b.link_energy_j)
        assert [c.peak_k for c in a.checks] == [c.peak_k for c in b.checks]
        assert a.facts.pad_thickness_m == b.facts.pad_thickness_m
        assert a.facts.removed_with_pad_material_j == b.facts.removed_with_pad_material_j
        assert a.facts.heat_partition_realised == b.facts.heat_partition_realised
        assert a.energy == b.energy


def test_a_segment_off_the_tables_after_wear_by_values_runs_on_the_model_of_the_pad_now(monkeypatch):
    """A segment whose state leaves a conductance table is solved by the numpy stepper on the
    corner's model; after pads worn by values (``PadKernel``) that model must be made for the pad
    as it is then. Laps 3 and 6 are sent off the tables (the kernel answers as it does there) in
    a run by values and in a run that rebuilds the corner every lap: the two must agree to the bit.
    Laps one at a time here (a stint's laps in one call stop before such a lap and solve it this way:
    tests/chain/test_chain_stint.py)."""
    import copy
    import tomllib
    from pathlib import Path

    from thermo.chain import corner_run, run_scenario
    from thermo.scenario.reader import scenario_from_dict

    demo = Path(__file__).resolve().parents[2] / "scenarios" / "demo.toml"
    text = demo.read_text(encoding="utf-8")
    raw = copy.deepcopy(tomllib.loads(text))
    raw["plan"]["phases"] = [{"type": "laps", "count": 7}]
    raw.pop("uncertainty", None)
    scenario = scenario_from_dict(raw, path=demo, text=text, overrides=[
        ("pad_wear.wear_coefficient_mm3_per_kj", 6.0), ("solver.method", "fast")])
    sent = []
    send_laps_off_the_tables(monkeypatch, (3, 6), sent)
    laps_one_at_a_time(monkeypatch)
    by_values = run_scenario(scenario)
    assert len(sent) == 8             # each corner's laps 3 and 6, by values and then on the model
    monkeypatch.setattr(corner_run, "_pad_kernel", lambda setup: None)
    monkeypatch.setattr(corner_run, "worn_corner", lambda model, thickness: None)
    anew = run_scenario(scenario)
    assert len(sent) == 12
    for a, b in zip(by_values.corners, anew.corners):
        assert a.facts.pad_thickness_m[-1].thickness_m < 0.9 * scenario.corners[0].pad.thickness_m or a.name == "rear"
        np.testing.assert_array_equal(a.temperatures_k, b.temperatures_k)
        assert a.facts.removed_with_pad_material_j == b.facts.removed_with_pad_material_j
        assert a.energy == b.energy
