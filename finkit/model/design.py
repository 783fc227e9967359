"""One design at one condition: physics inputs from a case, solve, allowable power.

``sink_inputs(case)`` builds the physics inputs from a validated :class:`finkit.case.Case` (SI
floats); :func:`solve` and :func:`allowable` answer the two design questions (temperatures at
the stated power, allowable power at the limit less the required margin) and
:func:`solve_condition` gives one operating condition's state. Sweeps
(:mod:`finkit.model.sweeps`) re-use the same inputs with one field replaced by an array. The
studies (:mod:`finkit.model.review`, :mod:`finkit.model.trade`, :mod:`finkit.model.uncertainty`)
build on this module; :mod:`finkit.model.run` runs a whole case.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.physics.airflow.fans import FanCurve
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.atmosphere import standard_atmosphere
from finkit.physics.properties.materials import get_material, material_emissivity
from finkit.physics.sink.inputs import (
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
)
from finkit.physics.sink.results import SinkSolution
from finkit.physics.sink.solve import solve_allowable_power, solve_temperatures

__all__ = [
    "ConditionState",
    "SinkInputs",
    "airflow_of",
    "allowable",
    "fan_curve",
    "sink_inputs",
    "solve",
    "solve_condition",
]


@dataclass(frozen=True)
class SinkInputs:
    """The physics inputs of a heat-sink case, in SI (see :mod:`finkit.physics.sink`).

    ``altitude`` [m] is the site altitude the air pressure was taken from (standard
    atmosphere); relative scenarios (``altitude_increase``) start from it.
    """

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
    altitude: float = 0.0


# --------------------------------------------------------------------------------------
# Case -> physics inputs
# --------------------------------------------------------------------------------------


def _material(case, key, finish, emissivity=None):
    material = get_material(key, case.user_materials() or None)
    eps = emissivity if emissivity is not None else material_emissivity(material, finish)
    return material, eps


def sink_inputs(case) -> SinkInputs:
    """Physics inputs of a heat-sink case (SI), ready for :mod:`finkit.physics.sink`.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case. [-]
    """
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
        options=ModelOptions(
            heat_transfer_coefficient_override=s.heat_transfer_coefficient_override
        ),
        altitude=float(a.altitude),
    )


def fan_curve(fan) -> FanCurve:
    """The (combined, scaled) fan curve of a case's ``air.flow.fan`` block.

    Parameters
    ----------
    fan : finkit.case.Fan
        The validated fan block (table in SI, count, arrangement, pressure factor). [-]
    """
    # The case's checks (finkit.case.Fan) apply the fan curve's own table rules, so a
    # validated case builds its curve.
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


def solve(inputs: SinkInputs, *, airflow=None, **replacements) -> SinkSolution:
    """Temperatures at the stated power; ``replacements`` swap whole input objects.

    Parameters
    ----------
    inputs : SinkInputs
        The design at one condition. [-]
    airflow : object, optional
        :func:`airflow_of` the same inputs, to share between solves. [-]
    **replacements
        Fields of :class:`SinkInputs` replaced for this solve (whole objects). [-]
    """
    i = replace(inputs, **replacements) if replacements else inputs
    return solve_temperatures(
        i.geometry, i.material, i.source, i.air, i.flow, i.bypass, i.options, airflow=airflow
    )


def allowable(
    inputs: SinkInputs, margin: float | None = None, *, airflow=None, **replacements
) -> SinkSolution:
    """State at the allowable power: limit node at the limit less ``margin`` [K].

    Parameters
    ----------
    inputs : SinkInputs
        The design at one condition. [-]
    margin : float, optional
        Margin below the limit; default the case's required margin. [K]
    airflow : object, optional
        :func:`airflow_of` the same inputs, to share between solves. [-]
    **replacements
        Fields of :class:`SinkInputs` replaced for this solve (whole objects). [-]
    """
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
        airflow=airflow,
    )


def airflow_of(inputs: SinkInputs):
    """The airflow of a case (forced convection; None in still air), solved once so that the
    two design questions asked of the same inputs share it (it does not depend on power).

    Parameters
    ----------
    inputs : SinkInputs
        The design at one condition. [-]
    """
    from finkit.physics.sink.results import solve_case_airflow

    if isinstance(inputs.flow, NaturalConvection):
        return None
    i = inputs
    return solve_case_airflow(i.geometry, i.flow, i.air, i.bypass, i.options)


@dataclass(frozen=True)
class ConditionState:
    """One operating condition solved both ways (see :func:`solve_condition`).

    Attributes
    ----------
    results : dict
        Name -> value in the unit of :data:`RESULT_UNITS` (temperatures in °C).
    solution : SinkSolution
        State at the stated power.
    allowable : SinkSolution or None
        State at the allowable power (limit node at the limit less the required margin); None
        when the inlet air already leaves no margin.
    status : str
        ``pass`` when the margin is at least the required margin, else ``fail``.
    warnings : tuple of str
        Validity messages of both states (one per quantity).
    """

    results: dict[str, float | None]
    solution: SinkSolution
    allowable: SinkSolution | None
    status: str
    warnings: tuple[str, ...]


def solve_condition(inputs: SinkInputs) -> ConditionState:
    """Solve one operating condition: temperatures, margin, allowable power, power at the limit.

    The one place where a condition's results are computed; the nominal case and every scenario
    go through it (:func:`finkit.model.review.run_scenarios`).

    Parameters
    ----------
    inputs : SinkInputs
        The design at the condition. [-]
    """
    airflow = airflow_of(inputs)  # shared by the three solves below
    sol = solve(inputs, airflow=airflow)
    t_in = float(np.max(inputs.air.inlet_temperature))
    usable_limit = inputs.limit_temperature - inputs.required_margin
    if usable_limit > t_in + 1e-6:
        at_margin = allowable(inputs, airflow=airflow)
        allowable_power = float(at_margin.power)
    else:
        at_margin, allowable_power = None, 0.0
    if inputs.limit_temperature > t_in + 1e-6:
        power_at_limit = float(allowable(inputs, margin=0.0, airflow=airflow).power)
    else:
        power_at_limit = 0.0
    node_t = float(sol.node_temperature(inputs.limit_node))
    margin = inputs.limit_temperature - node_t
    is_natural = isinstance(inputs.flow, NaturalConvection)
    total_q = float(sol.convection_heat_rate + sol.radiation_heat_rate)
    with np.errstate(invalid="ignore", divide="ignore"):
        bypass_fraction = float(sol.bypass_volume_flow / sol.volume_flow)
    results = {
        "sink_resistance": float(sol.sink_resistance),
        "total_resistance": float(sol.total_resistance),
        "base_temperature": _c(sol.base_temperature),
        "source_base_temperature": _c(sol.source_base_temperature),
        "source_base_centre_temperature": _c(sol.source_base_centre_temperature),
        "case_temperature": _c(sol.case_temperature),
        "junction_temperature": _c(sol.junction_temperature),
        "fin_tip_temperature": _c(sol.fin_tip_temperature),
        "limit_node_temperature": node_t - ZERO_CELSIUS,
        "limit_temperature": inputs.limit_temperature - ZERO_CELSIUS,
        "allowable_power": allowable_power,
        "power_at_limit": power_at_limit,
        "temperature_margin": margin,
        "required_margin": inputs.required_margin,
        "pressure_drop": None if is_natural else float(sol.pressure_drop),
        "volume_flow": None if is_natural else float(sol.volume_flow),
        "sink_volume_flow": None if is_natural else float(sol.sink_volume_flow),
        "bypass_fraction": None if is_natural else bypass_fraction,
        "approach_velocity": None if is_natural else float(sol.approach_velocity),
        "fin_efficiency": float(sol.fin_efficiency),
        "surface_efficiency": float(sol.surface_efficiency),
        "fin_effectiveness": None,
        "heat_transfer_coefficient": float(sol.heat_transfer_coefficient),
        "outlet_air_temperature": None if is_natural else _c(sol.outlet_air_temperature),
        "radiation_fraction": float(sol.radiation_heat_rate) / total_q if total_q > 0 else 0.0,
        "fin_heat_rate": None,
        "mass": float(inputs.geometry.mass(inputs.material.density)),
        "power": float(np.max(sol.power)),
        "inlet_temperature": _c(sol.inlet_air_temperature),
    }
    warnings = list(sol.warnings)
    if at_margin is not None:
        # The allowable-power state repeats most messages with other numbers: keep only those
        # about a quantity the stated-power state did not already flag.
        seen = {w.split(" = ")[0] for w in warnings}
        warnings += [w for w in at_margin.warnings if w.split(" = ")[0] not in seen]
    return ConditionState(
        results=results,
        solution=sol,
        allowable=at_margin,
        status="pass" if margin >= inputs.required_margin else "fail",
        warnings=tuple(warnings),
    )
