"""The kernel's linearised mode: each TR-BDF2 stage linearised once, all laps of a run in one call.

One configuration at a time (``thermo.solver.kernel_lanes`` is the same scheme for batches, with
configurations side by side). Per step of length h (weights as in ``thermo.solver.kernel``):

- the stage matrix diag(C(T_n)) - h d D dF/dT is built from the slopes of the last flow
  evaluation and factored once (sparse elimination plan, dense fallback);
- stage 1 (TR, to t_n + gamma h): the flows at T_n with the stage's inputs, one linear solve
  from T_n (whose enthalpy is already known), the flows updated to first order;
- stage 2 (BDF2, to t_n + h): the flows at Y2 with the step-end inputs, one linear solve from Y2
  with its exact enthalpy, then one chord correction with the exact enthalpy H(Y) and the
  linearised flows.

Two flow evaluations, one factorisation, three solves and three capacity evaluations a step. The
exact-enthalpy corrections remove the c(T) linearisation error that would otherwise build up over
a braking zone (0.6 K measured without them); one for stage 1 as well was measured to change the
demo's 30-lap peaks by about 0.001 K and is not made. Linearising H(Y2) as well (one capacity
evaluation fewer, about 5 % faster) raised the energy-balance error by half (7e-6 to 1.1e-5 on a
demo braking sequence) and is not done either. The rest of the error is that of
linearising radiation and G(T) once per stage: peaks within 0.005 K of full Newton on the demo
corner; the energy balance closes to it (about 1e-5 relative on the demo), not to round-off.

``n_laps``: the grid is driven that many times carrying the state (a race of identical laps); the
flows are evaluated afresh at each lap's start, each lap's peak of every output (a weighted node
sum) is kept, and after the last step the end state's own table lookup is checked.

Why this step loop is not merged with the full-Newton one (``kernel._advance_one``; issue 18):
the two share their skeleton (set-up, sources, the stage matrix at T_n, checks, energies, peaks,
records) and differ only in how the two stages are solved. One loop for both, the mode a run-time
flag, measured 3-7 % slower a step (demo corner, one core, ``kernel.advance`` and this module's
call timed beside the separate loops in one session, minimum of 84 runs each: full Newton 4.72
against 4.59 us, linearised 3.10 against 2.90 us). Compiled once per mode (the mode a constant
of a closure, so each compiled loop lacks the other's branch), the linearised loop was level
(2.89 against 2.84 us) but full Newton still about 5 % slower (4.87 against 4.6-4.9 us; the lap
loop and the output peaks it then carries). So the loops stay apart; what they share is in
``thermo.solver.kernel`` (flows, capacities, factorisation, residual, sources, scratch).
"""
from __future__ import annotations

import math

import numpy as np
from numba import njit, prange

from thermo.solver.kernel import (D_WEIGHT, STATUS_NEWTON, STATUS_NONFINITE, STATUS_OK, STATUS_OUTSIDE_GRID,
                                  W_WEIGHT, _capacity_enthalpy, _configuration, _flow_update, _flows, _net_inflow,
                                  _reference_ramps, _residual, _scratch, _sources)
from thermo.solver.stage_matrix import FACTOR_FAILED, _factor, _solve


@njit(cache=True, error_model="numpy")
def _linear_stage(Y, H, tgt, coef, fx, dfa, dfb, R, mode, A, piv, order, ptr, nbr, n, link_a, link_b):
    """One chord correction of a stage: R = -(H(Y) - coef D f - target) solved, Y and f updated."""
    _residual(H, tgt, coef, fx, n, link_a, link_b, R)
    for i in range(n):
        R[i] = -R[i]
    _solve(mode, A, piv, order, ptr, nbr, R)
    for i in range(n):
        Y[i] += R[i]
    _flow_update(fx, dfa, dfb, R, n, link_a, link_b)


@njit(cache=True, error_model="numpy")
def _outputs_peak(T, w_ptr, w_node, w_val, lap_peak):
    """Raise each output's running peak to its value at T (outputs are weighted node sums) [K]."""
    for o in range(w_ptr.size - 1):
        v = 0.0
        for j in range(w_ptr[o], w_ptr[o + 1]):
            v += w_val[j] * T[w_node[j]]
        if v > lap_peak[o]:
            lap_peak[o] = v


@njit(cache=True, error_model="numpy")
def _advance_linearised_one(b, T0, inputs, net, n_laps, weights, record, out, lap_peaks):
    """Configuration b driven over the grid ``n_laps`` times in the linearised mode.

    Each stage: the flows at its first guess (T_n for Y2, Y2 for Y3) with the matrix at T_n and
    one linear solve; the second stage then one more chord correction with the exact enthalpy and
    the linearised flows (see the module notes). The first stage's guess is T_n, whose enthalpy
    H0 is already known."""
    _, h, bk_grid, drv_grid, bk_mid, drv_mid, qs_mid, qs_full = inputs
    temps_out, flows_out, final, peak, peak_step, link_energy, heat_in, status, fail_step, counts = out
    w_ptr, w_node, w_val = weights
    link_a, link_b, order, ptr, nbr = net.link_a, net.link_b, net.order, net.ptr, net.nbr
    links, cap = _configuration(net, b)
    src = net.src[b]
    n = T0.shape[1]
    L = link_a.size
    N = h.size
    n_out = w_ptr.size - 1
    T = T0[b].copy()
    (Y, C, H, H0, R, r1, r2, tgt, A, piv, f1, f2, f3, dfa, dfb, q2, q3,
     ax_i, ax_f, ax_ok) = _scratch(n, L, drv_grid.shape[1] + bk_grid.shape[1])
    lp = np.empty(max(n_out, 1))
    href = np.empty(cap.seg_lo.size)
    _reference_ramps(cap, href)
    nf = 0
    nj = 0
    st = STATUS_OK
    for i in range(n):
        peak[b, i] = T[i]
        peak_step[b, i] = 0
    e_in = 0.0
    done = 0
    step = 0
    for lap in range(n_laps):
        last = lap == n_laps - 1
        if not _flows(T, bk_grid[0], drv_grid[0], links, f1, dfa, dfb, ax_i, ax_f, ax_ok):
            st = STATUS_OUTSIDE_GRID
        nf += 1
        rec = 0
        if last and record[0]:
            temps_out[b, rec, :] = T
            flows_out[b, rec, :] = f1
            rec += 1
        for o in range(n_out):
            lp[o] = -math.inf
        _outputs_peak(T, w_ptr, w_node, w_val, lp)
        step = 0
        while step < N and st == STATUS_OK:
            hn = h[step]
            coef = hn * D_WEIGHT
            _capacity_enthalpy(T, cap, href, C, H0, True)
            _net_inflow(f1, n, link_a, link_b, r1)
            e_in += _sources(src, step, qs_mid, qs_full, q2, q3)
            mode = _factor(A, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, piv)
            nj += 1
            if mode == FACTOR_FAILED:
                st = STATUS_NEWTON
                break
            # stage 1 (TR), from Y = T_n
            for i in range(n):
                tgt[i] = H0[i] + coef * r1[i] + q2[i]
                Y[i] = T[i]
            inside = _flows(Y, bk_mid[step], drv_mid[step], links, f2, dfa, dfb, ax_i, ax_f, ax_ok)
            _linear_stage(Y, H0, tgt, coef, f2, dfa, dfb, R, mode, A, piv, order, ptr, nbr, n, link_a, link_b)
            # stage 2 (BDF2), from Y = Y2
            _net_inflow(f2, n, link_a, link_b, r2)
            for i in range(n):
                tgt[i] = H0[i] + hn * W_WEIGHT * (r1[i] + r2[i]) + q3[i]
            inside2 = _flows(Y, bk_grid[step + 1], drv_grid[step + 1], links, f3, dfa, dfb, ax_i, ax_f, ax_ok)
            nf += 2
            _capacity_enthalpy(Y, cap, href, C, H, False)
            _linear_stage(Y, H, tgt, coef, f3, dfa, dfb, R, mode, A, piv, order, ptr, nbr, n, link_a, link_b)
            _capacity_enthalpy(Y, cap, href, C, H, False)
            _linear_stage(Y, H, tgt, coef, f3, dfa, dfb, R, mode, A, piv, order, ptr, nbr, n, link_a, link_b)
            if not (inside and inside2):
                st = STATUS_OUTSIDE_GRID
                break
            for i in range(n):
                if not math.isfinite(Y[i]):
                    st = STATUS_NONFINITE
            if st != STATUS_OK:
                break
            for l in range(L):
                link_energy[b, l] += hn * (W_WEIGHT * (f1[l] + f2[l]) + D_WEIGHT * f3[l])
                f1[l] = f3[l]
            for i in range(n):
                T[i] = Y[i]
                if T[i] > peak[b, i]:
                    peak[b, i] = T[i]
                    peak_step[b, i] = done + step + 1
            _outputs_peak(T, w_ptr, w_node, w_val, lp)
            step += 1
            if last and record[step]:
                temps_out[b, rec, :] = T
                flows_out[b, rec, :] = f1
                rec += 1
        if st != STATUS_OK:
            break
        for o in range(n_out):
            lap_peaks[b, lap, o] = lp[o]
        done += N
    if st == STATUS_OK and not _flows(T, bk_grid[N], drv_grid[N], links, f3, dfa, dfb, ax_i, ax_f, ax_ok):
        st = STATUS_OUTSIDE_GRID        # the accepted end state itself lies off a table
        done -= N
        step = N - 1
    final[b, :] = T
    heat_in[b] = e_in
    status[b] = st
    fail_step[b] = done if st == STATUS_OK else done + step
    counts[b, 0] = nf
    counts[b, 1] = nj


@njit(cache=True, error_model="numpy", nogil=True)
def advance_linearised(T0, inputs, net, n_laps, weights, record, out, lap_peaks):
    """The linearised mode for B configurations, one after another (see ``ARGS_DOC``); releases the GIL."""
    for b in range(T0.shape[0]):
        _advance_linearised_one(b, T0, inputs, net, n_laps, weights, record, out, lap_peaks)


@njit(cache=True, parallel=True, error_model="numpy")
def advance_linearised_parallel(T0, inputs, net, n_laps, weights, record, out, lap_peaks):
    """``advance_linearised`` with the configurations spread over the CPU cores."""
    for b in prange(T0.shape[0]):
        _advance_linearised_one(b, T0, inputs, net, n_laps, weights, record, out, lap_peaks)
