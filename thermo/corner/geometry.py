"""The description of one brake corner: geometry, materials and heat-path coefficients (SI units).

Small frozen dataclasses that validate on construction and name the offending key. The scenario
reader converts the user's unit-suffixed keys (mm, mm^2, degC ...) into these once.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from lapdata.echo import shown
from lapdata.units import CM3, KMH, MM, MM2
from thermo.errors import ScenarioError
from thermo.keys import check_declared, key

PISTON_TYPES = ("solid", "vented")
DUCT_TARGETS = ("disc_eye", "disc_face", "caliper")
FACE_CORRELATIONS = ("rotating", "limpert")
DUCT_FLOW_MODES = ("area", "volume_flow", "duct_velocity")


MAX_PISTON_DIAMETER_M = 0.1       # sanity bound, not a design rule: no car caliper has a 100 mm piston
PISTON_OVERHANG_ALLOWED = 1.5     # sanity bound, not a design rule: a piston may overhang the ring a little


def disc_radiating_area_m2(outer_diameter_m: float, inner_diameter_m: float, thickness_m: float) -> float:
    """Both faces of a friction ring and its outer rim [m^2]."""
    return 2 * math.pi / 4 * (outer_diameter_m ** 2 - inner_diameter_m ** 2) + math.pi * outer_diameter_m * thickness_m


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

    material: str = key("material", kind=str)
    outer_diameter_m: float = key("outer_diameter_mm", factor=MM, above=0.0, doc="the swept ring", maximum=600.0)
    inner_diameter_m: float = key("inner_diameter_mm", factor=MM, above=0.0, maximum=600.0)
    thickness_m: float = key("thickness_mm", factor=MM, above=0.0, maximum=100.0)
    vented: bool = key("vented", kind=bool)
    cheek_thickness_m: float = key("cheek_thickness_mm", 0.0, factor=MM, minimum=0.0, doc="vented", maximum=50.0)
    vane_count: int = key("vane_count", 0, kind=int, minimum=0, doc="vented", maximum=200)
    vane_thickness_m: float = key("vane_thickness_mm", 0.0, factor=MM, minimum=0.0, doc="vented", maximum=30.0)
    layers: int = key("layers", 0, kind=int, minimum=0, maximum=12,
                      doc="nodes through each cheek; 0 = automatic, the first from the braking pulse's penetration "
                          "depth, as many as fill the cheek (at most 8); 1 lumps the disc, which cannot resolve the "
                          "friction face an IR sensor reads")
    vane_pumping_coefficient: float = key("vane_pumping_coefficient", 0.2, minimum=0.0, maximum=1.0,
                                          doc="vane exit air speed / rim speed")
    bell_mass_kg: float = key("bell_mass_kg", 0.8, above=0.0, maximum=20.0)
    bell_material: str = key("bell_material", "aluminium_7075_t6", kind=str)
    bell_area_m2: float = key("bell_area_m2", 0.04, above=0.0, maximum=1.0)
    emissivity_override: float | None = key("emissivity", None, above=0.0, maximum=1.0, doc="omit: the material's")
    face_correlation: str = key("face_correlation", "rotating", kind=str, choices=FACE_CORRELATIONS,
                                doc="rotating: Cobb & Saunders on the wheel speed, or the cross-flow where larger; "
                                    "limpert: Limpert's disc form on the local air speed (about three times more cooling)")
    section: str = "disc"

    def __post_init__(self):
        check_declared(self, self.section)
        if self.inner_diameter_m >= self.outer_diameter_m:
            raise ScenarioError(f"[{self.section}] inner_diameter_mm must be less than outer_diameter_mm")
        if self.vented:
            for name, value in (("cheek_thickness_mm", self.cheek_thickness_m), ("vane_thickness_mm", self.vane_thickness_m),
                                ("vane_pumping_coefficient", self.vane_pumping_coefficient)):
                if value <= 0:
                    raise ScenarioError(f"[{self.section}] a vented disc needs {name} > 0, got {shown(value)}")
            if not (isinstance(self.vane_count, int) and self.vane_count >= 3):
                raise ScenarioError(f"[{self.section}] vane_count must be a whole number >= 3 for a vented disc")
            if 2 * self.cheek_thickness_m >= self.thickness_m:
                raise ScenarioError(f"[{self.section}] two cheeks (2 x cheek_thickness_mm) must be thinner than thickness_mm")
            if self.vane_count * self.vane_thickness_m >= math.pi * self.inner_diameter_m:
                raise ScenarioError(f"[{self.section}] vanes ({self.vane_count} x vane_thickness_mm) do not fit round the inner diameter")

    @property
    def ring_area_m2(self) -> float:
        """One face of the swept ring [m^2]."""
        return math.pi / 4 * (self.outer_diameter_m ** 2 - self.inner_diameter_m ** 2)

    @property
    def radiating_area_m2(self) -> float:
        """Both faces of the ring and its outer rim, the area the disc radiates from [m^2]."""
        return disc_radiating_area_m2(self.outer_diameter_m, self.inner_diameter_m, self.thickness_m)

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


PAD_EDGE_TOLERANCE_M = 0.5e-3   # common practice, no published source: pad edge to disc edge


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

    material: str = key("material", kind=str)
    area_m2: float = key("area_mm2", factor=MM2, above=0.0, doc="friction face of one pad", maximum=50000.0)
    thickness_m: float = key("thickness_mm", factor=MM, above=0.0, maximum=60.0)
    minimum_thickness_m: float = key("minimum_thickness_mm", 3.0, factor=MM, minimum=0.0, maximum=50.0)
    backing_thickness_m: float = key("backing_thickness_mm", 5.0, factor=MM, above=0.0, maximum=20.0)
    backing_material: str = key("backing_material", "steel_4340", kind=str)
    partition_override: float | None = key("heat_partition", None, minimum=0.0, maximum=1.0,
                                           doc="fixed disc share; omit to let the interface split the heat")
    layers: int = key("layers", 0, kind=int, minimum=0, maximum=12,
                      doc="nodes through the friction material; 0 = automatic, from the penetration depth (at most 6)")
    # 400: about a 0.1 mm air gap, k_air / gap (air k from Incropera Table A.4); the gap itself is
    # common practice, no published source
    rest_contact_conductance_w_m2k: float = key("rest_contact_conductance_w_m2k", 400.0, minimum=0.0,
                                                doc="pad resting on the disc between applications", maximum=100000.0)
    radial_height_m: float = key("radial_height_mm", 0.0, factor=MM, minimum=0.0, maximum=200.0,
                                 doc="friction face's radial height, for the alignment warnings; 0: not given")
    outer_edge_offset_m: float = key("outer_edge_offset_mm", 0.0, factor=MM, minimum=-50.0, maximum=50.0,
                                     doc="pad's outer edge beyond (+) or inside (-) the disc's outer edge")
    section: str = "pad"

    def __post_init__(self):
        check_declared(self, self.section)
        # a worn pad may go below its minimum during a run (the run warns); the scenario reader
        # rejects a starting thickness at or below the minimum


@dataclass(frozen=True)
class PistonGeometry:
    """The pistons of ONE side of an opposed caliper (the corner model lumps both sides).

    diameters_m : one entry per piston on one side [m]; height_m, wall_thickness_m, crown_thickness_m :
    cup shape [m]; crown_contact_fraction : share of the piston face that touches the backing plate;
    piston_type : 'solid' or 'vented' (radial holes behind the crown); vent_hole_* : per piston;
    insert_* : insulating crown insert (thickness 0 = none); shim_* : insulator between backing plate
    and pistons (thickness 0 = none); contact_conductance_w_m2k : crown on backing plate.
    """

    material: str = key("material", kind=str)
    diameters_m: tuple[float, ...] = key("diameters_mm", factor=MM, kind=list, doc="one per piston on ONE side")
    height_m: float = key("height_mm", 25.0, factor=MM, above=0.0, maximum=100.0)
    wall_thickness_m: float = key("wall_thickness_mm", 3.0, factor=MM, above=0.0, maximum=20.0)
    crown_thickness_m: float = key("crown_thickness_mm", 4.0, factor=MM, above=0.0, maximum=50.0)
    crown_contact_fraction: float = key("crown_contact_fraction", 0.6, above=0.0, maximum=1.0,
                                        doc="share of the piston face touching the backing plate")
    piston_type: str = key("type", "solid", kind=str, choices=PISTON_TYPES)
    vent_hole_count: int = key("vent_hole_count", 0, kind=int, minimum=0, doc="per piston (vented)", maximum=32)
    vent_hole_diameter_m: float = key("vent_hole_diameter_mm", 0.0, factor=MM, minimum=0.0, doc="vented", maximum=20.0)
    insert_material: str = key("insert_material", "ceramic_zirconia", kind=str)
    insert_thickness_m: float = key("insert_thickness_mm", 0.0, factor=MM, minimum=0.0, doc="0: none", maximum=20.0)
    shim_material: str = key("shim_material", "mica_ceramic_fibre_shim", kind=str)
    shim_thickness_m: float = key("shim_thickness_mm", 0.0, factor=MM, minimum=0.0, doc="0: none", maximum=10.0)
    contact_conductance_w_m2k: float = key("contact_conductance_w_m2k", 3000.0, above=0.0, doc="crown on backing plate", maximum=1000000.0)
    seal_gap_conductance_w_m2k: float = key("seal_gap_conductance_w_m2k", 300.0, above=0.0, maximum=100000.0)
    section: str = "piston"

    def __post_init__(self):
        if not self.diameters_m or any(not (isinstance(d, (int, float)) and d > 0) for d in self.diameters_m):
            raise ScenarioError(f"[{self.section}] diameters_mm must be a list of positive diameters, one per piston on one side")
        check_declared(self, self.section)
        if self.piston_type == "vented":
            if self.vent_hole_count < 1:
                raise ScenarioError(f"[{self.section}] a vented piston needs vent_hole_count >= 1")
            if self.vent_hole_diameter_m <= 0:
                raise ScenarioError(f"[{self.section}] a vented piston needs vent_hole_diameter_mm > 0")
        if max(self.diameters_m) > MAX_PISTON_DIAMETER_M:
            raise ScenarioError(f"[{self.section}] diameters_mm must each be at most {MAX_PISTON_DIAMETER_M * 1e3:g} mm, "
                                f"got {max(self.diameters_m) * 1e3:g}")
        if 2 * self.wall_thickness_m >= min(self.diameters_m):
            raise ScenarioError(f"[{self.section}] wall_thickness_mm is too thick for the smallest piston")
        if self.crown_thickness_m + self.insert_thickness_m >= self.height_m:
            raise ScenarioError(f"[{self.section}] crown_thickness_mm (+ insert_thickness_mm) must be less than height_mm "
                                f"({(self.crown_thickness_m + self.insert_thickness_m) * 1e3:g} mm is not less than "
                                f"{self.height_m * 1e3:g} mm)")
        if self.vent_hole_count and self.vent_hole_diameter_m >= min(self.diameters_m) - 2 * self.wall_thickness_m:
            raise ScenarioError(f"[{self.section}] vent_hole_diameter_mm must be less than the smallest piston's bore "
                                f"inside its wall")

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

    material: str = key("material", kind=str)
    mass_kg: float = key("mass_kg", above=0.0, maximum=30.0)
    area_m2: float = key("area_m2", above=0.0, doc="outer surface in the airflow", maximum=2.0)
    fluid_wetted_area_m2: float = key("fluid_wetted_area_mm2", factor=MM2, above=0.0, maximum=200000.0)
    fluid_volume_m3: float = key("fluid_volume_cm3", factor=CM3, above=0.0, maximum=1000.0)
    fluid_film_conductance_w_m2k: float = key("fluid_film_conductance_w_m2k", 150.0, above=0.0,
                                              doc="bulk fluid to its walls and to the fluid at the pistons", maximum=100000.0)
    # 1 mm behind a new pad's pistons: common practice, no published source
    piston_fluid_gap_m: float = key("piston_fluid_gap_mm", 1.0, factor=MM, above=0.0,
                                    doc="fluid between each piston and its bore bottom: the fluid_at_piston node", maximum=20.0)
    mount_conductance_w_k: float = key("mount_conductance_w_k", 2.0, minimum=0.0, maximum=1000.0)
    view_factor_from_disc: float = key("view_factor_from_disc", 0.08, minimum=0.0, maximum=1.0)
    emissivity_override: float | None = key("emissivity", None, above=0.0, maximum=1.0, doc="omit: the material's")
    section: str = "caliper"

    def __post_init__(self):
        check_declared(self, self.section)


@dataclass(frozen=True)
class HubGeometry:
    """Hub, wheel bearing and upright, with the joints between them [W/K]."""

    hub_mass_kg: float = key("hub_mass_kg", 2.5, above=0.0, maximum=50.0)
    hub_material: str = key("hub_material", "steel_4340", kind=str)
    hub_area_m2: float = key("hub_area_m2", 0.03, above=0.0, maximum=2.0)
    bearing_mass_kg: float = key("bearing_mass_kg", 0.9, above=0.0, maximum=50.0)
    bearing_material: str = key("bearing_material", "bearing_steel_52100", kind=str)
    upright_mass_kg: float = key("upright_mass_kg", 3.0, above=0.0, maximum=50.0)
    upright_material: str = key("upright_material", "aluminium_6061_t6", kind=str)
    upright_area_m2: float = key("upright_area_m2", 0.12, above=0.0, maximum=2.0)
    disc_to_bell_w_k: float = key("disc_to_bell_w_k", 4.0, above=0.0, doc="joint", maximum=1000.0)
    bell_to_hub_w_k: float = key("bell_to_hub_w_k", 3.0, above=0.0, doc="joint", maximum=1000.0)
    hub_to_bearing_w_k: float = key("hub_to_bearing_w_k", 2.5, above=0.0, doc="joint", maximum=1000.0)
    bearing_to_upright_w_k: float = key("bearing_to_upright_w_k", 3.0, above=0.0, doc="joint", maximum=1000.0)
    section: str = "hub"

    def __post_init__(self):
        check_declared(self, self.section)


@dataclass(frozen=True)
class DuctGeometry:
    """A cooling duct: air taken from the front at the car's speed, delivered to a target.

    flow_mode 'area': m_dot = rho v_car A_inlet C_eff; 'volume_flow': a fixed volume flow [m^3/s] at
    the reference speed, scaled with speed; 'duct_velocity': a fixed outlet velocity at the reference
    speed over the outlet area, scaled with speed. air_rise_k: duct air warmer than ambient [K].
    """

    target: str = key("target", "disc_eye", kind=str, choices=DUCT_TARGETS)
    flow_mode: str = key("flow", "area", kind=str, choices=DUCT_FLOW_MODES)
    inlet_area_m2: float = key("inlet_area_mm2", 0.0, factor=MM2, minimum=0.0, doc="flow = area", maximum=100000.0)
    effectiveness_coefficient: float = key("duct_quality", 0.6, minimum=0.0, maximum=1.0,
                                           doc="C_eff: delivered flow / (rho v A_inlet)")
    volume_flow_m3_s: float = key("volume_flow_m3_s", 0.0, minimum=0.0, doc="flow = volume_flow, at reference_speed_kmh", maximum=2.0)
    duct_velocity_m_s: float = key("duct_velocity_m_s", 0.0, minimum=0.0,
                                   doc="flow = duct_velocity, over outlet_area_mm2 at reference_speed_kmh", maximum=200.0)
    outlet_area_m2: float = key("outlet_area_mm2", 4000.0, factor=MM2, above=0.0, maximum=100000.0)
    reference_speed_m_s: float = key("reference_speed_kmh", 200.0, factor=KMH, minimum=1.0, maximum=500.0)
    air_rise_k: float = key("air_rise_k", 5.0, minimum=0.0, doc="the duct's air warmer than ambient by this", maximum=100.0)
    face_area_share: float = key("face_area_share", 0.3, minimum=0.0, maximum=1.0)
    section: str = "duct"

    def __post_init__(self):
        check_declared(self, self.section)
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

    local_airflow_factor: float = key("local_airflow_factor", 0.35, above=0.0,
                                      doc="air in the wheel moves slower than the car", maximum=10.0)
    disc_convection_multiplier: float = key("disc_convection_multiplier", 1.0, above=0.0,
                                            doc="calibration multiplier (1 = the published correlation): disc faces", maximum=10.0)
    vane_convection_multiplier: float = key("vane_convection_multiplier", 1.0, above=0.0, doc="vane passages", maximum=10.0)
    caliper_convection_multiplier: float = key("caliper_convection_multiplier", 1.0, above=0.0,
                                               doc="caliper, backing plates, pad edges", maximum=10.0)
    hub_convection_multiplier: float = key("hub_convection_multiplier", 1.0, above=0.0, maximum=10.0)
    duct_effectiveness_multiplier: float = key("duct_effectiveness_multiplier", 1.0, above=0.0, maximum=10.0)
    contact_conductance_multiplier: float = key("contact_conductance_multiplier", 1.0, above=0.0, maximum=10.0)
    section: str = "airflow"

    def __post_init__(self):
        check_declared(self, self.section)


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
    pad_mu: float = key("pad_mu", 0.5, minimum=0.05, maximum=1.0, doc="pad-disc friction coefficient")
    rolling_radius_m: float = 0.33

    def __post_init__(self):
        if self.axle not in ("front", "rear"):
            raise ScenarioError(f"[corners.{self.name}] axle must be 'front' or 'rear'")
        check_declared(self, f"corners.{self.name}")
        gap_volume = self.fluid_at_pistons_volume_m3
        if gap_volume >= self.caliper.fluid_volume_m3:
            raise ScenarioError(
                f"[corners.{self.name}.caliper] the fluid behind the pistons (piston_fluid_gap_mm x piston area, "
                f"{gap_volume * 1e6:.1f} cm3) must be less than fluid_volume_cm3 ({self.caliper.fluid_volume_m3 * 1e6:.1f} cm3)")
        if not (isinstance(self.rolling_radius_m, (int, float)) and math.isfinite(self.rolling_radius_m)
                and self.rolling_radius_m > 0):
            raise ScenarioError(f"[corners.{self.name}] rolling_radius_m must be a number > 0, got {shown(self.rolling_radius_m)}")
        self._check_parts_fit()

    def _check_parts_fit(self) -> None:
        """The geometry must fit together: pistons on their pad, pad on the swept ring, disc in the wheel."""
        where = f"corners.{self.name}"
        disc, pad, piston = self.disc, self.pad, self.piston
        ring_height_m = (disc.outer_diameter_m - disc.inner_diameter_m) / 2
        if max(piston.diameters_m) > ring_height_m * PISTON_OVERHANG_ALLOWED:
            raise ScenarioError(
                f"[{where}.piston] diameters_mm: a {max(piston.diameters_m) * 1e3:g} mm piston does not fit on the "
                f"{ring_height_m * 1e3:g} mm swept ring of the disc ((outer - inner diameter) / 2)")
        if piston.area_one_side_m2 > pad.area_m2:
            raise ScenarioError(
                f"[{where}.piston] the pistons of one side ({piston.area_one_side_m2 * 1e6:.0f} mm2) must fit on the pad "
                f"([{where}.pad] area_mm2 = {pad.area_m2 * 1e6:.0f})")
        swept_one_face_m2 = math.pi / 4 * (disc.outer_diameter_m ** 2 - disc.inner_diameter_m ** 2)
        if pad.area_m2 > swept_one_face_m2 / 2:
            raise ScenarioError(
                f"[{where}.pad] area_mm2 = {pad.area_m2 * 1e6:.0f} is more than half the swept ring of one disc face "
                f"({swept_one_face_m2 * 1e6:.0f} mm2)")
        if disc.outer_diameter_m / 2 >= self.rolling_radius_m:
            raise ScenarioError(
                f"[{where}.disc] outer_diameter_mm = {disc.outer_diameter_m * 1e3:g} does not fit inside a wheel of "
                f"rolling radius {self.rolling_radius_m * 1e3:g} mm ([car] rolling_radius_{self.axle}_mm)")

    def alignment_warnings(self) -> list[str]:
        """Warnings (not errors) from the trade's rules for how a pad sits on its disc.

        Common practice, no published source: the pad's outer edge within about 0.5 mm of the
        disc's outer edge (beyond it the pad overhangs and wears a step; inside it the disc keeps
        an unswept rim that grows into a lip), the pad's inner edge on the friction ring, and each
        piston no wider than the pad's radial height. Needs ``pad.radial_height_mm`` for all but
        the first.
        """
        where = f"corners.{self.name}.pad"
        pad, disc = self.pad, self.disc
        out = []
        offset = pad.outer_edge_offset_m
        if abs(offset) > PAD_EDGE_TOLERANCE_M:
            side = "overhangs the disc's outer edge" if offset > 0 else "stops short of the disc's outer edge"
            out.append(f"[{where}] outer_edge_offset_mm = {offset * 1e3:+.2f}: the pad {side} by more than "
                       f"{PAD_EDGE_TOLERANCE_M * 1e3:g} mm, which wears a step into the "
                       f"{'pad' if offset > 0 else 'disc'} (common practice, no published source)")
        if pad.radial_height_m > 0:
            inner_edge = disc.outer_diameter_m / 2 + offset - pad.radial_height_m
            if inner_edge < disc.inner_diameter_m / 2 - PAD_EDGE_TOLERANCE_M:
                out.append(f"[{where}] radial_height_mm = {pad.radial_height_m * 1e3:g}: the pad's inner edge sits "
                           f"{(disc.inner_diameter_m / 2 - inner_edge) * 1e3:.1f} mm inside the friction ring's inner "
                           f"diameter ({disc.inner_diameter_m * 1e3:g} mm) (common practice, no published source)")
            widest = max(self.piston.diameters_m)
            if widest > pad.radial_height_m:
                out.append(f"[{where}] a {widest * 1e3:g} mm piston is wider than the pad's radial height "
                           f"({pad.radial_height_m * 1e3:g} mm): it pushes past the friction material's edge")
        return out

    @property
    def fluid_at_pistons_volume_m3(self) -> float:
        """Fluid between the pistons of both sides and their bore bottoms: area x gap [m^3]."""
        return 2 * self.piston.area_one_side_m2 * self.caliper.piston_fluid_gap_m

    @property
    def effective_radius_m(self) -> float:
        """Mean radius of the swept ring, where the pad force acts [m]."""
        return (self.disc.outer_diameter_m + self.disc.inner_diameter_m) / 4
