"""What several commands share: the bundled demo's path, the options every command that runs a
scenario takes (declared once here: ``add_common_options``), and the --set / --solver overrides."""
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


def add_common_options(p, *, solver: bool = True, json_what: str = "the report", quiet: bool = True,
                       out_help: str | None = None) -> None:
    """The options commands share, declared once: ``--set`` (repeatable), ``--solver``, ``--json``,
    ``--out DIR`` (its help says what the command writes) and ``--quiet``; ``solver``, ``quiet``
    and ``out_help`` (None: no --out) leave out those a command has no use for."""
    p.add_argument("--set", metavar="KEY=VALUE", action="append", default=[], dest="overrides",
                   help="override one scenario key, e.g. --set corners.front.piston.type=vented (repeatable)")
    if solver:
        p.add_argument("--solver", metavar="METHOD", help="override [solver] method (fast, LSODA, BDF, Radau)")
    p.add_argument("--json", action="store_true", help=f"print one JSON object on stdout instead of {json_what}")
    if out_help is not None:
        p.add_argument("--out", metavar="DIR", help=out_help)
    if quiet:
        p.add_argument("--quiet", action="store_true", help="no progress indication (never shown with --json or off a terminal)")


def threads_count(text: str) -> int:
    """--threads: a whole number of at least 1."""
    import argparse
    if not text.isdigit() or int(text) < 1:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 1, got {text!r}")
    return int(text)


def add_threads_option(p) -> None:
    """``--threads N``: how many corners a run solves side by side (``thermo.chain.run.corner_threads``)."""
    p.add_argument("--threads", type=threads_count, default=1, metavar="N",
                   help="corners solved side by side, up to N (default 1: one after another); less wall time, "
                        "more CPU time; the results are the same to the bit whatever N")
