"""Operating conditions (scenarios): each solved at once, the governing one named.

What a scenario is and changes lives in :mod:`finkit.model.review.scenario_defs`.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.errors import FinkitError, InputError
from finkit.model.design import SinkInputs, allowable
from finkit.model.review.scenario_defs import (
    Scenario,
    scenario_changes,
)
from finkit.physics.airflow.fans import FanCurve
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.atmosphere import ALTITUDE_RANGE, standard_atmosphere
from finkit.physics.sink.inputs import FanDriven, NaturalConvection
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "EMPIRICAL_STATEMENT",
    "ScenarioRow",
    "ScenarioTable",
    "apply_scenario",
    "milder_than_nominal",
    "run_scenarios",
]

EMPIRICAL_STATEMENT = (
    "The multiplier is empirical: it absorbs every difference between this model and the test "
    "(correlation scatter, contact and interface resistance, flow bypass, thermocouple placement "
    "and error) and holds only near the tested geometry, flow and power."
)


def milder_than_nominal(inputs: SinkInputs, scenario: Scenario) -> list[str]:
    """Warnings for a scenario that is no harsher than the nominal case on some condition.

    A scenario written with absolute values does not follow a variant: a variant installed at
    3000 m makes a "2500 m" scenario milder than its own nominal. Each condition the scenario
    sets to a cooler inlet, a lower altitude, less power, more fan or less loss than nominal is
    named (equal values too: that scenario checks nothing beyond the nominal).

    Parameters
    ----------
    inputs : SinkInputs
        The nominal case. [-]
    scenario : Scenario
        The scenario to compare with it. [-]
    """
    out = []
    where = f"scenario {scenario.name}"
    t_nom = float(np.max(inputs.air.inlet_temperature))
    if scenario.inlet_temperature is not None and scenario.inlet_temperature <= t_nom + 1e-9:
        out.append(
            f"{where}: inlet air {scenario.inlet_temperature - ZERO_CELSIUS:.1f} degC is not "
            f"above this variant's nominal {t_nom - ZERO_CELSIUS:.1f} degC, so it checks nothing "
            "harsher; use inlet_temperature_rise to follow the variant"
        )
    if scenario.altitude is not None and scenario.altitude <= inputs.altitude + 1e-9:
        out.append(
            f"{where}: altitude {scenario.altitude:.0f} m is not above this variant's nominal "
            f"{inputs.altitude:.0f} m, so it checks nothing harsher; use altitude_increase to "
            "follow the variant"
        )
    p_nom = float(np.max(inputs.source.power))
    if scenario.power is not None and scenario.power <= p_nom * (1 + 1e-12):
        out.append(
            f"{where}: power {scenario.power:.3g} W is not above this variant's nominal "
            f"{p_nom:.3g} W; use power_factor to follow the variant"
        )
    milder_factors = {
        "power_factor": (scenario.power_factor, "below", lambda v: v < 1),
        "fan_speed_ratio": (scenario.fan_speed_ratio, "above", lambda v: v > 1),
        "fan_pressure_factor": (scenario.fan_pressure_factor, "above", lambda v: v > 1),
        "heat_transfer_factor": (scenario.heat_transfer_factor, "above", lambda v: v > 1),
        "pressure_drop_factor": (scenario.pressure_drop_factor, "below", lambda v: v < 1),
    }
    for name, (value, side, is_milder) in milder_factors.items():
        if value is not None and is_milder(value):
            out.append(f"{where}: {name} {value:.3g} is {side} 1, milder than the nominal case")
    return out


def _series_losses(volume_flow, losses):
    return sum(loss(volume_flow) for loss in losses)


def _shifted_air(air, inlet_temperature, surroundings_temperature=None):
    """Air with a new inlet temperature; surroundings given, or moved by the same amount."""
    if surroundings_temperature is None and air.surroundings_temperature is not None:
        shift = np.asarray(inlet_temperature, float) - np.asarray(air.inlet_temperature, float)
        surroundings_temperature = np.asarray(air.surroundings_temperature, float) + shift
    return replace(
        air,
        inlet_temperature=inlet_temperature,
        surroundings_temperature=surroundings_temperature,
    )


def _check_deposit(geometry, thickness, where):
    """Refuse a deposit layer that closes the passages."""
    if isinstance(geometry, PlateFinSink):
        gap = float(np.min(geometry.fin_spacing))
        if 2.0 * thickness >= gap:
            raise InputError(
                f"{where}.deposit_thickness: {thickness * 1e3:.3g} mm on each face closes the "
                f"{gap * 1e3:.3g} mm fin gap; must be below half the gap"
            )
    else:
        clear = float(
            np.min(
                np.minimum(geometry.transverse_pitch, geometry.longitudinal_pitch)
                - geometry.pin_diameter
            )
        )
        if 2.0 * thickness >= clear:
            raise InputError(
                f"{where}.deposit_thickness: {thickness * 1e3:.3g} mm on each pin closes the "
                f"{clear * 1e3:.3g} mm clearance between pins; must be below half of it"
            )


def apply_scenario(inputs: SinkInputs, scenario: Scenario, fan_block=None) -> SinkInputs:
    """The physics inputs of one scenario: the nominal inputs with its conditions replaced.

    Parameters
    ----------
    inputs : SinkInputs
        The nominal case (:func:`finkit.model.sink_inputs`). [-]
    scenario : Scenario
        Conditions to change. [-]
    fan_block : object, optional
        The case's ``air.flow.fan`` block (volume_flow, pressure, count, arrangement,
        rating_density, pressure_factor); required for ``failed_fans``, since a failed fan is
        taken out of the combination of single-fan curves. [-]

    Returns
    -------
    SinkInputs
        New inputs; the nominal ones are not altered.

    Raises
    ------
    InputError
        A fan change in a case without a fan, a filter or pressure-drop change in natural
        convection, too many failed fans, or a deposit that closes the passages; one line
        naming ``scenarios[<name>].<field>``.

    Notes
    -----
    Failed fans: the curve of ``count`` fans of which ``failed_fans`` are stopped
    (:meth:`finkit.physics.airflow.FanCurve.with_failed`, with the leak through each stopped fan
    when
    its resistance is given), then the case's own pressure factor, then the speed ratio. The
    operating point is re-solved against the sink, bypass and series losses at the scenario's
    air density. A filter adds ``dp(Q)`` in series with the sink and its bypass. A deposit layer
    narrows the passages (``ModelOptions.deposit_thickness``) and, with its conductivity, adds
    its conduction resistance to the fouling resistance.
    """
    # Long by design: one block per kind of condition a scenario may change (inlet, altitude, power,
    # fans, filter, fouling, ...), applied in a fixed order.
    where = f"scenarios[{scenario.name}]"
    s, i = scenario, inputs
    is_fan = isinstance(i.flow, FanDriven)
    is_natural = isinstance(i.flow, NaturalConvection)
    air, source, flow, options = i.air, i.source, i.flow, i.options

    altitude = i.altitude
    if (
        s.inlet_temperature is not None
        or s.inlet_temperature_rise is not None
        or s.surroundings_temperature is not None
    ):
        inlet = air.inlet_temperature if s.inlet_temperature is None else s.inlet_temperature
        if s.inlet_temperature_rise is not None:
            inlet = np.asarray(inlet, float) + s.inlet_temperature_rise
        air = _shifted_air(air, inlet, s.surroundings_temperature)
    if s.altitude is not None or s.altitude_increase is not None:
        altitude = i.altitude if s.altitude is None else s.altitude
        altitude = altitude + (s.altitude_increase or 0.0)
        if altitude > ALTITUDE_RANGE[1]:
            raise InputError(
                f"{where}.altitude_increase: takes the site to {altitude:.0f} m; the standard "
                f"atmosphere used here ends at {ALTITUDE_RANGE[1]:.0f} m"
            )
        air = replace(air, pressure=float(standard_atmosphere(altitude).pressure))
    if s.power is not None:
        source = replace(source, power=s.power)
    if s.power_factor is not None:
        source = replace(source, power=np.asarray(source.power, float) * s.power_factor)

    fan_changes = [
        n for n in ("fan_speed_ratio", "fan_pressure_factor", "filter") if getattr(s, n) is not None
    ] + (["failed_fans"] if s.failed_fans else [])
    if fan_changes and not is_fan:
        raise InputError(
            f"{where}.{fan_changes[0]}: applies to a fan-driven case (air.flow.fan); this case's "
            f"flow is {type(i.flow).__name__}"
        )
    if s.pressure_drop_factor is not None and is_natural:
        raise InputError(f"{where}.pressure_drop_factor: has no effect in natural convection")
    if s.failed_fans:
        if fan_block is None:
            raise InputError(
                f"{where}.failed_fans: needs the case's air.flow.fan block (fan_block) to take "
                "fans out of the combination"
            )
        single = FanCurve(
            volume_flow=np.asarray(fan_block.volume_flow, float),
            static_pressure=np.asarray(fan_block.pressure, float),
            rating_density=fan_block.rating_density,
        )
        if s.failed_fans >= fan_block.count:
            raise InputError(
                f"{where}.failed_fans: got {s.failed_fans}; must be below air.flow.fan.count "
                f"= {fan_block.count} (at least one fan must run)"
            )
        curve = single.with_failed(
            fan_block.count, s.failed_fans, fan_block.arrangement, s.stopped_fan_resistance
        )
        if fan_block.pressure_factor != 1.0:
            curve = curve.scaled(pressure_factor=fan_block.pressure_factor)
        flow = FanDriven(curve)
    if s.fan_speed_ratio is not None:
        flow = FanDriven(flow.fan.at_speed(s.fan_speed_ratio))

    changes: dict[str, Any] = {}
    if s.fan_pressure_factor is not None:
        changes["fan_pressure_factor"] = options.fan_pressure_factor * s.fan_pressure_factor
    if s.pressure_drop_factor is not None:
        changes["pressure_drop_factor"] = options.pressure_drop_factor * s.pressure_drop_factor
    if s.heat_transfer_factor is not None:
        changes["heat_transfer_factor"] = options.heat_transfer_factor * s.heat_transfer_factor
    fouling = 0.0 if s.fouling_resistance is None else s.fouling_resistance
    if s.deposit_thickness is not None:
        deposit = np.asarray(options.deposit_thickness, float) + s.deposit_thickness
        _check_deposit(i.geometry, float(np.max(deposit)), where)
        changes["deposit_thickness"] = deposit
        if s.deposit_conductivity is not None:
            fouling += s.deposit_thickness / s.deposit_conductivity
    if s.fouling_resistance is not None or s.deposit_conductivity is not None:
        changes["fouling_resistance"] = options.fouling_resistance + fouling
    if s.filter is not None:
        losses = [s.filter.pressure_drop_at]
        if options.extra_pressure_drop is not None:
            losses.insert(0, options.extra_pressure_drop)
        changes["extra_pressure_drop"] = functools.partial(_series_losses, losses=tuple(losses))
    if changes:
        options = replace(options, **changes)
    return replace(i, air=air, source=source, flow=flow, options=options, altitude=altitude)


@dataclass(frozen=True)
class ScenarioRow:
    """One solved scenario (all temperatures absolute [K]; NaN where not applicable).

    Attributes
    ----------
    name, description : str
        Scenario id and text [-].
    inlet_temperature : float
        Inlet air [K].
    pressure : float
        Air pressure [Pa].
    power : float
        Source power [W].
    limit_node : str
        Node the limit applies to [-].
    node_temperature, junction_temperature, source_base_temperature, fin_tip_temperature : float
        Temperatures at the stated power [K].
    outlet_air_temperature : float
        Mixed-out air leaving the fins [K].
    limit_temperature : float
        The case's limit [K].
    margin : float
        ``limit_temperature - node_temperature`` [K].
    required_margin : float
        The case's required margin [K].
    status : str
        ``pass`` when ``margin >= required_margin``, else ``fail`` [-].
    allowable_power : float
        Power with the node at the limit less the required margin [W] (0 if none).
    volume_flow, sink_volume_flow : float
        Total and through-fin flow [m³ s⁻¹].
    bypass_fraction : float
        Share of the flow round the fins [-].
    pressure_drop : float
        Static pressure drop across the sink [Pa].
    heat_transfer_coefficient : float
        Air-side h after factors and fouling [W m⁻² K⁻¹].
    sink_resistance : float
        Mean base to inlet air [K W⁻¹].
    is_governing : bool
        The least-margin scenario [-].
    warnings : tuple of str
        Validity messages of this solve.
    inputs : SinkInputs
        The inputs solved (for reproduction).
    results : dict
        Every result of this condition in the units of :data:`finkit.model.RESULT_UNITS`
        (°C for temperatures), from :func:`finkit.model.solve_condition`.
    solution, allowable : SinkSolution
        States at the stated power and at the allowable power (None if there is none).
    power_at_limit : float
        Power with the node exactly at the limit [W].
    altitude : float
        Site altitude of this condition [m].
    changes : tuple of str
        What this condition changes from nominal, one readable item each [-].
    combines : tuple of str
        Scenarios merged into this one [-].
    requirement_id : str or None
        Identifier of the requirement this condition checks [-].
    sources : tuple of dict
        With several sources, each one's temperatures against its own limit, the governing
        source first (:func:`finkit.model.design.source_rows`; °C, K, W, m); empty otherwise.
    """

    name: str
    description: str
    inlet_temperature: float
    pressure: float
    power: float
    limit_node: str
    node_temperature: float
    junction_temperature: float
    source_base_temperature: float
    fin_tip_temperature: float
    outlet_air_temperature: float
    limit_temperature: float
    margin: float
    required_margin: float
    status: str
    allowable_power: float
    volume_flow: float
    sink_volume_flow: float
    bypass_fraction: float
    pressure_drop: float
    heat_transfer_coefficient: float
    sink_resistance: float
    is_governing: bool
    warnings: tuple[str, ...]
    inputs: SinkInputs = field(repr=False)
    results: dict[str, float | None] = field(default_factory=dict, repr=False)
    solution: SinkSolution | None = field(default=None, repr=False)
    allowable: SinkSolution | None = field(default=None, repr=False)
    power_at_limit: float = float("nan")
    altitude: float = 0.0
    changes: tuple[str, ...] = ()
    combines: tuple[str, ...] = ()
    requirement_id: str | None = None
    sources: tuple[dict, ...] = field(default=(), repr=False)

    @property
    def governing_source(self) -> str | None:
        """Name of the source with the least surplus (None with one centred source) [-]."""
        return self.sources[0]["name"] if self.sources else None

    def to_json_dict(self) -> dict:
        """One entry of ``results.json``'s ``conditions`` list (°C, K, W, SI flows)."""
        from finkit.model.results import RESULT_UNITS, source_json

        extra = {}
        if self.sources:
            extra = {
                "governing_source": self.governing_source,
                "sources": [source_json(row) for row in self.sources],
            }
        return {
            "name": self.name,
            "description": self.description,
            "status": self.status,
            "is_governing": self.is_governing,
            "requirement_id": self.requirement_id,
            "changes": list(self.changes),
            "combines": list(self.combines),
            "altitude": {"value": self.altitude, "unit": "m"},
            "results": {
                k: {"value": None if v is None else float(v), "unit": RESULT_UNITS.get(k, "")}
                for k, v in self.results.items()
            },
            **extra,
            "warnings": list(self.warnings),
        }


@dataclass(frozen=True)
class ScenarioTable:
    """Every scenario of a case, nominal first, with the governing one marked.

    Attributes
    ----------
    rows : tuple of ScenarioRow
        Nominal first, then the scenarios in the order given.
    governing : str
        Name of the least-margin row (the first one on a tie).
    """

    rows: tuple[ScenarioRow, ...]
    governing: str
    notices: tuple[str, ...] = ()

    @property
    def governing_row(self) -> ScenarioRow:
        """The least-margin row."""
        return next(r for r in self.rows if r.is_governing)

    @property
    def least_allowable_power_row(self) -> ScenarioRow:
        """The row with the least allowable power (the first one on a tie)."""
        return self.rows[int(np.argmin([r.allowable_power for r in self.rows]))]

    @property
    def reason(self) -> str:
        """Why the governing condition governs, in one sentence."""
        gov = self.governing_row
        if len(self.rows) == 1:
            return "the only operating condition of the case (no scenarios given)"
        others = sorted(r.margin for r in self.rows if r is not gov)
        return (
            f"least margin of the {len(self.rows)} operating conditions "
            f"({gov.margin:.3g} K; next {others[0]:.3g} K)"
        )

    def governing_summary(self) -> dict:
        """The ``governing`` block of ``results.json``."""
        gov, least = self.governing_row, self.least_allowable_power_row
        return {
            "condition": gov.name,
            "description": gov.description,
            "requirement_id": gov.requirement_id,
            "reason": self.reason,
            "status": gov.status,
            "temperature_margin": {"value": gov.margin, "unit": "K"},
            "required_margin": {"value": gov.required_margin, "unit": "K"},
            "allowable_power": {"value": gov.allowable_power, "unit": "W"},
            "power": {"value": gov.power, "unit": "W"},
            "least_allowable_power_condition": least.name,
            "least_allowable_power": {"value": least.allowable_power, "unit": "W"},
            "condition_count": len(self.rows),
            "failing_conditions": [r.name for r in self.rows if r.status == "fail"],
        }

    @property
    def status(self) -> str:
        """Headline status: that of the governing row (``pass`` or ``fail``)."""
        return self.governing_row.status

    def row(self, name: str) -> ScenarioRow:
        """The row of a scenario by name.

        Parameters
        ----------
        name : str
            Scenario name (``"nominal"`` for the case as stated). [-]
        """
        for r in self.rows:
            if r.name == name:
                return r
        raise InputError(f"scenarios: no scenario named {name!r}")


def _allowable_power(inputs: SinkInputs, airflow=None, stated=None, known=None) -> float:
    """``allowable(inputs).power``, 0 where the inlet air leaves no room; ``known``: that
    allowable state already solved, ``stated``: ``solve(inputs)`` (where the search starts)."""
    usable = inputs.limit_temperature - inputs.required_margin
    if usable <= float(np.max(inputs.air.inlet_temperature)) + 1e-6:
        return 0.0
    if known is not None:
        return float(known.power)
    return float(allowable(inputs, airflow=airflow, stated=stated).power)


def _row(name, description, inputs: SinkInputs, scenario: Scenario | None = None) -> ScenarioRow:
    from finkit.model.design import solve_condition

    state = solve_condition(inputs)
    sol, r = state.solution, state.results
    node_t = r["limit_node_temperature"] + ZERO_CELSIUS
    with np.errstate(invalid="ignore", divide="ignore"):
        bypass_fraction = float(sol.bypass_volume_flow / sol.volume_flow)
    return ScenarioRow(
        name=name,
        description=description,
        inlet_temperature=float(sol.inlet_air_temperature),
        pressure=float(np.max(inputs.air.pressure)),
        power=float(np.max(sol.power)),
        limit_node=state.limit_node,
        node_temperature=node_t,
        junction_temperature=r["junction_temperature"] + ZERO_CELSIUS,
        source_base_temperature=r["source_base_temperature"] + ZERO_CELSIUS,
        fin_tip_temperature=float(sol.fin_tip_temperature),
        outlet_air_temperature=float(sol.outlet_air_temperature),
        limit_temperature=r["limit_temperature"] + ZERO_CELSIUS,
        margin=r["temperature_margin"],
        required_margin=float(r["required_margin"]),
        status=state.status,
        allowable_power=r["allowable_power"],
        volume_flow=float(sol.volume_flow),
        sink_volume_flow=float(sol.sink_volume_flow),
        bypass_fraction=bypass_fraction,
        pressure_drop=float(sol.pressure_drop),
        heat_transfer_coefficient=float(sol.heat_transfer_coefficient),
        sink_resistance=float(sol.sink_resistance),
        is_governing=False,
        warnings=state.warnings,
        inputs=inputs if state.inputs is None else state.inputs,
        results=r,
        solution=sol,
        allowable=state.allowable,
        power_at_limit=r["power_at_limit"],
        altitude=float(np.max(inputs.altitude)),
        changes=() if scenario is None else scenario_changes(scenario),
        combines=() if scenario is None else scenario.combines,
        requirement_id=None if scenario is None else scenario.requirement_id,
        sources=state.sources,
    )


def run_scenarios(
    inputs: SinkInputs, scenarios, fan_block=None, *, nominal_description="the case as stated"
) -> ScenarioTable:
    """Solve the nominal case and every scenario; mark the governing (least-margin) one.

    Parameters
    ----------
    inputs : SinkInputs
        The nominal case. [-]
    scenarios : sequence of Scenario
        Scenarios to run (names unique, not ``nominal``). [-]
    fan_block : object, optional
        The case's ``air.flow.fan`` block, for failed-fan scenarios. [-]
    nominal_description : str, optional
        Text of the nominal row [-].

    Returns
    -------
    ScenarioTable
        One row per scenario, nominal first; each row re-solved in full (airflow, bypass, air
        heating, temperatures and allowable power). The margin is ``limit - node temperature``;
        the governing row is the one with the least margin, and the headline status is its
        status.
    """
    names = [s.name for s in scenarios]
    repeated = sorted({n for n in names if names.count(n) > 1 or n == "nominal"})
    if repeated:
        raise InputError(
            f"scenarios: names must be unique and not 'nominal' (got {', '.join(repeated)})"
        )
    rows = [_row("nominal", nominal_description, inputs)]
    notices = []
    for s in scenarios:
        notices += milder_than_nominal(inputs, s)
        try:
            rows.append(_row(s.name, s.description, apply_scenario(inputs, s, fan_block), s))
        except FinkitError as exc:
            if hasattr(exc, "errors"):
                raise  # an error made of several lines keeps its own form
            # Same error, told which scenario it belongs to.
            raise type(exc)(f"scenarios[{s.name}]: {exc}") from None
    governing = int(np.argmin([r.margin for r in rows]))
    rows[governing] = replace(rows[governing], is_governing=True)
    return ScenarioTable(rows=tuple(rows), governing=rows[governing].name, notices=tuple(notices))
