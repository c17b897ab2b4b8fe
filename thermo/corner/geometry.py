"""The description of one brake corner: geometry, materials and heat-path coefficients (SI units).

Small frozen dataclasses that validate on construction and name the offending key. The scenario
reader converts the user's unit-suffixed keys (mm, mm^2, degC ...) into these once.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, fields

from thermo.errors import ScenarioError

PISTON_TYPES = ("solid", "vented")
DUCT_TARGETS = ("disc_eye", "disc_face", "caliper")
FACE_CORRELATIONS = ("rotating", "limpert")
DUCT_FLOW_MODES = ("area", "volume_flow", "duct_velocity")


def _require_positive(obj, *names, allow_zero=False):
    for name in names:
        value = getattr(obj, name)
        ok = isinstance(value, (int, float)) and math.isfinite(value) and (value >= 0 if allow_zero else value > 0)
        if not ok:
            want = ">= 0" if allow_zero else "> 0"
            raise ScenarioError(f"[{obj.section}] {name} must be a number {want}, got {value!r}")


def _require_fraction(obj, *names):
    for name in names:
        value = getattr(obj, name)
        if not (isinstance(value, (int, float)) and 0.0 <= value <= 1.0):
            raise ScenarioError(f"[{obj.section}] {name} must be between 0 and 1, got {value!r}")


@dataclass(frozen=True)
class DiscGeometry:
    """Friction ring of the disc (the bell is separate).

    outer_diameter_m, inner_diameter_m : swept ring [m]; thickness_m : overall [m];
    vented : vane passages between two cheeks; cheek_thickness_m, vane_count, vane_thickness_m :
    for vented discs; layers : nodes through each cheek's half (0 = automatic from the braking
    pulse's penetration depth, ``thermo.corner.layers``; 1 = lumped; more resolve the
    friction-surface temperature an infra-red sensor reads); vane_pumping_coefficient : vane exit
    air speed as a share of the disc rim speed (centrifugal pumping, common practice 0.1-0.3).
    """

    material: str
    outer_diameter_m: float
    inner_diameter_m: float
    thickness_m: float
    vented: bool
    cheek_thickness_m: float = 0.0
    vane_count: int = 0
    vane_thickness_m: float = 0.0
    layers: int = 0
    vane_pumping_coefficient: float = 0.2
    bell_mass_kg: float = 0.8
    bell_material: str = "aluminium_7075_t6"
    bell_area_m2: float = 0.04
    emissivity_override: float | None = None
    face_correlation: str = "rotating"
    section: str = "disc"

    def __post_init__(self):
        _require_positive(self, "outer_diameter_m", "inner_diameter_m", "thickness_m", "bell_mass_kg", "bell_area_m2")
        if self.inner_diameter_m >= self.outer_diameter_m:
            raise ScenarioError(f"[{self.section}] inner_diameter_mm must be less than outer_diameter_mm")
        if not (isinstance(self.layers, int) and 0 <= self.layers <= 12):
            raise ScenarioError(f"[{self.section}] layers must be a whole number from 0 (automatic) to 12, got {self.layers!r}")
        if self.vented:
            _require_positive(self, "cheek_thickness_m", "vane_thickness_m", "vane_pumping_coefficient")
            if not (isinstance(self.vane_count, int) and self.vane_count >= 3):
                raise ScenarioError(f"[{self.section}] vane_count must be a whole number >= 3 for a vented disc")
            if 2 * self.cheek_thickness_m >= self.thickness_m:
                raise ScenarioError(f"[{self.section}] two cheeks (2 x cheek_thickness_mm) must be thinner than thickness_mm")
            if self.vane_count * self.vane_thickness_m >= math.pi * self.inner_diameter_m:
                raise ScenarioError(f"[{self.section}] vanes ({self.vane_count} x vane_thickness_mm) do not fit round the inner diameter")
        if self.emissivity_override is not None:
            _require_fraction(self, "emissivity_override")
        if self.face_correlation not in FACE_CORRELATIONS:
            raise ScenarioError(f"[{self.section}] face_correlation must be one of {', '.join(FACE_CORRELATIONS)}")

    @property
    def ring_area_m2(self) -> float:
        """One face of the swept ring [m^2]."""
        return math.pi / 4 * (self.outer_diameter_m ** 2 - self.inner_diameter_m ** 2)

    @property
    def vane_height_m(self) -> float:
        """Height of a vane passage between the cheeks [m]."""
        return self.thickness_m - 2 * self.cheek_thickness_m if self.vented else 0.0

    @property
    def vane_volume_m3(self) -> float:
        """Metal volume of the vanes [m^3]."""
        if not self.vented:
            return 0.0
        radial = (self.outer_diameter_m - self.inner_diameter_m) / 2
        return self.vane_count * self.vane_thickness_m * radial * self.vane_height_m

    @property
    def metal_volume_m3(self) -> float:
        """Metal volume of the friction ring [m^3]."""
        if self.vented:
            return 2 * self.ring_area_m2 * self.cheek_thickness_m + self.vane_volume_m3
        return self.ring_area_m2 * self.thickness_m

    @property
    def passage_flow_area_m2(self) -> float:
        """Total inlet flow area of the vane passages at the inner diameter [m^2]."""
        if not self.vented:
            return 0.0
        width = math.pi * self.inner_diameter_m / self.vane_count - self.vane_thickness_m
        return self.vane_count * width * self.vane_height_m

    @property
    def passage_hydraulic_diameter_m(self) -> float:
        """Hydraulic diameter 4 A / P of one passage at its inlet [m]."""
        if not self.vented:
            return 0.0
        width = math.pi * self.inner_diameter_m / self.vane_count - self.vane_thickness_m
        return 4 * width * self.vane_height_m / (2 * (width + self.vane_height_m))

    @property
    def passage_length_m(self) -> float:
        """Radial length of a vane passage [m]."""
        return (self.outer_diameter_m - self.inner_diameter_m) / 2

    @property
    def passage_wetted_area_m2(self) -> float:
        """Metal area wetted by the air in all passages: two cheek inner faces plus the vane sides [m^2]."""
        if not self.vented:
            return 0.0
        vane_sides = self.vane_count * 2 * self.passage_length_m * self.vane_height_m
        cheek_faces = 2 * (self.ring_area_m2 - self.vane_count * self.vane_thickness_m * self.passage_length_m)
        return vane_sides + cheek_faces


@dataclass(frozen=True)
class PadGeometry:
    """Both pads of the corner together (one each side of the disc).

    area_m2 : friction face of ONE pad [m^2]; thickness_m : friction material now [m];
    minimum_thickness_m : replace-by thickness [m]; backing_* : steel backing plate of one pad;
    partition_override : fixed disc share of the friction heat (None: the pad-disc interface
    splits it by the two bodies' thermal resistances); layers : nodes through the friction
    material (0 = automatic from the penetration depth); rest_contact_conductance_w_m2k : the
    pad resting on the disc between brake applications [W/(m^2 K)].
    """

    material: str
    area_m2: float
    thickness_m: float
    minimum_thickness_m: float = 0.003
    backing_thickness_m: float = 0.005
    backing_material: str = "steel_4340"
    partition_override: float | None = None
    layers: int = 0
    rest_contact_conductance_w_m2k: float = 400.0
    section: str = "pad"

    def __post_init__(self):
        _require_positive(self, "area_m2", "thickness_m", "backing_thickness_m")
        _require_positive(self, "minimum_thickness_m", "rest_contact_conductance_w_m2k", allow_zero=True)
        if not (isinstance(self.layers, int) and 0 <= self.layers <= 12):
            raise ScenarioError(f"[{self.section}] layers must be a whole number from 0 (automatic) to 12, got {self.layers!r}")
        # a worn pad may go below its minimum during a run (the run warns); the scenario reader
        # rejects a starting thickness at or below the minimum
        if self.partition_override is not None:
            _require_fraction(self, "partition_override")


@dataclass(frozen=True)
class PistonGeometry:
    """The pistons of ONE side of an opposed caliper (the corner model lumps both sides).

    diameters_m : one entry per piston on one side [m]; height_m, wall_thickness_m, crown_thickness_m :
    cup shape [m]; crown_contact_fraction : share of the piston face that touches the backing plate;
    piston_type : 'solid' or 'vented' (radial holes behind the crown); vent_hole_* : per piston;
    insert_* : insulating crown insert (thickness 0 = none); shim_* : insulator between backing plate
    and pistons (thickness 0 = none); contact_conductance_w_m2k : crown on backing plate.
    """

    material: str
    diameters_m: tuple[float, ...]
    height_m: float = 0.025
    wall_thickness_m: float = 0.003
    crown_thickness_m: float = 0.004
    crown_contact_fraction: float = 0.6
    piston_type: str = "solid"
    vent_hole_count: int = 0
    vent_hole_diameter_m: float = 0.0
    insert_material: str = "ceramic_zirconia"
    insert_thickness_m: float = 0.0
    shim_material: str = "mica_ceramic_fibre_shim"
    shim_thickness_m: float = 0.0
    contact_conductance_w_m2k: float = 3000.0
    seal_gap_conductance_w_m2k: float = 300.0
    section: str = "piston"

    def __post_init__(self):
        if not self.diameters_m or any(not (isinstance(d, (int, float)) and d > 0) for d in self.diameters_m):
            raise ScenarioError(f"[{self.section}] diameters_mm must be a list of positive diameters, one per piston on one side")
        _require_positive(self, "height_m", "wall_thickness_m", "crown_thickness_m", "contact_conductance_w_m2k",
                          "seal_gap_conductance_w_m2k")
        _require_positive(self, "insert_thickness_m", "shim_thickness_m", allow_zero=True)
        _require_fraction(self, "crown_contact_fraction")
        if self.crown_contact_fraction == 0:
            raise ScenarioError(f"[{self.section}] crown_contact_fraction must be above 0")
        if self.piston_type not in PISTON_TYPES:
            raise ScenarioError(f"[{self.section}] type must be one of {', '.join(PISTON_TYPES)}, got {self.piston_type!r}")
        if self.piston_type == "vented":
            if not (isinstance(self.vent_hole_count, int) and self.vent_hole_count >= 1):
                raise ScenarioError(f"[{self.section}] a vented piston needs vent_hole_count >= 1")
            _require_positive(self, "vent_hole_diameter_m")
        if 2 * self.wall_thickness_m >= min(self.diameters_m):
            raise ScenarioError(f"[{self.section}] wall_thickness_mm is too thick for the smallest piston")

    @property
    def count_per_side(self) -> int:
        return len(self.diameters_m)

    @property
    def area_one_side_m2(self) -> float:
        """Summed piston area acting on one pad: what sets the clamp force [m^2]."""
        return sum(math.pi / 4 * d ** 2 for d in self.diameters_m)

    @property
    def metal_volume_m3(self) -> float:
        """Metal volume of all pistons of BOTH sides (cup: crown disc plus wall tube) [m^3]."""
        vol = 0.0
        for d in self.diameters_m:
            crown = math.pi / 4 * d ** 2 * self.crown_thickness_m
            wall = math.pi / 4 * (d ** 2 - (d - 2 * self.wall_thickness_m) ** 2) * (self.height_m - self.crown_thickness_m)
            vol += crown + wall
        return 2 * vol


@dataclass(frozen=True)
class CaliperGeometry:
    """Caliper body, its fluid, and its mounting to the upright."""

    material: str
    mass_kg: float
    area_m2: float
    fluid_wetted_area_m2: float
    fluid_volume_m3: float
    fluid_film_conductance_w_m2k: float = 150.0
    piston_fluid_gap_m: float = 0.001
    mount_conductance_w_k: float = 2.0
    view_factor_from_disc: float = 0.08
    emissivity_override: float | None = None
    section: str = "caliper"

    def __post_init__(self):
        _require_positive(self, "mass_kg", "area_m2", "fluid_wetted_area_m2", "fluid_volume_m3",
                          "fluid_film_conductance_w_m2k", "piston_fluid_gap_m")
        _require_positive(self, "mount_conductance_w_k", allow_zero=True)
        _require_fraction(self, "view_factor_from_disc")


@dataclass(frozen=True)
class HubGeometry:
    """Hub, wheel bearing and upright, with the joints between them [W/K]."""

    hub_mass_kg: float = 2.5
    hub_material: str = "steel_4340"
    hub_area_m2: float = 0.03
    bearing_mass_kg: float = 0.9
    bearing_material: str = "bearing_steel_52100"
    upright_mass_kg: float = 3.0
    upright_material: str = "aluminium_6061_t6"
    upright_area_m2: float = 0.12
    disc_to_bell_w_k: float = 4.0
    bell_to_hub_w_k: float = 3.0
    hub_to_bearing_w_k: float = 2.5
    bearing_to_upright_w_k: float = 3.0
    section: str = "hub"

    def __post_init__(self):
        _require_positive(self, *(f.name for f in fields(self) if f.name.endswith(("_kg", "_m2", "_w_k"))))


@dataclass(frozen=True)
class DuctGeometry:
    """A cooling duct: air taken from the front at the car's speed, delivered to a target.

    flow_mode 'area': m_dot = rho v_car A_inlet C_eff; 'volume_flow': a fixed volume flow [m^3/s] at
    the reference speed, scaled with speed; 'duct_velocity': a fixed outlet velocity at the reference
    speed over the outlet area, scaled with speed. air_rise_k: duct air warmer than ambient [K].
    """

    target: str = "disc_eye"
    flow_mode: str = "area"
    inlet_area_m2: float = 0.0
    effectiveness_coefficient: float = 0.6
    volume_flow_m3_s: float = 0.0
    duct_velocity_m_s: float = 0.0
    outlet_area_m2: float = 0.004
    reference_speed_m_s: float = 200 / 3.6
    air_rise_k: float = 5.0
    face_area_share: float = 0.3
    section: str = "duct"

    def __post_init__(self):
        if self.target not in DUCT_TARGETS:
            raise ScenarioError(f"[{self.section}] target must be one of {', '.join(DUCT_TARGETS)}, got {self.target!r}")
        if self.flow_mode not in DUCT_FLOW_MODES:
            raise ScenarioError(f"[{self.section}] flow must be one of {', '.join(DUCT_FLOW_MODES)}, got {self.flow_mode!r}")
        _require_positive(self, "inlet_area_m2", "volume_flow_m3_s", "duct_velocity_m_s", "air_rise_k", allow_zero=True)
        _require_positive(self, "outlet_area_m2", "reference_speed_m_s")
        _require_fraction(self, "effectiveness_coefficient", "face_area_share")
        needed = {"area": "inlet_area_m2", "volume_flow": "volume_flow_m3_s", "duct_velocity": "duct_velocity_m_s"}[self.flow_mode]
        if getattr(self, needed) <= 0:
            raise ScenarioError(f"[{self.section}] flow = '{self.flow_mode}' needs {needed.replace('_m2', '_mm2')} > 0")

    def mass_flow_kg_s(self, vehicle_speed_m_s, air_density_kg_m3):
        """Air mass flow delivered by the duct at a vehicle speed [kg/s] (vectorised)."""
        if self.flow_mode == "area":
            return air_density_kg_m3 * vehicle_speed_m_s * self.inlet_area_m2 * self.effectiveness_coefficient
        scale = vehicle_speed_m_s / self.reference_speed_m_s
        if self.flow_mode == "volume_flow":
            return air_density_kg_m3 * self.volume_flow_m3_s * scale
        return air_density_kg_m3 * self.duct_velocity_m_s * self.outlet_area_m2 * scale


@dataclass(frozen=True)
class AirflowSettings:
    """How the wheel-well air moves: local speed = factor x car speed; calibration multipliers."""

    local_airflow_factor: float = 0.35
    disc_convection_multiplier: float = 1.0
    vane_convection_multiplier: float = 1.0
    caliper_convection_multiplier: float = 1.0
    hub_convection_multiplier: float = 1.0
    duct_effectiveness_multiplier: float = 1.0
    contact_conductance_multiplier: float = 1.0
    section: str = "airflow"

    def __post_init__(self):
        _require_positive(self, "local_airflow_factor", "disc_convection_multiplier", "vane_convection_multiplier",
                          "caliper_convection_multiplier",
                          "hub_convection_multiplier", "duct_effectiveness_multiplier", "contact_conductance_multiplier")


@dataclass(frozen=True)
class CornerDesign:
    """Everything that defines one brake corner's heat network."""

    name: str
    axle: str
    disc: DiscGeometry
    pad: PadGeometry
    piston: PistonGeometry
    caliper: CaliperGeometry
    hub: HubGeometry
    ducts: tuple[DuctGeometry, ...]
    airflow: AirflowSettings
    fluid_material: str = "brake_fluid_glycol"
    pad_mu: float = 0.5
    rolling_radius_m: float = 0.33

    def __post_init__(self):
        if self.axle not in ("front", "rear"):
            raise ScenarioError(f"[corners.{self.name}] axle must be 'front' or 'rear'")
        if not (0.05 <= self.pad_mu <= 1.5):
            raise ScenarioError(f"[corners.{self.name}] pad_mu must be between 0.05 and 1.5, got {self.pad_mu!r}")
        gap_volume = 2 * self.piston.area_one_side_m2 * self.caliper.piston_fluid_gap_m
        if gap_volume >= self.caliper.fluid_volume_m3:
            raise ScenarioError(
                f"[corners.{self.name}.caliper] the fluid behind the pistons (piston_fluid_gap_mm x piston area, "
                f"{gap_volume * 1e6:.1f} cm3) must be less than fluid_volume_cm3 ({self.caliper.fluid_volume_m3 * 1e6:.1f} cm3)")
        _require_positive(type("x", (), {"section": f"corners.{self.name}", "rolling_radius_m": self.rolling_radius_m})(),
                          "rolling_radius_m")

    @property
    def effective_radius_m(self) -> float:
        """Mean radius of the swept ring, where the pad force acts [m]."""
        return (self.disc.outer_diameter_m + self.disc.inner_diameter_m) / 4
