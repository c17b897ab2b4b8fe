"""A phase may drive its own logged lap (a safety-car lap, say) instead of the plan's lap."""
from pathlib import Path

import numpy as np
import pytest

from chain_runs import small_scenario
from lapdata import LapDataError
from lapdata.reader import read_trace_csv
from thermo.chain.plan import expand_plan

DEMO_LAP = Path(__file__).resolve().parents[2] / "scenarios" / "demo_lap.csv"


def test_safety_car_phase_uses_its_own_trace_with_its_speed_factor():
    phases = [{"type": "laps", "count": 1},
              {"type": "safety_car", "count": 2, "speed_factor": 0.5, "trace": str(DEMO_LAP)}]
    segments = expand_plan(small_scenario(phases))
    logged = read_trace_csv(DEMO_LAP)
    race, sc1, sc2 = segments
    assert race.trace.duration_s != pytest.approx(logged.duration_s, rel=1e-3)   # the built lap, another length
    # the logged lap at half speed over the same distances takes twice as long (t = s / v)
    assert sc1.trace.duration_s == pytest.approx(2 * logged.duration_s, rel=1e-9)
    assert np.max(sc1.trace.speed_mps) == pytest.approx(0.5 * np.max(logged.speed_mps), rel=1e-9)
    assert sc2.t_start_s == pytest.approx(sc1.t_end_s)


def test_missing_phase_trace_is_an_error_naming_the_file(tmp_path):
    phases = [{"type": "laps", "count": 1, "trace": str(tmp_path / "nowhere.csv")}]
    with pytest.raises(LapDataError, match="nowhere.csv"):
        expand_plan(small_scenario(phases))
