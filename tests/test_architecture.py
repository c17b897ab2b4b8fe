"""The layering rules of CONVENTIONS.md ("Imports run one way"), checked on the source with ast."""
from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
SOURCES = sorted(p for pkg in ("thermo", "lapdata") for p in (ROOT / pkg).rglob("*.py"))
BRAKE_WORDS = ("disc", "pad", "piston", "caliper", "fluid", "bearing", "brake")


def module_of(path: Path) -> str:
    return ".".join(path.relative_to(ROOT).with_suffix("").parts).removesuffix(".__init__")


def import_statements(path: Path):
    """(base module, [imported names]) of every import anywhere in the file (also inside functions);
    relative imports resolved. ``import a.b`` gives ("a.b", []); ``from a import b, c`` ("a", ["b", "c"])."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    package = module_of(path) if path.name == "__init__.py" else module_of(path).rpartition(".")[0]
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield alias.name, []
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                parts = package.split(".")
                base = ".".join(parts[: len(parts) - node.level + 1] + ([base] if base else []))
            yield base, [alias.name for alias in node.names]


def imported(path: Path) -> set[str]:
    """Absolute names of every module imported anywhere in the file (also inside functions)."""
    names = set()
    for base, members in import_statements(path):
        names.add(base)
        names.update(f"{base}.{m}" for m in members)
    return names


def files_in(*packages: str) -> list[Path]:
    return [p for p in SOURCES if any(under(module_of(p), pkg) for pkg in packages)]


def under(name: str, package: str) -> bool:
    return name == package or name.startswith(package + ".")


def test_sources_found():
    assert len(files_in("lapdata")) >= 5 and len(files_in("thermo.network")) >= 3 and len(files_in("thermo.solver")) >= 3


@pytest.mark.parametrize("path", files_in("lapdata"), ids=lambda p: p.name)
def test_lapdata_never_imports_thermo(path):
    assert not [n for n in imported(path) if under(n, "thermo")]


GENERIC_FORBIDDEN = ("thermo.corner", "thermo.duty", "thermo.scenario", "thermo.chain", "thermo.cli", "thermo.output")


@pytest.mark.parametrize("path", files_in("thermo.network", "thermo.solver"), ids=lambda p: p.name)
def test_generic_layers_know_nothing_of_brakes(path):
    bad = [n for n in imported(path) if any(under(n, f) for f in GENERIC_FORBIDDEN)]
    assert not bad, bad
    tree = ast.parse(path.read_text(encoding="utf-8"))
    identifiers = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Name):
            identifiers.add(node.id)
        elif isinstance(node, ast.Attribute):
            identifiers.add(node.attr)
        elif isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
            identifiers.add(node.name)
        elif isinstance(node, ast.arg):
            identifiers.add(node.arg)
        elif isinstance(node, ast.alias):
            identifiers.add(node.asname or node.name)
    pattern = re.compile("|".join(BRAKE_WORDS), re.IGNORECASE)
    assert not sorted(i for i in identifiers if pattern.search(i))


OUTPUT_MAY_IMPORT = ("thermo", "thermo.results", "thermo.errors", "lapdata.units", "lapdata.echo", "lapdata.lazy")


@pytest.mark.parametrize("path", files_in("thermo.output"), ids=lambda p: p.name)
def test_output_reads_results_only(path):
    """The output layer reads results and never runs a model (CONVENTIONS.md, "The shape of the
    house"): of brakeheat's own modules it imports only these, its own, and never pyplot."""
    bases = {base for base, _ in import_statements(path)}
    ours = [b for b in bases if b.split(".")[0] in ("thermo", "lapdata")]
    assert not [b for b in ours if b not in OUTPUT_MAY_IMPORT and not under(b, "thermo.output")]
    assert "matplotlib.pyplot" not in bases


def test_the_output_rule_sees_the_results_import():
    assert any("thermo.results" in {b for b, _ in import_statements(p)} for p in files_in("thermo.output"))


def _prints_or_exits(path: Path) -> list[str]:
    found = []
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Call):
            f = node.func
            if isinstance(f, ast.Name) and f.id in ("print", "exit", "quit"):
                found.append(f"{f.id}() line {node.lineno}")
            elif isinstance(f, ast.Attribute) and f.attr == "exit" and isinstance(f.value, ast.Name) and f.value.id in ("sys", "os"):
                found.append(f"{f.value.id}.exit() line {node.lineno}")
    return found


@pytest.mark.parametrize("path", [p for p in SOURCES if not under(module_of(p), "thermo.cli")
                                  and module_of(p) not in ("thermo.bench", "thermo.validate")], ids=lambda p: str(p.relative_to(ROOT)))
def test_only_the_cli_prints_or_exits(path):
    assert not _prints_or_exits(path)


def test_the_print_check_can_fail(tmp_path):
    sample = tmp_path / "x.py"
    sample.write_text("import sys\ndef f():\n    print('x')\n    sys.exit(1)\n", encoding="utf-8")
    assert _prints_or_exits(sample) == ["print() line 3", "sys.exit() line 4"]
    assert under("thermo.corner.build", "thermo.corner") and not under("thermo.cornerstone", "thermo.corner")


@pytest.mark.parametrize("path", SOURCES, ids=lambda p: str(p.relative_to(ROOT)))
def test_files_stay_under_600_lines(path):
    assert len(path.read_text(encoding="utf-8").splitlines()) < 600


@pytest.mark.parametrize("path", files_in("thermo.studies"), ids=lambda p: p.name)
def test_studies_are_library_code_below_the_command_line(path):
    # compare, settle and the lap summary live in the library; the command line is a thin layer over them
    assert not [n for n in imported(path) if under(n, "thermo.cli")]
    assert not _prints_or_exits(path)


@pytest.mark.parametrize("path", files_in("thermo.network", "thermo.solver"), ids=lambda p: p.name)
def test_generic_layers_never_import_the_brake_results(path):
    # the energy balance of a solve is generic (thermo.network.energy); results.py is the brake level
    assert "thermo.results" not in imported(path)


def _module_edges(path: Path, modules: set[str]) -> set[str]:
    """Modules of the project that a file imports (anywhere in it); ``from pkg import submodule``
    counts as an import of the submodule only."""
    name = module_of(path)
    found = set()
    for base, members in import_statements(path):
        subs = [f"{base}.{m}" for m in members if f"{base}.{m}" in modules]
        found.update(subs)
        if not members or len(subs) < len(members):
            found.add(base)
    edges = set()
    for imported_name in found:
        parts = imported_name.split(".")
        for k in range(len(parts), 0, -1):
            candidate = ".".join(parts[:k])
            if candidate in modules:
                if candidate != name:
                    edges.add(candidate)
                break
    return edges


def test_the_import_graph_has_no_loops():
    # imports inside functions count too: a loop hidden that way is still a loop
    modules = {module_of(p): p for p in SOURCES}
    graph = {name: _module_edges(path, set(modules)) for name, path in modules.items()}
    state: dict[str, int] = {}

    def visit(node, trail):
        state[node] = 1
        for nxt in sorted(graph[node]):
            if state.get(nxt) == 1:
                raise AssertionError("import loop: " + " -> ".join(trail[trail.index(nxt):] + [nxt]))
            if nxt not in state:
                visit(nxt, trail + [nxt])
        state[node] = 2

    for start in sorted(graph):
        if start not in state:
            visit(start, [start])
