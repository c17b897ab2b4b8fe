"""A small invented brake corner run, built by hand: the output layer reads it, nothing solves it.

Temperatures are Gaussian bumps with known peaks and peak times, so every expected value in
the tests follows from the formulas here (no solver, no hard-coded results).
"""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from thermo import CAUTION, __version__
from thermo.results import CheckResult, CornerFacts, CornerResult, EnergyBalance, LapSpan, PhaseSpan, Results, StintPadThickness

AMBIENT_K = 303.15
NODES = ("disc", "pad", "piston", "fluid", "caliper", "upright", "hub", "bearing")
# node: (rise above ambient [K], time of peak [s], width [s])
BUMPS = {
    "disc": (500.0, 300.0, 150.0), "pad": (300.0, 310.0, 150.0), "piston": (100.0, 950.0, 200.0),
    "fluid": (140.0, 1000.0, 250.0), "caliper": (90.0, 700.0, 200.0), "upright": (60.0, 1100.0, 300.0),
    "hub": (70.0, 1050.0, 300.0), "bearing": (100.0, 1150.0, 300.0),
}
LINKS = (  # name, group, energy over the run [J]
    ("disc_air", "disc_convection", 4.0e5), ("disc_rad", "disc_radiation", 1.0e5),
    ("caliper_air", "caliper_convection", 5.0e4), ("upright_air", "upright_convection", 5.0e4),
    ("duct_air", "duct", 4.0e5), ("disc_pad", "internal_contact", 2.0e5),
    ("pad_piston", "internal_conduction", 3.0e4),
)
STOP_S = 900.0


def make_facts(**changes) -> CornerFacts:
    """Facts of the invented corner: two stints, a 6 mm pad minimum, heat leaving by every link
    but the two internal ones; ``changes`` replace any of them."""
    facts = CornerFacts(
        pad_thickness_m=(StintPadThickness("start", 0.025), StintPadThickness("end", 0.0195)),
        pad_minimum_thickness_m=0.006,
        link_to_boundary=tuple(not group.startswith("internal") for _, group, _ in LINKS),
        heat_partition_disc=0.9, removed_with_pad_material_j=0.0, initial_temperature_k=AMBIENT_K, warnings=())
    return dataclasses.replace(facts, **changes)


def temperatures(time_s: np.ndarray, scale: float = 1.0) -> np.ndarray:
    cols = [AMBIENT_K + scale * rise * np.exp(-((time_s - t0) / width) ** 2)
            for rise, t0, width in (BUMPS[n] for n in NODES)]
    return np.column_stack(cols)


def _check(name, node, limit_k, band_k, series, time_s, source):
    i = int(np.argmax(series))
    margin = limit_k - float(series[i])
    status = "exceeded" if margin < 0 else ("caution" if margin < band_k else "ok")
    return CheckResult(name, node, limit_k, float(series[i]), float(time_s[i]), margin, status, band_k, source)


def _laps(time_s, temps, n_race_laps):
    """n_race_laps laps over 0..720 s, a pit stop 720..760 s, two laps to the stop at 900 s."""
    edges = list(np.linspace(0.0, 720.0, n_race_laps + 1)) + [760.0, 830.0, STOP_S]
    laps = []
    for k in range(len(edges) - 1):
        if k == n_race_laps:   # the pit stop is no lap
            continue
        a, b = float(edges[k]), float(edges[k + 1])
        inside = (time_s >= a) & (time_s <= b)
        phase = "out_lap" if k in (0, n_race_laps + 1) else ("safety_car" if k in (3, 4) else "laps")
        laps.append(LapSpan(
            index=len(laps) + 1, phase=phase, t_start_s=a, t_end_s=b,
            min_k={n: float(temps[inside, j].min()) for j, n in enumerate(NODES)},
            max_k={n: float(temps[inside, j].max()) for j, n in enumerate(NODES)},
            braking_energy_j=2.5e5 + 1000.0 * k))
    spans = [PhaseSpan("out lap", "out_lap", 0.0, float(edges[1])),
             PhaseSpan("safety car", "safety_car", float(edges[3]), float(edges[5])),
             PhaseSpan("stop 1", "pit_stop", 720.0, 760.0),
             PhaseSpan("paddock soak", "soak", STOP_S, 1200.0)]
    return tuple(laps), tuple(spans)


def make_corner(name="front_left", scale=1.0, stop=True, n_race_laps=8, dt=0.5, facts=None):
    time_s = np.arange(0.0, 1200.0 + dt / 2, dt)
    temps = temperatures(time_s, scale)
    rng = np.random.default_rng(7)
    flows = rng.normal(100.0, 30.0, size=(time_s.size, len(LINKS)))
    fluid, bearing = temps[:, NODES.index("fluid")], temps[:, NODES.index("bearing")]
    checks = (
        # FMVSS No. 116 (49 CFR 571.116): DOT 4 dry ERBP 230 degC, wet 155 degC
        _check("fluid_boiling_dry", "fluid", 503.15, 20.0, fluid, time_s, "FMVSS 116 DOT 4 dry"),
        _check("fluid_boiling_wet", "fluid", 428.15, 20.0, fluid, time_s, "FMVSS 116 DOT 4 wet"),
        # common practice, no published source: grease limit about 150 degC
        _check("bearing_grease", "bearing", 423.15, 30.0, bearing, time_s, "common practice"),
    )
    laps, phases = _laps(time_s, temps, n_race_laps)
    return CornerResult(
        name=name, node_names=NODES, time_s=time_s, temperatures_k=temps,
        link_names=tuple(n for n, _, _ in LINKS), link_groups=tuple(g for _, g, _ in LINKS),
        link_flows_w=flows, link_energy_j=np.array([e for _, _, e in LINKS]),
        energy=EnergyBalance(heat_in_j=1.2e6, stored_j=2.0e5, lost_j=1.0e6),
        checks=checks, laps=laps, phases=phases, stop_time_s=STOP_S if stop else None,
        facts=make_facts() if facts is None else facts)


def make_results(scale_rear=0.8, **corner_kwargs) -> Results:
    corners = (make_corner("front_left", 1.0, **corner_kwargs),
               make_corner("rear_left", scale_rear, **corner_kwargs))
    return Results(
        scenario_name="invented_car_at_invented_circuit", scenario_text='name = "demo"\nlaps = 10\n',
        version=__version__, solver="LSODA", solver_status="success",
        references=("Incropera et al., Fundamentals of Heat and Mass Transfer", "FMVSS No. 116"),
        corners=corners, caution=CAUTION, warnings=("duct flow outside correlation range at lap 3",),
        overrides=(("corners.front.piston.shim_thickness_mm", "1.0"), ("corners.front.pad.material", '"pad = odd"')))


def lumped_rise(time_s, start_s, t0_k, t_inf_k, tau_s):
    """Lumped-capacitance approach to a steady temperature after start_s (Incropera, Fundamentals of
    Heat and Mass Transfer, ch. 5: T - T_inf = (T0 - T_inf) exp(-t / tau)); t0_k before it."""
    t = np.maximum(np.asarray(time_s, dtype=float) - start_s, 0.0)
    return t_inf_k + (t0_k - t_inf_k) * np.exp(-t / tau_s)


def make_rising_fluid_corner(tau_s=600.0):
    """The front corner with its fluid still heating when the soak ends: it climbs from 150 degC at
    the stop towards 200 degC with time constant tau_s (600 s: 300 s of soak leave it rising)."""
    corner = make_corner()
    temps = corner.temperatures_k.copy()
    j = NODES.index("fluid")
    temps[:, j] = np.where(corner.time_s < STOP_S, AMBIENT_K + 120.0 * corner.time_s / STOP_S,
                           lumped_rise(corner.time_s, STOP_S, AMBIENT_K + 120.0, AMBIENT_K + 170.0, tau_s))
    fluid = temps[:, j]
    checks = (_check("fluid_boiling_dry", "fluid", 503.15, 20.0, fluid, corner.time_s, "FMVSS 116 DOT 4 dry"),
              corner.checks[2])
    return dataclasses.replace(corner, temperatures_k=temps, checks=checks)


@pytest.fixture
def results() -> Results:
    return make_results()


@pytest.fixture
def factory():
    """The builders, for tests that need a variant (more laps, no stop, other facts)."""
    return type("Factory", (), {"results": staticmethod(make_results), "corner": staticmethod(make_corner),
                                "facts": staticmethod(make_facts),
                                "temperatures": staticmethod(temperatures), "NODES": NODES,
                                "BUMPS": BUMPS, "STOP_S": STOP_S, "LINKS": LINKS,
                                "rising_fluid_corner": staticmethod(make_rising_fluid_corner),
                                "lumped_rise": staticmethod(lumped_rise)})
