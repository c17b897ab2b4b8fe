"""Packaging: every package listed in pyproject.toml, package data found, README set-up = .ci/run."""
from __future__ import annotations

import re
import tomllib
from importlib.resources import files
from pathlib import Path


ROOT = Path(__file__).resolve().parents[1]
PYPROJECT = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))


def test_every_package_directory_is_listed():
    listed = set(PYPROJECT["tool"]["setuptools"]["packages"])
    found = {".".join(p.parent.relative_to(ROOT).parts) for pkg in ("thermo", "lapdata")
             for p in (ROOT / pkg).rglob("__init__.py")}
    assert {"thermo", "lapdata"} <= found
    assert sorted(found - listed) == []
    assert "brakeheat_scenarios" in listed
    assert PYPROJECT["tool"]["setuptools"]["package-dir"]["brakeheat_scenarios"] == "scenarios"
    assert (ROOT / "scenarios" / "__init__.py").is_file()


def test_package_data_found_through_importlib_resources():
    materials = files("thermo.materials") / "materials.toml"
    assert "[grey_cast_iron]" in materials.read_text(encoding="utf-8")
    demo = files("brakeheat_scenarios")
    for name in ("demo.toml", "demo_circuit.toml", "demo_lap.csv"):
        assert (demo / name).is_file(), name
    assert "[[segments]]" in (demo / "demo_circuit.toml").read_text(encoding="utf-8")
    patterns = PYPROJECT["tool"]["setuptools"]["package-data"]["*"]
    assert "*.toml" in patterns and "*.csv" in patterns


def readme_setup_commands() -> list[str]:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text.split("## Set-up", 1)[1].split("\n## ", 1)[0]
    return [line.strip() for line in section.splitlines() if line.startswith("    ") and line.strip()]


def ci_commands() -> list[str]:
    lines = (ROOT / ".ci" / "run").read_text(encoding="utf-8").splitlines()
    return [line.strip() for line in lines if line.strip() and not line.lstrip().startswith("#")]


def test_readme_has_two_setup_commands():
    commands = readme_setup_commands()
    assert len(commands) == 2
    assert commands[0].endswith("pip install . && brakeheat demo")
    assert commands[1].endswith('pip install ".[test,cluster]" && ruff check . && pytest')   # lint, then tests and doctests


def test_ci_runs_readmes_test_command_word_for_word():
    commands, ci = readme_setup_commands(), ci_commands()
    assert commands[1] in ci, ci                                # the test set-up command, as written
    assert ci[-1] == commands[1]                                # and it is what CI ends with
    # README's first command (install and run the demo) is what a user types; CI runs the same
    # install without ".[test]" nowhere else, so only the venv part must match word for word
    venv = re.match(r"(python3 -m venv \.venv && \. \.venv/bin/activate) && ", commands[0])
    assert venv and ci[-1].startswith(venv.group(1))


def test_import_thermo_is_ours():
    # an unrelated PyPI package is also called 'thermo' (README "Set-up"): ours has the version and caution
    import thermo
    assert thermo.__version__ == PYPROJECT["project"]["version"]
    assert thermo.CAUTION.startswith("CAUTION:")
    assert Path(thermo.__file__).resolve().is_relative_to(ROOT)
    assert PYPROJECT["project"]["scripts"]["brakeheat"] == "thermo.cli.main:command"      # main, in a process of its own
    from thermo.cli.main import command, main
    assert callable(command) and callable(main)
