"""Where a corner's pad-dependent values sit in the compiled kernel's rows, and writing them there.

A pad that wears, or is changed at a stop, alters only some values of its corner's network
(``thermo.corner.pad_terms``: the pad layers' masses and conductances, the edges' area and layer,
the pad-disc interface and the friction heat's split). ``PadRows`` writes those values straight
into the kernel's arrays (``thermo.solver.kernel_arrays``), so a run never rebuilds its network as
the pad wears: ``CornerRun`` for one corner, ``CornerLanes`` for many configurations side by
side. What it writes equals, to the bit, the arrays of the corner built anew for that pad
(tested).
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from thermo.corner.build import (
    SIGNAL_DISC_HEAT, SIGNAL_PAD_HEAT, corner_materials, disc_face_resistance, disc_layers,
)
from thermo.corner.layers import face_extrapolation
from thermo.corner.pad_terms import PadTerms, pad_layer_link, pad_terms
from thermo.solver.kernel_arrays import kernel_network

EDGE_LINKS = ("pad_edge_convection", "pad_edge_radiation")


class PadRows:
    """Where a corner's pad-dependent values sit in the kernel's rows (one map for every configuration)."""

    def __init__(self, net, model):
        links, nodes = net.link_names, net.node_names
        self.pads = np.array([nodes.index(n) for n in model.pad_nodes])
        self.between = np.array([links.index(pad_layer_link(model.pad_nodes, i)) for i in range(len(self.pads) - 1)],
                                dtype=np.int64)
        self.to_backing = links.index("pad_to_backing_plate")
        self.edges = [links.index(name) for name in EDGE_LINKS]
        self.rest = links.index("pad_disc_interface")
        self.clamped = links.index("pad_disc_interface_clamped") if "pad_disc_interface_clamped" in links else None
        self.face, self.pad_face = nodes.index(model.disc_face_node), int(self.pads[0])
        signals = net.source_signals
        self.disc_signal, self.pad_signal = signals.index(SIGNAL_DISC_HEAT), signals.index(SIGNAL_PAD_HEAT)
        sources = {(s.node, s.signal) for s in model.network.sources}
        expected = {(n, sig) for n in (model.disc_face_node, model.pad_nodes[0]) for sig in (SIGNAL_DISC_HEAT, SIGNAL_PAD_HEAT)}
        if self.clamped is not None and sources != expected:
            raise ValueError("pad rows: the friction heat's sources are not the interface split")
        outputs = model.output_nodes
        self.out_pad = outputs.index("pad")
        self.out_pad_surface = outputs.index("pad_surface") if "pad_surface" in outputs else None

    def index(self) -> tuple:
        """The rows as ``write_pad_values`` takes them: (pad nodes, between-layer links, pad to backing,
        edge convection, edge radiation, interface at rest, interface clamped (-1: none), disc face,
        pad face, disc and pad heat signals, pad output, pad surface output (-1: none))."""
        return (self.pads, self.between, self.to_backing, self.edges[0], self.edges[1], self.rest,
                -1 if self.clamped is None else self.clamped, self.face, self.pad_face, self.disc_signal,
                self.pad_signal, self.out_pad, -1 if self.out_pad_surface is None else self.out_pad_surface)

    def write(self, rows: dict, link_a: np.ndarray, weights: np.ndarray, b: int, terms: PadTerms) -> None:
        """Configuration ``b``'s rows, the edges' first end and its output weights for ``terms``."""
        split = terms.direct_disc_share is not None
        values = (terms.masses_kg, terms.between_layers_w_k, terms.to_backing_w_k, terms.edge_area_m2,
                  terms.edge_convection_scale, terms.edge_radiation_w_k4, terms.mid_layer, terms.rest_w_k,
                  terms.clamped_extra_w_k, terms.direct_disc_share if split else 0.0)
        write_pad_values(rows["par"], rows["mass"], rows["src"], link_a, weights, b, self.index(), terms.layers_m,
                         values, split)


def write_pad_values(par, mass, src, link_a, weights, b, index, layers_m, values, split) -> None:
    """Write a pad's values (those of ``thermo.corner.pad_terms.pad_values`` for ``layers_m``) into
    configuration ``b``'s kernel rows (``par``, ``mass``, ``src``), the edges' first end (``link_a``)
    and the output weights of the pad's mean and face (``pad_output_weights``); ``index``:
    ``PadRows.index``; ``split``: the friction heat is split at the interface (else the user's fixed
    partition, whose sources do not change).

    Plain loops over the few pad layers: ``PadRows.write`` calls it, and the stint kernel
    (``thermo.chain.stint_kernel``) compiles this very function."""
    (pads, between, to_backing, edge_convection, edge_radiation, rest, clamped, face, pad_face, disc_signal,
     pad_signal, out_pad, out_pad_surface) = index
    masses, between_w_k, to_backing_w_k, _, edge_scale, edge_w_k4, mid, rest_w_k, clamped_extra, direct = values
    for i in range(between.size):
        par[b, between[i]] = between_w_k[i]
    par[b, to_backing] = to_backing_w_k
    par[b, edge_convection] = edge_scale
    par[b, edge_radiation] = edge_w_k4
    par[b, rest] = rest_w_k
    if clamped >= 0:
        par[b, clamped] = clamped_extra
    for i in range(pads.size):
        mass[b, pads[i]] = masses[i]
    if split:
        src[b, face, disc_signal] = direct
        src[b, face, pad_signal] = direct
        src[b, pad_face, disc_signal] = 1.0 - direct
        src[b, pad_face, pad_signal] = 1.0 - direct
    link_a[b, edge_convection] = pads[mid]
    link_a[b, edge_radiation] = pads[mid]
    total = 0.0
    for i in range(pads.size):
        total += masses[i]
    for i in range(pads.size):
        weights[b, out_pad, pads[i]] = masses[i] / total
    if out_pad_surface >= 0:
        w_first, w_second = face_extrapolation(layers_m)
        weights[b, out_pad_surface, pads[0]] = w_first
        weights[b, out_pad_surface, pads[1]] = w_second


class PadKernel:
    """One corner's kernel arrays (``kernel_network`` of its network), a copy of its own, into which
    its pad's values are written as the pad wears or is changed (``PadRows``), with the output
    weights that follow the pad. ``CornerRun`` solves every segment on these arrays, so a worn
    pad costs a few array writes instead of a new network.

    Raises ``ValueError`` when the network does not run compiled or its friction heat is not split
    the way ``PadRows`` writes it (the caller then rebuilds the corner for each pad instead).
    """

    def __init__(self, compiled, model):
        base = kernel_network(compiled)
        if base is None:
            raise ValueError("pad kernel: the network does not run compiled")
        self.rows = PadRows(compiled, model)
        self.network = replace(base, link_a=base.link_a.copy(), par=base.par.copy(), mass=base.mass.copy(),
                               src=base.src.copy())
        self.output_weights = model.output_weights.copy()
        design = model.design
        self.materials = corner_materials(design)
        self.disc_face_resistance = disc_face_resistance(design, disc_layers(design), self.materials["disc"])

    def set_pad(self, design, thickness_m: float, layers_m: np.ndarray) -> PadTerms:
        """Write the values of ``design``'s pad at ``thickness_m`` in ``layers_m`` (``pad_terms``) into the
        arrays and output weights; returns those values."""
        terms = pad_terms(design, layers_m, self.materials, self.disc_face_resistance, thickness_m)
        net = self.network
        self.rows.write({"par": net.par, "mass": net.mass, "src": net.src}, net.link_a[None, :],
                        self.output_weights[None], 0, terms)
        return terms
