"""From a validated case to its result: the one place that chooses models.

``run_case(case)`` builds the physics inputs from a :class:`finkit.case.Case` (SI floats), solves
both design questions (temperatures at the stated power, allowable power at the limit less the
required margin), checks the limit, and returns a :class:`CaseResult` whose
:meth:`CaseResult.to_json_dict` is the content of ``results.json``.

Sweeps for the note's plots (:func:`sweep`) re-use the same inputs with one field replaced by
an array, so every point of every plot comes from the same vectorised code as the headline.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np

import finkit
from finkit.airflow import FanCurve
from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.geometry import PinFinSink, PlateFinSink
from finkit.properties.atmosphere import standard_atmosphere
from finkit.properties.materials import get_material, material_emissivity
from finkit.sink import (
    DEFAULT_OPTIONS,
    Air,
    Bypass,
    FanDriven,
    GivenVelocity,
    GivenVolumeFlow,
    HeatSource,
    ModelOptions,
    NaturalConvection,
    SinkMaterial,
    SinkSolution,
    solve_allowable_power,
    solve_temperatures,
)

#: Names and units of the results every results.json carries (null where not applicable).
RESULT_UNITS = {
    "sink_resistance": "K/W",
    "total_resistance": "K/W",
    "base_temperature": "degC",
    "source_base_temperature": "degC",
    "case_temperature": "degC",
    "junction_temperature": "degC",
    "fin_tip_temperature": "degC",
    "limit_node_temperature": "degC",
    "limit_temperature": "degC",
    "allowable_power": "W",
    "power_at_limit": "W",
    "temperature_margin": "K",
    "required_margin": "K",
    "pressure_drop": "Pa",
    "volume_flow": "m^3/s",
    "sink_volume_flow": "m^3/s",
    "bypass_fraction": "1",
    "approach_velocity": "m/s",
    "fin_efficiency": "1",
    "surface_efficiency": "1",
    "fin_effectiveness": "1",
    "heat_transfer_coefficient": "W/(m^2 K)",
    "outlet_air_temperature": "degC",
    "radiation_fraction": "1",
    "fin_heat_rate": "W",
    "mass": "kg",
}


@dataclass(frozen=True)
class SinkInputs:
    """The physics inputs of a heat-sink case, in SI (see :mod:`finkit.sink`)."""

    geometry: PlateFinSink | PinFinSink
    material: SinkMaterial
    source: HeatSource
    air: Air
    flow: Any
    bypass: Bypass | None
    limit_node: str
    limit_temperature: float
    required_margin: float
    options: ModelOptions = DEFAULT_OPTIONS


@dataclass(frozen=True)
class CaseResult:
    """Everything a note, a batch or another tool needs from one case.

    Attributes
    ----------
    case : finkit.case.Case
        The validated case.
    status : str
        ``"pass"`` when the limit node stays at least ``required_margin`` below the limit.
    results : dict
        Name -> value in the unit of :data:`RESULT_UNITS` (None where not applicable).
    warnings : tuple of str
        Validity ranges left, 1-D fin validity, anything out of the ordinary.
    solution : SinkSolution or None
        The heat-sink state at the stated power (heat-sink cases).
    allowable : SinkSolution or None
        The heat-sink state at the allowable power (limit less the required margin).
    inputs : SinkInputs or None
        The physics inputs used.
    """

    case: Any
    status: str
    results: dict[str, float | None]
    warnings: tuple[str, ...]
    solution: SinkSolution | None = None
    allowable: SinkSolution | None = None
    inputs: SinkInputs | None = None
    created: str = field(
        default_factory=lambda: _dt.datetime.now(_dt.UTC).astimezone().isoformat(timespec="seconds")
    )

    def to_json_dict(self) -> dict:
        """The content of ``results.json`` (see the calculation-notes issue)."""
        from finkit.case import case_inputs_sha256

        return {
            "case": self.case.case_id,
            "status": self.status,
            "created": self.created,
            "inputs_sha256": case_inputs_sha256(self.case),
            "finkit_version": finkit.__version__,
            "warnings": list(self.warnings),
            "results": {
                name: {
                    "value": None if value is None else float(value),
                    "unit": RESULT_UNITS.get(name, ""),
                }
                for name, value in self.results.items()
            },
        }


# --------------------------------------------------------------------------------------
# Case -> physics inputs
# --------------------------------------------------------------------------------------


def _material(case, key, finish, emissivity=None):
    material = get_material(key, case.user_materials() or None)
    eps = emissivity if emissivity is not None else material_emissivity(material, finish)
    return material, eps


def sink_inputs(case) -> SinkInputs:
    """Physics inputs of a heat-sink case (SI), ready for :mod:`finkit.sink`."""
    s = case.sink
    material, eps = _material(case, s.material, s.finish, s.emissivity)
    if s.type == "plate-fin":
        geometry = PlateFinSink(
            base_width=s.base.width,
            base_length=s.base.length,
            base_thickness=s.base.thickness,
            fin_count=s.fins.count,
            fin_thickness=s.fins.thickness,
            fin_height=s.fins.height,
        )
    else:
        geometry = PinFinSink(
            base_width=s.base.width,
            base_length=s.base.length,
            base_thickness=s.base.thickness,
            pin_diameter=s.pins.diameter,
            pin_height=s.pins.height,
            transverse_pitch=s.pins.transverse_pitch,
            longitudinal_pitch=s.pins.longitudinal_pitch,
            arrangement=s.pins.arrangement,
        )
    src = case.source
    footprint = src.footprint_length * src.footprint_width
    r_int = src.interface.resistance_over(footprint)
    source = HeatSource(
        power=src.power,
        footprint_length=src.footprint_length,
        footprint_width=src.footprint_width,
        junction_to_case_resistance=src.junction_to_case or 0.0,
        interface_resistance=r_int,
    )
    a = case.air
    pressure = standard_atmosphere(a.altitude).pressure
    air = Air(
        inlet_temperature=a.inlet_temperature,
        pressure=float(pressure),
        surroundings_temperature=a.surroundings_temperature,
    )
    flow = _flow(a.flow)
    bypass = None
    if a.bypass is not None and (a.bypass.side_gap > 0 or a.bypass.top_gap > 0):
        bypass = Bypass(side_gap=a.bypass.side_gap, top_gap=a.bypass.top_gap)
    return SinkInputs(
        geometry=geometry,
        material=SinkMaterial(
            thermal_conductivity=material.thermal_conductivity,
            emissivity=eps,
            density=material.density,
        ),
        source=source,
        air=air,
        flow=flow,
        bypass=bypass,
        limit_node=case.limit.node,
        limit_temperature=case.limit.temperature,
        required_margin=case.limit.required_margin,
    )


def fan_curve(fan) -> FanCurve:
    """The (combined, scaled) fan curve of a case's ``air.flow.fan`` block."""
    curve = FanCurve(
        volume_flow=np.asarray(fan.volume_flow, float),
        static_pressure=np.asarray(fan.pressure, float),
        rating_density=fan.rating_density,
    )
    if fan.count > 1:
        curve = curve.combined(fan.count, fan.arrangement)
    if fan.pressure_factor != 1.0:
        curve = curve.scaled(pressure_factor=fan.pressure_factor)
    return curve


def _flow(flow):
    if flow.approach_velocity is not None:
        return GivenVelocity(flow.approach_velocity)
    if flow.volume_flow is not None:
        return GivenVolumeFlow(flow.volume_flow)
    if flow.fan is not None:
        return FanDriven(fan_curve(flow.fan))
    return NaturalConvection(flow.natural.orientation)


# --------------------------------------------------------------------------------------
# Running a case
# --------------------------------------------------------------------------------------


def _c(kelvin):
    return float(np.asarray(kelvin)) - ZERO_CELSIUS


def solve(inputs: SinkInputs, **replacements) -> SinkSolution:
    """Temperatures at the stated power; ``replacements`` swap whole input objects."""
    i = replace(inputs, **replacements) if replacements else inputs
    return solve_temperatures(i.geometry, i.material, i.source, i.air, i.flow, i.bypass, i.options)


def allowable(inputs: SinkInputs, margin: float | None = None, **replacements) -> SinkSolution:
    """State at the allowable power: limit node at the limit less ``margin`` [K]."""
    i = replace(inputs, **replacements) if replacements else inputs
    margin = i.required_margin if margin is None else margin
    return solve_allowable_power(
        i.geometry,
        i.material,
        i.source,
        i.air,
        i.flow,
        i.limit_node,
        np.asarray(i.limit_temperature, float) - margin,
        i.bypass,
        i.options,
    )


def run_case(case) -> CaseResult:
    """Solve a validated case and check it against its limit."""
    if getattr(case, "kind", "heat-sink") == "single-fin":
        return _run_single_fin(case)
    inputs = sink_inputs(case)
    sol = solve(inputs)
    t_in = float(np.asarray(inputs.air.inlet_temperature))
    usable_limit = inputs.limit_temperature - inputs.required_margin
    if usable_limit > t_in:
        at_margin = allowable(inputs)
        allowable_power = float(at_margin.power)
    else:
        at_margin, allowable_power = None, 0.0
    at_limit = allowable(inputs, margin=0.0)
    node_t = float(sol.node_temperature(inputs.limit_node))
    margin = inputs.limit_temperature - node_t
    status = "pass" if margin >= inputs.required_margin else "fail"
    is_natural = isinstance(inputs.flow, NaturalConvection)
    total_q = float(sol.convection_heat_rate + sol.radiation_heat_rate)
    results = {
        "sink_resistance": float(sol.sink_resistance),
        "total_resistance": float(sol.total_resistance),
        "base_temperature": _c(sol.base_temperature),
        "source_base_temperature": _c(sol.source_base_temperature),
        "case_temperature": _c(sol.case_temperature),
        "junction_temperature": _c(sol.junction_temperature),
        "fin_tip_temperature": _c(sol.fin_tip_temperature),
        "limit_node_temperature": node_t - ZERO_CELSIUS,
        "limit_temperature": inputs.limit_temperature - ZERO_CELSIUS,
        "allowable_power": allowable_power,
        "power_at_limit": float(at_limit.power),
        "temperature_margin": margin,
        "required_margin": inputs.required_margin,
        "pressure_drop": None if is_natural else float(sol.pressure_drop),
        "volume_flow": None if is_natural else float(sol.volume_flow),
        "sink_volume_flow": None if is_natural else float(sol.sink_volume_flow),
        "bypass_fraction": None if is_natural else float(sol.bypass_volume_flow / sol.volume_flow),
        "approach_velocity": None if is_natural else float(sol.approach_velocity),
        "fin_efficiency": float(sol.fin_efficiency),
        "surface_efficiency": float(sol.surface_efficiency),
        "fin_effectiveness": None,
        "heat_transfer_coefficient": float(sol.heat_transfer_coefficient),
        "outlet_air_temperature": None if is_natural else _c(sol.outlet_air_temperature),
        "radiation_fraction": float(sol.radiation_heat_rate) / total_q if total_q > 0 else 0.0,
        "fin_heat_rate": None,
        "mass": float(inputs.geometry.mass(inputs.material.density)),
    }
    warnings = list(sol.warnings)
    if at_margin is not None:
        warnings += [w for w in at_margin.warnings if w not in warnings]
    return CaseResult(
        case=case,
        status=status,
        results=results,
        warnings=tuple(warnings),
        solution=sol,
        allowable=at_margin,
        inputs=inputs,
    )


# --------------------------------------------------------------------------------------
# Single fins
# --------------------------------------------------------------------------------------


def _run_single_fin(case) -> CaseResult:
    from finkit.single_fin import solve_single_fin

    study = solve_single_fin(case)
    results = {name: None for name in RESULT_UNITS}
    results.update(study.results)
    status = "pass"
    if case.limit is not None and results.get("temperature_margin") is not None:
        status = "pass" if results["temperature_margin"] >= case.limit.required_margin else "fail"
    return CaseResult(case=case, status=status, results=results, warnings=study.warnings)


# --------------------------------------------------------------------------------------
# Sweeps (mode c): one input replaced by an array
# --------------------------------------------------------------------------------------

SWEEPABLE = (
    "inlet_temperature",
    "airflow",
    "fin_count",
    "fin_height",
    "fin_thickness",
    "altitude",
    "power",
)


def swept_inputs(inputs: SinkInputs, name: str, values) -> SinkInputs:
    """A copy of ``inputs`` with one quantity replaced by an array of values (SI)."""
    values = np.asarray(values, float)
    g = inputs.geometry
    if name == "inlet_temperature":
        return replace(inputs, air=replace(inputs.air, inlet_temperature=values))
    if name == "altitude":
        p = standard_atmosphere(values).pressure
        return replace(inputs, air=replace(inputs.air, pressure=np.asarray(p, float)))
    if name == "airflow":
        if isinstance(inputs.flow, NaturalConvection):
            raise InputError("sweeps: 'airflow' does not apply to natural convection")
        return replace(inputs, flow=GivenVolumeFlow(values))
    if name == "power":
        return replace(inputs, source=replace(inputs.source, power=values))
    if name in ("fin_count", "fin_height", "fin_thickness"):
        if not isinstance(g, PlateFinSink):
            raise InputError(f"sweeps: {name!r} applies to plate-fin sinks only")
        field_name = {"fin_count": "fin_count", "fin_height": "fin_height"}.get(
            name, "fin_thickness"
        )
        return replace(inputs, geometry=replace(g, **{field_name: values}))
    raise InputError(f"sweeps: got {name!r}; allowed: {', '.join(SWEEPABLE)}")


def sweep(inputs: SinkInputs, name: str, values) -> dict[str, np.ndarray]:
    """Temperatures at the stated power and allowable power over an array of one input.

    Returns a dict of arrays: ``values`` (SI), ``junction_temperature``, ``base_temperature``,
    ``limit_node_temperature`` [K], ``allowable_power`` [W] (at the limit less the required
    margin, zero where the inlet air leaves no margin), ``sink_resistance`` [K W⁻¹],
    ``fin_efficiency`` [-], ``pressure_drop`` [Pa].
    """
    swept = swept_inputs(inputs, name, values)
    sol = solve(swept)
    usable = inputs.limit_temperature - inputs.required_margin
    shape = np.shape(sol.power)
    t_in = np.broadcast_to(np.asarray(swept.air.inlet_temperature, float), shape)
    ok = t_in < usable - 1e-6
    # Where the inlet air already reaches the usable limit the allowable power is zero; solve
    # the others at an inlet clipped just below it so that one array call serves all points.
    clipped = replace(
        swept, air=replace(swept.air, inlet_temperature=np.minimum(t_in, usable - 1e-3))
    )
    power = np.where(ok, np.asarray(allowable(clipped).power, float), 0.0)
    return {
        "values": np.asarray(values, float),
        "junction_temperature": sol.junction_temperature,
        "base_temperature": sol.base_temperature,
        "limit_node_temperature": sol.node_temperature(inputs.limit_node),
        "allowable_power": power,
        "sink_resistance": sol.sink_resistance,
        "fin_efficiency": sol.fin_efficiency,
        "pressure_drop": sol.pressure_drop,
        "heat_transfer_coefficient": sol.heat_transfer_coefficient,
    }
