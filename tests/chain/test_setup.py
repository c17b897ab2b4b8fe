"""The one corner set-up step (thermo.chain.setup): each corner built once by run and settle, its
heat partition from the design alone, one settings conversion."""
from __future__ import annotations

import pytest

from chain_runs import NO_WEAR, SHORT_PLAN, small_scenario
from thermo.chain import corner_run, run, setup
from thermo.chain.setup import corner_brakes, corner_setup, corner_setups
from thermo.errors import ScenarioError
from thermo.solver.settings import SolverSettings


@pytest.fixture
def build_count(monkeypatch):
    """Counts the corner builds of the set-up step, per corner name; a rebuild of a worn pad
    (CornerRun) fails the test."""
    counts: dict[str, int] = {}
    real = setup.build_corner

    def counted(design, *args, **kwargs):
        counts[design.name] = counts.get(design.name, 0) + 1
        return real(design, *args, **kwargs)

    def no_rebuild(*args, **kwargs):
        raise AssertionError("a corner was rebuilt outside the set-up step")
    monkeypatch.setattr(setup, "build_corner", counted)
    monkeypatch.setattr(corner_run, "build_corner", no_rebuild)
    return counts


def test_a_run_builds_each_corner_once(build_count):
    scenario = small_scenario(SHORT_PLAN, NO_WEAR)      # no wear: the pads are never rebuilt
    results = run.run_scenario(scenario)
    assert build_count == {"front": 1, "rear": 1}
    assert [c.name for c in results.corners] == ["front", "rear"]


def test_settle_builds_only_the_corners_asked_for_once(build_count):
    from thermo.studies.settle import settle
    settled = settle(small_scenario(SHORT_PLAN, NO_WEAR), corners=["rear"])
    assert build_count == {"rear": 1} and [s.corner for s in settled] == ["rear"]


def test_heat_partition_from_the_design_is_the_built_models():
    """The duty step's split (no network built) is the one the network was built with."""
    scenario = small_scenario(SHORT_PLAN, NO_WEAR)
    for brake, built in zip(corner_brakes(scenario), corner_setups(scenario)):
        assert brake.name == built.name
        assert brake.partition == built.model.heat_partition == built.heat_partition
        assert 0.5 < brake.partition < 1.0        # the disc takes most of the heat (Newcomb & Spurr 1967)


def test_settings_converted_once_from_the_scenario_unless_given():
    scenario = small_scenario(SHORT_PLAN, [("solver.method", "fast"), ("solver.max_stride_samples", 4)])
    setups = corner_setups(scenario)
    assert all(s.settings == scenario.solver.settings() for s in setups)
    assert setups[0].settings.max_stride == 4 and setups[0].grid == setups[1].grid
    own = SolverSettings(method="Radau")
    assert corner_setup(scenario, scenario.corners[1], own).settings is own
    assert [s.name for s in corner_setups(scenario, ["rear"], own)] == ["rear"]


def test_an_unknown_corner_is_named():
    with pytest.raises(ScenarioError, match="no corner named 'middle' \\(corners: front, rear\\)"):
        corner_setups(small_scenario(SHORT_PLAN), ["middle"])
