"""Every bad-scenario rule raises a typed error with a one-line message naming the file and key.

The rules are the project's own contract (README "The scenario file", CONVENTIONS.md "Scenarios
and data": unknown keys are errors with a suggestion, missing keys name their section).
"""
from __future__ import annotations

import pytest

from lapdata.errors import LapDataError
from thermo.chain import expand_plan
from thermo.errors import ScenarioError
from thermo.scenario import load_scenario
from thermo.scenario.overrides import parse_override
from scenario_cases import CASES, SMALL, write_case

ERRORS = {"ScenarioError": ScenarioError, "LapDataError": LapDataError}


@pytest.mark.parametrize("case", CASES, ids=[c.id for c in CASES])
def test_bad_scenario_raises_one_line_naming_file_and_key(case, tmp_path):
    path = write_case(case, tmp_path)
    with pytest.raises(ERRORS[case.error]) as info:
        scenario = load_scenario(path, overrides=list(case.overrides))
        assert case.after_load, f"{case.id}: load_scenario accepted the file"
        expand_plan(scenario)
    message = str(info.value)
    assert "\n" not in message
    assert str(tmp_path) in message.split(":")[0], message    # the file comes first
    for fragment in case.fragments:
        assert fragment in message, f"{fragment!r} not in {message!r}"
    assert message.count(str(path)) <= 1, message               # the file is named once, not twice


def test_the_unedited_file_loads(tmp_path):
    # guards the cases above: each fails because of its edit, not because the copy is broken
    from scenario_cases import Case
    scenario = load_scenario(write_case(Case("none", ()), tmp_path))
    assert [c.name for c in scenario.corners] == ["front", "rear"]
    assert len(expand_plan(scenario)) == 3 + 1 + 1 + 2 + 1


def test_missing_file_and_missing_section(tmp_path):
    with pytest.raises(ScenarioError, match=r"nope\.toml: no such scenario file"):
        load_scenario(tmp_path / "nope.toml")
    text = SMALL.read_text(encoding="utf-8")
    start, end = text.index("[car]"), text.index("[brakes]")
    path = tmp_path / "no_car.toml"
    path.write_text(text[:start] + text[end:], encoding="utf-8")
    with pytest.raises(ScenarioError, match=r"no_car\.toml: missing section \[car\]"):
        load_scenario(path)


@pytest.mark.parametrize("text, fragment", [
    ("car.mass_kg", "expected KEY=VALUE"),
    ("=12", "the key must be dotted names"),
    ("car..mass_kg=1", "the key must be dotted names"),
    ("car.mass_kg=[1,{]", "cannot read the value"),
])
def test_bad_override_syntax(text, fragment):
    with pytest.raises(ScenarioError) as info:
        parse_override(text)
    assert fragment in str(info.value) and str(info.value).startswith("--set")
    assert "\n" not in str(info.value)


def test_override_into_a_value_is_rejected():
    with pytest.raises(ScenarioError, match=r"override car\.mass_kg\.x: 'car\.mass_kg' is a value, not a table"):
        load_scenario(SMALL, overrides=[("car.mass_kg.x", 1)])
