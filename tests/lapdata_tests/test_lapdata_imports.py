"""Import direction: lapdata never imports thermo (checked on the source with ast)."""
import ast
from pathlib import Path

import lapdata

PACKAGE = Path(lapdata.__file__).resolve().parent


def imported_roots(path):
    roots = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            roots |= {alias.name.split(".")[0] for alias in node.names}
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            roots.add(node.module.split(".")[0])
    return roots


def test_lapdata_never_imports_thermo():
    files = sorted(PACKAGE.glob("*.py"))
    assert len(files) >= 8
    offenders = [f.name for f in files if "thermo" in imported_roots(f)]
    assert offenders == []
