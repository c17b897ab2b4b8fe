"""Facts the summary, the report and the plots all read off a corner: peaks, soak, heat paths, laps.

Nothing here runs a model; everything works on :mod:`thermo.results` objects, in SI and kelvin.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from thermo.output.errors import OutputError
from thermo.results import CheckResult, CornerResult, LapSpan, Results

# Nodes whose peaks a comparison shows, in this order (terminal table and report.html)
COMPARED_PEAK_NODES = ("disc", "disc_surface", "pad", "piston", "fluid_at_piston", "fluid", "caliper", "hub", "bearing",
                       "upright")
# Nodes that keep heating after the car stops, listed first in soak tables.
SOAK_NODES = ("fluid_at_piston", "fluid", "piston", "caliper", "hub", "upright", "bearing")
# A soak peak within this share of the soak's duration (or the last sample step) of its end, with
# the temperature still climbing at the last sample, is "still rising": the true peak comes later.
STILL_RISING_TAIL_SHARE = 0.02
# Slower than this at the last sample [K/s] (0.36 K an hour) a node counts as settled, not rising.
STILL_RISING_MIN_RATE_K_S = 1e-4


@dataclass(frozen=True)
class SoakRow:
    """One node after the stop: its peak after the stop and whether that was the run's worst moment."""

    node: str
    peak_k: float                # highest temperature at or after the stop [K]
    after_stop_s: float          # time of that peak after the stop [s]
    run_peak_k: float            # highest temperature of the whole run [K]
    run_peak_time_s: float       # time of the whole-run peak [s]
    worst_after_stop: bool       # the whole-run peak came after the stop
    still_rising: bool = False   # the soak peak is at the end of the soak and still climbing there


def _check_samples(corner: CornerResult) -> None:
    n_t = np.shape(corner.time_s)[0] if np.ndim(corner.time_s) else 0
    if n_t == 0:
        raise OutputError(f"corner {corner.name}: time_s has no samples")
    if np.shape(corner.temperatures_k) != (n_t, len(corner.node_names)):
        raise OutputError(f"corner {corner.name}: temperatures_k has shape {np.shape(corner.temperatures_k)}, "
                          f"expected ({n_t}, {len(corner.node_names)}) for time x nodes")


def _peak(series: np.ndarray, time_s: np.ndarray) -> tuple[float, float]:
    """(max, time of the first max) ignoring NaN samples; (nan, nan) when every sample is NaN."""
    if np.all(np.isnan(series)):
        return math.nan, math.nan
    i = int(np.nanargmax(series))
    return float(series[i]), float(time_s[i])


def node_peaks(corner: CornerResult) -> dict[str, tuple[float, float]]:
    """Each output node's (peak temperature [K], time of peak [s]) over the whole run."""
    _check_samples(corner)
    return {node: _peak(corner.temperatures_k[:, j], corner.time_s) for j, node in enumerate(corner.node_names)}


def soak_node_order(corner: CornerResult) -> list[str]:
    """Output nodes with the soak-critical ones (fluid, piston, caliper, hub, upright, bearing) first."""
    first = [n for n in SOAK_NODES if n in corner.node_names]
    return first + [n for n in corner.node_names if n not in first]


def still_rising_at_end(time_s: np.ndarray, series: np.ndarray, start_s: float) -> bool:
    """Whether a series peaks at the end of the window from ``start_s`` and still climbs there.

    True when the highest sample at or after ``start_s`` lies within the window's last
    ``STILL_RISING_TAIL_SHARE`` of its duration (at least its last sample step) and the last
    step climbs faster than ``STILL_RISING_MIN_RATE_K_S``: the run ended before the peak.
    """
    time_s, series = np.asarray(time_s, dtype=float), np.asarray(series, dtype=float)
    inside = time_s >= start_s
    t, y = time_s[inside], series[inside]
    if t.size < 2 or np.all(np.isnan(y)) or t[-1] <= t[-2]:
        return False
    if not (y[-1] - y[-2]) / (t[-1] - t[-2]) > STILL_RISING_MIN_RATE_K_S:
        return False
    tail = max(STILL_RISING_TAIL_SHARE * (t[-1] - t[0]), t[-1] - t[-2])
    return bool(t[int(np.nanargmax(y))] >= t[-1] - tail)


def check_still_rising(corner: CornerResult, check: CheckResult) -> bool:
    """Whether a check's peak falls at the end of the run, in the soak, with its node still heating.

    Its margin then holds only for the soak as run: a longer soak would find a higher peak.
    False when the run has no soak or the checked node is not among the output nodes.
    """
    if corner.stop_time_s is None or check.node not in corner.node_names:
        return False
    stop = float(corner.stop_time_s)
    return check.peak_time_s >= stop and still_rising_at_end(corner.time_s, corner.temperature(check.node), stop)


def soak_rows(corner: CornerResult) -> list[SoakRow] | None:
    """The soak table of a corner, or None when the run has no stop (``stop_time_s`` is None)."""
    if corner.stop_time_s is None:
        return None
    _check_samples(corner)
    stop = float(corner.stop_time_s)
    after = corner.time_s >= stop
    if not np.any(after):
        raise OutputError(f"corner {corner.name}: stop_time_s {stop:g} s is after the last sample "
                          f"({float(corner.time_s[-1]):g} s); expected a time inside the run")
    rows = []
    for node in soak_node_order(corner):
        series = corner.temperature(node)
        peak_k, peak_t = _peak(series[after], corner.time_s[after])
        run_k, run_t = _peak(series, corner.time_s)
        rising = still_rising_at_end(corner.time_s, series, stop)
        rows.append(SoakRow(node, peak_k, peak_t - stop, run_k, run_t, bool(run_t > stop), rising))
    return rows


def outward_links(corner: CornerResult) -> list[bool]:
    """Which links carry heat out of the corner (to ambient air, duct air ...), one flag per link.

    The corner's ``facts.link_to_boundary``: one flag per link, True where its second end is a
    boundary (ambient or duct air).
    """
    flags = corner.facts.link_to_boundary
    if len(flags) != len(corner.link_names):
        raise OutputError(f"corner {corner.name}: link_to_boundary has {len(flags)} flags, expected "
                          f"{len(corner.link_names)}, one per link")
    return list(flags)


def heat_path_shares(corner: CornerResult) -> dict[str, float]:
    """Share (0..1) of the heat that left the corner through each link group, over the whole run.

    A group's heat is the sum of ``link_energy_j`` of its links that lead out of the corner
    (see :func:`outward_links`). A group that brought net heat in counts as zero outflow.
    Shares add up to 1 (all zero when no heat left).
    """
    energy = np.asarray(corner.link_energy_j, dtype=float)
    if energy.shape != (len(corner.link_names),) or len(corner.link_groups) != len(corner.link_names):
        raise OutputError(f"corner {corner.name}: link_energy_j, link_groups and link_names must have one "
                          f"entry per link ({len(corner.link_names)})")
    totals: dict[str, float] = {}
    for group, joules, out in zip(corner.link_groups, energy, outward_links(corner)):
        if out:
            label = group or "ungrouped"
            totals[label] = totals.get(label, 0.0) + float(joules)
    outflow = {g: max(j, 0.0) for g, j in totals.items()}
    total = sum(outflow.values())
    return {g: (j / total if total > 0 else 0.0) for g, j in outflow.items()}


def governing_check(corner: CornerResult, node: str) -> CheckResult | None:
    """The check on ``node`` with the smallest margin, or None when no check watches that node."""
    on_node = [c for c in corner.checks if c.node == node]
    return min(on_node, key=lambda c: c.margin_k) if on_node else None


def worst_lap(laps: tuple[LapSpan, ...], corner: CornerResult) -> LapSpan | None:
    """The lap in which the most critical node ran hottest.

    The critical node is the one watched by the check of smallest margin (if its node is
    in the laps' maxima), else "fluid", else the first node of the first lap.
    """
    if not laps:
        return None
    keys = laps[0].max_k
    node = None
    for check in sorted(corner.checks, key=lambda c: c.margin_k):
        if check.node in keys:
            node = check.node
            break
    if node is None:
        node = "fluid" if "fluid" in keys else next(iter(keys), None)
    if node is None:
        return None
    return max(laps, key=lambda lap: lap.max_k.get(node, -math.inf))


def laps_to_show(laps: tuple[LapSpan, ...], corner: CornerResult, max_rows: int = 40,
                 every_target: int = 20) -> tuple[list[LapSpan], int]:
    """Laps for a compact table and the stride used (1: all laps).

    Up to ``max_rows`` laps are all shown; beyond that every n-th lap (n chosen for about
    ``every_target`` rows) plus the last and the worst lap (see :func:`worst_lap`).
    """
    if len(laps) <= max_rows:
        return list(laps), 1
    stride = math.ceil(len(laps) / every_target)
    chosen = set(range(0, len(laps), stride)) | {len(laps) - 1}
    worst = worst_lap(laps, corner)
    if worst is not None:
        chosen.add(laps.index(worst))
    return [laps[i] for i in sorted(chosen)], stride


def margin_gains(variants: list[tuple[str, Results]], nodes=("fluid_at_piston", "fluid", "bearing")) -> dict:
    """Margin gained [K] on each node's governing check against the first (baseline) variant.

    Returns ``{variant: {corner: {node: margin_k - baseline_margin_k}}}`` for every variant after
    the first and every node that a check of the baseline corner watches. Every variant must
    have the baseline's corners and checks on those nodes.
    """
    if len(variants) < 1:
        raise OutputError("comparison: expected at least one (name, Results) variant, the first is the baseline")
    base_name, base = variants[0]
    gains: dict = {}
    for name, results in variants[1:]:
        per_corner = {}
        for base_corner in base.corners:
            try:
                corner = results.corner(base_corner.name)
            except KeyError:
                raise OutputError(f"comparison: variant '{name}' has no corner '{base_corner.name}' "
                                  f"(baseline '{base_name}' has)") from None
            per_node = {}
            for node in nodes:
                ref = governing_check(base_corner, node)
                if ref is None:
                    continue
                other = governing_check(corner, node)
                if other is None:
                    raise OutputError(f"comparison: variant '{name}' corner '{corner.name}' has no check on "
                                      f"node '{node}' (baseline '{base_name}' has '{ref.name}')")
                per_node[node] = float(other.margin_k - ref.margin_k)
            per_corner[base_corner.name] = per_node
        gains[name] = per_corner
    return gains
