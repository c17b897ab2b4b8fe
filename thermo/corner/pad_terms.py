"""What of a corner's network depends on its pad's thickness, worked out in one place.

``build_corner`` takes the pad's values from ``pad_terms``; a pad that wears lap by lap
(``with_pad_thickness``) takes the same values at its new thickness and puts them into the
corner it already has: the pad layers' masses and the conduction between them, the pad to
backing plate conduction, the pads' edge area (convection and radiation), the pad-disc
interface (resting and clamped conductance, and the share of the friction heat each side takes
straight away) and the output weights of the pad's mean and face. Nothing else of a corner
changes with the pad's thickness, so the result is the corner ``build_corner`` would build for
the worn design, at a small part of the cost (a run wears its pads every lap).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from thermo.corner.interface import applied_conductance, half_layer_resistance, interface_disc_share, rest_conductance
from thermo.corner import layers as layers_mod
from thermo.correlations.radiation import radiation_coefficient_to_surroundings
from thermo.network import Convection, HeatSource

ROOM_K = 293.15                 # 20 degC: the temperature the conductivities of fixed conductances are read at
PAD_ASPECT_RATIO = 3.0          # pad length / radial height, for its edge area; common practice, no published source


@dataclass(frozen=True)
class PadTerms:
    """The values of a corner's network that follow from its pad's thickness.

    Attributes
    ----------
    layers_m : numpy.ndarray
        Thickness of each friction-material layer, face first [m]
    masses_kg : numpy.ndarray
        Mass of each layer, both pads [kg]
    between_layers_w_k : numpy.ndarray
        Conduction between neighbouring layers at 20 degC, one fewer than the layers [W/K]
    to_backing_w_k : float
        Conduction from the last layer's centre to the backing plate's centre [W/K]
    edge_area_m2 : float
        The pads' edges in the wheel-well air (perimeter x thickness, both pads) [m^2]
    edge_convection_scale : float
        Scale of the edges' convection table (per m^2, multiplier 1): the edge area times the
        caliper convection multiplier [m^2]
    edge_radiation_w_k4 : float
        Radiation coefficient of the edges to the surroundings [W/K^4]
    mid_layer : int
        Index of the layer at mid-thickness, which the edges exchange heat from [-]
    rest_w_k : float
        Pad-disc interface conductance while the pad rests on the disc [W/K]
    clamped_extra_w_k : float
        Further interface conductance while clamped, G_applied - G_rest [W/K]
    direct_disc_share : float or None
        Share of the friction heat the disc's face layer takes straight away (None: the user's
        fixed heat partition, which does not depend on the pad) [-]
    """

    layers_m: np.ndarray
    masses_kg: np.ndarray
    between_layers_w_k: np.ndarray
    to_backing_w_k: float
    edge_area_m2: float
    edge_convection_scale: float
    edge_radiation_w_k4: float
    mid_layer: int
    rest_w_k: float
    clamped_extra_w_k: float
    direct_disc_share: float | None


def pad_terms(design, layers_m: np.ndarray, mat: dict, disc_face_resistance_k_w: float,
              thickness_m: float | None = None) -> PadTerms:
    """The pad-dependent values of a corner (``PadTerms``).

    Parameters
    ----------
    design : CornerDesign
        The corner, its pad at the thickness wanted
    layers_m : numpy.ndarray
        The pad's layers (``build.pad_layers``) [m]
    mat : dict
        The corner's materials by role ("pad", "backing", ...), as ``build_corner`` holds them [-]
    disc_face_resistance_k_w : float
        Conduction resistance from the disc's face layer centre to its face [K/W]
    thickness_m : float or None
        The pad's thickness, if not the design's (a worn pad) [m]
    """
    p = design.pad
    thickness = p.thickness_m if thickness_m is None else float(thickness_m)
    constants = pad_constants(design, mat, disc_face_resistance_k_w)
    (masses, between, to_backing, edge_area, edge_convection, edge_radiation, mid, rest, clamped_extra,
     direct) = pad_values(np.asarray(layers_m, dtype=float), thickness, *constants)
    return PadTerms(
        layers_m=np.asarray(layers_m, dtype=float), masses_kg=masses, between_layers_w_k=between,
        to_backing_w_k=to_backing, edge_area_m2=edge_area, edge_convection_scale=edge_convection,
        edge_radiation_w_k4=edge_radiation, mid_layer=mid, rest_w_k=rest, clamped_extra_w_k=clamped_extra,
        direct_disc_share=None if p.partition_override is not None else direct)


def pad_constants(design, mat: dict, disc_face_resistance_k_w: float) -> tuple:
    """What ``pad_values`` takes of a corner besides its pad's layers and thickness (nothing of it
    changes as the pad wears): (area of both pads [m^2], the pad's conductivity at 20 degC [W/(m K)],
    its density [kg/m^3], half the backing plate's conduction resistance [K/W], half the pads'
    perimeter [m], the contact conductance at rest [W/(m^2 K)], the disc face's resistance [K/W],
    the caliper convection multiplier [-], emissivity times the Stefan-Boltzmann constant
    [W/(m^2 K^4)]), in that order."""
    p = design.pad
    area2 = 2 * p.area_m2
    length = pad_length_m(p.area_m2)
    return (area2, mat["pad"].conductivity(ROOM_K), mat["pad"].density_kg_m3,
            (p.backing_thickness_m / 2) / (mat["backing"].conductivity(ROOM_K) * area2),
            length + p.area_m2 / length,
            design.airflow.contact_conductance_multiplier * p.rest_contact_conductance_w_m2k,
            disc_face_resistance_k_w, design.airflow.caliper_convection_multiplier,
            radiation_coefficient_to_surroundings(mat["pad"].emissivity, 1.0))


def pad_values(dx, thickness, area2, k_pad, density, r_backing_half, half_perimeter, contact, r_disc_face,
               caliper_multiplier, emissivity_sigma):
    """The pad-dependent values of a corner from its pad's layers ``dx`` (face first) [m] and
    thickness [m] and the corner's ``pad_constants``: (layer masses [kg], conduction between layers
    [W/K], to the backing plate [W/K], edge area [m^2], edge convection scale [m^2], edge radiation
    coefficient [W/K^4], index of the mid-thickness layer, interface conductance at rest [W/K], the
    further conductance while clamped [W/K], share of the friction heat the disc's face takes
    straight away [-]); see ``PadTerms``.

    Plain arithmetic on the scalars and arrays given: ``pad_terms`` calls it, and the compiled stint
    kernel (``thermo.chain.stint_kernel``) compiles this very function to wear a pad between laps."""
    between = k_pad * area2 / (dx[:-1] / 2 + dx[1:] / 2)
    r_back = (dx[-1] / 2) / (k_pad * area2)
    edge_area = 2 * 2 * half_perimeter * thickness          # both pads' perimeter x thickness
    r_pad_face = half_layer_resistance(dx[0], k_pad, area2)
    rest = rest_conductance(r_disc_face, r_pad_face, contact, area2)
    applied = applied_conductance(r_disc_face, r_pad_face)
    return (area2 * dx * density, between, 1.0 / (r_back + r_backing_half), edge_area, edge_area * caliper_multiplier,
            emissivity_sigma * edge_area, int(np.searchsorted(np.cumsum(dx), thickness / 2)), rest,
            max(applied - rest, 0.0), interface_disc_share(r_disc_face, r_pad_face))


def pad_length_m(area_m2: float) -> float:
    """Length of a pad of friction area ``area_m2`` along the disc's circumference (``PAD_ASPECT_RATIO``) [m]."""
    return math.sqrt(PAD_ASPECT_RATIO * area_m2)


def pad_layer_link(nodes, i: int) -> str:
    """Name of the conduction link from pad layer ``i`` to layer ``i + 1`` (``nodes``: the pad's nodes)."""
    return f"{nodes[i]}_to_{nodes[i + 1]}"


def pad_sources(face_node: str, pad_face_node: str, direct: float | None, signals: tuple[str, str]) -> list:
    """The friction heat's sources: the disc's face layer takes ``direct`` (``PadTerms.direct_disc_share``)
    of both the disc's and the pad's share of it (the interface split, ``thermo.corner.interface``),
    the pad's face layer the rest; with the user's fixed partition (``direct`` None) each body takes
    its own share."""
    disc_signal, pad_signal = signals
    if direct is None:
        return [HeatSource(face_node, disc_signal, 1.0), HeatSource(pad_face_node, pad_signal, 1.0)]
    return [HeatSource(face_node, disc_signal, direct), HeatSource(face_node, pad_signal, direct),
            HeatSource(pad_face_node, disc_signal, 1.0 - direct), HeatSource(pad_face_node, pad_signal, 1.0 - direct)]


def pad_output_weights(terms: PadTerms) -> tuple[np.ndarray, tuple[float, float]]:
    """Weights over the pad's layers of its two output nodes: "pad", the mass-weighted mean, and
    "pad_surface", the face extrapolated through the first two layer centres [-]."""
    return terms.masses_kg / np.sum(terms.masses_kg), layers_mod.face_extrapolation(terms.layers_m)


def with_pad_thickness(model, design, layers_m: np.ndarray, disc_face_resistance_k_w: float, mat: dict,
                       signals: tuple[str, str]):
    """The corner ``model`` with its pad at ``design``'s thickness, the same number of layers.

    Returns the ``CornerModel`` that ``build_corner(design)`` gives, made by putting the new
    ``pad_terms`` into ``model`` (nodes, links, sources and output weights), or None when the
    edges' layer moves (a change of the network's shape: build the corner anew).
    """
    terms = pad_terms(design, layers_m, mat, disc_face_resistance_k_w)
    network = model.network
    pads = model.pad_nodes
    if len(pads) != len(terms.layers_m):
        raise ValueError(f"with_pad_thickness: {len(terms.layers_m)} layers for a pad of {len(pads)}")
    links = {link.name: link for link in network.links}
    if links["pad_edge_convection"].node != pads[terms.mid_layer]:
        return None
    new_links = {
        "pad_to_backing_plate": replace(links["pad_to_backing_plate"], conductance_w_k=terms.to_backing_w_k),
        "pad_edge_convection": replace(links["pad_edge_convection"], scale=terms.edge_convection_scale),
        "pad_edge_radiation": replace(links["pad_edge_radiation"], coefficient_w_k4=terms.edge_radiation_w_k4),
        "pad_disc_interface": replace(links["pad_disc_interface"], conductance_w_k=terms.rest_w_k),
    }
    if "pad_disc_interface_clamped" in links:
        new_links["pad_disc_interface_clamped"] = replace(links["pad_disc_interface_clamped"],
                                                          scale=terms.clamped_extra_w_k)
    for i, g in enumerate(terms.between_layers_w_k):
        link = links[pad_layer_link(pads, i)]
        new_links[link.name] = replace(link, scale=g) if isinstance(link, Convection) else replace(link, conductance_w_k=g)
    masses = dict(zip(pads, terms.masses_kg))
    nodes = tuple(replace(node, heat_capacity=mat["pad"].heat_capacity(masses[node.name])) if node.name in masses
                  else node for node in network.nodes)
    sources = tuple(s for s in network.sources if s.node not in (model.disc_face_node, pads[0]))
    sources = tuple(pad_sources(model.disc_face_node, pads[0], terms.direct_disc_share, signals)) + sources
    weights = model.output_weights.copy()
    columns = [network.node_names.index(n) for n in pads]
    outputs = model.output_nodes
    mean, face = pad_output_weights(terms)
    weights[outputs.index("pad"), columns] = mean
    if "pad_surface" in outputs:
        weights[outputs.index("pad_surface"), columns[:2]] = face
    network = replace(network, nodes=nodes, links=tuple(new_links.get(link.name, link) for link in network.links),
                      sources=sources)
    return replace(model, design=design, network=network, output_weights=weights)
