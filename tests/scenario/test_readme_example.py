"""README's minimal scenario is a working scenario (README promises it; users copy it)."""
import re
import shutil
from pathlib import Path

from thermo.scenario import load_scenario

ROOT = Path(__file__).resolve().parents[2]


def _readme_minimal_scenario() -> str:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    blocks = re.findall(r"```toml\n(.*?)```", text, flags=re.S)
    return next(b for b in blocks if 'name = "minimal example"' in b)


def test_readme_minimal_scenario_loads_with_the_documented_defaults(tmp_path):
    path = tmp_path / "minimal.toml"
    path.write_text(_readme_minimal_scenario(), encoding="utf-8")
    shutil.copy(ROOT / "scenarios" / "demo_circuit.toml", tmp_path / "demo_circuit.toml")
    scenario = load_scenario(path)
    assert [c.name for c in scenario.corners] == ["front", "rear"]
    front = scenario.corners[0]
    assert front.piston.piston_type == "solid"            # README: type defaults to solid
    assert front.disc.layers == 0                         # README: layers [0: automatic ...]
    assert scenario.solver.method == "fast"               # README: the scenario default
    assert scenario.fluid.dry_boiling_c == 230.0          # FMVSS No. 116 S5.1.1, DOT 4 dry ERBP
    assert [p.kind for p in scenario.plan.phases] == ["laps", "in_lap", "soak"]
