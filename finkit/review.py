"""What a reviewer asks: scenarios, touch temperature, calibration, model spread, input flags.

Everything here works on the physics inputs of a case (:class:`finkit.model.SinkInputs`, SI)
and re-solves the full heat-sink model (airflow, bypass, air heating, property feedback,
temperatures) for every variant; no result is scaled by a fixed multiplier.

* :func:`apply_scenario`, :func:`run_scenarios` -- named operating scenarios (hot day, altitude,
  a failed fan, a clogged filter, dust, power corners), each re-solved, with the governing
  (least-margin) scenario marked;
* :func:`touch_temperature_check` -- hottest accessible surface at the user's reference ambient
  against the user's limit (finkit ships no table of limits);
* :func:`calibrate`, :func:`apply_calibration` -- one empirical multiplier (on h or on the sink
  resistance) fitted by least squares to measured points;
* :func:`correlation_spread` -- the headline results with every accepted alternative
  correlation finkit has for the same physics, and their spread;
* :func:`sanity_flags` -- one-line warnings for inputs practitioners commonly get wrong.

The functions return frozen dataclasses; temperatures are absolute [K] throughout.
"""

from __future__ import annotations

import functools
import itertools
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np

from finkit.airflow import FanCurve, power_law_pressure_drop
from finkit.constants import ZERO_CELSIUS
from finkit.correlations import forced, natural
from finkit.errors import FinkitError, InputError
from finkit.geometry import PlateFinSink
from finkit.model import SinkInputs, allowable, solve
from finkit.properties.air import air_properties
from finkit.properties.atmosphere import ALTITUDE_RANGE, standard_atmosphere
from finkit.review_schema import MEASUREMENT_NODES, TOUCH_SURFACES
from finkit.sink import (
    NATURAL_CHANNEL_METHODS,
    PLATE_CHANNEL_CHOICES,
    FanDriven,
    GivenVelocity,
    GivenVolumeFlow,
    NaturalConvection,
    SinkSolution,
)

__all__ = [
    "JUNCTION_TO_CASE_BUDGET_SHARE",
    "JUNCTION_TO_CASE_FLAG",
    "ROOM_AMBIENT_BAND",
    "TIGHT_GAP_FLOOR",
    "TIGHT_GAP_RATIO",
    "Calibration",
    "CorrelationSpread",
    "FilterLoss",
    "Measurement",
    "Scenario",
    "ScenarioRow",
    "ScenarioTable",
    "SpreadRow",
    "TouchResult",
    "apply_calibration",
    "apply_scenario",
    "calibrate",
    "combine_scenarios",
    "correlation_spread",
    "measurements_from_blocks",
    "milder_than_nominal",
    "run_scenarios",
    "sanity_flags",
    "scenario_changes",
    "scenarios_from_blocks",
    "touch_temperature_check",
    "uncalibrated",
]

EMPIRICAL_STATEMENT = (
    "The multiplier is empirical: it absorbs every difference between this model and the test "
    "(correlation scatter, contact and interface resistance, flow bypass, thermocouple placement "
    "and error) and holds only near the tested geometry, flow and power."
)


# --------------------------------------------------------------------------------------
# Scenarios
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class FilterLoss:
    """A filter or grille in series with the sink, ``dp = dp_ref (Q / Q_ref) ** exponent``.

    Attributes
    ----------
    volume_flow : float
        Flow of the rated point [m³ s⁻¹].
    pressure_drop : float
        Pressure drop at the rated point [Pa].
    exponent : float
        Exponent of the power law [-].
    """

    volume_flow: float
    pressure_drop: float
    exponent: float = 2.0

    def pressure_drop_at(self, volume_flow):
        """Pressure drop at a volume flow [Pa] (:func:`finkit.airflow.power_law_pressure_drop`)."""
        return power_law_pressure_drop(
            volume_flow, self.volume_flow, self.pressure_drop, self.exponent
        )


@dataclass(frozen=True)
class Scenario:
    """A named set of operating conditions that replace those of the nominal case (SI).

    ``None`` keeps the nominal value. The factors and resistances compose with the case's own
    model options (factors multiply, resistances and deposit thicknesses add).

    Attributes
    ----------
    name : str
        Short id [-].
    description : str
        One line for the note [-].
    inlet_temperature : float or None
        Local inlet air temperature [K].
    surroundings_temperature : float or None
        Radiation surroundings [K]; None moves them with the inlet air by the same amount.
    altitude : float or None
        Altitude; pressure from the standard atmosphere (ISO 2533) [m].
    power : float or None
        Source power [W].
    inlet_temperature_rise : float or None
        Inlet air above the nominal inlet (relative) [K].
    altitude_increase : float or None
        Altitude above the nominal altitude (relative) [m].
    power_factor : float or None
        Multiplier on the nominal power (relative) [-].
    combines : tuple of str
        Names of the scenarios merged into this one (:func:`combine_scenarios`) [-].
    requirement_id : str or None
        Identifier of the requirement the scenario checks [-].
    fan_speed_ratio : float or None
        Fan speed over rated speed, fan laws ``Q ∝ N``, ``dp ∝ N²`` [-].
    fan_pressure_factor : float or None
        Multiplier on fan pressure [-].
    failed_fans : int
        Stopped fans out of the case's fan count [-].
    stopped_fan_resistance : float or None
        ``R`` of the leak ``dp = R Q²`` through each stopped fan [Pa s² m⁻⁶]; None = sealed.
    filter : FilterLoss or None
        Series filter or grille (fan-driven cases).
    pressure_drop_factor : float or None
        Multiplier on the sink's own pressure drop [-].
    heat_transfer_factor : float or None
        Multiplier on the air-side h [-].
    fouling_resistance : float or None
        Added air-side fouling resistance [m² K W⁻¹].
    deposit_thickness : float or None
        Dust layer on every wetted face, narrowing the passages [m].
    deposit_conductivity : float or None
        Conductivity of the layer; adds ``deposit_thickness / deposit_conductivity`` to the
        fouling resistance [W m⁻¹ K⁻¹].
    """

    name: str
    description: str = ""
    inlet_temperature: float | None = None
    surroundings_temperature: float | None = None
    altitude: float | None = None
    power: float | None = None
    fan_speed_ratio: float | None = None
    fan_pressure_factor: float | None = None
    failed_fans: int = 0
    stopped_fan_resistance: float | None = None
    filter: FilterLoss | None = None
    pressure_drop_factor: float | None = None
    heat_transfer_factor: float | None = None
    fouling_resistance: float | None = None
    deposit_thickness: float | None = None
    deposit_conductivity: float | None = None
    inlet_temperature_rise: float | None = None
    altitude_increase: float | None = None
    power_factor: float | None = None
    combines: tuple[str, ...] = ()
    requirement_id: str | None = None


#: How :func:`combine_scenarios` merges each field of the parts.
_ADDED = ("inlet_temperature_rise", "altitude_increase", "fouling_resistance", "deposit_thickness")
_MULTIPLIED = (
    "power_factor",
    "fan_speed_ratio",
    "fan_pressure_factor",
    "pressure_drop_factor",
    "heat_transfer_factor",
)
_ABSOLUTE = (
    "inlet_temperature",
    "surroundings_temperature",
    "altitude",
    "power",
    "stopped_fan_resistance",
    "filter",
    "deposit_conductivity",
)


def combine_scenarios(name: str, description: str, parts) -> Scenario:
    """One scenario that applies all of ``parts`` together (e.g. hot day + one fan failed).

    Relative rises, fouling resistances and deposit thicknesses add; factors multiply; failed
    fans add up; an absolute value (inlet temperature, altitude, power, filter, ...) may be set
    by one part only, or by several with the same value.

    Raises
    ------
    InputError
        Two parts set the same absolute value differently; one line naming both.
    """
    merged: dict[str, Any] = {}
    owner: dict[str, str] = {}
    for part in parts:
        for n in _ADDED:
            v = getattr(part, n)
            if v is not None:
                merged[n] = merged.get(n, 0.0) + v
        for n in _MULTIPLIED:
            v = getattr(part, n)
            if v is not None:
                merged[n] = merged.get(n, 1.0) * v
        for n in _ABSOLUTE:
            v = getattr(part, n)
            if v is None:
                continue
            if n in merged and merged[n] != v:
                raise InputError(
                    f"scenarios[{name}].combines: '{owner[n]}' and '{part.name}' both set {n} "
                    "to different values; combine scenarios that change different conditions"
                )
            merged[n], owner[n] = v, part.name
        merged["failed_fans"] = merged.get("failed_fans", 0) + part.failed_fans
    names = tuple(p.name for p in parts)
    text = description or "together: " + " + ".join(names)
    return Scenario(name=name, description=text, combines=names, **merged)


def scenarios_from_blocks(blocks) -> tuple[Scenario, ...]:
    """:class:`Scenario` objects from validated ``scenarios:`` blocks (``ScenarioBlock``).

    A block with ``combines`` becomes one merged scenario (:func:`combine_scenarios`) of the
    scenarios it names and its own changes.
    """
    own = {}
    for b in blocks:
        leak = b.stopped_fan_leak
        own[b.name] = Scenario(
            name=b.name,
            description=b.description or "",
            requirement_id=getattr(b, "requirement_id", None),
            inlet_temperature=b.inlet_temperature,
            inlet_temperature_rise=b.inlet_temperature_rise,
            surroundings_temperature=b.surroundings_temperature,
            altitude=b.altitude,
            altitude_increase=b.altitude_increase,
            power=b.power,
            power_factor=b.power_factor,
            fan_speed_ratio=b.fan_speed_ratio,
            fan_pressure_factor=b.fan_pressure_factor,
            failed_fans=b.failed_fans or 0,
            stopped_fan_resistance=(
                None if leak is None else leak.pressure_drop / leak.volume_flow**2
            ),
            filter=(
                None
                if b.filter is None
                else FilterLoss(b.filter.volume_flow, b.filter.pressure_drop, b.filter.exponent)
            ),
            pressure_drop_factor=b.pressure_drop_factor,
            heat_transfer_factor=b.heat_transfer_factor,
            fouling_resistance=b.fouling_resistance,
            deposit_thickness=b.deposit_thickness,
            deposit_conductivity=b.deposit_conductivity,
        )
    out = []
    for b in blocks:
        combines = tuple(getattr(b, "combines", ()) or ())
        if not combines:
            out.append(own[b.name])
            continue
        parts = [own[n] for n in combines]
        if any(
            getattr(own[b.name], n) not in (None, 0, ())
            for n in (*_ADDED, *_MULTIPLIED, *_ABSOLUTE, "failed_fans")
        ):
            parts.append(own[b.name])
        combined = combine_scenarios(b.name, b.description or "", parts)
        out.append(replace(combined, requirement_id=getattr(b, "requirement_id", None)))
    return tuple(out)


def milder_than_nominal(inputs: SinkInputs, scenario: Scenario) -> list[str]:
    """Warnings for a scenario that is no harsher than the nominal case on some condition.

    A scenario written with absolute values does not follow a variant: a variant installed at
    3000 m makes a "2500 m" scenario milder than its own nominal. Each condition the scenario
    sets to a cooler inlet, a lower altitude, less power, more fan or less loss than nominal is
    named (equal values too: that scenario checks nothing beyond the nominal).
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
        The nominal case (:func:`finkit.model.sink_inputs`).
    scenario : Scenario
        Conditions to change.
    fan_block : object, optional
        The case's ``air.flow.fan`` block (volume_flow, pressure, count, arrangement,
        rating_density, pressure_factor); required for ``failed_fans``, since a failed fan is
        taken out of the combination of single-fan curves.

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
    (:meth:`finkit.airflow.FanCurve.with_failed`, with the leak through each stopped fan when
    its resistance is given), then the case's own pressure factor, then the speed ratio. The
    operating point is re-solved against the sink, bypass and series losses at the scenario's
    air density. A filter adds ``dp(Q)`` in series with the sink and its bypass. A deposit layer
    narrows the passages (``ModelOptions.deposit_thickness``) and, with its conductivity, adds
    its conduction resistance to the fouling resistance.
    """
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

    def to_json_dict(self) -> dict:
        """One entry of ``results.json``'s ``conditions`` list (°C, K, W, SI flows)."""
        from finkit.model import RESULT_UNITS

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
        """The row of a scenario by name."""
        for r in self.rows:
            if r.name == name:
                return r
        raise InputError(f"scenarios: no scenario named {name!r}")


def _allowable_power(inputs: SinkInputs) -> float:
    usable = inputs.limit_temperature - inputs.required_margin
    if usable <= float(np.max(inputs.air.inlet_temperature)) + 1e-6:
        return 0.0
    return float(allowable(inputs).power)


def scenario_changes(scenario: Scenario) -> tuple[str, ...]:
    """What a scenario changes from nominal, one readable item each (SI shown in °C, m, W)."""
    s, out = scenario, []
    if s.inlet_temperature is not None:
        out.append(f"inlet air {s.inlet_temperature - ZERO_CELSIUS:.1f} degC")
    if s.inlet_temperature_rise is not None:
        out.append(f"inlet air +{s.inlet_temperature_rise:.3g} K")
    if s.surroundings_temperature is not None:
        out.append(f"surroundings {s.surroundings_temperature - ZERO_CELSIUS:.1f} degC")
    if s.altitude is not None:
        out.append(f"altitude {s.altitude:.0f} m")
    if s.altitude_increase is not None:
        out.append(f"altitude +{s.altitude_increase:.0f} m")
    if s.power is not None:
        out.append(f"power {s.power:.3g} W")
    if s.power_factor is not None:
        out.append(f"power x{s.power_factor:.3g}")
    if s.failed_fans:
        out.append(f"{s.failed_fans} fan{'s' if s.failed_fans > 1 else ''} stopped")
    for name, label in (
        ("fan_speed_ratio", "fan speed"),
        ("fan_pressure_factor", "fan pressure"),
        ("pressure_drop_factor", "sink pressure drop"),
        ("heat_transfer_factor", "h"),
    ):
        value = getattr(s, name)
        if value is not None:
            out.append(f"{label} x{value:.3g}")
    if s.filter is not None:
        out.append(
            f"filter {s.filter.pressure_drop:.3g} Pa at {s.filter.volume_flow:.3g} m\u00b3/s"
        )
    if s.deposit_thickness is not None:
        out.append(f"dust layer {s.deposit_thickness * 1e3:.3g} mm")
    if s.fouling_resistance is not None:
        out.append(f"fouling {s.fouling_resistance:.3g} K\u00b7m\u00b2/W")
    return tuple(out)


def _row(name, description, inputs: SinkInputs, scenario: Scenario | None = None) -> ScenarioRow:
    from finkit.model import solve_condition

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
        limit_node=inputs.limit_node,
        node_temperature=node_t,
        junction_temperature=float(sol.junction_temperature),
        source_base_temperature=float(sol.source_base_temperature),
        fin_tip_temperature=float(sol.fin_tip_temperature),
        outlet_air_temperature=float(sol.outlet_air_temperature),
        limit_temperature=float(inputs.limit_temperature),
        margin=r["temperature_margin"],
        required_margin=float(inputs.required_margin),
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
        inputs=inputs,
        results=r,
        solution=sol,
        allowable=state.allowable,
        power_at_limit=r["power_at_limit"],
        altitude=float(np.max(inputs.altitude)),
        changes=() if scenario is None else scenario_changes(scenario),
        combines=() if scenario is None else scenario.combines,
        requirement_id=None if scenario is None else scenario.requirement_id,
    )


def run_scenarios(
    inputs: SinkInputs, scenarios, fan_block=None, *, nominal_description="the case as stated"
) -> ScenarioTable:
    """Solve the nominal case and every scenario; mark the governing (least-margin) one.

    Parameters
    ----------
    inputs : SinkInputs
        The nominal case.
    scenarios : sequence of Scenario
        Scenarios to run (names unique, not ``nominal``).
    fan_block : object, optional
        The case's ``air.flow.fan`` block, for failed-fan scenarios.
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


# --------------------------------------------------------------------------------------
# Touch temperature
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class TouchResult:
    """Accessible-surface temperature check at the user's reference ambient.

    Attributes
    ----------
    surface_temperatures : dict
        Accessible surface -> temperature at the reference [K]: ``base`` is the hottest base
        temperature (under the source), ``fin_tips`` the fin tip.
    hottest_surface : str
        The hottest accessible surface [-].
    hottest_temperature : float
        Its temperature [K].
    limit_temperature : float
        The user's limit [K].
    reference_ambient : float
        Room ambient of the check [K].
    inlet_temperature : float
        Air at the sink at the reference (ambient plus preheat) [K].
    power : float
        Power of the check [W].
    margin : float
        ``limit_temperature - hottest_temperature`` [K].
    status : str
        ``pass`` or ``fail`` [-].
    basis : str
        The user's statement of where the limit comes from [-].
    statement : str
        One paragraph for the note [-].
    """

    surface_temperatures: dict[str, float]
    hottest_surface: str
    hottest_temperature: float
    limit_temperature: float
    reference_ambient: float
    inlet_temperature: float
    power: float
    margin: float
    status: str
    basis: str
    statement: str


def touch_temperature_check(
    inputs: SinkInputs,
    limit_temperature: float,
    reference_ambient: float,
    basis_text: str,
    *,
    surfaces=TOUCH_SURFACES,
    inlet_preheat: float = 0.0,
    power: float | None = None,
) -> TouchResult:
    """Hottest accessible surface of the sink at a reference ambient, against a stated limit.

    Parameters
    ----------
    inputs : SinkInputs
        The case.
    limit_temperature : float
        Limit from the user's own standard for that surface material and contact time [K].
        finkit ships no table of limits. (Example only -- check against your standard: some
        product-safety standards judge accessible surfaces at a 25 degC reference with limits
        of the order of 70-80 degC for brief contact with plastic, lower for metal and longer
        contact.)
    reference_ambient : float
        Room ambient at which the standard judges the surface, e.g. 25 degC [K].
    basis_text : str
        Standard, edition, clause or table row, surface material and contact time [-].
    surfaces : sequence of {"base", "fin_tips"}
        Surfaces a person can touch [-].
    inlet_preheat : float, optional
        Air temperature at the sink above the reference ambient (internal preheat) [K].
    power : float, optional
        Power of the check; default the case power [W].

    Returns
    -------
    TouchResult
        Surface temperatures, the hottest one, margin and pass/fail.

    Notes
    -----
    The sink is re-solved with the inlet air (and the radiation surroundings) at
    ``reference_ambient + inlet_preheat``. This follows the practice of judging touch
    temperatures at a stated reference ambient rather than at the maximum rated ambient (the
    position discussed for IEC 62368-1; legacy IEC 60950-1 practice rescaled instead): the user
    states the reference and the limit, finkit does not choose them. Because natural convection
    and air properties depend on the absolute temperatures, the model is re-solved rather than
    shifted by the ambient difference.

    The base temperature reported is the hottest one, under the source (conservative for the
    parts of the base a hand can reach); the fin tip temperature is that of the 1-D fin
    referred to the inlet air (conservative in forced flow).
    """
    unknown = [s for s in surfaces if s not in TOUCH_SURFACES]
    if unknown or not surfaces:
        raise InputError(
            f"touch.surfaces: got {list(surfaces)!r}; allowed: one or more of "
            f"{', '.join(TOUCH_SURFACES)}"
        )
    if not limit_temperature > reference_ambient:
        raise InputError(
            "touch.limit_temperature: must be above touch.reference_ambient "
            f"(got {limit_temperature - ZERO_CELSIUS:.1f} degC)"
        )
    if not str(basis_text).strip():
        raise InputError("touch.basis: state the standard, table row, material and contact time")
    inlet = reference_ambient + inlet_preheat
    air = replace(inputs.air, inlet_temperature=inlet, surroundings_temperature=inlet)
    source = inputs.source if power is None else replace(inputs.source, power=power)
    sol = solve(inputs, air=air, source=source)
    temps = {
        "base": float(sol.source_base_centre_temperature),  # the hottest point of the base
        "fin_tips": float(sol.fin_tip_temperature),
    }
    temps = {k: v for k, v in temps.items() if k in surfaces}
    hottest = max(temps, key=temps.get)
    margin = limit_temperature - temps[hottest]
    status = "pass" if margin >= 0 else "fail"
    statement = (
        f"Hottest accessible surface ({hottest.replace('_', ' ')}) "
        f"{temps[hottest] - ZERO_CELSIUS:.1f}\u00a0°C at a "
        f"{reference_ambient - ZERO_CELSIUS:.1f}\u00a0°C reference ambient (air at the sink "
        f"{inlet - ZERO_CELSIUS:.1f}\u00a0°C, {float(sol.power):.3g}\u00a0W), against the user's "
        f"limit {limit_temperature - ZERO_CELSIUS:.1f}\u00a0°C ({basis_text}): {status}. "
        "The limit and its basis are the user's; finkit holds no table of touch limits."
    )
    return TouchResult(
        surface_temperatures=temps,
        hottest_surface=hottest,
        hottest_temperature=temps[hottest],
        limit_temperature=float(limit_temperature),
        reference_ambient=float(reference_ambient),
        inlet_temperature=float(inlet),
        power=float(sol.power),
        margin=float(margin),
        status=status,
        basis=str(basis_text),
        statement=statement,
    )


# --------------------------------------------------------------------------------------
# Calibration to test data
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Measurement:
    """One measured steady-state point (SI).

    Attributes
    ----------
    name : str
        Point id [-].
    node : {"junction", "case", "base", "fin_tip"}
        Where the temperature was measured [-].
    measured_temperature : float
        Measured temperature [K].
    power : float
        Power during the test [W].
    inlet_temperature : float
        Air entering the sink during the test [K].
    altitude : float or None
        Test altitude [m]; None = the case's pressure.
    volume_flow : float or None
        Measured total flow to the sink [m³ s⁻¹]; None = the case's flow.
    approach_velocity : float or None
        Measured approach velocity [m s⁻¹].
    fan_speed_ratio : float or None
        Fan speed over rated speed during the test [-].
    """

    name: str
    node: str
    measured_temperature: float
    power: float
    inlet_temperature: float
    altitude: float | None = None
    volume_flow: float | None = None
    approach_velocity: float | None = None
    fan_speed_ratio: float | None = None


def measurements_from_blocks(blocks) -> tuple[Measurement, ...]:
    """:class:`Measurement` objects from validated ``measurements:`` blocks."""
    return tuple(
        Measurement(
            name=b.name,
            node=b.node,
            measured_temperature=b.measured_temperature,
            power=b.power,
            inlet_temperature=b.inlet_temperature,
            altitude=b.altitude,
            volume_flow=b.volume_flow,
            approach_velocity=b.approach_velocity,
            fan_speed_ratio=b.fan_speed_ratio,
        )
        for b in blocks
    )


@dataclass(frozen=True)
class Calibration:
    """An empirical multiplier fitted to measured points by least squares.

    Attributes
    ----------
    target : str
        ``heat_transfer`` (multiplier on the air-side h) or ``sink_resistance`` [-].
    multiplier : float
        Fitted multiplier, relative to the case as stated [-].
    standard_error : float
        Its standard error from the residuals and the Jacobian [-] (NaN with one point).
    names, nodes : tuple of str
        Measured points [-].
    measured : numpy.ndarray
        Measured temperatures [K].
    inlet_temperatures : numpy.ndarray
        Inlet air of each point [K].
    predicted_uncalibrated : numpy.ndarray
        Model at multiplier 1 [K].
    predicted : numpy.ndarray
        Model at the fitted multiplier [K].
    residuals : numpy.ndarray
        ``predicted - measured`` [K].
    relative_residuals : numpy.ndarray
        Residual over the measured rise above the inlet air [-].
    rms_residual : float
        Root mean square residual [K].
    degrees_of_freedom : int
        Points less one [-].
    statement : str
        What the multiplier is and is not, for the note [-].
    is_applied : bool
        True when the case's results use the multiplier (``calibration.apply``) [-].
    """

    target: str
    multiplier: float
    standard_error: float
    names: tuple[str, ...]
    nodes: tuple[str, ...]
    measured: np.ndarray
    inlet_temperatures: np.ndarray
    predicted_uncalibrated: np.ndarray
    predicted: np.ndarray
    residuals: np.ndarray
    relative_residuals: np.ndarray
    rms_residual: float
    degrees_of_freedom: int
    statement: str
    is_applied: bool = False
    measurement_uncertainty: float = 1.0

    @property
    def mean_underprediction(self) -> float:
        """Mean of measured less predicted (uncalibrated) temperature [K]; > 0 reads low."""
        return float(np.mean(self.measured - self.predicted_uncalibrated))

    @property
    def reads_low(self) -> bool:
        """The uncalibrated model reads lower than the test by more than the measurement noise."""
        return self.mean_underprediction > self.measurement_uncertainty

    @property
    def warning(self) -> str:
        """One line for the warnings list when the model reads low (non-conservative)."""
        low = self.measured - self.predicted_uncalibrated
        return (
            f"calibration: the model reads {np.min(low):.2g} to {np.max(low):.2g} K lower than "
            f"the {len(low)} measured point(s) (mean {self.mean_underprediction:.2g} K, above the "
            f"{self.measurement_uncertainty:.2g} K measurement uncertainty): non-conservative; "
            f"fitted multiplier {self.multiplier:.3g} on the "
            f"{'air-side h' if self.target == 'heat_transfer' else 'sink resistance'}"
            + ("" if self.is_applied else " (not applied; the headline shows both)")
        )


CALIBRATION_TARGETS = ("heat_transfer", "sink_resistance")


def _with_multiplier(inputs: SinkInputs, target: str, multiplier) -> SinkInputs:
    o = inputs.options
    if target == "heat_transfer":
        options = replace(o, heat_transfer_factor=o.heat_transfer_factor * multiplier)
    else:
        options = replace(o, sink_resistance_factor=o.sink_resistance_factor * multiplier)
    return replace(inputs, options=options)


def _node_values(sol: SinkSolution, nodes) -> np.ndarray:
    table = {
        "junction": sol.junction_temperature,
        "case": sol.case_temperature,
        "base": sol.source_base_centre_temperature,  # as the base limit node: the centre
        "fin_tip": sol.fin_tip_temperature,
    }
    return np.array(
        [np.broadcast_to(table[n], np.shape(sol.power))[k] for k, n in enumerate(nodes)]
    )


def _measurement_groups(inputs: SinkInputs, measurements):
    """Batches of measurements solved in one vectorised call: (indices, inputs, nodes)."""

    def key(m: Measurement):
        if m.volume_flow is not None:
            return ("volume_flow", None)
        if m.approach_velocity is not None:
            return ("approach_velocity", None)
        return ("case", m.fan_speed_ratio)

    groups: dict[tuple, list[int]] = {}
    for k, m in enumerate(measurements):
        groups.setdefault(key(m), []).append(k)
    out = []
    for (kind, speed), idx in groups.items():
        ms = [measurements[k] for k in idx]
        inlet = np.array([m.inlet_temperature for m in ms])
        pressure = np.array(
            [
                float(inputs.air.pressure)
                if m.altitude is None
                else float(standard_atmosphere(m.altitude).pressure)
                for m in ms
            ]
        )
        air = replace(_shifted_air(inputs.air, inlet), pressure=pressure)
        source = replace(inputs.source, power=np.array([m.power for m in ms]))
        flow = inputs.flow
        if kind == "volume_flow":
            flow = GivenVolumeFlow(np.array([m.volume_flow for m in ms]))
        elif kind == "approach_velocity":
            flow = GivenVelocity(np.array([m.approach_velocity for m in ms]))
        elif speed is not None:
            if not isinstance(flow, FanDriven):
                raise InputError(
                    f"measurements[{ms[0].name}].fan_speed_ratio: applies to a fan-driven case"
                )
            flow = FanDriven(flow.fan.at_speed(speed))
        if kind != "case" and isinstance(inputs.flow, NaturalConvection):
            raise InputError(f"measurements[{ms[0].name}].{kind}: natural convection has no flow")
        out.append((idx, replace(inputs, air=air, source=source, flow=flow), [m.node for m in ms]))
    return out


def _predict(groups, target, multiplier, count) -> np.ndarray:
    out = np.empty(count)
    for idx, group_inputs, nodes in groups:
        sol = solve(_with_multiplier(group_inputs, target, multiplier))
        out[idx] = _node_values(sol, nodes)
    return out


def _one_parameter_fit(residual, start: float, bounds: tuple[float, float], tol: float = 1e-10):
    """Least squares in one bounded parameter: Gauss-Newton with step halving.

    ``residual([c]) -> array`` of the n residuals. Each step takes the Gauss-Newton step
    ``-Σ J r / Σ J²`` with ``J`` from central differences (step ``1e-6 (1 + |c|)``), clipped to
    the bounds and halved until the sum of squares falls (Bates, D.M., Watts, D.G., Nonlinear
    Regression Analysis and Its Applications, Wiley, 1988, section 2.2.1); it stops when a step
    is below ``tol (1 + |c|)``. The fit is the same as scipy's ``least_squares`` (trust-region
    reflective) to about 1e-9 (tested); written here because importing ``scipy.optimize``
    costs about 0.3 s of each ``finkit check`` of a case with measurements.

    Returns
    -------
    tuple
        ``(c, residuals at c, J at c)`` with ``J`` an ``(n, 1)`` array. [-], [K], [K]
    """
    low, high = bounds
    c = float(np.clip(start, low, high))

    def jacobian(c: float) -> np.ndarray:
        step = 1e-6 * (1.0 + abs(c))
        a, b = max(c - step, low), min(c + step, high)
        return (residual([b]) - residual([a])) / (b - a)

    r = residual([c])
    cost = float(r @ r)
    for _ in range(100):
        jac = jacobian(c)
        jtj = float(jac @ jac)
        if not jtj > 0:
            break
        trial = float(np.clip(c - float(jac @ r) / jtj, low, high))
        while True:
            r_trial = residual([trial])
            cost_trial = float(r_trial @ r_trial)
            if cost_trial <= cost or abs(trial - c) <= tol * (1.0 + abs(c)):
                break
            trial = c + 0.5 * (trial - c)
        moved = abs(trial - c)
        if cost_trial <= cost:
            c, r, cost = trial, r_trial, cost_trial
        if moved <= tol * (1.0 + abs(c)):
            break
    return c, r, jacobian(c).reshape(-1, 1)


def calibrate(
    inputs: SinkInputs,
    measurements,
    target: str = "heat_transfer",
    measurement_uncertainty: float = 1.0,
) -> Calibration:
    """Fit one empirical multiplier (on h or on the sink resistance) to measured temperatures.

    Parameters
    ----------
    inputs : SinkInputs
        The case (its model options are the starting point; the multiplier multiplies them).
    measurements : sequence of Measurement
        Measured points; each is predicted with its own inlet air, power, pressure and flow.
    target : {"heat_transfer", "sink_resistance"}
        What the multiplier scales [-]. ``heat_transfer``: the air-side h
        (``ModelOptions.heat_transfer_factor``), so fin efficiency, air heating and the
        spreading resistance respond as they would to a better or worse correlation.
        ``sink_resistance``: the whole fins-and-base-to-air resistance, convection and
        radiation together (``ModelOptions.sink_resistance_factor``); use it when the test
        cannot separate the air side from the rest of the sink.

    measurement_uncertainty : float, optional
        Uncertainty of one measured temperature [K]; the model "reads low" when it
        under-predicts by more than this on average.

    Returns
    -------
    Calibration
        Multiplier, its standard error, residuals and predictions.

    Notes
    -----
    Ordinary least squares on the temperature residuals ``r_i(c) = T_model,i(c) - T_meas,i``,
    solved by :func:`_one_parameter_fit` (bounded to 0.05 ≤ c ≤ 20). The standard
    error is the usual one of a one-parameter non-linear fit,
    ``se = sqrt(s² / (JᵀJ))`` with ``s² = Σ r_i² / (n - 1)`` and ``J = dT_model/dc`` at the fit
    (e.g. Bates & Watts, Nonlinear Regression Analysis and Its Applications, Wiley, 1988,
    section 2.1). It assumes independent, equal-variance errors in the measured temperatures.

    The multiplier is empirical: it absorbs every difference between the model and the test
    (correlation scatter, contact resistance, bypass, thermocouple placement) and holds only
    near the tested conditions. Prediction error is also given relative to the measured rise
    above the inlet air, which is how it should be judged.
    """
    if target not in CALIBRATION_TARGETS:
        raise InputError(
            f"calibration.target: got {target!r}; allowed: {', '.join(CALIBRATION_TARGETS)}"
        )
    measurements = tuple(measurements)
    if not measurements:
        raise InputError("measurements: at least one measured point is needed (got none)")
    for m in measurements:
        if m.node not in MEASUREMENT_NODES:
            raise InputError(
                f"measurements[{m.name}].node: got {m.node!r}; allowed: "
                f"{', '.join(MEASUREMENT_NODES)}"
            )
    n = len(measurements)
    measured = np.array([m.measured_temperature for m in measurements])
    inlet = np.array([m.inlet_temperature for m in measurements])
    groups = _measurement_groups(inputs, measurements)

    def residual(x):
        return _predict(groups, target, x[0], n) - measured

    c, r, jac = _one_parameter_fit(residual, 1.0, (0.05, 20.0))
    dof = n - 1
    jtj = float(np.sum(jac**2))
    if dof > 0 and jtj > 0:
        se = float(np.sqrt(np.sum(r**2) / dof / jtj))
    else:
        se = float("nan")
    predicted = measured + r
    what = "air-side heat transfer coefficient" if target == "heat_transfer" else "sink resistance"
    statement = (
        f"Calibration: a multiplier of {c:.3f} (standard error {se:.3f}) on the {what}, fitted by "
        f"least squares to {n} measured point(s); rms residual {np.sqrt(np.mean(r**2)):.2f} K. "
        + EMPIRICAL_STATEMENT
    )
    return Calibration(
        target=target,
        multiplier=c,
        standard_error=se,
        names=tuple(m.name for m in measurements),
        nodes=tuple(m.node for m in measurements),
        measured=measured,
        inlet_temperatures=inlet,
        predicted_uncalibrated=_predict(groups, target, 1.0, n),
        predicted=predicted,
        residuals=r,
        relative_residuals=r / (measured - inlet),
        rms_residual=float(np.sqrt(np.mean(r**2))),
        degrees_of_freedom=dof,
        statement=statement,
        measurement_uncertainty=float(measurement_uncertainty),
    )


def apply_calibration(inputs: SinkInputs, calibration: Calibration) -> SinkInputs:
    """The inputs with a fitted multiplier applied (empirical; say so wherever it is used).

    ``heat_transfer`` multiplies ``ModelOptions.heat_transfer_factor``; ``sink_resistance``
    multiplies ``ModelOptions.sink_resistance_factor`` (convection and radiation conductance of
    the sink divided by the multiplier, spreading and base conduction recomputed from it).
    """
    return _with_multiplier(inputs, calibration.target, calibration.multiplier)


def uncalibrated(inputs: SinkInputs, calibration: Calibration) -> SinkInputs:
    """The inputs with an applied multiplier taken out again (inverse of apply_calibration)."""
    return _with_multiplier(inputs, calibration.target, 1.0 / calibration.multiplier)


# --------------------------------------------------------------------------------------
# Correlation spread
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SpreadRow:
    """Headline results with one combination of correlations.

    Attributes
    ----------
    label : str
        The combination, e.g. ``plate_channel_method=vdi, loss_model=kays_london`` [-].
    methods : dict
        Option name -> method key [-].
    is_chosen : bool
        The case's own combination [-].
    junction_temperature, node_temperature : float
        At the stated power [K].
    sink_resistance : float
        [K W⁻¹].
    pressure_drop : float
        [Pa] (NaN in natural convection).
    volume_flow : float
        [m³ s⁻¹] (NaN in natural convection).
    allowable_power : float
        At the limit less the required margin [W].
    """

    label: str
    methods: dict[str, str]
    is_chosen: bool
    junction_temperature: float
    node_temperature: float
    sink_resistance: float
    pressure_drop: float
    volume_flow: float
    allowable_power: float


SPREAD_QUANTITIES = (
    "junction_temperature",
    "node_temperature",
    "sink_resistance",
    "pressure_drop",
    "volume_flow",
    "allowable_power",
)


@dataclass(frozen=True)
class CorrelationSpread:
    """Model-form spread: the same case with each accepted alternative correlation.

    Attributes
    ----------
    rows : tuple of SpreadRow
        Every combination of the alternatives that apply (the chosen one first).
    axes : dict
        Option name -> the methods tried [-]; empty when finkit has only one accepted
        correlation for this case's physics.
    spread : dict
        Quantity -> max - min over the rows (same unit as the quantity).
    relative_spread : dict
        Quantity -> spread over the chosen row's value; for temperatures, over the chosen
        row's rise above the inlet air (prediction error is judged against the rise) [-].
    statement : str
        One line for the note [-].
    """

    rows: tuple[SpreadRow, ...]
    axes: dict[str, tuple[str, ...]]
    spread: dict[str, float]
    relative_spread: dict[str, float]
    statement: str

    @property
    def chosen(self) -> SpreadRow:
        """The case's own combination."""
        return next(r for r in self.rows if r.is_chosen)


def _spread_axes(inputs: SinkInputs) -> dict[str, tuple[str, ...]]:
    if isinstance(inputs.flow, NaturalConvection):
        candidates = {"natural_channel_method": NATURAL_CHANNEL_METHODS}
    elif isinstance(inputs.geometry, PlateFinSink):
        candidates = {
            "plate_channel_method": PLATE_CHANNEL_CHOICES,
            "loss_model": forced.LOSS_MODELS,
        }
    else:
        # Pin banks: two heat-transfer correlations (Zukauskas, Gnielinski) and their lower
        # envelope; one pressure-drop method (forced.PIN_BANK_PRESSURE_DROP_METHODS).
        candidates = {"pin_bank_method": forced.PIN_BANK_METHODS}
    return {k: tuple(v) for k, v in candidates.items() if len(v) > 1}


def correlation_spread(inputs: SinkInputs) -> CorrelationSpread:
    """Headline results with each accepted alternative correlation, and their spread.

    Parameters
    ----------
    inputs : SinkInputs
        The case; its own model choices give the chosen row.

    Returns
    -------
    CorrelationSpread
        One row per combination of the alternatives that apply to the case (plate-fin forced
        flow: ``sink.PLATE_CHANNEL_CHOICES`` x ``forced.LOSS_MODELS``; natural convection:
        ``sink.NATURAL_CHANNEL_METHODS``; pin fins: ``forced.PIN_BANK_METHODS``), each a full
        re-solve
        (with a fan, the operating point moves with the loss model), and the spread
        ``max - min`` of each headline quantity, absolute and relative to the chosen model.

    Notes
    -----
    The spread shows model-form uncertainty between accepted correlations only; each
    correlation also has its own scatter against its data (often ±15 % or more), which the
    spread does not include.
    """
    axes = _spread_axes(inputs)
    chosen = {name: getattr(inputs.options, name) for name in axes}
    combos = [dict(zip(axes, values, strict=True)) for values in itertools.product(*axes.values())]
    combos.sort(key=lambda c: c != chosen)
    if not combos:
        combos = [{}]
    rows = []
    for combo in combos:
        variant = replace(inputs, options=replace(inputs.options, **combo))
        sol = solve(variant)
        rows.append(
            SpreadRow(
                label=", ".join(f"{k}={v}" for k, v in combo.items()) or "as chosen",
                methods=dict(combo),
                is_chosen=combo == chosen,
                junction_temperature=float(sol.junction_temperature),
                node_temperature=float(sol.node_temperature(inputs.limit_node)),
                sink_resistance=float(sol.sink_resistance),
                pressure_drop=float(sol.pressure_drop),
                volume_flow=float(sol.volume_flow),
                allowable_power=_allowable_power(variant),
            )
        )
    chosen_row = rows[0]
    spread, relative = {}, {}
    for q in SPREAD_QUANTITIES:
        values = np.array([getattr(r, q) for r in rows])
        if np.all(np.isnan(values)):
            spread[q] = relative[q] = float("nan")
            continue
        spread[q] = float(np.nanmax(values) - np.nanmin(values))
        reference = getattr(chosen_row, q)
        if q.endswith("temperature"):
            # relative to the rise above the inlet air, not to the absolute temperature
            reference = reference - float(np.max(inputs.air.inlet_temperature))
        relative[q] = spread[q] / reference if reference else float("nan")
    if axes:
        tried = "; ".join(f"{k}: {', '.join(v)}" for k, v in axes.items())
        statement = (
            f"Model-form spread over {len(rows)} combinations of accepted correlations "
            f"({tried}): junction "
            f"temperature {spread['junction_temperature']:.1f} K, sink resistance "
            f"{100 * relative['sink_resistance']:.0f} % of the chosen model. Each correlation's "
            "own scatter against its data comes on top."
        )
    else:
        statement = (
            "finkit has one accepted correlation for this case's physics; no model-form spread "
            "can be shown. The correlation's own scatter against its data still applies."
        )
    return CorrelationSpread(
        rows=tuple(rows), axes=axes, spread=spread, relative_spread=relative, statement=statement
    )


# --------------------------------------------------------------------------------------
# Input sanity flags
# --------------------------------------------------------------------------------------

JUNCTION_TO_CASE_FLAG = 5.0
"""RθJC [K W⁻¹] at or above which a stated junction-to-case figure looks like a still-air
junction-to-ambient one. Common practice, no source: packages that need a heat sink have a
top-side RθJC well below 1-2 K/W, while JESD51-2A still-air θJA values of the same packages
are tens of K/W."""

JUNCTION_TO_CASE_BUDGET_SHARE = 0.5
"""Share of the available rise (limit - inlet) above which the junction-to-case drop alone is
suspicious [-] (common practice, no source)."""

ROOM_AMBIENT_BAND = (20.0 + ZERO_CELSIUS - 1.0, 25.0 + ZERO_CELSIUS + 1.0)
"""Inlet temperatures [K] that look like room ambient (20-25 degC, ±1 K)."""

TIGHT_GAP_RATIO = 0.5
"""Natural-convection fin gap below this fraction of the Bar-Cohen & Rohsenow optimum is
flagged [-]. Derived from the composite correlation: at half the optimum spacing the heat per
unit volume is about 43 % of its optimum value (``Nu_S/S²`` with El ∝ S⁴)."""

TIGHT_GAP_FLOOR = 3.0e-3
"""Natural-convection fin gap [m] below which a gap is flagged whatever the optimum (dust
bridging and the fully developed regime; common practice, no source)."""


def _attr(obj, *names):
    for name in names:
        obj = getattr(obj, name, None)
        if obj is None:
            return None
    return obj


def sanity_flags(case, inputs: SinkInputs | None = None) -> list[str]:
    """One-line warnings for inputs practitioners commonly get wrong.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case (single-fin cases give no flags: their h is given by design).
        Optional fields read if present: ``source.junction_to_case_basis``,
        ``air.preheat_allowance``, ``sink.heat_transfer_coefficient_override``.
    inputs : SinkInputs, optional
        Its physics inputs (built from the case if not given).

    Returns
    -------
    list of str
        One line per flag (empty when nothing looks wrong):

        * ``source.junction_to_case`` -- stated as ``theta-ja``, or at or above
          :data:`JUNCTION_TO_CASE_FLAG` K/W, or its drop ``P R_jc`` takes more than
          :data:`JUNCTION_TO_CASE_BUDGET_SHARE` of the rise from inlet air to a junction limit,
          unless the basis is stated as a JESD51-14 RθJC. θJA (JESD51-2A still-air box)
          describes a test setup, not a heat-sink path.
        * ``air.inlet_temperature`` -- within :data:`ROOM_AMBIENT_BAND` with no
          ``air.preheat_allowance`` stated: using room ambient for the sink's inlet air
          under-predicts when upstream parts preheat it.
        * ``sink.heat_transfer_coefficient_override`` -- h typed in by hand instead of computed.
        * ``sink.fins`` -- natural convection with a fin gap below :data:`TIGHT_GAP_RATIO` of
          the Bar-Cohen & Rohsenow optimum spacing (at the solved base temperature) or below
          :data:`TIGHT_GAP_FLOOR`.
    """
    if getattr(case, "kind", "heat-sink") != "heat-sink":
        return []
    flags: list[str] = []
    src, air, sink = case.source, case.air, case.sink

    # 1. junction-to-case given as a still-air junction-to-ambient figure
    r_jc = float(src.junction_to_case or 0.0)
    basis = _attr(src, "junction_to_case_basis")
    budget = case.limit.temperature - air.inlet_temperature
    share = src.power * r_jc / budget if budget > 0 else 0.0
    if basis == "theta-ja":
        flags.append(
            f"source.junction_to_case: {r_jc:.3g} K/W is stated as θJA (JESD51-2A still air), "
            "which describes a test box, not the path through a heat sink; use RθJC "
            "(JESD51-14) for the cooled side"
        )
    elif basis not in ("jesd51-14-top", "jesd51-14-bottom") and (
        r_jc >= JUNCTION_TO_CASE_FLAG
        or (case.limit.node == "junction" and share > JUNCTION_TO_CASE_BUDGET_SHARE)
    ):
        flags.append(
            f"source.junction_to_case: {r_jc:.3g} K/W (drop {src.power * r_jc:.1f} K at "
            f"{src.power:.3g} W, {100 * share:.0f} % of the rise to the limit) looks like a "
            "still-air θJA rather than RθJC; θJA (JESD51-2A) is not a heat-sink path metric. "
            "State source.junction_to_case_basis"
        )

    # 2. inlet air at room ambient with no preheat allowance stated
    t_in = air.inlet_temperature
    preheat = _attr(air, "preheat_allowance")
    if ROOM_AMBIENT_BAND[0] <= t_in <= ROOM_AMBIENT_BAND[1] and preheat is None:
        flags.append(
            f"air.inlet_temperature: {t_in - ZERO_CELSIUS:.1f} degC is room ambient and no "
            "air.preheat_allowance is stated; the air reaching the sink is usually preheated "
            "by parts upstream (state the allowance, 0 K if none)"
        )

    # 3. h typed in by hand
    h_given = _attr(sink, "heat_transfer_coefficient_override")
    if h_given is not None:
        flags.append(
            f"sink.heat_transfer_coefficient_override: h = {h_given:.3g} W/m^2/K typed in by "
            "hand instead of computed from a correlation; tables of h suit only early estimates"
        )

    # 4. tight fin gaps in natural convection
    if _attr(air, "flow", "natural") is not None and sink.type == "plate-fin":
        if inputs is None:
            from finkit.model import sink_inputs

            inputs = sink_inputs(case)
        g = inputs.geometry
        gap = float(g.fin_spacing)
        sol = solve(inputs)
        t_in_k = float(sol.inlet_air_temperature)
        excess = max(float(sol.base_temperature) - t_in_k, 1e-3)
        film = air_properties(t_in_k + 0.5 * excess, inputs.air.pressure)
        nu = film.dynamic_viscosity / film.density
        alpha = nu / film.prandtl
        s_opt = float(
            natural.optimum_fin_spacing_bar_cohen_rohsenow(
                g.base_length, excess, t_in_k + 0.5 * excess, nu, alpha
            )
        )
        if gap < TIGHT_GAP_RATIO * s_opt or gap < TIGHT_GAP_FLOOR:
            flags.append(
                f"sink.fins: fin gap {gap * 1e3:.2f} mm in natural convection is tight "
                f"(Bar-Cohen & Rohsenow optimum about {s_opt * 1e3:.1f} mm at a "
                f"{excess:.0f} K base rise); the channels choke the buoyant flow and collect dust"
            )
    # 5. fin gaps and fins that cannot be made (forced and natural convection)
    flags += _manufacturing_flags(case)
    # 6. magnitudes outside air cooling of electronics: typed with a unit, but likely a slip
    flags += _implausible_flags(case)
    return flags


#: Ranges of air-cooled electronics heat sinks (low, high, SI unit, field); a value outside is
#: flagged, not refused: typed with a unit it may be right, but it is more likely a slip of
#: unit or of digits (common practice, no source).
PLAUSIBLE = {
    "approach_velocity": (0.0, 20.0, "m/s", "air.flow.approach_velocity"),
    "fin_height": (1e-3, 0.3, "m", "sink.fins.height"),
    "fin_thickness": (5e-5, 0.02, "m", "sink.fins.thickness"),
    "pin_diameter": (2e-4, 0.03, "m", "sink.pins.diameter"),
    "pin_height": (1e-3, 0.3, "m", "sink.pins.height"),
    "base_length": (5e-3, 1.0, "m", "sink.base.length"),
    "base_width": (5e-3, 1.0, "m", "sink.base.width"),
    "base_thickness": (3e-4, 0.1, "m", "sink.base.thickness"),
    "footprint_length": (5e-4, 0.5, "m", "source.footprint_length"),
    "footprint_width": (5e-4, 0.5, "m", "source.footprint_width"),
    "power": (1e-3, 1e4, "W", "source.power"),
    "limit_temperature": (0.0, 250.0 + ZERO_CELSIUS, "K", "limit.temperature"),
    "thermal_conductivity": (0.0, 2000.0, "W/(m K)", "the sink material's conductivity"),
}


def _implausible_flags(case) -> list[str]:
    """Typed values far outside air cooling of electronics (a slip of unit or of digits)."""
    from finkit.model import sink_inputs

    inputs = sink_inputs(case)
    fins = getattr(case.sink, "fins", None)
    pins = getattr(case.sink, "pins", None)
    values = {
        "approach_velocity": getattr(case.air.flow, "approach_velocity", None),
        "fin_height": getattr(fins, "height", None),
        "fin_thickness": getattr(fins, "thickness", None),
        "pin_diameter": getattr(pins, "diameter", None),
        "pin_height": getattr(pins, "height", None),
        "base_length": case.sink.base.length,
        "base_width": case.sink.base.width,
        "base_thickness": case.sink.base.thickness,
        "footprint_length": case.source.footprint_length,
        "footprint_width": case.source.footprint_width,
        "power": case.source.power,
        "limit_temperature": case.limit.temperature,
        "thermal_conductivity": float(np.max(inputs.material.thermal_conductivity)),
    }
    out = []
    for name, value in values.items():
        low, high, unit, field_name = PLAUSIBLE[name]
        if value is None or low < value <= high:
            continue
        if unit == "K":
            shown, shown_unit, span = (
                value - ZERO_CELSIUS,
                "degC",
                f"up to about {high - ZERO_CELSIUS:g} degC",
            )
        elif unit == "m":
            shown, shown_unit, span = value * 1e3, "mm", f"about {low * 1e3:g} to {high * 1e3:g} mm"
        else:
            shown, shown_unit = value, unit
            span = (
                f"up to about {high:g} {unit}" if low <= 0 else f"about {low:g} to {high:g} {unit}"
            )
        out.append(
            f"{field_name}: {shown:.4g} {shown_unit} is outside what air-cooled electronics "
            f"use ({span}); check the value and its unit"
        )
    return out


def _manufacturing_flags(case) -> list[str]:
    """Fin gaps thinner than the fins, or outside the trade study's manufacturing bounds.

    The bounds are :class:`finkit.trade.ManufacturingBounds` (the case's ``trade_study`` bounds
    when it gives them): common practice for extruded sinks, no source.
    """
    from finkit.bounds import ManufacturingBounds
    from finkit.explore_schema import to_bounds

    sink = case.sink
    if sink.type != "plate-fin" or sink.fins is None:
        return []
    study = getattr(case, "trade_study", None)
    bounds = to_bounds(study) if study is not None else ManufacturingBounds()
    n, t, h = sink.fins.count, sink.fins.thickness, sink.fins.height
    gap = (sink.base.width - n * t) / (n - 1) if n > 1 else float("inf")
    out = []
    if gap < t:
        out.append(
            f"sink.fins: fin gap {gap * 1e3:.2f} mm is narrower than the {t * 1e3:.2f} mm fins "
            f"({n} fins on {sink.base.width * 1e3:.0f} mm); hard to extrude and quick to foul"
        )
    elif gap < bounds.min_fin_gap:
        out.append(
            f"sink.fins: fin gap {gap * 1e3:.2f} mm is below the {bounds.min_fin_gap * 1e3:.2f} "
            "mm manufacturing minimum of the trade study (common practice, no source)"
        )
    if gap > 0 and h / gap > bounds.max_fin_aspect_ratio:
        out.append(
            f"sink.fins: fin height over gap {h / gap:.1f} exceeds the "
            f"{bounds.max_fin_aspect_ratio:g} the trade study allows (common practice, no source)"
        )
    return out
