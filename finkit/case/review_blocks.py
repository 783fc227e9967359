"""Case-file blocks for what a reviewer asks: scenarios, touch temperature, test data.

These pydantic (v2) models describe the top-level case-file blocks ``scenarios:``, ``touch:``,
``measurements:`` and ``calibration:``, and three single fields that belong inside existing
blocks (``air.preheat_allowance``, ``source.junction_to_case_basis``,
``sink.heat_transfer_coefficient_override``). Every physical value is read with
:func:`finkit.case.units.to_si` and stored as an SI float (m, K, W, Pa, ...; temperatures absolute
in K). Every model forbids unknown keys.

The blocks are wired into the case schema by :mod:`finkit.case.schema`; this module does not import
it.
:func:`load_review_blocks` validates the blocks of a raw case mapping on their own and reports
every problem on one line, ``path.to.field: what is wrong (got X; allowed Y)``.

Example (YAML)::

    air:
      inlet_temperature: 50 degC
      preheat_allowance: 10 K      # the inlet above includes 10 K of preheat inside the box
    scenarios:
      - name: hot-day
        description: 50 degC outdoor design day
        inlet_temperature: 60 degC
      - name: fan-failed
        failed_fans: 1
        stopped_fan_leak: {volume_flow: 5 CFM, pressure_drop: 20 Pa}
      - name: dusty
        filter: {volume_flow: 20 CFM, pressure_drop: 15 Pa}
        deposit_thickness: 0.1 mm
        deposit_conductivity: 0.1 W/m/K
        pressure_drop_factor: 1.3
    touch:
      limit_temperature: 70 degC   # example only: check against your own standard
      reference_ambient: 25 degC
      basis: "<standard, clause/table row, surface material, contact time>"
    measurements:
      - {name: tp1, node: base, measured_temperature: 71.3 degC, power: 40 W,
         inlet_temperature: 23 degC}
    calibration: {target: heat_transfer, apply: false}
"""

from __future__ import annotations

import json
import re
from collections.abc import Mapping
from typing import Annotated, Literal

from pydantic import BeforeValidator, ValidationError, model_validator

from finkit.case.fields import StrictModel, Text, fail, fail_at, quantity, shown, whole
from finkit.errors import InputError
from finkit.physics.properties.atmosphere import ALTITUDE_RANGE

__all__ = [
    "Altitude",
    "AltitudeIncrease",
    "AreaResistance",
    "CalibrationBlock",
    "Conductivity",
    "Count",
    "Factor",
    "FilterBlock",
    "HeatTransferCoefficient",
    "HeatTransferCoefficientOverride",
    "JUNCTION_TO_CASE_BASES",
    "JunctionToCaseBasis",
    "MEASUREMENT_NODES",
    "MeasurementBlock",
    "Name",
    "Power",
    "PreheatAllowance",
    "PressureDrop",
    "REVIEW_BLOCKS",
    "ReviewBlockError",
    "ReviewBlocks",
    "SCENARIO_RELATIVE_FIELDS",
    "ScenarioBlock",
    "StoppedFanLeakBlock",
    "TOUCH_SURFACES",
    "Temperature",
    "TemperatureDifference",
    "Thickness",
    "TouchBlock",
    "Velocity",
    "VolumeFlow",
    "load_review_blocks",
]

#: Top-level case-file keys described here.
REVIEW_BLOCKS = ("scenarios", "touch", "measurements", "calibration")

#: What a stated ``source.junction_to_case`` value is (``source.junction_to_case_basis``):
#: ``jesd51-14-top`` / ``jesd51-14-bottom`` -- RθJC to the top or bottom case surface by the
#: transient dual-interface method (JEDEC JESD51-14), the metric the heat-sink chain needs;
#: ``datasheet-unspecified`` -- a datasheet RθJC whose method or side is not stated;
#: ``estimate`` -- an engineering estimate; ``theta-ja`` -- a junction-to-ambient figure
#: (JESD51-2A still-air box), which is not a heat-sink path metric and is flagged.
JUNCTION_TO_CASE_BASES = (
    "jesd51-14-top",
    "jesd51-14-bottom",
    "datasheet-unspecified",
    "estimate",
    "theta-ja",
)

#: Nodes a measured temperature may be placed on (``measurements[i].node``): the limit nodes
#: of :mod:`finkit.physics.sink` and the fin tip.
MEASUREMENT_NODES = ("junction", "case", "base", "fin_tip")

#: Accessible surfaces of a touch check (``touch.surfaces``).
TOUCH_SURFACES = ("base", "fin_tips")

#: Scenario fields given absolutely and their relative form (``scenarios[i]``): a relative
#: field shifts or scales the variant's own nominal value, so the scenario follows the variant.
SCENARIO_RELATIVE_FIELDS = {
    "inlet_temperature": "inlet_temperature_rise",
    "altitude": "altitude_increase",
    "power": "power_factor",
}

_NAME = re.compile(r"^[a-z0-9][a-z0-9._-]{0,63}$")


# --------------------------------------------------------------------------------------------
# Field types


_fail, _fail_at, _shown = fail, fail_at, shown


def _quantity(kind: str, *, gt=None, ge=None, le=None, unit: str = ""):
    """A float field given with a unit and stored in SI; bounds printed in ``unit``."""
    return quantity(kind, gt=gt, ge=ge, le=le, show=unit.strip() or None)


def _name(value):
    if not isinstance(value, str) or not _NAME.match(value):
        raise _fail(
            "must be 1-64 characters from a-z 0-9 . _ -, starting with a letter or digit "
            f"(got {_shown(value)})"
        )
    return value


Name = Annotated[str, BeforeValidator(_name)]
Count = whole(1)
Temperature = _quantity("temperature")
TemperatureDifference = _quantity("temperature_difference", ge=0.0, unit=" K")
Altitude = _quantity("length", ge=ALTITUDE_RANGE[0], le=ALTITUDE_RANGE[1], unit=" m")
AltitudeIncrease = _quantity("length", ge=0.0, le=ALTITUDE_RANGE[1] - ALTITUDE_RANGE[0], unit=" m")
Power = _quantity("power", gt=0.0, unit=" W")
VolumeFlow = _quantity("volume_flow", gt=0.0, unit=" m^3/s")
Velocity = _quantity("velocity", gt=0.0, unit=" m/s")
PressureDrop = _quantity("pressure", gt=0.0, unit=" Pa")
Factor = _quantity("dimensionless", gt=0.0)
AreaResistance = _quantity("area_resistance", ge=0.0, unit=" K*m^2/W")
Thickness = _quantity("length", ge=0.0, unit=" m")
Conductivity = _quantity("thermal_conductivity", gt=0.0, unit=" W/m/K")
HeatTransferCoefficient = _quantity("heat_transfer_coefficient", gt=0.0, unit=" W/m^2/K")

#: ``air.preheat_allowance`` [K], optional: the preheat above room ambient that the stated
#: ``air.inlet_temperature`` already includes (air warmed by other parts upstream of the sink
#: inside the product). Writing it, even as ``0 K``, states that preheat was considered; an inlet
#: temperature at room ambient with no allowance written is flagged by
#: :func:`finkit.model.review.sanity_flags`. Default: not stated (None).
PreheatAllowance = TemperatureDifference

#: ``source.junction_to_case_basis``, optional: one of :data:`JUNCTION_TO_CASE_BASES`, saying
#: what the ``source.junction_to_case`` figure is. Default: not stated (None).
JunctionToCaseBasis = Literal[JUNCTION_TO_CASE_BASES]  # type: ignore[valid-type]

#: ``sink.heat_transfer_coefficient_override`` [W m⁻² K⁻¹], optional: a heat transfer
#: coefficient typed in by hand, used on every air-side surface instead of the correlations
#: (``ModelOptions.heat_transfer_coefficient_override``). Always flagged in the note, since h
#: from a table suits only the earliest phase of a design. Default: computed (None).
HeatTransferCoefficientOverride = HeatTransferCoefficient


_Model = StrictModel


# --------------------------------------------------------------------------------------------
# scenarios:


class FilterBlock(_Model):
    """A filter (or grille) in series with the sink, from one rated point.

    ``dp = pressure_drop (Q / volume_flow) ** exponent`` (:func:`finkit.physics.airflow.
    power_law_pressure_drop`): ``volume_flow`` [m³ s⁻¹] and ``pressure_drop`` [Pa] of the rated
    point (a loaded filter's figure for a dust scenario), ``exponent`` [-] 2 for turbulent
    losses, 1 for laminar media. ``basis`` says where the rated point comes from.
    """

    volume_flow: VolumeFlow
    pressure_drop: PressureDrop
    exponent: Factor = 2.0
    basis: Text | None = None


class StoppedFanLeakBlock(_Model):
    """Leak back through a stopped fan, as one point of ``dp = R Q²``.

    ``volume_flow`` [m³ s⁻¹] that flows backwards through one stopped fan at ``pressure_drop``
    [Pa] (from a test, or an estimate of its open area); ``R = pressure_drop / volume_flow²``
    [Pa s² m⁻⁶] at the fan's rating density.
    """

    volume_flow: VolumeFlow
    pressure_drop: PressureDrop


class ScenarioBlock(_Model):
    """One named operating scenario: the nominal case with some conditions changed.

    Every field except ``name`` is optional; a field left out keeps the nominal value. finkit
    re-solves airflow, bypass and temperatures for each scenario (no fixed multipliers).

    Attributes
    ----------
    name : str
        Short id, ``a-z 0-9 . _ -``; ``nominal`` is reserved for the case itself. [-]
    description : str, optional
        One line for the note's scenario table. [-]
    inlet_temperature : float, optional
        Local inlet air temperature, preheat included [K].
    surroundings_temperature : float, optional
        Temperature of the surfaces the sink radiates to [K]; left out, it moves with the inlet
        air (keeps the nominal difference). [K]
    inlet_temperature_rise : float, optional
        Inlet air this much warmer than the variant's own nominal inlet (relative; follows the
        variant) [K]. Not with ``inlet_temperature``.
    altitude : float, optional
        Altitude; the pressure follows the standard atmosphere [m].
    altitude_increase : float, optional
        This much higher than the variant's own nominal altitude (relative) [m]. Not with
        ``altitude``.
    power : float, optional
        Power of the source [W].
    power_factor : float, optional
        Multiplier on the variant's own nominal power (relative; e.g. 1.1 for a +10 % power
        corner) [-]. Not with ``power``.
    requirement_id : str, optional
        Identifier of the requirement this condition checks (e.g. in a requirements tool);
        carried to results.json. [-]
    combines : list of str, optional
        Names of other scenarios of the case applied together with this one (e.g. a hot day
        with one fan failed). Their changes are merged: relative rises add, factors multiply,
        resistances and deposits add; an absolute value set differently by two parts is an
        error. The named scenarios may not combine others themselves. [-]
    fan_speed_ratio : float, optional
        Fan speed over its rated speed; the curve follows the fan laws (Q ∝ N, dp ∝ N²) [-].
    fan_pressure_factor : float, optional
        Multiplier on the fan's pressure (ageing, supply voltage, tolerance) [-].
    failed_fans : int, optional
        Fans stopped, out of ``air.flow.fan.count`` (at least one must run) [-].
    stopped_fan_leak : StoppedFanLeakBlock, optional
        Leak back through each stopped fan (parallel) or loss of each stopped rotor (series);
        left out, stopped fans are taken as sealed (parallel) or loss-free (series),
        which is optimistic. [-]
    filter : FilterBlock, optional
        A filter or grille in series with the sink (fan-driven cases). [-]
    pressure_drop_factor : float, optional
        Multiplier on the sink's own pressure drop (fouled fins, beyond the deposit layer) [-].
    heat_transfer_factor : float, optional
        Multiplier on the air-side heat transfer coefficient (h reduction, e.g. 0.9) [-].
    fouling_resistance : float, optional
        Air-side fouling resistance per unit area, in series with 1/h [K m² W⁻¹].
    deposit_thickness : float, optional
        Dust layer on every wetted face; it narrows the passages (fins 2x thicker by it, pins
        2x larger), so the flow, pressure drop and h are re-solved [m].
    deposit_conductivity : float, optional
        Conductivity of that layer; adds ``deposit_thickness / deposit_conductivity`` to the
        fouling resistance [W m⁻¹ K⁻¹].
    """

    name: Name
    description: Text | None = None
    requirement_id: Text | None = None
    combines: list[Name] = []
    inlet_temperature: Temperature | None = None
    inlet_temperature_rise: TemperatureDifference | None = None
    surroundings_temperature: Temperature | None = None
    altitude: Altitude | None = None
    altitude_increase: AltitudeIncrease | None = None
    power: Power | None = None
    power_factor: Factor | None = None
    fan_speed_ratio: Factor | None = None
    fan_pressure_factor: Factor | None = None
    failed_fans: Count | None = None
    stopped_fan_leak: StoppedFanLeakBlock | None = None
    filter: FilterBlock | None = None
    pressure_drop_factor: Factor | None = None
    heat_transfer_factor: Factor | None = None
    fouling_resistance: AreaResistance | None = None
    deposit_thickness: Thickness | None = None
    deposit_conductivity: Conductivity | None = None

    @model_validator(mode="after")
    def _consistent(self):
        if self.name == "nominal":
            raise _fail_at("name", "'nominal' is reserved for the case itself (got 'nominal')")
        if self.stopped_fan_leak is not None and self.failed_fans is None:
            raise _fail_at("stopped_fan_leak", "needs failed_fans (got stopped_fan_leak alone)")
        if self.deposit_conductivity is not None and self.deposit_thickness is None:
            raise _fail_at(
                "deposit_conductivity", "needs deposit_thickness (got the conductivity only)"
            )
        for absolute, relative in SCENARIO_RELATIVE_FIELDS.items():
            if getattr(self, absolute) is not None and getattr(self, relative) is not None:
                raise _fail_at(
                    relative,
                    f"give {absolute} (absolute) or {relative} (relative to the nominal), not both",
                )
        if self.name in self.combines:
            raise _fail_at("combines", f"a scenario cannot combine itself (got '{self.name}')")
        changes = [
            n
            for n in type(self).model_fields
            if n not in ("name", "description", "requirement_id", "combines")
            and getattr(self, n) is not None
        ] + list(self.combines)
        if not changes:
            raise _fail(f"scenario '{self.name}' changes nothing (give at least one condition)")
        return self


# --------------------------------------------------------------------------------------------
# touch:


class TouchBlock(_Model):
    """Accessible-surface (touch) temperature check. finkit ships no table of limits.

    Attributes
    ----------
    limit_temperature : float
        The limit from the user's own safety standard, for the surface material and contact
        time that apply [K]. (Example only -- check against your standard: some product-safety
        standards give limits around 70-80 degC for short contact with plastic, lower for metal
        and for long contact.)
    reference_ambient : float
        Room ambient at which the limit is judged, e.g. 25 degC [K].
    basis : str
        Where the limit comes from: standard and edition, clause or table row, surface
        material, contact time. Printed in the note. [-]
    surfaces : list of {"base", "fin_tips"}
        Surfaces a person can touch; default both. [-]
    inlet_preheat : float, optional
        Air temperature at the sink above room ambient at the reference condition [K];
        left out: ``air.preheat_allowance`` if stated, else 0.
    power : float, optional
        Power for the check; default the case power [W].
    """

    limit_temperature: Temperature
    reference_ambient: Temperature
    basis: Text
    surfaces: list[Literal[TOUCH_SURFACES]] = list(TOUCH_SURFACES)  # type: ignore[valid-type]
    inlet_preheat: TemperatureDifference | None = None
    power: Power | None = None

    @model_validator(mode="after")
    def _checks(self):
        if not self.surfaces:
            raise _fail_at("surfaces", "give at least one of base, fin_tips (got an empty list)")
        if self.limit_temperature <= self.reference_ambient:
            raise _fail_at(
                "limit_temperature",
                "must be above reference_ambient (got "
                f"{self.limit_temperature - 273.15:.1f} degC <= "
                f"{self.reference_ambient - 273.15:.1f} degC)",
            )
        return self


# --------------------------------------------------------------------------------------------
# measurements: and calibration:


class MeasurementBlock(_Model):
    """One measured steady-state point from a test of the real sink.

    Attributes
    ----------
    name : str
        Short id of the point. [-]
    node : {"junction", "case", "base", "fin_tip"}
        Where the temperature was measured; ``base`` is the base at the centre of the source
        footprint (where a thermocouple under the device usually sits). [-]
    measured_temperature : float
        Measured steady temperature [K].
    power : float
        Power dissipated during the test [W].
    inlet_temperature : float
        Air temperature entering the sink during the test [K].
    altitude : float, optional
        Test altitude (pressure from the standard atmosphere); default the case's [m].
    volume_flow : float, optional
        Measured total volume flow to the sink during the test [m³ s⁻¹].
    approach_velocity : float, optional
        Measured approach velocity during the test [m s⁻¹] (not with ``volume_flow``).
    fan_speed_ratio : float, optional
        Fan speed over the rated speed during the test [-] (fan-driven cases).
    """

    name: Name
    node: Literal[MEASUREMENT_NODES]  # type: ignore[valid-type]
    measured_temperature: Temperature
    power: Power
    inlet_temperature: Temperature
    altitude: Altitude | None = None
    volume_flow: VolumeFlow | None = None
    approach_velocity: Velocity | None = None
    fan_speed_ratio: Factor | None = None

    @model_validator(mode="after")
    def _checks(self):
        given = [
            n for n in ("volume_flow", "approach_velocity", "fan_speed_ratio") if getattr(self, n)
        ]
        if len(given) > 1:
            raise _fail(
                "give at most one of volume_flow | approach_velocity | fan_speed_ratio "
                f"(got {', '.join(given)})"
            )
        if self.measured_temperature <= self.inlet_temperature:
            raise _fail_at(
                "measured_temperature",
                "must be above inlet_temperature (got "
                f"{self.measured_temperature - 273.15:.2f} degC <= "
                f"{self.inlet_temperature - 273.15:.2f} degC)",
            )
        return self


class CalibrationBlock(_Model):
    """Fit of one empirical multiplier to ``measurements``.

    ``target``: ``heat_transfer`` (multiplier on the air-side h) or ``sink_resistance``
    (multiplier on the sink resistance, convection plus radiation). ``apply``: use the fitted
    multiplier in every result of the case (default false: reported only).
    ``measurement_uncertainty`` [K]: the uncertainty of one measured temperature (thermocouple
    and placement; default 1 K, common practice, no source). When the model reads lower than
    the measurements by more than this on average, the case carries a warning and the headline
    shows the calibrated governing result beside the uncalibrated one.
    """

    target: Literal["heat_transfer", "sink_resistance"] = "heat_transfer"
    apply: bool = False
    measurement_uncertainty: TemperatureDifference = 1.0


class ReviewBlocks(_Model):
    """The review blocks of one case (all optional)."""

    scenarios: list[ScenarioBlock] = []
    touch: TouchBlock | None = None
    measurements: list[MeasurementBlock] = []
    calibration: CalibrationBlock | None = None

    @model_validator(mode="after")
    def _names(self):
        for block in ("scenarios", "measurements"):
            names = [item.name for item in getattr(self, block)]
            repeated = sorted({n for n in names if names.count(n) > 1})
            if repeated:
                raise _fail_at(
                    block, f"each name may appear once (got {', '.join(repeated)} twice)"
                )
        if self.calibration is not None and not self.measurements:
            raise _fail_at("calibration", "needs measurements (got none)")
        by_name = {s.name: s for s in self.scenarios}
        for k, scenario in enumerate(self.scenarios):
            for part in scenario.combines:
                if part not in by_name:
                    raise _fail_at(
                        f"scenarios.{k}.combines",
                        f"no scenario named '{part}' (allowed: "
                        f"{', '.join(n for n in by_name if n != scenario.name) or 'none'})",
                    )
                if by_name[part].combines:
                    raise _fail_at(
                        f"scenarios.{k}.combines",
                        f"'{part}' combines other scenarios itself; name its parts instead",
                    )
        return self


class ReviewBlockError(InputError):
    """Review blocks that do not validate; ``errors`` holds one line per problem."""

    def __init__(self, errors: list[str]):
        self.errors = list(errors)
        super().__init__("\n".join(self.errors))


def _path(loc) -> str:
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        elif str(part).startswith("function-"):
            continue
        else:
            out += f".{part}" if out else str(part)
    return out


def _join(path: str, message: str) -> str:
    return f"{path}: {message}" if path else message


def _lines(error: dict) -> list[str]:
    path, kind, value = _path(error["loc"]), error["type"], error.get("input")
    if kind == "finkit":
        return [_join(path, error["ctx"]["message"])]
    if kind == "finkit_many":
        return [
            _join(f"{path}.{sub}" if path and sub else (sub or path), message)
            for sub, message in json.loads(error["ctx"]["problems"])
        ]
    return [_line(path, kind, value, error)]


def _line(path, kind, value, error) -> str:
    if kind == "missing":
        return f"{path}: missing (required)"
    if kind == "extra_forbidden":
        return f"{path}: unknown key (not part of this block)"
    if kind == "literal_error":
        return f"{path}: not allowed (got {_shown(value)}; allowed: {error['ctx']['expected']})"
    return f"{path}: {error['msg']} (got {_shown(value)})"


def load_review_blocks(data: Mapping) -> ReviewBlocks:
    """Validate the review blocks of a raw case mapping (other keys are ignored).

    Parameters
    ----------
    data : Mapping
        The case as read from YAML (units as written). [-]

    Returns
    -------
    ReviewBlocks
        The validated blocks, SI floats.

    Raises
    ------
    ReviewBlockError
        One line per problem naming the field, e.g.
        ``scenarios[0].inlet_temperature: expected a temperature, got '3 W'``.
    """
    if not isinstance(data, Mapping):
        raise ReviewBlockError([f"case: expected a mapping (got {type(data).__name__})"])
    blocks = {k: data[k] for k in REVIEW_BLOCKS if k in data and data[k] is not None}
    try:
        return ReviewBlocks.model_validate(blocks)
    except ValidationError as exc:
        lines = [line for e in exc.errors(include_url=False) for line in _lines(e)]
        raise ReviewBlockError(list(dict.fromkeys(lines))) from None
