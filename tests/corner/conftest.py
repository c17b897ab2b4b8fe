"""Corner designs read from tests/data/small.toml, for network-level tests (no chain runs here)."""
from __future__ import annotations

from pathlib import Path

import pytest

from thermo.scenario import load_scenario

SMALL = Path(__file__).resolve().parents[1] / "data" / "small.toml"


@pytest.fixture(scope="session")
def small():
    """The small test scenario as read (layers = 1)."""
    return load_scenario(SMALL)


@pytest.fixture(scope="session")
def front(small):
    """The front CornerDesign of the small scenario (vented 380 x 36 mm disc, six pistons, one duct)."""
    return next(d for d in small.corners if d.name == "front")
