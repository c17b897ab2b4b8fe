"""Docstrings in numpydoc's standard form: every documented parameter, return value and attribute
of the packages parses with numpydoc's own parser (numpydoc.docscrape, the reference), with its
type and a description on the lines below it."""
from __future__ import annotations

import importlib
import inspect
import pkgutil
import warnings

import pytest
from numpydoc.docscrape import NumpyDocString

import lapdata
import thermo

SECTIONS = ("Parameters", "Returns", "Attributes", "Yields")


def _documented():
    """(qualified name, docstring) of every module-level function and class, and their methods,
    in thermo and lapdata whose docstring has a numpydoc section."""
    out = []
    for package in (thermo, lapdata):
        for info in pkgutil.walk_packages(package.__path__, package.__name__ + "."):
            if info.name.endswith("__main__"):
                continue
            module = importlib.import_module(info.name)
            for name, obj in vars(module).items():
                if getattr(obj, "__module__", None) != module.__name__ or not (inspect.isfunction(obj) or inspect.isclass(obj)):
                    continue
                members = [(name, obj)] + ([(f"{name}.{m}", f) for m, f in vars(obj).items() if inspect.isfunction(f)]
                                           if inspect.isclass(obj) else [])
                for qual, item in members:
                    doc = inspect.getdoc(item) or ""
                    if any(f"\n{s}\n{'-' * len(s)}" in f"\n{doc}" for s in SECTIONS):
                        out.append((f"{module.__name__}.{qual}", doc))
    return out


DOCUMENTED = _documented()


def test_the_walk_found_the_documented_api():
    names = {n for n, _ in DOCUMENTED}
    assert "thermo.studies.sweep.sweep" in names and "thermo.solver.batch.solve_batch" in names and len(names) > 60


@pytest.mark.parametrize("name, doc", DOCUMENTED, ids=[n for n, _ in DOCUMENTED])
def test_sections_parse_in_the_standard_form(name, doc):
    with warnings.catch_warnings():
        warnings.simplefilter("error")                 # numpydoc warns about what it cannot place
        parsed = NumpyDocString(doc)
    for section in SECTIONS:
        for entry in parsed[section]:
            # the one-line "name : type  description" form leaves the description glued to the type
            assert "  " not in entry.type, f"{name}: {section} entry {entry.name!r}: description on the type line"
            assert entry.desc or entry.name.startswith("*") or "," in entry.name or " : see " in f"{entry.name} : {entry.type}", \
                f"{name}: {section} entry {entry.name!r} has no description"
