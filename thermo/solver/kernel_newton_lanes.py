"""The full-Newton TR-BDF2 kernel with configurations side by side in lanes.

The scheme of ``thermo.solver.kernel`` (``_advance_one``: each stage solved by Newton's method
with the exact Jacobian, the stage matrix factored at T_n and again after ``REFACTOR_AFTER``
iterations without convergence), with ``LANES`` configurations advancing together as in
``thermo.solver.kernel_lanes``: every per-node and per-link quantity is an array (..., W) whose
innermost loop runs over the configurations, and the work the configurations share (the
schedule's table axes, the elimination plan, the loop control) is done once per block.

Each lane keeps its own Newton state (iteration count, whether its matrix is due to be
refactored, whether it has converged). A block iterates a stage until all its lanes have
converged; a lane that has converged is carried along without change (the flows and slopes of
further iterations are worked out for the whole block but kept only in lanes still iterating).
So every lane does exactly the arithmetic of the one-configuration kernel, in the same order, and
its numbers (temperatures, flows, peaks, link energies, heat in, evaluation counts) are the same
to the bit as ``kernel.advance`` on that configuration alone, whatever runs beside it (tested).

What the one-configuration kernel would handle by a fallback or report as a failure (a weak pivot
that needs the dense pivoted LU, a state off a conductance table, Newton not converging within
``max_newton``, non-finite temperatures) only flags the lane here (``lane_flag``): the caller
reruns that configuration alone with ``kernel.advance``, which decides.

Measured beside the one-configuration kernel, see DEVELOPERS.md ("Study points side by side").

Array shapes (K blocks of W configurations): T0 (K, n, W); rows of ``kernel.NetworkArrays`` as in
``thermo.solver.kernel_lanes``; ``NewtonLaneOutputs``: temps (K, n_rec, n, W), flows (K, n_rec, L, W),
final, peak, peak_step (K, n, W), link_energy (K, L, W), heat_in (K, W), lane_flag (K, W),
counts (K, 2, W) flow and matrix evaluations.
"""
from __future__ import annotations

import math
from collections import namedtuple

import numpy as np
from numba import njit, prange

from thermo.solver.kernel import D_WEIGHT, REFACTOR_AFTER, W_WEIGHT, _configuration, newton_converged
from thermo.solver.kernel_lanes import (_accept_step_lanes, _capacity_lanes, _factor_lanes, _flows_lanes,
                                        _lane_scratch, _net_inflow_lanes, _pattern, _reference_ramps, _residual_lanes,
                                        _solve_lanes, _sources_lanes)

# what a block run writes (shapes in the module notes)
NewtonLaneOutputs = namedtuple("NewtonLaneOutputs", ("temps", "flows", "final", "peak", "peak_step", "link_energy",
                                                     "heat_in", "lane_flag", "counts"))


@njit(cache=True, error_model="numpy")
def _keep_iterating(fs, dfas, dfbs, fx, dfa, dfb, active):
    """Copy the flows and slopes just evaluated into the lanes still iterating."""
    for l in range(fx.shape[0]):
        for c in range(fx.shape[1]):
            if active[c]:
                fx[l, c] = fs[l, c]
                dfa[l, c] = dfas[l, c]
                dfb[l, c] = dfbs[l, c]


@njit(cache=True, error_model="numpy")
def _flow_update_lane(fx, dfa, dfb, R, n, link_a, link_b, c):
    """``kernel._flow_update`` in lane c: the flows moved to first order by the accepted correction."""
    for l in range(link_a.size):
        dl = dfa[l, c] * R[link_a[l], c]
        if link_b[l] < n:
            dl += dfb[l, c] * R[link_b[l], c]
        fx[l, c] += dl


@njit(cache=True, error_model="numpy")
def _advance_block(blk, T0, inputs, net, rtol, atol, max_newton, record, out):
    """Block ``blk`` of W configurations over the grid, full Newton on each stage in every lane."""
    _, h, bk_grid, drv_grid, bk_mid, drv_mid, qs_mid, qs_full = inputs
    temps_out, flows_out, final, peak, peak_step, link_energy, heat_in, lane_flag, counts = out
    link_a, link_b, order, ptr, nbr = net.link_a, net.link_b, net.order, net.ptr, net.nbr
    links, cap = _configuration(net, blk)
    n = T0.shape[1]
    W = T0.shape[2]
    L = link_a.size
    N = h.size
    T = T0[blk].copy()
    Y, C, H, H0, R, r1, r2, tgt, q2, q3, pinv, f1, f2, f3, dfa, dfb, m, total = _lane_scratch(n, L, W)
    pos = np.empty((n, n), dtype=np.int64)
    slots = _pattern(n, order, ptr, nbr, pos)
    A = np.empty((slots, W))
    A_new = np.empty((slots, W))
    pinv_new = np.empty((n, W))
    fs = np.empty((L, W))
    dfas = np.empty((L, W))
    dfbs = np.empty((L, W))
    flag = lane_flag[blk]
    off_table = np.zeros(W, dtype=np.bool_)      # a lookup of this iteration left its table
    weak = np.zeros(W, dtype=np.bool_)           # a pivot of a refactorisation was weak
    active = np.zeros(W, dtype=np.bool_)         # still iterating this stage
    refactor = np.zeros(W, dtype=np.bool_)       # the stage matrix is due to be refactored
    worst = np.empty(W)
    previous = np.empty(W)                       # each lane's scaled correction of its last iteration
    nf = np.ones(W, dtype=np.int64)
    nj = np.zeros(W, dtype=np.int64)
    e_in = np.zeros(W)
    sb = net.src[blk]
    pk, pks, le = peak[blk], peak_step[blk], link_energy[blk]
    href = np.empty(cap.seg_lo.shape)
    _reference_ramps(cap, href)
    _flows_lanes(T, bk_grid[0], drv_grid[0], links, f1, dfa, dfb, flag)
    rec = 0
    if record[0]:
        temps_out[blk, rec] = T
        flows_out[blk, rec] = f1
        rec += 1
    pk[:, :] = T
    pks[:, :] = 0
    for step in range(N):
        if np.all(flag):
            break
        hn = h[step]
        coef = hn * D_WEIGHT
        _capacity_lanes(T, cap, href, C, H0, True)
        _net_inflow_lanes(f1, n, link_a, link_b, r1)
        _sources_lanes(sb, step, qs_mid, qs_full, q2, q3, e_in, total)
        # the stage matrix at T_n (its slopes are those of each lane's last flow evaluation)
        _factor_lanes(A, pos, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, pinv, m, flag)
        for c in range(W):
            nj[c] += 1
            refactor[c] = False
        for stage in range(2):
            if stage == 0:
                for i in range(n):
                    for c in range(W):
                        tgt[i, c] = H0[i, c] + coef * r1[i, c] + q2[i, c]
                        Y[i, c] = T[i, c]
                bkx = bk_mid[step]
                dvx = drv_mid[step]
                fx = f2
            else:
                # Y2 is the first guess for Y3
                _net_inflow_lanes(f2, n, link_a, link_b, r2)
                for i in range(n):
                    for c in range(W):
                        tgt[i, c] = H0[i, c] + hn * W_WEIGHT * (r1[i, c] + r2[i, c]) + q3[i, c]
                bkx = bk_grid[step + 1]
                dvx = drv_grid[step + 1]
                fx = f3
            for c in range(W):
                active[c] = not flag[c]
                previous[c] = math.inf
            for it in range(max_newton):
                if not np.any(active):
                    break
                off_table[:] = False
                every = True
                due = False
                for c in range(W):
                    if active[c]:
                        nf[c] += 1
                        due = due or refactor[c]
                    else:
                        every = False
                if every:
                    _flows_lanes(Y, bkx, dvx, links, fx, dfa, dfb, off_table)
                else:
                    _flows_lanes(Y, bkx, dvx, links, fs, dfas, dfbs, off_table)
                    _keep_iterating(fs, dfas, dfbs, fx, dfa, dfb, active)
                # C only where a matrix is refactored (the one-configuration kernel's C is read only there)
                _capacity_lanes(Y, cap, href, C, H, due)
                _residual_lanes(H, tgt, coef, fx, n, link_a, link_b, R)
                if due:
                    weak[:] = False
                    _factor_lanes(A_new, pos, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, pinv_new, m,
                                  weak)
                    for c in range(W):
                        if active[c] and refactor[c]:
                            for s in range(slots):
                                A[s, c] = A_new[s, c]
                            for i in range(n):
                                pinv[i, c] = pinv_new[i, c]
                            nj[c] += 1
                            refactor[c] = False
                            if weak[c]:
                                flag[c] = True
                                active[c] = False
                _solve_lanes(A, pos, pinv, order, ptr, nbr, R)
                for c in range(W):
                    worst[c] = 0.0
                for i in range(n):
                    for c in range(W):
                        e = abs(R[i, c]) / (atol + rtol * abs(Y[i, c] + R[i, c]))
                        if not (e <= worst[c]):
                            worst[c] = e if math.isfinite(e) else math.inf
                for i in range(n):
                    for c in range(W):
                        if active[c]:
                            Y[i, c] += R[i, c]
                for c in range(W):
                    if not active[c]:
                        continue
                    if newton_converged(worst[c], previous[c], it):
                        # as the one-configuration kernel: the accepted Y's flows to first order
                        _flow_update_lane(fx, dfa, dfb, R, n, link_a, link_b, c)
                        active[c] = False
                        if off_table[c]:
                            flag[c] = True
                        continue
                    previous[c] = worst[c]
                    if it + 1 == REFACTOR_AFTER:
                        refactor[c] = True
            for c in range(W):
                if active[c]:
                    flag[c] = True        # Newton did not converge: the one-configuration kernel reports it
        _accept_step_lanes(hn, f1, f2, f3, le, Y, T, pk, pks, flag, step + 1)
        if record[step + 1]:
            temps_out[blk, rec] = T
            flows_out[blk, rec] = f1
            rec += 1
    # the accepted end state itself must lie on the tables
    _flows_lanes(T, bk_grid[N], drv_grid[N], links, f3, dfa, dfb, flag)
    final[blk] = T
    for c in range(W):
        heat_in[blk, c] = e_in[c]
        counts[blk, 0, c] = nf[c]
        counts[blk, 1, c] = nj[c]


@njit(cache=True, parallel=True, error_model="numpy")
def advance_newton_lanes(T0, inputs, net, rtol, atol, max_newton, record, out):
    """All blocks, spread over the CPU cores (see the module notes for the shapes)."""
    for blk in prange(T0.shape[0]):
        _advance_block(blk, T0, inputs, net, rtol, atol, max_newton, record, out)
