"""The stage matrix of the compiled TR-BDF2 kernels: built, factored and solved.

The matrix diag(C) - coef D dF/dT of one configuration (``thermo.solver.kernel``) is factored
along a sparse elimination plan (``thermo.solver.elimination``: minimum-degree order, no pivoting,
the reciprocal pivots kept on the diagonal), with dense LU and partial pivoting as the fallback
when a pivot is weak. Compiled by numba and cached on disk, as the kernels are.
"""
from __future__ import annotations

import math

from numba import njit


@njit(cache=True, error_model="numpy")
def _lu_factor(A, piv):
    """In-place LU with partial pivoting of a small dense matrix; False if singular."""
    n = A.shape[0]
    for k in range(n):
        p = k
        big = abs(A[k, k])
        for r in range(k + 1, n):
            if abs(A[r, k]) > big:
                big = abs(A[r, k])
                p = r
        if big == 0.0 or not math.isfinite(big):
            return False
        piv[k] = p
        if p != k:
            for c in range(n):
                tmp = A[k, c]
                A[k, c] = A[p, c]
                A[p, c] = tmp
        inv = 1.0 / A[k, k]
        for r in range(k + 1, n):
            m = A[r, k] * inv
            A[r, k] = m
            if m != 0.0:
                for c in range(k + 1, n):
                    A[r, c] -= m * A[k, c]
    return True


@njit(cache=True, error_model="numpy")
def _lu_solve(A, piv, x):
    """Solve in place with the factors of ``_lu_factor``."""
    n = A.shape[0]
    for k in range(n):
        p = piv[k]
        if p != k:
            tmp = x[k]
            x[k] = x[p]
            x[p] = tmp
    for r in range(n):
        s = x[r]
        for c in range(r):
            s -= A[r, c] * x[c]
        x[r] = s
    for r in range(n - 1, -1, -1):
        s = x[r]
        for c in range(r + 1, n):
            s -= A[r, c] * x[c]
        x[r] = s / A[r, r]


@njit(cache=True, error_model="numpy")
def _sparse_factor(A, C, order, ptr, nbr):
    """In-place LU of A along an elimination plan (``thermo.solver.elimination``), no pivoting;
    the diagonal is left holding the reciprocal pivots (the solve multiplies, never divides).

    False if a pivot is not above half its node's heat capacity C [J/K] (for the diagonally
    dominant stage matrix every pivot is at least C; anything less means dominance is lost and
    the caller refactors densely with partial pivoting)."""
    for k in range(order.size):
        p = order[k]
        d = A[p, p]
        if not (d > 0.5 * C[p]):
            return False
        inv = 1.0 / d
        A[p, p] = inv
        for u in range(ptr[k], ptr[k + 1]):
            r = nbr[u]
            m = A[r, p] * inv
            A[r, p] = m
            for v in range(ptr[k], ptr[k + 1]):
                c = nbr[v]
                A[r, c] -= m * A[p, c]
    return True


@njit(cache=True, error_model="numpy")
def _sparse_solve(A, order, ptr, nbr, x):
    """Solve in place with the factors of ``_sparse_factor``."""
    for k in range(order.size):
        p = order[k]
        xp = x[p]
        for u in range(ptr[k], ptr[k + 1]):
            r = nbr[u]
            x[r] -= A[r, p] * xp
    for k in range(order.size - 1, -1, -1):
        p = order[k]
        s = x[p]
        for u in range(ptr[k], ptr[k + 1]):
            s -= A[p, nbr[u]] * x[nbr[u]]
        x[p] = s * A[p, p]


FACTOR_FAILED, FACTOR_SPARSE, FACTOR_DENSE = 0, 1, 2


@njit(cache=True, error_model="numpy")
def _factor(A, C, coef, n, link_a, link_b, dfa, dfb, order, ptr, nbr, piv):
    """Build and factor the stage matrix: sparse plan first, dense pivoted LU if a pivot is weak."""
    _newton_matrix(A, C, coef, n, link_a, link_b, dfa, dfb)
    if _sparse_factor(A, C, order, ptr, nbr):
        return FACTOR_SPARSE
    _newton_matrix(A, C, coef, n, link_a, link_b, dfa, dfb)
    if _lu_factor(A, piv):
        return FACTOR_DENSE
    return FACTOR_FAILED


@njit(cache=True, error_model="numpy")
def _solve(mode, A, piv, order, ptr, nbr, x):
    """Solve with the factors of ``_factor`` (``mode`` its return value)."""
    if mode == FACTOR_SPARSE:
        _sparse_solve(A, order, ptr, nbr, x)
    else:
        _lu_solve(A, piv, x)


@njit(cache=True, error_model="numpy")
def _newton_matrix(A, C, coef, n, link_a, link_b, dfa, dfb):
    """A = diag(C) - coef D dF/dT: the stage matrix (D = -1 at a link's first end, +1 at its second)."""
    A[:, :] = 0.0
    for i in range(n):
        A[i, i] = C[i]
    for l in range(link_a.size):
        a = link_a[l]
        b = link_b[l]
        A[a, a] += coef * dfa[l]
        if b < n:
            A[a, b] += coef * dfb[l]
            A[b, a] -= coef * dfa[l]
            A[b, b] -= coef * dfb[l]
