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
