"""The braking of one lap: its braking zones and each corner's braking energy and power."""
from __future__ import annotations

from lapdata.units import KMH, STANDARD_GRAVITY


def lap_summary(trace, scenario) -> dict:
    """Zones, energy per lap and per-corner energy of one trace with a scenario's car (JSON-ready)."""
    import numpy as np

    from lapdata.zones import find_braking_zones
    from thermo.chain.setup import corner_brakes
    from thermo.duty.corner_duty import corner_heat_inputs_from_trace
    from thermo.duty.summary import lap_energy_summary

    brakes = corner_brakes(scenario)
    if scenario.power_method == "pressure":
        duties = corner_heat_inputs_from_trace(trace, scenario.vehicle, None, brakes, method="pressure")
    else:
        duties = corner_heat_inputs_from_trace(trace, scenario.vehicle, scenario.bias, brakes,
                                               left_share_front=scenario.left_share_front,
                                               left_share_rear=scenario.left_share_rear)
    energies = lap_energy_summary(duties)
    # an axle corner stands for both wheels of its axle
    wheels = {d.name: (1 if "_" in d.name else 2) for d in scenario.corners}
    total = sum(e.braking_energy_j * wheels[name] for name, e in energies.items())
    t = trace.time_s
    car_power = sum(np.asarray(d.brake_heat_w) * wheels[name] for name, d in duties.items())
    zones = []
    for z in find_braking_zones(trace):
        inside = (t >= z.t_start_s) & (t <= z.t_end_s)
        zones.append({
            "t_start_s": round(z.t_start_s, 3), "t_end_s": round(z.t_end_s, 3),
            "d_start_m": round(z.d_start_m, 1), "d_end_m": round(z.d_end_m, 1),
            "v_in_kmh": round(z.v_in_mps / KMH, 1), "v_out_kmh": round(z.v_out_mps / KMH, 1),
            "duration_s": round(z.duration_s, 3), "peak_decel_g": round(z.peak_decel_mps2 / STANDARD_GRAVITY, 3),
            "energy_j": round(float(np.trapezoid(car_power[inside], t[inside])), 1),
        })
    return {
        "trace": str(trace.source), "scenario": scenario.name, "car_from": str(scenario.path),
        "duration_s": round(trace.duration_s, 3), "length_m": round(trace.length_m, 1),
        "repairs": list(trace.repairs), "zones": zones, "energy_per_lap_j": round(total, 1),
        "power_method": scenario.power_method,
        "corners": [{"name": name, "wheels": wheels[name], "energy_j": round(e.braking_energy_j, 1),
                     "disc_energy_j": round(e.disc_energy_j, 1), "pad_energy_j": round(e.pad_energy_j, 1),
                     "mean_power_w": round(e.mean_power_w, 1), "mean_braking_power_w": round(e.mean_braking_power_w, 1),
                     "peak_power_w": round(e.peak_power_w, 1)} for name, e in energies.items()],
    }


def lap_from_track(path, scenario):
    """(TrackDescription, LapTrace) of the flying lap built from a track TOML with a scenario's car
    envelope, sampled at the scenario's ``[plan] sample_hz``; as a run builds its laps."""
    from lapdata.track import build_speed_trace, read_track_toml
    from thermo.errors import ScenarioError
    if scenario.power_method == "pressure":
        raise ScenarioError(f"{scenario.path}: [brakes] power_method = \"pressure\" needs logged line pressures, "
                            f"and a lap built from the track {path} has none; give a logged trace CSV, or a "
                            "scenario with power_method = \"energy\"")
    track = read_track_toml(path)
    return track, build_speed_trace(track, scenario.envelope, sample_hz=scenario.plan.sample_hz)


def built_lap_dict(path, track, trace, sample_hz: float) -> dict:
    """What the lap command adds for a lap built from a track (JSON-ready): the track, the lap time,
    the top and minimum speed, and per segment its distance and its speeds."""
    import numpy as np

    speed_kmh = np.asarray(trace.speed_mps) / KMH
    d = np.asarray(trace.distance_m)
    segments, start = [], 0.0
    for seg in track.segments:
        end = start + seg.length_m
        inside = (d >= start) & (d <= end)
        v = speed_kmh[inside] if np.any(inside) else np.interp([start, end], d, speed_kmh)
        segments.append({"name": seg.name, "kind": seg.kind, "d_start_m": round(start, 1), "length_m": seg.length_m,
                         "v_entry_kmh": round(float(np.interp(start, d, speed_kmh)), 1),
                         "v_min_kmh": round(float(v.min()), 1), "v_max_kmh": round(float(v.max()), 1)})
        start = end
    return {"track_file": str(path), "track_name": track.name, "sample_hz": sample_hz,
            "lap_time_s": round(trace.duration_s, 3), "top_speed_kmh": round(float(speed_kmh.max()), 1),
            "min_speed_kmh": round(float(speed_kmh.min()), 1), "segments": segments}
