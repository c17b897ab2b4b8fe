"""``report.html``: one self-contained page a team can share and print.

No network access, no scripts, no external fonts or styles: the plots are inline SVG, the style
sheet is in the page. Every text that comes from a scenario (names, phases, the scenario text,
overrides, warnings) is escaped, so a name holding HTML shows as text. The caution stands at the
top and at the bottom.
"""
from __future__ import annotations

import datetime
import html

from lapdata.units import kelvin_to_celsius
from thermo import CAUTION
from thermo.output.analysis import heat_path_shares, soak_rows
from thermo.output.atomic import atomic_write
from thermo.results import CornerResult, Results

STYLE = """
body { font-family: sans-serif; margin: 1.5em; color: #111; max-width: 78em; }
h1 { font-size: 1.5em; } h2 { font-size: 1.25em; border-bottom: 1px solid #999; margin-top: 1.6em; }
h3 { font-size: 1.05em; }
table { border-collapse: collapse; margin: 0.5em 0 1em 0; font-size: 0.85em; }
th, td { border: 1px solid #bbb; padding: 0.2em 0.5em; text-align: left; vertical-align: top; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.exceeded td { background: #f6d5cc; } tr.caution td { background: #faf0c8; }
.caution-box { border: 2px solid #D55E00; padding: 0.6em; background: #fff5ee; font-weight: bold; }
pre { background: #f4f4f4; padding: 0.6em; font-size: 0.8em; white-space: pre-wrap; }
figure { margin: 0.5em 0; } svg { max-width: 100%; height: auto; }
@media print { h2 { page-break-before: auto; } figure, table { page-break-inside: avoid; } }
"""


def escape_html(value) -> str:
    """``value`` as text that shows literally in HTML, in an element or an attribute."""
    return html.escape(str(value), quote=True)


PAGE_END = "</body></html>"


def page_head(title: str) -> list[str]:
    """The opening lines of a page: doctype, the escaped title, the style sheet, and ``title`` as h1."""
    return ["<!DOCTYPE html>", '<html lang="en"><head><meta charset="utf-8">',
            f"<title>{escape_html(title)}</title>", f"<style>{STYLE}</style></head><body>",
            f"<h1>{escape_html(title)}</h1>"]


def caution_box(text: str = CAUTION) -> str:
    """The caution, boxed; every page carries it at the top and at the bottom."""
    return f'<p class="caution-box">{escape_html(text)}</p>'


def html_list(items) -> str:
    """An unordered list of escaped items, or "None." when there are none."""
    items = list(items)
    return "<ul>" + "".join(f"<li>{escape_html(i)}</li>" for i in items) + "</ul>" if items else "<p>None.</p>"


def html_overrides(pairs) -> str:
    """(key, value) overrides as a list of ``key = value`` lines in code, or "None."."""
    pairs = list(pairs)
    if not pairs:
        return "<p>None.</p>"
    return "<ul>" + "".join(f"<li><code>{escape_html(k)} = {escape_html(v)}</code></li>" for k, v in pairs) + "</ul>"


def _c(kelvin) -> str:
    return "" if kelvin is None else f"{kelvin_to_celsius(float(kelvin)):.1f}"


def html_table(headers, rows, numeric=(), row_classes=None) -> str:
    """A table of escaped cells; the columns numbered in ``numeric`` right-aligned, ``row_classes``
    (one class name or "" per row) marks rows such as "exceeded" or "caution"."""
    head = "".join(f"<th>{escape_html(h)}</th>" for h in headers)
    body = []
    for i, row in enumerate(rows):
        cls = f' class="{escape_html(row_classes[i])}"' if row_classes and row_classes[i] else ""
        cells = "".join(f'<td class="num">{escape_html(v)}</td>' if j in numeric else f"<td>{escape_html(v)}</td>"
                        for j, v in enumerate(row))
        body.append(f"<tr{cls}>{cells}</tr>")
    return f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(body)}</tbody></table>"


def _verdicts(corner: CornerResult) -> str:
    rows = [[c.name, c.node, _c(c.limit_k), _c(c.peak_k), f"{c.margin_k:+.1f}", c.status,
             f"{c.peak_time_s:.1f}", c.source] for c in corner.checks]
    return html_table(["check", "node read", "limit [degC]", "peak [degC]", "margin [K]", "status", "peak at [s]",
                   "source of the limit"], rows, numeric=(2, 3, 4, 6),
                  row_classes=[c.status if c.status in ("exceeded", "caution") else "" for c in corner.checks])


def _laps(corner: CornerResult) -> str:
    if not corner.laps:
        return "<p>No laps recorded.</p>"
    nodes = [n for n in corner.node_names if n in corner.laps[0].max_k]
    thickness = {row.lap: row.thickness_m for row in corner.facts.pad_thickness_by_lap_m or ()}
    rows = [[lap.index, lap.phase] + [_c(lap.max_k.get(n)) for n in nodes]
            + [f"{lap.braking_energy_j / 1e3:.0f}", "" if lap.index not in thickness else f"{thickness[lap.index] * 1e3:.2f}"]
            for lap in corner.laps]
    return html_table(["lap", "phase"] + [f"{n} max [degC]" for n in nodes] + ["braking [kJ]", "pad [mm]"], rows,
                  numeric=tuple(range(2, len(nodes) + 4)))


def _soak(corner: CornerResult) -> str:
    rows = soak_rows(corner)
    if rows is None:
        return "<p>The run has no stop.</p>"
    table = html_table(["node", "peak after the stop [degC]", "after the stop [s]", "run peak [degC]", "note"],
                   [[r.node, _c(r.peak_k), f"{r.after_stop_s:.0f}", _c(r.run_peak_k),
                     "; ".join((["worst of the run came after the stop"] if r.worst_after_stop else [])
                               + (["still rising at the end of the soak: run a longer soak"] if r.still_rising else []))]
                    for r in rows], numeric=(1, 2, 3))
    return f"<p>The car stops at {float(corner.stop_time_s):.1f} s.</p>{table}"


def _pads(corner: CornerResult) -> str:
    facts = corner.facts
    rows = [[row.when, f"{row.thickness_m * 1e3:.2f}"] for row in facts.pad_thickness_m]
    if not rows:
        return "<p>No pad thickness recorded.</p>"
    note = f"<p>Minimum thickness {facts.pad_minimum_thickness_m * 1e3:.1f} mm.</p>"
    return html_table(["stint ends at", "pad thickness [mm]"], rows, numeric=(1,)) + note


def _energy(corner: CornerResult) -> str:
    e = corner.energy
    shares = heat_path_shares(corner)
    balance = html_table(["heat in [kJ]", "stored [kJ]", "lost [kJ]", "relative error [-]"],
                     [[f"{e.heat_in_j / 1e3:.1f}", f"{e.stored_j / 1e3:.1f}", f"{e.lost_j / 1e3:.1f}",
                       f"{e.balance_rel_error:.2e}"]], numeric=(0, 1, 2, 3))
    paths = html_table(["heat path", "share of the heat that left [%]"],
                   [[group.replace("_", " "), f"{100 * share:.1f}"] for group, share in shares.items()], numeric=(1,))
    return balance + paths


def _hydraulics(h: dict | None) -> str:
    if not h:
        return "<p>Not recorded in these results.</p>"
    rows = [[name, c["calipers"], f"{c['piston_area_one_side_mm2']:.0f}", f"{c['clamp_force_n_per_bar']:.1f}",
             f"{c['brake_torque_nm_per_bar']:.2f}", f"{c['fluid_displacement_cm3_per_mm']:.3f}",
             f"{c['leading_trailing_area_ratio']:.3f}"] for name, c in h["corners"].items()]
    head = (f"<p>Front share of the brake torque {100 * h['front_share']:.1f} % ({escape_html(h['bias'])} bias). "
            "Rigid hydraulics: line and caliper compliance and seal roll-back are not modelled.</p>")
    return head + html_table(["corner", "calipers", "piston area one side [mm2]", "clamp force [N/bar]",
                          "torque [N m/bar]", "fluid [cm3/mm]", "leading/trailing"], rows, numeric=(1, 2, 3, 4, 5, 6))


def _figures(results: Results, svg: list[str] | None = None) -> str:
    from thermo.output.plots import run_figures, svg_text
    if svg is None:
        svg = [svg_text(make()) for _, make in run_figures(results)]
    return "".join(f"<figure>{figure}</figure>" for figure in svg)


def report_html(results: Results, *, generated: datetime.datetime | None = None, plots: bool = True,
                svg: list[str] | None = None) -> str:
    """The whole report as one HTML document (see the module notes). ``svg``: the run's plots
    already drawn (``thermo.output.plots.plot_run`` fills such a list), else they are drawn here."""
    when = (generated or datetime.datetime.now(datetime.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")
    caution = caution_box(results.caution or CAUTION)
    overrides = html_overrides(results.overrides)
    warnings = html_list(results.warnings)
    parts = [
        *page_head(f"brakeheat report: {results.scenario_name}"), caution,
        f"<p>brakeheat {escape_html(results.version)}, solver {escape_html(results.solver)} ({escape_html(results.solver_status)}), "
        f"report made {escape_html(when)}.</p>",
        "<h2>Verdict</h2>"]
    for corner in results.corners:
        parts += [f"<h3>Corner {escape_html(corner.name)}</h3>", _verdicts(corner)]
    if plots:
        parts += ["<h2>Plots</h2>", _figures(results, svg)]
    for corner in results.corners:
        parts += [f"<h2>Corner {escape_html(corner.name)}</h2>", "<h3>Per-lap maxima</h3>", _laps(corner),
                  "<h3>Heat soak after the stop</h3>", _soak(corner), "<h3>Pad wear</h3>", _pads(corner),
                  "<h3>Where the heat went and the energy balance</h3>", _energy(corner)]
    parts += ["<h2>Hydraulics</h2>", _hydraulics(results.hydraulics),
              "<h2>Warnings</h2>", warnings,
              "<h2>What was run</h2>", "<h3>Overrides on top of the scenario file</h3>", overrides,
              "<h3>Scenario file</h3>", f"<pre>{escape_html(results.scenario_text)}</pre>",
              "<h2>References</h2>", "<ul>" + "".join(f"<li>{escape_html(r)}</li>" for r in results.references) + "</ul>",
              caution, PAGE_END]
    return "\n".join(parts) + "\n"


def write_report_html(results: Results, path, **options) -> None:
    """``report_html`` written to ``path`` atomically."""
    text = report_html(results, **options)
    with atomic_write(path) as handle:
        handle.write(text)
