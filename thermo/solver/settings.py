"""Solver settings: which integrator, how tight, how the schedule's edges are handled."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from lapdata.echo import shown
from lapdata.suggest import did_you_mean
from thermo.errors import ModelError

METHODS = ("LSODA", "BDF", "Radau", "RK45", "fast")


@dataclass(frozen=True)
class SolverSettings:
    """How to integrate a heat network.

    Parameters
    ----------
    method : str
        'LSODA' (default), 'BDF', 'Radau' (scipy's stiff integrators), 'RK45' (explicit,
        for non-stiff checks only; it uses no Jacobian) or 'fast' (TR-BDF2 on the schedule's own
        time grid, ``thermo.solver.fast``) [-]
    rtol : float
        Relative tolerance; for 'fast' the Newton convergence test [-]
    atol_k : float
        Absolute tolerance on temperatures; energies get atol_k x total heat capacity [K]
    max_step_s : float or None
        Largest step anywhere; for 'fast', sample intervals longer than this
        are split [s]
    restart_at_edges : bool
        Restart the integration wherever a heat source switches between zero
        and non-zero, and bound the step inside heated segments (scipy methods; 'fast' always steps
        on every sample, so it requires True) [-]
    use_jacobian : bool
        Give the stiff integrators the analytic Jacobian; False makes them
        difference it numerically ('fast' then differences it too) [-]
    heated_max_step_samples : float
        Bound on the step inside heated segments, in sample intervals
        of that segment [-]
    max_stride : int
        'fast' only: longest step while no heat source is on, in schedule samples;
        1 steps on every sample, more steps on the graded grid of ``thermo.solver.grids.graded_grid``
        (every sample while a source is on). The outputs are then the step grid's points [-]
    linearised : bool
        'fast' only: one linearised solve a step instead of Newton iterations
        (``thermo.solver.kernel_linearised``; the tolerances then do not apply) [-]
    """

    method: str = "LSODA"
    rtol: float = 1e-6
    atol_k: float = 1e-4
    max_step_s: float | None = None
    restart_at_edges: bool = True
    use_jacobian: bool = True
    heated_max_step_samples: float = 4.0
    max_stride: int = 1
    linearised: bool = False

    def __post_init__(self):
        if self.method not in METHODS:
            hint = did_you_mean(self.method, METHODS, n=3, cutoff=0.3)
            raise ModelError(f"solver settings: unknown method '{self.method}'{hint}; expected one of {', '.join(METHODS)}")
        if not (np.isfinite(self.rtol) and 1e-13 <= self.rtol < 1.0):
            raise ModelError(f"solver settings: rtol must be in [1e-13, 1), got {shown(self.rtol)}")
        if not (np.isfinite(self.atol_k) and self.atol_k > 0):
            raise ModelError(f"solver settings: atol_k must be a positive number of kelvin, got {shown(self.atol_k)}")
        if self.max_step_s is not None and not (np.isfinite(self.max_step_s) and self.max_step_s > 0):
            raise ModelError(f"solver settings: max_step_s must be None or a positive number of seconds, got {shown(self.max_step_s)}")
        if not (np.isfinite(self.heated_max_step_samples) and self.heated_max_step_samples > 0):
            raise ModelError("solver settings: heated_max_step_samples must be a positive number, "
                             f"got {shown(self.heated_max_step_samples)}")
        if isinstance(self.max_stride, bool) or not isinstance(self.max_stride, (int, np.integer)) or not 1 <= self.max_stride <= 256:
            raise ModelError(f"solver settings: max_stride must be a whole number of samples from 1 to 256, got {shown(self.max_stride)}")
        for key in ("restart_at_edges", "use_jacobian", "linearised"):
            if not isinstance(getattr(self, key), bool):
                raise ModelError(f"solver settings: {key} must be true or false, got {shown(getattr(self, key))}")
        if self.method == "fast" and not self.restart_at_edges:
            raise ModelError("solver settings: method 'fast' steps on every schedule sample and so always restarts "
                             "at edges; restart_at_edges = false applies to the scipy methods only")
