"""The stint plan: fuel burn, safety car and pit-lane laps, and plan errors."""
from __future__ import annotations

import numpy as np
import pytest

from chain_runs import small_scenario
from thermo.chain.plan import expand_plan
from thermo.chain.run import corner_duties
from thermo.chain.setup import corner_brakes
from thermo.duty.bias import front_power_share
from thermo.errors import ScenarioError

NO_RESISTANCE = [("car.drag_cd_a_m2", 0.0), ("car.rolling_resistance", 0.0), ("car.engine_braking_force_n", 0.0)]


def _lap_energies(scenario):
    """Per-lap braking energy of the front corner [J], as the chain reports it in LapSpan."""
    segments = expand_plan(scenario)
    brakes = corner_brakes(scenario)
    out = []
    for seg in segments:
        if seg.moving:
            duty = corner_duties(scenario, seg, brakes)["front"]
            out.append((seg, float(np.trapezoid(duty.disc_heat_w + duty.pad_heat_w, duty.time_s))))
    return out


def _sum_dv2_over_zones(speed):
    """sum over braking zones of (v_in^2 - v_out^2): each run of falling speed from its start to its end."""
    v2 = np.asarray(speed) ** 2
    falling = np.diff(v2) < 0
    return float(-np.sum(np.diff(v2)[falling]))


def test_fuel_burn_lowers_braking_energy_by_half_dm_v2():
    # energy conservation (PHYSICS.md section 1): with drag, rolling and engine braking off, a lap puts
    # 1/2 m (1 + f) sum(v_in^2 - v_out^2) into the brakes; burning dm of fuel lowers it by
    # 1/2 dm (1 + f) sum(v_in^2 - v_out^2), times this corner's share
    scenario = small_scenario([{"type": "laps", "count": 3}], NO_RESISTANCE)
    laps = _lap_energies(scenario)
    f = scenario.vehicle.rotating_inertia_factor
    share = front_power_share(0.6, 0.335, 0.345) * 0.5
    dm = scenario.fuel_consumption_kg_per_lap
    assert laps[0][0].fuel_kg - laps[1][0].fuel_kg == pytest.approx(dm)
    s = _sum_dv2_over_zones(laps[0][0].trace.speed_mps)
    for (a, ea), (b, eb) in zip(laps, laps[1:]):
        assert ea - eb == pytest.approx(share * 0.5 * dm * (1 + f) * s, rel=1e-3)
        assert eb == pytest.approx(share * 0.5 * scenario.vehicle.with_fuel(b.fuel_kg).mass_effective_kg * s, rel=1e-3)


def test_chain_lap_spans_carry_the_braking_energy():
    from chain_runs import solve_one
    scenario = small_scenario([{"type": "laps", "count": 2}], NO_RESISTANCE + [("pad_wear.enabled", False)])
    run = solve_one(scenario)
    expected = [e for _, e in _lap_energies(scenario)]
    assert [lap.braking_energy_j for lap in run.laps] == pytest.approx(expected, rel=1e-12)
    assert run.laps[0].braking_energy_j > run.laps[1].braking_energy_j


def test_safety_car_laps_take_less_braking_energy_than_race_laps():
    scenario = small_scenario([{"type": "laps", "count": 1}, {"type": "safety_car", "count": 1}])
    (race, e_race), (sc, e_sc) = _lap_energies(scenario)
    assert sc.phase.kind == "safety_car"
    assert e_sc < 0.6 * e_race          # speeds x 0.6: kinetic energy differences x 0.36, less drag work
    assert sc.trace.duration_s > race.trace.duration_s


def test_in_and_out_laps_with_a_pit_lane_are_slower_and_capped():
    limit = 60.0 / 3.6
    scenario = small_scenario([
        {"type": "out_lap", "pace": 0.85, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 300},
        {"type": "laps", "count": 1},
        {"type": "in_lap", "pace": 0.8, "pit_lane_speed_kmh": 60, "pit_lane_length_m": 200}])
    out_lap, race, in_lap = expand_plan(scenario)
    assert out_lap.trace.duration_s > race.trace.duration_s
    assert in_lap.trace.duration_s > race.trace.duration_s
    d_in = in_lap.trace.distance_m - in_lap.trace.distance_m[0]
    d_out = out_lap.trace.distance_m - out_lap.trace.distance_m[0]
    # the re-timed lap is resampled uniformly in time, so the sample at the lane entry interpolates
    # the braking and accelerating curves: up to 0.07 % (entry) and 0.5 % (exit) over the limit in the
    # edge samples (lapdata.laps.limit_speed_over_distance); inside the lane it is the limit exactly
    assert np.max(in_lap.trace.speed_mps[d_in >= d_in[-1] - 200.0]) <= limit * 1.01
    assert np.max(out_lap.trace.speed_mps[d_out <= 300.0]) <= limit * 1.01
    assert np.median(out_lap.trace.speed_mps[d_out <= 300.0]) == pytest.approx(limit, rel=1e-9)
    assert np.median(in_lap.trace.speed_mps[d_in >= d_in[-1] - 200.0]) == pytest.approx(limit, rel=1e-9)
    assert np.max(race.trace.speed_mps) > 2 * limit
    assert in_lap.trace.length_m == pytest.approx(race.trace.length_m, rel=1e-6)


def test_pit_stop_refuels_and_laps_burn_fuel_at_their_pace():
    scenario = small_scenario([{"type": "laps", "count": 1}, {"type": "in_lap", "pace": 0.8},
                               {"type": "pit_stop", "duration_s": 10, "refuel_kg": 10}, {"type": "laps", "count": 1}])
    lap, in_lap, stop, after = expand_plan(scenario)
    assert in_lap.fuel_kg == pytest.approx(68.0 - 2.5)
    assert after.fuel_kg == pytest.approx(68.0 - 2.5 - 0.8 * 2.5 + 10.0)
    assert stop.t_start_s == pytest.approx(in_lap.t_end_s)


def test_unknown_phase_type_is_an_error():
    with pytest.raises(ScenarioError, match=r"unknown phase type 'parade'"):
        small_scenario([{"type": "laps", "count": 1}, {"type": "parade", "count": 1}])
    with pytest.raises(ScenarioError, match=r"did you mean 'safety_car'"):
        small_scenario([{"type": "safety_cars", "count": 1}])


def test_soak_must_be_last_and_fuel_must_last():
    with pytest.raises(ScenarioError, match="soak must be the last"):
        small_scenario([{"type": "soak", "duration_s": 60}, {"type": "laps", "count": 1}])
    with pytest.raises(ScenarioError, match="fuel runs out on lap 28"):
        expand_plan(small_scenario([{"type": "laps", "count": 30}]))
