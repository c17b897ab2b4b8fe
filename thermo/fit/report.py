"""A fit as a printed table and as one JSON-ready object (degrees Celsius only in labels)."""
from __future__ import annotations

from thermo import CAUTION

import math

from lapdata.units import KELVIN_AT_0C


def _num(x: float):
    return x if math.isfinite(x) else None


def fit_dict(result, *, scenario: str, measured: str, calibrated: str | None) -> dict:
    """JSON object: parameters (name, value, std_error, ...), correlation, rms_k, holdout_rms_k, peaks, warnings."""
    names = [v.name for v in result.values]
    out = {
        "caution": CAUTION,
        "scenario": scenario, "measured": measured, "calibrated_scenario": calibrated,
        "parameters": [{"name": v.name, "kind": v.kind, "value": v.value, "std_error": _num(v.std_error),
                        "prior": v.prior, "lower": _num(v.lower), "upper": _num(v.upper),
                        "override_keys": list(v.override_keys), "at_bound": v.at_bound} for v in result.values],
        "correlation": {"names": names,
                        "matrix": [[_num(float(c)) for c in row] for row in result.correlation]},
        "rms_k": {k: _num(v) for k, v in result.rms_k.items()},
        "peaks": [{"name": p.name, "kind": p.kind, "temperature_k": p.temperature_k,
                   "predicted_peak_k": p.predicted_peak_k, "honoured": p.honoured} for p in result.peaks],
        "warnings": list(result.warnings), "evaluations": result.evaluations, "converged": result.converged,
        "message": result.message, "residual_count": result.residual_count,
    }
    if result.holdout_laps:
        out["holdout_laps"] = list(result.holdout_laps)
        out["holdout_rms_k"] = {k: _num(v) for k, v in result.holdout_rms_k.items()}
    return out


def format_fit(result) -> str:
    """The table engineers read: fitted values with std errors, correlations, RMS per channel."""
    from thermo.output.text_table import format_table
    lines = format_table(["parameter", "value", "std error", "prior", "bounds", "note"],
                         [[v.name, f"{v.value:.4g}", f"{v.std_error:.3g}", f"{v.prior:.4g}",
                           f"[{v.lower:g}, {v.upper:g}]" if math.isfinite(v.lower) else "free",
                           "at bound" if v.at_bound else ""] for v in result.values],
                         align=["left", "right", "right", "right", "right", "left"], indent="")
    if len(result.values) > 1:
        lines += ["", "correlations"]
        for i, a in enumerate(result.values):
            for j in range(i + 1, len(result.values)):
                lines.append(f"  {a.name} / {result.values[j].name}: {result.correlation[i, j]:+.3f}")
    headers = ["channel", "RMS fit [K]"] + (["RMS hold-out [K]"] if result.holdout_laps else [])
    lines += [""] + format_table(headers, [[name, f"{rms:.3f}"] + ([f"{result.holdout_rms_k[name]:.3f}"]
                                                                   if result.holdout_laps else [])
                                           for name, rms in result.rms_k.items()], indent="")
    if result.holdout_laps:
        lines.append(f"(held-out laps: {', '.join(map(str, result.holdout_laps))})")
    if result.peaks:
        lines += ["", "peak readings"]
        for p in result.peaks:
            lines.append(f"  {p.name}: predicted peak {p.predicted_peak_k - KELVIN_AT_0C:.1f} degC, "
                         f"{'honoured' if p.honoured else 'NOT honoured'}")
    lines += ["", f"{result.evaluations} model runs; {result.message}"]
    lines += [f"warning: {w}" for w in result.warnings]
    lines += ["", CAUTION]
    return "\n".join(lines)
