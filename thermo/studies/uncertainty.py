"""An uncertainty study: uncertain inputs drawn from distributions, the scenario run at each
sample, and for every check the probability of exceeding its limit, with a confidence interval.

The scenario's ``[uncertainty]`` table says what is uncertain:

    [uncertainty]
    samples = 200              # runs
    seed = 2026                # the same seed, the same samples
    sampling = "lhs"           # "lhs" (Latin hypercube) or "sobol" (scrambled), scipy.stats.qmc
    confidence = 0.95          # of the intervals on each probability

    [[uncertainty.inputs]]
    name = "disc convection"   # optional; default the first key
    keys = ["corners.front.airflow.disc_convection_multiplier", "corners.rear.airflow.disc_convection_multiplier"]
    distribution = "normal"    # normal (mean, std), uniform (low, high),
    mean = 1.0                 # triangular (low, mode, high), lognormal (median, sigma: of ln x)
    std = 0.15

An input sets every key it lists to the same drawn value (``key = "..."`` for one key). Each
distribution is truncated to the range every one of its keys allows (``brakeheat keys``): the
unit-interval samples are mapped into the distribution's CDF between the range's ends, then
through its inverse, so no sample is ever outside what the scenario accepts.

The statistics
--------------
- ``p_exceed``: the share of samples whose check is exceeded (margin below 0), with its exact
  (Clopper-Pearson) binomial interval; ``p_caution``: the share in the caution band or beyond.
  The binomial interval treats the samples as independent draws, which Latin hypercube and
  Sobol samples are not (they are spread more evenly), so for a smooth margin it errs wide.
- ``margin_k_percentiles`` and ``peak_c_percentiles`` at 5, 50 and 95 %; a histogram of each peak.
- ``sensitivity``: Spearman's rank correlation of each input with each check's margin (which
  inputs drive the margin, and in which direction), shown as a tornado plot, with its p-value
  against no correlation; a correlation with p >= 0.05 is marked as within sampling noise (with
  few samples an input that moves nothing still shows a correlation of a few tenths).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from thermo.studies.engine import StudyError

DISTRIBUTIONS = {"normal": ("mean", "std"), "uniform": ("low", "high"), "triangular": ("low", "mode", "high"),
                 "lognormal": ("median", "sigma")}
SAMPLING = ("lhs", "sobol")
TABLE_KEYS = ("samples", "seed", "sampling", "confidence", "stints", "inputs")
INPUT_KEYS = ("name", "key", "keys", "distribution")
DEFAULT_SAMPLES = 200
MAX_SAMPLES = 1_000_000
PERCENTILES = (5, 50, 95)
HISTOGRAM_BINS = 20
HEADLINE_CHECK = "fluid_boiling_at_water_content"


@dataclass(frozen=True)
class UncertainInput:
    """One uncertain input: the keys it sets, its distribution and parameters (in the keys' unit),
    and the range its samples are truncated to."""

    name: str
    keys: tuple
    distribution: str
    parameters: dict
    low: float          # -inf: no lower end
    high: float         # +inf: no upper end

    def frozen(self):
        """The scipy.stats distribution, not truncated."""
        from scipy import stats
        p = self.parameters
        if self.distribution == "normal":
            return stats.norm(loc=p["mean"], scale=p["std"])
        if self.distribution == "uniform":
            return stats.uniform(loc=p["low"], scale=p["high"] - p["low"])
        if self.distribution == "triangular":
            width = p["high"] - p["low"]
            return stats.triang(c=(p["mode"] - p["low"]) / width, loc=p["low"], scale=width)
        return stats.lognorm(s=p["sigma"], scale=p["median"])

    def from_unit(self, u: np.ndarray) -> np.ndarray:
        """Samples on [0, 1) mapped to this input's truncated distribution (inverse CDF)."""
        dist = self.frozen()
        lo, hi = dist.cdf(self.low), dist.cdf(self.high)
        x = dist.ppf(lo + np.asarray(u, dtype=float) * (hi - lo))
        return np.clip(x, self.low, self.high)

    def as_dict(self) -> dict:
        return {"name": self.name, "keys": list(self.keys), "distribution": self.distribution,
                **self.parameters, "truncated_to": [None if math.isinf(self.low) else self.low,
                                                    None if math.isinf(self.high) else self.high]}


@dataclass(frozen=True)
class UncertaintyPlan:
    """The ``[uncertainty]`` table read and checked."""

    inputs: tuple
    samples: int
    seed: int
    sampling: str
    confidence: float
    stints: int

    def unit_samples(self) -> np.ndarray:
        """(samples, inputs) points on the unit cube, Latin hypercube or scrambled Sobol, seeded."""
        from scipy.stats import qmc
        d = len(self.inputs)
        engine = (qmc.LatinHypercube(d, rng=self.seed) if self.sampling == "lhs"
                  else qmc.Sobol(d, scramble=True, rng=self.seed))
        if self.sampling == "sobol":
            import warnings
            with warnings.catch_warnings():     # a count that is not a power of two: said once, by the CLI
                warnings.simplefilter("ignore")
                return engine.random(self.samples)
        return engine.random(self.samples)

    def values(self) -> list[list]:
        """Each sample's value of each key (an input's value repeated for each of its keys)."""
        u = self.unit_samples()
        drawn = [inp.from_unit(u[:, j]) for j, inp in enumerate(self.inputs)]
        return [[float(drawn[j][i]) for j, inp in enumerate(self.inputs) for _ in inp.keys] for i in range(self.samples)]

    @property
    def keys(self) -> tuple:
        return tuple(k for inp in self.inputs for k in inp.keys)


def _number(table: dict, name: str, where: str) -> float:
    value = table.get(name)
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise StudyError(f"{where}: '{name}' must be a finite number, got {shown(value)}")
    return float(value)


def _key_range(key: str, where: str, path, overrides) -> tuple[float, float]:
    """(low, high) a number key allows, in its own unit."""
    from thermo.scenario.schema import key_field
    declared = key_field(key)
    if declared is None:
        from thermo.errors import BrakeheatError
        from thermo.scenario import load_scenario
        try:
            load_scenario(path, list(overrides) + [(key, 1.0)])   # its own message, with a suggestion
        except BrakeheatError as error:
            raise StudyError(f"{where}: {error}") from None
        raise StudyError(f"{where}: {shown(key)} names no number key of the scenario")
    if declared.kind is not float:
        raise StudyError(f"{where}: {key} takes {declared.kind.__name__} values; an uncertain input must be a number key")
    # a key that must be above a value (not at it): the draws reach that end with probability 0
    low = declared.minimum if declared.minimum is not None else (
        declared.above if declared.above is not None else -math.inf)
    high = declared.maximum if declared.maximum is not None else math.inf
    return float(low), float(high)


def _input(raw, index: int, source: str, path, overrides) -> UncertainInput:
    where = f"{source}: [[uncertainty.inputs]] {index}"
    if not isinstance(raw, dict):
        raise StudyError(f"{where}: expected a table with keys (or key), distribution and its parameters")
    dist = raw.get("distribution")
    if dist not in DISTRIBUTIONS:
        raise StudyError(f"{where}: distribution must be one of {', '.join(DISTRIBUTIONS)}, got {shown(dist)}")
    allowed = INPUT_KEYS + DISTRIBUTIONS[dist]
    for name in raw:
        if name not in allowed:
            raise StudyError(f"{where}: unknown key {shown(name)} for a {dist} input; expected {', '.join(allowed)}")
    if ("key" in raw) == ("keys" in raw):
        raise StudyError(f"{where}: give either key = \"dotted.key\" or keys = [\"dotted.key\", ...]")
    keys = [raw["key"]] if "key" in raw else raw["keys"]
    if not isinstance(keys, list) or not keys or not all(isinstance(k, str) and k for k in keys):
        raise StudyError(f"{where}: keys must be a list of dotted scenario keys, got {shown(keys)}")
    params = {p: _number(raw, p, where) for p in DISTRIBUTIONS[dist]}
    if dist == "normal" and params["std"] <= 0 or dist == "lognormal" and (params["sigma"] <= 0 or params["median"] <= 0):
        raise StudyError(f"{where}: a {dist} input needs {'std' if dist == 'normal' else 'median and sigma'} above 0")
    if dist in ("uniform", "triangular") and not params["low"] < params["high"]:
        raise StudyError(f"{where}: low must be below high, got {params['low']:g} and {params['high']:g}")
    if dist == "triangular" and not params["low"] <= params["mode"] <= params["high"]:
        raise StudyError(f"{where}: mode must lie from low to high, got {params['mode']:g}")
    low, high = -math.inf, math.inf
    for key in keys:
        lo, hi = _key_range(key, f"{where} key {key}", path, overrides)
        low, high = max(low, lo), min(high, hi)
    name = raw.get("name", keys[0])
    if not isinstance(name, str) or not name.strip():
        raise StudyError(f"{where}: name must be text, got {shown(name)}")
    made = UncertainInput(name, tuple(keys), dist, params, low, high)
    dist_obj = made.frozen()
    if dist_obj.cdf(high) - dist_obj.cdf(low) < 1e-9:
        raise StudyError(f"{where}: the {dist} distribution has almost no probability inside the range its keys "
                         f"allow ({low:g} to {high:g}); check its parameters and the keys' units")
    return made


def read_uncertainty(scenario, path, overrides=(), samples=None, seed=None, sampling=None, stints=None) -> UncertaintyPlan:
    """The scenario's ``[uncertainty]`` table, checked; ``samples``, ``seed``, ``sampling`` and
    ``stints`` (when not None) replace the table's."""
    source = str(path)
    table = scenario.raw.get("uncertainty")
    if not isinstance(table, dict):
        raise StudyError(f"{source}: no [uncertainty] table; add one with [[uncertainty.inputs]] (README, "
                         "\"Uncertainty\")")
    for name in table:
        if name not in TABLE_KEYS:
            from lapdata.suggest import did_you_mean
            raise StudyError(f"{source}: unknown key {shown(name)} in [uncertainty]{did_you_mean(name, TABLE_KEYS)}; "
                             f"expected one of {', '.join(TABLE_KEYS)}")
    raw_inputs = table.get("inputs", [])
    if not isinstance(raw_inputs, list) or not raw_inputs:
        raise StudyError(f"{source}: [uncertainty] needs at least one [[uncertainty.inputs]] table")
    inputs = tuple(_input(raw, i + 1, source, path, overrides) for i, raw in enumerate(raw_inputs))
    keys = [k for inp in inputs for k in inp.keys]
    if len(set(keys)) != len(keys):
        twice = next(k for k in keys if keys.count(k) > 1)
        raise StudyError(f"{source}: [uncertainty] key {twice} belongs to two inputs; give each key to one input")
    names = [inp.name for inp in inputs]
    if len(set(names)) != len(names):
        raise StudyError(f"{source}: [uncertainty] two inputs are named {next(n for n in names if names.count(n) > 1)!r}")

    def whole(name, given, default, low, high):
        value = table.get(name, default) if given is None else given
        if isinstance(value, bool) or not isinstance(value, int) or not low <= value <= high:
            raise StudyError(f"{source}: [uncertainty] {name} must be a whole number from {low} to {high}, got {shown(value)}")
        return value
    n = whole("samples", samples, DEFAULT_SAMPLES, 2, MAX_SAMPLES)
    s = whole("seed", seed, 0, 0, 2**63 - 1)
    st = whole("stints", stints, 0, 0, 10_000)
    how = table.get("sampling", "lhs") if sampling is None else sampling
    if how not in SAMPLING:
        raise StudyError(f"{source}: [uncertainty] sampling must be one of {', '.join(SAMPLING)}, got {shown(how)}")
    conf = table.get("confidence", 0.95)
    if isinstance(conf, bool) or not isinstance(conf, (int, float)) or not 0.5 <= conf < 1.0:
        raise StudyError(f"{source}: [uncertainty] confidence must be a number from 0.5 to below 1, got {shown(conf)}")
    return UncertaintyPlan(inputs, n, s, how, float(conf), st)


def uncertainty(path, *, overrides=(), samples=None, seed=None, sampling=None, stints=None, settle=False,
                scheduler=None, workers=None, chunk_size=None, checkpoint=None, resume=False, progress=None,
                one_by_one=False):
    """Run the scenario's ``[uncertainty]`` study.

    Parameters
    ----------
    path : str or Path
        Scenario TOML file with an ``[uncertainty]`` table [-]
    overrides : sequence of (str, object)
        Applied to every sample first (``--set``) [-]
    samples, seed, sampling, stints : replace the table's values when given [-]
    settle, scheduler, workers, chunk_size, checkpoint, resume, progress, one_by_one : as ``thermo.studies.sweep.sweep`` [-]

    Returns
    -------
    (UncertaintyPlan, StudyRecord)
        The plan and every sample's result; ``uncertainty_dict``
        makes the statistics [-]
    """
    from thermo.scenario import load_scenario
    from thermo.studies.engine import run_study
    from thermo.studies.points import StudyJob
    scenario = load_scenario(path, overrides)
    plan = read_uncertainty(scenario, path, overrides, samples, seed, sampling, stints)
    definition = {"inputs": [inp.as_dict() for inp in plan.inputs], "samples": plan.samples, "seed": plan.seed,
                  "sampling": plan.sampling, "stints": plan.stints, "settle": bool(settle),
                  "overrides": [[k, v] for k, v in overrides]}
    if one_by_one:
        definition["one_by_one"] = True         # recorded only when asked: studies from before keep resuming
    job = StudyJob(str(path), tuple(overrides), plan.keys, plan.stints, bool(settle), False, lanes=not one_by_one)
    record = run_study("uncertainty", path, job, plan.values(), definition, scheduler=scheduler, workers=workers,
                       chunk_size=chunk_size, checkpoint=checkpoint, resume=resume, progress=progress)
    return plan, record


def exceedance(count: int, total: int, confidence: float) -> tuple[float, list[float]]:
    """(share, [low, high]): the share ``count / total`` and its exact (Clopper-Pearson) binomial
    interval at ``confidence`` (scipy.stats.binomtest)."""
    from scipy.stats import binomtest
    ci = binomtest(int(count), int(total)).proportion_ci(confidence_level=confidence, method="exact")
    return count / total, [float(ci.low), float(ci.high)]


def _input_columns(plan: UncertaintyPlan, points: list) -> np.ndarray:
    """(samples, inputs) each finished sample's value of each input (its first key's value)."""
    return np.array([[p["values"][inp.keys[0]] for inp in plan.inputs] for p in points], dtype=float)


NOISE_P = 0.05      # a rank correlation whose p-value is at least this is within sampling noise


def _rank_correlation(x: np.ndarray, y: np.ndarray) -> dict:
    """Spearman's rho of x and y and its two-sided p-value against no correlation
    (scipy.stats.spearmanr: the t distribution with n - 2 degrees of freedom, which treats the
    samples as independent draws), and whether it is within sampling noise (p >= ``NOISE_P``);
    None for all three where either does not vary."""
    from scipy.stats import spearmanr
    if np.ptp(x) == 0 or np.ptp(y) == 0:
        return {"rank_correlation": None, "p_value": None, "within_noise": None}
    result = spearmanr(x, y)
    p = float(result.pvalue)
    return {"rank_correlation": round(float(result.statistic), 4), "p_value": float(f"{p:.3g}"),
            "within_noise": bool(p >= NOISE_P)}


def check_samples(points: list) -> dict:
    """{(corner, check): {"node", "margin_k", "peak_c", "limit_c", "status"}} as arrays over the
    finished, successful samples (in sample order)."""
    table = {}
    for p in points:
        for c in p["corners"]:
            for k in c["checks"]:
                entry = table.setdefault((c["name"], k["name"]), {"node": k["node"], "margin_k": [], "peak_c": [],
                                                                   "limit_c": [], "status": []})
                for field in ("margin_k", "peak_c", "limit_c", "status"):
                    entry[field].append(k[field])
    return table


def uncertainty_dict(plan: UncertaintyPlan, record) -> dict:
    """JSON-ready, as ``uncertainty --json`` prints it: scenario, caution, samples, seed, inputs,
    headline (each corner's probability that the fluid boils), checks (per corner and check:
    p_exceed, p_exceed_ci, p_caution, p_caution_ci, margin and peak percentiles, peak histogram),
    sensitivity (per corner and check, each input's rank correlation with the margin, its p-value
    and whether it is within sampling noise)."""
    import thermo
    done = [p for p in record.points if p is not None and "error" not in p]
    failed = sum(1 for p in record.points if p is not None and "error" in p)
    out = {"scenario": record.scenario, "version": thermo.__version__, "caution": thermo.CAUTION,
           "samples": plan.samples, "samples_done": len(done), "samples_failed": failed, "seed": plan.seed,
           "sampling": plan.sampling, "confidence": plan.confidence, "stints": plan.stints,
           "inputs": [inp.as_dict() for inp in plan.inputs], "headline": [], "checks": [], "sensitivity": []}
    if not done:
        return out
    x = _input_columns(plan, done)
    n = len(done)
    for (corner, check), s in check_samples(done).items():
        margin, peak = np.asarray(s["margin_k"]), np.asarray(s["peak_c"])
        status = np.asarray(s["status"])
        p_exc, ci_exc = exceedance(int(np.sum(status == "exceeded")), n, plan.confidence)
        p_cau, ci_cau = exceedance(int(np.sum(status != "ok")), n, plan.confidence)
        counts, edges = np.histogram(peak, bins=HISTOGRAM_BINS)
        entry = {"corner": corner, "name": check, "node": s["node"], "p_exceed": round(p_exc, 6),
                 "p_exceed_ci": [round(v, 6) for v in ci_exc], "p_caution": round(p_cau, 6),
                 "p_caution_ci": [round(v, 6) for v in ci_cau],
                 "margin_k_percentiles": {str(q): round(float(np.percentile(margin, q)), 2) for q in PERCENTILES},
                 "peak_c_percentiles": {str(q): round(float(np.percentile(peak, q)), 2) for q in PERCENTILES},
                 "limit_c_range": [round(float(np.min(s["limit_c"])), 2), round(float(np.max(s["limit_c"])), 2)],
                 "peak_c_histogram": {"edges": [round(float(e), 3) for e in edges], "counts": counts.tolist()}}
        out["checks"].append(entry)
        if check == HEADLINE_CHECK:
            out["headline"].append({"corner": corner, "check": check, "p_exceed": entry["p_exceed"],
                                    "p_exceed_ci": entry["p_exceed_ci"], "p_caution": entry["p_caution"]})
        drivers = [{"input": inp.name, **_rank_correlation(x[:, j], margin)} for j, inp in enumerate(plan.inputs)]
        drivers.sort(key=lambda d: -abs(d["rank_correlation"] or 0.0))
        out["sensitivity"].append({"corner": corner, "check": check, "inputs": drivers})
    return out
