"""Brake bias from the hydraulics, against a hand calculation; the left/right split."""
import numpy as np
import pytest

from thermo.duty import FixedBias, HydraulicBias, front_power_share, split_left_right
from thermo.errors import ScenarioError

# An invented brake system with round numbers, so the hand calculation below is easy to follow.
SYSTEM = dict(master_cylinder_front_m2=2.5e-4, master_cylinder_rear_m2=3.0e-4,
              balance_bar_front_share=0.6, piston_area_front_m2=4.0e-3, piston_area_rear_m2=2.0e-3,
              pad_mu_front=0.5, pad_mu_rear=0.4, effective_radius_front_m=0.14,
              effective_radius_rear_m=0.12)


def test_hydraulic_bias_hand_calculation():
    # Hand calculation (statics of the balance bar and calipers), pushrod force 1000 N:
    #   front master cylinder: 0.6 * 1000 N / 2.5e-4 m^2 = 2.4e6 Pa
    #   rear master cylinder:  0.4 * 1000 N / 3.0e-4 m^2 = 1.3333e6 Pa
    #   front caliper torque: 2 * 0.5 * 2.4e6 Pa * 4.0e-3 m^2 * 0.14 m = 1344 N m
    #   rear caliper torque:  2 * 0.4 * 1.3333e6 Pa * 2.0e-3 m^2 * 0.12 m = 256 N m
    #   front share = 1344 / (1344 + 256) = 0.84
    bias = HydraulicBias(**SYSTEM)
    p_front, p_rear = bias.line_pressures_pa(1000.0)
    assert p_front == pytest.approx(2.4e6)
    assert p_rear == pytest.approx(1.0e6 * 4 / 3)
    front, rear = bias.axle_torques_nm(1000.0)
    assert front == pytest.approx(2 * 1344.0) and rear == pytest.approx(2 * 256.0)
    assert bias.front_share == pytest.approx(0.84, rel=1e-12)


def test_balance_bar_moves_the_bias():
    forward = HydraulicBias(**{**SYSTEM, "balance_bar_front_share": 0.5})
    # 0.5: front 2e6 Pa -> 1120 N m per caliper; rear 1.6667e6 Pa -> 320 N m; 1120/1440
    assert forward.front_share == pytest.approx(1120.0 / 1440.0, rel=1e-12)


def test_power_share_with_unequal_rolling_radii():
    # tyre force and power go as T / r: (0.84/0.30) / (0.84/0.30 + 0.16/0.33) = 0.852399
    assert front_power_share(0.84, 0.30, 0.33) == pytest.approx(0.852399, abs=1e-6)
    assert front_power_share(0.84, 0.31, 0.31) == pytest.approx(0.84, rel=1e-14)


def test_split_left_right_sums_to_axle():
    power = np.array([0.0, 1.0e5, 3.3e5])
    left, right = split_left_right(power, 0.53)
    assert left + right == pytest.approx(power, rel=1e-15)
    assert left[2] == pytest.approx(0.53 * 3.3e5)
    left, right = split_left_right(power)
    assert left == pytest.approx(right)


def test_bias_names_the_bad_field():
    with pytest.raises(ScenarioError, match=r"FixedBias.front_share"):
        FixedBias(1.2)
    with pytest.raises(ScenarioError, match=r"HydraulicBias.balance_bar_front_share"):
        HydraulicBias(**{**SYSTEM, "balance_bar_front_share": -0.1})
    with pytest.raises(ScenarioError, match=r"HydraulicBias.master_cylinder_rear_m2"):
        HydraulicBias(**{**SYSTEM, "master_cylinder_rear_m2": 0.0})
    with pytest.raises(ScenarioError, match=r"left_share"):
        split_left_right(1.0, 1.5)
