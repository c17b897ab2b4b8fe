"""Every number a scenario holds has a physical range, stated beside its key (README, `brakeheat keys`).

Issue 13: without an upper bound a caliper area of 1e300 m2 overflowed, a soak of 1e12 s tried to
allocate terabytes and a 1e9-lap phase never ended. The bounds are wide (what any car's brake
corner could have) and generous on purpose; they catch typing slips and nonsense, not designs.
"""
import pytest

from thermo.scenario import load_scenario
from thermo.scenario.keys_table import allowed_text, sections
from thermo.errors import ScenarioError

from scenario_cases import SMALL


def numeric_keys():
    for section, table in sections():
        for name, field in table.items():
            if field.kind in (int, float):
                yield section, name, field


def test_every_number_has_a_lower_and_an_upper_bound():
    unbounded = [f"{s} {n}" for s, n, f in numeric_keys()
                 if f.maximum is None or (f.minimum is None and f.above is None)]
    assert not unbounded, unbounded


def test_every_default_lies_in_its_range():
    for section, name, field in numeric_keys():
        if isinstance(field.default, (int, float)) and not isinstance(field.default, bool):
            low = field.minimum if field.minimum is not None else field.above
            assert low <= field.default <= field.maximum, (section, name, field.default)


def test_the_range_is_printed_beside_each_key():
    for section, name, field in numeric_keys():
        text = allowed_text(field)
        assert f"<= {field.maximum:g}" in text, (section, name, text)


@pytest.mark.parametrize("key, value", [
    ("corners.front.caliper.area_m2", 1e300),
    ("car.mass_kg", 1e300),
    ("corners.front.pad.backing_thickness_mm", 1e9),
    ("car.rolling_radius_front_mm", 1),
    ("plan.phases.1.count", 1_000_000_000),
    ("limits.bearing_c", -300),
])
def test_values_out_of_range_are_one_line_errors(key, value):
    with pytest.raises(ScenarioError) as info:
        load_scenario(SMALL, [(key, value)])
    message = str(info.value)
    assert "\n" not in message and key.split(".")[-1] in message and ("at most" in message or "at least" in message)


@pytest.mark.parametrize("key, value, fragment", [
    # a grey surface has an emissivity above 0 (the radiation exchange is undefined at 0)
    ("corners.front.caliper.emissivity", 0.0, "emissivity must be more than 0"),
    ("corners.front.disc.emissivity", 0.0, "emissivity must be more than 0"),
    # reciprocity of view factors (Incropera et al., Fundamentals of Heat and Mass Transfer, ch. 13;
    # the equation number 13.3 is from memory): A_disc F_disc->caliper = A_caliper F_caliper->disc,
    # with F_caliper->disc <= 1
    ("corners.front.caliper.area_m2", 0.001, "smaller than the disc area it sees"),
    ("corners.front.pad_mu", 1.2, "pad_mu must be at most 1"),
])
def test_values_the_model_cannot_take_are_refused_by_the_scenario(key, value, fragment):
    """Values that once passed the key's range and then stopped the run with a message naming no
    key (found by the studies' fuzz campaign)."""
    with pytest.raises(ScenarioError) as info:
        load_scenario(SMALL, [(key, value)])
    message = str(info.value)
    assert "\n" not in message and str(SMALL) in message and fragment in message, message
