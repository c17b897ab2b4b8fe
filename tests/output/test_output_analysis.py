"""Soak and heat-path logic on small hand-made corners whose answers are plain arithmetic."""
import dataclasses

import numpy as np
import pytest

from thermo.output import OutputError
from thermo.output.analysis import heat_path_shares, soak_rows


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
                                 link_flows_w=np.zeros((41, 4)), link_energy_j=np.array([300.0, 100.0, -50.0, 9e9]))
    assert heat_path_shares(corner) == {"duct": 1.0, "disc_radiation": 0.0}


def test_link_to_boundary_flags_take_precedence(factory):
    """A radiation group that holds both a disc-to-caliper link (inside) and disc-to-air (out)."""
    corner = dataclasses.replace(
        factory.corner(dt=30.0), link_names=("disc_to_caliper", "disc_to_air", "duct", "hub_path"),
        link_groups=("radiation", "radiation", "duct", "hub_path"), link_flows_w=np.zeros((41, 4)),
        link_energy_j=np.array([500.0, 300.0, 700.0, 4000.0]),
        extras={"link_to_boundary": [False, True, True, False]})
    assert heat_path_shares(corner) == {"radiation": pytest.approx(0.3), "duct": pytest.approx(0.7)}
    wrong = dataclasses.replace(corner, extras={"link_to_boundary": [True, False]})
    with pytest.raises(OutputError, match="expected 4 true/false values"):
        heat_path_shares(wrong)
