"""Soak and heat-path logic on small hand-made corners whose answers are plain arithmetic."""
import dataclasses

import numpy as np
import pytest

from thermo.output import OutputError
from thermo.output.analysis import (
    STILL_RISING_MIN_RATE_K_S, check_still_rising, heat_path_shares, soak_rows, still_rising_at_end,
)
from thermo.results import CheckResult


def _corner(factory, time_s, fluid_k, stop):
    base = factory.corner(dt=30.0)
    temps = np.tile(np.asarray(fluid_k, dtype=float)[:, None], (1, len(base.node_names)))
    return dataclasses.replace(base, time_s=np.asarray(time_s, dtype=float), temperatures_k=temps,
                               link_flows_w=np.zeros((len(time_s), len(base.link_names))), stop_time_s=stop)


def test_peak_after_stop_is_marked(factory):
    corner = _corner(factory, [0, 10, 20, 30, 40], [300, 350, 340, 360, 355], stop=20.0)
    row = {r.node: r for r in soak_rows(corner)}["fluid"]
    assert (row.peak_k, row.after_stop_s, row.run_peak_k, row.run_peak_time_s) == (360.0, 10.0, 360.0, 30.0)
    assert row.worst_after_stop


def test_peak_before_stop_is_not_marked(factory):
    corner = _corner(factory, [0, 10, 20, 30, 40], [300, 370, 340, 360, 355], stop=20.0)
    row = {r.node: r for r in soak_rows(corner)}["fluid"]
    assert (row.peak_k, row.after_stop_s, row.run_peak_k) == (360.0, 10.0, 370.0)
    assert not row.worst_after_stop


def test_peak_at_the_stop_is_not_after_it(factory):
    corner = _corner(factory, [0, 10, 20, 30], [300, 310, 400, 390], stop=20.0)
    row = {r.node: r for r in soak_rows(corner)}["fluid"]
    assert row.after_stop_s == 0.0 and not row.worst_after_stop


def test_no_stop_gives_no_soak(factory):
    assert soak_rows(_corner(factory, [0, 10], [300, 310], stop=None)) is None


def test_stop_after_the_run_raises(factory):
    with pytest.raises(OutputError, match="stop_time_s 50 s is after the last sample"):
        soak_rows(_corner(factory, [0, 10], [300, 310], stop=50.0))


def test_heat_path_with_net_inflow_counts_zero(factory):
    corner = dataclasses.replace(factory.corner(dt=30.0), link_names=("a", "b", "c", "d"),
                                 link_groups=("duct", "duct", "disc_radiation", "internal_contact"),
                                 link_flows_w=np.zeros((41, 4)), link_energy_j=np.array([300.0, 100.0, -50.0, 9e9]),
                                 facts=factory.facts(link_to_boundary=(True, True, True, False)))
    assert heat_path_shares(corner) == {"duct": 1.0, "disc_radiation": 0.0}


def test_link_to_boundary_flags_decide_the_paths_out(factory):
    """A radiation group that holds both a disc-to-caliper link (inside) and disc-to-air (out)."""
    corner = dataclasses.replace(
        factory.corner(dt=30.0), link_names=("disc_to_caliper", "disc_to_air", "duct", "hub_path"),
        link_groups=("radiation", "radiation", "duct", "hub_path"), link_flows_w=np.zeros((41, 4)),
        link_energy_j=np.array([500.0, 300.0, 700.0, 4000.0]),
        facts=factory.facts(link_to_boundary=(False, True, True, False)))
    assert heat_path_shares(corner) == {"radiation": pytest.approx(0.3), "duct": pytest.approx(0.7)}
    wrong = dataclasses.replace(corner, facts=factory.facts(link_to_boundary=(True, False)))
    with pytest.raises(OutputError, match="link_to_boundary has 2 flags, expected 4, one per link"):
        heat_path_shares(wrong)


SOAK_T = np.arange(0.0, 1001.0, 1.0)          # stop at 0 s, a 1000 s soak sampled every second


def test_lumped_rise_to_the_end_is_still_rising(factory):
    # Incropera ch. 5 lumped capacitance: T rises monotonically towards T_inf; with tau 600 s the
    # 1000 s soak ends at T_inf - 50 exp(-1000/600), 9.4 K short of T_inf and still climbing
    series = factory.lumped_rise(SOAK_T, 0.0, 400.0, 450.0, 600.0)
    assert series[-1] == pytest.approx(450.0 - 50.0 * np.exp(-1000.0 / 600.0))
    assert still_rising_at_end(SOAK_T, series, 0.0)


def test_settled_node_is_not_still_rising(factory):
    # tau 60 s: after 1000 s the last step climbs 50/60 exp(-1000/60) ~ 5e-8 K/s, below the 1e-4 K/s tolerance
    series = factory.lumped_rise(SOAK_T, 0.0, 400.0, 450.0, 60.0)
    assert (series[-1] - series[-2]) < STILL_RISING_MIN_RATE_K_S
    assert not still_rising_at_end(SOAK_T, series, 0.0)


def test_peak_in_the_tail_then_falling_is_not_rising():
    series = 400.0 + 0.05 * SOAK_T
    series[-1] = series[-2] - 0.5                  # peaked one sample before the end, now falling
    assert not still_rising_at_end(SOAK_T, series, 0.0)


def test_peak_in_the_last_two_percent_with_a_rising_end_is_flagged():
    series = 400.0 + 0.05 * SOAK_T
    series[-5:] = series[-6] - np.array([1.0, 0.8, 0.6, 0.4, 0.2])   # dip 5 s before the end, climbing again
    assert int(np.argmax(series)) == SOAK_T.size - 6                 # peak 5 s before the end: in the last 2 %
    assert still_rising_at_end(SOAK_T, series, 0.0)
    series[:500] += 100.0                                            # a higher peak mid-soak: not at the end
    assert not still_rising_at_end(SOAK_T, series, 0.0)


def test_soak_row_and_check_flag_a_rising_fluid(factory):
    corner = factory.rising_fluid_corner()
    rows = {r.node: r for r in soak_rows(corner)}
    assert rows["fluid"].still_rising and rows["fluid"].after_stop_s == pytest.approx(300.0)
    # the fixture's other bumps peak inside the soak or before the stop
    assert [n for n, r in rows.items() if r.still_rising] == ["fluid"]
    fluid_check, bearing_check = corner.checks
    assert fluid_check.peak_time_s == pytest.approx(1200.0) and check_still_rising(corner, fluid_check)
    assert not check_still_rising(corner, bearing_check)             # bearing peaks at 1150 s and falls
    settled = factory.rising_fluid_corner(tau_s=10.0)
    assert not soak_rows(settled)[0].still_rising


def test_check_on_a_missing_node_or_without_soak_is_not_rising(factory):
    corner = factory.rising_fluid_corner()
    ghost = CheckResult("x", "fluid_at_piston", 500.0, 450.0, 1200.0, 50.0, "ok", 20.0, "test")
    assert not check_still_rising(corner, ghost)
    assert not check_still_rising(dataclasses.replace(corner, stop_time_s=None), corner.checks[0])
