"""Compiled TR-BDF2 kernel: many configurations of one network topology, stepped on one time grid.

This is the numba-compiled core of method 'fast' (``thermo.solver.fast``) and of batched runs
(``thermo.solver.batch``). A single run is a batch of one. Everything the kernel needs is a plain
array (``thermo.solver.kernel_arrays.KernelNetwork``, passed as the namedtuples below); the
schedule's signals are sampled or integrated beforehand, in numpy, on the grid and at the TR-BDF2
stage times, so the kernel never calls back into Python.

Scheme (per step of length h, gamma = 2 - sqrt(2), d = gamma/2, w = sqrt(2)/4), on node enthalpies:

    H(Y2) = H(T_n) + h d (r(T_n) + r(Y2)) + Q(t_n, t_n + gamma h)
    H(Y3) = H(T_n) + h (w r(T_n) + w r(Y2) + d r(Y3)) + Q(t_n, t_n + h),    T_{n+1} = Y3

r = D f the net link flow into each node, Q the exact integral of the piecewise linear sources
(heat input averaged over each stage, never sampled at its ends). Both implicit stages share the
matrix diag(C) - h d D dF/dT; it is factored once per step at T_n (simplified Newton) and again at
the current iterate if Newton has not converged within ``REFACTOR_AFTER`` iterations. The
Jacobian is analytic: conduction G, radiation 4 c T^3, convection m G plus m (T_a - T_b) dG/dT from
the trilinear table (the table's own derivative, so the Newton matrix is exact for the model;
m is a per-configuration multiplier, 1 unless a sweep scales it).

Convergence (``newton_converged``): with the scaled correction e = max_i |dY_i| / (atol_k + rtol |Y_i|),
accept when e <= 0.1, or, from a stage's second iteration, when the corrections shrink at a rate
theta = e_k / e_(k-1) < 1 such that those still to come, at most theta / (1 - theta) e_k, are
within 0.01 (Hairer & Wanner 1996, IV.8): the matrix is factored at T_n, so the iteration converges
linearly, and the rate saves the iteration that would only confirm it (4.4 flow evaluations a
step instead of 6.1 on the 24-hour demo; peaks and lap extremes moved by less than 1e-4 K, the
energy balance's relative error from 6e-9 to 1e-7). Link energies are
accumulated with the scheme's weights, h (w f1 + w f2 + d f3), so heat in = stored + lost to the
Newton residual.

The stage matrix is factored (``thermo.solver.stage_matrix``) along a sparse elimination plan
(``thermo.solver.elimination``: minimum-degree order, no pivoting, the reciprocal pivots kept on
the diagonal), with dense LU and partial pivoting as the fallback when a pivot is weak. Table axes of the drivers and boundary
temperatures are located once per flow evaluation, not once per link.

The linearised mode for throughput runs (batches, races, the settled lap's coarse map) is in
``thermo.solver.kernel_linearised`` (one configuration) and ``thermo.solver.kernel_lanes``
(configurations side by side); they share this module's building blocks. 'fast' itself is the
full-Newton scheme here.

Status codes per configuration: 0 success, 1 Newton did not converge, 2 a convection lookup fell
outside its table grid, 3 non-finite temperatures; ``fail_step`` holds the step index.

numba compiles this on first use (``error_model="numpy"``: no zero-division checks in the loops)
and caches the machine code on disk (``cache=True``); with
``NUMBA_DISABLE_JIT=1`` the same code runs as plain Python (correct, about 1000x slower).

References
----------
R. E. Bank et al., "Transient simulation of silicon devices and circuits", IEEE Trans. CAD 4 (1985).
M. E. Hosea, L. F. Shampine, "Analysis and implementation of TR-BDF2", Appl. Numer. Math. 20 (1996).
E. Hairer, G. Wanner, "Solving Ordinary Differential Equations II: Stiff and Differential-Algebraic
Problems", 2nd ed., Springer (1996), section IV.8 (stopping criterion of the simplified Newton iteration).
"""
from __future__ import annotations

import math
import types
from collections import namedtuple
from typing import NamedTuple

import numpy as np
from numba import njit, prange

from thermo.network import laws
from thermo.solver.stage_matrix import FACTOR_FAILED, _factor, _solve

GAMMA = 2.0 - math.sqrt(2.0)
D_WEIGHT = GAMMA / 2.0
W_WEIGHT = math.sqrt(2.0) / 4.0
MAX_NEWTON = 12
REFACTOR_AFTER = 3
NEWTON_TOLERANCE = 0.1   # accept when the last correction is below this share of atol_k + rtol |Y|
NEWTON_RATE_TOLERANCE = 0.01   # ... or the corrections still to come, estimated from their rate, below this share

KIND_CONDUCTION, KIND_RADIATION, KIND_CONVECTION = 0, 1, 2
STATUS_OK, STATUS_NEWTON, STATUS_OUTSIDE_GRID, STATUS_NONFINITE = 0, 1, 2, 3


# The kernels' arguments, grouped (numba reads a namedtuple of arrays as a struct; measured no slower
# than the arrays passed one by one, see DEVELOPERS.md "Speed work"). Shapes in ``ARGS_DOC``.
class KernelInputs(NamedTuple):
    """A schedule's signals on one time grid: samples at grid and stage times, source integrals [J]."""

    grid: np.ndarray        # (N+1,) [s]
    h: np.ndarray           # (N,) [s]
    bk_grid: np.ndarray     # (N+1, n_boundaries) [K]
    drv_grid: np.ndarray    # (N+1, n_drivers)
    bk_mid: np.ndarray      # (N, n_boundaries) at t_n + gamma h [K]
    drv_mid: np.ndarray
    qs_mid: np.ndarray      # (N, n_signals) integral of each source signal over [t_n, t_n + gamma h] [J]
    qs_full: np.ndarray     # (N, n_signals) over [t_n, t_n+1] [J]


class KernelResult(NamedTuple):
    """What the one-configuration kernels write for B configurations (allocated by the caller)."""

    temps: np.ndarray       # (B, n_rec, n) [K] at the recorded grid points
    flows: np.ndarray       # (B, n_rec, L) [W]; (B, 0, L): not kept (``_advance_one``)
    final: np.ndarray       # (B, n) [K]
    peak: np.ndarray        # (B, n) [K]
    peak_step: np.ndarray   # (B, n) grid index of each peak
    link_energy: np.ndarray  # (B, L) [J]
    heat_in: np.ndarray     # (B,) [J]
    status: np.ndarray      # (B,) STATUS_*
    fail_step: np.ndarray   # (B,)
    counts: np.ndarray      # (B, 2) flow and matrix evaluations


# a batch of configurations as the kernels read it (``kernel_arrays.KernelNetwork.arrays``): shared
# arrays, and per-configuration rows (B, ...) (the lane kernel: blocks (K, ..., W), tables flattened)
NetworkArrays = namedtuple("NetworkArrays", (
    "link_a", "link_b", "kind", "par", "conv_slot", "conv_drv", "tables", "tix", "gp", "sliced", "slot_sliced",
    "six", "mass", "base", "seg_start", "seg_lo", "seg_hi", "seg_slope", "t_ref", "src", "order", "ptr", "nbr"))
# one configuration's (or one lane block's) rows: what ``_flows`` and ``_capacity_enthalpy`` read
Links = namedtuple("Links", ("n", "link_a", "link_b", "kind", "par", "conv_slot", "conv_drv", "tables", "tix", "gp",
                             "sliced", "slot_sliced", "six"))
Capacities = namedtuple("Capacities", ("mass", "base", "seg_start", "seg_lo", "seg_hi", "seg_slope", "t_ref"))


def _compile_laws(names):
    """The network's laws (``thermo.network.laws``) compiled: the very functions the numpy assembler
    calls, each given a namespace in which the laws it calls are compiled too.

    On scalars numpy's ``maximum``/``minimum`` are taken as Python's ``max``/``min``: equal for every
    number (they differ only in how a NaN propagates, and a NaN state fails the step either way);
    numpy's NaN handling measured 5-10 % of a kernel step (demo corner, one core). The laws'
    machine code is cached with ``laws.py``: after changing this namespace, delete the cache files
    (see the notes of ``thermo.network.laws``)."""
    namespace = dict(vars(laws), maximum=max, minimum=min)
    for name in names:
        fn = getattr(laws, name)
        namespace[name] = njit(cache=True, error_model="numpy")(types.FunctionType(fn.__code__, namespace, name))
    return [namespace[name] for name in names]


(conduction_flow, radiation_flow, convection_flow, bilinear, trilinear, trilinear_slope_k,
 capacity_segment) = _compile_laws(("conduction_flow", "radiation_flow", "convection_flow", "bilinear", "trilinear",
                                    "trilinear_slope_k", "capacity_segment"))


@njit(cache=True, error_model="numpy")
def _axis(value, lo, inv_step, n):
    """Cell index, fraction in the cell, and whether ``value`` lies on the axis (1/step given)."""
    x = (value - lo) * inv_step
    inside = x >= 0.0 and x <= n - 1
    i = int(math.floor(x))
    if i < 0:
        i = 0
    if i > n - 2:
        i = n - 2
    fr = x - i
    if fr < 0.0:
        fr = 0.0
    if fr > 1.0:
        fr = 1.0
    return i, fr, inside


@njit(cache=True, error_model="numpy")
def _trilinear(tables, t, inv_j, inv_k, i, fi, j, fj, k, fk):
    """G [W/K] of table t in cell (i, j, k) at fractions (fi, fj, fk), and dG/dT_a, dG/dT_b [W/K^2]."""
    a000, a001 = tables[t, i, j, k], tables[t, i, j, k + 1]
    a010, a011 = tables[t, i, j + 1, k], tables[t, i, j + 1, k + 1]
    a100, a101 = tables[t, i + 1, j, k], tables[t, i + 1, j, k + 1]
    a110, a111 = tables[t, i + 1, j + 1, k], tables[t, i + 1, j + 1, k + 1]
    g, dj = trilinear(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj, fk)
    dk = trilinear_slope_k(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj)
    return g, dj * inv_j, dk * inv_k


@njit(cache=True, error_model="numpy")
def _flows(T, bk, drv, links, f, dfa, dfb, ax_i, ax_f, ax_ok):
    """Link flows f [W] and their slopes at both ends [W/K] of one configuration (``Links``); False if
    a lookup left the grid.

    The table axis of each driver and of each boundary temperature is located once per call
    (scratch ``ax_i``, ``ax_f``, ``ax_ok`` of length n_drivers + n_boundaries), not once per link.
    A slot whose boundary temperature is constant over the run (``slot_sliced``) reads its table
    already interpolated along the boundary axis (``sliced`` (P, n_driver, n_node) flattened,
    ``six`` the slice of each slot; see ``KernelNetwork.boundary_slices``): the same arithmetic,
    four loads instead of eight, and no dG/dT_b (a boundary's slope never enters the matrix)."""
    n, link_a, link_b, kind, par, conv_slot, conv_drv, tables, tix, gp, sliced, slot_sliced, six = links
    ok = True
    nd = drv.size
    inv_i, inv_j, inv_k = 1.0 / gp[1], 1.0 / gp[4], 1.0 / gp[7]
    for d in range(nd):
        ax_i[d], ax_f[d], ax_ok[d] = _axis(drv[d], gp[0], inv_i, int(gp[2]))
    for q in range(bk.size):
        ax_i[nd + q], ax_f[nd + q], ax_ok[nd + q] = _axis(bk[q], gp[6], inv_k, int(gp[8]))
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        ta = T[a]
        tb = T[b] if b < n else bk[b - n]
        kd = kind[l]
        if kd == 0:
            f[l], dfa[l], dfb[l] = conduction_flow(par[l], ta, tb)
        elif kd == 1:
            f[l], dfa[l], dfb[l] = radiation_flow(par[l], ta, tb)
        else:
            s = conv_slot[l]
            dd = conv_drv[s]
            if dd >= 0:
                i, fi, oki = ax_i[dd], ax_f[dd], ax_ok[dd]
            else:
                i, fi, oki = _axis(0.0, gp[0], inv_i, int(gp[2]))
            j, fj, okj = _axis(ta, gp[3], inv_j, int(gp[5]))
            if slot_sliced[s]:
                if not (oki and okj):
                    ok = False
                n_j = int(gp[5])
                o = (six[s] * int(gp[2]) + i) * n_j + j
                g, ga = bilinear(sliced[o], sliced[o + 1], sliced[o + n_j], sliced[o + n_j + 1], fi, fj)
                f[l], dfa[l], dfb[l] = convection_flow(par[l], g, ga * inv_j, 0.0, ta, tb)
                continue
            if b >= n:
                k, fk, okk = ax_i[nd + b - n], ax_f[nd + b - n], ax_ok[nd + b - n]
            else:
                k, fk, okk = _axis(tb, gp[6], inv_k, int(gp[8]))
            if not (oki and okj and okk):
                ok = False
            g, ga, gb = _trilinear(tables, tix[s], inv_j, inv_k, i, fi, j, fj, k, fk)
            f[l], dfa[l], dfb[l] = convection_flow(par[l], g, ga, gb, ta, tb)
    return ok


@njit(cache=True, error_model="numpy")
def _reference_ramps(capacities, href):
    """Each capacity segment's ramp at the reference temperature (``href`` (S,)), constant over a run."""
    for s in range(capacities.seg_lo.size):
        href[s] = capacity_segment(capacities.t_ref, capacities.seg_lo[s], capacities.seg_hi[s])[1]


@njit(cache=True, error_model="numpy")
def _capacity_enthalpy(T, capacities, href, C, H, with_c):
    """Enthalpy H relative to t_ref [J] and, if ``with_c``, heat capacity C [J/K] of every node
    (``Capacities`` of one configuration; ``thermo.network.laws.capacity_segment``, as CapacityTable;
    ``href`` from ``_reference_ramps``)."""
    mass, base, seg_start, seg_lo, seg_hi, seg_slope, t_ref = capacities
    for i in range(T.size):
        c = base[i]
        h = base[i] * (T[i] - t_ref)
        for s in range(seg_start[i], seg_start[i + 1]):
            x, ramp = capacity_segment(T[i], seg_lo[s], seg_hi[s])
            c += seg_slope[s] * x
            h += seg_slope[s] * (ramp - href[s])
        if with_c:
            C[i] = mass[i] * c
        H[i] = mass[i] * h


@njit(cache=True, error_model="numpy")
def _residual(H, target, coef, f, n, link_a, link_b, R):
    """R = H(Y) - coef D f(Y) - target [J]."""
    for i in range(n):
        R[i] = H[i] - target[i]
    for l in range(link_a.size):
        R[link_a[l]] += coef * f[l]
        b = link_b[l]
        if b < n:
            R[b] -= coef * f[l]


@njit(cache=True, error_model="numpy")
def _net_inflow(f, n, link_a, link_b, r):
    """r = D f, the net link flow into each node [W]."""
    r[:] = 0.0
    for l in range(link_a.size):
        r[link_a[l]] -= f[l]
        b = link_b[l]
        if b < n:
            r[b] += f[l]


ARGS_DOC = """Shapes: T0 (B, n); ``KernelInputs``: h (N,); bk_grid (N+1, nb);
    drv_grid (N+1, nd); bk_mid (N, nb); drv_mid (N, nd); qs_mid, qs_full (N, n_signals) source-signal integrals [J].
    ``NetworkArrays``: src (B, n, n_signals); par (B, L); tix (B, n_conv) index into tables (U, n_driver,
    n_node, n_boundary); sliced, slot_sliced (n_conv,), six (B, n_conv) the tables pre-interpolated along
    constant boundary temperatures (``_flows``); mass, base (B, n); seg_lo, seg_hi, seg_slope (B, S);
    order, ptr, nbr the elimination plan (``thermo.solver.elimination``). max_newton: iterations per stage;
    record (N+1,) bool: grid points written to ``KernelResult``: temps (B, n_rec, n) and flows (B, n_rec, L)
    (the full-Newton kernel keeps none if flows has no rows);
    final, peak (B, n); peak_step (B, n) grid index of each peak; link_energy (B, L); heat_in, status,
    fail_step (B,); counts (B, 2) flow and matrix evaluations. The linearised entry points add n_laps (the
    grid is driven that many times, carrying the state; record applies to the last lap, peak_step counts
    steps over all laps, as does fail_step), weights = (w_ptr (n_out+1,), w_node, w_val) (sparse output
    weights: output o is sum of w_val[j] T[w_node[j]] for j in w_ptr[o]:w_ptr[o+1]) and lap_peaks
    (B, n_laps, n_out)."""


@njit(cache=True, error_model="numpy")
def _configuration(net, b):
    """``Links`` and ``Capacities`` of configuration (or lane block) b of ``NetworkArrays``."""
    links = Links(net.mass.shape[1], net.link_a, net.link_b, net.kind, net.par[b], net.conv_slot, net.conv_drv,
                  net.tables, net.tix[b], net.gp, net.sliced, net.slot_sliced, net.six[b])
    capacities = Capacities(net.mass[b], net.base[b], net.seg_start, net.seg_lo[b], net.seg_hi[b], net.seg_slope[b],
                            net.t_ref)
    return links, capacities


@njit(cache=True, error_model="numpy")
def _sources(src, step, qs_mid, qs_full, q2, q3):
    """Heat into each node over the first stage and the whole step [J] (``src`` (n, n_signals) of one
    configuration); returns the step's total."""
    n = q2.size
    n_sig = qs_full.shape[1]
    total = 0.0
    for i in range(n):
        s2 = 0.0
        s3 = 0.0
        for k in range(n_sig):
            s2 += src[i, k] * qs_mid[step, k]
            s3 += src[i, k] * qs_full[step, k]
        q2[i] = s2
        q3[i] = s3
        total += s3
    return total


@njit(cache=True, error_model="numpy")
def _flow_update(fx, dfa, dfb, dY, n, link_a, link_b):
    """First-order change of the link flows for a state change dY [W]."""
    for l in range(link_a.size):
        dl = dfa[l] * dY[link_a[l]]
        if link_b[l] < n:
            dl += dfb[l] * dY[link_b[l]]
        fx[l] += dl


@njit(cache=True, error_model="numpy")
def _scratch(n, L, n_axes):
    """Work arrays of one configuration's run: node vectors, the stage matrix and its pivots, link
    flows and slopes, and the table-axis scratch of ``_flows``."""
    e = lambda: np.empty(n)
    return (e(), e(), e(), e(), e(), e(), e(), e(), np.empty((n, n)), np.zeros(n, dtype=np.int64),
            np.empty(L), np.empty(L), np.empty(L), np.empty(L), np.empty(L), e(), e(),
            np.zeros(n_axes, dtype=np.int64), np.zeros(n_axes), np.zeros(n_axes, dtype=np.bool_))


@njit(cache=True, error_model="numpy")
def newton_converged(worst, previous, it):
    """Whether a stage's Newton iteration ``it`` (from 0) has converged: its scaled correction
    ``worst`` (max |dY_i| / (atol + rtol |Y_i|)) within ``NEWTON_TOLERANCE``, or, from the second
    iteration, the corrections shrinking at the rate theta = worst / ``previous`` < 1 such that the
    ones still to come, at most theta / (1 - theta) worst (a geometric series), are within
    ``NEWTON_RATE_TOLERANCE`` (Hairer & Wanner 1996, section IV.8, their kappa; a tenth of the
    plain test's share, so that the accepted states stay within about 1e-4 K of the iteration
    run to the plain test)."""
    if worst <= NEWTON_TOLERANCE:
        return True
    if it == 0:
        return False
    theta = worst / previous
    return theta < 1.0 and theta * worst <= NEWTON_RATE_TOLERANCE * (1.0 - theta)


@njit(cache=True, error_model="numpy")
def _advance_one(b, T0, inputs, net, rtol, atol, max_newton, record, out):
    """Configuration b over the whole grid, full Newton on each stage."""
    _, h, bk_grid, drv_grid, bk_mid, drv_mid, qs_mid, qs_full = inputs
    temps_out, flows_out, final, peak, peak_step, link_energy, heat_in, status, fail_step, counts = out
    link_a, link_b, order, ptr, nbr = net.link_a, net.link_b, net.order, net.ptr, net.nbr
    links, cap = _configuration(net, b)
    src = net.src[b]
    n = T0.shape[1]
    L = link_a.size
    N = h.size
    T = T0[b].copy()
    (Y, C, H, H0, R, r1, r2, tgt, A, piv, f1, f2, f3, dfa, dfb, q2, q3,
     ax_i, ax_f, ax_ok) = _scratch(n, L, drv_grid.shape[1] + bk_grid.shape[1])
    href = np.empty(cap.seg_lo.size)
    _reference_ramps(cap, href)
    nf = 1
    nj = 0
    st = STATUS_OK
    if not _flows(T, bk_grid[0], drv_grid[0], links, f1, dfa, dfb, ax_i, ax_f, ax_ok):
        st = STATUS_OUTSIDE_GRID
    rec = 0
    keep_flows = flows_out.shape[1] > 0     # no rows: the caller keeps no link flows
    if record[0]:
        temps_out[b, rec, :] = T
        if keep_flows:
            flows_out[b, rec, :] = f1
        rec += 1
    for i in range(n):
        peak[b, i] = T[i]
        peak_step[b, i] = 0
    e_in = 0.0
    step = 0
    while step < N and st == STATUS_OK:
        hn = h[step]
        coef = hn * D_WEIGHT
        _capacity_enthalpy(T, cap, href, C, H0, True)
        _net_inflow(f1, n, link_a, link_b, r1)
        e_in += _sources(src, step, qs_mid, qs_full, q2, q3)
        # the stage matrix at T_n (its slopes are those of the last flow evaluation) serves both stages
        mode = _factor(A, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, piv)
        nj += 1
        if mode == FACTOR_FAILED:
            st = STATUS_NEWTON
            break
        have_lu = True
        for stage in range(2):
            if stage == 0:
                for i in range(n):
                    tgt[i] = H0[i] + coef * r1[i] + q2[i]
                    Y[i] = T[i]
                bkx = bk_mid[step]
                dvx = drv_mid[step]
                fx = f2
            else:
                # Y2 is the first guess for Y3 (an extrapolated guess can leave the tables)
                _net_inflow(f2, n, link_a, link_b, r2)
                for i in range(n):
                    tgt[i] = H0[i] + hn * W_WEIGHT * (r1[i] + r2[i]) + q3[i]
                bkx = bk_grid[step + 1]
                dvx = drv_grid[step + 1]
                fx = f3
            converged = False
            previous = math.inf
            for it in range(max_newton):
                inside = _flows(Y, bkx, dvx, links, fx, dfa, dfb, ax_i, ax_f, ax_ok)
                nf += 1
                _capacity_enthalpy(Y, cap, href, C, H, not have_lu)     # C only for a refactorisation
                _residual(H, tgt, coef, fx, n, link_a, link_b, R)
                if not have_lu:
                    mode = _factor(A, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, piv)
                    nj += 1
                    if mode == FACTOR_FAILED:
                        st = STATUS_NEWTON
                        break
                    have_lu = True
                for i in range(n):
                    R[i] = -R[i]
                _solve(mode, A, piv, order, ptr, nbr, R)
                worst = 0.0
                for i in range(n):
                    e = abs(R[i]) / (atol + rtol * abs(Y[i] + R[i]))
                    if not (e <= worst):
                        worst = e if math.isfinite(e) else math.inf
                for i in range(n):
                    Y[i] += R[i]
                if newton_converged(worst, previous, it):
                    converged = True
                    # the corrections still to come are within the tolerance: the flows of the accepted
                    # Y are those just evaluated plus their first-order change (error O(dY^2))
                    _flow_update(fx, dfa, dfb, R, n, link_a, link_b)
                    if not inside:
                        st = STATUS_OUTSIDE_GRID
                    break
                previous = worst
                if it + 1 == REFACTOR_AFTER:
                    have_lu = False
            if st != STATUS_OK:
                break
            if not converged:
                st = STATUS_NEWTON
                break
        if st != STATUS_OK:
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
                peak_step[b, i] = step + 1
        step += 1
        if record[step]:
            temps_out[b, rec, :] = T
            if keep_flows:
                flows_out[b, rec, :] = f1
            rec += 1
    if st == STATUS_OK and not _flows(T, bk_grid[N], drv_grid[N], links, f3, dfa, dfb, ax_i, ax_f, ax_ok):
        st = STATUS_OUTSIDE_GRID        # the accepted end state itself lies off a table
        step = N - 1
    final[b, :] = T
    heat_in[b] = e_in
    status[b] = st
    fail_step[b] = step
    counts[b, 0] = nf
    counts[b, 1] = nj


@njit(cache=True, error_model="numpy", nogil=True)
def advance(T0, inputs, net, rtol, atol, max_newton, record, out):
    """Integrate B configurations over the grid, one after another (see ``ARGS_DOC``).

    Releases the GIL, so independent runs (the corners of a race) can go in parallel threads."""
    for b in range(T0.shape[0]):
        _advance_one(b, T0, inputs, net, rtol, atol, max_newton, record, out)


@njit(cache=True, parallel=True, error_model="numpy")
def advance_parallel(T0, inputs, net, rtol, atol, max_newton, record, out):
    """``advance`` with the configurations spread over the CPU cores (for batches)."""
    for b in prange(T0.shape[0]):
        _advance_one(b, T0, inputs, net, rtol, atol, max_newton, record, out)
