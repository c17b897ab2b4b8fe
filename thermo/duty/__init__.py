"""The duty step: heat into each brake corner from a lap trace (energy or pressure method)."""
from thermo.duty.bias import FixedBias, HydraulicBias, front_power_share, split_left_right
from thermo.duty.corner_duty import (
    CornerBrake, CornerDuty, corner_heat_inputs, corner_heat_inputs_from_trace,
)
from thermo.duty.fuel import braking_energy_by_lap, fuel_mass_by_lap
from thermo.duty.power import (
    DEFAULT_SMOOTHING_WINDOW_S, Caliper, brake_energy_per_interval, braking_power_energy_method,
    braking_power_pressure_method, braking_torque_pressure_method, power_from_interval_energy,
    resistive_work_per_interval_j, summed_piston_area_m2,
)
from thermo.duty.summary import CornerEnergy, corner_energy, lap_energy_summary, total_braking_energy_j
from thermo.duty.vehicle import VehicleParameters

__all__ = [
    "FixedBias", "HydraulicBias", "front_power_share", "split_left_right",
    "CornerBrake", "CornerDuty", "corner_heat_inputs", "corner_heat_inputs_from_trace",
    "braking_energy_by_lap", "fuel_mass_by_lap",
    "DEFAULT_SMOOTHING_WINDOW_S", "Caliper", "brake_energy_per_interval",
    "braking_power_energy_method", "braking_power_pressure_method",
    "braking_torque_pressure_method", "power_from_interval_energy",
    "resistive_work_per_interval_j", "summed_piston_area_m2",
    "CornerEnergy", "corner_energy", "lap_energy_summary", "total_braking_energy_j",
    "VehicleParameters",
]
