"""The realised heat partition of a run: what ended in the disc, the interface's exchange included."""
from __future__ import annotations

import pytest

from chain_runs import NO_WEAR, SHORT_PLAN, small_scenario, solve_one


def test_a_fixed_split_with_the_pad_held_off_is_realised_exactly():
    # the user's fixed share and no resting contact: the sources are the only way in, so the disc
    # takes exactly that share (energy conservation)
    scenario = small_scenario(SHORT_PLAN, NO_WEAR + [("corners.front.pad.heat_partition", 0.9),
                                                     ("corners.front.pad.rest_contact_conductance_w_m2k", 0.0)])
    run = solve_one(scenario)
    assert run.facts.heat_partition_disc == 0.9
    assert run.facts.heat_partition_realised == pytest.approx(0.9, abs=1e-9)


def test_the_resting_contact_carries_heat_from_the_hotter_side():
    # second law: between applications heat crosses the resting contact from the hotter face. A
    # lumped pad (small.toml, layers = 1) stays cooler than the disc's face layer, so the disc loses
    # heat to it; a layered pad's thin face layer, heated by its fixed share while braking and
    # slow to cool (low effusivity), comes off the brake hotter than the disc's face, which the
    # vanes and the bulk of the disc cool fast, so the disc gains
    lumped = small_scenario(SHORT_PLAN, NO_WEAR + [("corners.front.pad.heat_partition", 0.9)])
    layered = small_scenario(SHORT_PLAN, NO_WEAR + [("corners.front.pad.heat_partition", 0.9),
                                                    ("corners.front.pad.layers", 0)])
    assert solve_one(lumped).facts.heat_partition_realised < 0.9
    assert solve_one(layered).facts.heat_partition_realised > 0.9
