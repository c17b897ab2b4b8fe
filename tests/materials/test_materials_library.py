"""Packaged materials: sources, lookups, the TOML format's validation, and check values."""
import math

import numpy as np
import pytest

from lapdata.units import KELVIN_AT_0C
from thermo.errors import MaterialError
from thermo.materials import get_material, load_materials, material_names, merge_materials
from thermo.network import HeatCapacity

REQUIRED = {
    "grey_cast_iron", "carbon_carbon", "carbon_ceramic", "aluminium_2618_t61", "aluminium_6061_t6",
    "aluminium_7075_t6", "steel_4340", "stainless_17_4ph", "titanium_6al_4v", "pad_organic",
    "pad_semi_metallic", "pad_sintered", "brake_fluid_glycol", "bearing_steel_52100",
    "ceramic_zirconia", "phenolic_composite", "mica_ceramic_fibre_shim",
}

GOOD = '''
[test_alloy]
description = "an invented alloy for the test"
[test_alloy.density]
value_kg_m3 = 5000.0
source = "invented"
[test_alloy.specific_heat]
temperature_c = [0.0, 100.0]
value_j_kgk = [500.0, 600.0]
source = "invented"
[test_alloy.conductivity]
temperature_c = [0.0]
value_w_mk = [20.0]
source = "invented"
'''


def test_packaged_set_holds_the_required_materials():
    assert REQUIRED <= set(material_names())


@pytest.mark.parametrize("name", sorted(REQUIRED))
def test_every_value_has_a_source(name):
    m = get_material(name)
    keys = {"density", "specific_heat", "conductivity"} | ({"emissivity"} if m.emissivity is not None else set())
    for key in keys:
        assert len(m.sources[key].strip()) > 5, (name, key)
    assert m.description
    # kelvin inside: tables start at room temperature or above, never in degC
    assert m.specific_heat_table[0][0] >= 273.15 and m.conductivity_table[0][0] >= 273.15


def test_grey_iron_effusivity_check_value():
    # PHYSICS.md section 1 check value: e = sqrt(51 * 7100 * 499) = 13 442 (k, rho, c of the data at 20 degC)
    iron = get_material("grey_cast_iron")
    t20 = 20.0 + KELVIN_AT_0C
    assert (iron.conductivity(t20), iron.density_kg_m3, iron.specific_heat(t20)) == (51.0, 7100.0, 499.0)
    assert iron.effusivity(t20) == pytest.approx(math.sqrt(51.0 * 7100.0 * 499.0), rel=1e-12)
    assert iron.effusivity(t20) == pytest.approx(13440.0, rel=1e-3)


def test_organic_pad_effusivity_check_value():
    # PHYSICS.md section 1: organic pad k 1, rho 2000, c 1000 -> e = 1414
    assert get_material("pad_organic").effusivity(300.0) == pytest.approx(1414.2, rel=1e-4)


def test_cast_iron_emissivity_rises_with_temperature():
    # oxidised cast iron 0.63-0.78 rising with temperature (PHYSICS.md section 4, IR-instrument tables)
    iron = get_material("grey_cast_iron")
    eps = iron.emissivity_at(np.array([473.15, 673.15, 873.15]))
    assert eps[0] == pytest.approx(0.64) and eps[2] == pytest.approx(0.78) and eps[0] < eps[1] < eps[2]
    assert iron.emissivity_range == (0.63, 0.78)


def test_heat_capacity_of_a_part():
    iron = get_material("grey_cast_iron")
    hc = iron.heat_capacity(4.0)
    assert isinstance(hc, HeatCapacity)
    assert hc.capacity(293.15) == pytest.approx(4.0 * 499.0)
    assert hc.capacity(673.15) == pytest.approx(4.0 * float(iron.specific_heat(673.15)))


def test_conductivity_ordering_of_piston_materials():
    # PHYSICS.md section 3: titanium ~7 < stainless ~18 < alloy steel ~45 < aluminium ~150 W/m K
    k = [get_material(n).conductivity(293.15) for n in
         ("titanium_6al_4v", "stainless_17_4ph", "steel_4340", "aluminium_2618_t61")]
    assert k == sorted(k)
    assert k[0] == pytest.approx(6.7) and k[3] == pytest.approx(146.0)


def test_unknown_material_gives_close_matches():
    with pytest.raises(MaterialError, match="did you mean 'aluminium_6061_t6'"):
        get_material("aluminum_6061_t6")


def test_user_file_adds_a_material(tmp_path):
    path = tmp_path / "mine.toml"
    path.write_text(GOOD)
    added = load_materials(path)
    merged = merge_materials(load_materials(), added)
    m = get_material("test_alloy", merged)
    assert m.specific_heat(323.15) == pytest.approx(550.0)       # 50 degC, half way: degC converted
    assert m.emissivity is None
    with pytest.raises(MaterialError, match="already defined"):
        merge_materials(merged, added)
    assert merge_materials(merged, added, replace=True)["test_alloy"] == m


@pytest.mark.parametrize("bad, message", [
    (GOOD.replace("value_kg_m3", "value_kg_m"), r"\[test_alloy.density\]: unknown key 'value_kg_m' \(did you mean 'value_kg_m3'"),
    (GOOD.replace('[test_alloy.conductivity]', '[test_alloy.conductivty]'), "unknown key 'conductivty' \\(did you mean 'conductivity'"),
    (GOOD.replace('source = "invented"\n[test_alloy.conductivity]', 'source = ""\n[test_alloy.conductivity]'), "source must be a non-empty"),
    (GOOD.replace("[500.0, 600.0]", "[500.0]"), "equal-length"),
    (GOOD.replace("[0.0, 100.0]", "[100.0, 0.0]"), "strictly increasing"),
    (GOOD.replace("5000.0", "-1.0"), "density_kg_m3 must be > 0"),
    (GOOD.replace('description = "an invented alloy for the test"\n', ""), "missing key"),
    (GOOD + '[test_alloy.emissivity]\nvalue = 1.5\nsource = "x"\n', r"emissivity must lie in \(0, 1\]"),
    (GOOD + '[test_alloy.emissivity]\nvalue = 0.5\nlow = 0.4\nsource = "x"\n', "both low and high"),
    (GOOD + '[test_alloy.service_limit]\nvalue_k = 400.0\nsource = "x"\n',
     r"\[test_alloy.service_limit\]: unknown key 'value_k' \(did you mean 'value_c'"),
    (GOOD + '[test_alloy.service_limit]\nvalue_c = "hot"\nsource = "x"\n', r"service_limit\] value_c: expected a number"),
    (GOOD + '[test_alloy.service_limit]\nvalue_c = 200.0\n', r"\[test_alloy.service_limit\]: missing key\(s\) source"),
    (GOOD + '[test_alloy.service_limit]\nvalue_c = -300.0\nsource = "x"\n', "service limit must be a temperature"),
])
def test_bad_files_are_rejected_naming_the_key(tmp_path, bad, message):
    path = tmp_path / "bad.toml"
    path.write_text(bad)
    with pytest.raises(MaterialError, match=message) as info:
        load_materials(path)
    assert "\n" not in str(info.value)


def test_missing_file_is_a_material_error(tmp_path):
    with pytest.raises(MaterialError, match="no such materials file"):
        load_materials(tmp_path / "nope.toml")


def test_service_limit_is_optional_and_read_in_kelvin(tmp_path):
    path = tmp_path / "mine.toml"
    path.write_text(GOOD + '[test_alloy.service_limit]\nvalue_c = 250.0\nbasis = "invented"\nsource = "invented"\n')
    alloy = load_materials(path)["test_alloy"]
    assert alloy.service_limit_k == pytest.approx(250.0 + KELVIN_AT_0C)
    assert (alloy.service_limit_basis, alloy.service_limit_source) == ("invented", "invented")
    (tmp_path / "plain.toml").write_text(GOOD)
    plain = load_materials(tmp_path / "plain.toml")["test_alloy"]
    assert plain.service_limit_k is None and plain.service_limit_source == ""


@pytest.mark.parametrize("name, limit_c, cited", [
    # Badea, Surand, Ruau, Viguier, U.P.B. Sci. Bull. B 76(1) 2014: industrial use of Ti-6Al-4V limited to 400 degC
    ("titanium_6al_4v", 400.0, "Badea"),
    # Donovan, Fortune, Trout, Cal Poly San Luis Obispo 2015: 6061-T6 yield held above the minimum at 350 degF (177 degC)
    ("aluminium_6061_t6", 177.0, "Donovan"),
    # producer's data bulletin for UNS S17400: good mechanical properties up to 600 degF (316 degC)
    ("stainless_17_4ph", 316.0, "600 degF"),
    # AA typical values: 7075-T6 tensile strength 572 MPa at room temperature, about 110 MPa at 205 degC,
    # so it is halved below 205 degC; 140 degC sits between the 100 and 150 degC typical values (from memory)
    ("aluminium_7075_t6", 140.0, "572 MPa"),
    # from memory (Kaufman, ASM / Aluminum Association 1999, not checked): 2618-T61 strength halved near 200 degC
    ("aluminium_2618_t61", 200.0, "from memory"),
    # common practice, no published source: grey-iron disc sustained below about 700-800 degC
    ("grey_cast_iron", 700.0, "common practice"),
])
def test_packaged_service_limits_and_their_sources(name, limit_c, cited):
    material = get_material(name)
    assert material.service_limit_k == pytest.approx(limit_c + KELVIN_AT_0C)
    assert cited in material.service_limit_source and material.service_limit_basis


def test_every_service_limit_has_a_source_and_lies_below_melting():
    with_limit = [m for m in load_materials().values() if m.service_limit_k is not None]
    assert {m.name for m in with_limit} >= {"titanium_6al_4v", "steel_4340", "stainless_17_4ph", "bearing_steel_52100",
                                            "aluminium_2618_t61", "aluminium_6061_t6", "aluminium_7075_t6"}
    for m in with_limit:
        assert len(m.service_limit_source) > 10, m.name
    # heat-treated aluminium alloys lose strength far below melting (solidus of 6061 about 582 degC, data sheet)
    for name in ("aluminium_2618_t61", "aluminium_6061_t6", "aluminium_7075_t6"):
        assert get_material(name).service_limit_k < 300.0 + KELVIN_AT_0C
    # the fluid's limit is its boiling point (thermo.limits), not a material service limit
    assert get_material("brake_fluid_glycol").service_limit_k is None


def test_property_data_end_is_the_first_table_to_run_out():
    # grey iron specific heat and conductivity tables of materials.toml both end at 800 degC
    iron = get_material("grey_cast_iron")
    assert iron.property_data_end_k == pytest.approx(800.0 + KELVIN_AT_0C)
    assert iron.property_data_ranges_k["conductivity"] == pytest.approx((293.15, 1073.15))
    # 7075-T6: specific heat to 200 degC, conductivity one row (a constant, no range)
    alloy = get_material("aluminium_7075_t6")
    assert alloy.property_data_end_k == pytest.approx(200.0 + KELVIN_AT_0C)
    assert set(alloy.property_data_ranges_k) == {"specific heat"}
    # every table of the organic pad has one row: no range to leave
    assert get_material("pad_organic").property_data_end_k is None
