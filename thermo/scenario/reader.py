"""Read a scenario TOML file into a Scenario (SI inside), with overrides applied first."""
from __future__ import annotations

import copy
import math
from pathlib import Path

from lapdata.echo import has_control_characters, shown
from lapdata.files import read_toml_file
from lapdata.track import CarEnvelope
from thermo.corner.geometry import (
    AirflowSettings, CaliperGeometry, CornerDesign, DiscGeometry, DuctGeometry, HubGeometry, PadGeometry,
    PistonGeometry, disc_radiating_area_m2,
)
from thermo.correlations.air import air_density, pressure_at_altitude
from thermo.duty.bias import FixedBias, HydraulicBias
from thermo.duty.vehicle import VehicleParameters
from thermo.errors import BrakeheatError, ScenarioError
from thermo.limits import FluidSpec, Limits
from thermo.scenario import schema as S
from thermo.scenario.convert import convert_table, reject_unknown
from thermo.scenario.calibration import parse_calibration
from thermo.scenario.model import (
    PHASE_KINDS, Ambient, Phase, Plan, PadWear, Scenario, SolverChoice, StintTemplate,
)
from thermo.scenario.overrides import apply_overrides


def load_scenario(path, overrides=()) -> Scenario:
    """Read and check a scenario file; ``overrides`` is a sequence of (dotted key, value) pairs."""
    path = Path(path)
    raw, text = read_toml_file(path, "scenario file", ScenarioError)
    return scenario_from_dict(raw, path=path, text=text, overrides=overrides)


def scenario_from_dict(raw: dict, *, path: Path, text: str = "", overrides=()) -> Scenario:
    """Build a Scenario from parsed TOML (a deep copy is modified by the overrides)."""
    source = str(path)
    data = copy.deepcopy(raw)
    calibrated = data.pop("calibrated", {})
    if not isinstance(calibrated, dict) or any(isinstance(v, dict) for v in calibrated.values()):
        raise ScenarioError(f"{source}: [calibrated] must hold \"dotted.key\" = value pairs")
    data = apply_overrides(data, list(calibrated.items()) + list(overrides), source)
    data.pop("calibrated", None)
    reject_unknown("top level", data, S.TOP_LEVEL, source)
    for name in ("car", "corners", "plan"):
        if name not in data:
            raise ScenarioError(f"{source}: missing section [{name}]")
    sec = {name: convert_table(name, _without(data.get(name, {}), *(PLAN_LISTS if name == "plan" else ())), schema, source)
           for name, schema in S.SECTIONS.items()}

    ambient = _ambient(sec["ambient"], source)
    car = sec["car"]
    vehicle = VehicleParameters(
        mass_kg=car["mass_kg"], fuel_kg=car["fuel_kg"], drag_cd_a_m2=car["drag_cd_a_m2"],
        downforce_cl_a_m2=car["downforce_cl_a_m2"],
        rolling_resistance_coefficient=car["rolling_resistance_coefficient"],
        rolling_radius_front_m=car["rolling_radius_front_m"], rolling_radius_rear_m=car["rolling_radius_rear_m"],
        air_density_kg_m3=float(air_density(ambient.pressure_pa, ambient.temperature_k)),
        rotating_inertia_factor=car["rotating_inertia_factor"], engine_braking_force_n=car["engine_braking_force_n"])
    try:
        envelope = CarEnvelope(
            mass_kg=car["mass_kg"] + car["fuel_kg"], braking_decel_g=car["braking_decel_g"],
            lateral_grip_g=car["lateral_grip_g"], power_w=car["power_w"], traction_accel_g=car["traction_accel_g"],
            downforce_cl_a_m2=max(car["downforce_cl_a_m2"], 0.0), drag_cd_a_m2=car["drag_cd_a_m2"],
            air_density_kg_m3=vehicle.air_density_kg_m3,
            top_speed_kmh=car["top_speed_kmh"] if car["top_speed_kmh"] > 0 else None)
    except BrakeheatError as error:
        raise ScenarioError(f"{source}: [car] {error}") from None
    except ValueError as error:
        raise ScenarioError(f"{source}: [car] {error}") from None

    if car["fuel_kg"] > car["fuel_capacity_kg"]:
        raise ScenarioError(f"{source}: [car] fuel_kg = {car['fuel_kg']:g} does not fit in fuel_capacity_kg = "
                            f"{car['fuel_capacity_kg']:g}")
    corners = _corners(data["corners"], sec, vehicle, source)
    bias = _bias(sec["brakes"], corners, source)
    fluid = _fluid(sec["fluid"], source)
    limits = Limits(**sec["limits"])
    plan = _plan(sec["plan"], data["plan"], path, source)
    pad_wear = PadWear(**sec["pad_wear"])
    solver = SolverChoice(**sec["solver"])
    variants = data.get("variants", {})
    if not isinstance(variants, dict) or not all(isinstance(v, dict) for v in variants.values()):
        raise ScenarioError(f"{source}: [variants.NAME] tables must hold \"dotted.key\" = value overrides")
    for name in variants:
        if not name.strip() or has_control_characters(name):
            raise ScenarioError(f"{source}: [variants] name {shown(name)}: expected plain text (no line breaks, "
                                "escapes or control characters)")
    return Scenario(
        name=sec["scenario"]["name"], description=sec["scenario"]["description"], path=path, text=text, raw=raw,
        vehicle=vehicle, envelope=envelope, bias=bias, power_method=sec["brakes"]["power_method"],
        left_share_front=sec["brakes"]["left_share_front"], left_share_rear=sec["brakes"]["left_share_rear"],
        fuel_consumption_kg_per_lap=car["fuel_consumption_kg_per_lap"], fuel_capacity_kg=car["fuel_capacity_kg"],
        ambient=ambient, fluid=fluid, limits=limits, corners=corners, plan=plan, pad_wear=pad_wear,
        solver=solver, pedal_ratio=sec["brakes"]["pedal_ratio"], knock_back_m=sec["brakes"]["knock_back_m"],
        variants=variants, overrides=tuple(overrides),
        calibration=parse_calibration(data.get("calibration"), corners, source))


PLAN_LISTS = ("phases", "stints", "finish")     # the [plan] keys that are lists of tables, read by _plan


def _without(table, *keys):
    if isinstance(table, dict) and any(key in table for key in keys):
        return {k: v for k, v in table.items() if k not in keys}
    return table


def _ambient(a: dict, source: str) -> Ambient:
    pressure = a["pressure_pa"] if a["pressure_mode"] == "pressure" else float(pressure_at_altitude(a["altitude_m"]))
    profile = ()
    if a["temperature_profile_h_c"]:
        rows = a["temperature_profile_h_c"]
        if any(len(r) != 2 for r in rows if isinstance(r, tuple)) or not all(isinstance(r, tuple) for r in rows):
            raise ScenarioError(f"{source}: [ambient] temperature_profile_h_c must be a list of [hours, degC] pairs")
        hours = [r[0] for r in rows]
        if any(b <= a_ for a_, b in zip(hours, hours[1:])) or hours[0] < 0:
            raise ScenarioError(f"{source}: [ambient] temperature_profile_h_c hours must start at >= 0 and increase")
        field = S.AMBIENT["temperature_c"]
        for h, c in rows:
            if not field.minimum <= c <= field.maximum:
                raise ScenarioError(f"{source}: [ambient] temperature_profile_h_c at {h:g} h: {c:g} degC is outside "
                                    f"{field.minimum:g} to {field.maximum:g} degC")
        profile = tuple((h * 3600.0, c + 273.15) for h, c in rows)
    return Ambient(a["temperature_k"], pressure, profile)


def _fluid(fl: dict, source: str) -> FluidSpec:
    try:
        if fl["grade"].lower() == "custom":
            if fl["dry_boiling_c"] <= 0 or fl["wet_boiling_c"] <= 0:
                raise ScenarioError("grade = \"custom\" needs dry_boiling_c and wet_boiling_c (the maker's figures)")
            table = tuple(fl["boiling_table_pct_c"])
            if any(not isinstance(r, tuple) or len(r) != 2 for r in table):
                raise ScenarioError("boiling_table_pct_c must be a list of [water %, degC] pairs")
            return FluidSpec("custom fluid", fl["dry_boiling_c"], fl["wet_boiling_c"], fl["water_content_pct"],
                             table, source="fluid maker's figures (user input)")
        if fl["dry_boiling_c"] or fl["wet_boiling_c"] or fl["boiling_table_pct_c"]:
            raise ScenarioError("dry_boiling_c, wet_boiling_c and boiling_table_pct_c need grade = \"custom\"")
        return FluidSpec.from_grade(fl["grade"], fl["water_content_pct"])
    except ScenarioError as error:
        message = str(error).removeprefix("[fluid] ")
        raise ScenarioError(f"{source}: [fluid] {message}") from None


def _merge(base: dict, over: dict) -> dict:
    out = copy.deepcopy(base)
    for key, value in over.items():
        if isinstance(value, dict) and isinstance(out.get(key), dict):
            out[key] = _merge(out[key], value)
        else:
            out[key] = copy.deepcopy(value)
    return out


def _corners(table: dict, sec: dict, vehicle: VehicleParameters, source: str) -> tuple[CornerDesign, ...]:
    if not isinstance(table, dict):
        raise ScenarioError(f"{source}: [corners] must hold tables such as [corners.front]")
    reject_unknown("corners", table, S.CORNER_NAMES, source)
    fluid_material = sec["fluid"]["material"]
    _check_material("fluid", "material", fluid_material, source)
    out = []
    for axle in ("front", "rear"):
        share = sec["brakes"][f"left_share_{axle}"]
        sides = [s for s in ("left", "right") if f"{axle}_{s}" in table]
        if axle not in table and len(sides) < 2:
            raise ScenarioError(f"{source}: missing [corners.{axle}] (or both [corners.{axle}_left] and [corners.{axle}_right])")
        if not sides and math.isclose(share, 0.5):
            out.append(_corner(axle, axle, table[axle], vehicle, fluid_material, source))
            continue
        for side in ("left", "right"):
            name = f"{axle}_{side}"
            merged = _merge(table.get(axle, {}), table.get(name, {}))
            out.append(_corner(name, axle, merged, vehicle, fluid_material, source))
    return tuple(out)


def _check_material(where: str, key: str, name: str, source: str) -> None:
    """A material key must name a packaged material (checked as the file is read, naming the key)."""
    from thermo.materials import material_names
    from thermo.scenario.convert import suggestion
    known = material_names()
    if name not in known:
        raise ScenarioError(f"{source}: [{where}] {key} = {shown(name)} is not a known material{suggestion(name, known)}; "
                            f"expected one of: {', '.join(known)}")


def _corner(name: str, axle: str, t: dict, vehicle: VehicleParameters, fluid_material: str,
            source: str) -> CornerDesign:
    where = f"corners.{name}"
    if not isinstance(t, dict):
        raise ScenarioError(f"{source}: [{where}] must be a table")
    reject_unknown(where, t, tuple(S.CORNER) + tuple(S.CORNER_SECTIONS) + ("ducts",), source)
    for part in ("disc", "pad", "piston", "caliper"):
        if part not in t:
            raise ScenarioError(f"{source}: missing section [{where}.{part}]")
    top = convert_table(where, {k: v for k, v in t.items() if k in S.CORNER}, S.CORNER, source)
    parts = {part: convert_table(f"{where}.{part}", t.get(part, {}), schema, source)
             for part, schema in S.CORNER_SECTIONS.items()}
    for part, values in parts.items():
        for key in S.CORNER_SECTIONS[part]:
            if key == "material" or key.endswith("_material"):
                _check_material(f"{where}.{part}", key, values[S.CORNER_SECTIONS[part][key].si_name], source)
    ducts_raw = t.get("ducts", {})
    if not isinstance(ducts_raw, dict) or not all(isinstance(v, dict) for v in ducts_raw.values()):
        raise ScenarioError(f"{source}: ducts go in named tables, e.g. [{where}.ducts.main]")
    try:
        ducts = tuple(DuctGeometry(**convert_table(f"{where}.ducts.{dn}", dt, S.DUCT, source), section=f"{where}.ducts.{dn}")
                      for dn, dt in ducts_raw.items())
        if parts["pad"]["thickness_m"] <= parts["pad"]["minimum_thickness_m"]:
            raise ScenarioError(f"[{where}.pad] thickness_mm must be more than minimum_thickness_mm")
        piston = dict(parts["piston"])
        piston["diameters_m"] = tuple(piston["diameters_m"])
        _check_caliper_view(where, parts["disc"], parts["caliper"])
        return CornerDesign(
            name=name, axle=axle,
            disc=DiscGeometry(**parts["disc"], section=f"{where}.disc"),
            pad=PadGeometry(**parts["pad"], section=f"{where}.pad"),
            piston=PistonGeometry(**piston, section=f"{where}.piston"),
            caliper=CaliperGeometry(**parts["caliper"], section=f"{where}.caliper"),
            hub=HubGeometry(**parts["hub"], section=f"{where}.hub"),
            ducts=ducts, airflow=AirflowSettings(**parts["airflow"], section=f"{where}.airflow"),
            fluid_material=fluid_material, pad_mu=top["pad_mu"],
            rolling_radius_m=vehicle.rolling_radius_m(axle))
    except ScenarioError as error:
        message = str(error)  # convert_table's messages already start with the file
        raise ScenarioError(message if message.startswith(f"{source}: ") else f"{source}: {message}") from None


def _check_caliper_view(where: str, disc: dict, caliper: dict) -> None:
    """The caliper must be at least as large as the disc area it sees (reciprocity of view
    factors: A_disc F_disc->caliper = A_caliper F_caliper->disc, and F_caliper->disc <= 1)."""
    seen = caliper["view_factor_from_disc"] * disc_radiating_area_m2(
        disc["outer_diameter_m"], disc["inner_diameter_m"], disc["thickness_m"])
    if caliper["area_m2"] < seen:
        raise ScenarioError(
            f"[{where}.caliper] area_m2 = {caliper['area_m2']:g} is smaller than the disc area it sees "
            f"(view_factor_from_disc {caliper['view_factor_from_disc']:g} x the disc's {seen / caliper['view_factor_from_disc']:.4g} m^2 "
            f"radiating area = {seen:.4g} m^2); expected area_m2 >= {seen:.4g} or a smaller view_factor_from_disc")


def _bias(b: dict, corners, source: str):
    if b["bias"] == "fixed":
        return FixedBias(b["front_share"])
    if b["master_cylinder_front_diameter_m"] <= 0 or b["master_cylinder_rear_diameter_m"] <= 0:
        raise ScenarioError(f"{source}: [brakes] bias = \"hydraulic\" needs master_cylinder_front_mm and master_cylinder_rear_mm")
    front = next(c for c in corners if c.axle == "front")
    rear = next(c for c in corners if c.axle == "rear")
    area = lambda d: math.pi / 4 * d ** 2  # noqa: E731
    try:
        return HydraulicBias(
            master_cylinder_front_m2=area(b["master_cylinder_front_diameter_m"]),
            master_cylinder_rear_m2=area(b["master_cylinder_rear_diameter_m"]),
            balance_bar_front_share=b["balance_bar_front_share"],
            piston_area_front_m2=front.piston.area_one_side_m2, piston_area_rear_m2=rear.piston.area_one_side_m2,
            pad_mu_front=front.pad_mu, pad_mu_rear=rear.pad_mu,
            effective_radius_front_m=front.effective_radius_m, effective_radius_rear_m=rear.effective_radius_m)
    except BrakeheatError as error:
        raise ScenarioError(f"{source}: [brakes] {error}") from None


def _plan(p: dict, raw_plan: dict, path: Path, source: str) -> Plan:
    key = p["lap_source"]
    name = p[key]
    if not name:
        raise ScenarioError(f"{source}: [plan] lap_source = \"{key}\" needs {key} = \"FILE\"")
    lap_path = (path.parent / name) if not Path(name).is_absolute() else Path(name)
    phases = _phase_list(raw_plan, "phases", "plan.phases", path, source)
    finish = _phase_list(raw_plan, "finish", "plan.finish", path, source)
    stints = tuple(_stint(raw, i, path, source) for i, raw in enumerate(_table_list(raw_plan, "stints", "plan.stints", source), start=1))
    if not phases and not stints:
        raise ScenarioError(f"{source}: [plan] needs at least one [[plan.phases]] entry (or a [[plan.stints]] template)")
    if not stints and not finish and phases[0].kind == "pit_stop" and len(phases) == 1:
        raise ScenarioError(f"{source}: [plan] has only a pit stop: add laps")
    ordered = [("plan.phases", ph) for ph in phases] + [("plan.stints", ph) for st in stints for ph in st.phases] \
        + [("plan.finish", ph) for ph in finish]
    soaks = [where for where, ph in ordered if ph.kind == "soak"]
    if "plan.stints" in soaks:
        raise ScenarioError(f"{source}: [plan.stints] a stint template cannot hold the soak (it would repeat): "
                            "put it in [[plan.finish]]")
    if len(soaks) > 1 or (soaks and ordered[-1][1].kind != "soak"):
        raise ScenarioError(f"{source}: [plan] the soak must be the last phase of the run, and there can be only one")
    return Plan(key, lap_path, p["sample_hz"], p["soak_sample_s"], phases, p["repair_trace"], stints, finish)


def _table_list(raw: dict, key: str, where: str, source: str) -> list:
    items = raw.get(key, [])
    if not isinstance(items, list) or any(not isinstance(item, dict) for item in items):
        raise ScenarioError(f"{source}: [{where}] must be a list of tables, written [[{where}]]")
    return items


def _phase_list(raw: dict, key: str, where: str, path: Path, source: str) -> tuple[Phase, ...]:
    """The phases of one list of tables ([[plan.phases]], [[plan.finish]], a template's phases)."""
    phases = []
    for i, ph in enumerate(_table_list(raw, key, where, source), start=1):
        at = f"{where} #{i}"
        if "type" not in ph:
            raise ScenarioError(f"{source}: [{at}] needs a type ({', '.join(PHASE_KINDS)})")
        kind = ph["type"]
        if not isinstance(kind, str) or kind not in S.PHASES:
            from thermo.scenario.convert import suggestion
            raise ScenarioError(f"{source}: [{at}] unknown phase type {shown(kind)}{suggestion(str(kind), S.PHASES)}; "
                                f"expected one of: {', '.join(PHASE_KINDS)}")
        values = convert_table(at, ph, {**S.PHASE_COMMON, **S.PHASES[kind]}, source)
        values["name"] = values["name"] or {"plan.phases": f"{kind} {i}", "plan.finish": f"finish: {kind}"}.get(where, kind)
        if "trace" in values:
            own = values.pop("trace")
            values["trace"] = (path.parent / own if not Path(own).is_absolute() else Path(own)) if own else None
        phases.append(Phase(**values))
    return tuple(phases)


def _stint(raw: dict, index: int, path: Path, source: str) -> StintTemplate:
    where = f"plan.stints #{index}"
    values = convert_table(where, _without(raw, "phases"), S.STINT, source)
    phases = _phase_list(raw, "phases", f"{where} phases", path, source)
    if not any(ph.driving for ph in phases):
        raise ScenarioError(f"{source}: [{where}] needs [[plan.stints.phases]] with at least one lap "
                            "(laps, out_lap, in_lap or safety_car)")
    if values["repeat"] == 0 and values["until_s"] == 0:
        values["repeat"] = 1
    return StintTemplate(name=values["name"] or "stint", phases=phases, repeat=values["repeat"],
                         until_s=values["until_s"], pad_change_every=values["pad_change_every"])
