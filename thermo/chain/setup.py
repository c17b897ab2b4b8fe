"""Each corner set up once to be solved (``CornerSetup``): the one step every solving caller takes.

The run (``thermo.chain.run``: ``run_scenario``, ``solve_corner``, and through them the sweeps
and uncertainty studies and the fit), the settled lap and the long race (``thermo.chain.settle``,
``thermo.chain.race``) start each corner here:

- its brake as the duty step sees it (``corner_brakes``): the heat partition comes from the
  design, without building the network; this is all the lap summary needs;
- its network, built once on the scenario's conductance grid and compiled;
- the solver settings, converted once from the scenario's ``[solver]`` table
  (``SolverChoice.settings``), unless the caller gives its own.
"""
from __future__ import annotations

from dataclasses import dataclass

from thermo.chain.corner_run import conductance_grid
from thermo.corner.build import CornerModel, build_corner, heat_partition
from thermo.corner.geometry import CornerDesign
from thermo.duty.corner_duty import CornerBrake
from thermo.errors import ScenarioError
from thermo.network.assemble import CompiledNetwork, compile_network
from thermo.network.tabulate import ConductanceGrid
from thermo.scenario.model import Scenario
from thermo.solver.settings import SolverSettings


@dataclass(frozen=True)
class CornerSetup:
    """One corner ready to be solved.

    Attributes
    ----------
    design : CornerDesign
        The corner's parts, materials and coefficients [-]
    brake : CornerBrake
        The duty step's view of the corner: heat partition, piston area, friction and
        rolling radius [-]
    model : CornerModel
        The corner's heat network with its output nodes, built on ``grid`` at the
        scenario's ambient pressure [-]
    network : CompiledNetwork
        ``model.network`` compiled for the solvers [-]
    grid : ConductanceGrid
        The table grid of the convective paths, spanning the scenario's air temperatures
        (a worn pad's network is rebuilt on it) [-]
    settings : SolverSettings
        How the corner is integrated [-]
    """

    design: CornerDesign
    brake: CornerBrake
    model: CornerModel
    network: CompiledNetwork
    grid: ConductanceGrid
    settings: SolverSettings

    @property
    def name(self) -> str:
        """The corner's name [-]."""
        return self.design.name

    @property
    def heat_partition(self) -> float:
        """Disc share of the friction heat the duty step splits by (``CornerBrake.partition``) [-]."""
        return self.brake.partition


def corner_brake(design: CornerDesign) -> CornerBrake:
    """The duty step's view of one corner (an axle corner stands for its left wheel); the heat
    partition comes from the design, without building its network."""
    side = design.name.split("_")[1] if "_" in design.name else "left"
    return CornerBrake(name=design.name, axle=design.axle, side=side, partition=heat_partition(design),
                       piston_area_one_side_m2=design.piston.area_one_side_m2, pad_mu=design.pad_mu,
                       effective_radius_m=design.effective_radius_m, rolling_radius_m=design.rolling_radius_m)


def corner_brakes(scenario: Scenario) -> list[CornerBrake]:
    """``corner_brake`` of every corner of the scenario, in its order (the duty step splits the car's
    braking between all of them)."""
    return [corner_brake(design) for design in scenario.corners]


def corner_setup(scenario: Scenario, design: CornerDesign, settings: SolverSettings | None = None, *,
                 grid: ConductanceGrid | None = None) -> CornerSetup:
    """One corner of the scenario set up: its brake, its network built and compiled, its settings.

    Parameters
    ----------
    scenario : Scenario
        Gives the ambient pressure, the air temperatures of the grid and ``[solver]`` [-]
    design : CornerDesign
        The corner (usually one of ``scenario.corners``) [-]
    settings : SolverSettings or None
        None: the scenario's own (``scenario.solver.settings()``) [-]
    grid : ConductanceGrid or None
        None: ``conductance_grid(scenario)`` [-]

    Returns
    -------
    CornerSetup
        The corner, built once [-]
    """
    grid = conductance_grid(scenario) if grid is None else grid
    model = build_corner(design, scenario.ambient.pressure_pa, grid)
    return CornerSetup(design=design, brake=corner_brake(design), model=model, network=compile_network(model.network),
                       grid=grid, settings=scenario.solver.settings() if settings is None else settings)


def corner_setups(scenario: Scenario, corners=None, settings: SolverSettings | None = None) -> tuple[CornerSetup, ...]:
    """The scenario's corners set up, each built once, on one grid and with one settings conversion.

    Parameters
    ----------
    scenario : Scenario
        A scenario read with ``load_scenario`` [-]
    corners : sequence of str or None
        Names of the corners to set up, in this order (None: every corner, in the scenario's order) [-]
    settings : SolverSettings or None
        None: the scenario's own (``scenario.solver.settings()``) [-]

    Returns
    -------
    tuple of CornerSetup
        One per corner asked for [-]

    Raises
    ------
    ScenarioError
        A name that is not one of the scenario's corners.
    """
    designs = {d.name: d for d in scenario.corners}
    names = list(designs) if corners is None else list(corners)
    for name in names:
        if name not in designs:
            raise ScenarioError(f"{scenario.path}: no corner named '{name}' (corners: {', '.join(designs)})")
    settings = scenario.solver.settings() if settings is None else settings
    grid = conductance_grid(scenario)
    return tuple(corner_setup(scenario, designs[name], settings, grid=grid) for name in names)
