"""The settled lap of each corner: the cyclic steady state of a repeated lap (Newton shooting)."""
from __future__ import annotations

from lapdata.units import kelvin_to_celsius


def settle(scenario, *, corners=None, phase=None) -> list:
    """The settled lap of each corner (all by default) of a scenario, with its own solver settings;
    each corner asked for is set up once (``thermo.chain.settle.lap_setups``).

    Parameters
    ----------
    scenario : Scenario
        A scenario read with ``load_scenario`` [-]
    corners : sequence of str or None
        Corner names (None: every corner) [-]
    phase : str or None
        The 'laps' phase whose lap is repeated (None: the first) [-]

    Returns
    -------
    list of SettledLap
        One per corner (``thermo.chain.settle.SettledLap``: peaks, minima, laps to
        within 1 K from ambient) [-]
    """
    from thermo.chain.settle import lap_setups, settled_lap

    names = list(corners) if corners else [c.name for c in scenario.corners]
    setups = lap_setups(scenario, phase, corners=names)
    settings = scenario.solver.settings()
    return [settled_lap(scenario, name, phase_name=phase, settings=settings, setup=setups[name]) for name in names]


def settled_checks(scenario, result) -> list:
    """The run's limit checks of one corner against its settled peaks: ``CheckResult`` each, the
    peak that of the settled lap (its time 0: the settled lap has no run time). The checks are
    those the settled lap's own model carries (``SettledLap.check_specs``): no corner is built again."""
    import numpy as np

    from thermo.limits import evaluate_check
    return [evaluate_check(spec, np.zeros(1), np.array([result.peak_k[spec.node]]))
            for spec in result.check_specs if spec.node in result.peak_k]


def settled_dict(scenario, results) -> dict:
    """JSON-ready: per corner the settled peaks and minima, laps to within 1 K, and ``checks``: each
    of the run's limit checks against the settled peak (``limit_c``, ``peak_c``, ``margin_k``, ``status``)."""
    import thermo
    out = {"scenario": scenario.name, "version": thermo.__version__, "caution": thermo.CAUTION, "corners": []}
    for r in results:
        checks = [{"name": c.name, "node": c.node, "limit_c": round(float(kelvin_to_celsius(c.limit_k)), 2),
                   "peak_c": round(float(kelvin_to_celsius(c.peak_k)), 2), "margin_k": round(c.margin_k, 2),
                   "status": c.status, "source": c.source} for c in settled_checks(scenario, r)]
        out["corners"].append({
            "name": r.corner, "phase": r.phase, "lap_time_s": round(r.lap_time_s, 3),
            "peak_c": {n: round(float(kelvin_to_celsius(v)), 2) for n, v in r.peak_k.items()},
            "min_c": {n: round(float(kelvin_to_celsius(v)), 2) for n, v in r.min_k.items()},
            "laps_to_within_1k": r.laps_to_1k, "residual_k": r.residual_k, "lap_solves": r.lap_solves,
            "method": r.method, "wall_s": round(r.wall_s, 4), "checks": checks})
    return out
