"""What several commands share: the bundled demo's path and the --set / --solver overrides."""
from __future__ import annotations

from pathlib import Path

from thermo.errors import ScenarioError

DEMO_SCENARIO = "demo.toml"


def demo_scenario_path() -> Path:
    """The bundled demo scenario, installed with the package (or the repo's scenarios/ folder)."""
    try:
        from importlib.resources import files
        path = Path(str(files("brakeheat_scenarios") / DEMO_SCENARIO))
        if path.is_file():
            return path
    except ModuleNotFoundError:
        pass
    path = Path(__file__).resolve().parents[2] / "scenarios" / DEMO_SCENARIO
    if not path.is_file():
        raise ScenarioError(f"{path}: the bundled demo scenario is missing; reinstall brakeheat")
    return path


def collect_overrides(texts) -> list:
    from thermo.scenario.overrides import parse_override
    return [parse_override(t) for t in texts]


def overrides_with_solver(args) -> list:
    overrides = collect_overrides(args.overrides)
    if args.solver:
        overrides.append(("solver.method", args.solver))
    return overrides
