"""Temperature limits of a brake corner and the checks of a run against them.

Brake fluid boiling points: the FMVSS No. 116 minimum equilibrium reflux boiling points (ERBP)
are built in; racing fluids carry their maker's figures, entered by the user. The remaining
limits (bearing grease, piston seal, caliper body, disc, pad) are common-practice defaults that
the user overrides with the makers' figures.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.units import celsius_to_kelvin
from thermo.errors import ScenarioError
from thermo.results import CheckResult

# FMVSS No. 116, 49 CFR 571.116, S5.1.1 (dry ERBP) and S5.1.2 (wet ERBP), minimums [degC].
FMVSS116_BOILING_POINTS_C = {
    "DOT 3": (205.0, 140.0),
    "DOT 4": (230.0, 155.0),
    "DOT 5": (260.0, 180.0),
    "DOT 5.1": (260.0, 180.0),
}
FMVSS116_SOURCE = "FMVSS No. 116 (49 CFR 571.116) minimum equilibrium reflux boiling point"
# "Wet" ERBP is measured after humidification to about 3.7 % water by mass (FMVSS 116 S7.2).
WET_WATER_CONTENT_PCT = 3.7


@dataclass(frozen=True)
class FluidSpec:
    """A brake fluid's boiling points and its water content in service.

    The boiling point at the stated water content is interpolated linearly between dry (0 %)
    and wet (3.7 %) and held at the wet value beyond: a documented simplification (the real
    curve falls most steeply over the first percent), unless the user gives a table of
    (water %, boiling point) pairs, which is then interpolated instead.
    """

    name: str
    dry_boiling_c: float
    wet_boiling_c: float
    water_content_pct: float = 0.0
    boiling_table: tuple[tuple[float, float], ...] = ()
    source: str = FMVSS116_SOURCE

    def __post_init__(self):
        for key in ("dry_boiling_c", "wet_boiling_c", "water_content_pct"):
            value = getattr(self, key)
            if not np.isfinite(value):
                raise ScenarioError(f"[fluid] {key} must be a number, got {value!r}")
        if self.water_content_pct < 0 or self.water_content_pct > 10:
            raise ScenarioError(f"[fluid] water_content_pct must be 0 to 10 %, got {self.water_content_pct}")
        if self.wet_boiling_c > self.dry_boiling_c:
            raise ScenarioError("[fluid] wet_boiling_c must not exceed dry_boiling_c")
        water = [w for w, _ in self.boiling_table]
        if self.boiling_table and (any(np.diff(water) <= 0) or water[0] < 0):
            raise ScenarioError("[fluid] boiling_table water contents must start at >= 0 % and increase")

    @classmethod
    def from_grade(cls, grade: str, water_content_pct: float = 0.0) -> "FluidSpec":
        """A fluid at the FMVSS 116 minimum boiling points of its DOT grade."""
        key = grade.upper().replace("DOT", "DOT ").replace("  ", " ").strip()
        if key not in FMVSS116_BOILING_POINTS_C:
            import difflib
            close = difflib.get_close_matches(key, FMVSS116_BOILING_POINTS_C, n=2)
            hint = f" (did you mean {' or '.join(close)}?)" if close else ""
            raise ScenarioError(
                f"[fluid] grade '{grade}' is unknown{hint}; expected one of "
                f"{', '.join(FMVSS116_BOILING_POINTS_C)}, or grade = \"custom\" with dry_boiling_c and wet_boiling_c")
        dry, wet = FMVSS116_BOILING_POINTS_C[key]
        return cls(key, dry, wet, water_content_pct)

    def boiling_at_water_c(self, water_pct: float | None = None) -> float:
        """Boiling point at a water content [degC] (the stated one by default)."""
        w = self.water_content_pct if water_pct is None else water_pct
        if self.boiling_table:
            water, boil = zip(*self.boiling_table)
            return float(np.interp(w, water, boil))
        share = min(w / WET_WATER_CONTENT_PCT, 1.0)
        return self.dry_boiling_c + share * (self.wet_boiling_c - self.dry_boiling_c)


@dataclass(frozen=True)
class Limits:
    """Temperature limits [degC] and caution bands [K]; defaults are common practice, to be overridden.

    Defaults (common practice, no published source): wheel-bearing grease 150 degC with caution
    from 120 degC; EPDM piston seal 175 degC (the SAE J1603 dry-air test temperature) with a 25 K
    band; aluminium caliper body 200 degC; grey-iron disc 750 degC; pad 650 degC (the pad maker's
    window governs).
    """

    bearing_c: float = 150.0
    bearing_caution_band_k: float = 30.0
    piston_seal_c: float = 175.0
    piston_seal_caution_band_k: float = 25.0
    caliper_c: float = 200.0
    caliper_caution_band_k: float = 20.0
    disc_c: float = 750.0
    disc_caution_band_k: float = 50.0
    pad_c: float = 650.0
    pad_caution_band_k: float = 50.0
    fluid_caution_band_k: float = 20.0

    def __post_init__(self):
        for key, value in self.__dict__.items():
            if not (np.isfinite(value) and (value >= 0 if key.endswith("_k") else True)):
                raise ScenarioError(f"[limits] {key} must be a finite number (bands >= 0), got {value!r}")


LIMIT_SOURCE_PRACTICE = "common practice default, no published source; the maker's figure governs"


@dataclass(frozen=True)
class CheckSpec:
    """What one check compares: a node's peak against a limit [K]."""

    name: str
    node: str
    limit_k: float
    caution_band_k: float
    source: str


def check_specs(fluid: FluidSpec, limits: Limits, disc_node: str = "disc") -> tuple[CheckSpec, ...]:
    """The checks of one corner, in report order.

    ``disc_node`` is the disc temperature checked against the disc limit: the friction surface
    (``disc_surface``) when the disc is layered, else the lumped ``disc``.
    Fluid vapour forms when line pressure is released, so the fluid is compared with the
    atmospheric boiling point (common practice, no published source).
    """
    c2k = celsius_to_kelvin
    band = limits.fluid_caution_band_k
    return (
        CheckSpec("fluid_boiling_dry", "fluid", c2k(fluid.dry_boiling_c), band, f"{fluid.name}: {fluid.source}, dry"),
        CheckSpec("fluid_boiling_wet", "fluid", c2k(fluid.wet_boiling_c), band,
                  f"{fluid.name}: {fluid.source}, wet ({WET_WATER_CONTENT_PCT} % water)"),
        CheckSpec("fluid_boiling_at_water_content", "fluid", c2k(fluid.boiling_at_water_c()), band,
                  f"{fluid.name} at {fluid.water_content_pct:g} % water: "
                  + ("user table, interpolated" if fluid.boiling_table else "linear between dry and wet")),
        CheckSpec("bearing_grease", "bearing", c2k(limits.bearing_c), limits.bearing_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("piston_seal", "piston_seal", c2k(limits.piston_seal_c), limits.piston_seal_caution_band_k,
                  "SAE J1603 dry-air seal test temperature as default; seal maker governs"),
        CheckSpec("caliper_body", "caliper", c2k(limits.caliper_c), limits.caliper_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("disc_max", disc_node, c2k(limits.disc_c), limits.disc_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("pad_max", "pad", c2k(limits.pad_c), limits.pad_caution_band_k, "pad maker's window governs; default common practice"),
    )


def status_of(margin_k: float, caution_band_k: float) -> str:
    """'exceeded' below zero margin, 'caution' within the band, else 'ok'."""
    if margin_k < 0:
        return "exceeded"
    if margin_k < caution_band_k:
        return "caution"
    return "ok"


def evaluate_check(spec: CheckSpec, time_s: np.ndarray, temperature_k: np.ndarray) -> CheckResult:
    """Peak, time of peak, margin and status of one check on a temperature history [K]."""
    i = int(np.argmax(temperature_k))
    peak = float(temperature_k[i])
    margin = spec.limit_k - peak
    return CheckResult(
        name=spec.name, node=spec.node, limit_k=spec.limit_k, peak_k=peak, peak_time_s=float(time_s[i]),
        margin_k=margin, status=status_of(margin, spec.caution_band_k), caution_band_k=spec.caution_band_k,
        source=spec.source,
    )
