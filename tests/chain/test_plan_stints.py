"""Plans that repeat (issue 14): [[plan.stints]] templates expanded into today's phases.

The expansion is checked against the same plan written out by hand (it must give the very same
segments), and the rules a template adds: a time-based end (the flag), pad changes every n-th
stop or when a pad is worn below a thickness, and filling the tank.
"""
from __future__ import annotations

import copy
from pathlib import Path

import numpy as np
import pytest

from chain_runs import SMALL, SMALL_RAW, SMALL_TEXT, solve_one
from thermo.chain.plan import expand_plan
from thermo.errors import ScenarioError
from thermo.scenario import load_scenario
from thermo.scenario.reader import scenario_from_dict

ROOT = Path(__file__).resolve().parents[2]
STINT = [{"type": "laps", "count": 2},
         {"type": "in_lap", "pace": 0.8, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 200},
         {"type": "pit_stop", "duration_s": 30, "refuel_kg": 10},
         {"type": "out_lap", "pace": 0.85, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 200}]
SOAK = {"type": "soak", "duration_s": 60}


def scenario(phases=(), stints=(), finish=(), overrides=()):
    raw = copy.deepcopy(SMALL_RAW)
    raw["plan"].pop("phases")
    for key, value in (("phases", phases), ("stints", stints), ("finish", finish)):
        if value:
            raw["plan"][key] = copy.deepcopy(list(value))
    return scenario_from_dict(raw, path=SMALL, text=SMALL_TEXT, overrides=list(overrides))


def template(**keys):
    return {"name": "stint", "phases": STINT, **keys}


def _same_segments(a, b):
    assert len(a) == len(b)
    for x, y in zip(a, b):
        assert (x.phase.kind, x.lap_index, x.phase.pad_change) == (y.phase.kind, y.lap_index, y.phase.pad_change)
        assert x.t_start_s == pytest.approx(y.t_start_s, abs=1e-9) and x.fuel_kg == pytest.approx(y.fuel_kg)
        np.testing.assert_array_equal(x.trace.speed_mps, y.trace.speed_mps)


def test_a_repeated_template_gives_the_segments_of_the_plan_written_out():
    by_hand = scenario(phases=[{"type": "laps", "count": 1}] + STINT * 3 + [SOAK])
    templated = scenario(phases=[{"type": "laps", "count": 1}], stints=[template(repeat=3)], finish=[SOAK])
    _same_segments(expand_plan(templated), expand_plan(by_hand))
    names = [s.phase.name for s in expand_plan(templated)]
    assert "stint 2: pit_stop" in names and names[-1] == "finish: soak"


def test_the_flag_ends_the_stint_at_the_first_lap_end_after_until_h():
    lap_s = expand_plan(scenario(phases=[{"type": "laps", "count": 1}]))[0].trace.duration_s
    until_h = 7.5 * lap_s / 3600.0          # the flag falls during a lap, in the second stint
    segments = expand_plan(scenario(stints=[template(until_h=until_h)], finish=[SOAK]))
    laps = [s for s in segments if s.lap_index]
    assert laps[-1].t_end_s >= until_h * 3600.0 > laps[-2].t_end_s
    assert segments[-1].phase.kind == "soak" and segments[-2] is laps[-1]
    # the rest of the stint in progress is skipped: no in-lap, stop or out-lap after the flag
    assert laps[-1].phase.kind == "laps" and laps[-1].phase.name.startswith("stint 2:")


def test_repeat_and_until_h_together_end_at_whichever_comes_first():
    few = expand_plan(scenario(stints=[template(repeat=2, until_h=24.0)]))
    assert sum(1 for s in few if s.phase.kind == "pit_stop") == 2


def test_pad_change_every_n_th_stop_and_refuel_full():
    stint = copy.deepcopy(STINT)
    stint[2] = {"type": "pit_stop", "duration_s": 30, "refuel_full": True}
    sc = scenario(stints=[{"name": "run", "repeat": 4, "pad_change_every": 2, "phases": stint}])
    stops = [s for s in expand_plan(sc) if s.phase.kind == "pit_stop"]
    assert [s.phase.pad_change for s in stops] == [False, True, False, True]
    assert all(s.fuel_kg == pytest.approx(sc.fuel_capacity_kg) for s in stops)


def test_pads_worn_below_a_thickness_are_changed_at_the_stop_corner_by_corner():
    stint = copy.deepcopy(STINT)
    stint[2] = {"type": "pit_stop", "duration_s": 30, "pad_change_below_mm": 19.0}
    sc = scenario(stints=[{"name": "run", "repeat": 3, "phases": stint}], finish=[SOAK],
                  overrides=[("pad_wear.wear_coefficient_mm3_per_kj", 40.0)])
    result = solve_one(sc, "front")
    changes = [entry for entry in result.facts.pad_thickness_m if entry.when != "end of run"]
    # each change is recorded with the thickness the pad had come down to, below the threshold
    assert changes and all(entry.thickness_m < 19.0e-3 for entry in changes)
    new = sc.corners[0].pad.thickness_m
    assert len(changes) < 3 or all(entry.thickness_m < new for entry in changes)
    # without the rule no pad is changed
    stint[2] = {"type": "pit_stop", "duration_s": 30}
    plain = solve_one(scenario(stints=[{"name": "run", "repeat": 3, "phases": stint}], finish=[SOAK],
                               overrides=[("pad_wear.wear_coefficient_mm3_per_kj", 40.0)]), "front")
    assert [e.when for e in plain.facts.pad_thickness_m] == ["end of run"]


@pytest.mark.parametrize("stints, finish, message", [
    ([{"name": "s", "phases": STINT + [SOAK]}], [], "[[plan.finish]]"),
    ([{"name": "s", "phases": [{"type": "pit_stop", "duration_s": 30}]}], [], "at least one lap"),
    ([{"name": "s", "repaet": 2, "phases": STINT}], [], "repeat"),
    ([{"name": "s", "until_h": 49, "phases": STINT}], [], "until_h"),
    ([{"name": "s", "phases": "laps"}], [], "list of tables"),
])
def test_template_mistakes_are_one_line_errors(stints, finish, message):
    with pytest.raises(ScenarioError) as error:
        scenario(stints=stints, finish=finish)
    assert message in str(error.value) and "\n" not in str(error.value)


def test_overrides_reach_a_template_and_its_phases():
    sc = scenario(stints=[template(repeat=3)], overrides=[("plan.stints.1.repeat", 1), ("plan.stints.1.phases.1.count", 4)])
    laps = [s for s in expand_plan(sc) if s.phase.kind == "laps"]
    assert len(laps) == 4


def test_the_24_hour_demo_is_a_screenful_and_runs_to_the_flag():
    path = ROOT / "scenarios" / "demo_24h.toml"
    plan_text = path.read_text(encoding="utf-8").split("[plan]", 1)[1].split("[pad_wear]", 1)[0]
    assert len(plan_text.strip().splitlines()) < 60
    sc = load_scenario(path)
    segments = expand_plan(sc)
    laps = [s for s in segments if s.phase.kind == "laps"]
    assert laps[-1].t_end_s >= 24 * 3600 > laps[-2].t_end_s
    assert segments[-2].phase.name == "cool-down lap" and segments[-1].phase.kind == "soak"
    assert sc.ambient.profile_s_k and min(k for _, k in sc.ambient.profile_s_k) < max(k for _, k in sc.ambient.profile_s_k) - 10
