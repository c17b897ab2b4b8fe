"""Regenerate scenarios/demo_lap.csv: one synthetic, invented lap "logged" at 20 Hz.

Run from the repository root: ``/work/venv/bin/python tests/lapdata_tests/make_demo_lap.py``.
The lap comes from the quasi-steady builder on the invented Kestrel Valley Raceway with the
invented car below, plus small seeded noise. Brake pressures are made up from the braking part of
the deceleration (total minus aerodynamic drag): front 35 bar per g, rear 0.7 of the front.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from lapdata.track import CarEnvelope, build_speed_trace, read_track_toml
from lapdata.units import KMH, STANDARD_GRAVITY

ROOT = Path(__file__).resolve().parents[2]
CIRCUIT = ROOT / "scenarios" / "demo_circuit.toml"
OUTPUT = ROOT / "scenarios" / "demo_lap.csv"
# The invented demo car (also recorded in the comment at the top of demo_circuit.toml).
DEMO_CAR = CarEnvelope(mass_kg=1000.0, braking_decel_g=1.6, lateral_grip_g=1.7, power_w=400e3,
                       traction_accel_g=1.0, downforce_cl_a_m2=3.0, drag_cd_a_m2=1.0,
                       air_density_kg_m3=1.2)
FRONT_BAR_PER_G = 35.0   # invented hydraulics  # common practice, no published source
REAR_TO_FRONT = 0.7      # invented bias        # common practice, no published source
SEED = 20240611


def make_demo_rows(seed: int = SEED) -> np.ndarray:
    """Columns time [s], distance [m], speed [km/h], pressure_front [bar], pressure_rear [bar], accel_long [g]."""
    lap = build_speed_trace(read_track_toml(CIRCUIT), DEMO_CAR, sample_hz=20.0)
    rng = np.random.default_rng(seed)
    n = lap.time_s.size
    v = lap.speed_mps
    drag = 0.5 * DEMO_CAR.air_density_kg_m3 * DEMO_CAR.drag_cd_a_m2 * v**2 / DEMO_CAR.mass_kg
    brake_decel_g = np.maximum(-lap.accel_long_mps2 - drag, 0.0) / STANDARD_GRAVITY
    braking = lap.accel_long_mps2 < -drag - 0.5
    front = np.where(braking, FRONT_BAR_PER_G * brake_decel_g, 0.0)
    front = np.clip(front + rng.normal(0.0, 0.3, n), 0.0, None)
    rear = np.clip(REAR_TO_FRONT * front + rng.normal(0.0, 0.2, n), 0.0, None)
    speed_kmh = np.clip(v / KMH + rng.normal(0.0, 0.2, n), 0.0, None)
    accel_g = lap.accel_long_mps2 / STANDARD_GRAVITY + rng.normal(0.0, 0.03, n)
    return np.column_stack([lap.time_s, lap.distance_m, speed_kmh, front, rear, accel_g])


def write_demo_lap(path: Path = OUTPUT) -> None:
    """Write the CSV with its comment line."""
    rows = make_demo_rows()
    lines = ["# SYNTHETIC lap, invented car on the invented Kestrel Valley Raceway; made by "
             "tests/lapdata_tests/make_demo_lap.py (quasi-steady builder plus noise), not a measurement",
             "time [s],distance [m],speed [km/h],pressure_front [bar],pressure_rear [bar],accel_long [g]"]
    lines += [f"{t:.2f},{d:.2f},{s:.2f},{pf:.2f},{pr:.2f},{a:.3f}" for t, d, s, pf, pr, a in rows]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


if __name__ == "__main__":
    write_demo_lap()
