"""PNG plots of a run and of option variants (matplotlib, Agg canvas: no display, no pyplot state).

Every figure labels its axes with units, has a title and a legend, and is written atomically.
"""
from __future__ import annotations

import contextlib
from collections.abc import Callable, Iterator
from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.text import Text
from matplotlib.ticker import MaxNLocator

from lapdata.units import MINUTE, kelvin_to_celsius
from thermo.output.analysis import governing_check, heat_path_shares, margin_gains
from thermo.output.atomic import atomic_write
from thermo.output.errors import OutputError
from thermo.results import CornerResult, Results

DPI = 110
# the nodes the per-lap plot may show, in order; it shows those a check reads (the disc's face and
# bulk, the fluid at the pistons, or the bulk fluid in results written before that node, the bearing)
LAP_PEAK_NODES = ("disc_surface", "disc", "fluid_at_piston", "fluid", "bearing")
COMPARE_NODES = ("fluid_at_piston", "fluid", "bearing")
# phase kind: (fill colour, label) of the shaded spans; other kinds are not shaded
PHASE_SHADES = {"pit_stop": ("tab:red", "pit stop"), "safety_car": ("gold", "safety car"),
                "soak": ("tab:blue", "soak (car stopped)"), "in_lap": ("tab:gray", "in lap")}


def _new_figure(width: float = 10.0, height: float = 5.5) -> Figure:
    figure = Figure(figsize=(width, height), dpi=DPI, layout="constrained")
    FigureCanvasAgg(figure)
    return figure


@contextlib.contextmanager
def _drawn_as_built(figure: Figure):
    """Draw ``figure`` from the layout it was built with, and leave it so.

    Constrained layout places the axes and the figure title from where they stand when a draw
    starts, so a figure drawn a second time (the PNG, then the report's SVG) came out a fraction
    of a point apart from one drawn once. Putting back what the layout moves (every axes'
    position, the figure-level titles' position and alignment) after each draw makes every
    drawing of a figure the same as the first one of a fresh figure. The positions are matplotlib's
    own attributes (3.11); tests/output/test_output_plots.py compares the files with a fresh
    figure's, byte for byte, so a matplotlib that moves them fails there. Where a matplotlib lacks
    them, the figure is drawn as it stands (a later drawing may then sit a fraction of a point
    apart from the first), never not at all.
    """
    try:
        axes, texts = _layout_state(figure)
    except AttributeError:
        yield figure
        return
    try:
        yield figure
    finally:
        for a, original, active in axes:
            a._set_position(original, which="original")
            a._set_position(active, which="active")
        for t, position, horizontal, vertical in texts:
            t.set_position(position)
            t.set_horizontalalignment(horizontal)
            t.set_verticalalignment(vertical)


def _layout_state(figure: Figure) -> tuple[list, list]:
    """What constrained layout moves: each axes' original and active position, and the position and
    alignment of the figure-level titles (matplotlib's own attributes)."""
    axes = [(a, a._originalPosition.frozen(), a._position.frozen()) for a in figure.axes]
    texts = [(t, t.get_position(), t.get_horizontalalignment(), t.get_verticalalignment())
             for t in (figure._suptitle, figure._supxlabel, figure._supylabel) if t is not None]
    return axes, texts


def _savefig(figure: Figure, target, fmt: str, **options) -> None:
    """``figure.savefig(target, format=fmt, **options)``, the constrained layout run on its own first.

    Before a figure with a layout engine is saved, matplotlib draws it once with drawing switched
    off: the layout needs the sizes of the texts, and every artist is then walked to no effect,
    about a quarter of the time of a saved plot. Here the layout is run alone, as that first draw
    runs it (an SVG measured at 72 dots per inch by the SVG writer's own renderer, a PNG by the
    Agg canvas at the figure's dots per inch), and the figure is saved without a layout engine,
    so it is drawn once. The files are the same as matplotlib's own, byte for byte (tested).
    """
    engine = figure.get_layout_engine()
    if engine is None:
        figure.savefig(target, format=fmt, **options)
        return
    canvas, dpi = figure.canvas, figure.dpi
    try:
        if fmt == "svg":
            from matplotlib.backends.backend_svg import FigureCanvasSVG
            FigureCanvasSVG(figure)                   # the renderer the layout measures with: the SVG writer's
            figure.dpi = 72                           # as the SVG writer draws
        engine.execute(figure)
        figure.dpi = dpi
        figure.set_layout_engine(None)
        figure.savefig(target, format=fmt, **options)
    finally:
        figure.dpi = dpi
        figure.set_layout_engine(engine)
        figure.set_canvas(canvas)


def save_png(figure: Figure, path: Path) -> Path:
    """Write ``figure`` atomically as PNG, every text drawn literally.

    Names come from users' files: a ``$`` in a scenario or variant name must not start matplotlib's
    math markup (``cost $\\frac{$ x`` crashed the plots), so math parsing is off for every text.
    """
    for text in figure.findobj(Text):
        text.set_parse_math(False)
    with _drawn_as_built(figure), atomic_write(path, "wb") as handle:
        _savefig(figure, handle, "png", dpi=DPI)
    return path


def svg_text(figure: Figure) -> str:
    """``figure`` as an SVG element for inline use in HTML (no XML declaration or DOCTYPE); every
    text drawn literally, as in ``save_png``, and kept as text (searchable, printable)."""
    import io
    from matplotlib import rc_context
    for text in figure.findobj(Text):
        text.set_parse_math(False)
    import re
    buffer = io.StringIO()
    with _drawn_as_built(figure), rc_context({"svg.fonttype": "none", "svg.hashsalt": "brakeheat"}):
        _savefig(figure, buffer, "svg", metadata={"Date": None})      # stable ids: same run, same page
    svg = buffer.getvalue()
    svg = svg[svg.index("<svg"):]
    # the RDF metadata block and its name spaces: nothing a page needs, and links to nowhere useful
    svg = re.sub(r"<metadata>.*?</metadata>\s*", "", svg, flags=re.S)
    return re.sub(r'\s+xmlns:(dc|cc|rdf)="[^"]*"', "", svg)


def _safe(name: str) -> str:
    return "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in name)


def _node_colours(nodes) -> dict[str, tuple]:
    from matplotlib import colormaps
    cmap = colormaps["tab20"]
    # even entries of tab20 first (the strong colours), then the light ones: 20 distinct nodes
    order = [2 * i for i in range(10)] + [2 * i + 1 for i in range(10)]
    return {node: cmap(order[i % 20]) for i, node in enumerate(nodes)}


# Okabe & Ito (2008), "Color Universal Design": a palette that readers with the common colour-vision
# deficiencies can tell apart. Each node keeps one colour and line style in every plot.
OKABE_ITO = {"orange": "#E69F00", "sky": "#56B4E9", "green": "#009E73", "yellow": "#F0E442", "blue": "#0072B2",
             "vermillion": "#D55E00", "purple": "#CC79A7", "black": "#000000", "grey": "#999999"}
NODE_STYLES = {  # node: (colour, line style, label in words)
    "disc_surface": (OKABE_ITO["vermillion"], "-", "disc friction face"),
    "disc": (OKABE_ITO["vermillion"], "--", "disc bulk"),
    "pad_surface": (OKABE_ITO["orange"], ":", "pad friction face"),
    "pad": (OKABE_ITO["orange"], "-", "pad bulk"),
    "backing_plate": (OKABE_ITO["yellow"], "-", "pad backing plate"),
    "piston": (OKABE_ITO["purple"], "-", "piston"),
    "piston_seal": (OKABE_ITO["purple"], ":", "piston seal"),
    "fluid_at_piston": (OKABE_ITO["blue"], "-", "fluid at the pistons"),
    "fluid": (OKABE_ITO["sky"], "-", "bulk fluid"),
    "caliper": (OKABE_ITO["green"], "-", "caliper body"),
    "hub": (OKABE_ITO["grey"], "-", "hub"),
    "bearing": (OKABE_ITO["black"], "-", "wheel bearing"),
    "upright": (OKABE_ITO["green"], "--", "upright"),
    "disc_bell": (OKABE_ITO["grey"], "--", "disc bell"),
}
TEMPERATURE_PANELS = (   # title, nodes; a node in none of them gets a panel of its own at the end
    ("disc and pad", ("disc_surface", "disc", "pad")),
    ("pistons, fluid and caliper", ("piston", "fluid_at_piston", "fluid", "caliper")),
    ("hub, bearing and upright", ("hub", "bearing", "upright")),
)
LIMIT_STYLES = ("--", "-.", ":", (0, (5, 1, 1, 1, 1, 1)), (0, (8, 3)))


MAX_PLOT_POINTS = 3000     # per line: longer series are drawn as their envelope (min and max per bucket)


def envelope(x: np.ndarray, y: np.ndarray, max_points: int = MAX_PLOT_POINTS) -> tuple[np.ndarray, np.ndarray]:
    """A long series thinned for drawing: in each of ``max_points // 2`` equal runs of samples,
    the lowest and the highest sample in their time order, so peaks and troughs stay drawn.

    Within a run the first lowest and the first highest sample are kept (as ``numpy.argmin`` and
    ``numpy.argmax`` pick them; a NaN counts as both, as there); a run whose lowest and highest
    sample are one sample keeps it once."""
    x, y = np.asarray(x), np.asarray(y)
    if x.size <= max_points:
        return x, y
    buckets = max_points // 2
    edges = np.linspace(0, x.size, buckets + 1).astype(int)
    starts = np.unique(edges[:-1][edges[1:] > edges[:-1]])      # the runs that hold samples
    sizes = np.diff(np.append(starts, x.size))
    nan = np.isnan(y) if y.dtype.kind == "f" else np.zeros(y.shape, dtype=bool)

    def first(reduce) -> np.ndarray:
        """Index of each run's first sample equal to the run's reduction (NaN matching NaN)."""
        extreme = np.repeat(reduce.reduceat(y, starts), sizes)
        hits = np.flatnonzero((y == extreme) | ((nan & np.isnan(extreme)) if nan.any() else False))
        return hits[np.searchsorted(hits, starts)]

    lo, hi = first(np.minimum), first(np.maximum)
    keep = np.column_stack([np.minimum(lo, hi), np.maximum(lo, hi)]).ravel()
    once = np.ones(keep.size, dtype=bool)
    once[1::2] = lo != hi
    keep = keep[once]
    return x[keep], y[keep]


def node_style(node: str, fallback_index: int = 0) -> tuple:
    """(colour, line style, label) of a node, the same in every plot."""
    if node in NODE_STYLES:
        return NODE_STYLES[node]
    colours = list(OKABE_ITO.values())
    return colours[fallback_index % len(colours)], "-", node.replace("_", " ")


def _panels(corner: CornerResult) -> list[tuple[str, list[str]]]:
    present = set(corner.node_names)
    panels = [(title, [n for n in nodes if n in present]) for title, nodes in TEMPERATURE_PANELS]
    placed = {n for _, nodes in panels for n in nodes}
    rest = [n for n in corner.node_names if n not in placed and n not in ("pad_surface", "backing_plate",
                                                                          "piston_seal", "disc_bell")]
    if rest:
        panels.append(("other nodes", rest))
    return [(title, nodes) for title, nodes in panels if nodes]


def _time_unit(corner: CornerResult) -> tuple[float, str]:
    """(seconds per unit, unit) of a run's time axis: minutes, or hours for a run over 3 hours."""
    end = float(np.asarray(corner.time_s)[-1]) if np.size(corner.time_s) else 0.0
    return (3600.0, "h") if end > 3 * 3600.0 else (MINUTE, "min")


def _mark_phases(axes, corner: CornerResult, label: bool, unit_s: float = MINUTE) -> None:
    """Shade the phases of the kinds in PHASE_SHADES across the whole height of ``axes`` and mark
    the stop. The spans of one kind are one collection (a 24-hour run has about 60 spans a
    panel; one artist each made drawing slow), drawn as ``axvspan`` draws each span."""
    from matplotlib.collections import PolyCollection
    spans: dict[str, list] = {}
    for phase in corner.phases:
        if phase.kind in PHASE_SHADES:
            a, b = phase.t_start_s / unit_s, phase.t_end_s / unit_s
            spans.setdefault(phase.kind, []).append([(a, 0.0), (b, 0.0), (b, 1.0), (a, 1.0)])   # as axvspan's
    for kind, verts in spans.items():
        colour, name = PHASE_SHADES[kind]
        shade = PolyCollection(verts, facecolors=colour, edgecolors=colour, alpha=0.12, joinstyle="miter",
                               transform=axes.get_xaxis_transform(), label=name if label else None)
        axes.add_collection(shade, autolim=False)
        axes.update_datalim([(min(v[0][0] for v in verts), 0.0), (max(v[1][0] for v in verts), 0.0)],
                            updatey=False)
        axes.autoscale_view(scaley=False)
    if corner.stop_time_s is not None:
        axes.axvline(corner.stop_time_s / unit_s, color="black", linestyle=":", linewidth=1.2,
                     label="car stops" if label else None)


def plot_corner_temperatures(corner: CornerResult, path: Path, title: str = "") -> Path:
    """``corner_temperature_figure`` written as PNG to ``path``."""
    return save_png(corner_temperature_figure(corner, title), path)


def corner_temperature_figure(corner: CornerResult, title: str = "") -> Figure:
    """One corner over the run, in stacked panels sharing the time axis [min]: speed and brake power
    on top (when the results hold them); disc and pad; pistons, fluid and caliper; hub, bearing and
    upright; each with the limits of the checks that read its nodes, phases shaded, the stop marked."""
    panels = _panels(corner)
    top = corner.speed_m_s is not None and corner.brake_power_w is not None
    rows = len(panels) + (1 if top else 0)
    figure = _new_figure(12.0, 2.6 * rows + 0.6)
    unit_s, unit = _time_unit(corner)
    minutes = np.asarray(corner.time_s) / unit_s
    axes_list = figure.subplots(rows, 1, sharex=True, squeeze=False)[:, 0]
    k = 0
    if top:
        axes = axes_list[0]
        axes.plot(*envelope(minutes, np.asarray(corner.speed_m_s) * 3.6), color=OKABE_ITO["grey"], linewidth=0.8,
                  label="car speed")
        axes.set_ylabel("speed [km/h]")
        power = axes.twinx()
        power.plot(*envelope(minutes, np.asarray(corner.brake_power_w) / 1e3), color=OKABE_ITO["vermillion"],
                   linewidth=0.8, label="brake power into the corner")
        power.set_ylabel("brake power [kW]")
        _mark_phases(axes, corner, label=True, unit_s=unit_s)
        handles = axes.get_legend_handles_labels()[0] + power.get_legend_handles_labels()[0]
        labels = axes.get_legend_handles_labels()[1] + power.get_legend_handles_labels()[1]
        axes.legend(handles, labels, loc="center left", bbox_to_anchor=(1.08, 0.5), fontsize="small")
        axes.set_title("speed and brake power", loc="left", fontsize="medium")
        axes.grid(True, alpha=0.3)
        k = 1
    for (panel_title, nodes), axes in zip(panels, axes_list[k:]):
        for i, node in enumerate(nodes):
            colour, style, label = node_style(node, i)
            bulk_over_face = node == "disc" and "disc_surface" in nodes    # drawn over the face's band
            axes.plot(*envelope(minutes, kelvin_to_celsius(corner.temperature(node))), color=colour, linestyle=style,
                      linewidth=1.8 if bulk_over_face else 1.2, zorder=3 if bulk_over_face else 2, label=label)
        checks = [c for c in corner.checks if c.node in nodes]
        for m, check in enumerate(checks):
            colour, _, _ = node_style(check.node)
            limit_c = kelvin_to_celsius(check.limit_k)
            axes.axhline(limit_c, color=colour, linestyle=LIMIT_STYLES[m % len(LIMIT_STYLES)], linewidth=0.9,
                         alpha=0.8, label=f"limit: {check.name.replace('_', ' ')} {limit_c:.0f} degC")
        _mark_phases(axes, corner, label=not top and axes is axes_list[0], unit_s=unit_s)
        axes.set_ylabel("temperature [degC]")
        axes.set_title(panel_title, loc="left", fontsize="medium")
        axes.grid(True, alpha=0.3)
        axes.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize="x-small" if len(checks) > 4 else "small")
    axes_list[-1].set_xlabel(f"time from the start of the run [{unit}]")
    figure.suptitle(f"{title.strip()}\ncorner {corner.name}: temperatures over the run" if title.strip()
                    else f"corner {corner.name}: temperatures over the run")
    return figure


def plot_lap_peaks(results: Results, path: Path, nodes=LAP_PEAK_NODES) -> Path:
    """``lap_peaks_figure`` written as PNG to ``path``."""
    return save_png(lap_peaks_figure(results, nodes), path)


MARKED_LAPS = 60      # a line of more laps marks about this many of them, so that the corners stay apart


def lap_marker_every(n_laps: int) -> int:
    """Every how many laps a corner's line in the lap peak plot is marked: every lap up to
    ``MARKED_LAPS`` laps; beyond, evenly about ``MARKED_LAPS`` of them (804 laps marked one by
    one merge into a band in which the corners' markers cannot be told apart, and cost 6432 SVG
    elements in the report). The line itself joins every lap."""
    return 1 if n_laps <= MARKED_LAPS else -(-n_laps // MARKED_LAPS)


def lap_peaks_figure(results: Results, nodes=LAP_PEAK_NODES) -> Figure:
    """Per-lap peak of the nodes the main checks read (disc face, fluid at the pistons, bearing) for
    every corner [degC vs lap], each with the limits of the checks on it and, after the last lap,
    the peak of the soak (where the bearing usually peaks)."""
    read = {check.node for corner in results.corners for check in corner.checks}
    present = [n for n in nodes if n in read
               and any(lap.max_k.get(n) is not None for c in results.corners for lap in c.laps)]
    if not present:
        raise OutputError(f"lap peak plot: no lap has a maximum for any of {', '.join(nodes)}")
    figure = _new_figure(11.0, 2.8 * len(present) + 0.4)
    markers = ("o", "s", "^", "D")
    for k, node in enumerate(present):
        axes = figure.add_subplot(len(present), 1, k + 1)
        colour, _, label = node_style(node)
        last_lap = 0
        for m, corner in enumerate(results.corners):
            laps = [lap for lap in corner.laps if node in lap.max_k]
            if not laps:
                continue
            marker = markers[m % len(markers)]
            axes.plot([lap.index for lap in laps], [kelvin_to_celsius(lap.max_k[node]) for lap in laps],
                      marker=marker, markersize=3, linewidth=1.0, color=colour, alpha=1.0 - 0.35 * (m % 2),
                      markevery=lap_marker_every(len(laps)), label=f"{corner.name}")
            last_lap = max(last_lap, laps[-1].index)
            if corner.stop_time_s is not None and node in corner.node_names:
                after = np.asarray(corner.time_s) >= corner.stop_time_s
                if np.any(after):
                    soak_c = kelvin_to_celsius(float(corner.temperature(node)[after].max()))
                    axes.plot([laps[-1].index + 1.5], [soak_c], marker=marker, markersize=7, color=colour,
                              linestyle="none", markerfacecolor="none", label=f"{corner.name}: soak peak")
        for n, check in enumerate(c for c in results.corners[0].checks if c.node == node):
            limit_c = kelvin_to_celsius(check.limit_k)
            axes.axhline(limit_c, color="black", linestyle=LIMIT_STYLES[n % len(LIMIT_STYLES)], linewidth=0.9,
                         label=f"limit: {check.name.replace('_', ' ')} {limit_c:.0f} degC")
        axes.xaxis.set_major_locator(MaxNLocator(integer=True))
        axes.set_ylabel("peak [degC]")
        axes.set_title(f"{label}: highest temperature in each lap, and in the soak (open marker)", loc="left",
                       fontsize="medium")
        axes.grid(True, alpha=0.3)
        axes.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize="small")
    axes.set_xlabel("lap [-] (the soak after the last lap)")
    return figure


def plot_heat_paths(results: Results, path: Path) -> Path:
    """``heat_paths_figure`` written as PNG to ``path``."""
    return save_png(heat_paths_figure(results), path)


def heat_paths_figure(results: Results) -> Figure:
    """Where the heat went: a stacked horizontal bar of heat-path shares per corner [%]."""
    shares = {c.name: heat_path_shares(c) for c in results.corners}
    groups = []
    for per_corner in shares.values():
        groups += [g for g in per_corner if g not in groups]
    if not groups:
        raise OutputError("heat path plot: no corner has a link group that carries heat out")
    figure = _new_figure(10.0, 1.2 + 0.8 * len(shares))
    axes = figure.add_subplot()
    names = list(shares)
    left = np.zeros(len(names))
    for group in groups:
        width = np.array([100.0 * shares[n].get(group, 0.0) for n in names])
        bars = axes.barh(names, width, left=left, label=group.replace("_", " "))
        # each share written on its bar where it is wide enough to hold the number
        axes.bar_label(bars, labels=[f"{w:.0f} %" if w >= 4.0 else "" for w in width], label_type="center",
                       fontsize="x-small")
        left += width
    axes.set_xlabel("share of the heat that left the corner [%]")
    axes.set_ylabel("corner")
    axes.set_xlim(0.0, 100.0)
    axes.invert_yaxis()   # corners top to bottom in run order
    axes.set_title("Where the heat went, whole run")
    axes.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize="small")
    return figure


def run_figures(results: Results) -> Iterator[tuple[str, Callable[[], Figure]]]:
    """(PNG file name, maker of the figure) of each plot of a run, in order: one temperature plot
    per corner, the lap peak plot (when the run has laps), the heat path plot (when heat left
    through a named group). The PNG files and the report's inline plots are these figures."""
    # fixed file names (a promise to users' scripts, listed in README); the scenario name is in the titles
    for c in results.corners:
        yield (f"temperatures_{_safe(c.name)}.png",
               lambda c=c: corner_temperature_figure(c, f"{results.scenario_name} "))
    if any(c.laps for c in results.corners):
        yield "lap_peaks.png", lambda: lap_peaks_figure(results)
    if any(heat_path_shares(c) for c in results.corners):
        yield "heat_paths.png", lambda: heat_paths_figure(results)


def plot_run(results: Results, out_dir, svg: list[str] | None = None) -> list[Path]:
    """Write the run's plots as PNG files into ``out_dir`` (created if missing).

    Parameters
    ----------
    results : Results
        A finished run [-]
    out_dir : str or os.PathLike
        Folder for the PNG files [-]
    svg : list of str, optional
        When given, each figure is also drawn as SVG (``svg_text``) and appended to it, from the
        same figure: the report's plots without building them a second time [-]

    Returns
    -------
    list of Path
        One temperature plot per corner, the lap peak plot (when the run has laps)
        and the heat path plot (when heat left through a named group) [-]
    """
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    written = []
    for name, make in run_figures(results):
        figure = make()
        written.append(save_png(figure, out / name))
        if svg is not None:
            svg.append(svg_text(figure))
    return written


def _overlay(variants: list[tuple[str, Results]], corner_name: str, path: Path) -> Path:
    return save_png(comparison_overlay_figure(variants, corner_name), path)


def comparison_overlay_figure(variants: list[tuple[str, Results]], corner_name: str) -> Figure:
    """Fluid and bearing (and the other compared nodes) of one corner, every variant overlaid, with
    the baseline's governing limit of each node."""
    base = variants[0][1].corner(corner_name)
    nodes = [n for n in COMPARE_NODES if n in base.node_names]
    if not nodes:
        raise OutputError(f"comparison: corner '{corner_name}' has none of the nodes {', '.join(COMPARE_NODES)}")
    figure = _new_figure(10.0, 3.2 * len(nodes))
    for k, node in enumerate(nodes):
        axes = figure.add_subplot(len(nodes), 1, k + 1)
        for name, results in variants:
            corner = results.corner(corner_name)
            if node not in corner.node_names:
                raise OutputError(f"comparison: variant '{name}' corner '{corner_name}' has no node '{node}'")
            axes.plot(*envelope(np.asarray(corner.time_s) / MINUTE, kelvin_to_celsius(corner.temperature(node))),
                      label=name)
        check = governing_check(base, node)
        if check is not None:
            axes.axhline(kelvin_to_celsius(check.limit_k), color="black", linestyle="--", linewidth=1.0,
                         label=f"limit {check.name}")
        axes.set_ylabel(f"{node} [degC]")
        axes.set_title(f"{corner_name}: {node} temperature by variant")
        axes.grid(True, alpha=0.3)
        axes.legend(fontsize="small")
    axes.set_xlabel("time [min]")
    return figure


def _gain_bars(variants: list[tuple[str, Results]], path: Path) -> Path:
    return save_png(margin_gain_figure(variants), path)


def margin_gain_figure(variants: list[tuple[str, Results]]) -> Figure:
    """Bars of the margin each variant gains on the fluid and bearing checks against the first (baseline)."""
    gains = margin_gains(variants, COMPARE_NODES)
    labels = [f"{corner}\n{node_style(node)[2]}" for corner, per_node in next(iter(gains.values())).items()
              for node in per_node]
    if not labels:
        raise OutputError("comparison: the baseline has no check on fluid or bearing, so no margin to compare")
    figure = _new_figure(max(6.0, 1.1 * len(labels) + 3.0), 5.0)
    axes = figure.add_subplot()
    x = np.arange(len(labels))
    width = 0.8 / len(gains)
    for k, (name, per_corner) in enumerate(gains.items()):
        values = [g for per_node in per_corner.values() for g in per_node.values()]
        bars = axes.bar(x + (k - (len(gains) - 1) / 2) * width, values, width, label=name)
        axes.bar_label(bars, labels=[f"{v:+.1f}" for v in values], fontsize="x-small", padding=2)
    axes.axhline(0.0, color="black", linewidth=0.8)
    axes.set_xticks(x, labels)
    axes.set_ylabel("margin gained vs baseline [K]")
    axes.set_xlabel("corner and node (governing check)")
    axes.set_title(f"Margin gained against the baseline '{variants[0][0]}'")
    axes.grid(True, axis="y", alpha=0.3)
    axes.legend(fontsize="small")
    return figure


def plot_comparison(variant_results: list[tuple[str, Results]], out_dir) -> list[Path]:
    """Overlay fluid and bearing temperatures of all variants per corner, and bar the margin gained.

    Parameters
    ----------
    variant_results : list of (str, Results)
        Named variants, the first is the baseline [-]
    out_dir : str or os.PathLike
        Folder for the PNG files [-]

    Returns
    -------
    list of Path
        One overlay per corner of the baseline, then the margin-gain bar chart
        (only when there are at least two variants) [-]
    """
    if not variant_results:
        raise OutputError("comparison: expected at least one (name, Results) variant, the first is the baseline")
    names = [name for name, _ in variant_results]
    if len(set(names)) != len(names):
        raise OutputError(f"comparison: variant names must be unique, got {names}")
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    base = variant_results[0][1]
    for name, results in variant_results[1:]:
        for corner in base.corners:
            try:
                results.corner(corner.name)
            except KeyError:
                raise OutputError(f"comparison: variant '{name}' has no corner '{corner.name}'") from None
    written = [_overlay(variant_results, c.name, out / f"compare_{_safe(c.name)}_fluid_bearing.png")
               for c in base.corners]
    if len(variant_results) > 1:
        written.append(_gain_bars(variant_results, out / "compare_margin_gain.png"))
    return written
