"""Corners solved side by side (``thermo.chain.run.corner_threads``, ``CornerThreads``): the same run
to the bit as one corner after another, errors and settings carried as in one thread.

The reference is the run with one thread, itself checked against textbook solutions elsewhere
(tests/solver, tests/corner); the only question here is whether solving the corners in threads
changed any number, so the comparison is exact."""
from __future__ import annotations

import threading
import warnings

import numpy as np
import pytest

from chain_runs import STINT_PLAN, assert_same_run, laps_one_at_a_time, send_laps_off_the_tables, small_scenario
from thermo.chain import corner_run, run, run_scenario
from thermo.chain.run import corner_threads
from thermo.correlations.validity import CorrelationWarning, check_range, get_validity_policy, set_validity_policy, unchecked
from thermo.errors import ModelError, SolveError

WORN = [("pad_wear.wear_coefficient_mm3_per_kj", 10.0), ("corners.front.pad.thickness_mm", 3.0),
        ("corners.front.pad.minimum_thickness_mm", 1.0)]


def test_corners_side_by_side_are_the_corners_one_after_another_to_the_bit():
    """Both corners of the small scenario over two stints with a pad change, the front pad worn to
    its floor: two threads against one."""
    scenario = small_scenario(STINT_PLAN, WORN)
    assert corner_threads(scenario, 2, 2) == 2
    assert_same_run(run_scenario(scenario, threads=1), run_scenario(scenario, threads=2))


def test_four_corners_of_two_alike_axles_side_by_side_are_the_same_run():
    """Left and right of each axle alike but for their share of the heat: the sides' networks are
    equal, so they share the tables and the kernel arrays each corner copies before wearing its pad
    in them; four threads against one, the pads worn on every lap."""
    scenario = small_scenario(STINT_PLAN, WORN + [("brakes.left_share_front", 0.53), ("brakes.left_share_rear", 0.52)])
    alone, side_by_side = run_scenario(scenario, threads=1), run_scenario(scenario, threads=4)
    assert [c.name for c in alone.corners] == ["front_left", "front_right", "rear_left", "rear_right"]
    assert_same_run(alone, side_by_side)


def test_laps_off_the_tables_in_threads_leave_the_warning_filters_alone(monkeypatch):
    """Laps that leave a table are solved on the model's own functions with their correlations
    unchecked; in threads that must neither change a number nor touch the process's warning
    filters (``warnings.catch_warnings`` there lost other threads' warnings)."""
    scenario = small_scenario(STINT_PLAN, WORN)
    sent: list = []
    laps_one_at_a_time(monkeypatch)
    send_laps_off_the_tables(monkeypatch, (2,), sent)
    filters = list(warnings.filters)
    alone = run_scenario(scenario, threads=1)
    side_by_side = run_scenario(scenario, threads=2)
    # lap 2 of both corners in both runs, each sent twice: off the corner's arrays, then off the
    # fast solver's kernel, to the numpy stepper
    assert len(sent) == 8 and warnings.filters == filters
    assert_same_run(alone, side_by_side)


def test_how_many_corners_go_side_by_side():
    scenario = small_scenario(STINT_PLAN)
    assert corner_threads(scenario, 2) == 1                         # the default: one after another
    assert corner_threads(scenario, 2, 8) == 2                      # at most one per corner
    assert corner_threads(scenario, 4, 1) == 1
    assert corner_threads(scenario, 2, 2, sink=object()) == 1       # rows go to a sink in corner order
    lsoda = small_scenario(STINT_PLAN, [("solver.method", "LSODA")])
    assert corner_threads(lsoda, 2, 2) == 1                         # scipy's integrators keep state of their own
    for bad in (0, -1, 1.5):
        with pytest.raises(ModelError, match="at least 1"):
            corner_threads(scenario, 2, bad)


def test_the_first_corners_error_is_raised_after_both_have_ended(monkeypatch):
    """Both corners fail: the front's error (the one a run one corner after another raises), once
    the rear's task has ended too; a failure of the rear alone is raised as well."""
    scenario = small_scenario([{"type": "laps", "count": 1}])
    ended = []
    real = corner_run.CornerRun.advance_laps

    def failing(names):
        def advance_laps(self, segments, duties):
            real(self, segments, duties)
            ended.append(self.design.name)
            if self.design.name in names:
                raise SolveError(f"corner {self.design.name}: failed on purpose")
        return advance_laps
    monkeypatch.setattr(corner_run.CornerRun, "advance_laps", failing(("front", "rear")))
    with pytest.raises(SolveError, match="corner front"):
        run_scenario(scenario, threads=2)
    assert sorted(ended) == ["front", "rear"]
    monkeypatch.setattr(corner_run.CornerRun, "advance_laps", failing(("rear",)))
    with pytest.raises(SolveError, match="corner rear"):
        run_scenario(scenario, threads=2)


def test_each_corner_runs_in_the_callers_context(monkeypatch):
    """The correlations' validity policy set around a run holds in every corner's thread."""
    scenario = small_scenario([{"type": "laps", "count": 1}])
    seen = []
    real = run._advance

    def advance(*args):
        seen.append((threading.current_thread() is threading.main_thread(), get_validity_policy()))
        return real(*args)
    monkeypatch.setattr(run, "_advance", advance)
    with set_validity_policy("raise"):
        run_scenario(scenario, threads=2)
    assert seen == [(False, "raise")] * 2


def test_unchecked_stays_in_its_thread():
    """``unchecked``: no validity check and no numpy floating-point warning inside, in this thread
    only; another thread keeps its policy meanwhile."""
    inside, other = threading.Event(), []

    def other_thread():
        inside.wait(5.0)
        other.append(get_validity_policy())
    worker = threading.Thread(target=other_thread)
    worker.start()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        with unchecked():
            check_range("demo correlation", "Re", 5.0, 10.0, 20.0)     # outside: no warning
            np.float64(1.0) / np.float64(0.0)
            inside.set()
            worker.join(5.0)
        check_range("demo correlation", "Re", 5.0, 10.0, 20.0)         # outside: warned again
    assert other == ["warn"]
    assert [w.category for w in caught] == [CorrelationWarning]
