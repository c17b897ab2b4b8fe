"""The network's laws, written once: each link kind's flow with its slopes, the table interpolation
of a convective conductance, and a node's heat capacity C(T) and enthalpy H(T).

Every function here is plain arithmetic that works alike on floats and on numpy arrays (element
by element), so there is one description of each law for the whole code base:

- the numpy assembler calls them on arrays (``thermo.network.assemble``: flows and Jacobian;
  ``thermo.network.capacity``: C(T) and H(T); ``thermo.network.tabulate``: the trilinear lookup);
- the compiled kernels wrap these same functions with numba's ``njit`` and call them on scalars
  (``thermo.solver.kernel``, used by ``kernel_linearised`` and ``kernel_lanes``), so what the
  kernels compute is what is written here, operation for operation.

This module imports only numpy (numba is loaded by the kernels, not by the generic network).
numba's on-disk cache of a kernel does not notice an edit of a function it calls from another
file: after changing a law here, delete the ``__pycache__/*.nbi`` and ``*.nbc`` files of
``thermo/solver`` and ``thermo/network`` (or touch the kernel modules) before measuring.

Flows are positive from a link's first end a to its second end b [W]; the slopes are
d f / d T_a and d f / d T_b [W/K].
"""
from __future__ import annotations

from numpy import maximum, minimum


def conduction_flow(g, ta, tb):
    """Conduction f = G (T_a - T_b) and its slopes.

    Parameters
    ----------
    g : float or ndarray
        Conductance G [W/K].
    ta, tb : float or ndarray
        Temperatures of the link's two ends [K].

    Returns
    -------
    tuple
        (f [W], df/dT_a [W/K], df/dT_b [W/K]).
    """
    return g * (ta - tb), g, -g


def radiation_flow(c, ta, tb):
    """Radiation f = c (T_a^4 - T_b^4) and its slopes 4 c T_a^3, -4 c T_b^3 (no pow() call).

    Parameters
    ----------
    c : float or ndarray
        Radiation coefficient, emissivity factor x area x Stefan-Boltzmann constant [W/K^4].
    ta, tb : float or ndarray
        Temperatures of the link's two ends [K].

    Returns
    -------
    tuple
        (f [W], df/dT_a [W/K], df/dT_b [W/K]).
    """
    ta2 = ta * ta
    tb2 = tb * tb
    return c * (ta2 * ta2 - tb2 * tb2), 4.0 * c * ta2 * ta, -4.0 * c * tb2 * tb


def convection_flow(m, g, dg_a, dg_b, ta, tb):
    """Convection f = m G (T_a - T_b), G depending on both end temperatures, and its slopes.

    Parameters
    ----------
    m : float or ndarray
        Multiplier of the conductance (1 unless a sweep scales the link) [-].
    g : float or ndarray
        Conductance G(driver, T_a, T_b) [W/K].
    dg_a, dg_b : float or ndarray
        dG/dT_a and dG/dT_b [W/K^2]; zeros give the slopes with G held constant.
    ta, tb : float or ndarray
        Temperatures of the link's two ends [K].

    Returns
    -------
    tuple
        (f [W], df/dT_a = m (G + dG/dT_a dT) [W/K], df/dT_b = m (-G + dG/dT_b dT) [W/K]).
    """
    dt = ta - tb
    return m * g * dt, m * (g + dg_a * dt), m * (-g + dg_b * dt)


def bilinear(c00, c01, c10, c11, fi, fj):
    """Bilinear interpolation in a cell and its slope along the second axis.

    Parameters
    ----------
    c00, c01, c10, c11 : float or ndarray
        Corner values, first index along the first axis, second along the second [any unit].
    fi, fj : float or ndarray
        Fractions in the cell along the two axes, in [0, 1] [-].

    Returns
    -------
    tuple
        (value, d value / d fj) [unit of the corners].
    """
    gi = 1.0 - fi
    gj = 1.0 - fj
    return gi * (gj * c00 + fj * c01) + fi * (gj * c10 + fj * c11), gi * (c01 - c00) + fi * (c11 - c10)


def trilinear(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj, fk):
    """Trilinear interpolation in a cell (driver i, node temperature j, boundary temperature k) and
    its slope along j: first along k, then ``bilinear`` in (i, j).

    Parameters
    ----------
    a000 ... a111 : float or ndarray
        Corner values, digits the offsets along i, j, k [any unit].
    fi, fj, fk : float or ndarray
        Fractions in the cell, in [0, 1] [-].

    Returns
    -------
    tuple
        (value, d value / d fj) [unit of the corners].
    """
    c00 = a000 + fk * (a001 - a000)
    c01 = a010 + fk * (a011 - a010)
    c10 = a100 + fk * (a101 - a100)
    c11 = a110 + fk * (a111 - a110)
    return bilinear(c00, c01, c10, c11, fi, fj)


def trilinear_slope_k(a000, a001, a010, a011, a100, a101, a110, a111, fi, fj):
    """The slope along k of ``trilinear`` in its cell: ``bilinear``'s value of the k-differences.

    Parameters
    ----------
    a000 ... a111 : float or ndarray
        Corner values, digits the offsets along i, j, k [any unit].
    fi, fj : float or ndarray
        Fractions in the cell along i and j, in [0, 1] [-].

    Returns
    -------
    float or ndarray
        d value / d fk [unit of the corners].
    """
    gi = 1.0 - fi
    gj = 1.0 - fj
    return gi * (gj * (a001 - a000) + fj * (a011 - a010)) + fi * (gj * (a101 - a100) + fj * (a111 - a110))


def capacity_segment(t, lo, hi):
    """One segment of a piecewise-linear specific heat: its ramp and the ramp's integral.

    A node's specific heat is c(T) = c_0 + sum_s slope_s (clip(T, lo_s, hi_s) - lo_s) (constant
    beyond its table), so that C = m c(T) and H(T) = m [c_0 (T - T_ref) + sum_s slope_s (R_s(T) -
    R_s(T_ref))], with R_s the integral of the ramp from below lo_s:
    R_s(T) = (clip(T) - lo)^2 / 2 + (hi - lo) max(T - hi, 0).

    Parameters
    ----------
    t : float or ndarray
        Temperature [K].
    lo, hi : float or ndarray
        The segment's ends [K].

    Returns
    -------
    tuple
        (clip(t, lo, hi) - lo [K], R(t) [K^2]).
    """
    x = minimum(maximum(t, lo), hi) - lo
    return x, 0.5 * x * x + (hi - lo) * maximum(t - hi, 0.0)
