"""Plots are written as real PNG files; the comparison's margin gains have the right values."""
import pytest

from thermo.output import OutputError, plot_comparison, plot_run
from thermo.output.analysis import margin_gains

# PNG signature: W3C PNG specification (2nd ed.) / ISO/IEC 15948:2004, section 5.2
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _png_size(path):
    """Width and height from the IHDR chunk, the first chunk after the signature (same spec, 11.2.2)."""
    data = path.read_bytes()
    assert data[:8] == PNG_SIGNATURE and data[12:16] == b"IHDR"
    return int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")


def test_plot_run_writes_pngs(factory, tmp_path):
    paths = plot_run(factory.results(dt=10.0), tmp_path / "plots")
    names = [p.name for p in paths]
    assert names == ["temperatures_front_left.png", "temperatures_rear_left.png", "lap_peaks.png", "heat_paths.png"]
    for path in paths:
        assert path.stat().st_size > 10_000
        width, height = _png_size(path)
        assert width > 400 and height > 150
    assert sorted(p.name for p in (tmp_path / "plots").iterdir()) == sorted(names)   # no temp files left


def test_plot_run_without_laps_skips_lap_plot(factory, tmp_path):
    import dataclasses
    r = factory.results(dt=20.0)
    r = dataclasses.replace(r, corners=tuple(dataclasses.replace(c, laps=()) for c in r.corners))
    names = [p.name for p in plot_run(r, tmp_path)]
    assert not any("lap_peaks" in n for n in names) and len(names) == 3


def test_margin_gains_values(factory):
    base, cooler = factory.results(scale_rear=0.8), factory.results(scale_rear=0.6)
    gains = margin_gains([("baseline", base), ("bigger duct", cooler)])
    # analytic: the rear bumps shrink by 0.2 of their height: fluid 140 K, bearing 100 K
    assert gains["bigger duct"]["rear_left"]["fluid"] == pytest.approx(0.2 * 140.0)
    assert gains["bigger duct"]["rear_left"]["bearing"] == pytest.approx(0.2 * 100.0)
    assert gains["bigger duct"]["front_left"] == {"fluid": pytest.approx(0.0), "bearing": pytest.approx(0.0)}


def test_margin_gains_follow_the_node_the_fluid_checks_read(factory):
    """Runs of the current corner model check the fluid at the pistons: its gain is reported there
    (the bulk fluid then has no check of its own and no gain)."""
    import dataclasses

    def at_piston(results):
        corners = []
        for c in results.corners:
            names = tuple("fluid_at_piston" if n == "fluid" else n for n in c.node_names)
            checks = tuple(dataclasses.replace(k, node="fluid_at_piston") if k.node == "fluid" else k for k in c.checks)
            corners.append(dataclasses.replace(c, node_names=names, checks=checks))
        return dataclasses.replace(results, corners=tuple(corners))
    gains = margin_gains([("baseline", at_piston(factory.results(scale_rear=0.8))),
                          ("bigger duct", at_piston(factory.results(scale_rear=0.6)))])
    # the same analytic bump as above: 0.2 of the 140 K fluid bump
    assert gains["bigger duct"]["rear_left"]["fluid_at_piston"] == pytest.approx(0.2 * 140.0)
    assert "fluid" not in gains["bigger duct"]["rear_left"]


def test_plot_comparison_writes_pngs(factory, tmp_path):
    variants = [("baseline", factory.results(dt=10.0)), ("titanium pistons", factory.results(scale_rear=0.7, dt=10.0)),
                ("bigger duct", factory.results(scale_rear=0.6, dt=10.0))]
    paths = plot_comparison(variants, tmp_path)
    assert [p.name for p in paths] == ["compare_front_left_fluid_bearing.png", "compare_rear_left_fluid_bearing.png",
                                       "compare_margin_gain.png"]
    for path in paths:
        assert path.stat().st_size > 10_000
        _png_size(path)


def test_comparison_needs_matching_corners(factory, tmp_path):
    import dataclasses
    base = factory.results()
    other = dataclasses.replace(base, corners=base.corners[:1])
    with pytest.raises(OutputError, match="no corner 'rear_left'"):
        plot_comparison([("baseline", base), ("one corner", other)], tmp_path)
    with pytest.raises(OutputError, match="unique"):
        plot_comparison([("same", base), ("same", base)], tmp_path)
    assert list(tmp_path.iterdir()) == []


def test_the_temperature_figure_reads_at_a_glance():
    """Issue 17: stacked panels sharing the time axis (speed and brake power on top, then disc and
    pad, pistons and fluid, hub and bearing), labels in words with units, each check's limit as its
    own line in the panel of its node, the stop marked. Checked on matplotlib's objects, on a real run."""
    from pathlib import Path
    from thermo.chain.run import run_scenario
    from thermo.output.plots import corner_temperature_figure
    from thermo.scenario import load_scenario
    small = Path(__file__).resolve().parents[1] / "data" / "small.toml"
    run = run_scenario(load_scenario(small, [("plan.phases.1.count", 1), ("plan.phases.4.count", 1),
                                             ("plan.phases.5.duration_s", 60)]))
    corner = run.corners[0]
    figure = corner_temperature_figure(corner, "small ")
    axes = [a for a in figure.axes if a.get_title(loc="left")]
    assert [a.get_title(loc="left") for a in axes] == ["speed and brake power", "disc and pad",
                                                       "pistons, fluid and caliper", "hub, bearing and upright"]
    assert axes[0].get_ylabel() == "speed [km/h]" and any(a.get_ylabel() == "brake power [kW]" for a in figure.axes)
    assert all(a.get_ylabel() == "temperature [degC]" for a in axes[1:])
    assert axes[-1].get_xlabel() == "time from the start of the run [min]"
    assert all(a in axes[0].get_shared_x_axes().get_siblings(axes[0]) for a in axes)   # one time axis
    for panel in axes[1:]:
        labels = panel.get_legend_handles_labels()[1]
        nodes_here = [n for n in corner.node_names if any(label == _word(n) for label in labels)]
        limits = [label for label in labels if label.startswith("limit: ")]
        # every check on a node of this panel has its own limit line, and no other does
        expected = [c for c in corner.checks if c.node in nodes_here]
        assert len(limits) == len(expected) and all(c.name.replace("_", " ") in " ".join(limits) for c in expected)
    styles = {line.get_linestyle() for line in axes[2].get_lines() if line.get_label().startswith("limit: fluid")}
    assert len(styles) == 3                       # the three fluid limits, each in its own style
    assert any(line.get_label() == "car stops" for line in axes[0].get_lines())
    assert "\nsmall" not in figure.get_suptitle() and figure.get_suptitle().startswith("small\ncorner front")


def _word(node):
    from thermo.output.plots import node_style
    return node_style(node)[2]


def _envelope_by_loop(x, y, max_points):
    """The envelope written out run by run: ``numpy.argmin``/``numpy.argmax`` of each run (their
    documented first-occurrence rule, NaN first), as the plots drew it before it was vectorised."""
    import numpy as np
    if x.size <= max_points:
        return x, y
    edges = np.linspace(0, x.size, max_points // 2 + 1).astype(int)
    keep = []
    for a, b in zip(edges[:-1], edges[1:]):
        if b > a:
            keep += sorted({a + int(np.argmin(y[a:b])), a + int(np.argmax(y[a:b]))})
    return x[keep], y[keep]


@pytest.mark.parametrize("n", [10, 3000, 3001, 4999, 96740])
@pytest.mark.parametrize("kind", ["noise", "ties", "nan", "flat", "spike"])
def test_envelope_keeps_every_extreme_and_its_time(n, kind):
    """Issue 14: the thinned series keeps the series' highest and lowest sample, at their times,
    in every run of samples (checked against the per-run numpy.argmin/argmax loop), in time order."""
    import numpy as np
    from thermo.output.plots import envelope
    rng = np.random.default_rng(n)
    x = np.arange(n) * 0.1
    y = {"noise": rng.normal(size=n), "ties": np.round(rng.normal(size=n), 1), "nan": rng.normal(size=n),
         "flat": np.full(n, 300.0), "spike": np.zeros(n)}[kind]
    if kind == "nan":
        y[rng.integers(0, n, 5)] = np.nan
    if kind == "spike":
        y[n // 3], y[n // 2] = 1000.0, -1000.0           # one sample high, one low: both must survive
    for max_points in (3000, 3001, 7):
        ex, ey = envelope(x, y, max_points)
        rx, ry = _envelope_by_loop(x, y, max_points)
        assert np.array_equal(ex, rx) and np.array_equal(ey, ry, equal_nan=True)
        assert ex.size <= max_points and np.all(np.diff(ex) > 0)
        if kind != "nan":
            assert ey.max() == y.max() and ex[np.argmax(ey)] == x[np.argmax(y)]
            assert ey.min() == y.min() and ex[np.argmin(ey)] == x[np.argmin(y)]


def _mark_phases_one_patch_each(axes, corner, label, unit_s=60.0):
    """The phase shading as it was drawn before issue 14: one ``axvspan`` per phase (matplotlib's
    own span artist, the reference for the collections that replaced it)."""
    from thermo.output.plots import PHASE_SHADES
    used = set()
    for phase in corner.phases:
        if phase.kind in PHASE_SHADES:
            colour, name = PHASE_SHADES[phase.kind]
            axes.axvspan(phase.t_start_s / unit_s, phase.t_end_s / unit_s, color=colour, alpha=0.12,
                         label=name if label and phase.kind not in used else None)
            used.add(phase.kind)
    if corner.stop_time_s is not None:
        axes.axvline(corner.stop_time_s / unit_s, color="black", linestyle=":", linewidth=1.2,
                     label="car stops" if label else None)


def test_phase_shading_draws_as_one_span_per_phase(factory, tmp_path, monkeypatch):
    """Issue 14: the shaded phases are one collection per kind; the PNG is the one matplotlib's
    axvspan per phase drew, byte for byte (in-laps and pit stops side by side, a soak running past
    the last stored sample so the time axis must widen to hold it), and the legend names each
    kind once."""
    import dataclasses
    from thermo.output import plots
    from thermo.results import PhaseSpan
    results = factory.results(dt=10.0)
    spans = [PhaseSpan("out lap", "out_lap", 0.0, 60.0)]
    for k in range(5):                                   # in lap, then its pit stop, five times
        start = 100.0 + 120.0 * k
        spans += [PhaseSpan(f"in {k}", "in_lap", start, start + 50.0), PhaseSpan(f"stop {k}", "pit_stop", start + 50.0,
                                                                                   start + 70.0)]
    spans += [PhaseSpan("safety car", "safety_car", 700.0, 760.0), PhaseSpan("soak", "soak", 900.0, 1500.0)]
    corner = dataclasses.replace(results.corners[0], phases=tuple(spans))
    plots.save_png(plots.corner_temperature_figure(corner, "t "), tmp_path / "collections.png")
    figure = plots.corner_temperature_figure(corner, "t ")
    monkeypatch.setattr(plots, "_mark_phases", _mark_phases_one_patch_each)
    plots.save_png(plots.corner_temperature_figure(corner, "t "), tmp_path / "patches.png")
    assert (tmp_path / "collections.png").read_bytes() == (tmp_path / "patches.png").read_bytes()
    top = figure.axes[0]
    labels = top.get_legend_handles_labels()[1]
    assert [x for x in labels if x in ("in lap", "pit stop", "safety car", "soak (car stopped)")] == [
        "in lap", "pit stop", "safety car", "soak (car stopped)"]
    assert all(a.get_xlim()[1] >= 1500.0 / 60.0 for a in figure.axes)


def _matplotlib_png_and_svg(make):
    """A fresh figure from ``make`` saved by matplotlib's own ``savefig`` (its layout run inside a
    draw with drawing switched off) as PNG bytes, and another as SVG text, with the options and the
    clean-up of ``save_png`` and ``svg_text`` as they were before issue 14."""
    import io
    import re
    from matplotlib import rc_context
    from matplotlib.text import Text
    from thermo.output.plots import DPI
    figures = [make(), make()]
    for figure in figures:
        for text in figure.findobj(Text):
            text.set_parse_math(False)
    png = io.BytesIO()
    figures[0].savefig(png, format="png", dpi=DPI)
    buffer = io.StringIO()
    with rc_context({"svg.fonttype": "none", "svg.hashsalt": "brakeheat"}):
        figures[1].savefig(buffer, format="svg", metadata={"Date": None})
    svg = buffer.getvalue()
    svg = re.sub(r"<metadata>.*?</metadata>\s*", "", svg[svg.index("<svg"):], flags=re.S)
    return png.getvalue(), re.sub(r'\s+xmlns:(dc|cc|rdf)="[^"]*"', "", svg)


def test_plots_are_matplotlibs_own_files_byte_for_byte(factory, tmp_path):
    """Issue 14: the plots run constrained layout on its own and draw once, and `--out` draws each
    run figure twice (its PNG, then the report's SVG). The PNG and the SVG are the files
    matplotlib's savefig writes for a fresh figure (the reference), whatever was drawn before
    (constrained layout starts from where the last draw left the axes: without putting them back
    a second drawing came out a fraction of a point apart), for a temperature plot (panels, a twin
    axis, a figure title), the lap peak and heat path plots and the comparison's bars."""
    from thermo.output.plots import margin_gain_figure, run_figures, save_png, svg_text
    results = factory.results(dt=10.0)
    runs = dict(run_figures(results))
    assert list(runs) == ["temperatures_front_left.png", "temperatures_rear_left.png", "lap_peaks.png",
                          "heat_paths.png"]
    variants = [("baseline", results), ("bigger duct", factory.results(scale_rear=0.6, dt=10.0))]
    makers = [runs["temperatures_front_left.png"], runs["lap_peaks.png"], runs["heat_paths.png"],
              lambda: margin_gain_figure(variants)]
    for k, make in enumerate(makers):
        png, svg = _matplotlib_png_and_svg(make)
        figure = make()
        assert save_png(figure, tmp_path / f"{k}.png").read_bytes() == png
        assert svg_text(figure) == svg
        assert save_png(figure, tmp_path / f"{k}.png").read_bytes() == png
        assert figure.get_layout_engine() is not None and figure.canvas.figure is figure   # left as it was


def test_a_figure_is_still_drawn_where_matplotlib_lacks_the_layout_attributes(tmp_path, monkeypatch):
    # the layout restore reads matplotlib's own attributes; a matplotlib without them must still
    # get its plots written (only the restore is skipped)
    from thermo.output import plots

    def lacking(figure):
        raise AttributeError("'Axes' object has no attribute '_originalPosition'")
    monkeypatch.setattr(plots, "_layout_state", lacking)
    figure = plots._new_figure()
    figure.add_subplot().plot([0, 1], [0, 1])
    path = plots.save_png(figure, tmp_path / "p.png")
    assert path.stat().st_size > 1000


def test_a_long_race_marks_about_60_of_its_laps_and_joins_them_all():
    from thermo.output.plots import MARKED_LAPS, lap_marker_every
    assert lap_marker_every(1) == 1 and lap_marker_every(MARKED_LAPS) == 1     # every lap of a stint marked
    for n in (61, 200, 804, 5000):
        every = lap_marker_every(n)
        marked = len(range(0, n, every))
        assert MARKED_LAPS / 2 <= marked <= MARKED_LAPS, (n, every, marked)
