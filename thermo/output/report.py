"""The plain-text run report for the terminal: what the engineer reads before signing off.

Per corner: node peaks, limit checks with margins, the energy balance, heat paths, the soak
after the stop, a compact lap table and pad thickness. Warnings and references, then the
caution. Temperatures in degC, margins in K, times in s (and min:s), as the headers say.
"""
from __future__ import annotations

import math

from lapdata.units import kelvin_to_celsius
from thermo import CAUTION
from thermo.output.analysis import check_still_rising, heat_path_shares, laps_to_show, node_peaks, soak_rows, worst_lap
from thermo.output.text_table import format_table
from thermo.results import CornerResult, Results

RULE = "-" * 78
STATUS_WORDS = {"ok": "ok", "caution": "CAUTION", "exceeded": "EXCEEDED"}
AFTER_STOP_MARK = "<< worst of the run came AFTER the stop"
STILL_RISING_MARK = "still rising at the end"
LONGER_SOAK_ADVICE = "run a longer soak (plan soak duration_s)"


def _c(kelvin) -> str:
    return "-" if kelvin is None or not math.isfinite(kelvin) else f"{kelvin_to_celsius(kelvin):.1f}"


def _num(value, fmt: str = ".1f") -> str:
    return "-" if value is None or not math.isfinite(value) else format(value, fmt)


def _clock(seconds) -> str:
    """Seconds as m:ss (h:mm:ss past an hour)."""
    if seconds is None or not math.isfinite(seconds):
        return "-"
    sign, total = ("-" if seconds < 0 else ""), int(round(abs(seconds)))
    hours, rest = divmod(total, 3600)
    minutes, secs = divmod(rest, 60)
    return f"{sign}{hours}:{minutes:02d}:{secs:02d}" if hours else f"{sign}{minutes}:{secs:02d}"


def _table(headers: list[str], rows: list[list[str]], indent: str = "  ") -> list[str]:
    return format_table(headers, rows, indent=indent)


def _ordinal(n: int) -> str:
    suffix = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def _peaks_section(corner: CornerResult) -> list[str]:
    rows = [[node, _c(k), _num(t), _clock(t)] for node, (k, t) in node_peaks(corner).items()]
    return ["Peak temperatures", *_table(["node", "peak [degC]", "at [s]", "at [m:s]"], rows)]


def _checks_section(corner: CornerResult) -> list[str]:
    if not corner.checks:
        return ["Limit checks: none were set for this corner"]
    rows = [[c.name, c.node, _c(c.limit_k), _c(c.peak_k), _num(c.margin_k, "+.1f"),
             STATUS_WORDS.get(c.status, c.status.upper()), _num(c.peak_time_s), c.source] for c in corner.checks]
    headers = ["check", "node", "limit [degC]", "peak [degC]", "margin [K]", "status", "peak at [s]", "source"]
    lines = ["Limit checks (margin = limit - peak)", *_table(headers, rows)]
    rising = [c.name for c in corner.checks if check_still_rising(corner, c)]
    if rising:
        lines.append(f"  ! {', '.join(rising)}: peak still rising at the end of the soak, so the margin may be "
                     f"smaller: {LONGER_SOAK_ADVICE}")
    return lines


def _energy_lines(corner: CornerResult) -> list[str]:
    e = corner.energy
    lines = [f"Energy balance [kJ]: heat in {e.heat_in_j / 1e3:.1f} = stored {e.stored_j / 1e3:.1f} "
             f"+ lost {e.lost_j / 1e3:.1f}; relative error {e.balance_rel_error:.2e}"]
    shares = heat_path_shares(corner)
    if shares:
        ranked = sorted(shares.items(), key=lambda item: -item[1])
        lines.append("Heat out of the corner by path [%]: " +
                     ", ".join(f"{g} {100 * s:.1f}" for g, s in ranked))
    return lines


def _soak_section(corner: CornerResult) -> list[str]:
    rows = soak_rows(corner)
    if rows is None:
        return ["Soak: the run has no stop"]
    stop = float(corner.stop_time_s)
    table = [[r.node, _c(r.peak_k), _num(r.after_stop_s), _clock(r.after_stop_s), _c(r.run_peak_k),
              "; ".join(([AFTER_STOP_MARK] if r.worst_after_stop else []) +
                        ([STILL_RISING_MARK] if r.still_rising else []))] for r in rows]
    headers = ["node", "peak after stop [degC]", "after stop [s]", "[m:s]", "run peak [degC]", "note"]
    worst = [r.node for r in rows if r.worst_after_stop]
    summary = (f"  Peak of the whole run came after the stop for: {', '.join(worst)}" if worst
               else "  No node reached its run peak after the stop.")
    lines = [f"Soak after the stop at {stop:.1f} s ({_clock(stop)})", *_table(headers, table), summary]
    rising = [r.node for r in rows if r.still_rising]
    if rising:
        lines.append(f"  ! {', '.join(rising)} still rising at the end of the soak: {LONGER_SOAK_ADVICE}")
    return lines


def _laps_section(corner: CornerResult, lap_rows: int | None = None) -> list[str]:
    if not corner.laps:
        return ["Laps: none recorded"]
    if lap_rows is None:
        shown, stride = laps_to_show(corner.laps, corner)
    else:
        shown, stride = laps_to_show(corner.laps, corner, max_rows=lap_rows, every_target=lap_rows)
    lap_nodes = [n for n in corner.node_names if n in corner.laps[0].max_k]
    lap_nodes += [n for n in corner.laps[0].max_k if n not in lap_nodes]
    title = f"Per-lap maxima [degC], {len(corner.laps)} laps"
    if stride > 1:
        worst = worst_lap(corner.laps, corner)
        title += f" (every {_ordinal(stride)} lap shown, plus the last and the worst, lap {worst.index})"
    rows = [[str(lap.index), lap.phase] + [_c(lap.max_k.get(n)) for n in lap_nodes] +
            [_num(lap.braking_energy_j / 1e3)] for lap in shown]
    return [title, *_table(["lap", "phase"] + lap_nodes + ["braking [kJ]"], rows)]


def _pad_lines(corner: CornerResult) -> list[str]:
    """The pad thickness at the end of each stint, and the pad's minimum."""
    facts = corner.facts
    lines = []
    if facts.pad_thickness_m:
        text = ", ".join(f"{row.when} {row.thickness_m * 1e3:.1f}".strip() for row in facts.pad_thickness_m)
        lines.append(f"Pad thickness [mm]: {text}")
    lines.append(f"Pad minimum thickness [mm]: {facts.pad_minimum_thickness_m * 1e3:.1f}")
    return lines


def format_corner_report(corner: CornerResult, lap_rows: int | None = None) -> str:
    """The report section of one corner; ``lap_rows``: about how many per-lap rows (None: up to 40
    laps all, else about 20 of them with the last and the worst)."""
    parts = [RULE, f"Corner {corner.name}", RULE, *_peaks_section(corner), "", *_checks_section(corner), "",
             *_energy_lines(corner), "", *_soak_section(corner), "", *_laps_section(corner, lap_rows)]
    pad = _pad_lines(corner)
    if pad:
        parts += ["", *pad]
    return "\n".join(parts)


def hydraulics_lines(h: dict | None) -> list[str]:
    """The hydraulics block: bias, pressure ratio, per-corner caliper figures, master cylinders."""
    if not h:
        return []
    lines = [RULE, "Hydraulics (rigid: line and caliper compliance and seal roll-back not modelled)", RULE,
             f"Front share of the brake torque: {h['front_share'] * 100:.1f} % ({h['bias']} bias); "
             f"front/rear line pressure ratio {_num(h['pressure_ratio_front_to_rear'], '.3f')}"]
    headers = ["corner", "calipers", "piston area one side [mm2]", "caliper [mm2]", "clamp [N/bar]",
               "torque [N m/bar]", "fluid [cm3/mm]", "leading/trailing"]
    rows = [[name, str(c["calipers"]), f"{c['piston_area_one_side_mm2']:.0f}", f"{c['piston_area_caliper_mm2']:.0f}",
             f"{c['clamp_force_n_per_bar']:.1f}", f"{c['brake_torque_nm_per_bar']:.2f}",
             f"{c['fluid_displacement_cm3_per_mm']:.3f}", f"{c['leading_trailing_area_ratio']:.3f}"]
            for name, c in h["corners"].items()]
    lines += _table(headers, rows)
    for name, c in h["corners"].items():
        stints = c.get("pad_wear_by_stint") or []
        if stints:
            lines.append(f"  {name}: fluid drawn from the reservoir as the pads wore, per stint [cm3]: "
                         + ", ".join(f"{row['fluid_cm3']:.1f} ({row['wear_mm']:.2f} mm, to {row['stint_end']})"
                                     for row in stints))
    mc = h.get("master_cylinders")
    if mc:
        lines.append(f"Master cylinders {mc['front_bore_mm']:.1f} / {mc['rear_bore_mm']:.1f} mm, balance bar "
                     f"{mc['balance_bar_front_share'] * 100:.1f} % front, pedal ratio {h['pedal_ratio']:g}: "
                     f"{mc['line_pressure_front_bar_per_n']:.3f} / {mc['line_pressure_rear_bar_per_n']:.3f} bar per N "
                     f"of pedal force front / rear")
        lines.append(f"Pedal travel: {mc['pedal_travel_mm_per_mm_piston_travel']:.2f} mm per mm of piston travel; "
                     f"{mc['knock_back_pedal_travel_mm']:.1f} mm to take up a knock-back of {h['knock_back_mm']:.2f} mm")
    else:
        lines.append("Master cylinders: not given (bias = \"fixed\"); give them with bias = \"hydraulic\" "
                     "for line pressures and pedal travel")
    return lines


def format_run_report(results: Results, lap_rows: int | None = None) -> str:
    """The whole run as plain ASCII text, ending with the caution.

    Parameters
    ----------
    results : Results
        A finished run [-]
    lap_rows : int or None
        About how many rows each per-lap table shows (None: the compact default) [-]

    Returns
    -------
    str
        The report, lines separated by newlines [-]
    """
    head = [f"brakeheat run report: {results.scenario_name}",
            f"brakeheat {results.version}, solver {results.solver}: {results.solver_status}"]
    if results.overrides:
        head += ["Overrides applied on top of the scenario file:"] + [f"  {k} = {v}" for k, v in results.overrides]
    if results.warnings:
        head += ["Warnings:"] + [f"  ! {w}" for w in results.warnings]
    body = [format_corner_report(c, lap_rows) for c in results.corners]
    tail = hydraulics_lines(results.hydraulics)
    tail += [RULE, "References"] + [f"  - {ref}" for ref in results.references]
    tail += [RULE, results.caution or CAUTION]
    text = "\n".join(head + [""] + ["\n\n".join(body)] + tail) + "\n"
    return text.encode("ascii", "replace").decode("ascii")
