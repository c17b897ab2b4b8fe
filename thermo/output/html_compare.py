"""``report.html`` of a comparison: the baseline and every variant side by side on one page.

Built from the single-run page's pieces (its style sheet, escaping, tables and caution box, in
:mod:`thermo.output.html_report`), with the same promises: no network access, no scripts, no
external fonts or styles, plots as inline SVG, every text that comes from a scenario or the
command line (variant names, overrides, warnings, the scenario text) escaped, the caution at the
top and at the bottom. It reads the comparison's JSON-ready dict (``Comparison.as_dict()``, as
``compare --json`` prints it) and the runs' results; it never runs a model.
"""
from __future__ import annotations

import datetime

from thermo import CAUTION
from thermo.output.analysis import COMPARED_PEAK_NODES
from thermo.output.atomic import atomic_write
from thermo.output.html_report import (
    PAGE_END, caution_box, escape_html, html_list, html_overrides, html_table, page_head,
)
from thermo.results import Results

STATUS_WORDS = {"ok": "ok", "caution": "CAUTION", "exceeded": "EXCEEDED"}


def variant_overrides(runs: list[tuple[str, Results]]) -> list[tuple[str, list]]:
    """(name, the overrides that make each variant differ from the baseline), baseline excluded.

    A variant's overrides are the baseline's (the command line's ``--set``) followed by its own
    (and what ``--keep-bias`` added); the baseline's are taken off the front.
    """
    base = list(runs[0][1].overrides)
    out = []
    for name, results in runs[1:]:
        own = list(results.overrides)
        own = own[len(base):] if own[:len(base)] == base else [p for p in own if p not in base]
        out.append((name, own))
    return out


def _side_by_side(data: dict, ci: int) -> str:
    """Each check's margin and status, then each node's peak, per variant (change in brackets)."""
    variants = data["variants"]
    base = variants[0]["corners"][ci]
    names = [v["name"] for v in variants]
    rows, classes = [], []
    for k, check in enumerate(base["checks"]):
        cells = [f"margin {check['name']} [K]", check["node"]]
        statuses = []
        for v in variants:
            c = v["corners"][ci]["checks"][k]
            change = "" if v is variants[0] else f" ({c['margin_k'] - check['margin_k']:+.1f})"
            cells.append(f"{c['margin_k']:+.1f}{change} {STATUS_WORDS.get(c['status'], c['status'])}")
            statuses.append(c["status"])
        rows.append(cells)
        classes.append(next((s for s in ("exceeded", "caution") if s in statuses), ""))
    for node in [n for n in COMPARED_PEAK_NODES if n in base["peak_c"]]:
        cells = [f"peak {node} [degC]", node, f"{base['peak_c'][node]:.1f}"]
        for v in variants[1:]:
            value = v["corners"][ci]["peak_c"][node]
            cells.append(f"{value:.1f} ({value - base['peak_c'][node]:+.1f})")
        rows.append(cells)
        classes.append("")
    return html_table(["quantity", "node read"] + names, rows, numeric=tuple(range(2, 2 + len(names))),
                      row_classes=classes)


def _gains(data: dict, ci: int) -> str:
    """Margin gained [K] on each check against the baseline, one column per variant."""
    base = data["variants"][0]["corners"][ci]
    changes = data["changes"]
    if not changes:
        return "<p>No variants: nothing to compare with the baseline.</p>"
    rows = [[check["name"], check["node"]] + [f"{change['corners'][ci]['margin_change_k'][check['name']]:+.1f}"
                                              for change in changes]
            for check in base["checks"]]
    if not rows:
        return "<p>No checks were set for this corner.</p>"
    return html_table(["check", "node read"] + [c["name"] for c in changes], rows,
                      numeric=tuple(range(2, 2 + len(changes))))


def _variants_table(runs: list[tuple[str, Results]], data: dict) -> str:
    rebalanced = {c["name"]: c.get("rebalanced") for c in data["changes"]}
    rows = []
    for name, own in variant_overrides(runs):
        r = rebalanced.get(name)
        note = "" if not r else (f"--keep-bias: {r['key']} {r['from']:.4g} -> {r['to']:.4g} (front share "
                                 f"{r['front_share_before'] * 100:.2f} % -> {r['front_share_after'] * 100:.2f} %)")
        if not own:
            rows.append([name, "(none)", "", note])
        for i, (key, value) in enumerate(own):
            rows.append([name if i == 0 else "", key, value, note if i == 0 else ""])
    if not rows:
        return "<p>No variants were run: the page shows the baseline alone.</p>"
    return html_table(["variant", "key", "value", "re-balanced"], rows)


def _hydraulics(data: dict) -> str:
    hyd = [v.get("hydraulics") for v in data["variants"]]
    if not all(hyd):
        return "<p>Not recorded in these results.</p>"
    names = [v["name"] for v in data["variants"]]
    base = hyd[0]
    share_rows = [[name, f"{h['front_share'] * 100:.2f}", "" if i == 0 else
                   f"{(h['front_share'] - base['front_share']) * 100:+.2f}"] for i, (name, h) in enumerate(zip(names, hyd))]
    parts = ["<h3>Front share of the brake torque</h3>",
             html_table(["variant", "front share [%]", "change [points]"], share_rows, numeric=(1, 2))]
    keys = (("clamp_force_n_per_bar", "clamp force [N/bar]", ".1f"),
            ("fluid_displacement_cm3_per_mm", "fluid [cm3/mm piston travel]", ".3f"),
            ("piston_area_one_side_mm2", "piston area one side [mm2]", ".0f"))
    rows = []
    for corner, b in base["corners"].items():
        for i, (name, h) in enumerate(zip(names, hyd)):
            c = h["corners"].get(corner)
            if c is None:
                continue
            cells = [corner, name]
            for key, _, fmt in keys:
                cells.append(format(c[key], fmt) if i == 0 else f"{c[key]:{fmt}} ({c[key] - b[key]:+{fmt}})")
            rows.append(cells)
    parts += ["<h3>Calipers per corner (change against the baseline in brackets)</h3>",
              html_table(["corner", "variant"] + [label for _, label, _ in keys], rows, numeric=(2, 3, 4))]
    return "".join(parts)


def _figures(runs: list[tuple[str, Results]]) -> str:
    from thermo.output.analysis import margin_gains
    from thermo.output.plots import COMPARE_NODES as PLOTTED, comparison_overlay_figure, margin_gain_figure, svg_text
    parts = [f"<figure>{svg_text(comparison_overlay_figure(runs, c.name))}</figure>" for c in runs[0][1].corners
             if any(n in c.node_names for n in PLOTTED)]
    if len(runs) > 1 and any(per_node for per_corner in margin_gains(runs, PLOTTED).values()
                             for per_node in per_corner.values()):
        parts.append(f"<figure>{svg_text(margin_gain_figure(runs))}</figure>")
    return "".join(parts) or "<p>No plots: the corners have no fluid or bearing node.</p>"


def comparison_html(data: dict, runs: list[tuple[str, Results]], *, warnings=(),
                    generated: datetime.datetime | None = None, plots: bool = True) -> str:
    """The comparison as one HTML document (see the module notes).

    Parameters
    ----------
    data : dict
        ``Comparison.as_dict()``: the variants (baseline first) and their changes [-]
    runs : list of (str, Results)
        The same runs, baseline first (overrides, scenario text, plots) [-]
    warnings : sequence of str
        Warnings of the comparison itself (a variant that moves the bias) [-]
    generated : datetime or None
        When the page was made (None: now) [-]
    plots : bool
        Embed the overlay and margin-gain plots as inline SVG [-]
    """
    base = runs[0][1]
    when = (generated or datetime.datetime.now(datetime.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")
    caution = caution_box(data.get("caution") or CAUTION)
    solvers = sorted({f"{r.solver} ({r.solver_status})" for _, r in runs})
    all_warnings = list(warnings) + [f"{name}: {w}" for name, r in runs for w in r.warnings]
    references = list(dict.fromkeys(ref for _, r in runs for ref in r.references))
    parts = [*page_head(f"brakeheat comparison: {data['scenario']}"), caution,
             f"<p>brakeheat {escape_html(data['version'])}, solver {escape_html(', '.join(solvers))}, "
             f"report made {escape_html(when)}. {len(runs) - 1} variant(s) against the baseline. Peaks in degC, "
             "margins in K (margin = limit - peak); margin gained = the variant's margin less the baseline's, "
             "positive is margin gained.</p>",
             "<h2>Variants and their overrides</h2>", _variants_table(runs, data)]
    for ci, corner in enumerate(data["variants"][0]["corners"]):
        parts += [f"<h2>Corner {escape_html(corner['name'])}</h2>",
                  "<h3>Side by side (change against the baseline in brackets)</h3>", _side_by_side(data, ci),
                  "<h3>Margin gained against the baseline [K]</h3>", _gains(data, ci)]
    if plots:
        parts += ["<h2>Plots</h2>", _figures(runs)]
    parts += ["<h2>Hydraulics</h2>", _hydraulics(data),
              "<h2>Warnings</h2>", html_list(all_warnings),
              "<h2>What was run</h2>", "<h3>Overrides on top of the scenario file, for every run</h3>",
              html_overrides(base.overrides),
              "<h3>Scenario file</h3>", f"<pre>{escape_html(base.scenario_text)}</pre>",
              "<h2>References</h2>", html_list(references),
              caution, PAGE_END]
    return "\n".join(parts) + "\n"


def write_comparison_html(data: dict, runs: list[tuple[str, Results]], path, **options) -> None:
    """``comparison_html`` written to ``path`` atomically."""
    text = comparison_html(data, runs, **options)
    with atomic_write(path) as handle:
        handle.write(text)
