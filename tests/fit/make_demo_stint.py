"""Make a SYNTHETIC logged stint for `brakeheat fit`: the model itself, with known parameters, plus sensor effects.

Not a measurement. The speed trace is the scenario's track lap (quasi-steady builder) driven at a
pace that varies a little from lap to lap, with speed noise; the temperature channels are the
model's node temperatures for the TRUE parameters, seen through each channel's first-order lag,
with a sensor offset and Gaussian noise, rounded as a logger would.

    python tests/fit/make_demo_stint.py        # rewrites scenarios/demo_logged_stint.csv

``synthesize_stint`` is also used by the tests (tests/fit/conftest.py).
"""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from lapdata.reader import read_trace_csv
from lapdata.track import build_speed_trace, read_track_toml
from lapdata.units import KELVIN_AT_0C, KMH
from thermo.fit.sensor import sensor_reading
from thermo.fit.stint import StintRunner, logged_segments
from thermo.scenario import load_scenario

ROOT = Path(__file__).resolve().parents[2]


@dataclass(frozen=True)
class SyntheticChannel:
    channel: str
    corner: str
    node: str
    lag_s: float
    offset_k: float
    noise_k: float


def _speed_log(scenario, laps: int, sample_hz: float, rng) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    track = read_track_toml(scenario.plan.lap_path)
    t_all, d_all, v_all, t0, d0 = [], [], [], 0.0, 0.0
    for k in range(laps):
        lap = build_speed_trace(track, scenario.envelope, sample_hz=sample_hz, pace=float(rng.uniform(0.97, 1.0)))
        skip = 1 if k else 0
        t_all.append(lap.time_s[skip:] + t0)
        d_all.append(lap.distance_m[skip:] + d0)
        v_all.append(lap.speed_mps[skip:])
        t0, d0 = t_all[-1][-1], d_all[-1][-1]
    # one uniform time base, the logger's own
    t_raw, d_raw, v_raw = map(np.concatenate, (t_all, d_all, v_all))
    t = np.arange(0.0, t_raw[-1], 1.0 / sample_hz)
    speed = np.interp(t, t_raw, v_raw) + rng.normal(0.0, 0.15, t.size)   # ~0.5 km/h wheel-speed noise
    return t, np.interp(t, t_raw, d_raw), np.maximum(speed, 1.0)


def synthesize_stint(scenario_path, out_csv, channels, truth, *, laps=3, sample_hz=10.0, seed=7) -> Path:
    """Write a synthetic logged stint CSV for a scenario and (dotted key, value) true parameters."""
    rng = np.random.default_rng(seed)
    scenario = load_scenario(scenario_path)
    t, d, v = _speed_log(scenario, laps, sample_hz, rng)
    out_csv = Path(out_csv)
    header = "time [s],distance [m],speed [km/h]"
    rows = np.column_stack([t, d, v / KMH])
    fmt = ["%.2f", "%.2f", "%.2f"]
    np.savetxt(out_csv, rows, fmt=fmt, delimiter=",", header=header, comments="")
    trace = read_trace_csv(out_csv)                     # simulate the duty exactly as the fit will read it
    lap_m = read_track_toml(scenario.plan.lap_path).length_m
    corners = tuple(dict.fromkeys(c.corner for c in channels))
    runner = StintRunner(scenario, logged_segments(scenario, trace, lap_m), corners)
    prediction = runner.run(list(truth))
    columns = []
    for c in channels:
        reading = sensor_reading(*prediction.node(c.corner, c.node), c.lag_s, c.offset_k, trace.time_s)
        columns.append(reading + rng.normal(0.0, c.noise_k, reading.size) - KELVIN_AT_0C)
    header += "".join(f",{c.channel} [degC]" for c in channels)
    comment = ("# SYNTHETIC logged stint, invented car on an invented circuit: made by tests/fit/make_demo_stint.py "
               "from the brakeheat model with known parameters " + "; ".join(f"{k} = {val:g}" for k, val in truth)
               + "; sensor lag, offset and noise added. Not a measurement.\n")
    rows = np.column_stack([trace.time_s, trace.distance_m, trace.speed_mps / KMH] + columns)
    body = "\n".join(",".join(f"{x:.2f}" for x in row) for row in rows)
    out_csv.write_text(comment + header + "\n" + body + "\n", encoding="utf-8")
    return out_csv


# The demo's truth: what scenarios/demo_fit.toml's fit should recover (its priors are elsewhere).
DEMO_TRUTH = (("corners.front.airflow.disc_convection_multiplier", 1.3),
              ("corners.front.airflow.caliper_convection_multiplier", 0.7))
DEMO_CHANNELS = (SyntheticChannel("temp_disc_front", "front", "disc_surface", 0.2, 0.0, 3.0),
                 SyntheticChannel("temp_caliper_front", "front", "caliper", 4.0, 2.5, 0.3))


if __name__ == "__main__":
    path = synthesize_stint(ROOT / "scenarios" / "demo_fit.toml", ROOT / "scenarios" / "demo_logged_stint.csv",
                            DEMO_CHANNELS, DEMO_TRUTH, laps=6, sample_hz=10.0, seed=2024)
    print(f"wrote {path}")
