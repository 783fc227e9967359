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
from finkit.physics.base_field import BasePlate, SourceFootprint
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.atmosphere import standard_atmosphere
from finkit.physics.properties.materials import get_material, material_emissivity
from finkit.physics.sink.inputs import (
    DEFAULT_OPTIONS,
    Air,
    Bypass,
    FanDriven,
    FreeConvectionCredit,
    FreeStream,
    GivenVelocity,
    GivenVolumeFlow,
    HeatSource,
    ModelOptions,
    NaturalConvection,
    SinkMaterial,
)
from finkit.physics.sink.results import SinkSolution
from finkit.physics.sink.solve import solve_allowable_power, solve_temperatures
from finkit.physics.sink.sources import (
    NATURAL_PLACEMENT_WARNING,
    PlacedSource,
    SourceLayout,
    SourcesState,
    solve_sources,
)

__all__ = [
    "ConditionState",
    "SinkInputs",
    "airflow_of",
    "allowable",
    "fan_curve",
    "limit_node_temperature",
    "own_allowable_powers",
    "sink_inputs",
    "solve",
    "solve_condition",
    "source_rows",
    "source_surplus",
    "without_margin",
]


@dataclass(frozen=True)
class SinkInputs:
    """The physics inputs of a heat-sink case, in SI (see :mod:`finkit.physics.sink`).

    ``altitude`` [m] is the site altitude the air pressure was taken from (standard
    atmosphere); relative scenarios (``altitude_increase``) start from it.

    With several sources (``sources``, a :class:`~finkit.physics.sink.sources.SourceLayout`),
    ``source`` is their sum spread over the whole base (no interface, no RθJC): the sink model
    needs only the total power for the fins and the air; each source's own temperatures come
    from the base field (:func:`solve_condition`). A scenario that scales ``source.power``
    scales every source by the same factor. ``limits`` then holds each source's (node,
    limit [K], required margin [K]); ``lead_source`` is the index of the source whose limit
    ``limit_node``, ``limit_temperature`` and ``required_margin`` repeat (the governing source
    of the condition once :func:`solve_condition` has named it), for the figures and studies
    that follow one limit node (:func:`limit_node_temperature`).
    """

    geometry: PlateFinSink | PinFinSink
    material: SinkMaterial
    source: HeatSource
    air: Air
    flow: Any
    bypass: Bypass | FreeStream | None
    limit_node: str
    limit_temperature: float
    required_margin: float
    options: ModelOptions = DEFAULT_OPTIONS
    altitude: float = 0.0
    sources: SourceLayout | None = None
    limits: tuple[tuple[str, float, float], ...] = ()
    lead_source: int = 0


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
    layout, limits = None, ()
    if case.sources:
        layout, limits = _layout(case, material.thermal_conductivity)
        source = HeatSource(
            power=layout.total_power,
            footprint_length=s.base.length,
            footprint_width=s.base.width,
        )
    else:
        src = case.source
        footprint = src.footprint_length * src.footprint_width
        source = HeatSource(
            power=src.power,
            footprint_length=src.footprint_length,
            footprint_width=src.footprint_width,
            junction_to_case_resistance=src.junction_to_case or 0.0,
            interface_resistance=src.interface.resistance_over(footprint),
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
    if a.bypass is not None and a.bypass.free_stream:
        bypass = FreeStream()
    elif a.bypass is not None and (a.bypass.side_gap > 0 or a.bypass.top_gap > 0):
        bypass = Bypass(side_gap=a.bypass.side_gap, top_gap=a.bypass.top_gap)
    limit_node, limit_temperature, required_margin = (
        limits[0]
        if limits
        else (case.limit.node, case.limit.temperature, case.limit.required_margin)
    )
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
        limit_node=limit_node,
        limit_temperature=limit_temperature,
        required_margin=required_margin,
        options=ModelOptions(
            heat_transfer_coefficient_override=s.heat_transfer_coefficient_override,
            free_convection=_free_convection(a.flow.free_convection),
        ),
        altitude=float(a.altitude),
        sources=layout,
        limits=limits,
    )


def _layout(case, metal_conductivity: float):
    """The placed sources of a case and each one's limit (its own, else the case's)."""
    base = case.sink.base
    spreader = base.spreader
    plate = BasePlate(
        length=base.length,
        width=base.width,
        thickness=base.thickness,
        in_plane_conductivity=metal_conductivity
        if spreader is None
        else spreader.in_plane_conductivity,
        through_conductivity=metal_conductivity
        if spreader is None
        else spreader.through_conductivity,
    )
    placed, limits = [], []
    for s in case.sources:
        area = s.footprint_length * s.footprint_width
        placed.append(
            PlacedSource(
                name=s.name,
                power=s.power,
                footprint=SourceFootprint(
                    length=s.footprint_length,
                    width=s.footprint_width,
                    centre_along=s.centre_along,
                    centre_across=s.centre_across,
                ),
                junction_to_case_resistance=s.junction_to_case or 0.0,
                interface_resistance=s.interface.resistance_over(area),
            )
        )
        lim = s.limit or case.limit
        limits.append((lim.node, lim.temperature, lim.required_margin))
    return SourceLayout(sources=tuple(placed), plate=plate), tuple(limits)


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


def _free_convection(block) -> FreeConvectionCredit | None:
    if block is None:
        return None
    return FreeConvectionCredit(
        orientation=block.orientation, forced_flow=block.forced_flow, radiation=block.radiation
    )


def _flow(flow):
    if flow.approach_velocity is not None:
        return GivenVelocity(flow.approach_velocity)
    if flow.volume_flow is not None:
        return GivenVolumeFlow(flow.volume_flow)
    if flow.fan is not None:
        return FanDriven(fan_curve(flow.fan))
    return NaturalConvection(flow.natural.orientation)


# --------------------------------------------------------------------------------------
# Several sources on the base
# --------------------------------------------------------------------------------------

#: Fixed-point steps of the common power scale at the limit (each a sink solve; the sink is
#: close to linear in power, so two or three steps reach 1e-7).
SCALE_STEPS = 12
#: Relative change of the scale at which the steps stop.
SCALE_TOLERANCE = 1e-11


def _with_sources(inputs: SinkInputs, sol: SinkSolution) -> SinkSolution:
    """The sink state with each source's temperatures (``sol.sources``); the four source nodes
    of the solution become the hottest value of any source at that node."""
    is_natural = isinstance(inputs.flow, NaturalConvection)
    air_rise = (
        np.zeros_like(np.asarray(sol.base_temperature, float))
        if is_natural
        else np.asarray(sol.outlet_air_temperature - sol.inlet_air_temperature, float)
    )
    state = solve_sources(
        inputs.sources,
        base_temperature=sol.base_temperature,
        sink_resistance=sol.sink_resistance,
        air_rise=air_rise,
        total_power=sol.power,
    )
    warnings = sol.warnings + ((NATURAL_PLACEMENT_WARNING,) if is_natural else ())
    return replace(
        sol,
        source_base_temperature=state.base_mean.max(axis=-1),
        source_base_centre_temperature=state.base_peak.max(axis=-1),
        case_temperature=state.case.max(axis=-1),
        junction_temperature=state.junction.max(axis=-1),
        sources=state,
        warnings=warnings,
    )


def without_margin(inputs: SinkInputs) -> SinkInputs:
    """The same design with no required margin (every source's too, with several sources).

    Parameters
    ----------
    inputs : SinkInputs
        The design. [-]
    """
    limits = tuple((node, limit, 0.0) for node, limit, _ in inputs.limits)
    return replace(inputs, required_margin=0.0, limits=limits)


def limit_node_temperature(inputs: SinkInputs, sol: SinkSolution) -> np.ndarray:
    """Temperature of the limit node the inputs name [K]: with several sources, the lead
    source's own node (``inputs.lead_source``), else the one chain's.

    Parameters
    ----------
    inputs : SinkInputs
        The design. [-]
    sol : SinkSolution
        Its solved state. [-]
    """
    if inputs.sources is None or sol.sources is None:
        return sol.node_temperature(inputs.limit_node)
    return sol.sources.node(inputs.limit_node)[..., inputs.lead_source]


def _node_of_sources(inputs: SinkInputs, state: SourcesState) -> np.ndarray:
    """Each source's own limit node, the source axis last [K]."""
    return np.stack(
        [state.node(node)[..., k] for k, (node, _, _) in enumerate(inputs.limits)], axis=-1
    )


def source_surplus(inputs: SinkInputs, state: SourcesState, margin=None) -> np.ndarray:
    """Each source's limit less its margin less its limit-node temperature [K].

    Parameters
    ----------
    inputs : SinkInputs
        A case with several sources (``inputs.limits``). [-]
    state : SourcesState
        The sources' temperatures. [-]
    margin : float or None
        One margin for every source in place of each one's required margin. [K]

    Returns
    -------
    numpy.ndarray
        The surplus of each source, the source axis last [K].
    """
    usable = np.array([lim - (req if margin is None else margin) for _, lim, req in inputs.limits])
    return usable - _node_of_sources(inputs, state)


def _allowable_sources(inputs: SinkInputs, margin, airflow, stated=None) -> SinkSolution:
    """State at the common scale of every source's power that brings the governing source to
    its limit less its margin (fixed point on the scale, design by design; each step a full
    sink solve), starting from ``stated`` (the state at the stated powers) when given."""
    t_in = np.asarray(inputs.air.inlet_temperature, float)
    usable = np.array([lim - (req if margin is None else margin) for _, lim, req in inputs.limits])
    if airflow is None:
        airflow = airflow_of(inputs)  # it does not depend on the power: once for every step
    power = np.asarray(inputs.source.power, float)
    sol = solve(inputs, airflow=airflow) if stated is None else stated
    total = np.broadcast_to(power, np.shape(sol.power)).astype(float).copy()
    hopeless = (
        np.any(usable <= t_in[..., None], axis=-1) if np.ndim(t_in) else np.any(usable <= t_in)
    )
    total = np.where(hopeless | (total <= 0), 0.0, total)
    for _ in range(SCALE_STEPS):
        rise = (
            _node_of_sources(inputs, sol.sources)
            - np.asarray(sol.inlet_air_temperature, float)[..., None]
        )
        with np.errstate(divide="ignore", invalid="ignore"):
            room = usable - np.asarray(sol.inlet_air_temperature, float)[..., None]
            ratio = np.min(np.where(rise > 0, room / rise, np.inf), axis=-1)
        ratio = np.where(np.isfinite(ratio) & (total > 0), ratio, 1.0)
        total = total * ratio
        sol = solve(inputs, airflow=airflow, source=replace(inputs.source, power=total))
        if np.all(np.abs(ratio - 1.0) < SCALE_TOLERANCE):
            break
    return sol


def own_allowable_powers(inputs: SinkInputs, sol: SinkSolution, margin=None) -> np.ndarray:
    """Power each source could reach with the others held at theirs, each at its own limit
    less its margin [W].

    A linear estimate about the solved state: the source's own coefficient (sink, base field,
    interface, RθJC and the air placement, each per watt of that source) with the air
    properties and the airflow held; exact for the base field, within the film-temperature
    change of the sink resistance otherwise.

    Parameters
    ----------
    inputs : SinkInputs
        A case with several sources. [-]
    sol : SinkSolution
        The solved state (with ``sol.sources``). [-]
    margin : float or None
        One margin for every source in place of each one's required margin. [K]
    """
    state = sol.sources
    r_sink = float(np.asarray(sol.sink_resistance).max())
    total = float(state.power.sum())
    air_rise = float(state.air_rise)
    rise_per_watt = air_rise / total if total > 0 else 0.0
    surplus = source_surplus(inputs, state, margin)
    out = []
    for k, (node, _, _) in enumerate(inputs.limits):
        step = max(1e-3 * total, 1e-3)
        bumped = np.array(state.power, float)
        bumped[k] += step
        other = solve_sources(
            inputs.sources,
            base_temperature=float(state.base_temperature) + step * r_sink,
            sink_resistance=r_sink,
            air_rise=air_rise + step * rise_per_watt,
            powers=bumped,
        )
        slope = (float(other.node(node)[k]) - float(state.node(node)[k])) / step
        out.append(max(state.power[k] + surplus[k] / slope, 0.0) if slope > 0 else np.nan)
    return np.array(out)


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
    sol = solve_temperatures(
        i.geometry, i.material, i.source, i.air, i.flow, i.bypass, i.options, airflow=airflow
    )
    return sol if i.sources is None else _with_sources(i, sol)


def allowable(
    inputs: SinkInputs,
    margin: float | None = None,
    *,
    airflow=None,
    stated: SinkSolution | None = None,
    **replacements,
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
    stated : SinkSolution, optional
        With several sources: ``solve(inputs, airflow=airflow)`` already at hand (the state at
        the stated powers, where the search starts), so that it is not solved again; ignored
        with ``replacements`` [-].
    **replacements
        Fields of :class:`SinkInputs` replaced for this solve (whole objects). [-]
    """
    i = replace(inputs, **replacements) if replacements else inputs
    if i.sources is not None:
        return _allowable_sources(i, margin, airflow, None if replacements else stated)
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
    sources : tuple of dict
        With several sources: one mapping per source (see :func:`source_rows`), the governing
        source first; empty otherwise.
    limit_node : str
        The node checked (with several sources: the governing source's) [-].
    inputs : SinkInputs or None
        With several sources: the inputs with the governing source as the lead source (its
        limit in ``limit_node``, ``limit_temperature``, ``required_margin``); else None.
    """

    results: dict[str, float | None]
    solution: SinkSolution
    allowable: SinkSolution | None
    status: str
    warnings: tuple[str, ...]
    sources: tuple[dict[str, Any], ...] = ()
    limit_node: str = "junction"
    inputs: SinkInputs | None = None

    @property
    def governing_source(self) -> str | None:
        """Name of the source with the least surplus over its required margin (None with one
        centred source) [-]."""
        return self.sources[0]["name"] if self.sources else None


def solve_condition(inputs: SinkInputs) -> ConditionState:
    """Solve one operating condition: temperatures, margin, allowable power, power at the limit.

    The one place where a condition's results are computed; the nominal case and every scenario
    go through it (:func:`finkit.model.review.run_scenarios`).

    Parameters
    ----------
    inputs : SinkInputs
        The design at the condition. [-]
    """
    if inputs.sources is not None:
        return _solve_condition_sources(inputs)
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
    results = _condition_results(inputs, sol)
    results.update(
        {
            "limit_node_temperature": node_t - ZERO_CELSIUS,
            "limit_temperature": inputs.limit_temperature - ZERO_CELSIUS,
            "allowable_power": allowable_power,
            "power_at_limit": power_at_limit,
            "temperature_margin": margin,
            "required_margin": inputs.required_margin,
        }
    )
    return ConditionState(
        results=results,
        solution=sol,
        allowable=at_margin,
        status="pass" if margin >= inputs.required_margin else "fail",
        warnings=_both_warnings(sol, at_margin),
        limit_node=inputs.limit_node,
    )


def _both_warnings(sol: SinkSolution, at_margin: SinkSolution | None) -> tuple[str, ...]:
    """Validity messages of the stated-power state and of the allowable-power state. The
    latter repeats most of them with other numbers: only those about a quantity the first did
    not already flag are kept."""
    warnings = list(sol.warnings)
    if at_margin is not None:
        seen = {w.split(" = ")[0] for w in warnings}
        warnings += [w for w in at_margin.warnings if w.split(" = ")[0] not in seen]
    return tuple(warnings)


def _condition_results(inputs: SinkInputs, sol: SinkSolution) -> dict[str, float | None]:
    """The results every condition carries, from the state at the stated power (the limit,
    margin and allowable entries are the caller's)."""
    is_natural = isinstance(inputs.flow, NaturalConvection)
    total_q = float(sol.convection_heat_rate + sol.radiation_heat_rate)
    with np.errstate(invalid="ignore", divide="ignore"):
        bypass_fraction = float(sol.bypass_volume_flow / sol.volume_flow)
    return {
        "sink_resistance": float(sol.sink_resistance),
        "total_resistance": float(sol.total_resistance),
        "base_temperature": _c(sol.base_temperature),
        "source_base_temperature": _c(sol.source_base_temperature),
        "source_base_centre_temperature": _c(sol.source_base_centre_temperature),
        "case_temperature": _c(sol.case_temperature),
        "junction_temperature": _c(sol.junction_temperature),
        "fin_tip_temperature": _c(sol.fin_tip_temperature),
        # the limit entries are the caller's (one chain, or the governing source)
        "limit_node_temperature": None,
        "limit_temperature": None,
        "allowable_power": None,
        "power_at_limit": None,
        "temperature_margin": None,
        "required_margin": None,
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


def source_rows(inputs: SinkInputs, sol: SinkSolution) -> list[dict[str, Any]]:
    """One mapping per source of a solved state, the governing source (least surplus over its
    required margin) first, then by surplus.

    Each holds ``name``, ``power`` [W], ``base_mean``, ``base_peak``, ``case``, ``junction``,
    ``limit_temperature``, ``node_temperature`` [°C], ``limit_node``, ``margin``,
    ``required_margin``, ``air_offset`` [K], ``status``, ``allowable_power_alone`` (with the
    others held) [W], ``centre_along``, ``centre_across``, ``peak_along``, ``peak_across`` [m].

    Parameters
    ----------
    inputs : SinkInputs
        A case with several sources. [-]
    sol : SinkSolution
        Its state at the stated power (with ``sol.sources``). [-]
    """
    state = sol.sources
    alone = own_allowable_powers(inputs, sol)
    rows = []
    for k, (node, limit, required) in enumerate(inputs.limits):
        placed = inputs.sources.sources[k]
        node_t = float(state.node(node)[k])
        rows.append(
            {
                "name": placed.name,
                "power": float(state.power[k]),
                "base_mean": float(state.base_mean[k]) - ZERO_CELSIUS,
                "base_peak": float(state.base_peak[k]) - ZERO_CELSIUS,
                "case": float(state.case[k]) - ZERO_CELSIUS,
                "junction": float(state.junction[k]) - ZERO_CELSIUS,
                "limit_node": node,
                "node_temperature": node_t - ZERO_CELSIUS,
                "limit_temperature": float(limit) - ZERO_CELSIUS,
                "margin": float(limit) - node_t,
                "required_margin": float(required),
                "status": "pass" if float(limit) - node_t >= required else "fail",
                "air_offset": float(state.air_offset[k]),
                "allowable_power_alone": float(alone[k]),
                "centre_along": placed.footprint.centre_along,
                "centre_across": placed.footprint.centre_across,
                "peak_along": float(state.peak_along[k]),
                "peak_across": float(state.peak_across[k]),
            }
        )
    rows.sort(key=lambda r: r["margin"] - r["required_margin"])
    return rows


def _solve_condition_sources(inputs: SinkInputs) -> ConditionState:
    """:func:`solve_condition` with several sources: every source against its own limit; the
    governing source gives the headline node, margin and limit; the allowable power is the
    common scale of all sources that brings the governing one to its limit less its margin."""
    airflow = airflow_of(inputs)
    sol = solve(inputs, airflow=airflow)
    t_in = float(np.max(inputs.air.inlet_temperature))
    rows = source_rows(inputs, sol)
    gov = rows[0]
    if all(lim - req > t_in + 1e-6 for _, lim, req in inputs.limits):
        at_margin = allowable(inputs, airflow=airflow, stated=sol)
        allowable_power = float(at_margin.power)
    else:
        at_margin, allowable_power = None, 0.0
    if all(lim > t_in + 1e-6 for _, lim, _ in inputs.limits):
        power_at_limit = float(allowable(inputs, margin=0.0, airflow=airflow, stated=sol).power)
    else:
        power_at_limit = 0.0
    results = _condition_results(inputs, sol)
    results.update(
        {
            # the governing source's chain; one source's chain is not the sink's, so no total
            "total_resistance": None,
            "source_base_temperature": gov["base_mean"],
            "source_base_centre_temperature": gov["base_peak"],
            "case_temperature": gov["case"],
            "junction_temperature": gov["junction"],
            "limit_node_temperature": gov["node_temperature"],
            "limit_temperature": gov["limit_temperature"],
            "allowable_power": allowable_power,
            "power_at_limit": power_at_limit,
            "temperature_margin": gov["margin"],
            "required_margin": gov["required_margin"],
        }
    )
    return ConditionState(
        results=results,
        solution=sol,
        allowable=at_margin,
        status="pass" if all(r["status"] == "pass" for r in rows) else "fail",
        warnings=_both_warnings(sol, at_margin),
        sources=tuple(rows),
        limit_node=gov["limit_node"],
        inputs=replace(
            inputs,
            limit_node=gov["limit_node"],
            limit_temperature=gov["limit_temperature"] + ZERO_CELSIUS,
            required_margin=gov["required_margin"],
            lead_source=inputs.sources.names.index(gov["name"]),
        ),
    )
