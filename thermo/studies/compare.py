"""Compare a baseline with variants: each run in full, peaks and margins against the baseline.

A variant is a set of overrides addressed by the scenario's own dotted keys (``[variants.NAME]``
tables of the scenario, or given in Python); every variant is checked before any runs.
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from lapdata.echo import has_control_characters, shown
from thermo.errors import ScenarioError

if TYPE_CHECKING:       # numpy and the network load with the first run, not with `brakeheat --help`
    from thermo.results import Results

BASELINE = "baseline"


@dataclass(frozen=True)
class Comparison:
    """The baseline and each variant, run in full.

    Attributes
    ----------
    runs : tuple of (str, Results)
        (name, results), the baseline first [-]
    """

    runs: tuple[tuple[str, Results], ...]
    rebalanced: tuple[tuple[str, dict], ...] = ()     # (variant, what --keep-bias changed), see keep_bias_plans

    def results(self, name: str) -> Results:
        """The results of one variant (or ``"baseline"``)."""
        for n, r in self.runs:
            if n == name:
                return r
        raise KeyError(f"no variant {shown(name)}; known: {', '.join(n for n, _ in self.runs)}")

    def as_dict(self) -> dict:
        """JSON-ready, as `brakeheat compare --json` prints it."""
        return comparison_dict(self.runs, dict(self.rebalanced))


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


KEEP_BIAS_CHOICES = ("balance_bar", "rear_master_cylinder")
BIAS_WARNING_POINTS = 1.0       # a variant moving the front share further than this (points) is named


def keep_bias_plans(plans, how: str, path: Path) -> tuple[list, dict]:
    """Re-balance each variant whose front share of the brake torque differs from the baseline's
    (a caliper swap), so that it is the baseline's again: by the balance bar (``how`` =
    "balance_bar") or by the rear master cylinder bore ("rear_master_cylinder"), as the override
    ``brakes.balance_bar_front_share`` or ``brakes.master_cylinder_rear_mm`` added to the variant.

    Returns the plans with those variants re-read, and per re-balanced variant what was changed:
    {"key", "from", "to", "front_share_before", "front_share_after"}. Needs ``bias = "hydraulic"``
    (a fixed share does not move with the calipers).
    """
    from thermo.chain.hydraulics import front_share, master_cylinders, scenario_calipers
    from thermo.duty.hydraulics import balance_bar_for_share, bore_diameter_m, rear_area_for_share
    from thermo.scenario import load_scenario
    if how not in KEEP_BIAS_CHOICES:
        raise ScenarioError(f"--keep-bias {shown(how)}: expected one of {', '.join(KEEP_BIAS_CHOICES)}")
    base = plans[0][1]
    if master_cylinders(base) is None:
        raise ScenarioError(f"{path}: --keep-bias needs [brakes] bias = \"hydraulic\" (with bias = \"fixed\" the "
                            "front share is given, and a caliper swap does not move it)")
    target = front_share(base)
    out, notes = [plans[0]], {}
    for name, scenario in plans[1:]:
        before = front_share(scenario)
        mc = master_cylinders(scenario)
        if abs(before - target) < 1e-9 or mc is None:
            out.append((name, scenario))
            continue
        calipers = scenario_calipers(scenario)
        if how == "balance_bar":
            key, old = "brakes.balance_bar_front_share", mc.balance_bar_front_share
            new = balance_bar_for_share(target, calipers, mc.area_front_m2, mc.area_rear_m2)
        else:
            key, old = "brakes.master_cylinder_rear_mm", bore_diameter_m(mc.area_rear_m2) * 1e3
            area = rear_area_for_share(target, calipers, mc.area_front_m2, mc.balance_bar_front_share)
            new = bore_diameter_m(area) * 1e3
        try:
            again = load_scenario(path, list(scenario.overrides) + [(key, new)])
        except ScenarioError as error:
            raise ScenarioError(f"variant '{name}': --keep-bias {how} needs {key} = {new:.4g}, which the scenario "
                                f"does not allow: {error}") from None
        out.append((name, again))
        notes[name] = {"key": key, "from": old, "to": new, "front_share_before": before,
                       "front_share_after": front_share(again)}
    return out, notes


def bias_warnings(plans, threshold_points: float = BIAS_WARNING_POINTS) -> list[str]:
    """One line per variant whose front share of the brake torque moved from the baseline's by
    more than ``threshold_points`` percentage points."""
    from thermo.chain.hydraulics import front_share
    base = front_share(plans[0][1])
    lines = []
    for name, scenario in plans[1:]:
        moved = (front_share(scenario) - base) * 100.0
        if abs(moved) > threshold_points:
            lines.append(f"variant '{name}' moves the front share of the brake torque by {moved:+.1f} points "
                         f"(from {base * 100:.1f} %): its temperatures change with the bias too; use --keep-bias "
                         "to hold the baseline's share")
    return lines


def run_comparison(plans, *, progress=None, rebalanced=None, threads: int = 1) -> Comparison:
    """Run each planned scenario in full (``progress(corner, segment)`` is called as segments finish);
    ``rebalanced``: what ``keep_bias_plans`` changed, carried into the comparison; ``threads``: corners
    solved side by side in each run (``thermo.chain.run.corner_threads``)."""
    from thermo.chain import run_scenario
    return Comparison(tuple((name, run_scenario(sc, progress=progress, threads=threads)) for name, sc in plans),
                      tuple((rebalanced or {}).items()))


def compare(path, *, variants=(), overrides=(), only=None, keep_bias=None,
            threads: int = 1) -> Comparison:
    """The baseline and each variant of a scenario file, run in full.

    Parameters
    ----------
    path : str or Path
        Scenario TOML file [-]
    variants : sequence
        More variants as [NAME, "KEY=VALUE", ...] lists [-]
    overrides : sequence
        (dotted key, value) pairs applied to every run [-]
    only : sequence of str or None
        Run only these variants [-]
    keep_bias : str or None
        "balance_bar" or "rear_master_cylinder": re-balance variants that move
        the front share back to the baseline's (``keep_bias_plans``); None: leave them [-]
    threads : int
        Corners solved side by side in each run (1: one after another) [-]

    Returns
    -------
    Comparison
        The runs, the baseline first [-]
    """
    plans = plan_comparison(Path(path), overrides, variants, only)
    rebalanced = {}
    if keep_bias is not None:
        plans, rebalanced = keep_bias_plans(plans, keep_bias, Path(path))
    return run_comparison(plans, rebalanced=rebalanced, threads=threads)


def _hydraulics_change(base: dict | None, variant: dict | None) -> dict | None:
    """Front share [points] and each corner's clamp force per bar and fluid per mm against the baseline."""
    if not base or not variant:
        return None
    corners = {}
    for name, v in variant["corners"].items():
        b = base["corners"].get(name)
        if b is not None:
            corners[name] = {key: round(v[key] - b[key], 4) for key in
                             ("clamp_force_n_per_bar", "fluid_displacement_cm3_per_mm", "piston_area_one_side_mm2")}
    return {"front_share_change_points": round((variant["front_share"] - base["front_share"]) * 100.0, 3),
            "corners": corners}


def comparison_dict(runs, rebalanced=None) -> dict:
    """JSON-ready: ``variants`` (baseline first), each with ``name`` and ``corners`` as in `run --json`,
    and ``changes``: per variant and corner, peak and margin differences against the baseline [K],
    the hydraulics' changes (front share in points, clamp force per bar, fluid per mm of piston
    travel) and, where ``--keep-bias`` re-balanced the variant, what it changed (``rebalanced``)."""
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
        changes.append({"name": name, "corners": corners,
                        "hydraulics": _hydraulics_change(base.get("hydraulics"), s.get("hydraulics")),
                        "rebalanced": (rebalanced or {}).get(name)})
    return {
        "scenario": base["scenario"], "version": base["version"], "caution": base["caution"],
        "variants": [{"name": name, **{k: v for k, v in s.items() if k not in ("caution", "version")}} for name, s in summaries],
        "changes": changes,
    }


