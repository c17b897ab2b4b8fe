"""[solver] output_s (or output_hz) thins the stored series, never the peaks, margins or laps."""
from __future__ import annotations

import numpy as np

from chain_runs import NO_WEAR, SHORT_PLAN, small_scenario, solve_one
from thermo.chain.corner_run import stored_rows


def test_stored_rows_keep_the_ends_the_extremes_and_one_row_a_step():
    t = np.arange(0.0, 10.0, 0.05)
    out = np.column_stack([np.sin(t), -t])
    rows = stored_rows(t, out, 1.0)
    assert rows[0] == 0 and rows[-1] == t.size - 1
    assert {int(np.argmax(np.sin(t))), int(np.argmin(np.sin(t))), int(np.argmin(-t))} <= set(rows.tolist())
    assert set(np.floor(t[rows])) == set(np.floor(t))          # every 1 s step has a row
    assert rows.size < 20
    assert np.array_equal(stored_rows(t, out, 0.0), np.arange(t.size))


def test_a_segment_that_continues_keeps_the_extremes_of_the_rows_after_its_first():
    # the first row repeats the last one stored, or (after a pad change or wear) holds the pad's new
    # state at that instant: it is not stored, and the extremes kept are those of the rows after it,
    # so a node cooling from a reset keeps its highest later value however thin the series
    t = np.arange(0.0, 10.0, 0.05)
    falling = np.column_stack([10.0 - t, t])                # its maximum at the first row
    rows = stored_rows(t, falling, 4.0, continues=True)
    assert rows[0] == 1 and rows[-1] == t.size - 1
    assert falling[rows, 0].max() == falling[1:, 0].max()
    assert falling[rows, 1].min() == falling[1:, 1].min()
    assert 0 not in stored_rows(t, falling, 0.0, continues=True)
    assert np.array_equal(stored_rows(t[:2], falling[:2], 4.0, continues=True), [1])


def test_a_thinned_run_has_the_same_peaks_checks_and_laps():
    short_run = solve_one(small_scenario(SHORT_PLAN, NO_WEAR), method="LSODA")
    thin = solve_one(small_scenario(SHORT_PLAN, NO_WEAR + [("solver.output_hz", 0.5)]), method="LSODA")
    assert thin.time_s.size < 0.2 * short_run.time_s.size
    assert thin.node_names == short_run.node_names
    np.testing.assert_array_equal(thin.temperatures_k.max(axis=0), short_run.temperatures_k.max(axis=0))
    for a, b in zip(thin.checks, short_run.checks):
        assert (a.name, a.peak_k, a.peak_time_s, a.margin_k) == (b.name, b.peak_k, b.peak_time_s, b.margin_k)
    assert thin.laps == short_run.laps
    assert thin.energy == short_run.energy


def test_the_default_interval_is_one_second():
    from thermo.scenario import load_scenario
    from chain_runs import SMALL
    default = load_scenario(SMALL).solver
    assert default.output_s == 1.0 and default.output_hz == 0.0
    run = solve_one(small_scenario(SHORT_PLAN, NO_WEAR + [("solver.output_s", 1.0)]))
    steps = np.floor(run.time_s)
    # one row a second, plus each segment's ends and every node's extremes in each segment
    assert set(steps) == set(np.floor(np.arange(0.0, run.time_s[-1])))
    assert run.time_s.size < 1.2 * run.time_s[-1] + 20 * len(run.node_names) * 3
