"""Validity mechanism (warn / raise / ignore), the registry, references and docstring units."""
import inspect
import re
import warnings

import numpy as np
import pytest

import thermo.correlations as corr
from thermo.correlations import CorrelationWarning, forced, internal, set_validity_policy, validity
from thermo.errors import CorrelationError


def test_default_policy_warns_outside_range():
    assert corr.get_validity_policy() == "warn"
    with pytest.warns(CorrelationWarning, match=r"nusselt_internal_turbulent_dittus_boelter: re spans \[5000"):
        value = internal.nusselt_internal_turbulent_dittus_boelter(5000.0, 0.7)
    assert value == pytest.approx(0.023 * 5000.0 ** 0.8 * 0.7 ** 0.4)   # still evaluated under "warn"


def test_raise_policy_as_context_manager_restores_previous():
    with set_validity_policy("raise"):
        with pytest.raises(CorrelationError, match="outside the validity range"):
            internal.nusselt_internal_turbulent_dittus_boelter(5000.0, 0.7)
    assert corr.get_validity_policy() == "warn"


def test_ignore_policy_is_silent():
    with set_validity_policy("ignore"), warnings.catch_warnings():
        warnings.simplefilter("error")
        internal.nusselt_internal_turbulent_dittus_boelter(5000.0, 0.7)


def test_arrays_are_checked_by_min_and_max():
    with set_validity_policy("raise"):
        forced.nusselt_flat_plate_laminar_pohlhausen(np.array([1e3, 4e5]), 0.7)   # inside: fine
        with pytest.raises(CorrelationError, match=r"re spans \[1000, 6e\+05\]"):
            forced.nusselt_flat_plate_laminar_pohlhausen(np.array([1e3, 6e5]), 0.7)
        with pytest.raises(CorrelationError):   # NaN counts as outside
            forced.nusselt_flat_plate_laminar_pohlhausen(np.array([1e3, np.nan]), 0.7)


def test_derived_group_and_optional_arguments():
    with set_validity_policy("raise"):
        with pytest.raises(CorrelationError, match=r"re\*pr"):   # Churchill-Bernstein needs Re Pr > 0.2
            forced.nusselt_cylinder_crossflow_churchill_bernstein(0.1, 0.7)
        # viscosity_ratio None is not checked; given, it is
        internal.nusselt_internal_laminar_entry_sieder_tate(1000.0, 0.7, 0.01, 0.1)
        with pytest.raises(CorrelationError, match="viscosity_ratio"):
            internal.nusselt_internal_laminar_entry_sieder_tate(1000.0, 0.7, 0.01, 0.1, viscosity_ratio=20.0)


def test_validity_is_data():
    assert validity.VALIDITY["nusselt_internal_turbulent_dittus_boelter"]["re"] == (1.0e4, 5.0e6)
    assert forced.nusselt_rotating_disc_laminar_cobb_saunders.validity == {"re_w": (0.0, 2.4e5)}


def test_bad_policy_is_rejected():
    with pytest.raises(CorrelationError, match="warn, raise, ignore"):
        set_validity_policy("loud")


def test_registry_entries_callable_and_referenced():
    assert len(corr.REGISTRY) >= 30
    for name, func in corr.REGISTRY.items():
        assert callable(func), name
        assert len(corr.correlation_reference(name)) > 20, name
    assert "Churchill" in corr.correlation_reference("nusselt_cylinder_crossflow_churchill_bernstein")
    assert corr.get_correlation("nusselt_vertical_plate_churchill_chu")(1.0e6, 0.7) > 0


def test_unknown_name_gives_close_matches():
    with pytest.raises(CorrelationError, match="did you mean 'nusselt_internal_turbulent_gnielinski'"):
        corr.get_correlation("nusselt_internal_turbulent_gnielinsky")
    with pytest.raises(CorrelationError, match="unknown name 'zzz'$"):
        corr.get_correlation("zzz")




def _documented_parameters(doc):
    """name -> description of each parameter, as numpydoc's own parser reads the docstring."""
    from numpydoc.docscrape import NumpyDocString
    return {p.name: " ".join(p.desc) for p in NumpyDocString(inspect.cleandoc(doc))["Parameters"]}


@pytest.mark.parametrize("name", sorted(corr.REGISTRY))
def test_every_parameter_documented_with_a_unit(name):
    func = corr.REGISTRY[name]
    params = [p for p in inspect.signature(func).parameters]
    documented = _documented_parameters(func.__doc__)
    assert set(documented) == set(params), name
    for param, text in documented.items():
        assert re.search(r"\[[^\]]+\]$", text.strip()), f"{name}: parameter {param} has no [unit]"
    doc = inspect.cleandoc(func.__doc__)
    assert "Returns" in doc and "Notes" in doc and "References" in doc, name
