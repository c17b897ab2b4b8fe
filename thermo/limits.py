"""Temperature limits of a brake corner and the checks of a run against them.

Brake fluid boiling points: the FMVSS No. 116 minimum equilibrium reflux boiling points (ERBP)
are built in; racing fluids carry their maker's figures, entered by the user. Between dry and
wet the boiling point follows a published curve of boiling point against water content (see
:func:`boiling_drop_share`). The remaining limits (bearing grease, piston seal, caliper body,
disc, pad) are common-practice defaults that the user overrides with the makers' figures; parts
with no such limit are checked against their material's service limit (materials.toml).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping

import numpy as np

from lapdata.echo import shown
from lapdata.suggest import did_you_mean
from lapdata.units import celsius_to_kelvin, kelvin_to_celsius
from thermo.errors import ScenarioError
from thermo.keys import check_declared, key
from thermo.materials import Material
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

# Vapour lock point of glycol brake fluid against water content [(water %, degC)], as stated in
# J. Keen, "Vapour lock in car braking systems", TRRL Laboratory Report LR 903, Transport and
# Road Research Laboratory, Crowthorne, 1979 (abstract, TRID accession 00384731): "a water content
# of 1 % ... reduces the vapour lock point from around 250 degC to around 180 degC, with further
# increases in water content having progressively less effect"; "3 % or more water ...
# corresponding to a vapour lock point of about 145 degC". Rounded values, as the report states them.
KEEN_1979_POINTS_PCT_C = ((0.0, 250.0), (1.0, 180.0), (3.0, 145.0))
KEEN_1979_SOURCE = ("Keen, Vapour lock in car braking systems, TRRL Laboratory Report LR 903 (1979): "
                    "about 250, 180 and 145 degC at 0, 1 and 3 % water")


def _keen_exponential() -> tuple[float, float]:
    """(decay length w0 [% water], total drop A [K]) of B(w) = B0 - A (1 - exp(-w / w0)) through Keen's points.

    The three points lie at 0, a and 3a % water, so with x = exp(-a / w0) the drops d1 = A (1 - x)
    and d3 = A (1 - x^3) give 1 + x + x^2 = d3 / d1, a quadratic in x.
    """
    (w_0, b_0), (w_1, b_1), (w_3, b_3) = KEEN_1979_POINTS_PCT_C
    assert w_0 == 0.0 and math.isclose(w_3, 3.0 * w_1)
    ratio = (b_0 - b_3) / (b_0 - b_1)
    x = (-1.0 + math.sqrt(4.0 * ratio - 3.0)) / 2.0
    return -w_1 / math.log(x), (b_0 - b_1) / (1.0 - x)


KEEN_DECAY_PCT, KEEN_TOTAL_DROP_K = _keen_exponential()


def boiling_drop_share(water_pct):
    """Share of the dry-to-wet boiling-point drop reached at a water content [-] (0 dry, 1 at 3.7 %).

    An exponential fall B(w) = B0 - A (1 - exp(-w / w0)) passed exactly through the three points
    of Keen (1979, ``KEEN_1979_POINTS_PCT_C``): w0 = 0.995 % water, A = 110.4 K. Normalised by
    its drop at the FMVSS 116 wet water content (3.7 %) it scales to any fluid's dry and wet
    points; about 65 % of the drop comes in the first percent of water. Glycol fluids measured in
    1979: a modern or silicone fluid may fall otherwise; the maker's table governs where given.
    Beyond 3.7 % the fit flattens (at most 2.5 % of the drop further) while real fluids keep
    falling: no published point of this source lies there, so measure such a fluid.

    Parameters
    ----------
    water_pct : float or array
        Water content [% by mass]

    Returns
    -------
    float or array
        Share of the dry-to-wet drop [-]
    """
    w = np.maximum(np.asarray(water_pct, dtype=float), 0.0)
    share = -np.expm1(-w / KEEN_DECAY_PCT) / -math.expm1(-WET_WATER_CONTENT_PCT / KEEN_DECAY_PCT)
    return float(share) if share.ndim == 0 else share


@dataclass(frozen=True)
class FluidSpec:
    """A brake fluid's boiling points and its water content in service.

    The boiling point at the stated water content follows the published curve of Keen (1979,
    TRRL LR 903; see :func:`boiling_drop_share`) scaled to this fluid's dry (0 %) and wet (3.7 %)
    points: most of the drop comes in the first percent of water, so it lies below a straight
    line from dry to wet (the safe side). A user table of (water %, boiling point) pairs, when
    given, is interpolated instead (held at its end values beyond).
    """

    name: str
    dry_boiling_c: float
    wet_boiling_c: float
    water_content_pct: float = 0.0
    boiling_table: tuple[tuple[float, float], ...] = ()
    source: str = FMVSS116_SOURCE

    def __post_init__(self):
        for name in ("dry_boiling_c", "wet_boiling_c", "water_content_pct"):
            value = getattr(self, name)
            if not np.isfinite(value):
                raise ScenarioError(f"[fluid] {name} must be a number, got {shown(value)}")
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
            hint = did_you_mean(key, FMVSS116_BOILING_POINTS_C, n=2)
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
        return self.dry_boiling_c - boiling_drop_share(w) * (self.dry_boiling_c - self.wet_boiling_c)

    @property
    def water_curve_source(self) -> str:
        """Where the boiling point at the stated water content comes from."""
        if self.boiling_table:
            return "user table, interpolated"
        return f"published curve ({KEEN_1979_SOURCE}), scaled to this fluid's dry and wet points"


@dataclass(frozen=True)
class Limits:
    """Temperature limits [degC] and caution bands [K]; defaults are common practice, to be overridden.

    Defaults (common practice, no published source): wheel-bearing grease 150 degC with caution
    from 120 degC; EPDM piston seal 175 degC (the SAE J1603 dry-air test temperature) with a 25 K
    band; aluminium caliper body 200 degC; grey-iron disc 750 degC; pad 650 degC (the pad maker's
    window governs). Parts with no limit here are checked against their material's service limit
    (materials.toml) with a ``material_caution_band_k`` band.
    """

    bearing_c: float = key("bearing_c", 150.0, minimum=0.0, doc="wheel-bearing grease", maximum=400.0)
    bearing_caution_band_k: float = key("bearing_caution_band_k", 30.0, minimum=0.0, maximum=300.0)
    piston_seal_c: float = key("piston_seal_c", 175.0, minimum=0.0, maximum=400.0)
    piston_seal_caution_band_k: float = key("piston_seal_caution_band_k", 25.0, minimum=0.0, maximum=300.0)
    caliper_c: float = key("caliper_c", 200.0, minimum=0.0, doc="caliper body", maximum=700.0)
    caliper_caution_band_k: float = key("caliper_caution_band_k", 20.0, minimum=0.0, maximum=300.0)
    disc_c: float = key("disc_c", 750.0, minimum=0.0, doc="read on the disc face", maximum=2500.0)
    disc_caution_band_k: float = key("disc_caution_band_k", 50.0, minimum=0.0, maximum=300.0)
    pad_c: float = key("pad_c", 650.0, minimum=0.0, doc="read on the pad bulk", maximum=2500.0)
    pad_caution_band_k: float = key("pad_caution_band_k", 50.0, minimum=0.0, maximum=300.0)
    fluid_caution_band_k: float = key("fluid_caution_band_k", 20.0, minimum=0.0, maximum=300.0)
    material_caution_band_k: float = key("material_caution_band_k", 20.0, minimum=0.0,
                                         doc="band of the checks against a part's material service limit", maximum=300.0)

    def __post_init__(self):
        check_declared(self, "limits")


LIMIT_SOURCE_PRACTICE = "common practice default, no published source; the maker's figure governs"


@dataclass(frozen=True)
class CheckSpec:
    """What one check compares: a node's peak against a limit [K]."""

    name: str
    node: str
    limit_k: float
    caution_band_k: float
    source: str


def check_specs(fluid: FluidSpec, limits: Limits, disc_node: str = "disc", *, fluid_node: str = "fluid",
                node_materials: Mapping[str, Material] | None = None) -> tuple[CheckSpec, ...]:
    """The checks of one corner, in report order.

    ``disc_node`` is the disc temperature checked against the disc limit: the friction surface
    (``disc_surface``) when the disc is layered, else the lumped ``disc``. ``fluid_node`` is the
    node every fluid boiling check reads (e.g. the fluid at the piston face, its hottest place).
    Fluid vapour forms when line pressure is released, so the fluid is compared with the
    atmospheric boiling point (common practice, no published source).

    ``node_materials`` (node name -> Material) adds, after the checks above, one check
    ``<node>_material`` (e.g. ``piston_material``) for each node whose material has a service
    limit and that no check above already watches; its limit and source are the material's.
    """
    c2k = celsius_to_kelvin
    band = limits.fluid_caution_band_k
    specs = [
        CheckSpec("fluid_boiling_dry", fluid_node, c2k(fluid.dry_boiling_c), band, f"{fluid.name}: {fluid.source}, dry"),
        CheckSpec("fluid_boiling_wet", fluid_node, c2k(fluid.wet_boiling_c), band,
                  f"{fluid.name}: {fluid.source}, wet ({WET_WATER_CONTENT_PCT} % water)"),
        CheckSpec("fluid_boiling_at_water_content", fluid_node, c2k(fluid.boiling_at_water_c()), band,
                  f"{fluid.name} at {fluid.water_content_pct:g} % water: {fluid.water_curve_source}"),
        CheckSpec("bearing_grease", "bearing", c2k(limits.bearing_c), limits.bearing_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("piston_seal", "piston_seal", c2k(limits.piston_seal_c), limits.piston_seal_caution_band_k,
                  "SAE J1603 dry-air seal test temperature as default; seal maker governs"),
        CheckSpec("caliper_body", "caliper", c2k(limits.caliper_c), limits.caliper_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("disc_max", disc_node, c2k(limits.disc_c), limits.disc_caution_band_k, LIMIT_SOURCE_PRACTICE),
        CheckSpec("pad_max", "pad", c2k(limits.pad_c), limits.pad_caution_band_k, "pad maker's window governs; default common practice"),
    ]
    watched = {s.node for s in specs}
    for node, material in (node_materials or {}).items():
        if material.service_limit_k is None or node in watched:
            continue
        specs.append(CheckSpec(f"{node}_material", node, material.service_limit_k, limits.material_caution_band_k,
                               f"{material.name} service limit ({material.service_limit_basis}): "
                               f"{material.service_limit_source}"))
        watched.add(node)
    return tuple(specs)


def property_range_warnings(corner_name: str, node_materials: Mapping[str, Material],
                            node_peaks_k: Mapping[str, float]) -> list[str]:
    """One warning line per node whose peak lies above the end of its material's property tables.

    Beyond the last row of its specific-heat or conductivity table a material's properties are
    held constant (see :mod:`thermo.materials`), so the temperatures there rest on extrapolated
    data. Tables of one row declare a constant and set no range. Nodes without a peak are skipped.

    Parameters
    ----------
    corner_name : str
        Corner named in each line [-]
    node_materials : mapping
        Node name -> Material [-]
    node_peaks_k : mapping
        Node name -> peak temperature of the run [K]

    Returns
    -------
    list of str
        One line per node out of range, in the order of ``node_materials`` [-]
    """
    lines = []
    for node, material in node_materials.items():
        peak = node_peaks_k.get(node)
        end = material.property_data_end_k
        if peak is None or end is None or not math.isfinite(peak) or peak <= end:
            continue
        ranges = ", ".join(f"{name} {kelvin_to_celsius(lo):.0f}-{kelvin_to_celsius(hi):.0f} degC"
                           for name, (lo, hi) in material.property_data_ranges_k.items())
        lines.append(f"corner {corner_name}: node {node} peaks at {kelvin_to_celsius(peak):.1f} degC, above the "
                     f"end of the property data of {material.name} ({ranges}); properties are held constant "
                     f"beyond, so this temperature rests on extrapolated data")
    return lines


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
