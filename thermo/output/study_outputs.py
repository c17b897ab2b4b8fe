"""The files of a study besides its HDF5 file: sweep.csv or uncertainty.csv (one row per point),
and the plots (margin against each varied key, a heat map for two keys; the peak distributions and
a tornado of what drives each margin). Each written atomically.

CSV headers use the project's ``name [unit]`` form: a varied key's column is the key itself (its
unit is in its name), then per corner and check ``CORNER CHECK margin [K]`` and ``... peak [degC]``.
"""
from __future__ import annotations

import csv
import io
import math
from pathlib import Path

import numpy as np

from thermo.output.atomic import atomic_write


def _layout(points: list) -> dict[tuple[str, str], str]:
    """{(corner, check): the node it reads}, in the order of the first point that ran."""
    pairs = {}
    for p in points:
        for c in (p or {}).get("corners", []):
            for k in c["checks"]:
                pairs.setdefault((c["name"], k["name"]), k["node"])
    return pairs


def worst_check(point: dict) -> tuple[float, str]:
    """(smallest margin [K], "corner: check") of a point; (NaN, "") for a failed point."""
    best = (math.inf, "")
    for c in point.get("corners", []):
        for k in c["checks"]:
            if k["margin_k"] < best[0]:
                best = (k["margin_k"], f"{c['name']}: {k['name']}")
    return best if best[1] else (math.nan, "")


def _check(point: dict, corner: str, name: str) -> dict | None:
    for c in point.get("corners", []):
        if c["name"] == corner:
            return next((k for k in c["checks"] if k["name"] == name), None)
    return None


def study_rows(record) -> list[list]:
    """Header and one row per point that ran: its index (from 1), each key's value, each check's
    margin, peak and status, and the error of a failed point."""
    points = [(i, p) for i, p in enumerate(record.points) if p is not None]
    pairs = _layout([p for _, p in points])
    header = ["point", *record.keys]
    for corner, name in pairs:
        header += [f"{corner} {name} margin [K]", f"{corner} {name} peak [degC]", f"{corner} {name} status"]
    header.append("error")
    rows = [header]
    for i, p in points:
        row = [i + 1, *(p["values"][k] for k in record.keys)]
        for corner, name in pairs:
            k = _check(p, corner, name)
            row += ["", "", ""] if k is None else [f"{k['margin_k']:.2f}", f"{k['peak_c']:.2f}", k["status"]]
        row.append(p.get("error", ""))
        rows.append(row)
    return rows


def write_study_csv(record, path) -> Path:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows(study_rows(record))
    with atomic_write(path, "w") as handle:
        handle.write(buffer.getvalue())
    return Path(path)


def _short(key: str) -> str:
    """A dotted key's last two parts, enough to read an axis by."""
    parts = key.split(".")
    return ".".join(parts[-2:]) if len(parts) > 1 else key


def _number_values(record, key: str) -> np.ndarray | None:
    vals = [v[record.keys.index(key)] for v in record.values]
    if all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in vals):
        return np.array(vals, dtype=float)
    return None


def sweep_margin_figure(record, key: str):
    """Margin of every check against one varied key, a panel per corner; with other keys varied,
    the smallest margin over their values at each value of this one (the worst case)."""
    from thermo.output.plots import _new_figure, node_style
    pairs = _layout(record.points)
    corners = list(dict.fromkeys(c for c, _ in pairs))
    column = record.keys.index(key)
    numeric = _number_values(record, key)
    levels = list(dict.fromkeys(repr(v[column]) for v in record.values))
    shown_values = {repr(v[column]): v[column] for v in record.values}
    x = (np.array([shown_values[lv] for lv in levels], dtype=float) if numeric is not None
         else np.arange(len(levels), dtype=float))
    figure = _new_figure(10.0, 3.2 * max(1, len(corners)) + 0.8)
    for row, corner in enumerate(corners):
        axes = figure.add_subplot(len(corners), 1, row + 1)
        for j, (c, name) in enumerate(p for p in pairs if p[0] == corner):
            y = np.full(len(levels), np.nan)
            for value, point in zip(record.values, record.points):
                k = _check(point or {}, c, name)
                if k is not None:
                    at = levels.index(repr(value[column]))
                    y[at] = k["margin_k"] if math.isnan(y[at]) else min(y[at], k["margin_k"])
            colour = node_style(pairs[(c, name)], j)[0]
            axes.plot(x, y, marker="o", markersize=3, label=name.replace("_", " "),
                      linestyle=("-", "--", "-.", ":")[j % 4], color=colour)
        axes.axhline(0.0, color="black", linewidth=1.0)
        axes.set_ylabel(f"{corner}: margin [K]")
        axes.grid(True, alpha=0.3)
        axes.legend(fontsize="x-small", loc="center left", bbox_to_anchor=(1.01, 0.5))
        if numeric is None:
            axes.set_xticks(x, [str(shown_values[lv]) for lv in levels], rotation=20, fontsize="small")
    axes.set_xlabel(key if len(record.keys) == 1 else f"{key} (worst case over the other varied keys)")
    figure.suptitle(f"Margin to each limit against {_short(key)} (below 0: exceeded)")
    return figure


FLUID_CHECK = "fluid_boiling_at_water_content"


def fluid_margin(point: dict, corner: str | None = None) -> float:
    """The margin of the fluid boiling check (at the fluid's water content) of one corner, or the
    smallest over the corners (``corner`` None); NaN where there is none."""
    margins = [k["margin_k"] for c in point.get("corners", []) if corner in (None, c["name"])
               for k in c["checks"] if k["name"] == FLUID_CHECK]
    return min(margins) if margins else math.nan


def percent(p: float) -> str:
    """A probability (0 to 1) as a percentage for tables."""
    return f"{100 * p:.1f} %"


def ranked_points(points: list) -> list:
    """The points sorted by their smallest margin of any check, the worst first; failed points last."""
    return sorted(points, key=lambda p: (math.isnan(worst_check(p)[0]), worst_check(p)[0]))


def point_verdict(point: dict) -> dict:
    """What a sweep table shows of a point that ran: its smallest margin, that check ("corner:
    check") and its status, and how many checks are exceeded."""
    margin, where = worst_check(point)
    status = "exceeded" if margin < 0 else next(k["status"] for c in point["corners"] for k in c["checks"]
                                                if f"{c['name']}: {k['name']}" == where)
    exceeded = sum(k["status"] == "exceeded" for c in point["corners"] for k in c["checks"])
    return {"margin_k": margin, "check": where, "status": status, "exceeded": exceeded}


def sweep_heatmap_figure(record):
    """Over a grid of two varied keys: the fluid's boiling margin (the worst corner) and the
    smallest margin of any check, numbers in the cells."""
    from matplotlib.colors import TwoSlopeNorm

    from thermo.output.plots import _new_figure
    k1, k2 = record.keys
    rows = list(dict.fromkeys(repr(v[0]) for v in record.values))
    cols = list(dict.fromkeys(repr(v[1]) for v in record.values))
    label = {repr(v[i]): v[i] for v in record.values for i in (0, 1)}
    text = lambda r: f"{label[r]:g}" if isinstance(label[r], float) else str(label[r])
    panels = (("fluid boiling margin, worst corner [K]", fluid_margin),
              ("smallest margin of any check [K]", lambda p: worst_check(p)[0]))
    figure = _new_figure(max(9.0, 1.6 * len(cols) + 5.0), max(4.0, 0.5 * len(rows) + 2.2))
    for n, (title, measure) in enumerate(panels):
        grid = np.full((len(rows), len(cols)), np.nan)
        for value, point in zip(record.values, record.points):
            if point is not None:
                grid[rows.index(repr(value[0])), cols.index(repr(value[1]))] = measure(point)
        axes = figure.add_subplot(1, 2, n + 1)
        finite = grid[np.isfinite(grid)]
        span = max(1.0, float(np.max(np.abs(finite)))) if finite.size else 1.0
        image = axes.imshow(grid, origin="lower", aspect="auto", cmap="PuOr", norm=TwoSlopeNorm(0.0, -span, span))
        for i in range(len(rows)):
            for j in range(len(cols)):
                if np.isfinite(grid[i, j]):
                    axes.text(j, i, f"{grid[i, j]:+.0f}", ha="center", va="center", fontsize="x-small",
                              color="white" if abs(grid[i, j]) > 0.6 * span else "black")
        axes.set_xticks(range(len(cols)), [text(c) for c in cols], rotation=30, fontsize="small")
        axes.set_yticks(range(len(rows)), [text(r) for r in rows], fontsize="small")
        axes.set_xlabel(k2, fontsize="small")
        axes.set_ylabel(k1, fontsize="small")
        figure.colorbar(image, ax=axes, label="margin [K]; below 0: exceeded")
        axes.set_title(title, fontsize="medium")
    figure.suptitle("Margins over the grid of the two varied keys")
    return figure


def _two_column_panels(count: int, width: float, row_height: float):
    """A figure with ``count`` panels in two columns, and the panels in reading order."""
    from thermo.output.plots import _new_figure
    rows = max(1, -(-count // 2))
    figure = _new_figure(width, row_height * rows + 0.8)
    return figure, [figure.add_subplot(rows, 2, n + 1) for n in range(count)]


def uncertainty_peaks_figure(stats: dict, corner: str):
    """Histogram of each check's peak over the samples of one corner, with the limit's range."""
    from thermo.output.plots import node_style
    checks = [c for c in stats["checks"] if c["corner"] == corner]
    figure, panels = _two_column_panels(len(checks), 10.0, 2.6)
    for n, (c, axes) in enumerate(zip(checks, panels)):
        edges, counts = np.array(c["peak_c_histogram"]["edges"]), np.array(c["peak_c_histogram"]["counts"])
        colour = node_style(c["node"], n)[0]
        axes.stairs(counts, edges, fill=True, alpha=0.6, color=colour, label="samples")
        low, high = c["limit_c_range"]
        if high - low > 1e-9:
            axes.axvspan(low, high, color="black", alpha=0.15, label="limit (varies)")
        else:
            axes.axvline(low, color="black", linestyle="--", label=f"limit {low:.0f} degC")
        axes.set_title(f"{c['name'].replace('_', ' ')}: P(exceeded) {100 * c['p_exceed']:.1f} %", fontsize="small")
        axes.set_xlabel(f"peak {c['node'].replace('_', ' ')} [degC]", fontsize="small")
        axes.set_ylabel("samples", fontsize="small")
        axes.legend(fontsize="xx-small")
    figure.suptitle(f"{corner}: peak temperatures over {stats['samples_done']} samples")
    return figure


def uncertainty_tornado_figure(stats: dict, corner: str):
    """What drives each margin of one corner: each input's rank correlation with the margin."""
    entries = [s for s in stats["sensitivity"] if s["corner"] == corner]
    figure, panels = _two_column_panels(len(entries), 11.0, 2.4)
    for s, axes in zip(entries, panels):
        inputs = list(reversed(s["inputs"]))
        rho = [d["rank_correlation"] or 0.0 for d in inputs]
        noise = [bool(d.get("within_noise")) for d in inputs]
        colours = ["#BBBBBB" if q else "#0072B2" if r >= 0 else "#D55E00" for r, q in zip(rho, noise)]
        bars = axes.barh(range(len(inputs)), rho, color=colours)
        axes.bar_label(bars, labels=[f"{r:+.2f}" + (" ~" if q else "") for r, q in zip(rho, noise)],
                       fontsize="xx-small", padding=2)
        axes.set_yticks(range(len(inputs)), [d["input"] for d in inputs], fontsize="x-small")
        axes.set_xlim(-1.15, 1.15)
        axes.axvline(0.0, color="black", linewidth=0.8)
        axes.set_title(s["check"].replace("_", " "), fontsize="small")
        axes.set_xlabel("rank correlation with the margin [-] (above 0: more margin)", fontsize="x-small")
    figure.suptitle(f"{corner}: what drives each margin (Spearman rank correlation over the samples; "
                    "grey, ~: within sampling noise, p >= 0.05)")
    return figure


def plot_sweep(record, out_dir) -> list[Path]:
    """sweep_margin_<key>.png for each varied key, and sweep_heatmap.png for a grid of two keys."""
    from thermo.output.plots import _safe, save_png
    out = Path(out_dir)
    if not any(p and p.get("corners") for p in record.points):
        return []
    paths = [save_png(sweep_margin_figure(record, key), out / f"sweep_margin_{_safe(_short(key))}.png")
             for key in record.keys]
    if len(record.keys) == 2 and not record.definition.get("zip"):
        paths.append(save_png(sweep_heatmap_figure(record), out / "sweep_heatmap.png"))
    return paths


def plot_uncertainty(stats: dict, out_dir) -> list[Path]:
    """uncertainty_peaks_<corner>.png and uncertainty_tornado_<corner>.png for each corner."""
    from thermo.output.plots import _safe, save_png
    out = Path(out_dir)
    corners = list(dict.fromkeys(c["corner"] for c in stats["checks"]))
    paths = []
    for corner in corners:
        paths.append(save_png(uncertainty_peaks_figure(stats, corner), out / f"uncertainty_peaks_{_safe(corner)}.png"))
        paths.append(save_png(uncertainty_tornado_figure(stats, corner), out / f"uncertainty_tornado_{_safe(corner)}.png"))
    return paths
