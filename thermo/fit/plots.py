"""Measured against predicted readings per channel, with residuals (PNG, Agg canvas, written atomically)."""
from __future__ import annotations

from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from lapdata.units import kelvin_to_celsius
from thermo.output.plots import save_png

DPI = 110


def plot_channel(series, path: Path) -> Path:
    """Top: logged and predicted reading [degC]; bottom: predicted minus logged [K]; held-out laps shaded."""
    figure = Figure(figsize=(10.0, 6.0), dpi=DPI, layout="constrained")
    FigureCanvasAgg(figure)
    top, bottom = figure.subplots(2, 1, sharex=True, height_ratios=(3, 1))
    t = series.time_s
    top.plot(t, kelvin_to_celsius(series.measured_k), ".", ms=2, color="tab:gray", label="logged")
    top.plot(t, kelvin_to_celsius(series.predicted_k), "-", color="tab:red", label="fitted model (sensor view)")
    residual = series.predicted_k - series.measured_k
    bottom.plot(t, residual, ".", ms=2, color="tab:blue")
    bottom.axhline(0.0, color="black", lw=0.8)
    if series.holdout.any():
        edges = np.flatnonzero(np.diff(np.concatenate([[0], series.holdout.astype(int), [0]])))
        for k, (a, b) in enumerate(zip(edges[::2], edges[1::2])):
            for ax in (top, bottom):
                ax.axvspan(t[a], t[b - 1], color="gold", alpha=0.25, label="held-out laps" if (k == 0 and ax is top) else None)
    top.set_ylabel("temperature [degC]")
    top.set_title(f"{series.channel}: logged against fitted model")
    top.legend(loc="best")
    bottom.set_ylabel("residual [K]")
    bottom.set_xlabel("time [s]")
    return save_png(figure, path)


def plot_fit(result, out_dir: Path) -> list[Path]:
    """One PNG per channel, fit_<channel>.png, in ``out_dir``."""
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    return [plot_channel(s, out_dir / f"fit_{s.channel}.png") for s in result.series]
