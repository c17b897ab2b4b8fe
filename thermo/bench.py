"""Benchmark of the solvers on the demo corner: ``python -m thermo.bench [--quick] [--json]``.

Measured side by side in one run (medians over repeats):
- a stint of repeated laps: the naive baseline (scipy RK45, no Jacobian, steps bounded in braking
  zones, restarted at each brake edge) against 'fast' (``speedup_vs_rk45``), and LSODA; the peak
  fluid and disc-surface temperature error of each against Radau at tight tolerance (``peak_error_k``);
- the same stint on the throughput path (``thermo.chain.race.repeated_laps``: graded grid,
  linearised kernel, all laps in one kernel call), its time and peak error (``race_path``);
- a 24-hour race, every corner from ambient on the throughput path, corners in threads, model
  build from scratch included (conductance tables too; the kernels are compiled beforehand), all
  24 hours driven (``race24h_s``, ``race24h_measured_h``), for the demo's two
  axle corners and, as ``race24h_four_corners_s``, for the same car with four wheel corners (each
  driven in full);
- batched runs: wall time per configuration for a 1-hour stint with 1, 10, 100 and 1000
  configurations (link conductances scaled at random by 0.8-1.2) on the graded grid in the
  linearised mode, configurations side by side in lanes, the whole hour driven in one kernel call
  (--quick: ``batch_laps_measured`` laps, scaled to the hour) (``batch_s_per_config``);
- start-up: a fresh interpreter running ``brakeheat --help`` and ``import thermo``, beside a bare
  interpreter (``startup``);
- the settled lap (``thermo.chain.settle``, model already built; the build is ``model_build_s``)
  against simulating lap by lap until within 1 K;
- the main command on a 24-hour race (``run24h``): ``brakeheat run scenarios/demo_24h.toml`` with
  ``--json`` and with ``--out`` in a fresh interpreter each (CPU time, wall time, peak resident
  memory, the size of results.h5), ``--json`` again with ``--threads 2`` (the two corners side
  by side instead of one after another), and 2 hours on the demo's logged lap resampled to 1 kHz (--quick: 2 hours
  of the 24-hour plan and a quarter of an hour of the 1 kHz lap);
- a study (``sweep``, as the issue that asked for it names it): ``brakeheat uncertainty scenarios/demo.toml --json`` with 1000 samples of
  the first stint (--quick: 48, scaled), the samples side by side (the default, full Newton), wall
  time and peak memory of the command and its workers; the same with the linearised scheme in the
  lane kernel (``--set solver.linearised=true``); and ``--one-by-one`` (each sample run alone as
  ``brakeheat run`` runs it; 200 samples, scaled), and the ratio;
- the corner build (``corner_build``): the demo's corners set up with every conductance table built
  anew (``corner_setups``, the start-up of ``brakeheat run``), and 100 front corners drawn like
  the demo's ``[uncertainty]`` inputs (duct inlet area, convection multipliers, pad thickness)
  built one after another with the tables cached as a study's worker caches them.
"""
from __future__ import annotations

import argparse
import json
import math
import os
import platform
import statistics
import sys
import time
from pathlib import Path

import numpy as np

from thermo.chain.race import DEFAULT_MAX_STRIDE, race, repeated_laps
from thermo.chain.settle import lap_setup, settled_lap
from thermo.scenario import load_scenario
from thermo.solver.batch import kernel_inputs, kernel_network, lane_width, scaled
from thermo.solver.grids import graded_grid
from thermo.solver.scipy_solve import solve_network
from thermo.solver.settings import SolverSettings

DEMO = Path(__file__).resolve().parents[1] / "scenarios" / "demo.toml"
FAST = SolverSettings(method="fast")
BASELINE = SolverSettings(method="RK45", use_jacobian=False)
LSODA = SolverSettings(method="LSODA")
# the demo car with each axle split into left and right wheels (invented 52 % left share): four corners
FOUR_CORNERS = (("brakes.left_share_front", 0.52), ("brakes.left_share_rear", 0.52))


def _demo_path() -> Path:
    if DEMO.exists():
        return DEMO
    import brakeheat_scenarios
    return Path(brakeheat_scenarios.__file__).parent / "demo.toml"


def machine() -> dict:
    """CPU model and core count of this machine."""
    model = platform.processor() or "unknown"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                model = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return {"cpu": model, "cores": os.cpu_count(), "python": platform.python_version()}


def _forget_tabulated_conductances() -> None:
    """Empty the caches of tabulated convection conductances, so that a timed model build is cold."""
    from thermo.chain.run import forget_cached_tables
    forget_cached_tables()


def _timed(fn, repeats):
    times, out = [], None
    for _ in range(repeats):
        t = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times), out


def stint(net, model, schedule, T0, settings, laps):
    """Repeat one lap ``laps`` times, carrying the state; peaks of the output nodes [K]."""
    T, peaks = np.array(T0, dtype=float), None
    for _ in range(laps):
        sol = solve_network(net, schedule, T, settings, phase="bench")
        T = sol.final_k
        p = model.outputs(sol.temperatures_k).max(axis=0)
        peaks = p if peaks is None else np.maximum(peaks, p)
    return peaks


STARTUP_TARGET_S = 0.3      # issue 14: `brakeheat --help`


def startup_s(repeats: int = 5) -> dict:
    """Median wall time of a fresh interpreter running `brakeheat --help` and `import thermo` [s]."""
    import subprocess

    def fresh(code):
        return lambda: subprocess.run([sys.executable, "-c", code], capture_output=True, check=True)
    help_s, _ = _timed(fresh("from thermo.cli.main import command; import sys; sys.argv = ['brakeheat', '--help']\n"
                             "try:\n    command()\nexcept SystemExit:\n    pass"), repeats)
    import_s, _ = _timed(fresh("import thermo"), repeats)
    bare_s, _ = _timed(fresh("pass"), repeats)
    return {"help_s": help_s, "import_thermo_s": import_s, "bare_python_s": bare_s, "target_help_s": STARTUP_TARGET_S}


# issue 14: the main command on a 24-hour race and on a long logged trace
RUN24H_TARGETS = {"json_cpu_s": 3.0, "json_peak_mb": 500.0, "out_cpu_s": 6.0, "results_h5_mb": 100.0,
                  "trace_1khz_2h_peak_mb": 1500.0}
# the same figures when issue 14 was filed (a 24-hour plan of 111 phases written by hand, every
# solver row kept, on the same machine), printed beside this run's for comparison
RUN24H_AT_ISSUE = {"json_cpu_s": 35.0, "json_peak_mb": 2100.0, "out_cpu_s": 64.0, "out_peak_mb": 3500.0,
                   "results_h5_mb": 902.0, "trace_1khz_2h_peak_mb": 8000.0}
_CHILD = ("import resource, sys, time\n"
          "t = time.perf_counter()\n"
          "from thermo.cli.main import command\n"
          "code = command(sys.argv[1:])\n"
          "wall = time.perf_counter() - t\n"
          "u = resource.getrusage(resource.RUSAGE_SELF)\n"
          "sys.stderr.write(f'\\nBENCH {u.ru_utime + u.ru_stime} {u.ru_maxrss} {wall}\\n')\n"
          "sys.exit(code)\n")


def _brakeheat(argv) -> tuple[float, float, float]:
    """(CPU time [s], peak resident memory [MB], wall time [s], from the interpreter's first import)
    of one `brakeheat ARGV` in a fresh interpreter."""
    import subprocess
    done = subprocess.run([sys.executable, "-c", _CHILD, *argv], capture_output=True, text=True)
    line = [x for x in done.stderr.splitlines() if x.startswith("BENCH ")]
    if done.returncode not in (0, 3) or not line:
        raise RuntimeError(f"bench: brakeheat {' '.join(argv)} failed: {done.stderr.strip()[-500:]}")
    cpu, rss_kb, wall = line[-1].split()[1:]
    return float(cpu), float(rss_kb) / 1024.0, float(wall)


def _logged_trace_scenario(folder: Path, hours: float, rate_hz: float) -> Path:
    """The demo car on its logged lap resampled to ``rate_hz``, stints of 24 laps for ``hours``
    (a 40 s stop between them to refuel) and a soak."""
    from lapdata.reader import read_trace_csv
    from lapdata.signal import resample_uniform
    demo = _demo_path()
    lap = resample_uniform(read_trace_csv(demo.parent / "demo_lap.csv"), rate_hz)
    g = 9.80665                                                      # standard gravity (CGPM 1901)
    rows = np.column_stack([lap.time_s - lap.time_s[0], lap.distance_m - lap.distance_m[0], lap.speed_mps * 3.6,
                            lap.pressure_front_pa / 1e5, lap.pressure_rear_pa / 1e5, lap.accel_long_mps2 / g])
    trace = folder / "lap_1khz.csv"
    np.savetxt(trace, rows, delimiter=",", fmt="%.6f",
               header="time [s],distance [m],speed [km/h],pressure_front [bar],pressure_rear [bar],accel_long [g]",
               comments="")
    text = demo.read_text(encoding="utf-8").split("[plan]")[0] + (
        f'[plan]\nlap_source = "trace"\ntrace = "{trace.name}"\nsample_hz = {rate_hz:g}\n\n'
        f'[[plan.stints]]\nuntil_h = {hours:g}\n\n[[plan.stints.phases]]\ntype = "laps"\ncount = 24\n\n'
        '[[plan.stints.phases]]\ntype = "pit_stop"\nduration_s = 40\nrefuel_full = true\n\n'
        '[[plan.finish]]\ntype = "soak"\nduration_s = 600\n')
    text = text.replace('track = "demo_circuit.toml"', "")
    path = folder / "trace_1khz.toml"
    path.write_text(text, encoding="utf-8")
    return path


def run24h(quick: bool = False) -> dict:
    """`brakeheat run scenarios/demo_24h.toml` with --json and with --out (CPU, peak memory, results.h5
    size), and a 2-hour run on a 1 kHz logged lap (peak memory), each in a fresh interpreter."""
    import tempfile
    path = _demo_path().parent / "demo_24h.toml"
    hours = ["--set", "plan.stints.1.until_h=2"] if quick else []
    out = {"hours": 2.0 if quick else 24.0, "targets": RUN24H_TARGETS, "at_issue": RUN24H_AT_ISSUE}
    out["json_cpu_s"], out["json_peak_mb"], out["json_wall_s"] = _brakeheat(["run", str(path), "--json", *hours])
    # the same with the corners side by side (--threads 2), measured beside it
    out["json_two_threads_cpu_s"], _, out["json_two_threads_wall_s"] = _brakeheat(
        ["run", str(path), "--json", "--threads", "2", *hours])
    with tempfile.TemporaryDirectory() as folder:
        out["out_cpu_s"], out["out_peak_mb"], out["out_wall_s"] = _brakeheat(
            ["run", str(path), "--quiet", "--out", folder, *hours])
        out["results_h5_mb"] = (Path(folder) / "results.h5").stat().st_size / 1e6
        trace = _logged_trace_scenario(Path(folder), 0.25 if quick else 2.0, 1000.0)
        out["trace_1khz_hours"] = 0.25 if quick else 2.0
        out["trace_1khz_cpu_s"], out["trace_1khz_2h_peak_mb"], _ = _brakeheat(["run", str(trace), "--json"])
    return out


# issue 15: 1000 uncertainty samples of the demo's first stint
STUDY_TARGETS = {"samples": 1000, "wall_s": 60.0, "peak_mb": 2000.0}
_STUDY_CHILD = ("import resource, sys, time\n"
                "from thermo.cli.main import command\n"
                "t = time.perf_counter()\n"
                "code = command(sys.argv[1:])\n"
                "wall = time.perf_counter() - t\n"
                "me, kids = resource.getrusage(resource.RUSAGE_SELF), resource.getrusage(resource.RUSAGE_CHILDREN)\n"
                "sys.stderr.write(f'\\nBENCH {wall} {me.ru_maxrss} {kids.ru_maxrss}\\n')\n"
                "sys.exit(code)\n")


def _study_run(samples: int, extra=()) -> tuple[float, float]:
    """(wall [s], peak memory [MB]) of `brakeheat uncertainty demo.toml --json --samples N` in a fresh
    interpreter: the command's own peak plus workers x the largest worker's (an upper bound)."""
    import subprocess

    from thermo.studies.engine import default_workers
    done = subprocess.run([sys.executable, "-c", _STUDY_CHILD, "uncertainty", str(_demo_path()), "--json", "--quiet",
                           "--samples", str(samples), *extra], capture_output=True, text=True)
    line = [x for x in done.stderr.splitlines() if x.startswith("BENCH ")]
    if done.returncode != 0 or not line:
        raise RuntimeError(f"bench: brakeheat uncertainty failed: {done.stderr.strip()[-500:]}")
    wall, own_kb, worker_kb = map(float, line[-1].split()[1:])
    return wall, (own_kb + default_workers() * worker_kb) / 1024.0


def study(quick: bool = False) -> dict:
    """`brakeheat uncertainty scenarios/demo.toml --json` (the demo's [uncertainty] table: convection
    multipliers, front duct inlet area, front pad thickness, fluid water content; the first stint)
    with the default workers (one process per core): wall time scaled to 1000 samples and peak
    memory, the samples side by side (full Newton, the scheme of ``brakeheat run``); the same with
    ``--set solver.linearised=true`` (the linearised scheme in the lane kernel); and
    ``--one-by-one`` (each sample alone), all measured in the same run. --quick: 48 samples each;
    else 1000, 1000 linearised and 200 one by one."""
    from thermo.studies.engine import default_workers
    samples = 48 if quick else STUDY_TARGETS["samples"]
    alone_samples = 48 if quick else 200
    per = STUDY_TARGETS["samples"]
    wall, peak = _study_run(samples)
    wall_lin, peak_lin = _study_run(samples, ("--set", "solver.linearised=true"))
    wall_alone, peak_alone = _study_run(alone_samples, ("--one-by-one",))
    newton, linearised, alone = wall * per / samples, wall_lin * per / samples, wall_alone * per / alone_samples
    return {"samples": samples, "workers": default_workers(), "wall_s": wall, "wall_s_per_1000": newton,
            "peak_mb": peak, "linearised_wall_s_per_1000": linearised, "linearised_peak_mb": peak_lin,
            "one_by_one_samples": alone_samples, "one_by_one_wall_s_per_1000": alone,
            "one_by_one_peak_mb": peak_alone, "lanes_speedup": alone / newton, "targets": STUDY_TARGETS}


def corner_build(quick: bool = False) -> dict:
    """Wall time of building corners [s]: the demo's corners with every table built anew (median),
    and 100 study-like front corners one after another (30 with --quick), the tables cached as a
    study's worker caches them (``forget_cached_tables`` after every 32, as after a chunk)."""
    from thermo.chain.corner_run import conductance_grid
    from thermo.chain.run import STUDY_TABULATED_KEPT, forget_cached_tables
    from thermo.chain.setup import corner_setups
    from thermo.corner.build import build_corner
    scenario = load_scenario(_demo_path())
    corner_setups(scenario)                                     # imports and the first compile out of the timing

    def cold():
        forget_cached_tables()
        corner_setups(scenario)
    cold_s, _ = _timed(cold, 3 if quick else 7)
    rng = np.random.default_rng(2026)
    count = 30 if quick else 100
    multipliers = ("disc_convection_multiplier", "caliper_convection_multiplier", "hub_convection_multiplier")
    designs = []
    for _ in range(count):
        overrides = [("corners.front.ducts.main.inlet_area_mm2", float(rng.triangular(8000.0, 10000.0, 11000.0))),
                     ("corners.front.pad.thickness_mm", float(rng.uniform(18.0, 24.0)))]
        overrides += [(f"corners.front.airflow.{m}", float(np.clip(rng.normal(1.0, 0.15), 0.5, 1.5))) for m in multipliers]
        designs.append(next(d for d in load_scenario(_demo_path(), overrides).corners if d.name == "front"))
    grid, pressure = conductance_grid(scenario), scenario.ambient.pressure_pa

    def study_like():
        forget_cached_tables()
        for i, design in enumerate(designs):
            build_corner(design, pressure, grid)
            if i % 32 == 31:
                forget_cached_tables(keep_tabulated=STUDY_TABULATED_KEPT)
    study_s, _ = _timed(study_like, 1 if quick else 3)
    forget_cached_tables()
    return {"cold_corner_setups_s": cold_s, "corners": len(scenario.corners), "study_like_builds": count,
            "study_like_s": study_s, "study_like_s_per_build": study_s / count}


def run(quick: bool = False) -> dict:
    scenario = load_scenario(_demo_path())
    repeats = 1 if quick else 3
    laps = 2 if quick else 30
    design, model, net, schedule, _ = lap_setup(scenario)
    T0 = np.full(net.n_nodes, float(scenario.ambient.temperature_at(0.0)))
    watch = [model.output_nodes.index("fluid"), model.output_nodes.index(model.disc_check_node)]
    stint(net, model, schedule, T0, FAST, 1)                   # compile or load the kernel first
    reference = SolverSettings(method="Radau", rtol=1e-8 if quick else 1e-9, atol_k=1e-6 if quick else 1e-7)
    ref_peaks = stint(net, model, schedule, T0, reference, laps)
    result = {"machine": machine(), "quick": quick, "stint_laps": laps, "corner": design.name,
              "startup": startup_s(3 if quick else 7),
              "reference": f"Radau rtol {reference.rtol:g} atol_k {reference.atol_k:g}"}
    wall, err = {}, {}
    for name, st in (("rk45_baseline", BASELINE), ("lsoda", LSODA), ("fast", FAST)):
        wall[name], peaks = _timed(lambda: stint(net, model, schedule, T0, st, laps), repeats if name == "fast" else 1)
        err[name] = {"fluid": float(abs(peaks[watch[0]] - ref_peaks[watch[0]])),
                     model.disc_check_node: float(abs(peaks[watch[1]] - ref_peaks[watch[1]]))}
    # the throughput path (graded grid, linearised kernel) on the same stint, against the same reference
    repeated_laps(model, net, schedule, T0, 1, FAST)           # compile or load its kernel first
    wall["race_path"], rl = _timed(lambda: repeated_laps(model, net, schedule, T0, laps, FAST), repeats)
    err["race_path"] = {"fluid": float(abs(rl.peak_k[watch[0]] - ref_peaks[watch[0]])),
                        model.disc_check_node: float(abs(rl.peak_k[watch[1]] - ref_peaks[watch[1]]))}

    # 24-hour race, every corner from ambient, all laps in one kernel call a corner (thermo.chain.race),
    # corners in threads: the demo car (its two axle corners) and the same car with each axle split
    # into its left and right wheels (FOUR_CORNERS: four corner networks, each driven in full)
    hours = 24.0                                                # driven in full, --quick too (about 3 s)
    result["race24h_measured_h"] = hours
    for key, count_key, scen in (("race24h_s", "race24h_corners", scenario),
                                 ("race24h_four_corners_s", "race24h_four_corners",
                                  load_scenario(_demo_path(), FOUR_CORNERS))):
        race(scen, 0.05, FAST)                                  # first call compiles or loads the kernel
        _forget_tabulated_conductances()                        # the timed run builds its models from scratch
        r24 = race(scen, hours, FAST)
        result[key] = r24.wall_s
        result[count_key] = len(scen.corners)
    result["race24h_method"] = (f"graded grid (max stride {DEFAULT_MAX_STRIDE} samples), linearised kernel, "
                                "model build from scratch included (kernels already compiled); four corners: the "
                                "demo with brakes.left_share_front and left_share_rear = 0.52")

    # batches: per-configuration cost for a 1-hour stint, graded grid and linearised kernel, all laps
    # in one kernel call (--quick: two laps, scaled to the hour)
    base = kernel_network(net)
    lap_s = schedule.t_end_s - schedule.t_start_s
    coarse = graded_grid(schedule, net, schedule.t_start_s, schedule.t_end_s, 1, DEFAULT_MAX_STRIDE)
    inputs = kernel_inputs(net, schedule, coarse)
    batch_laps = 2 if quick else math.ceil(3600.0 / lap_s)
    rng = np.random.default_rng(8)
    per_config = {}
    for size in (1, 10, 100, 1000):
        kn = scaled(base, link_scale=rng.uniform(0.8, 1.2, size=(size, net.n_links)))
        start = np.repeat(T0[None, :], size, axis=0)
        kn.run_laps(inputs, start, 1, None)                     # compile or load this width's kernel first
        w, (res, _) = _timed(lambda: kn.run_laps(inputs, start, batch_laps, None), 1 if size >= 100 else repeats)
        if np.any(res.status != 0):
            raise RuntimeError(f"bench: a batch configuration failed (status {res.status.max()})")
        per_config[str(size)] = w / size * (3600.0 / (batch_laps * lap_s))
    result["batch_laps_measured"] = batch_laps
    result["batch_s_per_config"] = per_config
    result["batch_method"] = (f"graded grid (max stride {DEFAULT_MAX_STRIDE} samples), linearised kernel, "
                              f"configurations in lanes ({lane_width(1000)} wide for 1000 on this machine)")
    result["stint_wall_s"] = wall
    result["speedup_vs_rk45"] = wall["rk45_baseline"] / wall["fast"]
    result["speedup_vs_rk45_race_path"] = wall["rk45_baseline"] / wall["race_path"]
    result["peak_error_k"] = err

    result["corner_build"] = corner_build(quick)
    result["run24h"] = run24h(quick)
    result["sweep"] = study(quick)

    # settled lap against lap-by-lap simulation until within 1 K
    setup = lap_setup(scenario, design.name)
    w_setup, _ = _timed(lambda: lap_setup(scenario, design.name), 1)
    w_settle, settled = _timed(lambda: settled_lap(scenario, design.name, setup=setup), max(repeats, 3))
    w_brute, _ = _timed(lambda: stint(net, model, schedule, T0, FAST, settled.laps_to_1k), 1)
    result["settle"] = {"settled_lap_s": w_settle, "simulate_to_1k_s": w_brute, "laps_to_1k": settled.laps_to_1k,
                        "model_build_s": w_setup,
                        "residual_k": settled.residual_k, "lap_solves": settled.lap_solves}
    return result


def _text(r: dict) -> str:
    m = r["machine"]
    lines = [f"brakeheat bench on {m['cpu']} ({m['cores']} cores), corner {r['corner']}, "
             f"{r['stint_laps']}-lap stint, reference {r['reference']}"]
    for name, w in r["stint_wall_s"].items():
        e = ", ".join(f"{k} {v:.4f} K" for k, v in r["peak_error_k"][name].items())
        lines.append(f"  {name:14s} {w:8.3f} s   peak error: {e}")
    lines.append(f"  speedup_vs_rk45  {r['speedup_vs_rk45']:.1f}x")
    lines.append(f"  speedup_vs_rk45 (race path) {r['speedup_vs_rk45_race_path']:.1f}x")
    lines.append(f"  race24h_s        {r['race24h_s']:.2f} s for {r['race24h_corners']} corners, "
                 f"{r['race24h_four_corners_s']:.2f} s for {r['race24h_four_corners']} corners "
                 f"(model build included)")
    lines.append("  batch_s_per_config (1-hour stint): " + ", ".join(f"{k}: {v * 1e3:.1f} ms" for k, v in
                                                                   r["batch_s_per_config"].items()))
    st = r["startup"]
    lines.append(f"  start-up: brakeheat --help {st['help_s']:.2f} s (target < {st['target_help_s']:g} s), "
                 f"import thermo {st['import_thermo_s']:.2f} s, bare python {st['bare_python_s']:.2f} s")
    b = r["corner_build"]
    lines.append(f"  corner build: the demo's {b['corners']} corners with every table anew {b['cold_corner_setups_s']:.3f} s; "
                 f"{b['study_like_builds']} study-like front corners {b['study_like_s']:.2f} s "
                 f"({b['study_like_s_per_build'] * 1e3:.1f} ms each)")
    h = r["run24h"]
    t = h["targets"]
    was = h["at_issue"] if h["hours"] == 24.0 else {k: float("nan") for k in h["at_issue"]}   # --quick: 2 h
    lines.append(f"  run24h ({h['hours']:g} h, brakeheat run demo_24h.toml): --json {h['json_cpu_s']:.1f} s CPU "
                 f"(target < {t['json_cpu_s']:g}, {was['json_cpu_s']:g} at the issue), {h['json_wall_s']:.1f} s wall "
                 f"(--threads 2: {h['json_two_threads_cpu_s']:.1f} s CPU, {h['json_two_threads_wall_s']:.1f} s wall), "
                 f"{h['json_peak_mb']:.0f} MB (target < {t['json_peak_mb']:g}, {was['json_peak_mb']:g}); "
                 f"--out {h['out_cpu_s']:.1f} s CPU (target < {t['out_cpu_s']:g}, {was['out_cpu_s']:g}), "
                 f"{h['out_wall_s']:.1f} s wall, "
                 f"{h['out_peak_mb']:.0f} MB ({was['out_peak_mb']:g}), "
                 f"results.h5 {h['results_h5_mb']:.1f} MB (target < {t['results_h5_mb']:g}, {was['results_h5_mb']:g}); "
                 f"{h['trace_1khz_hours']:g} h on a 1 kHz logged lap {h['trace_1khz_cpu_s']:.1f} s CPU, "
                 f"{h['trace_1khz_2h_peak_mb']:.0f} MB (target < {t['trace_1khz_2h_peak_mb']:g}, "
                 f"{was['trace_1khz_2h_peak_mb']:g})")
    u = r["sweep"]
    t = u["targets"]
    lines.append(f"  sweep (brakeheat uncertainty demo.toml, {u['samples']} samples of the first stint, {u['workers']} "
                 f"workers): {u['wall_s']:.1f} s wall, {u['wall_s_per_1000']:.0f} s per 1000 samples (target < "
                 f"{t['wall_s']:g}), peak {u['peak_mb']:.0f} MB (target < {t['peak_mb']:g}), side by side in full Newton; "
                 f"--set solver.linearised=true {u['linearised_wall_s_per_1000']:.0f} s per 1000, "
                 f"{u['linearised_peak_mb']:.0f} MB; --one-by-one {u['one_by_one_wall_s_per_1000']:.0f} s per 1000, "
                 f"{u['one_by_one_peak_mb']:.0f} MB (side by side {u['lanes_speedup']:.1f}x faster)")
    s = r["settle"]
    lines.append(f"  settled lap {s['settled_lap_s']:.3f} s vs simulating {s['laps_to_1k']} laps to within 1 K "
                 f"{s['simulate_to_1k_s']:.3f} s (model build {s['model_build_s']:.2f} s not included)")
    return "\n".join(lines)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m thermo.bench", description="Time brakeheat's solvers on the demo.")
    parser.add_argument("--quick", action="store_true", help="shorter runs (under a minute)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    args = parser.parse_args(argv)
    r = run(quick=args.quick)
    print(json.dumps(r) if args.json else _text(r))
    return 0


if __name__ == "__main__":
    sys.exit(main())
