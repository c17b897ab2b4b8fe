"""The one terminal table formatter (issue 17): columns as wide as their content, numbers right-aligned,
long names abbreviated with a key below, so columns never run together (the issue quotes
``1019.31096.5 (+77.2)``); and every command's tables (run, compare, lap, settle, fit) use it."""
from __future__ import annotations

import dataclasses
import re
from types import SimpleNamespace

import numpy as np
import pytest

from thermo.cli.compare_cmd import format_comparison
from thermo.cli.lap_cmd import format_lap
from thermo.cli.settle_cmd import format_settled
from thermo.fit.report import format_fit
from thermo.output import format_run_report
from thermo.output.text_table import MAX_TEXT_WIDTH, format_table, is_number

LONG_CHECK = "fluid_boiling_at_the_end_of_a_very_long_soak_with_the_ducts_closed"


def spans(rule: str) -> list[tuple[int, int]]:
    """(first, last + 1) character of each column, read off the rule of dashes under the header."""
    return [m.span() for m in re.finditer(r"-+", rule)]


def assert_columns_hold(block: list[str]) -> list[list[str]]:
    """Header, rule and rows of one table: no cell crosses into the gap between two columns, and
    right-aligned (numeric) cells end at their column's right edge. Returns the rows' cells."""
    header, rule, *rows = block
    columns = spans(rule)
    assert len(columns) >= 2
    cells = []
    for line in [header, *rows]:
        for (a, b), (c, _) in zip(columns, columns[1:]):
            assert line[b:c].strip() == "", f"column runs into the next one at {b}..{c}: {line!r}"
        cells.append([line[a:b].strip() for a, b in columns[:-1]] + [line[columns[-1][0]:].strip()])
    for j, (_, b) in enumerate(columns[:-1]):
        if all(row[j] and is_number(row[j]) for row in cells[1:]):
            assert all(line[b - 1] != " " for line in rows), f"numbers of column {j + 1} are not right-aligned"
    return cells[1:]


def block_after(text: str, title: str, rows: int) -> list[str]:
    """The header, rule and ``rows`` rows of the table under the first line that starts with ``title``."""
    lines = text.splitlines()
    start = next(i for i, line in enumerate(lines) if line.strip().startswith(title))
    return lines[start + 1:start + 3 + rows]


def test_wide_numbers_never_run_together():
    # the case: a column narrower than its numbers ran 1019.3 into 1096.5 (+77.2)
    lines = format_table(["", "base", "duct"], [["peak disc", "1019.3", "1096.5 (+77.2)"],
                                                ["peak fluid", "5.0", "123456789.1 (+123456784.1)"]])
    cells = assert_columns_hold(lines[:4])
    assert cells == [["peak disc", "1019.3", "1096.5 (+77.2)"], ["peak fluid", "5.0", "123456789.1 (+123456784.1)"]]
    assert "1019.3  " in lines[2] and lines[2].endswith("1096.5 (+77.2)")
    assert lines[3].index("5.0") + 3 == lines[2].index("1019.3") + 6          # right-aligned
    assert len(lines) == 4                                                     # nothing abbreviated, no key


def test_a_very_long_check_name_is_abbreviated_with_a_key_below():
    rows = [[LONG_CHECK, "fluid", "+60.0"], ["bearing_grease", "bearing", "-5.2"], [LONG_CHECK, "fluid", "+1.0"]]
    lines = format_table(["check", "node", "margin [K]"], rows)
    cells = assert_columns_hold(lines[:5])
    short = cells[0][0]
    assert len(short) == MAX_TEXT_WIDTH and short.endswith("~1") and LONG_CHECK.startswith(short[:-2])
    assert cells[2][0] == short                                  # the same name, the same mark
    assert cells[1] == ["bearing_grease", "bearing", "-5.2"]
    assert lines[5:] == [f"  ~1 = {LONG_CHECK}"]                # the key, once


def test_numbers_are_never_abbreviated_and_the_last_column_keeps_its_text():
    wide = "1" * 60 + ".5"
    lines = format_table(["a", "value", "source"], [["x", wide, "a very long source " * 5]])
    assert wide in lines[2] and ("a very long source " * 5).strip() in lines[2] and "~" not in "".join(lines)


def test_alignment_and_missing_values():
    lines = format_table(["node", "peak [degC]", "at [m:s]"], [["disc", "530.0", "5:00"], ["pad", "-", "15:00"]])
    assert lines[2] == "  disc        530.0      5:00" and lines[3] == "  pad             -     15:00"
    assert format_table(["a", "b"], [["x", "y"]], align=["right", "left"])[2] == "  x  y"
    with pytest.raises(ValueError, match="row 1 has 1 cells, expected 2"):
        format_table(["a", "b"], [["x"]])


def test_run_report_tables_hold_with_a_long_check_name(results):
    corner = results.corners[0]
    checks = (dataclasses.replace(corner.checks[0], name=LONG_CHECK),) + corner.checks[1:]
    results = dataclasses.replace(results, corners=(dataclasses.replace(corner, checks=checks),))
    text = format_run_report(results)
    cells = assert_columns_hold(block_after(text, "Limit checks", len(checks)))
    assert cells[0][0].endswith("~1") and cells[0][1:6] == ["fluid", "230.0", "170.0", "+60.0", "ok"]
    assert f"  ~1 = {LONG_CHECK}" in text.splitlines()
    assert_columns_hold(block_after(text, "Peak temperatures", len(corner.node_names)))
    assert_columns_hold(block_after(text, "Per-lap maxima", len(corner.laps)))


def _comparison(names=("baseline", "a_duct_with_a_name_longer_than_forty_characters_in_all", "vented")) -> dict:
    def corner(scale):
        return {"name": "front", "peak_c": {"disc": 1019.3 * scale, "fluid": 180.0 * scale},
                "checks": [{"name": LONG_CHECK, "margin_k": 40.0 / scale}, {"name": "disc_max", "margin_k": -269.3 * scale}]}
    return {"scenario": "s", "caution": "CAUTION", "changes": [],
            "variants": [{"name": n, "corners": [corner(1.0 + 0.0757 * i)]} for i, n in enumerate(names)]}


def test_compare_table_holds_wide_numbers_and_long_names():
    text = format_comparison(_comparison())
    cells = assert_columns_hold(block_after(text, "Corner front", 4))
    assert cells[0][:3] == ["peak disc", "1019.3", "1096.5 (+77.2)"]     # the numbers, apart
    assert cells[2][0].startswith("margin fluid_boiling") and cells[2][0].endswith("~2")
    assert block_after(text, "Corner front", 0)[0].split()[-2:] == ["a_duct_with_a_name_longer_than_forty_c~1", "vented"]
    key = [line.strip() for line in text.splitlines() if line.strip().startswith("~")]
    assert key == ["~1 = a_duct_with_a_name_longer_than_forty_characters_in_all", f"~2 = margin {LONG_CHECK}"]


def test_lap_table_holds_long_segment_names():
    zone = {"t_start_s": 12.1, "t_end_s": 14.95, "d_start_m": 865.0, "d_end_m": 1000.0, "v_in_kmh": 294.7,
            "v_out_kmh": 75.0, "duration_s": 2.85, "peak_decel_g": 3.3, "energy_j": 123456789.0}
    segment = {"name": "The very long and winding road down to the river mill", "kind": "straight", "d_start_m": 0.0,
               "length_m": 1000.0, "v_entry_kmh": 189.6, "v_min_kmh": 77.6, "v_max_kmh": 295.0}
    summary = {"trace": "t", "duration_s": 100.0, "length_m": 5000.0, "car_from": "c", "power_method": "energy",
               "repairs": [], "zones": [zone], "energy_per_lap_j": 1.4e7,
               "corners": [{"name": "front", "energy_j": 4.3e6, "disc_energy_j": 4.2e6, "pad_energy_j": 1e5,
                            "mean_power_w": 4.18e4, "mean_braking_power_w": 3.5e5, "peak_power_w": 8.8e5}],
               "built": {"track_file": "k.toml", "sample_hz": 20, "lap_time_s": 100.0, "top_speed_kmh": 295.0,
                         "min_speed_kmh": 75.0, "segments": [segment]}}
    text = format_lap(summary)
    assert assert_columns_hold(block_after(text, "Segments of the built lap", 1))[0][1].endswith("~1")
    assert assert_columns_hold(block_after(text, "Braking zones", 1))[0][-1] == "123456.8"
    assert assert_columns_hold(block_after(text, "Per corner", 1))[0][:2] == ["front", "4300.0"]


def test_settle_table_holds_long_check_names():
    check = {"name": LONG_CHECK, "node": "fluid_at_piston", "limit_c": 312.0, "peak_c": 1180.5, "margin_k": -868.5,
             "status": "exceeded"}
    data = {"scenario": "s", "caution": "CAUTION", "corners": [{
        "name": "front", "phase": "race", "lap_time_s": 100.0, "laps_to_within_1k": 12, "method": "newton",
        "lap_solves": 4, "residual_k": 1e-4, "peak_c": {"disc": 1019.31, "fluid": 180.0},
        "min_c": {"disc": 300.0, "fluid": 150.0}, "checks": [check]}]}
    text = format_settled(data)
    assert assert_columns_hold(block_after(text, "Corner front", 2))[0] == ["disc", "1019.3", "300.0"]
    row = assert_columns_hold(block_after(text, "(newton", 1))[0]
    assert row[0].endswith("~1") and row[2:] == ["312.0", "1180.5", "-868.5", "EXCEEDED"]


def test_fit_table_holds_long_parameter_names():
    value = SimpleNamespace(name="corners.front.ducts.main.duct_quality_and_a_much_longer_tail", value=123456.7,
                            std_error=0.5, prior=1.0, lower=0.1, upper=4.0, at_bound=False)
    result = SimpleNamespace(values=[value], correlation=np.eye(1), rms_k={"temp_disc_front": 1.25},
                             holdout_laps=(), holdout_rms_k={}, peaks=[], evaluations=3, message="ok", warnings=[])
    text = format_fit(result)
    row = assert_columns_hold(text.splitlines()[:3])[0]
    assert row[0].endswith("~1") and row[1:5] == ["1.235e+05", "0.5", "1", "[0.1, 4]"]
    assert f"~1 = {value.name}" in text


def test_the_last_columns_rule_stops_at_the_text_width():
    source = "a published source of this limit, " * 6
    lines = format_table(["check", "source"], [["disc_max", source.strip()]])
    assert lines[1] == "  --------  " + "-" * MAX_TEXT_WIDTH and lines[2].endswith(source.strip())
