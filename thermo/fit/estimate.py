"""Fit the [calibration] parameters to measured channels and peak readings (scipy least_squares, 'trf').

Residual vector, each term dimensionless:
- every fitted logged sample: (reading_model - reading_logged) / noise_k, reading_model = lagged
  node temperature + sensor offset (``thermo.fit.sensor``);
- every peak reading: one-sided, max(0, T_paint - peak_model) / tolerance_k for "reached",
  max(0, peak_model - T_paint) / tolerance_k for "not_reached" (zero when the reading is honoured);
- every parameter with prior_std > 0: (value - prior) / prior_std, a weak Gaussian prior.
Model parameters keep their [lower, upper] bounds; fitted sensor offsets are unbounded and enter
linearly (their Jacobian columns are exact). Model columns are forward differences with a step
of DIFF_STEP x max(|value|, 0.1), taken towards the interior of the bounds.

Covariance (J^T J)^-1 s^2 with s^2 = sum(r^2) / (m - n), as scipy's curve_fit does with
absolute_sigma = False; std errors are its diagonal's square root, correlations its normalised
form. Both are linearised estimates: see Bates & Watts, *Nonlinear Regression Analysis and Its
Applications*, Wiley, 1988, ch. 2.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
from scipy.optimize import least_squares

from thermo.errors import SolveError
from thermo.fit.errors import FitError
from thermo.fit.measured import MeasuredChannel, measured_channels, read_log
from thermo.fit.sensor import sensor_reading
from thermo.fit.stint import StintRunner, runner_for, segment_lap
from thermo.scenario.model import Scenario

DIFF_STEP = 0.01                 # relative step of the finite-difference Jacobian [-]
RELATIVE_STD_LIMIT = 0.5         # std error above half the value: not identifiable [-]
CORRELATION_LIMIT = 0.95         # |correlation| above this: the pair is not separately identifiable [-]
XTOL = 1e-4                      # relative step below which the fit stops: far below any std error [-]
FTOL = 1e-6                      # relative change of the cost below which the fit stops [-]


@dataclass(frozen=True)
class FittedValue:
    """One fitted quantity: a model parameter or a sensor offset."""

    name: str
    kind: str                    # 'parameter' or 'sensor offset'
    value: float
    std_error: float
    prior: float
    lower: float
    upper: float
    override_keys: tuple[str, ...]
    at_bound: bool = False


@dataclass(frozen=True)
class PeakCheck:
    name: str
    kind: str
    temperature_k: float
    predicted_peak_k: float

    @property
    def honoured(self) -> bool:
        above = self.predicted_peak_k >= self.temperature_k
        return above if self.kind == "reached" else not above


@dataclass(frozen=True)
class ChannelSeries:
    """Logged against predicted readings of one channel at the used samples (for plots)."""

    channel: str
    time_s: np.ndarray
    measured_k: np.ndarray
    predicted_k: np.ndarray
    holdout: np.ndarray


@dataclass(frozen=True)
class FitResult:
    values: tuple[FittedValue, ...]
    correlation: np.ndarray
    rms_k: dict[str, float]
    holdout_rms_k: dict[str, float]
    peaks: tuple[PeakCheck, ...]
    series: tuple[ChannelSeries, ...]
    warnings: tuple[str, ...]
    evaluations: int
    converged: bool
    message: str
    residual_count: int = 0
    holdout_laps: tuple[int, ...] = field(default_factory=tuple)

    @property
    def overrides(self) -> tuple[tuple[str, float], ...]:
        """(dotted key, fitted value) pairs that make the scenario the fitted one."""
        return tuple((key, v.value) for v in self.values for key in v.override_keys)


class _Problem:
    def __init__(self, scenario: Scenario, runner: StintRunner, channels: tuple[MeasuredChannel, ...]):
        cal = scenario.calibration
        self.cal, self.runner, self.channels = cal, runner, channels
        self.params = cal.parameters
        self.offset_channels = [i for i, ch in enumerate(channels) if ch.mapping.fit_offset]
        self.n_model = len(self.params)
        self.cache: dict[tuple, object] = {}

    def x0(self) -> np.ndarray:
        return np.array([p.prior for p in self.params] + [self.channels[i].mapping.offset_k for i in self.offset_channels])

    def bounds(self):
        lo = [p.lower for p in self.params] + [-np.inf] * len(self.offset_channels)
        hi = [p.upper for p in self.params] + [np.inf] * len(self.offset_channels)
        return np.array(lo), np.array(hi)

    def overrides(self, x) -> list:
        return [(key, float(v)) for p, v in zip(self.params, x[: self.n_model]) for key in p.override_keys]

    def prediction(self, x):
        key = tuple(np.round(x[: self.n_model], 12))
        if key not in self.cache:
            try:
                self.cache[key] = self.runner.run(self.overrides(x))
            except SolveError as error:
                raise FitError(f"fit: the model failed at {dict(zip((p.name for p in self.params), key))}: {error}") from None
        return self.cache[key]

    def offsets(self, x) -> list[float]:
        out = [ch.mapping.offset_k for ch in self.channels]
        for j, i in enumerate(self.offset_channels):
            out[i] = float(x[self.n_model + j])
        return out

    def readings(self, x) -> list[np.ndarray]:
        pred = self.prediction(x)
        return [sensor_reading(*pred.node(ch.mapping.corner, ch.mapping.node), ch.mapping.lag_s, off, ch.time_s)
                for ch, off in zip(self.channels, self.offsets(x))]

    def peak_values(self, x) -> list[float]:
        pred = self.prediction(x)
        return [float(np.max(pred.node(p.corner, p.node)[1])) for p in self.cal.peaks]

    def residuals(self, x) -> np.ndarray:
        parts = [((r - ch.values_k) / ch.mapping.noise_k)[~ch.holdout] for ch, r in zip(self.channels, self.readings(x))]
        for peak, value in zip(self.cal.peaks, self.peak_values(x)):
            gap = peak.temperature_k - value if peak.kind == "reached" else value - peak.temperature_k
            parts.append(np.array([max(gap, 0.0) / peak.tolerance_k]))
        for p, v in zip(self.params, x):
            if p.prior_std > 0:
                parts.append(np.array([(v - p.prior) / p.prior_std]))
        return np.concatenate(parts) if parts else np.zeros(0)

    def jacobian(self, x) -> np.ndarray:
        r0 = self.residuals(x)
        lo, hi = self.bounds()
        jac = np.zeros((r0.size, x.size))
        for j in range(self.n_model):
            h = DIFF_STEP * max(abs(x[j]), 0.1)
            if x[j] + h > hi[j]:
                h = -h
            xs = x.copy()
            xs[j] += h
            jac[:, j] = (self.residuals(xs) - r0) / h
        row = 0
        for i, ch in enumerate(self.channels):
            n = int(np.count_nonzero(~ch.holdout))
            if i in self.offset_channels:
                jac[row: row + n, self.n_model + self.offset_channels.index(i)] = 1.0 / ch.mapping.noise_k
            row += n
        return jac


def covariance(jac: np.ndarray, residuals: np.ndarray) -> np.ndarray:
    """(J^T J)^-1 s^2, s^2 = sum r^2 / (m - n); a value on a direction the data do not see gets inf."""
    m, n = jac.shape
    s2 = float(residuals @ residuals) / max(m - n, 1)
    w, v = np.linalg.eigh(jac.T @ jac)
    good = w > max(float(w.max()), 0.0) * 1e-12
    cov = (v[:, good] / w[good]) @ v[:, good].T * s2
    dead = (np.abs(v[:, ~good]) > 1e-3).any(axis=1)
    cov[dead, :] = np.inf
    cov[:, dead] = np.inf
    return cov


def fit_scenario(scenario: Scenario, measured_path) -> FitResult:
    """Fit a scenario's [calibration] parameters to a logged stint.

    Parameters
    ----------
    scenario : Scenario
        Read with load_scenario; must have a [calibration] table [-]
    measured_path : str or Path
        The logged CSV (speed and distance, temp_* channels) [-]

    Raises
    ------
    FitError
        No [calibration], unmapped or missing channels, a log that does not overlap the run,
        held-out laps not in the log.
    """
    cal = scenario.calibration
    if cal is None:
        raise FitError(f"{scenario.path}: no [calibration] table: it names the channels and the parameters to fit")
    source = str(measured_path)
    trace = read_log(measured_path)
    corners = tuple(dict.fromkeys([c for p in cal.parameters for c in p.corners] + [c.corner for c in cal.channels]
                                  + [p.corner for p in cal.peaks]))
    runner = runner_for(scenario, trace, corners)
    channels, notes = measured_channels(trace, cal, runner.span_s, lambda t: segment_lap(runner.segments, t), source)
    problem = _Problem(scenario, runner, channels)
    x0 = problem.x0()
    lo, hi = problem.bounds()
    n_res = problem.residuals(x0).size
    if n_res < x0.size:
        raise FitError(f"{scenario.path}: [calibration] {x0.size} values to fit from only {n_res} residuals: "
                       "add channels, peaks or priors, or fit fewer parameters")
    sol = least_squares(problem.residuals, x0, jac=problem.jacobian, bounds=(lo, hi), method="trf",
                        x_scale="jac", xtol=XTOL, ftol=FTOL, max_nfev=cal.max_evaluations)
    x = sol.x
    jac = problem.jacobian(x)
    cov = covariance(jac, sol.fun)
    std = np.sqrt(np.where(np.isfinite(np.diag(cov)), np.maximum(np.diag(cov), 0.0), np.inf))
    with np.errstate(invalid="ignore", divide="ignore"):
        corr = cov / np.outer(std, std)
    corr[~np.isfinite(corr)] = np.nan
    np.fill_diagonal(corr, 1.0)
    values = _values(problem, x, std, lo, hi)
    warnings = list(notes) + _identifiability(values, corr)
    if not sol.success:
        warnings.append(f"least_squares stopped without converging: {sol.message}")
    readings = problem.readings(x)
    series = tuple(ChannelSeries(ch.mapping.channel, ch.time_s, ch.values_k, r, ch.holdout)
                   for ch, r in zip(channels, readings))
    rms = {s.channel: _rms(s.predicted_k - s.measured_k, ~s.holdout) for s in series}
    hold = {s.channel: _rms(s.predicted_k - s.measured_k, s.holdout) for s in series} if cal.holdout_laps else {}
    peaks = tuple(PeakCheck(p.name, p.kind, p.temperature_k, v) for p, v in zip(cal.peaks, problem.peak_values(x)))
    for p in peaks:
        if not p.honoured:
            warnings.append(f"peak reading '{p.name}' is not honoured by the fitted model "
                            f"(predicted peak {p.predicted_peak_k - 273.15:.1f} degC)")
    return FitResult(values, corr, rms, hold, peaks, series, tuple(warnings), runner.evaluations, bool(sol.success),
                     str(sol.message), n_res, cal.holdout_laps)


def _rms(err: np.ndarray, mask: np.ndarray) -> float:
    return float(np.sqrt(np.mean(err[mask] ** 2))) if mask.any() else float("nan")


def _values(problem: _Problem, x, std, lo, hi) -> tuple[FittedValue, ...]:
    out = []
    for j, p in enumerate(problem.params):
        span = hi[j] - lo[j]
        at = bool(x[j] - lo[j] < 1e-6 * span or hi[j] - x[j] < 1e-6 * span)
        out.append(FittedValue(p.name, "parameter", float(x[j]), float(std[j]), p.prior, p.lower, p.upper,
                               p.override_keys, at))
    for j, i in enumerate(problem.offset_channels):
        m = problem.channels[i].mapping
        k = problem.n_model + j
        out.append(FittedValue(f"{m.channel}.offset_k", "sensor offset", float(x[k]), float(std[k]), m.offset_k,
                               -np.inf, np.inf, (f"calibration.channels.{m.channel}.offset_k",)))
    return tuple(out)


def _identifiability(values, corr) -> list[str]:
    out = []
    for v in values:
        scale = max(abs(v.value), 0.1) if v.kind == "parameter" else 1.0
        if not np.isfinite(v.std_error):
            out.append(f"{v.name} is not identifiable from these data: the measurements do not depend on it")
        elif v.kind == "parameter" and (v.std_error > RELATIVE_STD_LIMIT * scale or v.std_error > 0.5 * (v.upper - v.lower)):
            out.append(f"{v.name} is poorly identified: std error {v.std_error:.3g} against value {v.value:.3g}")
        if v.at_bound:
            out.append(f"{v.name} ended on a bound ({v.value:.4g}); its std error is not meaningful")
    n = len(values)
    for i in range(n):
        for j in range(i + 1, n):
            if np.isfinite(corr[i, j]) and abs(corr[i, j]) > CORRELATION_LIMIT:
                out.append(f"{values[i].name} and {values[j].name} are strongly correlated ({corr[i, j]:+.3f}): "
                           "the data cannot separate them")
    return out
