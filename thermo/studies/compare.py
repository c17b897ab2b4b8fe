"""Compare a baseline with variants: each run in full, peaks and margins against the baseline.

A variant is a set of overrides addressed by the scenario's own dotted keys (``[variants.NAME]``
tables of the scenario, or given in Python); every variant is checked before any runs.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from lapdata.echo import has_control_characters, shown
from thermo.errors import ScenarioError
from thermo.results import Results

BASELINE = "baseline"


@dataclass(frozen=True)
class Comparison:
    """The baseline and each variant, run in full.

    Attributes
    ----------
    runs : tuple of (str, Results)  (name, results), the baseline first [-]
    """

    runs: tuple[tuple[str, Results], ...]

    def results(self, name: str) -> Results:
        """The results of one variant (or ``"baseline"``)."""
        for n, r in self.runs:
            if n == name:
                return r
        raise KeyError(f"no variant {shown(name)}; known: {', '.join(n for n, _ in self.runs)}")

    def as_dict(self) -> dict:
        """JSON-ready, as `brakeheat compare --json` prints it."""
        return comparison_dict(self.runs)


def variant_overrides(scenario_raw: dict, cli_variants, only, source: str) -> list[tuple[str, list]]:
    """(name, overrides) of every variant to run, scenario ones first, in file order.

    ``cli_variants``: more variants as [NAME, "KEY=VALUE", ...] lists (a later one of the same name
    replaces the scenario's); ``only``: run just these variants (None: all).
    """
    from thermo.scenario.overrides import parse_override
    declared = scenario_raw.get("variants", {})
    if not isinstance(declared, dict):
        raise ScenarioError(f"{source}: [variants] must hold tables [variants.NAME]")
    out = []
    for name, table in declared.items():
        if not isinstance(table, dict):
            raise ScenarioError(f"{source}: [variants.{name}] must be a table of \"dotted.key\" = value overrides")
        out.append((name, list(table.items())))
    for item in cli_variants:
        name, pairs = item[0], item[1:]
        if "=" in name:
            raise ScenarioError(f"--variant {shown(' '.join(item))}: the first word is the variant's name, then KEY=VALUE pairs")
        if not name.strip() or has_control_characters(name):
            raise ScenarioError(f"--variant {shown(name)}: expected a name of plain text (no line breaks, escapes "
                                "or control characters)")
        if not pairs:
            raise ScenarioError(f"--variant {name}: give at least one KEY=VALUE override")
        out = [(n, o) for n, o in out if n != name]
        out.append((name, [parse_override(p, f"--variant {name}") for p in pairs]))
    if name_clash := [n for n, _ in out if n == BASELINE]:
        raise ScenarioError(f"{source}: a variant may not be called '{name_clash[0]}'")
    if only:
        known = [n for n, _ in out]
        for name in only:
            if name not in known:
                from thermo.scenario.convert import suggestion
                raise ScenarioError(f"--only {name}: no such variant{suggestion(name, known)}; known: {', '.join(known) or 'none'}")
        out = [(n, o) for n, o in out if n in only]
    return out


def plan_comparison(path: Path, overrides=(), variants=(), only=None) -> list[tuple[str, object]]:
    """(name, Scenario) of the baseline and each variant, every one read and checked before any runs.

    ``overrides`` apply to the baseline and every variant alike; ``variants`` adds [NAME,
    "KEY=VALUE", ...] lists to the scenario's own ``[variants.NAME]`` tables.
    """
    from thermo.scenario import load_scenario

    base = load_scenario(path, overrides)
    plans = [(BASELINE, base)]
    for name, extra in variant_overrides(base.raw, variants, only, str(path)):
        try:
            plans.append((name, load_scenario(path, list(overrides) + list(extra))))
        except ScenarioError as error:
            raise ScenarioError(f"variant '{name}': {error}") from None
    return plans


def run_comparison(plans, *, progress=None) -> Comparison:
    """Run each planned scenario in full (``progress(corner, segment)`` is called as segments finish)."""
    from thermo.chain import run_scenario
    return Comparison(tuple((name, run_scenario(sc, progress=progress)) for name, sc in plans))


def compare(path, *, variants=(), overrides=(), only=None) -> Comparison:
    """The baseline and each variant of a scenario file, run in full.

    Parameters
    ----------
    path : str or Path  Scenario TOML file [-]
    variants : sequence  More variants as [NAME, "KEY=VALUE", ...] lists [-]
    overrides : sequence  (dotted key, value) pairs applied to every run [-]
    only : sequence of str or None  Run only these variants [-]

    Returns
    -------
    Comparison  The runs, the baseline first [-]
    """
    return run_comparison(plan_comparison(Path(path), overrides, variants, only))


def comparison_dict(runs) -> dict:
    """JSON-ready: ``variants`` (baseline first), each with ``name`` and ``corners`` as in `run --json`,
    and ``changes``: per variant and corner, peak and margin differences against the baseline [K]."""
    from thermo.output.summary import summary_dict
    summaries = [(name, summary_dict(res)) for name, res in runs]
    base = summaries[0][1]
    changes = []
    for name, s in summaries[1:]:
        corners = []
        for bc, vc in zip(base["corners"], s["corners"]):
            corners.append({
                "name": vc["name"],
                "peak_change_k": {n: round(vc["peak_c"][n] - bc["peak_c"][n], 3) for n in vc["peak_c"] if n in bc["peak_c"]},
                "margin_change_k": {c["name"]: round(c["margin_k"] - b["margin_k"], 3)
                                    for c, b in zip(vc["checks"], bc["checks"])},
            })
        changes.append({"name": name, "corners": corners})
    return {
        "scenario": base["scenario"], "version": base["version"], "caution": base["caution"],
        "variants": [{"name": name, **{k: v for k, v in s.items() if k not in ("caution", "version")}} for name, s in summaries],
        "changes": changes,
    }


