"""Every lap of a stint in one compiled call, the pad worn between laps (``CornerRun.advance_laps``).

A stint's laps differ in their heat input (the fuel burns off) and air temperature (a day-night
profile), which are known before the run: each lap's kernel inputs are made beforehand and passed
concatenated, with each lap's offsets. What depends on the solved state is the pad: after each lap
the kernel takes the lap's heat-weighted mean pad temperature, wears the pad by the scenario's law
(``thermo.corner.pad_wear.worn_thickness_m``), lays the worn pad out in as many layers
(``thermo.corner.layers.layers_of_count``), works out its values (``pad_terms.pad_values``), writes
them into the corner's kernel arrays (``thermo.chain.pad_rows.write_pad_values``) and carries the
pad's temperatures to the new layers (``layers.worn_pad_profile``). Each of those is compiled here
from its own Python source, the one the per-lap path runs, so there is one description of each;
each lap is integrated by the one-configuration kernel itself (``thermo.solver.kernel``).

What the caller does per lap after the call (stored rows, lap extremes, the enthalpy the worn
slice took away, warnings) it does from what this returns: each lap's recorded rows and end state
before the wear, and the pad's thickness, layers, interface share and state after it.

Numbers: a stint is the per-lap path (``CornerRun.advance``) to the bit: the lap integrations
are the same kernel's, and the wear's functions the same source, the heat-weighted pad temperature
(``pad_wear.heat_weighted_pad_k``) called compiled by both (tested). numba caches the machine code beside the source files; after
changing one of the compiled functions, delete the ``__pycache__/*.nbi`` and ``*.nbc`` files of
``thermo/chain`` and ``thermo/corner``.
"""
from __future__ import annotations

import types
from typing import NamedTuple

import numpy as np
from numba import njit

from thermo.chain import pad_rows
from thermo.corner import interface, layers, pad_terms, pad_wear
from thermo.solver.kernel import STATUS_OK, KernelInputs, KernelResult
from thermo.solver.kernel import _advance_one as advance_configuration


def _compiled(module, name: str, namespace: dict):
    """``module.name`` compiled with ``namespace`` (the module's globals, some replaced by compiled
    functions), as ``thermo.solver.kernel`` compiles the network's laws."""
    space = dict(vars(module), **namespace)
    fn = getattr(module, name)
    return njit(cache=True, error_model="numpy")(types.FunctionType(fn.__code__, space, name))


_interface = {name: _compiled(interface, name, {}) for name in (
    "half_layer_resistance", "rest_conductance", "applied_conductance", "interface_disc_share")}
pad_values = _compiled(pad_terms, "pad_values", _interface)
worn_thickness_m = _compiled(pad_wear, "worn_thickness_m", {})
heat_weighted_pad_k = _compiled(pad_wear, "heat_weighted_pad_k", {})
layers_of_count = _compiled(layers, "layers_of_count", {})
depth_from_back = _compiled(layers, "depth_from_back", {})
worn_pad_profile = _compiled(layers, "worn_pad_profile", {"depth_from_back": depth_from_back})
face_extrapolation = _compiled(layers, "face_extrapolation", {})
write_pad_values = _compiled(pad_rows, "write_pad_values", {"face_extrapolation": face_extrapolation})


class StintWear(NamedTuple):
    """The pad wear law and the pad as the stint kernel reads them.

    ``enabled``; ``coefficient_m3_per_j``, ``reference_k``, ``scale_k``: the scenario's [pad_wear];
    ``energy_j`` (n_laps,) each lap's friction energy [J]; ``row_weight`` (n_rows,) the pad's heat
    at each recorded row [W]; ``min_thickness_m`` the thickness a pad is held at; ``first_layer_m``,
    ``layer_count`` the worn pad's layers; ``constants`` ``pad_terms.pad_constants``; ``index``
    ``PadRows.index``; ``split`` the friction heat split at the interface."""

    enabled: bool
    coefficient_m3_per_j: float
    reference_k: float
    scale_k: float
    energy_j: np.ndarray
    row_weight: np.ndarray
    min_thickness_m: float
    first_layer_m: float
    layer_count: int
    constants: tuple
    index: tuple
    split: bool


class StintPads(NamedTuple):
    """What the stint kernel writes per lap about the pad (allocated by the caller): ``weights``
    (n_laps, n_out, n) the output weights each lap was solved with; after each lap's wear:
    ``thickness_m`` (n_laps,), ``layers_m`` (n_laps, n_layers), ``direct`` (n_laps,) the
    interface's direct share, ``state_k`` (n_laps, n) the state the next lap starts from [K];
    ``masses_kg`` (n_laps, n_layers) the layers' masses, written only after a lap that wore the pad."""

    weights: np.ndarray
    thickness_m: np.ndarray
    layers_m: np.ndarray
    masses_kg: np.ndarray
    direct: np.ndarray
    state_k: np.ndarray


@njit(cache=True, error_model="numpy", nogil=True)
def advance_stint(T0, inputs, lap_grid, lap_step, lap_rec, net, rtol, atol, max_newton, record, out, weights,
                  wear, thickness_m, layers_m, direct, pads):
    """Every lap of a stint from ``T0`` (1, n) [K]: lap k on grid points ``lap_grid[k]:lap_grid[k+1]``
    and steps ``lap_step[k]:lap_step[k+1]`` of the concatenated ``inputs`` (``KernelInputs``),
    recorded at ``record`` into rows ``lap_rec[k]:lap_rec[k+1]`` of ``out.temps`` and ``out.flows``
    (1, n_rows, ...); the per-lap fields of ``out`` (``KernelResult``: final, peak, peak_step,
    link_energy, heat_in, status, fail_step, counts) have a row per lap. ``net``: one configuration
    (``kernel.NetworkArrays``) whose pad rows the wear rewrites; ``weights`` (n_out, n) its output
    weights, rewritten likewise; ``wear`` ``StintWear``; ``thickness_m``, ``layers_m``, ``direct`` the pad now (its thickness,
    layers and interface share);
    ``pads`` ``StintPads``. Returns the number of laps solved: all of them, or the index of the
    first lap whose status is not ``STATUS_OK`` (nothing after it is done)."""
    state = T0.copy()
    dx = layers_m.copy()
    pad_nodes, out_pad = wear.index[0], wear.index[11]
    thickness = thickness_m
    for k in range(lap_grid.size - 1):
        g0, g1, s0, s1, r0, r1 = lap_grid[k], lap_grid[k + 1], lap_step[k], lap_step[k + 1], lap_rec[k], lap_rec[k + 1]
        lap = KernelInputs(inputs.grid[g0:g1], inputs.h[s0:s1], inputs.bk_grid[g0:g1], inputs.drv_grid[g0:g1],
                           inputs.bk_mid[s0:s1], inputs.drv_mid[s0:s1], inputs.qs_mid[s0:s1], inputs.qs_full[s0:s1])
        result = KernelResult(out.temps[:, r0:r1], out.flows[:, r0:r1], out.final[k:k + 1], out.peak[k:k + 1],
                              out.peak_step[k:k + 1], out.link_energy[k:k + 1], out.heat_in[k:k + 1],
                              out.status[k:k + 1], out.fail_step[k:k + 1], out.counts[k:k + 1])
        pads.weights[k] = weights
        advance_configuration(0, state, lap, net, rtol, atol, max_newton, record[g0:g1], result)
        if out.status[k] != STATUS_OK:
            return k
        state[0] = out.final[k]
        if wear.enabled and wear.energy_j[k] > 0:
            pad_k = heat_weighted_pad_k(out.temps[0, r0:r1], weights[out_pad][pad_nodes], pad_nodes,
                                        wear.row_weight[r0:r1])
            new = worn_thickness_m(thickness, wear.coefficient_m3_per_j, wear.energy_j[k], wear.constants[0], pad_k,
                                   wear.reference_k, wear.scale_k, wear.min_thickness_m)
            if new < thickness:
                new_dx = layers_of_count(new, wear.first_layer_m, wear.layer_count)
                values = pad_values(new_dx, new, *wear.constants)
                write_pad_values(net.par, net.mass, net.src, net.link_a[None, :], weights[None], 0, wear.index,
                                 new_dx, values, wear.split)
                profile = worn_pad_profile(dx, state[0, pad_nodes], new_dx)
                for i in range(pad_nodes.size):
                    state[0, pad_nodes[i]] = profile[i]
                dx = new_dx
                thickness = new
                direct = values[9]
                pads.masses_kg[k] = values[0]
        pads.direct[k] = direct
        pads.thickness_m[k] = thickness
        pads.layers_m[k] = dx
        pads.state_k[k] = state[0]
    return lap_grid.size - 1
