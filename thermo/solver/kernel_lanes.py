"""The linearised TR-BDF2 kernel with configurations side by side in lanes (vectorised over a batch).

Same scheme, same arithmetic as ``thermo.solver.kernel_linearised`` (see that module for the
method), but ``LANES`` configurations advance together: every per-node and per-link
quantity is an array (..., LANES) whose innermost loop runs over the configurations, which the
compiler turns into SIMD instructions, and the work shared by all configurations of a batch (the
schedule's driver and boundary-temperature table axes, the elimination plan, the loop control) is
done once per block instead of once per configuration. Blocks go to the CPU cores in parallel.

A lane that fails (a weak pivot, a state off the conductance tables, non-finite temperatures) is
only flagged here (``lane_flag``): its numbers are not used, and the caller reruns that
configuration alone with the one-configuration kernel, which has the dense-LU fallback and the
exact failure report. The other lanes of its block are unaffected (lanes never mix).

Array shapes (K blocks of LANES configurations) in ``kernel.NetworkArrays``: T0 (K, n, W); par (K, L, W);
tix, six (K, n_conv, W); mass, base (K, n, W); seg_lo, seg_hi, seg_slope (K, S, W); src (K, n, n_signals, W);
tables flattened (C order); in ``LaneOutputs``: final, peak (K, n, W), peak_step (K, n, W), lap_peaks
(K, n_laps, n_out, W), link_energy (K, L, W), heat_in, lane_flag, counts (K, W), temps (K, n_rec, n, W),
flows (K, n_rec, L, W). Shared arrays are those of ``thermo.solver.kernel`` (``ARGS_DOC``).
"""
from __future__ import annotations

import math
from collections import namedtuple

import numpy as np
from numba import njit, prange

from thermo.solver.kernel import (D_WEIGHT, W_WEIGHT, _axis, _configuration, bilinear, capacity_segment,
                                  conduction_flow, convection_flow, radiation_flow, trilinear, trilinear_slope_k)

LANES = 64       # widest block: measured fastest per configuration (16: 0.66, 32: 0.55, 64: 0.48 us a step)

# what a block run writes (shapes in the module notes)
LaneOutputs = namedtuple("LaneOutputs", ("temps", "flows", "final", "peak", "peak_step", "lap_peaks", "link_energy",
                                         "heat_in", "lane_flag", "counts"))


@njit(cache=True, error_model="numpy")
def _flows_lanes(T, bk, drv, links, f, dfa, dfb, flag):
    """Link flows and slopes (L, W) of every lane at T (n, W) (``kernel.Links`` of one block); flag[c]
    set where a lookup left its table.

    ``tables`` is the kernel's (U, n_driver, n_node, n_boundary) table array flattened (C order).
    A convection slot whose boundary temperature is constant over the run (``slot_sliced``) reads
    ``sliced`` instead, (P, n_driver, n_node) flattened: its table already interpolated along the
    boundary axis, the same arithmetic as the trilinear lookup's first step, so the result is
    identical and the lookup costs four loads, not eight (``six`` (n_conv, W) the slice of each
    lane; dG/dT_b is not formed: a boundary's slope never enters the stage matrix)."""
    n, link_a, link_b, kind, par, conv_slot, conv_drv, tables, tix, gp, sliced, slot_sliced, six = links
    W = T.shape[1]
    n_i = int(gp[2])
    n_j = int(gp[5])
    n_k = int(gp[8])
    s_i = n_j * n_k
    lo_j = gp[3]
    top_j = n_j - 1.0
    inv_j = 1.0 / gp[4]           # multiplications by reciprocals: no division in the lane loop
    inv_k = 1.0 / gp[7]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        kd = kind[l]
        on_node = b < n
        tbk = 0.0 if on_node else bk[b - n]
        if kd == 0:
            for c in range(W):
                tb = T[b, c] if on_node else tbk
                f[l, c], dfa[l, c], dfb[l, c] = conduction_flow(par[l, c], T[a, c], tb)
        elif kd == 1:
            for c in range(W):
                tb = T[b, c] if on_node else tbk
                f[l, c], dfa[l, c], dfb[l, c] = radiation_flow(par[l, c], T[a, c], tb)
        else:
            s = conv_slot[l]
            dd = conv_drv[s]
            i, fi, oki = _axis(drv[dd] if dd >= 0 else 0.0, gp[0], 1.0 / gp[1], n_i)
            kb, fkb, okb = _axis(tbk, gp[6], inv_k, n_k)
            if slot_sliced[s]:
                for c in range(W):
                    ta = T[a, c]
                    x = (ta - lo_j) * inv_j
                    if not (oki and x >= 0.0 and x <= top_j):
                        flag[c] = True
                    x = x if x > 0.0 else 0.0
                    x = x if x < top_j else top_j
                    j = min(int(x), n_j - 2)
                    fj = x - j
                    o = (six[s, c] * n_i + i) * n_j + j
                    g, ga = bilinear(sliced[o], sliced[o + 1], sliced[o + n_j], sliced[o + n_j + 1], fi, fj)
                    f[l, c], dfa[l, c], dfb[l, c] = convection_flow(par[l, c], g, ga * inv_j, 0.0, ta,
                                                                    T[b, c] if on_node else tbk)
                continue
            for c in range(W):
                ta = T[a, c]
                x = (ta - lo_j) * inv_j
                if not (x >= 0.0 and x <= top_j):
                    flag[c] = True
                x = x if x > 0.0 else 0.0
                x = x if x < top_j else top_j
                j = min(int(x), n_j - 2)
                fj = x - j
                if on_node:
                    tb = T[b, c]
                    k, fk, okk = _axis(tb, gp[6], inv_k, n_k)
                    if not okk:
                        flag[c] = True
                else:
                    tb = tbk
                    k, fk = kb, fkb
                if not (oki and (on_node or okb)):
                    flag[c] = True
                o = ((tix[s, c] * n_i + i) * n_j + j) * n_k + k
                a000, a001, a010, a011 = tables[o], tables[o + 1], tables[o + n_k], tables[o + n_k + 1]
                a100, a101 = tables[o + s_i], tables[o + s_i + 1]
                a110, a111 = tables[o + s_i + n_k], tables[o + s_i + n_k + 1]
                g, ga = trilinear(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj, fk)
                gb = trilinear_slope_k(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj)
                f[l, c], dfa[l, c], dfb[l, c] = convection_flow(par[l, c], g, ga * inv_j, gb * inv_k, ta, tb)


@njit(cache=True, error_model="numpy")
def _reference_ramps(capacities, href):
    """Each capacity segment's ramp at the reference temperature (S, W), constant over a run."""
    seg_lo, seg_hi, t_ref = capacities.seg_lo, capacities.seg_hi, capacities.t_ref
    W = seg_lo.shape[1]
    for s in range(seg_lo.shape[0]):
        for c in range(W):
            lo = seg_lo[s, c]
            hi = seg_hi[s, c]
            href[s, c] = capacity_segment(t_ref, lo, hi)[1]


@njit(cache=True, error_model="numpy")
def _capacity_lanes(T, capacities, href, C, H, with_c):
    """Enthalpy H [J] and, if ``with_c``, heat capacity C [J/K] (n, W) of every lane (``kernel.Capacities``
    of one block; as ``kernel._capacity_enthalpy``; ``href`` from ``_reference_ramps``)."""
    mass, base, seg_start, seg_lo, seg_hi, seg_slope, t_ref = capacities
    W = T.shape[1]
    for i in range(T.shape[0]):
        for c in range(W):
            H[i, c] = base[i, c] * (T[i, c] - t_ref)
        if with_c:
            for c in range(W):
                C[i, c] = base[i, c]
        for s in range(seg_start[i], seg_start[i + 1]):
            for c in range(W):
                H[i, c] += seg_slope[s, c] * (capacity_segment(T[i, c], seg_lo[s, c], seg_hi[s, c])[1] - href[s, c])
            if with_c:
                for c in range(W):
                    C[i, c] += seg_slope[s, c] * capacity_segment(T[i, c], seg_lo[s, c], seg_hi[s, c])[0]
        for c in range(W):
            H[i, c] *= mass[i, c]
        if with_c:
            for c in range(W):
                C[i, c] *= mass[i, c]


@njit(cache=True, error_model="numpy")
def _pattern(n, order, ptr, nbr, pos):
    """Slot of every entry of the filled pattern in the compact matrix store (pos (n, n), -1 where
    structurally zero); returns the number of slots. Only the pattern is ever read or written."""
    pos[:, :] = -1
    count = 0
    for k in range(order.size):
        p = order[k]
        if pos[p, p] < 0:
            pos[p, p] = count
            count += 1
        for u in range(ptr[k], ptr[k + 1]):
            r = nbr[u]
            for x, y in ((r, p), (p, r)):
                if pos[x, y] < 0:
                    pos[x, y] = count
                    count += 1
            for v in range(ptr[k], ptr[k + 1]):
                q = nbr[v]
                if pos[r, q] < 0:
                    pos[r, q] = count
                    count += 1
    return count


@njit(cache=True, error_model="numpy")
def _factor_lanes(A, pos, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, pinv, m, flag):
    """Stage matrix of every lane (compact store A (slots, W), ``_pattern``), factored in place
    along the plan; weak pivots flag a lane."""
    W = C.shape[1]
    A[:, :] = 0.0
    for i in range(n):
        d = pos[i, i]
        for c in range(W):
            A[d, c] = C[i, c]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        aa = pos[a, a]
        for c in range(W):
            A[aa, c] += coef * dfa[l, c]
        if b < n:
            ab, ba, bb = pos[a, b], pos[b, a], pos[b, b]
            for c in range(W):
                A[ab, c] += coef * dfb[l, c]
                A[ba, c] -= coef * dfa[l, c]
                A[bb, c] -= coef * dfb[l, c]
    for k in range(order.size):
        p = order[k]
        pp = pos[p, p]
        for c in range(W):
            d = A[pp, c]
            if not (d > 0.5 * C[p, c]):
                flag[c] = True
                d = C[p, c]
            pinv[p, c] = 1.0 / d
        for u in range(ptr[k], ptr[k + 1]):
            r = nbr[u]
            rp = pos[r, p]
            for c in range(W):
                m[c] = A[rp, c] * pinv[p, c]
                A[rp, c] = m[c]
            for v in range(ptr[k], ptr[k + 1]):
                q = nbr[v]
                rq, pq = pos[r, q], pos[p, q]
                for c in range(W):
                    A[rq, c] -= m[c] * A[pq, c]


@njit(cache=True, error_model="numpy")
def _solve_lanes(A, pos, pinv, order, ptr, nbr, x):
    """Solve every lane in place with the factors of ``_factor_lanes``."""
    W = x.shape[1]
    for k in range(order.size):
        p = order[k]
        for u in range(ptr[k], ptr[k + 1]):
            r = nbr[u]
            rp = pos[r, p]
            for c in range(W):
                x[r, c] -= A[rp, c] * x[p, c]
    for k in range(order.size - 1, -1, -1):
        p = order[k]
        for u in range(ptr[k], ptr[k + 1]):
            q = nbr[u]
            pq = pos[p, q]
            for c in range(W):
                x[p, c] -= A[pq, c] * x[q, c]
        for c in range(W):
            x[p, c] *= pinv[p, c]


@njit(cache=True, error_model="numpy")
def _residual_lanes(H, tgt, coef, fx, n, link_a, link_b, R):
    """R = -(H(Y) - coef D f(Y) - target) [J] in every lane (``kernel._residual`` negated: IEEE
    rounding is symmetric, so each entry is the exact negative of the one-configuration value)."""
    W = R.shape[1]
    for i in range(n):
        for c in range(W):
            R[i, c] = tgt[i, c] - H[i, c]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        for c in range(W):
            R[a, c] -= coef * fx[l, c]
        if b < n:
            for c in range(W):
                R[b, c] += coef * fx[l, c]


@njit(cache=True, error_model="numpy")
def _sources_lanes(sb, step, qs_mid, qs_full, q2, q3, e_in, total):
    """Heat into each node over the first stage and the whole step [J] in every lane (``sb`` (n,
    n_signals, W)); each lane's step total is added to ``e_in`` as ``kernel._sources`` adds it
    (``total`` (W,) scratch)."""
    n, n_sig, W = sb.shape
    for c in range(W):
        total[c] = 0.0
    for i in range(n):
        for c in range(W):
            q2[i, c] = 0.0
            q3[i, c] = 0.0
        for k in range(n_sig):
            qm = qs_mid[step, k]
            qf = qs_full[step, k]
            for c in range(W):
                q2[i, c] += sb[i, k, c] * qm
                q3[i, c] += sb[i, k, c] * qf
        for c in range(W):
            total[c] += q3[i, c]
    for c in range(W):
        e_in[c] += total[c]


@njit(cache=True, error_model="numpy")
def _chord_lanes(Y, H, tgt, coef, fx, dfa, dfb, R, A, pos, pinv, order, ptr, nbr, n, link_a, link_b):
    """One chord correction of a stage in every lane (``kernel._linear_stage``)."""
    W = Y.shape[1]
    _residual_lanes(H, tgt, coef, fx, n, link_a, link_b, R)
    _solve_lanes(A, pos, pinv, order, ptr, nbr, R)
    for i in range(n):
        for c in range(W):
            Y[i, c] += R[i, c]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        for c in range(W):
            fx[l, c] += dfa[l, c] * R[a, c]
        if b < n:
            for c in range(W):
                fx[l, c] += dfb[l, c] * R[b, c]


@njit(cache=True, error_model="numpy")
def _net_inflow_lanes(f, n, link_a, link_b, r):
    """r = D f in every lane [W]."""
    r[:, :] = 0.0
    W = r.shape[1]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        for c in range(W):
            r[a, c] -= f[l, c]
        if b < n:
            for c in range(W):
                r[b, c] += f[l, c]


@njit(cache=True, error_model="numpy")
def _outputs_lanes(T, w_ptr, w_node, w_val, lp):
    """Raise each output's running peak lp (n_out, W) to its value at T."""
    W = T.shape[1]
    for o in range(w_ptr.size - 1):
        for c in range(W):
            v = 0.0
            for j in range(w_ptr[o], w_ptr[o + 1]):
                v += w_val[j] * T[w_node[j], c]
            lp[o, c] = max(lp[o, c], v)


@njit(cache=True, error_model="numpy")
def _lane_scratch(n, L, W):
    """Work arrays of a block run: node arrays (n, W) Y, C, H, H0, R, r1, r2, tgt, q2, q3, pinv;
    link arrays (L, W) f1, f2, f3, dfa, dfb; and (W,) scratch m, total."""
    e = lambda: np.empty((n, W))
    k = lambda: np.empty((L, W))
    return (e(), e(), e(), e(), e(), e(), e(), e(), np.zeros((n, W)), np.zeros((n, W)), e(),
            k(), k(), k(), k(), k(), np.empty(W), np.empty(W))


@njit(cache=True, error_model="numpy")
def _accept_step_lanes(hn, f1, f2, f3, le, Y, T, pk, pks, flag, index):
    """A step's end in every lane: link energies by the scheme's weights, f1 = f3, T = Y (a
    non-finite state flags its lane), and each node's peak raised, reached at grid step ``index``."""
    L, W = f1.shape
    for l in range(L):
        for c in range(W):
            le[l, c] += hn * (W_WEIGHT * (f1[l, c] + f2[l, c]) + D_WEIGHT * f3[l, c])
            f1[l, c] = f3[l, c]
    for i in range(T.shape[0]):
        for c in range(W):
            y = Y[i, c]
            if not math.isfinite(y):
                flag[c] = True
            T[i, c] = y
            if y > pk[i, c]:
                pk[i, c] = y
                pks[i, c] = index


@njit(cache=True, error_model="numpy")
def _advance_block(blk, T0, inputs, net, n_laps, weights, record, out):
    """Block ``blk`` of LANES configurations over the grid ``n_laps`` times (linearised mode)."""
    _, h, bk_grid, drv_grid, bk_mid, drv_mid, qs_mid, qs_full = inputs
    temps_out, flows_out, final, peak, peak_step, lap_peaks, link_energy, heat_in, lane_flag, counts = out
    w_ptr, w_node, w_val = weights
    link_a, link_b, order, ptr, nbr = net.link_a, net.link_b, net.order, net.ptr, net.nbr
    links, cap = _configuration(net, blk)
    n = T0.shape[1]
    W = T0.shape[2]
    L = link_a.size
    N = h.size
    n_out = w_ptr.size - 1
    T = T0[blk].copy()
    Y, C, H, H0, R, r1, r2, tgt, q2, q3, pinv, f1, f2, f3, dfa, dfb, m, total = _lane_scratch(n, L, W)
    pos = np.empty((n, n), dtype=np.int64)
    A = np.empty((_pattern(n, order, ptr, nbr, pos), W))
    lp = np.empty((max(n_out, 1), W))
    flag = lane_flag[blk]
    sb = net.src[blk]
    pk, pks, le = peak[blk], peak_step[blk], link_energy[blk]
    e_in = np.zeros(W)
    href = np.empty(cap.seg_lo.shape)
    _reference_ramps(cap, href)
    pk[:, :] = T
    pks[:, :] = 0
    done = 0
    for lap in range(n_laps):
        last = lap == n_laps - 1
        _flows_lanes(T, bk_grid[0], drv_grid[0], links, f1, dfa, dfb, flag)
        rec = 0
        if last and record[0]:
            temps_out[blk, rec] = T
            flows_out[blk, rec] = f1
            rec += 1
        lp[:, :] = -math.inf
        _outputs_lanes(T, w_ptr, w_node, w_val, lp)
        for step in range(N):
            hn = h[step]
            coef = hn * D_WEIGHT
            hw = hn * W_WEIGHT
            _capacity_lanes(T, cap, href, C, H0, True)
            _net_inflow_lanes(f1, n, link_a, link_b, r1)
            _sources_lanes(sb, step, qs_mid, qs_full, q2, q3, e_in, total)
            _factor_lanes(A, pos, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, pinv, m, flag)
            # stage 1 (TR) from Y = T_n, whose enthalpy is H0
            for i in range(n):
                for c in range(W):
                    tgt[i, c] = H0[i, c] + coef * r1[i, c] + q2[i, c]
                    Y[i, c] = T[i, c]
            _flows_lanes(Y, bk_mid[step], drv_mid[step], links, f2, dfa, dfb, flag)
            _chord_lanes(Y, H0, tgt, coef, f2, dfa, dfb, R, A, pos, pinv, order, ptr, nbr, n, link_a, link_b)
            # stage 2 (BDF2) from Y = Y2
            _net_inflow_lanes(f2, n, link_a, link_b, r2)
            for i in range(n):
                for c in range(W):
                    tgt[i, c] = H0[i, c] + hw * (r1[i, c] + r2[i, c]) + q3[i, c]
            _flows_lanes(Y, bk_grid[step + 1], drv_grid[step + 1], links, f3, dfa, dfb, flag)
            _capacity_lanes(Y, cap, href, C, H, False)
            _chord_lanes(Y, H, tgt, coef, f3, dfa, dfb, R, A, pos, pinv, order, ptr, nbr, n, link_a, link_b)
            _capacity_lanes(Y, cap, href, C, H, False)
            _chord_lanes(Y, H, tgt, coef, f3, dfa, dfb, R, A, pos, pinv, order, ptr, nbr, n, link_a, link_b)
            _accept_step_lanes(hn, f1, f2, f3, le, Y, T, pk, pks, flag, done + step + 1)
            _outputs_lanes(T, w_ptr, w_node, w_val, lp)
            if last and record[step + 1]:
                temps_out[blk, rec] = T
                flows_out[blk, rec] = f1
                rec += 1
        for o in range(n_out):
            for c in range(W):
                lap_peaks[blk, lap, o, c] = lp[o, c]
        done += N
    # the accepted end state itself must lie on the tables (its flows are otherwise never looked up)
    _flows_lanes(T, bk_grid[N], drv_grid[N], links, f3, dfa, dfb, flag)
    final[blk] = T
    for c in range(W):
        heat_in[blk, c] = e_in[c]
        counts[blk, c] = done


@njit(cache=True, parallel=True, error_model="numpy")
def advance_lanes(T0, inputs, net, n_laps, weights, record, out):
    """All blocks, spread over the CPU cores (see the module notes for the shapes)."""
    for blk in prange(T0.shape[0]):
        _advance_block(blk, T0, inputs, net, n_laps, weights, record, out)
