"""Energy balance of whole runs, with pad wear and a pad change: heat in = stored + lost.

First law over the corner: the friction heat put in equals the rise of the enthalpy of every
node plus the heat carried to the air, plus the enthalpy carried away in worn and changed pad
material. Each term is re-derived here from the outputs, not taken from the run's own sum.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from chain_runs import STINT_PLAN, small_scenario, solve_one
from thermo.corner.build import build_corner
from thermo.materials import get_material
from thermo.network import HeatCapacity


def _final_model(scenario, result):
    design = scenario.corners[0]
    thickness = result.facts.pad_thickness_m[-1].thickness_m
    return build_corner(replace(design, pad=replace(design.pad, thickness_m=thickness)), grid=None)


def _enthalpy(model, result, row):
    """Sum of node enthalpies from the output temperatures at one output row (layers = 1)."""
    return sum(node.heat_capacity.enthalpy(result.temperature(node.name)[row]) for node in model.network.nodes)


def test_stint_energy_balance_below_1e_5(stint_run):
    assert stint_run.energy.balance_rel_error < 1e-5
    assert stint_run.facts.removed_with_pad_material_j > 0.0


def test_heat_in_is_the_braking_energy_of_the_laps(stint_run):
    laps = sum(lap.braking_energy_j for lap in stint_run.laps)
    assert len(stint_run.laps) == 4          # two laps, the in-lap, one lap after the stop
    # the solver integrates the heat input as a state, so it matches the duty's trapezoid integral
    # to its tolerance (rtol 1e-6, atol 1e-4 K x heat capacity; about 7e-6 here), not to rounding
    assert stint_run.energy.heat_in_j == pytest.approx(laps, rel=1e-5)


def test_balance_rebuilt_from_outputs_and_link_energies(stint_scenario, stint_run):
    r = stint_run
    initial = build_corner(stint_scenario.corners[0], grid=None)
    final = _final_model(stint_scenario, r)
    stored = _enthalpy(final, r, -1) - _enthalpy(initial, r, 0)
    to_air = sum(e for e, out in zip(r.link_energy_j, r.facts.link_to_boundary) if out)
    removed = r.facts.removed_with_pad_material_j
    assert stored == pytest.approx(r.energy.stored_j, rel=1e-9)
    assert r.energy.heat_in_j - stored - to_air - removed == pytest.approx(0.0, abs=1e-5 * r.energy.heat_in_j)


def test_pad_change_removes_the_enthalpy_of_the_old_pads():
    """Wear off: what leaves with the pads at the stop is the old pads' and backing plates' heat
    above a new pair at ambient, from their temperatures when the car came in."""
    scenario = small_scenario(STINT_PLAN, [("pad_wear.enabled", False)])
    r = solve_one(scenario)
    assert r.energy.balance_rel_error < 1e-5
    pit = next(p for p in r.phases if p.kind == "pit_stop")
    row = int(np.searchsorted(r.time_s, pit.t_start_s))
    assert r.time_s[row] == pytest.approx(pit.t_start_s)
    model = build_corner(scenario.corners[0], grid=None)
    amb = scenario.ambient.temperature_k
    expected = sum(node.heat_capacity.enthalpy(r.temperature(node.name)[row]) - node.heat_capacity.enthalpy(amb)
                   for node in model.network.nodes if node.name in ("pad", "backing_plate"))
    assert expected > 1e4
    assert r.facts.removed_with_pad_material_j == pytest.approx(expected, rel=1e-9)
    # and the new pads start the next stint at ambient
    assert r.temperature("pad")[row + 1] < r.temperature("pad")[row]


def test_worn_material_carries_its_own_enthalpy():
    """One lap with wear: removed = (worn volume) rho_pad h_pad(T_pad at the end of the lap)."""
    scenario = small_scenario([{"type": "laps", "count": 1}], [("pad_wear.wear_coefficient_mm3_per_kj", 5.0)])
    r = solve_one(scenario)
    t0 = scenario.corners[0].pad.thickness_m
    t1 = r.facts.pad_thickness_m[-1].thickness_m
    assert t1 < t0
    pad = get_material("pad_semi_metallic")
    worn_kg = (t0 - t1) * 2 * scenario.corners[0].pad.area_m2 * pad.density_kg_m3
    specific = HeatCapacity(1.0, tuple(pad.specific_heat_table[0]), tuple(pad.specific_heat_table[1]))
    expected = worn_kg * float(specific.enthalpy(r.temperature("pad")[-1]))
    assert r.facts.removed_with_pad_material_j == pytest.approx(expected, rel=1e-9)
    assert r.energy.balance_rel_error < 1e-5
