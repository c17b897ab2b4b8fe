"""PNG plots of a run and of option variants (matplotlib, Agg canvas: no display, no pyplot state).

Every figure labels its axes with units, has a title and a legend, and is written atomically.
"""
from __future__ import annotations

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
# the fluid at the pistons is what the boiling checks read; "fluid" (the bulk) is kept for results
# written before that node existed, where it carries the fluid checks
LAP_PEAK_NODES = ("disc", "fluid_at_piston", "fluid", "bearing")
COMPARE_NODES = ("fluid_at_piston", "fluid", "bearing")
# phase kind: (fill colour, label) of the shaded spans; other kinds are not shaded
PHASE_SHADES = {"pit_stop": ("tab:red", "pit stop"), "safety_car": ("gold", "safety car"),
                "soak": ("tab:blue", "soak (car stopped)"), "in_lap": ("tab:gray", "in lap")}


def _new_figure(width: float = 10.0, height: float = 5.5) -> Figure:
    figure = Figure(figsize=(width, height), dpi=DPI, layout="constrained")
    FigureCanvasAgg(figure)
    return figure


def save_png(figure: Figure, path: Path) -> Path:
    """Write ``figure`` atomically as PNG, every text drawn literally.

    Names come from users' files: a ``$`` in a scenario or variant name must not start matplotlib's
    math markup (``cost $\\frac{$ x`` crashed the plots), so math parsing is off for every text.
    """
    for text in figure.findobj(Text):
        text.set_parse_math(False)
    with atomic_write(path, "wb") as handle:
        figure.savefig(handle, format="png", dpi=DPI)
    return path



def _safe(name: str) -> str:
    return "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in name)


def _node_colours(nodes) -> dict[str, tuple]:
    from matplotlib import colormaps
    cmap = colormaps["tab20"]
    # even entries of tab20 first (the strong colours), then the light ones: 20 distinct nodes
    order = [2 * i for i in range(10)] + [2 * i + 1 for i in range(10)]
    return {node: cmap(order[i % 20]) for i, node in enumerate(nodes)}


def _shade_phases(axes, corner: CornerResult) -> None:
    used = set()
    for phase in corner.phases:
        if phase.kind not in PHASE_SHADES:
            continue
        colour, label = PHASE_SHADES[phase.kind]
        axes.axvspan(phase.t_start_s / MINUTE, phase.t_end_s / MINUTE, color=colour, alpha=0.15,
                     label=None if phase.kind in used else label)
        used.add(phase.kind)
    if corner.stop_time_s is not None:
        axes.axvline(corner.stop_time_s / MINUTE, color="black", linestyle=":", linewidth=1.2, label="car stops")


def plot_corner_temperatures(corner: CornerResult, path: Path, title: str = "") -> Path:
    """Every output node against time [degC vs min], limit lines for the checks, phases shaded."""
    entries = len(corner.node_names) + len(corner.checks)
    figure = _new_figure(width=13.0 if entries > 20 else 10.0, height=6.5 if entries > 20 else 5.5)
    axes = figure.add_subplot()
    colours = _node_colours(corner.node_names)
    minutes = np.asarray(corner.time_s) / MINUTE
    for j, node in enumerate(corner.node_names):
        axes.plot(minutes, kelvin_to_celsius(corner.temperatures_k[:, j]), color=colours[node], label=node)
    for check in corner.checks:
        axes.axhline(kelvin_to_celsius(check.limit_k), color=colours.get(check.node, "black"), linestyle="--",
                     linewidth=1.0, label=f"limit {check.name} ({kelvin_to_celsius(check.limit_k):.0f} degC)")
    _shade_phases(axes, corner)
    axes.set_xlabel("time [min]")
    axes.set_ylabel("temperature [degC]")
    axes.set_title(f"{title}{corner.name}: temperatures")
    axes.grid(True, alpha=0.3)
    # many nodes and limits: two columns, so that the legend fits beside the axes
    axes.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize="x-small" if entries > 20 else "small",
                ncol=2 if entries > 20 else 1)
    return save_png(figure, path)


def plot_lap_peaks(results: Results, path: Path, nodes=LAP_PEAK_NODES) -> Path:
    """Per-lap peak of disc, fluid (at the pistons and bulk) and bearing for all corners [degC vs lap]."""
    present = [n for n in nodes if any(lap.max_k.get(n) is not None for c in results.corners for lap in c.laps)]
    if not present:
        raise OutputError(f"lap peak plot: no lap has a maximum for any of {', '.join(nodes)}")
    figure = _new_figure(10.0, 2.8 * len(present))
    for k, node in enumerate(present):
        axes = figure.add_subplot(len(present), 1, k + 1)
        for corner in results.corners:
            laps = [lap for lap in corner.laps if node in lap.max_k]
            if laps:
                axes.plot([lap.index for lap in laps], [kelvin_to_celsius(lap.max_k[node]) for lap in laps],
                          marker="o", markersize=3, label=corner.name)
        axes.xaxis.set_major_locator(MaxNLocator(integer=True))
        axes.set_ylabel(f"{node} peak [degC]")
        axes.set_title(f"{node}: highest temperature in each lap")
        axes.grid(True, alpha=0.3)
        axes.legend(fontsize="small")
    axes.set_xlabel("lap [-]")
    return save_png(figure, path)


def plot_heat_paths(results: Results, path: Path) -> Path:
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
        axes.barh(names, width, left=left, label=group)
        left += width
    axes.set_xlabel("share of the heat that left the corner [%]")
    axes.set_ylabel("corner")
    axes.set_xlim(0.0, 100.0)
    axes.invert_yaxis()   # corners top to bottom in run order
    axes.set_title("Where the heat went, whole run")
    axes.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize="small")
    return save_png(figure, path)


def plot_run(results: Results, out_dir) -> list[Path]:
    """Write the run's plots as PNG files into ``out_dir`` (created if missing).

    Parameters
    ----------
    results : Results  A finished run [-]
    out_dir : str or os.PathLike  Folder for the PNG files [-]

    Returns
    -------
    list of Path  One temperature plot per corner, the lap peak plot (when the run has laps)
        and the heat path plot (when heat left through a named group) [-]
    """
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    # fixed file names (a promise to users' scripts, listed in README); the scenario name is in the titles
    written = [plot_corner_temperatures(c, out / f"temperatures_{_safe(c.name)}.png", f"{results.scenario_name} ")
               for c in results.corners]
    if any(c.laps for c in results.corners):
        written.append(plot_lap_peaks(results, out / "lap_peaks.png"))
    if any(heat_path_shares(c) for c in results.corners):
        written.append(plot_heat_paths(results, out / "heat_paths.png"))
    return written


def _overlay(variants: list[tuple[str, Results]], corner_name: str, path: Path) -> Path:
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
            axes.plot(np.asarray(corner.time_s) / MINUTE, kelvin_to_celsius(corner.temperature(node)), label=name)
        check = governing_check(base, node)
        if check is not None:
            axes.axhline(kelvin_to_celsius(check.limit_k), color="black", linestyle="--", linewidth=1.0,
                         label=f"limit {check.name}")
        axes.set_ylabel(f"{node} [degC]")
        axes.set_title(f"{corner_name}: {node} temperature by variant")
        axes.grid(True, alpha=0.3)
        axes.legend(fontsize="small")
    axes.set_xlabel("time [min]")
    return save_png(figure, path)


def _gain_bars(variants: list[tuple[str, Results]], path: Path) -> Path:
    gains = margin_gains(variants, COMPARE_NODES)
    labels = [f"{corner}\n{node}" for corner, per_node in next(iter(gains.values())).items() for node in per_node]
    if not labels:
        raise OutputError("comparison: the baseline has no check on fluid or bearing, so no margin to compare")
    figure = _new_figure(max(6.0, 1.1 * len(labels) + 3.0), 5.0)
    axes = figure.add_subplot()
    x = np.arange(len(labels))
    width = 0.8 / len(gains)
    for k, (name, per_corner) in enumerate(gains.items()):
        values = [g for per_node in per_corner.values() for g in per_node.values()]
        axes.bar(x + (k - (len(gains) - 1) / 2) * width, values, width, label=name)
    axes.axhline(0.0, color="black", linewidth=0.8)
    axes.set_xticks(x, labels)
    axes.set_ylabel("margin gained vs baseline [K]")
    axes.set_xlabel("corner and node (governing check)")
    axes.set_title(f"Margin gained against the baseline '{variants[0][0]}'")
    axes.grid(True, axis="y", alpha=0.3)
    axes.legend(fontsize="small")
    return save_png(figure, path)


def plot_comparison(variant_results: list[tuple[str, Results]], out_dir) -> list[Path]:
    """Overlay fluid and bearing temperatures of all variants per corner, and bar the margin gained.

    Parameters
    ----------
    variant_results : list of (str, Results)  Named variants, the first is the baseline [-]
    out_dir : str or os.PathLike  Folder for the PNG files [-]

    Returns
    -------
    list of Path  One overlay per corner of the baseline, then the margin-gain bar chart
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
