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
from thermo.corner.pad_terms import PadTerms, pad_layer_link, pad_output_weights, pad_terms
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

    def write(self, rows: dict, link_a: np.ndarray, weights: np.ndarray, b: int, terms: PadTerms) -> None:
        """Configuration ``b``'s rows, the edges' first end and its output weights for ``terms``."""
        par = rows["par"]
        par[b, self.between] = terms.between_layers_w_k
        par[b, self.to_backing] = terms.to_backing_w_k
        par[b, self.edges[0]] = terms.edge_convection_scale
        par[b, self.edges[1]] = terms.edge_radiation_w_k4
        par[b, self.rest] = terms.rest_w_k
        if self.clamped is not None:
            par[b, self.clamped] = terms.clamped_extra_w_k
        rows["mass"][b, self.pads] = terms.masses_kg
        if terms.direct_disc_share is not None:
            src, d = rows["src"], terms.direct_disc_share
            src[b, self.face, [self.disc_signal, self.pad_signal]] = d
            src[b, self.pad_face, [self.disc_signal, self.pad_signal]] = 1.0 - d
        link_a[b, self.edges] = self.pads[terms.mid_layer]
        mean, face = pad_output_weights(terms)
        weights[b, self.out_pad, self.pads] = mean
        if self.out_pad_surface is not None:
            weights[b, self.out_pad_surface, self.pads[:2]] = face


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
