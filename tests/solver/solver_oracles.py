"""Exact solutions used as test oracles for the network solvers (tests only).

A linear network written by hand as dT/dt = A T + b(t), with b piecewise linear in time, is
solved exactly over each linear piece by the matrix exponential of an augmented matrix:
C. F. Van Loan, "Computing integrals involving the matrix exponential", IEEE Trans. Automatic
Control 23 (1978) 395-404; scipy.linalg.expm (Al-Mohy & Higham 2009) evaluates it.
"""
import numpy as np
from scipy.linalg import expm


def linear_piecewise_exact(A, b_at, times, T0):
    """Exact T at ``times`` for dT/dt = A T + b(t), b linear between consecutive ``times``.

    ``b_at(t)`` returns b at a sample time. Returns an array (len(times), n).
    """
    A = np.asarray(A, dtype=float)
    n = A.shape[0]
    out = [np.array(T0, dtype=float)]
    for t0, t1 in zip(times[:-1], times[1:]):
        h = t1 - t0
        b0, b1 = np.asarray(b_at(t0), float), np.asarray(b_at(t1), float)
        M = np.zeros((n + 2, n + 2))
        M[:n, :n] = A
        M[:n, n] = (b1 - b0) / h      # slope term, multiplies s (time since t0)
        M[:n, n + 1] = b0             # constant term
        M[n, n + 1] = 1.0             # ds/dt = 1
        z = expm(M * h) @ np.concatenate([out[-1], [0.0, 1.0]])
        out.append(z[:n])
    return np.array(out)
