"""Pad wear takes the friction face: the rest of the pad keeps its temperature at its depth."""
from __future__ import annotations

import numpy as np
import pytest

from thermo.chain.corner_run import worn_pad_profile


def test_the_worn_slice_is_the_face_and_the_back_keeps_its_temperature():
    old_dx = np.array([1.0, 2.0, 3.0]) * 1e-3          # face first; centres 5.5, 4.0, 1.5 mm from the back
    old_t = np.array([900.0, 600.0, 300.0])
    new_dx = np.array([0.6, 2.0, 3.0]) * 1e-3          # 0.4 mm worn off the face; centres 5.3, 4.0, 1.5 mm
    new_t = worn_pad_profile(old_dx, old_t, new_dx)
    # linear between the old centres at the same depth from the backing plate (worked by hand):
    # 5.3 mm lies 1.3/1.5 of the way from 600 K (4.0 mm) to 900 K (5.5 mm)
    assert new_t == pytest.approx([600.0 + 300.0 * 1.3 / 1.5, 600.0, 300.0], rel=1e-12)
    # what is left is cooler on average than what was there: the hot face material has gone
    assert np.average(new_t, weights=new_dx) < np.average(old_t, weights=old_dx)


def test_a_lumped_pad_keeps_its_temperature():
    assert worn_pad_profile(np.array([0.02]), np.array([650.0]), np.array([0.019])) == pytest.approx([650.0])
