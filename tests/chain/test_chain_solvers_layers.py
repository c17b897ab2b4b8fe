"""The same short run with three integrators, and with a layered disc against the lumped one."""
from __future__ import annotations

import numpy as np
import pytest

from chain_runs import NO_WEAR, SHORT_PLAN, small_scenario, solve_one

SEVEN_AND_HUB = ("disc", "pad", "piston", "fluid", "caliper", "upright", "bearing", "hub")


@pytest.mark.parametrize("method", ["BDF", "Radau"])
def test_scipy_integrators_agree_on_peaks_within_0_1_k(short_scenario, short_run, method):
    # rtol 1e-6, atol 1e-4 K: three independent stiff integrators (scipy's LSODA, BDF, Radau) must
    # agree on each node's peak to 0.1 K and its peak time to one output sample
    other = solve_one(short_scenario, method=method)
    assert other.node_names == short_run.node_names
    times = short_run.time_s
    for node in SEVEN_AND_HUB:
        (pa, ta), (pb, tb) = short_run.peak(node), other.peak(node)
        assert pb == pytest.approx(pa, abs=0.1), node
        row = int(np.searchsorted(times, ta))
        sample = max(np.diff(times[max(row - 1, 0):row + 2]))      # the output spacing around the peak
        assert abs(tb - ta) <= sample + 1e-9, node
    assert other.energy.balance_rel_error < 1e-5
    assert short_run.energy.balance_rel_error < 1e-5


def test_short_run_has_the_named_nodes_and_heats_them(short_scenario, short_run):
    amb = short_scenario.ambient.temperature_k
    for node in SEVEN_AND_HUB:
        assert short_run.peak(node)[0] > amb + 1.0, node
    # heat flows outward from the friction faces: disc and pad hottest, bearing and upright least
    peaks = {n: short_run.peak(n)[0] for n in SEVEN_AND_HUB}
    assert peaks["disc"] > peaks["pad"] > peaks["piston"] > peaks["fluid"] > peaks["upright"]


@pytest.fixture(scope="module", params=[3, 6])
def layered(request):
    scenario = small_scenario(SHORT_PLAN, NO_WEAR + [("corners.front.disc.layers", request.param)])
    return scenario, solve_one(scenario)


def test_layered_disc_bulk_agrees_with_lumped(short_run, layered):
    _, run = layered
    bulk, lumped = run.temperature("disc"), short_run.temperature("disc")
    assert bulk.shape == lumped.shape
    rise = short_run.peak("disc")[0] - short_run.temperature("disc")[0]
    # the mass-weighted mean of the layers holds about the same heat as the lumped disc; they differ
    # through the paths that see the surface (faces, radiation) and the core (vanes, bell), and
    # through the pad-disc interface: its split follows the resistance of half the first layer
    # (thermo.corner.interface), so a finer disc takes a little more of the friction heat (1.5 %
    # of the rise with 6 layers against the lumped disc; the lumped disc is the less accurate)
    assert np.max(np.abs(bulk - lumped)) < 0.02 * rise
    assert np.max(bulk - lumped) >= -0.005 * rise
    assert run.energy.balance_rel_error < 1e-5


def test_layered_surface_runs_hotter_than_bulk_while_braking(short_scenario, layered):
    scenario, run = layered
    from thermo.chain.plan import expand_plan
    segments = expand_plan(scenario)
    surface, bulk = run.temperature("disc_surface"), run.temperature("disc")
    assert run.peak("disc_surface")[0] > run.peak("disc")[0] + 50.0
    # at the end of every braking zone (speed falling, then no longer) the surface leads the bulk
    checked = 0
    for seg in segments:
        if not seg.moving:
            continue
        v = seg.trace.speed_mps
        ends = np.nonzero((np.diff(v)[:-1] < -0.5 / scenario.plan.sample_hz) & (np.diff(v)[1:] >= 0))[0] + 1
        for i in ends:
            row = int(np.argmin(np.abs(run.time_s - (seg.t_start_s + seg.trace.time_s[i] - seg.trace.time_s[0]))))
            assert surface[row] > bulk[row] + 20.0
            checked += 1
    assert checked >= 6          # three braking zones a lap, two laps
