"""The terminal report: what it must say, and the soak marking."""
import dataclasses


from thermo import CAUTION
from thermo.output import format_run_report
from thermo.output.report import AFTER_STOP_MARK, STILL_RISING_MARK


def _section(text, title):
    """Lines of the first table that follows a line starting with title, up to the next blank line."""
    lines = text.splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith(title))
    end = next((i for i in range(start, len(lines)) if not lines[i].strip()), len(lines))
    return lines[start:end]


def test_report_basics(results):
    text = format_run_report(results)
    assert text.rstrip().endswith(CAUTION)
    assert text.isascii()
    for name in ("front_left", "rear_left", "invented_car_at_invented_circuit", "LSODA", "FMVSS No. 116"):
        assert name in text
    assert "! duct flow outside correlation range at lap 3" in text
    assert "Overrides applied on top of the scenario file:\n  corners.front.piston.shim_thickness_mm = 1.0\n" in text
    for header in ("peak [degC]", "limit [degC]", "margin [K]", "after stop [s]", "braking [kJ]"):
        assert header in text


def test_check_rows(results):
    rows = _section(format_run_report(results), "Limit checks")
    row = {line.split()[0]: line.split() for line in rows[3:]}
    # fluid peak 170 degC (30 degC ambient + 140 K bump); FMVSS 116 DOT 4 limits 230 dry, 155 wet
    assert row["fluid_boiling_dry"][1:6] == ["fluid", "230.0", "170.0", "+60.0", "ok"]
    assert row["fluid_boiling_wet"][1:6] == ["fluid", "155.0", "170.0", "-15.0", "EXCEEDED"]
    assert row["bearing_grease"][5] == "CAUTION"


def test_peak_rows(results, factory):
    rows = _section(format_run_report(results), "Peak temperatures")
    peaks = {line.split()[0]: line.split() for line in rows[3:]}
    assert set(peaks) == set(factory.NODES)
    rise, t0, _ = factory.BUMPS["disc"]
    assert peaks["disc"][1:4] == [f"{30 + rise:.1f}", f"{t0:.1f}", "5:00"]


def test_soak_marks_nodes_whose_worst_came_after_stop(results):
    rows = _section(format_run_report(results), "Soak after the stop at 900.0 s (15:00)")
    by_node = {line.split()[0]: line for line in rows[3:-1]}
    for node in ("fluid", "piston", "hub", "upright", "bearing"):
        assert AFTER_STOP_MARK in by_node[node]
    for node in ("disc", "pad", "caliper"):
        assert AFTER_STOP_MARK not in by_node[node]
    assert by_node["fluid"].split()[1:4] == ["170.0", "100.0", "1:40"]
    assert rows[-1].strip() == "Peak of the whole run came after the stop for: fluid, piston, hub, upright, bearing"


def test_no_stop_says_so(factory):
    text = format_run_report(factory.results(stop=False))
    assert "Soak: the run has no stop" in text
    assert AFTER_STOP_MARK not in text


def test_short_run_shows_every_lap(results):
    rows = _section(format_run_report(results), "Per-lap maxima")
    assert rows[0] == "Per-lap maxima [degC], 10 laps"
    assert [r.split()[0] for r in rows[3:]] == [str(i) for i in range(1, 11)]


def test_long_run_shows_every_nth_plus_worst(factory):
    r = factory.results(n_race_laps=60)
    corner = r.corners[0]
    # make lap 30 the hottest for the fluid (smallest-margin check watches the fluid)
    laps = list(corner.laps)
    laps[29] = dataclasses.replace(laps[29], max_k={**laps[29].max_k, "fluid": 480.0})
    r = dataclasses.replace(r, corners=(dataclasses.replace(corner, laps=tuple(laps)),))
    rows = _section(format_run_report(r), "Per-lap maxima")
    assert rows[0] == "Per-lap maxima [degC], 62 laps (every 4th lap shown, plus the last and the worst, lap 30)"
    shown = [int(line.split()[0]) for line in rows[3:]]
    assert shown == sorted(set(range(1, 63, 4)) | {30, 62})
    assert len(shown) < 40


def test_pad_thickness_lines(factory):
    from thermo.results import StintPadThickness
    default = format_run_report(factory.results())
    assert "Pad thickness [mm]: start 25.0, end 19.5" in default
    assert "Pad minimum thickness [mm]: 6.0" in default
    # the stints as the run chain names them: the pit stop that changed pads, then the end of the run
    chain = format_run_report(factory.results(facts=factory.facts(
        pad_thickness_m=(StintPadThickness("pit_stop 6", 0.022), StintPadThickness("end of run", 0.0183)),
        pad_minimum_thickness_m=0.0045)))
    assert "Pad thickness [mm]: pit_stop 6 22.0, end of run 18.3" in chain
    assert "Pad minimum thickness [mm]: 4.5" in chain
    none = format_run_report(factory.results(facts=factory.facts(pad_thickness_m=())))
    assert "Pad thickness [mm]" not in none and "Pad minimum thickness [mm]: 6.0" in none


def test_still_rising_soak_asks_for_a_longer_soak(results, factory):
    assert "still rising" not in format_run_report(results)
    text = format_run_report(dataclasses.replace(results, corners=(factory.rising_fluid_corner(),)))
    rows = _section(text, "Soak after the stop at 900.0 s (15:00)")
    by_node = {line.split()[0]: line for line in rows[3:-2]}
    assert STILL_RISING_MARK in by_node["fluid"] and STILL_RISING_MARK not in by_node["bearing"]
    assert rows[-1].strip() == "! fluid still rising at the end of the soak: run a longer soak (plan soak duration_s)"
    checks = _section(text, "Limit checks")
    assert checks[-1].strip().startswith("! fluid_boiling_dry: peak still rising at the end of the soak")
    assert checks[-1].rstrip().endswith("run a longer soak (plan soak duration_s)")


def test_the_number_of_lap_rows_is_the_users_choice(factory):
    """`run --laps all|N` (issue 17): every lap of a long run, or about N rows."""
    r = factory.results(n_race_laps=60)
    every = _section(format_run_report(r, lap_rows=10 ** 9), "Per-lap maxima")
    assert every[0] == "Per-lap maxima [degC], 62 laps"
    assert [int(line.split()[0]) for line in every[3:]] == list(range(1, 63))
    few = _section(format_run_report(r, lap_rows=7), "Per-lap maxima")
    shown = [int(line.split()[0]) for line in few[3:]]
    assert 7 <= len(shown) <= 9 and shown[-1] == 62          # about 7, with the last (and the worst)
