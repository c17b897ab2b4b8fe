"""Build the default brake-corner heat network from a CornerDesign.

Nodes (network names): disc (or disc_layer_1 ... disc_layer_N through each cheek), disc_bell,
pad (both pads), backing_plate, piston (all pistons), fluid (the fluid in the caliper), caliper,
hub, bearing, upright. Boundaries: ambient (wheel-well air) and duct_air (the first duct's air;
further ducts get duct_air_2, duct_air_3 ...).
Schedule signals the network reads: disc_heat_w, pad_heat_w [W], vehicle_speed_m_s [m/s],
ambient_k and duct_air_k [K].

The wheel rim and tyre are not modelled: the disc radiates to "ambient" for the share of its
view that does not see the caliper.
"""
from __future__ import annotations

import functools
import math
import warnings
from dataclasses import dataclass, replace

import numpy as np

from lapdata.units import STEFAN_BOLTZMANN
from thermo.corner import paths
from thermo.corner.geometry import CornerDesign
from thermo.correlations.partition import effusivity, heat_partition_area_weighted
from thermo.correlations.radiation import (
    radiation_coefficient_grey_two_surface, radiation_coefficient_to_surroundings,
)
from thermo.materials import get_material
from thermo.network import Boundary, Conduction, Convection, HeatSource, Network, Node, Radiation
from thermo.network.tabulate import ConductanceGrid, TabulatedConductance

SIGNAL_DISC_HEAT = "disc_heat_w"
SIGNAL_PAD_HEAT = "pad_heat_w"
SIGNAL_SPEED = "vehicle_speed_m_s"
SIGNAL_AMBIENT = "ambient_k"
SIGNAL_DUCT_AIR = "duct_air_k"
ROOM_K = 293.15
LAYER_GROWTH = 1.8              # each disc layer this much thicker than the one nearer the surface
HOLE_FLOW_COEFFICIENT = 0.5     # vent-hole air speed / local airflow speed; common practice, no published source
OUTPUT_NODES = ("disc", "pad", "piston", "fluid", "caliper", "upright", "bearing", "hub",
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
    heat_partition: float             # disc share of the friction heat
    materials_used: tuple[str, ...]

    def outputs(self, temperatures_k: np.ndarray) -> np.ndarray:
        """Output-node temperatures (n_t, n_outputs) from network temperatures (n_t, n_nodes) [K]."""
        return temperatures_k @ self.output_weights.T


def layer_thicknesses(total_m: float, layers: int, growth: float = LAYER_GROWTH) -> np.ndarray:
    """Graded layer thicknesses from the friction face inwards, summing to total_m [m]."""
    weights = growth ** np.arange(layers)
    return total_m * weights / weights.sum()


def duct_air_boundary(index: int) -> str:
    """Boundary of the air delivered by the corner's duct number index (0-based)."""
    return "duct_air" if index == 0 else f"duct_air_{index + 1}"


def duct_air_signals(design: CornerDesign) -> list[tuple[str, float]]:
    """(schedule signal, rise above ambient [K]) of each duct's air, in duct order.

    The first duct's air is signal ``duct_air_k`` (boundary ``duct_air``, present even without a
    duct); further ducts get ``duct_air_2_k``, ``duct_air_3_k`` ... each with its own ``air_rise_k``.
    """
    return [(SIGNAL_DUCT_AIR if i == 0 else f"duct_air_{i + 1}_k", duct.air_rise_k) for i, duct in enumerate(design.ducts)]


def heat_partition(design: CornerDesign) -> float:
    """Disc share of the friction heat: the user's override or the area-weighted effusivity form."""
    if design.pad.partition_override is not None:
        return design.pad.partition_override
    disc, pad = get_material(design.disc.material), get_material(design.pad.material)
    e_disc = effusivity(disc.conductivity(ROOM_K), disc.density_kg_m3, disc.specific_heat(ROOM_K))
    e_pad = effusivity(pad.conductivity(ROOM_K), pad.density_kg_m3, pad.specific_heat(ROOM_K))
    return float(heat_partition_area_weighted(e_disc, e_pad, 2 * design.disc.ring_area_m2, 2 * design.pad.area_m2))


def _series(*resistances_k_w):
    return 1.0 / sum(resistances_k_w)


@functools.lru_cache(maxsize=512)
def _tabulated(path, grid: ConductanceGrid) -> TabulatedConductance:
    with warnings.catch_warnings():
        # the grid spans corners of (speed, temperature) that a run may never reach; validity is
        # checked on the run's own states afterwards (thermo.chain.validity)
        warnings.simplefilter("ignore")
        return TabulatedConductance.build(path, grid)


def build_corner(design: CornerDesign, pressure_pa: float = 101325.0,
                 grid: ConductanceGrid | None = ConductanceGrid()) -> CornerModel:
    """The corner network for one CornerDesign at an ambient pressure [Pa].

    ``grid``: convective conductances are tabulated on it (``None``: evaluated exactly every call).
    """
    d, p, pi_, cal, hub, air_ = design.disc, design.pad, design.piston, design.caliper, design.hub, design.airflow
    mat = {key: get_material(name) for key, name in {
        "disc": d.material, "bell": d.bell_material, "pad": p.material, "backing": p.backing_material,
        "piston": pi_.material, "caliper": cal.material, "fluid": design.fluid_material, "hub": hub.hub_material,
        "bearing": hub.bearing_material, "upright": hub.upright_material,
        "insert": pi_.insert_material, "shim": pi_.shim_material}.items()}
    contact_mult = air_.contact_conductance_multiplier
    nodes, links = [], []

    # --- disc: one node, or graded layers through each cheek (symmetric: both faces heated alike)
    ring = d.ring_area_m2
    solid_half = d.cheek_thickness_m if d.vented else d.thickness_m / 2
    if d.layers == 1:
        disc_nodes = ["disc"]
        disc_masses = [d.metal_volume_m3 * mat["disc"].density_kg_m3]
    else:
        dx = layer_thicknesses(solid_half, d.layers)
        disc_nodes = [f"disc_layer_{i + 1}" for i in range(d.layers)]
        disc_masses = list(2 * ring * dx * mat["disc"].density_kg_m3)
        disc_masses[-1] += d.vane_volume_m3 * mat["disc"].density_kg_m3
        k_disc = mat["disc"].conductivity(ROOM_K)
        for i in range(d.layers - 1):
            g = k_disc * 2 * ring / (dx[i] / 2 + dx[i + 1] / 2)
            links.append(Conduction(f"{disc_nodes[i]}_to_{disc_nodes[i + 1]}", disc_nodes[i], disc_nodes[i + 1], g, "disc_internal"))
    for name, mass in zip(disc_nodes, disc_masses):
        nodes.append(Node(name, mat["disc"].heat_capacity(mass)))
    surface, core = disc_nodes[0], disc_nodes[-1]

    nodes += [
        Node("disc_bell", mat["bell"].heat_capacity(d.bell_mass_kg)),
        Node("pad", mat["pad"].heat_capacity(2 * p.area_m2 * p.thickness_m * mat["pad"].density_kg_m3)),
        Node("backing_plate", mat["backing"].heat_capacity(2 * p.area_m2 * p.backing_thickness_m * mat["backing"].density_kg_m3)),
        Node("piston", mat["piston"].heat_capacity(pi_.metal_volume_m3 * mat["piston"].density_kg_m3)),
        Node("fluid", mat["fluid"].heat_capacity(cal.fluid_volume_m3 * mat["fluid"].density_kg_m3)),
        Node("caliper", mat["caliper"].heat_capacity(cal.mass_kg)),
        Node("hub", mat["hub"].heat_capacity(hub.hub_mass_kg)),
        Node("bearing", mat["bearing"].heat_capacity(hub.bearing_mass_kg)),
        Node("upright", mat["upright"].heat_capacity(hub.upright_mass_kg)),
    ]
    boundaries = (Boundary("ambient", SIGNAL_AMBIENT), Boundary("duct_air", SIGNAL_DUCT_AIR)) + tuple(
        Boundary(duct_air_boundary(i), signal) for i, (signal, _) in enumerate(duct_air_signals(design)) if i > 0)

    # --- conduction: pad -> backing plate -> (shim, insert, crown contact) -> piston -> fluid -> caliper
    pad_area2 = 2 * p.area_m2
    r_pad = (p.thickness_m / 2) / (mat["pad"].conductivity(ROOM_K) * pad_area2)
    r_backing_half = (p.backing_thickness_m / 2) / (mat["backing"].conductivity(ROOM_K) * pad_area2)
    links.append(Conduction("pad_to_backing_plate", "pad", "backing_plate", _series(r_pad, r_backing_half), "pad_conduction"))

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
    links.append(Conduction("piston_to_fluid", "piston", "fluid", cal.fluid_film_conductance_w_m2k * face_area, "piston_path"))
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
    links.append(Convection("disc_face_convection", surface, "ambient", SIGNAL_SPEED, paths.RotatingDiscFaces(
        2 * ring, d.outer_diameter_m / 2, design.rolling_radius_m, factor, air_.disc_convection_multiplier, pressure_pa,
        d.face_correlation),
        "disc_convection"))
    passages = None
    if d.vented:
        passages = paths.VanePassages(
            d.passage_wetted_area_m2, d.passage_flow_area_m2, d.passage_hydraulic_diameter_m, d.passage_length_m,
            d.outer_diameter_m / 2, design.rolling_radius_m, d.vane_pumping_coefficient,
            air_.disc_convection_multiplier, pressure_pa, ducted=disc_ducts[0] if disc_ducts else None)
        links.append(Convection("disc_vane_convection", core, "ambient", SIGNAL_SPEED, passages, "disc_convection"))
    for i, duct in enumerate(design.ducts):
        tag = f"duct_{i + 1}_{duct.target}"
        mult = air_.duct_effectiveness_multiplier
        if duct.target == "disc_eye" and passages is not None:
            fn = paths.DuctToDiscEye(duct, passages, mult, pressure_pa)
            node = core
        elif duct.target in ("disc_eye", "disc_face"):
            fn = paths.DuctJetOnSurface(duct, duct.face_area_share * 2 * ring, d.outer_diameter_m - d.inner_diameter_m, mult, pressure_pa)
            node = surface
        else:
            fn = paths.DuctJetOnSurface(duct, duct.face_area_share * cal.area_m2, math.sqrt(cal.area_m2), mult, pressure_pa)
            node = "caliper"
        links.append(Convection(tag, node, duct_air_boundary(i), SIGNAL_SPEED, fn, "duct"))

    def plate(area, mult):
        return paths.PlateInAirflow(area, math.sqrt(area), factor, mult, pressure_pa)

    links += [
        Convection("bell_convection", "disc_bell", "ambient", SIGNAL_SPEED, plate(d.bell_area_m2, air_.hub_convection_multiplier), "hub_convection"),
        Convection("backing_plate_convection", "backing_plate", "ambient", SIGNAL_SPEED, plate(pad_area2, air_.caliper_convection_multiplier), "caliper_convection"),
        Convection("caliper_convection", "caliper", "ambient", SIGNAL_SPEED, plate(cal.area_m2, air_.caliper_convection_multiplier), "caliper_convection"),
        Convection("hub_convection", "hub", "ambient", SIGNAL_SPEED, plate(hub.hub_area_m2, air_.hub_convection_multiplier), "hub_convection"),
        Convection("upright_convection", "upright", "ambient", SIGNAL_SPEED, plate(hub.upright_area_m2, air_.hub_convection_multiplier), "upright_convection"),
    ]
    if pi_.piston_type == "vented":
        inner = sum(math.pi / 4 * (dia - 2 * pi_.wall_thickness_m) ** 2 for dia in pi_.diameters_m) * 2
        links.append(Convection("piston_vent_convection", "piston", "ambient", SIGNAL_SPEED, paths.PistonVentHoles(
            pi_.vent_hole_count * n_pistons, pi_.vent_hole_diameter_m, pi_.wall_thickness_m, inner, factor,
            HOLE_FLOW_COEFFICIENT, air_.caliper_convection_multiplier, pressure_pa), "piston_vents"))

    # --- radiation: disc to caliper (view factor) and to the surroundings; caliper, upright, bell out
    eps_disc = d.emissivity_override if d.emissivity_override is not None else mat["disc"].emissivity
    eps_cal = cal.emissivity_override if cal.emissivity_override is not None else mat["caliper"].emissivity
    disc_rad_area = 2 * ring + math.pi * d.outer_diameter_m * d.thickness_m
    view = cal.view_factor_from_disc
    links += [
        Radiation("disc_to_caliper_radiation", surface, "caliper", radiation_coefficient_grey_two_surface(
            eps_disc, eps_cal, disc_rad_area, cal.area_m2, view), "radiation"),
        Radiation("disc_radiation", surface, "ambient", radiation_coefficient_to_surroundings(eps_disc, disc_rad_area * (1 - view)), "radiation"),
        Radiation("caliper_radiation", "caliper", "ambient", radiation_coefficient_to_surroundings(eps_cal, cal.area_m2), "radiation"),
        Radiation("upright_radiation", "upright", "ambient", radiation_coefficient_to_surroundings(mat["upright"].emissivity, hub.upright_area_m2), "radiation"),
        Radiation("bell_radiation", "disc_bell", "ambient", radiation_coefficient_to_surroundings(mat["bell"].emissivity, d.bell_area_m2), "radiation"),
    ]

    if grid is not None:
        links = [replace(link, conductance=_tabulated(link.conductance, grid)) if isinstance(link, Convection) else link
                 for link in links]
    gamma = heat_partition(design)
    sources = [HeatSource(surface, SIGNAL_DISC_HEAT, 1.0), HeatSource("pad", SIGNAL_PAD_HEAT, 1.0)]
    network = Network(tuple(nodes), boundaries, tuple(links), tuple(sources))

    names = network.node_names
    outputs = ["disc"] + ([] if d.layers == 1 else ["disc_surface"]) + [n for n in OUTPUT_NODES[1:]]
    weights = np.zeros((len(outputs), len(names)))
    masses = np.array(disc_masses)
    for row, out in enumerate(outputs):
        if out == "disc":
            for node, m in zip(disc_nodes, masses):
                weights[row, names.index(node)] = m / masses.sum()
        elif out == "disc_surface":
            weights[row, names.index(surface)] = 1.0
        elif out == "piston_seal":
            for node, w in SEAL_WEIGHTS.items():
                weights[row, names.index(node)] = w
        else:
            weights[row, names.index(out)] = 1.0
    used = tuple(sorted({m.name for key, m in mat.items()
                         if not (key == "insert" and pi_.insert_thickness_m == 0) and not (key == "shim" and pi_.shim_thickness_m == 0)}))
    return CornerModel(design, network, tuple(outputs), weights, "disc_surface" if d.layers > 1 else "disc", gamma, used)
