"""``report.html`` of a study (sweep or uncertainty): one self-contained page, like a run's.

An uncertainty study's page opens with its headline, the probability that the brake fluid boils
in each corner with its interval; then every check's probabilities and margin percentiles, the
inputs, what drives each margin, the plots (inline SVG) and what was run. A sweep's page lists the
points sorted by the worst margin, with the plots. No scripts, no network; every text from the
scenario or the command line is escaped; the caution at the top and the bottom.
"""
from __future__ import annotations

import datetime
import json
import math

from thermo import CAUTION
from thermo.output.atomic import atomic_write
from thermo.output.html_report import PAGE_END, caution_box, escape_html, html_list, html_table, page_head
from thermo.output.study_outputs import FLUID_CHECK, fluid_margin, percent as _percent, point_verdict, ranked_points

MAX_POINT_ROWS = 500


def _when(generated) -> str:
    return (generated or datetime.datetime.now(datetime.timezone.utc)).strftime("%Y-%m-%d %H:%M UTC")


def _what_was_run(record) -> list[str]:
    return ["<h2>What was run</h2>", "<h3>The study</h3>",
            f"<pre>{escape_html(json.dumps(record.definition, indent=2))}</pre>",
            "<h3>Scenario file</h3>", f"<pre>{escape_html(record.scenario_text)}</pre>"]


def _class(p_exceed: float, p_caution: float) -> str:
    return "exceeded" if p_exceed > 0 else ("caution" if p_caution > 0 else "")


def uncertainty_html(data: dict, record, *, generated=None, plots: bool = True) -> str:
    """The page of an uncertainty study; ``data`` as ``uncertainty --json`` prints it."""
    caution = caution_box(data.get("caution") or CAUTION)
    how = {"lhs": "Latin hypercube", "sobol": "scrambled Sobol"}.get(data["sampling"], data["sampling"])
    scope = f"up to pit stop {data['stints']}" if data["stints"] else "the whole plan"
    conf = f"{100 * data['confidence']:g} %"
    parts = [*page_head(f"brakeheat uncertainty: {data['scenario']}"), caution,
             f"<p>brakeheat {escape_html(data['version'])}, report made {escape_html(_when(generated))}. "
             f"{data['samples_done']} of {data['samples']} samples ({escape_html(how)}, seed {data['seed']}), "
             f"{escape_html(scope)}; {data['samples_failed']} failed.</p>",
             "<h2>Probability that the brake fluid boils</h2>",
             f"<p>The fluid at the pistons against its boiling point at the fluid's water content "
             f"(check {FLUID_CHECK}); {conf} exact binomial intervals.</p>"]
    rows = [[h["corner"], _percent(h["p_exceed"]), f"{_percent(h['p_exceed_ci'][0])} to {_percent(h['p_exceed_ci'][1])}",
             _percent(h["p_caution"])] for h in data["headline"]]
    parts.append(html_table(["corner", "P(boils)", f"{conf} interval", "P(caution band or beyond)"], rows,
                            numeric=(1, 2, 3), row_classes=[_class(h["p_exceed"], h["p_caution"]) for h in data["headline"]])
                 if rows else "<p>No corner has that check.</p>")
    rows = [[c["corner"], c["name"], c["node"], _percent(c["p_exceed"]),
             f"{_percent(c['p_exceed_ci'][0])} to {_percent(c['p_exceed_ci'][1])}", _percent(c["p_caution"]),
             *(f"{c['margin_k_percentiles'][q]:+.1f}" for q in ("5", "50", "95")),
             *(f"{c['peak_c_percentiles'][q]:.1f}" for q in ("5", "50", "95"))] for c in data["checks"]]
    parts += ["<h2>Every check</h2>",
              html_table(["corner", "check", "node read", "P(exceeded)", f"{conf} interval", "P(caution or worse)",
                          "margin 5 % [K]", "margin 50 % [K]", "margin 95 % [K]", "peak 5 % [degC]", "peak 50 % [degC]",
                          "peak 95 % [degC]"], rows, numeric=tuple(range(3, 12)),
                         row_classes=[_class(c["p_exceed"], c["p_caution"]) for c in data["checks"]])]
    rows = [[i["name"], i["distribution"],
             ", ".join(f"{k} {i[k]:g}" for k in ("mean", "std", "low", "mode", "high", "median", "sigma") if k in i),
             " to ".join("-" if v is None else f"{v:g}" for v in i["truncated_to"]), ", ".join(i["keys"])]
            for i in data["inputs"]]
    parts += ["<h2>Inputs</h2>", html_table(["input", "distribution", "parameters", "truncated to", "keys"], rows)]
    rows = [[s["corner"], s["check"], *(
        "; ".join(f"{d['input']} {d['rank_correlation']:+.2f}{' (within noise)' if d.get('within_noise') else ''}"
                  for d in s["inputs"] if d["rank_correlation"] is not None)
        or "no input moves it",)] for s in data["sensitivity"]]
    parts += ["<h2>What drives each margin</h2>",
              "<p>Spearman's rank correlation of each input with the margin, largest first (above 0: more of the "
              "input, more margin); within noise: its p-value against no correlation is 0.05 or more, so the "
              "samples do not show that the input moves the margin.</p>", html_table(["corner", "check", "inputs"], rows)]
    if plots and data["checks"]:
        from thermo.output.plots import svg_text
        from thermo.output.study_outputs import uncertainty_peaks_figure, uncertainty_tornado_figure
        parts.append("<h2>Plots</h2>")
        for corner in dict.fromkeys(c["corner"] for c in data["checks"]):
            parts += [f"<figure>{svg_text(uncertainty_peaks_figure(data, corner))}</figure>",
                      f"<figure>{svg_text(uncertainty_tornado_figure(data, corner))}</figure>"]
    parts += [*_what_was_run(record), caution, PAGE_END]
    return "\n".join(parts) + "\n"


def sweep_html(data: dict, record, *, generated=None, plots: bool = True) -> str:
    """The page of a sweep; ``data`` as ``sweep --json`` prints it."""
    caution = caution_box(data.get("caution") or CAUTION)
    scope = f"up to pit stop {data['stints']}" if data["stints"] else "the whole plan"
    keys = data["varied"]
    ranked = ranked_points(data["points"])
    corners = list(dict.fromkeys(c["name"] for p in ranked for c in p.get("corners", [])))
    rows, classes = [], []
    for p in ranked[:MAX_POINT_ROWS]:
        values = [p["values"][k] for k in keys]
        if "error" in p:
            rows.append([*values, *("" for _ in corners), "", "failed", p["error"]])
            classes.append("exceeded")
            continue
        v = point_verdict(p)
        fluid = ["" if math.isnan(m) else f"{m:+.1f}" for m in (fluid_margin(p, name) for name in corners)]
        rows.append([*values, *fluid, f"{v['margin_k']:+.1f}", v["status"], v["check"]])
        classes.append(v["status"] if v["status"] in ("exceeded", "caution") else "")
    parts = [*page_head(f"brakeheat sweep: {data['scenario']}"), caution,
             f"<p>brakeheat {escape_html(data['version'])}, report made {escape_html(_when(generated))}. "
             f"{data['points_done']} of {data['points_total']} points, {escape_html(scope)}; {data['failed']} failed. "
             "Margins in K (margin = limit - peak; below 0: exceeded).</p>",
             "<h2>Points, the worst first</h2>",
             html_table([*keys, *(f"{c} fluid [K]" for c in corners), "worst margin [K]", "status", "worst check"],
                        rows, numeric=tuple(range(len(keys), len(keys) + len(corners) + 1)), row_classes=classes)]
    if len(ranked) > MAX_POINT_ROWS:
        parts.append(f"<p>... {len(ranked) - MAX_POINT_ROWS} more points in sweep.csv and sweep.h5.</p>")
    parts.append(f"<p>fluid: the margin of {FLUID_CHECK} (the fluid at the pistons against its boiling point at "
                 "the fluid's water content).</p>")
    if plots and any(p.get("corners") for p in data["points"]):
        from thermo.output.plots import svg_text
        from thermo.output.study_outputs import sweep_heatmap_figure, sweep_margin_figure
        figures = [sweep_margin_figure(record, key) for key in record.keys]
        if len(record.keys) == 2 and not record.definition.get("zip"):
            figures.append(sweep_heatmap_figure(record))
        parts += ["<h2>Plots</h2>", *(f"<figure>{svg_text(f)}</figure>" for f in figures)]
    failed = [f"{json.dumps(p['values'])}: {p['error']}" for p in data["points"] if "error" in p]
    parts += ["<h2>Failed points</h2>", html_list(failed), *_what_was_run(record), caution, PAGE_END]
    return "\n".join(parts) + "\n"


def write_study_html(kind: str, data: dict, record, path, **options) -> None:
    """The study's page (``sweep_html`` or ``uncertainty_html``) written to ``path`` atomically."""
    text = (sweep_html if kind == "sweep" else uncertainty_html)(data, record, **options)
    with atomic_write(path) as handle:
        handle.write(text)
