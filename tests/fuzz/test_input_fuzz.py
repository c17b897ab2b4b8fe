"""Fuzz the readers of scenarios, track files and --set overrides (issue 13).

Every generated case must either load or raise the project's own error (``BrakeheatError`` or
``LapDataError``) with a one-line message of printable text; nothing else may escape (no
TypeError, OverflowError, RecursionError, MemoryError, no hang). The lap-trace reader has its
own fuzz tests in tests/lapdata_tests/test_lapdata_fuzz.py. Bounded: a few hundred cases per
reader, well under a minute in all.
"""
from __future__ import annotations

import shutil
from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from lapdata.errors import LapDataError
from lapdata.track import read_track_toml
from thermo.chain import expand_plan
from thermo.errors import BrakeheatError
from thermo.scenario import load_scenario
from thermo.scenario.overrides import parse_override
from thermo.scenario.keys_table import sections

DATA = Path(__file__).resolve().parents[1] / "data"
SMALL = (DATA / "small.toml").read_text(encoding="utf-8")
TRACK = (DATA / "short_circuit.toml").read_text(encoding="utf-8")
FUZZ = settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture],
                database=None)

# what a hostile or careless file holds: numbers at and beyond every range, wrong types, markup,
# control characters, deep nesting, enormous literals
TOKENS = ["", "=", "\n", "[", "]", "[[", "]]", "{", "}", '"', "'", "#", ",", ".", "0", "-1", "1e308", "-1e308",
          "1e-300", "inf", "nan", "-inf", "true", "9" * 30, "9" * 5000, "[" * 300 + "]" * 300, '"\\u0000"',
          '"\\u001b[31m"', '"a\\nb"', '"$\\\\frac{$"', "[1, 2]", "[[1, 2], [3]]", '["laps"]', "{a = 1}",
          "1_000", "0x10", "2026-12-02", "1e9", "-300", "0.0", "1e12"]
VALUES = st.one_of(
    st.sampled_from(TOKENS),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(min_value=-(2 ** 70), max_value=2 ** 70).map(str),
    st.text(max_size=12).map(lambda s: '"' + s.replace("\\", "\\\\").replace('"', '\\"') + '"'),
)
KEYS = sorted({(section, name) for section, table in sections() for name in table})


def _override_key(section: str, name: str) -> str:
    """A dotted override key for a row of the key tables (NAME -> front, DUCT -> main, phases -> 1)."""
    if section.startswith("[[plan.phases]]"):
        return f"plan.phases.1.{name}"
    return f"{section.strip('[]').replace('NAME', 'front').replace('DUCT', 'main')}.{name}"


def assert_one_line_project_error(error: Exception) -> None:
    message = str(error)
    assert isinstance(error, (BrakeheatError, LapDataError)), f"{type(error).__name__}: {message[:200]}"
    assert "\n" not in message and "\r" not in message, message[:300]
    assert message.isprintable(), repr(message[:300])


def _load(folder: Path, scenario_text: str, track_text: str = TRACK, overrides=()):
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "short_circuit.toml").write_text(track_text, encoding="utf-8", errors="surrogatepass")
    path = folder / "scenario.toml"
    path.write_text(scenario_text, encoding="utf-8", errors="surrogatepass")
    try:
        scenario = load_scenario(path, overrides)
        expand_plan(scenario)
    except Exception as error:              # noqa: BLE001 - the point: which kind of error
        assert_one_line_project_error(error)


def _mangle(text: str, edits) -> str:
    for position, cut, token in edits:
        position = min(position, len(text))
        text = text[:position] + token + text[position + cut:]
    return text


EDITS = st.lists(st.tuples(st.integers(0, 10_000), st.integers(0, 12), st.sampled_from(TOKENS)), min_size=1, max_size=5)


@FUZZ
@given(edits=EDITS)
def test_mangled_scenario_files(tmp_path_factory, edits):
    _load(tmp_path_factory.mktemp("s"), _mangle(SMALL, edits))


@FUZZ
@given(key=st.sampled_from(KEYS), value=VALUES)
def test_every_key_given_any_value_in_the_file(tmp_path_factory, key, value):
    # the value lands in the scenario file itself, through the same path as an override
    section, name = key
    try:
        override = parse_override(f"{_override_key(section, name)}={value}")
    except Exception as error:              # noqa: BLE001
        assert_one_line_project_error(error)
        return
    _load(tmp_path_factory.mktemp("k"), SMALL, overrides=[override])


@FUZZ
@given(text=st.text(max_size=200))
def test_any_set_argument(text):
    try:
        parse_override(text)
    except Exception as error:              # noqa: BLE001
        assert_one_line_project_error(error)


@FUZZ
@given(edits=EDITS)
def test_mangled_track_files(tmp_path_factory, edits):
    folder = tmp_path_factory.mktemp("t")
    path = folder / "track.toml"
    path.write_text(_mangle(TRACK, edits), encoding="utf-8", errors="surrogatepass")
    try:
        read_track_toml(path)
    except Exception as error:              # noqa: BLE001
        assert_one_line_project_error(error)
    # and through a scenario, where the built lap meets the car
    _load(folder / "via_scenario", SMALL, _mangle(TRACK, edits))


@FUZZ
@given(data=st.binary(max_size=3000))
def test_arbitrary_bytes_as_scenario_and_track(tmp_path_factory, data):
    folder = tmp_path_factory.mktemp("b")
    for name in ("scenario.toml", "track.toml"):
        (folder / name).write_bytes(data)
    for reader in (load_scenario, read_track_toml):
        try:
            reader(folder / ("scenario.toml" if reader is load_scenario else "track.toml"))
        except Exception as error:          # noqa: BLE001
            assert_one_line_project_error(error)


def test_the_unmangled_inputs_load(tmp_path):
    # guards the fuzz: the seeds are valid, so the mangled cases fail for their edits
    shutil.copy(DATA / "short_circuit.toml", tmp_path / "short_circuit.toml")
    (tmp_path / "scenario.toml").write_text(SMALL, encoding="utf-8")
    assert expand_plan(load_scenario(tmp_path / "scenario.toml"))
    assert _override_key("[corners.NAME.ducts.DUCT]", "inlet_area_mm2") == "corners.front.ducts.main.inlet_area_mm2"
