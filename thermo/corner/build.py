"""Build the default brake-corner heat network from a CornerDesign.

Nodes (network names): disc (or disc_layer_1 ... disc_layer_N through each cheek), disc_bell,
pad (or pad_layer_1 ... pad_layer_M through the friction material of both pads), backing_plate,
piston (all pistons), fluid_at_piston (the fluid between the pistons and their bore bottoms,
the hottest wetted fluid), fluid (the rest of the fluid in the caliper), caliper, hub, bearing,
upright. Boundaries: ambient (wheel-well air) and duct_air (the first duct's air; further ducts
get duct_air_2, duct_air_3 ...).
Schedule signals the network reads: disc_heat_w, pad_heat_w [W] (their sum is the friction
heat; see ``thermo.corner.interface`` for how it is split), pad_clamp [0-1], vehicle_speed_m_s
[m/s], ambient_k and duct_air_k [K].

The wheel rim and tyre are not modelled: the disc radiates to "ambient" for the share of its
view that does not see the caliper.
"""
from __future__ import annotations

import functools
import math
import threading
import weakref
from dataclasses import dataclass, replace

import numpy as np

from thermo.corner import interface, paths
from thermo.corner import layers as layers_mod
from thermo.corner.geometry import CornerDesign
from thermo.corner.pad_terms import ROOM_K, pad_layer_link, pad_length_m, pad_sources, pad_terms, with_pad_thickness
from thermo.correlations.partition import effusivity, heat_partition_area_weighted
from thermo.correlations.radiation import (
    radiation_coefficient_grey_two_surface, radiation_coefficient_to_surroundings,
)
from thermo.correlations.validity import unchecked
from thermo.materials import get_material
from thermo.network import Boundary, Conduction, Convection, Network, Node, Radiation
from thermo.network.tabulate import ConductanceGrid, TabulatedConductance

SIGNAL_DISC_HEAT = "disc_heat_w"
SIGNAL_PAD_HEAT = "pad_heat_w"
SIGNAL_SPEED = "vehicle_speed_m_s"
SIGNAL_AMBIENT = "ambient_k"
SIGNAL_DUCT_AIR = "duct_air_k"
SIGNAL_CLAMP = "pad_clamp"
PAD_MAX_LAYERS = 6
HOLE_FLOW_COEFFICIENT = 0.5     # vent-hole air speed / local airflow speed; common practice, no published source
OUTPUT_NODES = ("disc", "pad", "piston", "fluid_at_piston", "fluid", "caliper", "upright", "bearing", "hub",
                "disc_bell", "backing_plate", "piston_seal")
# The piston seal sits in a groove of the caliper bore, against the piston wall: its temperature is
# taken as the mean of piston and caliper (common practice, no published source).
SEAL_WEIGHTS = {"piston": 0.5, "caliper": 0.5}


@dataclass(frozen=True)
class CornerModel:
    """A built corner: its network, how output nodes map onto network nodes, and what it used."""

    design: CornerDesign
    network: Network
    output_nodes: tuple[str, ...]
    output_weights: np.ndarray        # (n_outputs, n_network_nodes): output T = weights @ T_network
    disc_check_node: str              # 'disc_surface' when layered, else 'disc'
    heat_partition: float             # disc share of the friction heat (formula, or the user's fixed share)
    materials_used: tuple[str, ...]
    pad_nodes: tuple[str, ...] = ("pad",)   # network nodes of the friction material, face first
    fluid_check_node: str = "fluid_at_piston"
    disc_face_node: str = "disc"            # the network node at the friction face (disc_layer_1 when layered)

    def outputs(self, temperatures_k: np.ndarray) -> np.ndarray:
        """Output-node temperatures (n_t, n_outputs) from network temperatures (n_t, n_nodes) [K]."""
        return temperatures_k @ self.output_weights.T


def clamp_signal(friction_heat_w) -> np.ndarray:
    """The ``pad_clamp`` schedule signal: 1 where friction heat is made (brake applied), else 0."""
    return (np.asarray(friction_heat_w, dtype=float) > 0.0).astype(float)


def _diffusivity(material) -> float:
    return material.conductivity(ROOM_K) / (material.density_kg_m3 * material.specific_heat(ROOM_K))


def solid_layers(total_m: float, requested: int, material, max_layers: int = layers_mod.MAX_LAYERS) -> np.ndarray:
    """Layers through a heated solid, the first from the braking pulse's penetration depth
    (``thermo.corner.layers``): as many as needed (``requested`` 0) or exactly ``requested`` [m]."""
    if requested >= 1:
        return layers_mod.layers_of_count(total_m, layers_mod.first_layer_m(_diffusivity(material)), requested)
    return layers_mod.auto_layers(total_m, _diffusivity(material), max_layers)


def pad_first_layer_m(design: CornerDesign) -> float:
    """The first (face) layer of the pad's friction material, new or worn [m]."""
    return layers_mod.first_layer_m(_diffusivity(get_material(design.pad.material)))


def disc_layers(design: CornerDesign) -> np.ndarray:
    """Layer thicknesses through one cheek (vented) or half the thickness (solid disc) [m]."""
    d = design.disc
    half = d.cheek_thickness_m if d.vented else d.thickness_m / 2
    return solid_layers(half, d.layers, get_material(d.material))


def pad_layers(design: CornerDesign, thickness_m: float | None = None, count: int | None = None) -> np.ndarray:
    """Layer thicknesses through the friction material of a pad [m]; ``thickness_m`` and ``count``
    (the number of layers) if not the design's (a worn pad keeps its count)."""
    p = design.pad
    return solid_layers(p.thickness_m if thickness_m is None else thickness_m, p.layers if count is None else count,
                        get_material(p.material), PAD_MAX_LAYERS)


def duct_air_boundary(index: int) -> str:
    """Boundary of the air delivered by the corner's duct number index (0-based)."""
    return "duct_air" if index == 0 else f"duct_air_{index + 1}"


def duct_air_signals(design: CornerDesign) -> list[tuple[str, float]]:
    """(schedule signal, rise above ambient [K]) of each duct's air, in duct order.

    The first duct's air is signal ``duct_air_k`` (boundary ``duct_air``, present even without a
    duct); further ducts get ``duct_air_2_k``, ``duct_air_3_k`` ... each with its own ``air_rise_k``.
    """
    return [(SIGNAL_DUCT_AIR if i == 0 else f"duct_air_{i + 1}_k", duct.air_rise_k) for i, duct in enumerate(design.ducts)]


def materials_used(design: CornerDesign) -> tuple[str, ...]:
    """Names of the materials the corner's network is built from (an insert or shim of thickness 0 is none)."""
    d, p, pi_, hub = design.disc, design.pad, design.piston, design.hub
    names = {d.material, d.bell_material, p.material, p.backing_material, pi_.material, design.caliper.material,
             design.fluid_material, hub.hub_material, hub.bearing_material, hub.upright_material}
    if pi_.insert_thickness_m > 0:
        names.add(pi_.insert_material)
    if pi_.shim_thickness_m > 0:
        names.add(pi_.shim_material)
    return tuple(sorted(names))


def corner_materials(design: CornerDesign) -> dict:
    """The corner's materials by role: disc, bell, pad, backing, piston, caliper, fluid, hub,
    bearing, upright, insert, shim."""
    d, p, pi_, hub = design.disc, design.pad, design.piston, design.hub
    return {key: get_material(name) for key, name in {
        "disc": d.material, "bell": d.bell_material, "pad": p.material, "backing": p.backing_material,
        "piston": pi_.material, "caliper": design.caliper.material, "fluid": design.fluid_material,
        "hub": hub.hub_material, "bearing": hub.bearing_material, "upright": hub.upright_material,
        "insert": pi_.insert_material, "shim": pi_.shim_material}.items()}


def disc_face_resistance(design: CornerDesign, dx_disc: np.ndarray, disc_material) -> float:
    """Conduction resistance from the centre of the disc's face layer to its friction faces [K/W]."""
    return interface.half_layer_resistance(dx_disc[0], disc_material.conductivity(ROOM_K), 2 * design.disc.ring_area_m2)


def worn_corner(model: CornerModel, thickness_m: float) -> CornerModel | None:
    """``model`` with its pad worn (or renewed) to ``thickness_m``, the same number of layers: the
    model ``build_corner`` builds for that pad (``thermo.corner.pad_terms``), made from the one
    given without building the rest anew; None when the pads' edges move to another layer (then
    build the corner anew)."""
    design = model.design
    design = replace(design, pad=replace(design.pad, thickness_m=thickness_m, layers=len(model.pad_nodes)))
    mat = corner_materials(design)
    dx_disc = disc_layers(design)
    return with_pad_thickness(model, design, pad_layers(design), disc_face_resistance(design, dx_disc, mat["disc"]), mat,
                              (SIGNAL_DISC_HEAT, SIGNAL_PAD_HEAT))


def heat_partition(design: CornerDesign) -> float:
    """Disc share of the friction heat: the user's override or the area-weighted effusivity form."""
    if design.pad.partition_override is not None:
        return design.pad.partition_override
    disc, pad = get_material(design.disc.material), get_material(design.pad.material)
    e_disc = effusivity(disc.conductivity(ROOM_K), disc.density_kg_m3, disc.specific_heat(ROOM_K))
    e_pad = effusivity(pad.conductivity(ROOM_K), pad.density_kg_m3, pad.specific_heat(ROOM_K))
    return float(heat_partition_area_weighted(e_disc, e_pad, 2 * design.disc.ring_area_m2, 2 * design.pad.area_m2))


def _solid_conduction(name: str, a: str, b: str, g_room_w_k: float, group: str, material):
    """A conduction through a solid: fixed where the material gives one conductivity, else following
    its k(T) table (``paths.ConductivityRatio``, scaled by the conductance at 20 degC)."""
    if len(material.conductivity_table[0]) < 2:
        return Conduction(name, a, b, g_room_w_k, group)
    return Convection(name, a, b, None, paths.ConductivityRatio.of(material), group, scale=g_room_w_k)


def _series(*resistances_k_w):
    return 1.0 / sum(resistances_k_w)


TABLES_CACHED = 512     # tabulated conductances a process keeps cached at most (each table about 2 MB)
# table key -> a table some TabulatedConductance still holds; weak, so it keeps no table alive itself
_tables_by_value: weakref.WeakValueDictionary = weakref.WeakValueDictionary()
_tables_lock = threading.Lock()


@functools.lru_cache(maxsize=TABLES_CACHED)
def _tabulated(path, grid: ConductanceGrid) -> TabulatedConductance:
    """``path`` tabulated on ``grid``, cached per process at two levels, both by value.

    1. By the path itself (a frozen dataclass: equal by the values of its fields) and the grid, the
       ``TABLES_CACHED`` most recently used: an equal path gives the same ``TabulatedConductance``
       (a chain rebuilding a worn corner reuses it; a compiled network's stack of tables too).
    2. By the values the table depends on (``path.table_key(grid)`` where the path has one, else the
       path) and the grid: a path that differs only in what its table does not depend on (a duct's
       air temperature rise; another inlet area that leaves the vane passages the same pumped flow)
       gets a ``TabulatedConductance`` of its own (its exact function, for points off the grid and
       the validity check) holding the table already built: the same numbers, and the lanes of a
       study stack it once. This level refers to its tables weakly: it holds a table only while a
       tabulated conductance (cached above, or in a live network) does, so it adds no memory.

    ``forget_tables`` empties both.
    """
    with unchecked():
        # the grid spans corners of (speed, temperature) that a run may never reach; validity is
        # checked on the run's own states afterwards (thermo.chain.validity); unchecked in this
        # thread only, as corners may be solved side by side
        key = (path.table_key(grid) if hasattr(path, "table_key") else (path,), grid)
        with _tables_lock:
            table = _tables_by_value.get(key)
        if table is not None:
            return TabulatedConductance(path, grid, table)
        built = TabulatedConductance.build(path, grid)
    with _tables_lock:
        _tables_by_value[key] = built.table
    return built


def tables_cached() -> int:
    """How many tabulated conductances this process keeps cached [-]."""
    return _tabulated.cache_info().currsize


def forget_tables() -> None:
    """Empty both caches of tabulated conductances (``_tabulated``)."""
    _tabulated.cache_clear()
    with _tables_lock:
        _tables_by_value.clear()


def build_corner(design: CornerDesign, pressure_pa: float = 101325.0,
                 grid: ConductanceGrid | None = ConductanceGrid()) -> CornerModel:
    """The corner network for one CornerDesign at an ambient pressure [Pa].

    ``grid``: convective conductances are tabulated on it (``None``: evaluated exactly every call).
    """
    d, p, pi_, cal, hub, air_ = design.disc, design.pad, design.piston, design.caliper, design.hub, design.airflow
    mat = corner_materials(design)
    contact_mult = air_.contact_conductance_multiplier
    nodes, links = [], []

    # --- disc: one node, or graded layers through each cheek (symmetric: both faces heated alike)
    ring = d.ring_area_m2
    disc_face_area = 2 * ring
    k_disc = mat["disc"].conductivity(ROOM_K)
    dx_disc = disc_layers(design)
    if len(dx_disc) == 1:
        disc_nodes = ["disc"]
        disc_masses = [d.metal_volume_m3 * mat["disc"].density_kg_m3]
    else:
        disc_nodes = [f"disc_layer_{i + 1}" for i in range(len(dx_disc))]
        disc_masses = list(disc_face_area * dx_disc * mat["disc"].density_kg_m3)
        disc_masses[-1] += d.vane_volume_m3 * mat["disc"].density_kg_m3
        for i in range(len(dx_disc) - 1):
            g = k_disc * disc_face_area / (dx_disc[i] / 2 + dx_disc[i + 1] / 2)
            links.append(_solid_conduction(f"{disc_nodes[i]}_to_{disc_nodes[i + 1]}", disc_nodes[i], disc_nodes[i + 1], g,
                                           "disc_internal", mat["disc"]))
    for name, mass in zip(disc_nodes, disc_masses):
        nodes.append(Node(name, mat["disc"].heat_capacity(mass)))
    surface, core = disc_nodes[0], disc_nodes[-1]

    # --- pad: one node, or graded layers from the friction face to the backing plate; every value
    # that follows from the pad's thickness comes from pad_terms (a pad that wears takes the same)
    pad_area2 = 2 * p.area_m2
    dx_pad = pad_layers(design)
    pad = pad_terms(design, dx_pad, mat, disc_face_resistance(design, dx_disc, mat["disc"]))
    pad_nodes = ["pad"] if len(dx_pad) == 1 else [f"pad_layer_{i + 1}" for i in range(len(dx_pad))]
    pad_masses = pad.masses_kg
    for name, mass in zip(pad_nodes, pad_masses):
        nodes.append(Node(name, mat["pad"].heat_capacity(mass)))
    for i, g in enumerate(pad.between_layers_w_k):
        links.append(_solid_conduction(pad_layer_link(pad_nodes, i), pad_nodes[i], pad_nodes[i + 1], g,
                                       "pad_conduction", mat["pad"]))
    pad_face, pad_back = pad_nodes[0], pad_nodes[-1]

    gap_volume = design.fluid_at_pistons_volume_m3
    fluid_density = mat["fluid"].density_kg_m3
    nodes += [
        Node("disc_bell", mat["bell"].heat_capacity(d.bell_mass_kg)),
        Node("backing_plate", mat["backing"].heat_capacity(pad_area2 * p.backing_thickness_m * mat["backing"].density_kg_m3)),
        Node("piston", mat["piston"].heat_capacity(pi_.metal_volume_m3 * mat["piston"].density_kg_m3)),
        Node("fluid_at_piston", mat["fluid"].heat_capacity(gap_volume * fluid_density)),
        Node("fluid", mat["fluid"].heat_capacity((cal.fluid_volume_m3 - gap_volume) * fluid_density)),
        Node("caliper", mat["caliper"].heat_capacity(cal.mass_kg)),
        Node("hub", mat["hub"].heat_capacity(hub.hub_mass_kg)),
        Node("bearing", mat["bearing"].heat_capacity(hub.bearing_mass_kg)),
        Node("upright", mat["upright"].heat_capacity(hub.upright_mass_kg)),
    ]
    boundaries = (Boundary("ambient", SIGNAL_AMBIENT), Boundary("duct_air", SIGNAL_DUCT_AIR)) + tuple(
        Boundary(duct_air_boundary(i), signal) for i, (signal, _) in enumerate(duct_air_signals(design)) if i > 0)

    # --- conduction: pad -> backing plate -> (shim, insert, crown contact) -> piston -> fluid -> caliper
    r_backing_half = (p.backing_thickness_m / 2) / (mat["backing"].conductivity(ROOM_K) * pad_area2)
    links.append(Conduction("pad_to_backing_plate", pad_back, "backing_plate", pad.to_backing_w_k, "pad_conduction"))

    n_pistons = 2 * pi_.count_per_side
    face_area = 2 * pi_.area_one_side_m2
    contact_area = pi_.crown_contact_fraction * face_area
    resistances = [r_backing_half, 1.0 / (contact_mult * pi_.contact_conductance_w_m2k * contact_area),
                   pi_.crown_thickness_m / (mat["piston"].conductivity(ROOM_K) * face_area)]
    if pi_.shim_thickness_m > 0:
        resistances += [pi_.shim_thickness_m / (mat["shim"].conductivity(ROOM_K) * face_area),
                        1.0 / (contact_mult * pi_.contact_conductance_w_m2k * face_area)]
    if pi_.insert_thickness_m > 0:
        resistances.append(pi_.insert_thickness_m / (mat["insert"].conductivity(ROOM_K) * contact_area))
    links.append(Conduction("backing_plate_to_piston", "backing_plate", "piston", _series(*resistances), "piston_path"))
    # the fluid behind each piston: conduction across half the gap to the piston's back face and
    # half to the bore bottom (stagnant fluid); it meets the rest of the fluid only round its rim
    # (bore circumference x gap, where the feed drillings join), through the fluid film
    g_gap = mat["fluid"].conductivity(ROOM_K) * face_area / (cal.piston_fluid_gap_m / 2)
    rim_area = 2 * sum(math.pi * dia for dia in pi_.diameters_m) * cal.piston_fluid_gap_m
    links += [
        Conduction("piston_to_fluid_at_piston", "piston", "fluid_at_piston", g_gap, "piston_path"),
        Conduction("fluid_at_piston_to_caliper", "fluid_at_piston", "caliper", g_gap, "fluid_path"),
        Conduction("fluid_at_piston_to_fluid", "fluid_at_piston", "fluid", cal.fluid_film_conductance_w_m2k * rim_area, "fluid_path"),
    ]
    seal_area = sum(math.pi * dia * pi_.height_m / 2 for dia in pi_.diameters_m) * 2
    links.append(Conduction("piston_to_caliper", "piston", "caliper", contact_mult * pi_.seal_gap_conductance_w_m2k * seal_area, "piston_path"))
    links.append(Conduction("fluid_to_caliper", "fluid", "caliper", cal.fluid_film_conductance_w_m2k * cal.fluid_wetted_area_m2, "fluid_path"))

    # --- disc -> bell -> hub -> bearing -> upright; caliper -> upright
    links += [
        Conduction("disc_to_bell", core, "disc_bell", contact_mult * hub.disc_to_bell_w_k, "hub_path"),
        Conduction("bell_to_hub", "disc_bell", "hub", contact_mult * hub.bell_to_hub_w_k, "hub_path"),
        Conduction("hub_to_bearing", "hub", "bearing", contact_mult * hub.hub_to_bearing_w_k, "hub_path"),
        Conduction("bearing_to_upright", "bearing", "upright", contact_mult * hub.bearing_to_upright_w_k, "hub_path"),
        Conduction("caliper_to_upright", "caliper", "upright", contact_mult * cal.mount_conductance_w_k, "caliper_mount"),
    ]

    # --- convection (all to the wheel-well air unless ducted)
    factor = air_.local_airflow_factor
    disc_ducts = [dt for dt in design.ducts if dt.target == "disc_eye"]
    # a path whose conductance is proportional to its multiplier (the faces, the plates) carries the
    # multiplier as the link's scale, so that corners differing only in multipliers share one table
    links.append(Convection("disc_face_convection", surface, "ambient", SIGNAL_SPEED, paths.RotatingDiscFaces(
        disc_face_area, d.outer_diameter_m / 2, design.rolling_radius_m, factor, 1.0, pressure_pa, d.face_correlation),
        "disc_convection", scale=air_.disc_convection_multiplier))
    passages = None
    if d.vented:
        passages = paths.VanePassages(
            d.passage_wetted_area_m2, d.passage_flow_area_m2, d.passage_hydraulic_diameter_m, d.passage_length_m,
            d.outer_diameter_m / 2, design.rolling_radius_m, d.vane_pumping_coefficient,
            air_.vane_convection_multiplier, pressure_pa, ducted=disc_ducts[0] if disc_ducts else None)
        links.append(Convection("disc_vane_convection", core, "ambient", SIGNAL_SPEED, passages, "disc_convection"))
    for i, duct in enumerate(design.ducts):
        tag = f"duct_{i + 1}_{duct.target}"
        mult = air_.duct_effectiveness_multiplier
        if duct.target == "disc_eye" and passages is not None:
            fn = paths.DuctToDiscEye(duct, passages, mult, pressure_pa)
            node = core
        elif duct.target in ("disc_eye", "disc_face"):
            fn = paths.DuctJetOnSurface(duct, duct.face_area_share * disc_face_area, d.outer_diameter_m - d.inner_diameter_m, mult, pressure_pa)
            node = surface
        else:
            fn = paths.DuctJetOnSurface(duct, duct.face_area_share * cal.area_m2, math.sqrt(cal.area_m2), mult, pressure_pa)
            node = "caliper"
        links.append(Convection(tag, node, duct_air_boundary(i), SIGNAL_SPEED, fn, "duct"))

    def plate(area, length=None):
        return paths.PlateInAirflow(area, math.sqrt(area) if length is None else length, factor, 1.0, pressure_pa)

    hub_mult, caliper_mult = air_.hub_convection_multiplier, air_.caliper_convection_multiplier
    links += [
        Convection("bell_convection", "disc_bell", "ambient", SIGNAL_SPEED, plate(d.bell_area_m2), "hub_convection", scale=hub_mult),
        Convection("backing_plate_convection", "backing_plate", "ambient", SIGNAL_SPEED, plate(pad_area2), "caliper_convection",
                   scale=caliper_mult),
        Convection("caliper_convection", "caliper", "ambient", SIGNAL_SPEED, plate(cal.area_m2), "caliper_convection",
                   scale=caliper_mult),
        Convection("hub_convection", "hub", "ambient", SIGNAL_SPEED, plate(hub.hub_area_m2), "hub_convection", scale=hub_mult),
        Convection("upright_convection", "upright", "ambient", SIGNAL_SPEED, plate(hub.upright_area_m2), "upright_convection",
                   scale=hub_mult),
    ]
    # the pads' edges (perimeter x thickness of each pad) in the wheel-well air, from the layer at
    # mid-thickness (the edges carry about 1 % of the corner's heat: one node stands for them all)
    pad_mid = pad_nodes[pad.mid_layer]
    edge_per_m2 = plate(1.0, pad_length_m(p.area_m2))  # one table, scaled by the edge area and the multiplier
    links.append(Convection("pad_edge_convection", pad_mid, "ambient", SIGNAL_SPEED, edge_per_m2, "pad_convection",
                            scale=pad.edge_convection_scale))
    if pi_.piston_type == "vented":
        inner = sum(math.pi / 4 * (dia - 2 * pi_.wall_thickness_m) ** 2 for dia in pi_.diameters_m) * 2
        links.append(Convection("piston_vent_convection", "piston", "ambient", SIGNAL_SPEED, paths.PistonVentHoles(
            pi_.vent_hole_count * n_pistons, pi_.vent_hole_diameter_m, pi_.wall_thickness_m, inner, factor,
            HOLE_FLOW_COEFFICIENT, air_.caliper_convection_multiplier, pressure_pa), "piston_vents"))

    # --- the pad-disc interface (thermo.corner.interface): the friction heat split by the two
    # bodies' resistances to the interface, plus their exchange while clamped and while resting
    sources = pad_sources(surface, pad_face, pad.direct_disc_share, (SIGNAL_DISC_HEAT, SIGNAL_PAD_HEAT))
    links.append(Conduction("pad_disc_interface", pad_face, surface, pad.rest_w_k, "pad_interface"))
    if pad.direct_disc_share is not None:
        # resting contact always, and the rest of the clamped conductance in proportion to the clamp:
        # G = G_rest + (G_applied - G_rest) clamp, as two links so that the tabulated part holds no
        # geometry (a pad rebuilt as it wears reuses the same table)
        links.append(Convection("pad_disc_interface_clamped", pad_face, surface, SIGNAL_CLAMP,
                                interface.ClampShare(), "pad_interface", scale=pad.clamped_extra_w_k))

    # --- radiation: disc to caliper (view factor) and to the surroundings; caliper, upright, bell,
    # backing plate and pad edges out
    eps_disc = d.emissivity_override if d.emissivity_override is not None else mat["disc"].emissivity
    eps_cal = cal.emissivity_override if cal.emissivity_override is not None else mat["caliper"].emissivity
    disc_rad_area = d.radiating_area_m2
    view = cal.view_factor_from_disc
    links += [
        Radiation("disc_to_caliper_radiation", surface, "caliper", radiation_coefficient_grey_two_surface(
            eps_disc, eps_cal, disc_rad_area, cal.area_m2, view), "radiation"),
        Radiation("disc_radiation", surface, "ambient", radiation_coefficient_to_surroundings(eps_disc, disc_rad_area * (1 - view)), "radiation"),
        Radiation("caliper_radiation", "caliper", "ambient", radiation_coefficient_to_surroundings(eps_cal, cal.area_m2), "radiation"),
        Radiation("upright_radiation", "upright", "ambient", radiation_coefficient_to_surroundings(mat["upright"].emissivity, hub.upright_area_m2), "radiation"),
        Radiation("bell_radiation", "disc_bell", "ambient", radiation_coefficient_to_surroundings(mat["bell"].emissivity, d.bell_area_m2), "radiation"),
        Radiation("backing_plate_radiation", "backing_plate", "ambient",
                  radiation_coefficient_to_surroundings(mat["backing"].emissivity, pad_area2), "radiation"),
    ]
    links.append(Radiation("pad_edge_radiation", pad_mid, "ambient", pad.edge_radiation_w_k4, "radiation"))

    if grid is not None:
        links = [replace(link, conductance=_tabulated(link.conductance, grid)) if isinstance(link, Convection) else link
                 for link in links]
    network = Network(tuple(nodes), boundaries, tuple(links), tuple(sources))

    names = network.node_names
    outputs = (["disc"] + ([] if len(disc_nodes) == 1 else ["disc_surface"]) + ["pad"]
               + ([] if len(pad_nodes) == 1 else ["pad_surface"]) + list(OUTPUT_NODES[2:]))
    weights = np.zeros((len(outputs), len(names)))

    def mean_of(row, members, masses):
        for node, m in zip(members, masses):
            weights[row, names.index(node)] = m / np.sum(masses)

    def face_of(row, members, dx):
        w1, w2 = layers_mod.face_extrapolation(dx)
        weights[row, names.index(members[0])] = w1
        if len(members) > 1:
            weights[row, names.index(members[1])] = w2

    for row, out in enumerate(outputs):
        if out == "disc":
            mean_of(row, disc_nodes, disc_masses)
        elif out == "disc_surface":
            face_of(row, disc_nodes, dx_disc)
        elif out == "pad":
            mean_of(row, pad_nodes, pad_masses)
        elif out == "pad_surface":
            face_of(row, pad_nodes, dx_pad)
        elif out == "piston_seal":
            for node, w in SEAL_WEIGHTS.items():
                weights[row, names.index(node)] = w
        else:
            weights[row, names.index(out)] = 1.0
    used = materials_used(design)
    return CornerModel(design, network, tuple(outputs), weights, "disc_surface" if len(disc_nodes) > 1 else "disc",
                       heat_partition(design), used, tuple(pad_nodes), "fluid_at_piston", surface)
