"""The output layer reads results and never runs a model (CONVENTIONS.md, 'The shape of the house')."""
import ast
from pathlib import Path

import thermo.output

ALLOWED = {"thermo", "thermo.results", "thermo.errors", "thermo.output", "lapdata.units", "lapdata.echo", "lapdata.lazy"}
FORBIDDEN_TOP = {"thermo.solver", "thermo.network", "thermo.corner", "thermo.duty", "thermo.scenario",
                 "thermo.cli", "matplotlib.pyplot"}


def test_output_imports_only_results_errors_and_units():
    folder = Path(thermo.output.__file__).parent
    seen = set()
    for path in folder.glob("*.py"):
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            names = []
            if isinstance(node, ast.Import):
                names = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module:
                names = [node.module]
            for name in names:
                seen.add(name)
                assert not any(name == f or name.startswith(f + ".") for f in FORBIDDEN_TOP), f"{path.name}: {name}"
                if name.split(".")[0] in ("thermo", "lapdata"):
                    assert name in ALLOWED or name.startswith("thermo.output."), f"{path.name}: {name}"
    assert "thermo.results" in seen   # the walk did see the files
