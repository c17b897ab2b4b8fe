"""A Python user and a TOML user get the same car: the corner parts' and the limits' keys are
declared once, on the dataclass fields (``thermo.keys.key``), and the schema tables are derived
from them; their Python defaults are the TOML defaults converted to SI. PadWear and SolverChoice
(whose defaults had drifted) carry none of their own."""
from __future__ import annotations

import dataclasses
import math

import pytest

from thermo.corner import geometry as G
from thermo.limits import Limits
from thermo.scenario import schema as S
from thermo.scenario.model import PadWear, SolverChoice

PAIRS = [("disc", S.DISC, G.DiscGeometry), ("pad", S.PAD, G.PadGeometry), ("piston", S.PISTON, G.PistonGeometry),
         ("caliper", S.CALIPER, G.CaliperGeometry), ("hub", S.HUB, G.HubGeometry), ("ducts.NAME", S.DUCT, G.DuctGeometry),
         ("airflow", S.AIRFLOW, G.AirflowSettings), ("limits", S.LIMITS, Limits)]


@pytest.mark.parametrize("section, table, cls", PAIRS, ids=[p[0] for p in PAIRS])
def test_dataclass_defaults_equal_the_schema(section, table, cls):
    fields = {f.name: f for f in dataclasses.fields(cls)}
    compared = 0
    for key, declared in table.items():
        field = fields.get(declared.si_name)
        assert field is not None, f"[{section}] {key}: no field {declared.si_name} in {cls.__name__}"
        if declared.default is S.REQUIRED or field.default is dataclasses.MISSING:
            continue
        want = declared.default
        if declared.kind in (int, float) and isinstance(want, (int, float)) and not isinstance(want, bool):
            want = want * declared.factor + declared.offset
        got = field.default
        same = want == got or (isinstance(want, float) and math.isclose(want, got, rel_tol=1e-12))
        assert same, f"[{section}] {key}: schema {want!r}, {cls.__name__}.{field.name} {got!r}"
        compared += 1
    assert compared > 0


def test_pad_wear_and_solver_carry_no_default_of_their_own():
    for cls in (PadWear, SolverChoice):
        assert all(f.default is dataclasses.MISSING for f in dataclasses.fields(cls)), cls.__name__
