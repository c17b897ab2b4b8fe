"""Cached short runs of the small scenario's front corner, shared by the chain tests."""
from __future__ import annotations

import pytest

from chain_runs import NO_WEAR, SHORT_PLAN, STINT_PLAN, small_scenario, solve_one


@pytest.fixture(scope="session")
def short_scenario():
    """Two race laps and a 120 s soak, no pad wear."""
    return small_scenario(SHORT_PLAN, NO_WEAR)


@pytest.fixture(scope="session")
def short_run(short_scenario):
    """Front corner of ``short_scenario`` with LSODA (the baseline of the option checks)."""
    return solve_one(short_scenario)


@pytest.fixture(scope="session")
def stint_scenario():
    """STINT_PLAN with pad wear on (the small scenario's 1 mm^3/kJ)."""
    return small_scenario(STINT_PLAN)


@pytest.fixture(scope="session")
def stint_run(stint_scenario):
    return solve_one(stint_scenario)
