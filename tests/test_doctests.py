"""Every docstring example of the packages runs (the installed copy, as a user has it)."""
from __future__ import annotations

import doctest
import importlib
import pkgutil

import pytest

import lapdata
import thermo

SKIP = ("thermo.cli.main", "thermo.bench", "thermo.validate")     # entry points: they run when imported as scripts only


def _modules():
    names = []
    for package in (thermo, lapdata):
        names.append(package.__name__)
        for info in pkgutil.walk_packages(package.__path__, package.__name__ + "."):
            if info.name not in SKIP:
                names.append(info.name)
    return sorted(names)


MODULES = _modules()


def test_modules_found():
    assert "thermo.correlations.forced" in MODULES and "lapdata.suggest" in MODULES


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples_run(name):
    module = importlib.import_module(name)
    finder = doctest.DocTestFinder()
    tests = finder.find(module, name)
    # decorated functions (the correlations) keep their module's name but not its globals, so the
    # finder skips them when it walks the module: look at each such object directly
    seen = {t.name for t in tests}
    for attribute, obj in vars(module).items():
        if getattr(obj, "__module__", None) == name and callable(obj) and getattr(obj, "__wrapped__", None) is not None:
            for test in finder.find(obj, f"{name}.{attribute}", module=module, globs=dict(vars(module))):
                if test.name not in seen:
                    tests.append(test)
    runner = doctest.DocTestRunner(optionflags=doctest.ELLIPSIS)
    for test in tests:
        runner.run(test)
    assert runner.failures == 0, f"{name}: {runner.failures} docstring example(s) failed"
