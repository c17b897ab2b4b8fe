"""`brakeheat compare`: baseline first, a no-op variant reproduces it exactly, a real change moves peaks."""
from __future__ import annotations

import json

import pytest

from thermo.studies.compare import variant_overrides
from thermo.scenario.overrides import parse_override
from conftest import SHRINK, SMALL, cli


def test_variants_listed_baseline_first(comparison):
    assert [v["name"] for v in comparison["variants"]] == ["baseline", "same", "bigger_duct"]
    assert [c["name"] for c in comparison["changes"]] == ["same", "bigger_duct"]
    for variant in comparison["variants"]:
        assert [c["name"] for c in variant["corners"]] == ["front", "rear"]
        for corner in variant["corners"]:
            assert {"peak_c", "peak_time_s", "checks", "energy"} <= set(corner)   # as in run --json
            assert abs(corner["energy"]["balance_rel_error"]) < 1e-5


def test_variant_equal_to_baseline_reproduces_it_exactly(comparison):
    base, same = comparison["variants"][0], comparison["variants"][1]
    # small.toml has pad_mu = 0.50 for the front: the override changes nothing, so nothing may change
    assert same["corners"] == base["corners"]
    for corner in comparison["changes"][0]["corners"]:
        assert set(corner["peak_change_k"].values()) == {0.0}
        assert set(corner["margin_change_k"].values()) == {0.0}


def test_bigger_front_duct_cools_the_front_only(comparison):
    base, duct = comparison["variants"][0], comparison["variants"][2]
    front_b, front_d = base["corners"][0], duct["corners"][0]
    # physical invariant (CONVENTIONS.md): more cooling never raises a peak
    for node in ("disc", "pad", "fluid", "caliper", "bearing"):
        assert front_d["peak_c"][node] <= front_b["peak_c"][node] + 0.01, node
    assert front_d["peak_c"]["disc"] < front_b["peak_c"]["disc"] - 1.0     # and twice the duct does something
    assert duct["corners"][1] == base["corners"][1]                         # the rear corner is untouched
    change = comparison["changes"][1]["corners"][0]
    for node, delta in change["peak_change_k"].items():
        assert delta == pytest.approx(front_d["peak_c"][node] - front_b["peak_c"][node], abs=0.011)
    for check_b, check_d in zip(front_b["checks"], front_d["checks"]):
        assert change["margin_change_k"][check_b["name"]] == pytest.approx(check_d["margin_k"] - check_b["margin_k"], abs=0.011)


def test_variant_selection_and_replacement():
    raw = {"variants": {"vented": {"corners.front.piston.type": "vented"}, "ti": {"corners.front.piston.material": "x"}}}
    cli_variants = [["ti", "corners.front.piston.material=titanium_6al_4v"], ["duct", "corners.front.ducts.main.inlet_area_mm2=1"]]
    all_ = variant_overrides(raw, cli_variants, None, "s.toml")
    assert [n for n, _ in all_] == ["vented", "ti", "duct"]       # scenario ones first; the CLI 'ti' replaces the file's
    assert dict(all_)["ti"] == [parse_override("corners.front.piston.material=titanium_6al_4v")]
    only = variant_overrides(raw, cli_variants, ["duct", "vented"], "s.toml")
    assert [n for n, _ in only] == ["vented", "duct"]


def test_only_selects_through_the_cli():
    code, out, err = cli(["compare", SMALL, "--json", "--quiet", *SHRINK, "--set", "plan.phases.5.duration_s=5",
                          "--variant", "a", "corners.rear.pad_mu=0.4", "--variant", "b", "corners.rear.pad_mu=0.45",
                          "--only", "b"])
    assert code == 0, err
    data = json.loads(out)
    assert [v["name"] for v in data["variants"]] == ["baseline", "b"]
    assert data["variants"][0]["corners"][0]["name"] == "front"


# issue 16: caliper swaps. small.toml with hydraulic bias (invented master cylinders) and a variant
# with bigger front pistons, which moves the front share of the brake torque
HYDRAULIC = ["--set", "brakes.bias=hydraulic", "--set", "brakes.master_cylinder_front_mm=19.05",
             "--set", "brakes.master_cylinder_rear_mm=22.2", "--set", "brakes.balance_bar_front_share=0.55"]
SWAP = ["--variant", "big_front_pistons", "corners.front.piston.diameters_mm=[36, 40, 42]"]


@pytest.mark.parametrize("how, key", [("balance_bar", "brakes.balance_bar_front_share"),
                                      ("rear_master_cylinder", "brakes.master_cylinder_rear_mm")])
def test_keep_bias_holds_the_front_share_within_a_tenth_of_a_point(how, key):
    code, out, err = cli(["compare", str(SMALL), *SHRINK, *HYDRAULIC, *SWAP, "--only", "big_front_pistons",
                          "--keep-bias", how, "--json", "--quiet"])
    assert code == 0, err
    data = json.loads(out)
    base, swap = (v["hydraulics"] for v in data["variants"])
    assert abs(swap["front_share"] - base["front_share"]) * 100 < 0.1
    change = data["changes"][0]
    assert change["rebalanced"]["key"] == key and change["rebalanced"]["from"] != change["rebalanced"]["to"]
    # the caliper swap itself still shows: more clamp force and more fluid per mm at the front
    front = change["hydraulics"]["corners"]["front"]
    assert front["clamp_force_n_per_bar"] > 0 and front["fluid_displacement_cm3_per_mm"] > 0
    assert "warning" not in err


def test_a_caliper_swap_that_moves_the_bias_is_named_without_keep_bias():
    code, out, err = cli(["compare", str(SMALL), *SHRINK, *HYDRAULIC, *SWAP, "--only", "big_front_pistons",
                          "--json", "--quiet"])
    assert code == 0, err
    data = json.loads(out)
    moved = data["changes"][0]["hydraulics"]["front_share_change_points"]
    assert moved > 1.0 and data["changes"][0]["rebalanced"] is None
    assert "variant 'big_front_pistons' moves the front share" in err and "--keep-bias" in err


def test_keep_bias_needs_hydraulic_bias():
    code, _, err = cli(["compare", str(SMALL), *SHRINK, *SWAP, "--keep-bias", "balance_bar", "--json"])
    assert code == 1 and "bias = \"hydraulic\"" in err and len(err.strip().splitlines()) == 1


def test_compare_out_writes_report_html(tmp_path):
    from html.parser import HTMLParser

    from thermo.output.manifest import verify_manifest
    name = "cool <b>duct</b>"
    code, out, err = cli(["compare", SMALL, "--quiet", *SHRINK, "--variant", name,
                          "corners.front.ducts.main.inlet_area_mm2=18000", "--out", tmp_path])
    assert code == 0, err
    assert verify_manifest(tmp_path) == [] and "report.html" in out
    page = (tmp_path / "report.html").read_text(encoding="utf-8")
    tags = []
    parser = HTMLParser()
    parser.handle_starttag = lambda tag, attrs: tags.append(tag)
    parser.feed(page)
    assert page.startswith("<!DOCTYPE html>") and "b" not in tags and "script" not in tags
    assert "cool &lt;b&gt;duct&lt;/b&gt;" in page
    # the margin gained on the front fluid check is the one compare --json reports in comparison.json
    data = json.loads((tmp_path / "comparison.json").read_text(encoding="utf-8"))
    gain = data["changes"][0]["corners"][0]["margin_change_k"]["fluid_boiling_dry"]
    assert f"<td>fluid_boiling_dry</td><td>fluid_at_piston</td><td class=\"num\">{gain:+.1f}</td>" in page


def test_demo_compare_runs_the_demos_variants(tmp_path):
    # demo --compare once failed on options only `compare` defines (--keep-bias); a shortened demo
    import tomllib

    from thermo.cli.options import demo_scenario_path
    short = ["--set", "plan.phases.2.count=2", "--set", "plan.phases.4.count=1", "--set", "plan.phases.8.count=2"]
    code, out, err = cli(["demo", "--compare", "--json", "--quiet", *short])
    assert code == 0, err
    declared = tomllib.loads(demo_scenario_path().read_text(encoding="utf-8"))["variants"]
    assert [v["name"] for v in json.loads(out)["variants"]] == ["baseline", *declared]


def test_compare_with_corners_side_by_side_gives_the_same_comparison(comparison):
    # the session's comparison solved each run's corners one after another (the default); side by
    # side they must give the same numbers
    code, out, err = cli(["compare", SMALL, "--json", "--quiet", *SHRINK, "--threads", "2",
                          "--variant", "same", "corners.front.pad_mu=0.5",
                          "--variant", "bigger_duct", "corners.front.ducts.main.inlet_area_mm2=18000"])
    assert code == 0, err
    assert json.loads(out) == comparison
