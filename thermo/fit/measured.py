"""Measured temperature channels of a logged stint, matched to the scenario's [calibration] channels."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.reader import read_trace_csv
from lapdata.trace import LapTrace
from thermo.fit.errors import FitError
from thermo.scenario.calibration import Calibration, ChannelMap


@dataclass(frozen=True)
class MeasuredChannel:
    """One logged channel's samples used by the fit, on the run's time axis."""

    mapping: ChannelMap
    time_s: np.ndarray        # run time of each sample [s]
    values_k: np.ndarray      # logged reading [K]
    lap: np.ndarray           # lap number of each sample (0 in a stop) [-]
    holdout: np.ndarray       # True for samples in a held-out lap [-]


def read_log(path) -> LapTrace:
    """The logged stint (speed, distance and temp_* channels) as a trace."""
    return read_trace_csv(path)


def check_columns(trace: LapTrace, calibration: Calibration, source: str) -> None:
    """Every temp_* column mapped, every mapped channel present."""
    mapped = {c.channel for c in calibration.channels}
    logged = set(trace.temperatures_k)
    for name in sorted(logged - mapped):
        raise FitError(f"{source}: column {name} is not mapped to a node: add [calibration.channels.{name}] "
                       "with corner and node (e.g. node = \"disc_surface\") to the scenario")
    for name in sorted(mapped - logged):
        have = ", ".join(sorted(logged)) or "no temp_* columns"
        raise FitError(f"{source}: no column '{name} [degC]' for [calibration.channels.{name}]; the file has {have}")


def pick_samples(time_s: np.ndarray, spacing_s: float) -> np.ndarray:
    """Indices of the first sample in each interval of ``spacing_s`` (all samples when 0) [-]."""
    if spacing_s <= 0:
        return np.arange(time_s.size)
    bins = np.floor((time_s - time_s[0]) / spacing_s + 1e-9).astype(np.int64)
    return np.flatnonzero(np.concatenate([[True], np.diff(bins) > 0]))


def measured_channels(trace: LapTrace, calibration: Calibration, span_s: tuple[float, float], lap_of,
                      source: str) -> tuple[tuple[MeasuredChannel, ...], list[str]]:
    """Samples of each mapped channel inside the run, with their laps; notes on what was left out.

    ``lap_of`` maps run times to lap numbers. A log whose time base (shifted by time_offset_s)
    does not overlap the run is an error; samples outside the run are left out and said so.
    """
    check_columns(trace, calibration, source)
    run_time = trace.time_s + calibration.time_offset_s
    t0, t1 = span_s
    inside = (run_time >= t0 - 1e-9) & (run_time <= t1 + 1e-9)
    if np.count_nonzero(inside) < 2:
        raise FitError(f"{source}: the logged time {run_time[0]:.1f} to {run_time[-1]:.1f} s (with time_offset_s = "
                       f"{calibration.time_offset_s:g}) does not overlap the run, {t0:.1f} to {t1:.1f} s")
    notes = []
    if not inside.all():
        notes.append(f"{np.count_nonzero(~inside)} logged samples lie outside the run ({t0:.1f} to {t1:.1f} s) "
                     "and were not used")
    keep = np.flatnonzero(inside)
    keep = keep[pick_samples(run_time[keep], calibration.sample_s)]
    laps = lap_of(run_time[keep])
    present = set(int(x) for x in np.unique(laps) if x > 0)
    missing = [lap for lap in calibration.holdout_laps if lap not in present]
    if missing:
        raise FitError(f"{source}: [calibration] holdout_laps {missing} are not in the logged run, which has laps "
                       f"{min(present, default=0)} to {max(present, default=0)}")
    holdout = np.isin(laps, calibration.holdout_laps)
    if calibration.holdout_laps and holdout.all():
        raise FitError(f"{source}: [calibration] holdout_laps leave no laps to fit on")
    channels = tuple(MeasuredChannel(m, run_time[keep], trace.temperatures_k[m.channel][keep], laps, holdout)
                     for m in calibration.channels)
    return channels, notes
