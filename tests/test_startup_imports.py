"""Start-up stays light (issue 14, "Start-up"): what each entry point loads, checked in a fresh interpreter.

`import thermo` and `brakeheat --help` load neither matplotlib, h5py nor scipy.signal (together
about a second of start-up); a `--json` run never loads matplotlib, h5py or scipy.signal. Times are measured in
the benchmark, not here: these machines are noisy, the imports are not.
"""
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
HEAVY = ("matplotlib", "h5py", "scipy.signal")
SHRINK = ["--set", "plan.phases.1.count=1", "--set", "plan.phases.4.count=1", "--set", "plan.phases.5.duration_s=60"]


def loaded_after(statements: str, watched=HEAVY) -> list[str]:
    code = (f"import sys\n{statements}\n"
            f"print(','.join(m for m in {tuple(watched)!r} if m in sys.modules))")
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT, timeout=300)
    assert proc.returncode == 0, proc.stderr
    line = proc.stdout.strip().splitlines()[-1] if proc.stdout.strip() else ""
    return [m for m in line.split(",") if m]


@pytest.mark.parametrize("statements", [
    "import thermo",
    "import lapdata",
    "from lapdata.echo import shown",
    "import thermo.output",
    "from thermo.cli.main import build_parser; build_parser()",       # what `brakeheat --help` does
])
def test_light_entry_points_load_no_heavy_library(statements):
    assert loaded_after(statements) == []


def test_the_help_parser_loads_no_numerical_library():
    # `brakeheat --help` builds every command's parser: numpy alone was 0.13 s of its 0.3 s target
    assert loaded_after("from thermo.cli.main import build_parser; build_parser()", ("numpy", "scipy", "numba")) == []


def test_a_json_run_loads_neither_matplotlib_nor_h5py_nor_scipy_signal():
    argv = ["run", "tests/data/small.toml", "--json", "--quiet", *SHRINK]
    statements = ("import io, contextlib\nfrom thermo.cli.main import main\n"
                  f"with contextlib.redirect_stdout(io.StringIO()):\n    assert main({argv!r}) == 0")
    # nor scipy.signal: the Savitzky-Golay filter is brakeheat's own (lapdata.signal.savgol)
    assert not {"matplotlib", "h5py", "scipy.signal"} & set(loaded_after(statements))


def test_the_lazy_names_still_resolve():
    import lapdata
    import thermo.output
    assert all(getattr(lapdata, name) for name in lapdata.__all__)
    assert all(getattr(thermo.output, name) for name in thermo.output.__all__)


def test_the_studies_package_names_its_functions_not_its_modules():
    import importlib
    importlib.import_module("thermo.studies.compare")      # a submodule named like a function the package exports
    from thermo.studies import compare, settle
    assert callable(compare) and callable(settle)
