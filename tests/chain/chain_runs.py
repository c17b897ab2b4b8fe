"""Short runs of the small test scenario for the chain tests: one corner solved, plans replaced.

``small_scenario(phases, overrides)`` reads tests/data/small.toml with its [[plan.phases]]
replaced by ``phases`` (so a test runs only the laps it needs) and dotted-key overrides applied;
``solve_one(scenario, corner)`` runs the whole chain (plan, duty, network, solver) for ONE corner,
which is what the chain's run_scenario does per corner, at half the cost of solving both.
"""
from __future__ import annotations

import copy
import tomllib
from pathlib import Path

import numpy as np

from thermo.chain.plan import expand_plan
from thermo.chain.run import corner_duties, solve_corner
from thermo.chain.setup import corner_brakes
from thermo.scenario.reader import scenario_from_dict
from thermo.solver.settings import SolverSettings

DATA = Path(__file__).resolve().parents[1] / "data"
SMALL = DATA / "small.toml"
SMALL_TEXT = SMALL.read_text(encoding="utf-8")
SMALL_RAW = tomllib.loads(SMALL_TEXT)

# two race laps and a short soak: enough to heat every node, a few seconds per corner
SHORT_PLAN = [{"type": "laps", "count": 2}, {"type": "soak", "duration_s": 120}]
# a multi-lap stint with an in-lap, a pit stop with a pad change, one more lap and a short soak
STINT_PLAN = [{"type": "laps", "count": 2},
              {"type": "in_lap", "pace": 0.8, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 200},
              {"type": "pit_stop", "duration_s": 30, "pad_change": True, "refuel_kg": 10},
              {"type": "laps", "count": 1},
              {"type": "soak", "duration_s": 60}]
NO_WEAR = [("pad_wear.enabled", False)]


def small_scenario(phases=None, overrides=(), soak_sample_s=None):
    """The small scenario with its phases replaced (None keeps them) and overrides applied.

    The chain tests compare series row by row, so every solver row is stored (``output_s`` 0)
    unless an override says otherwise."""
    overrides = [("solver.output_s", 0.0)] + list(overrides)
    raw = copy.deepcopy(SMALL_RAW)
    if phases is not None:
        raw["plan"]["phases"] = copy.deepcopy(list(phases))
    if soak_sample_s is not None:
        raw["plan"]["soak_sample_s"] = soak_sample_s
    return scenario_from_dict(raw, path=SMALL, text=SMALL_TEXT, overrides=list(overrides))


def solve_one(scenario, corner="front", method=None, segments=None):
    """CornerResult of one corner over the scenario's plan (the chain's own functions)."""
    segments = expand_plan(scenario) if segments is None else segments
    brakes = corner_brakes(scenario)
    duties = [corner_duties(scenario, seg, brakes) for seg in segments]
    settings = SolverSettings(method=method or scenario.solver.method, rtol=scenario.solver.rtol,
                              atol_k=scenario.solver.atol_k)
    design = next(d for d in scenario.corners if d.name == corner)
    return solve_corner(scenario, design, segments, duties, settings)


def send_laps_off_the_tables(monkeypatch, laps, sent: list) -> None:
    """Make the kernel answer, for ``laps`` (lap numbers) of every corner, as it does when a state
    leaves a conductance table (``run_compiled`` returns None), in ``CornerRun`` and in the fast
    solver alike; each such answer's phase is appended to ``sent``."""
    from thermo.chain import corner_run
    from thermo.solver import fast

    ends = tuple(f" lap {lap}" for lap in laps)

    def off_on_laps(real):
        def run(knet, inputs, T0, settings, out_t, phase):
            if phase.endswith(ends):
                sent.append(phase)
                return None
            return real(knet, inputs, T0, settings, out_t, phase)
        return run
    monkeypatch.setattr(corner_run, "run_compiled", off_on_laps(corner_run.run_compiled))
    monkeypatch.setattr(fast, "run_compiled", off_on_laps(fast.run_compiled))


def laps_one_at_a_time(monkeypatch) -> None:
    """``CornerRun.advance_laps`` one lap at a time (``advance``), as the run went before a stint's
    laps went to the kernel in one call."""
    from thermo.chain import corner_run

    monkeypatch.setattr(corner_run.CornerRun, "advance_laps",
                        lambda self, segments, duties: [self.advance(s, d) for s, d in zip(segments, duties)])


def assert_same_run(a, b) -> None:
    """Two ``Results`` the same to the bit, corner by corner: series, link energies, laps, phases,
    checks, energy balance and facts (pad thickness by lap and stint, removed heat, partition,
    warnings)."""
    assert [x.name for x in a.corners] == [y.name for y in b.corners]
    for x, y in zip(a.corners, b.corners):
        np.testing.assert_array_equal(x.time_s, y.time_s)
        np.testing.assert_array_equal(x.temperatures_k, y.temperatures_k)
        np.testing.assert_array_equal(x.link_energy_j, y.link_energy_j)
        assert x.laps == y.laps
        assert x.phases == y.phases
        assert x.checks == y.checks
        assert x.energy == y.energy
        assert x.facts == y.facts
    assert a.warnings == b.warnings
