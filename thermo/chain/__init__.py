"""The orchestrator: scenario -> laps -> heat per corner -> network solve -> checks -> Results.

Each step is a function of its own and can be called alone (``expand_plan``, ``corner_setups``,
``corner_duties``, ``solve_corner``), so the chain can start part way, for example from a measured
heat input.
"""
from thermo.chain.plan import PlanSegment, expand_plan
from thermo.chain.run import run_scenario, solve_corner
from thermo.chain.setup import CornerSetup, corner_setups

__all__ = ["CornerSetup", "PlanSegment", "corner_setups", "expand_plan", "run_scenario", "solve_corner"]
