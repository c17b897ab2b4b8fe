"""The soak after the stop, and pad wear with pad changes (issue 6)."""
from __future__ import annotations

import numpy as np
import pytest

from chain_runs import NO_WEAR, small_scenario, solve_one

TWO_LAPS = {"type": "laps", "count": 2}


@pytest.fixture(scope="module")
def long_soak():
    scenario = small_scenario([TWO_LAPS, {"type": "soak", "duration_s": 4 * 3600}], NO_WEAR, soak_sample_s=60.0)
    return scenario, solve_one(scenario)


def test_long_soak_tends_to_ambient_and_every_node_falls_after_its_peak(long_soak):
    scenario, run = long_soak
    amb = scenario.ambient.temperature_k
    for node in run.node_names:
        series = run.temperature(node)
        peak = int(np.argmax(series))
        rise = series[peak] - amb
        # lumped-capacitance cooling, Incropera ch. 5: T - T_inf decays towards 0 after the heat stops
        assert series[-1] - amb < min(3.0, 0.1 * rise), node
        assert series[-1] >= amb - 1e-6, node
        assert np.all(np.diff(series[peak:]) <= 1e-6), node


def test_bearing_heated_through_hub_and_upright_peaks_after_the_stop(long_soak):
    # common practice, no published source (PHYSICS.md section 6): fluid, hub and bearing keep
    # rising for minutes after the car stops
    _, run = long_soak
    stop = run.stop_time_s
    assert stop == pytest.approx(run.laps[-1].t_end_s)
    for node in ("bearing", "hub", "fluid"):
        peak_k, peak_t = run.peak(node)
        assert peak_t > stop + 60.0, node
        at_stop = run.temperature(node)[int(np.searchsorted(run.time_s, stop))]
        assert peak_k > at_stop + 1.0, node
    assert run.peak("disc")[1] < stop               # the disc peaks while braking


def test_ambient_profile_day_to_night_lowers_the_soak_end():
    plan = [TWO_LAPS, {"type": "soak", "duration_s": 2 * 3600}]
    day = solve_one(small_scenario(plan, NO_WEAR, soak_sample_s=60.0))
    night = solve_one(small_scenario(plan, NO_WEAR + [("ambient.temperature_profile_h_c", [[0.0, 28.0], [2.5, 8.0]])],
                                     soak_sample_s=60.0))
    end_air_k = 28.0 + (8.0 - 28.0) * (2.0 + day.stop_time_s / 3600) / 2.5 + 273.15
    # the air ends 16 K colder; the slowest node (the pad, cooled only through its backing plate)
    # lags it by hours, so it follows it by more than 5 K, the disc by more than 10 K
    drops = [day.temperature(n)[-1] - night.temperature(n)[-1] for n in day.node_names]
    assert min(drops) > 5.0 and max(drops) > 10.0
    for node in day.node_names:
        assert night.temperature(node)[-1] > end_air_k - 0.5, node     # never below the air it sits in


@pytest.fixture(scope="module")
def pad_stints():
    """Heavy wear, two laps, a stop with or without a pad change, two more laps."""
    def run(change):
        plan = [TWO_LAPS, {"type": "pit_stop", "duration_s": 20, "pad_change": change}, TWO_LAPS]
        return solve_one(small_scenario(plan, [("pad_wear.wear_coefficient_mm3_per_kj", 10.0)]))
    return run(True), run(False)


def test_pad_change_restores_thickness_and_lowers_the_next_fluid_peak(small_design, pad_stints):
    changed, kept = pad_stints
    new = small_design.pad.thickness_m
    by_lap = {row.lap: row.thickness_m for row in changed.facts.pad_thickness_by_lap_m}
    kept_by_lap = {row.lap: row.thickness_m for row in kept.facts.pad_thickness_by_lap_m}
    assert changed.facts.pad_thickness_m[0].thickness_m == pytest.approx(by_lap[2])
    assert new - by_lap[3] < 0.6 * (new - by_lap[2])      # after the change: one lap of wear, not three
    assert kept_by_lap[4] < by_lap[4] - 1e-3
    pit_end = next(p.t_end_s for p in changed.phases if p.kind == "pit_stop")
    after = lambda run: run.time_s > pit_end  # noqa: E731 (each run stores its own rows)
    # common practice, no published source (PHYSICS.md section 6): less pad, more heat into the fluid
    assert changed.temperature("fluid")[after(changed)].max() < kept.temperature("fluid")[after(kept)].max() - 0.1
    for run in pad_stints:
        assert run.energy.balance_rel_error < 1e-5


def test_pad_thickness_falls_monotonically_within_a_stint(pad_stints):
    _, kept = pad_stints
    rows = kept.facts.pad_thickness_by_lap_m
    assert [r.lap for r in rows] == [1, 2, 3, 4]
    assert np.all(np.diff([r.thickness_m for r in rows]) < 0)


def test_warning_near_the_minimum_thickness():
    plan = [TWO_LAPS, {"type": "laps", "count": 2}]
    overrides = [("corners.front.pad.thickness_mm", 10.5), ("pad_wear.wear_coefficient_mm3_per_kj", 10.0)]
    run = solve_one(small_scenario(plan, overrides))
    rows = [r.thickness_m for r in run.facts.pad_thickness_by_lap_m]
    first_near = next(i for i, th in enumerate(rows, start=1) if th - 0.008 < 0.001)
    near = [w for w in run.facts.warnings if "within 1.0 mm" in w]
    assert len(near) == 1 and f"lap {first_near}" in near[0]
    # no warning at all while the pads are thick
    quiet = solve_one(small_scenario([TWO_LAPS]))
    assert not [w for w in quiet.facts.warnings if "pad" in w]


@pytest.fixture(scope="module")
def small_design():
    return small_scenario().corners[0]


def test_pad_warnings_say_near_above_the_minimum_and_below_under_it(small_design):
    """Issue 17: a pad already under its minimum was reported as "within 1.0 mm of its minimum"."""
    from thermo.chain.corner_run import _pad_warnings
    minimum = small_design.pad.minimum_thickness_m
    warned = set()
    near = _pad_warnings(small_design, 1.0e-3, minimum + 0.4e-3, 7, warned)
    assert len(near) == 1 and "within 1.0 mm of its minimum" in near[0]
    below = _pad_warnings(small_design, 1.0e-3, minimum - 2.8e-3, 9, warned)
    assert len(below) == 1 and "below its minimum" in below[0]
    # straight from well above to under the minimum in one lap: only "below", never "within"
    jump = _pad_warnings(small_design, 1.0e-3, minimum - 2.8e-3, 9, set())
    assert len(jump) == 1 and "below its minimum" in jump[0] and "within" not in jump[0]
