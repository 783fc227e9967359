"""The two design questions: temperatures at a power, and the allowable power at a limit."""

from __future__ import annotations

from typing import Literal

import numpy as np

from finkit.errors import InputError
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.sink.forced import (
    _solve_forced,
)
from finkit.physics.sink.inputs import (
    DEFAULT_OPTIONS,
    Air,
    Bypass,
    Flow,
    HeatSource,
    ModelOptions,
    NaturalConvection,
    SinkMaterial,
)
from finkit.physics.sink.mixed import mixed_conductance
from finkit.physics.sink.natural import (
    _solve_natural,
)
from finkit.physics.sink.results import (
    SinkSolution,
    _check_node,
    _property_range_context,
)

__all__ = [
    "solve_allowable_power",
    "solve_temperatures",
]


# --------------------------------------------------------------------------------------
# The two design questions
# --------------------------------------------------------------------------------------


def _mixed(geometry, material, air, options):
    """The mixed-convection conductance of this design, when the options credit it."""
    if options.free_convection is None:
        return None

    def mixed(forced, base_excess):
        return mixed_conductance(geometry, material, air, options, forced, base_excess)

    return mixed


def solve_temperatures(
    geometry: PlateFinSink | PinFinSink,
    material: SinkMaterial,
    source: HeatSource,
    air: Air,
    flow: Flow,
    bypass: Bypass | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
    *,
    airflow=None,
) -> SinkSolution:
    """At this power, how hot does each node get?

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs) [-].
    material : SinkMaterial
        Sink conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    source : HeatSource
        Power [W], footprint [m], RθJC and interface resistance [K W⁻¹].
    air : Air
        Inlet air temperature [K] and pressure [Pa].
    flow : GivenVelocity, GivenVolumeFlow, FanDriven or NaturalConvection
        How the air moves [-].
    bypass : Bypass, optional
        Duct clearance round the sink (forced convection only); None = fully shrouded [-].
    options : ModelOptions, optional
        Model choices, calibration and fouling allowances [-].
    airflow : optional
        :func:`solve_airflow` of these same inputs, to reuse (forced convection); solved here
        when not given. No result is remembered between calls [-].

    Returns
    -------
    SinkSolution
        Node temperatures [K], resistances [K W⁻¹], flows, efficiencies and warnings.
    """
    with _property_range_context():
        if isinstance(flow, NaturalConvection):
            state = _solve_natural(
                geometry, material, source, air, flow, options, power=source.power
            )
            return state[0]
        return _solve_forced(
            geometry,
            material,
            source,
            air,
            flow,
            bypass,
            options,
            power=source.power,
            airflow=airflow,
            mixed=_mixed(geometry, material, air, options),
        )


def solve_allowable_power(
    geometry: PlateFinSink | PinFinSink,
    material: SinkMaterial,
    source: HeatSource,
    air: Air,
    flow: Flow,
    limit_node: Literal["junction", "case", "base"],
    limit_temperature,
    bypass: Bypass | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
    *,
    airflow=None,
) -> SinkSolution:
    """At this temperature limit on a node, how much power can the sink carry?

    The power in ``source`` is ignored; the returned solution is the state at the allowable
    power (its ``power`` field), with the limit node exactly at ``limit_temperature`` [K].
    Air heating and the film-temperature property feedback are included. Where the inlet air
    is already at or above the limit, the allowable power is zero. ``airflow``: as in
    :func:`solve_temperatures`.

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs) [-].
    material : SinkMaterial
        Sink conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    source : HeatSource
        Footprint [m], RθJC and interface resistance [K W⁻¹]; its power is ignored.
    air : Air
        Inlet air temperature [K] and pressure [Pa].
    flow : GivenVelocity, GivenVolumeFlow, FanDriven or NaturalConvection
        How the air moves [-].
    limit_node : {"junction", "case", "base"}
        The node whose temperature is limited [-].
    limit_temperature : float or array_like
        Allowed temperature of ``limit_node`` [K].
    bypass : Bypass, optional
        Duct clearance round the sink (forced convection only); None = fully shrouded [-].
    options : ModelOptions, optional
        Model choices, calibration and fouling allowances [-].
    airflow : optional
        :func:`solve_airflow` of these same inputs, to reuse (forced convection); solved here
        when not given [-].
    """
    _check_node(limit_node)
    limit = (limit_node, np.asarray(limit_temperature, float))
    if isinstance(flow, NaturalConvection):
        t_in = np.asarray(air.inlet_temperature, float)
        if np.any(limit[1] <= t_in):
            raise InputError(
                "limit.temperature: must be above the inlet air temperature for natural "
                "convection (no heat can leave otherwise)"
            )
        with _property_range_context():
            return _solve_natural(geometry, material, source, air, flow, options, limit=limit)[0]
    with _property_range_context():
        return _solve_forced(
            geometry,
            material,
            source,
            air,
            flow,
            bypass,
            options,
            limit=limit,
            airflow=airflow,
            mixed=_mixed(geometry, material, air, options),
        )
