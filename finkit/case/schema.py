"""The case file: schema, validation and conversion to SI.

A case is a YAML file (or a YAML string, or a dict) that holds every input of one calculation.
:func:`load_case` validates it against the schema below and returns a frozen :class:`Case`
(:class:`HeatSinkCase` or :class:`SingleFinCase`) in which every physical value is an SI float
(m, K, W, Pa, ...; temperatures absolute in K). All problems are reported together, one line
each, as ``path.to.field: what is wrong (got X; allowed Y)``, in a :class:`CaseError`.

Two kinds of case exist (key ``kind``):

* ``heat-sink`` -- a plate-fin or pin-fin heat sink on a heat source, in forced flow (given
  approach velocity, given volume flow, or a fan curve) or natural convection;
* ``single-fin`` -- one fin with a prescribed base temperature, with an optional study over
  materials and heat transfer coefficients.

Units are read by :func:`finkit.case.units.to_si`; bare numbers mean SI. Material keys are checked
against ``finkit.physics.properties.materials`` (imported lazily, so this module imports without
it).
"""

from __future__ import annotations

import copy
import difflib
import hashlib
import json
import re
import types
from collections.abc import Mapping
from pathlib import Path
from typing import Annotated, Literal, Union, get_args, get_origin

import yaml
from pydantic import (
    BaseModel,
    BeforeValidator,
    ConfigDict,
    PrivateAttr,
    TypeAdapter,
    ValidationError,
    field_validator,
    model_validator,
)

from finkit.case.explore_blocks import MonteCarloBlock, TolerancesBlock, TradeStudyBlock
from finkit.case.fields import (
    StrictModel,
    Text,
    fail,
    fail_many,
    format_bound,
    quantity,
    shown,
    whole,
)
from finkit.case.review_blocks import (
    CalibrationBlock,
    HeatTransferCoefficientOverride,
    JunctionToCaseBasis,
    MeasurementBlock,
    PreheatAllowance,
    ReviewBlocks,
    ScenarioBlock,
    TouchBlock,
)
from finkit.case.units import to_si
from finkit.errors import InputError
from finkit.physics.properties.atmosphere import (
    ALTITUDE_RANGE,
)  # the standard atmosphere's range [m]

__all__ = [
    "CASE_KINDS",
    "SWEEP_NAMES",
    "Air",
    "Base",
    "Bypass",
    "Case",
    "CaseError",
    "Conditions",
    "Fan",
    "Fin",
    "Fins",
    "Flow",
    "HeatSinkCase",
    "Interface",
    "Limit",
    "Natural",
    "Pins",
    "Sink",
    "SingleFinCase",
    "SingleFinLimit",
    "Source",
    "Study",
    "TitleBlock",
    "UserMaterial",
    "case_inputs_sha256",
    "load_case",
]

CASE_KINDS = ("heat-sink", "single-fin")
#: Sweep plots a heat-sink note can show: the one registry of sweep names (``finkit.model``
#: sweeps exactly these).
SWEEP_NAMES = (
    "inlet_temperature",
    "airflow",
    "heat_transfer_coefficient",
    "fin_count",
    "fin_height",
    "fin_thickness",
    "altitude",
    "power",
)

_CASE_ID = re.compile(r"^[a-z0-9][a-z0-9._-]{0,63}$")


class CaseError(InputError):
    """A case that does not validate.

    Attributes
    ----------
    errors : list of str
        One line per problem, ``path.to.field: what is wrong (got X; allowed Y)``.
    """

    def __init__(self, errors: list[str]):
        self.errors = list(errors)
        super().__init__("\n".join(self.errors))


# --------------------------------------------------------------------------------------------
# Field types


_fail, _fail_many, _shown, _fmt = fail, fail_many, shown, format_bound
_whole, _quantity = whole, quantity


def _key(value):
    if not isinstance(value, str) or not value.strip():
        raise _fail(f"expected a key such as 'aluminium-6063-t5' (got {_shown(value)})")
    return value.strip()


Key = Annotated[str, BeforeValidator(_key)]
# A heat sink's parts measure millimetres to decimetres: a bare number above 1 m is almost
# surely millimetres written without the unit (common practice, no source).
Length = _quantity("length", gt=0.0, bare_max=1.0, hint="mm")
Gap = _quantity("length", ge=0.0, bare_max=1.0, hint="mm")
Altitude = _quantity("length", ge=ALTITUDE_RANGE[0], le=ALTITUDE_RANGE[1], show="m")
Temperature = _quantity("temperature")
TemperatureDifference = _quantity("temperature_difference", ge=0.0)
Power = _quantity("power", gt=0.0)
ThermalResistance = _quantity("thermal_resistance", ge=0.0)
AreaResistance = _quantity("area_resistance", ge=0.0)
Conductivity = _quantity("thermal_conductivity", gt=0.0)
HeatTransferCoefficient = _quantity("heat_transfer_coefficient", gt=0.0)
# Air cooling of electronics: approach velocities up to a few m/s, flows up to a fraction of a
# m^3/s; bare numbers far above are feet per minute or CFM without the unit (common practice).
Velocity = _quantity("velocity", gt=0.0, bare_max=50.0, hint="ft/min")
VolumeFlow = _quantity("volume_flow", gt=0.0, bare_max=1.0, hint="CFM")
CurveFlow = _quantity("volume_flow", ge=0.0, bare_max=1.0, hint="CFM")
CurvePressure = _quantity("pressure", ge=0.0)
Density = _quantity("density", gt=0.0)
Emissivity = _quantity("dimensionless", gt=0.0, le=1.0)
Factor = _quantity("dimensionless", gt=0.0)


def _case_id(value):
    if not isinstance(value, str) or not _CASE_ID.match(value):
        raise _fail(
            "must be 1-64 characters from a-z 0-9 . _ -, starting with a letter or digit "
            f"(got {_shown(value)})"
        )
    return value


_Model = StrictModel


def _given(model: BaseModel, names) -> list[str]:
    return [n for n in names if getattr(model, n) is not None]


# The "exactly one form" and "which block" rules are written once and used twice: by the models
# (so a model never holds an impossible combination) and on the raw data in load_case (so the
# message appears even when a field inside the same block is also wrong). Identical lines are
# reported once.

_FLOW_FORMS = ("approach_velocity", "volume_flow", "fan", "natural")


def _interface_problem(given) -> str | None:
    forms = [n for n in ("resistance", "area_resistance") if n in given]
    layer = [n for n in ("thickness", "thermal_conductivity") if n in given]
    if layer:
        forms.append(" and ".join(layer))
    if len(forms) != 1:
        return (
            "give exactly one of: resistance | area_resistance | thickness and "
            f"thermal_conductivity (got {', '.join(forms) if forms else 'none'})"
        )
    if len(layer) == 1:
        other = {"thickness": "thermal_conductivity", "thermal_conductivity": "thickness"}
        return f"{layer[0]} needs {other[layer[0]]} as well (got only {layer[0]})"
    return None


def _flow_problem(given) -> str | None:
    forms = [n for n in _FLOW_FORMS if n in given]
    if len(forms) != 1:
        return (
            "give exactly one of: approach_velocity | volume_flow | fan | natural "
            f"(got {', '.join(forms) if forms else 'none'})"
        )
    return None


def _sink_block_problems(sink_type: str, has_fins: bool, has_pins: bool) -> list[tuple[str, str]]:
    wanted, unwanted = ("fins", "pins") if sink_type == "plate-fin" else ("pins", "fins")
    present = {"fins": has_fins, "pins": has_pins}
    problems = []
    if not present[wanted]:
        problems.append((wanted, f"missing (required for sink.type '{sink_type}')"))
    if present[unwanted]:
        problems.append((unwanted, f"not used by sink.type '{sink_type}'; remove it"))
    return problems


# --------------------------------------------------------------------------------------------
# Common parts


class TitleBlock(_Model):
    """Who and what the calculation note is for (all plain text)."""

    project: Text
    part: Text
    revision: Text
    prepared_by: Text
    checked_by: Text | None = None
    approved_by: Text | None = None
    company: Text | None = None
    description: Text | None = None


class UserMaterial(_Model):
    """A material added, or a built-in one overridden, in the case file (``materials: {key: ...}``).

    For a new key ``thermal_conductivity`` [W m⁻¹ K⁻¹] is required (``name`` and ``density``
    [kg m⁻³] are optional); for a built-in key every value is optional and replaces the
    built-in one.
    ``emissivity`` maps a finish (``bare``, ``anodised-black``, ...) to its emissivity [-].
    ``source`` says where the values come from (printed in the note).
    """

    name: Text | None = None
    thermal_conductivity: Conductivity | None = None
    density: Density | None = None
    emissivity: dict[Key, Emissivity] = {}
    source: Text


# --------------------------------------------------------------------------------------------
# heat-sink kind


class Interface(_Model):
    """Thermal interface between the device case and the sink base.

    Exactly one form: ``resistance`` [K W⁻¹], ``area_resistance`` [K m² W⁻¹] (divide by the
    footprint area), or ``thickness`` [m] with ``thermal_conductivity`` [W m⁻¹ K⁻¹].
    """

    resistance: ThermalResistance | None = None
    area_resistance: AreaResistance | None = None
    thickness: Length | None = None
    thermal_conductivity: Conductivity | None = None

    @model_validator(mode="after")
    def _one_form(self):
        problem = _interface_problem(_given(self, type(self).model_fields))
        if problem:
            raise _fail(problem)
        return self

    def resistance_over(self, area: float) -> float:
        """Interface resistance [K W⁻¹] over a contact area [m²] (the source footprint)."""
        from finkit.physics.spreading import interface_resistance

        return float(
            interface_resistance(
                area,
                resistance=self.resistance,
                area_resistance=self.area_resistance,
                thickness=self.thickness,
                thermal_conductivity=self.thermal_conductivity,
            )
        )


class Source(_Model):
    """The heat source: power [W], footprint [m] centred on the base, RθJC [K W⁻¹], interface."""

    power: Power
    footprint_length: Length
    footprint_width: Length
    junction_to_case: ThermalResistance = 0.0
    junction_to_case_basis: JunctionToCaseBasis | None = None
    interface: Interface


class Base(_Model):
    """Base plate [m]: width across the flow, length along it, thickness."""

    width: Length
    length: Length
    thickness: Length


class Fins(_Model):
    """Plate fins: count [-], thickness [m], height base to tip [m]; fin length = base length."""

    count: _whole(2)
    thickness: Length
    height: Length


class Pins(_Model):
    """Pin fins [m]: diameter, height, pitches across (transverse) and along (longitudinal)."""

    diameter: Length
    height: Length
    transverse_pitch: Length
    longitudinal_pitch: Length
    arrangement: Literal["inline", "staggered"]

    @model_validator(mode="after")
    def _pins_apart(self):
        problems = [
            (
                name,
                f"must be larger than diameter {_fmt(self.diameter, 'length')} "
                f"(got {_fmt(getattr(self, name), 'length')}): the pins would touch",
            )
            for name in ("transverse_pitch", "longitudinal_pitch")
            if getattr(self, name) <= self.diameter
        ]
        if problems:
            raise _fail_many(problems)
        return self


class Sink(_Model):
    """The heat sink: type, material and finish keys, optional emissivity override [-], geometry."""

    type: Literal["plate-fin", "pin-fin"]
    material: Key
    finish: Key
    emissivity: Emissivity | None = None
    base: Base
    fins: Fins | None = None
    pins: Pins | None = None
    heat_transfer_coefficient_override: HeatTransferCoefficientOverride | None = None

    @model_validator(mode="after")
    def _geometry(self):
        problems = _sink_block_problems(self.type, self.fins is not None, self.pins is not None)
        if self.type == "plate-fin" and self.fins is not None:
            from finkit.physics.geometry import fins_fit

            if not fins_fit(self.base.width, self.fins.count, self.fins.thickness):
                problems.append(
                    (
                        "fins",
                        f"{self.fins.count} fins of {_fmt(self.fins.thickness, 'length')} do not "
                        f"fit on sink.base.width {_fmt(self.base.width, 'length')} "
                        "(count x thickness must be less than the width)",
                    )
                )
        if self.type == "pin-fin" and self.pins is not None:
            for side in ("width", "length"):
                if self.pins.diameter > getattr(self.base, side):
                    problems.append(
                        (
                            "pins.diameter",
                            f"{_fmt(self.pins.diameter, 'length')} is larger than sink.base.{side} "
                            f"{_fmt(getattr(self.base, side), 'length')}",
                        )
                    )
        if problems:
            raise _fail_many(problems)
        return self


class Fan(_Model):
    """A fan curve: static pressure [Pa] against volume flow [m³ s⁻¹] of ONE fan.

    ``count`` identical fans in ``arrangement`` (parallel adds flows, series adds pressures); the
    curve was measured at ``rating_density`` [kg m⁻³]; ``pressure_factor`` [-] scales the
    pressures (e.g. for a guard or a speed derating the user knows).
    """

    volume_flow: list[CurveFlow]
    pressure: list[CurvePressure]
    count: _whole(1) = 1
    arrangement: Literal["parallel", "series"] = "parallel"
    rating_density: Density = 1.2
    pressure_factor: Factor = 1.0

    @model_validator(mode="after")
    def _curve(self):
        # The fan-table rules live with the fan curve (finkit.physics.airflow.fan_table_problems);
        # here
        # each problem is placed on the case's own field. A case also asks for 3 points or more
        # (two make a straight line that misses the knee of a real fan; common practice, no
        # source).
        from finkit.physics.airflow.fans import fan_table_problems

        problems = []
        n_q, n_p = len(self.volume_flow), len(self.pressure)
        for problem in fan_table_problems(self.volume_flow, self.pressure):
            field = "pressure" if problem.argument == "static_pressure" else "volume_flow"
            if problem.rule == "lengths":
                problems.append(
                    (
                        "pressure",
                        f"must have as many points as volume_flow "
                        f"(got {n_p} pressures and {n_q} flows)",
                    )
                )
            elif problem.rule == "not_increasing":
                problems.append(
                    (
                        "volume_flow",
                        f"must increase from point to point (point {problem.index} "
                        "is not larger than the one before)",
                    )
                )
            elif problem.rule == "not_shut_off":
                problems.append(
                    (
                        "volume_flow[0]",
                        "must be 0: the table starts at shut-off "
                        f"(got {_fmt(problem.value, 'volume_flow', 'CFM')})",
                    )
                )
            elif problem.rule == "not_positive":
                problems.append(
                    (
                        f"pressure[{problem.index}]",
                        "must be above 0 before free delivery, the last point "
                        f"(got {_fmt(problem.value, 'pressure')})",
                    )
                )
            elif problem.rule == "not_free_delivery":
                problems.append(
                    (
                        f"pressure[{problem.index}]",
                        "must be 0: the table ends at free delivery "
                        f"(got {_fmt(problem.value, 'pressure')})",
                    )
                )
            elif problem.rule == "not_finite":
                problems.append((f"{field}[{problem.index}]", "must be a finite number"))
            # "too_few": the case's own count rule below says more
        if min(n_q, n_p) < 3:
            problems.append(("", f"needs at least 3 points (got {min(n_q, n_p)})"))
        if problems:
            raise _fail_many(problems)
        return self


class Natural(_Model):
    """Natural convection; ``orientation`` of the fins (only vertical fins in this version)."""

    orientation: Literal["vertical-fins"]


class Flow(_Model):
    """How air reaches the sink: exactly one of the four forms.

    ``approach_velocity`` [m s⁻¹] upstream of the sink; ``volume_flow`` [m³ s⁻¹] total flow
    approaching the sink before any bypass; ``fan`` a fan curve; ``natural`` natural convection.
    """

    approach_velocity: Velocity | None = None
    volume_flow: VolumeFlow | None = None
    fan: Fan | None = None
    natural: Natural | None = None

    @model_validator(mode="after")
    def _one_form(self):
        problem = _flow_problem(_given(self, _FLOW_FORMS))
        if problem:
            raise _fail(problem)
        return self

    @property
    def mode(self) -> str:
        """Which form was given: ``approach_velocity``, ``volume_flow``, ``fan`` or ``natural``."""
        return _given(self, _FLOW_FORMS)[0]


class Bypass(_Model):
    """Clearance [m] between the sink and the duct: on each side, and above the fin tips."""

    side_gap: Gap = 0.0
    top_gap: Gap = 0.0


class Air(_Model):
    """Air at the sink: inlet and surroundings temperature [K], altitude [m], flow, bypass."""

    inlet_temperature: Temperature
    altitude: Altitude = 0.0
    surroundings_temperature: Temperature | None = None
    preheat_allowance: PreheatAllowance | None = None
    flow: Flow
    bypass: Bypass | None = None

    @model_validator(mode="after")
    def _default_surroundings(self):
        if self.surroundings_temperature is None:
            object.__setattr__(self, "surroundings_temperature", self.inlet_temperature)
        return self


class Limit(_Model):
    """Temperature limit [K] at a node, with a required margin [K] below it.

    ``requirement_id``: optional identifier of the requirement the limit comes from (as a
    requirements or product-lifecycle tool names it), carried to results.json and the batch
    overview.
    """

    node: Literal["junction", "case", "base"]
    temperature: Temperature
    required_margin: TemperatureDifference = 0.0
    requirement_id: Text | None = None


class SingleFinLimit(_Model):
    """Temperature limit [K] at the fin base, with a required margin [K]."""

    node: Literal["base"] = "base"
    temperature: Temperature
    required_margin: TemperatureDifference = 0.0


class PreviousRevision(_Model):
    """The previous signed revision of this case, for the note's "changes since" section.

    ``source``: a case file, a note folder or its results.json (a relative path is taken from
    the case file's folder); ``revision``: its revision letter or number as signed. Not part of
    the inputs hash: naming a previous revision changes no result.
    """

    source: Text
    revision: Text


class Case(_Model):
    """Fields common to every case. Use :class:`HeatSinkCase` or :class:`SingleFinCase`."""

    case_id: str
    kind: str
    title_block: TitleBlock
    materials: dict[Key, UserMaterial] = {}
    previous_revision: PreviousRevision | None = None

    _entered: dict = PrivateAttr(default_factory=dict)
    _source_path: Path | None = PrivateAttr(default=None)

    @field_validator("case_id", mode="before")
    @classmethod
    def _case_id(cls, value):
        return _case_id(value)

    @property
    def entered(self) -> dict:
        """The case as written in the file (units and all), for the inputs table of a note."""
        return copy.deepcopy(self._entered)

    @property
    def source_path(self) -> Path | None:
        """The YAML file the case was read from (``None`` for a string or a dict)."""
        return self._source_path

    def user_materials(self) -> dict[str, dict]:
        """The case's ``materials`` as SI mappings, for ``get_material(key, user_materials)``.

        A built-in key is overridden value by value, each given value credited to ``source``.
        """
        return {key: entry.model_dump() for key, entry in self.materials.items()}


class HeatSinkCase(Case):
    """A heat sink on a heat source (``kind: heat-sink``)."""

    kind: Literal["heat-sink"]
    source: Source
    sink: Sink
    air: Air
    limit: Limit
    sweeps: list[Literal[SWEEP_NAMES]] = []  # type: ignore[valid-type]
    scenarios: list[ScenarioBlock] = []
    touch: TouchBlock | None = None
    measurements: list[MeasurementBlock] = []
    calibration: CalibrationBlock | None = None
    tolerances: TolerancesBlock | None = None
    monte_carlo: MonteCarloBlock | None = None
    trade_study: TradeStudyBlock | None = None

    @model_validator(mode="after")
    def _review_blocks(self):
        # Unique scenario and measurement names, calibration needs measurements: the checks
        # live with the blocks (finkit.case.review_blocks.ReviewBlocks).
        ReviewBlocks.model_validate(
            {
                "scenarios": self.scenarios,
                "touch": self.touch,
                "measurements": self.measurements,
                "calibration": self.calibration,
            }
        )
        fan = self.air.flow.fan
        for scenario in self.scenarios:
            needs_fan = [
                name
                for name in ("failed_fans", "fan_speed_ratio", "fan_pressure_factor")
                if getattr(scenario, name) is not None
            ]
            if needs_fan and fan is None:
                raise _fail(
                    f"scenario {scenario.name!r}: {', '.join(needs_fan)} need a fan (air.flow.fan)"
                )
            if scenario.failed_fans is not None and fan is not None:
                if scenario.failed_fans >= fan.count:
                    raise _fail(
                        f"scenario {scenario.name!r}: failed_fans must be below the fan count "
                        f"{fan.count} (got {scenario.failed_fans})"
                    )
        return self

    @field_validator("sweeps")
    @classmethod
    def _unique_sweeps(cls, value):
        repeated = sorted({s for s in value if value.count(s) > 1})
        if repeated:
            raise _fail(f"each sweep may appear once (got {', '.join(repeated)} more than once)")
        return value


# --------------------------------------------------------------------------------------------
# single-fin kind

_PROFILE_FIELDS = {
    "rectangular": ({"length", "thickness"}, {"width"}),
    "triangular": ({"length", "thickness"}, {"width"}),
    "parabolic": ({"length", "thickness"}, {"width"}),
    "pin": ({"length", "diameter"}, set()),
    "conical-pin": ({"length", "diameter"}, set()),
    "annular": ({"inner_radius", "outer_radius", "thickness"}, set()),
}
_GEOMETRY_FIELDS = ("length", "thickness", "width", "diameter", "inner_radius", "outer_radius")
_TIPS = {
    "rectangular": ("convective", "adiabatic", "prescribed", "infinite"),
    "pin": ("convective", "adiabatic", "prescribed", "infinite"),
    "annular": ("convective", "adiabatic"),
}


class Fin(_Model):
    """One fin: profile, dimensions [m], material and finish keys, tip condition.

    ``width`` [m] defaults to 1 m (results per metre of width) for rectangular, triangular and
    parabolic profiles. ``tip`` defaults to ``convective`` for rectangular, pin and annular fins
    and is ``None`` for the pointed profiles (triangular, parabolic, conical-pin).
    ``tip_temperature`` [K] is given only with ``tip: prescribed``.
    """

    profile: Literal["rectangular", "pin", "annular", "triangular", "parabolic", "conical-pin"]
    length: Length | None = None
    thickness: Length | None = None
    width: Length | None = None
    diameter: Length | None = None
    inner_radius: Length | None = None
    outer_radius: Length | None = None
    material: Key
    finish: Key = "bare"
    tip: Literal["convective", "adiabatic", "prescribed", "infinite"] | None = None
    tip_temperature: Temperature | None = None

    @model_validator(mode="after")
    def _profile(self):
        required, optional = _PROFILE_FIELDS[self.profile]
        problems = []
        for name in _GEOMETRY_FIELDS:
            given = getattr(self, name) is not None
            if name in required and not given:
                problems.append((name, f"missing (required for a {self.profile} fin)"))
            elif given and name not in required | optional:
                hint = " (use inner_radius and outer_radius)" if self.profile == "annular" else ""
                problems.append((name, f"not used by a {self.profile} fin{hint}; remove it"))
        if self.profile == "annular" and None not in (self.inner_radius, self.outer_radius):
            if self.outer_radius <= self.inner_radius:
                problems.append(
                    (
                        "outer_radius",
                        f"must be larger than inner_radius {_fmt(self.inner_radius, 'length')} "
                        f"(got {_fmt(self.outer_radius, 'length')})",
                    )
                )
        allowed_tips = _TIPS.get(self.profile)
        if allowed_tips is None and self.tip is not None:
            problems.append(("tip", f"a {self.profile} fin ends in a point; remove tip"))
        elif allowed_tips is not None and self.tip is not None and self.tip not in allowed_tips:
            problems.append(
                (
                    "tip",
                    f"not available for a {self.profile} fin (got '{self.tip}'; "
                    f"allowed: {', '.join(allowed_tips)})",
                )
            )
        if self.tip == "prescribed" and self.tip_temperature is None:
            problems.append(("tip_temperature", "missing (required with tip 'prescribed')"))
        if self.tip != "prescribed" and self.tip_temperature is not None:
            problems.append(("tip_temperature", "only used with tip 'prescribed'; remove it"))
        if problems:
            raise _fail_many(problems)
        if self.width is None and "width" in optional:
            object.__setattr__(self, "width", 1.0)
        if self.tip is None and allowed_tips is not None:
            object.__setattr__(self, "tip", "convective")
        return self


class Conditions(_Model):
    """Base and ambient temperature [K] and heat transfer coefficient [W m⁻² K⁻¹]."""

    base_temperature: Temperature
    ambient_temperature: Temperature
    heat_transfer_coefficient: HeatTransferCoefficient


class Study(_Model):
    """Optional comparison over material keys and heat transfer coefficients [W m⁻² K⁻¹]."""

    materials: list[Key] = []
    heat_transfer_coefficients: list[HeatTransferCoefficient] = []

    @model_validator(mode="after")
    def _not_empty(self):
        if not self.materials and not self.heat_transfer_coefficients:
            raise _fail("give materials, heat_transfer_coefficients or both (got neither)")
        return self


class SingleFinCase(Case):
    """One fin at a prescribed base temperature (``kind: single-fin``)."""

    kind: Literal["single-fin"]
    fin: Fin
    conditions: Conditions
    study: Study | None = None
    limit: SingleFinLimit | None = None


_ROOTS: dict[str, type[Case]] = {"heat-sink": HeatSinkCase, "single-fin": SingleFinCase}


class _Common(BaseModel):
    """What can be checked when ``kind`` itself is wrong."""

    model_config = ConfigDict(extra="ignore")
    case_id: Annotated[str, BeforeValidator(_case_id)]
    title_block: TitleBlock


# --------------------------------------------------------------------------------------------
# Reading and error messages


#: Deepest nesting a case file may have (a real case nests four or five levels).
MAX_DEPTH = 40
#: Largest case file read [bytes].
MAX_CASE_BYTES = 2_000_000


class _UniqueKeyLoader(yaml.SafeLoader):
    """SafeLoader that refuses a key given twice in one mapping (PyYAML keeps the last), YAML
    aliases (``*name``: an alias bomb would expand without bound) and deep nesting."""

    def compose_node(self, parent, index):
        if self.check_event(yaml.AliasEvent):
            mark = self.peek_event().start_mark
            raise CaseError(
                [
                    f"case file: YAML anchors and aliases (&name, *name) are not accepted "
                    f"(line {mark.line + 1}); write the values out"
                ]
            )
        self._depth = getattr(self, "_depth", 0) + 1
        try:
            if self._depth > MAX_DEPTH:
                mark = self.peek_event().start_mark
                raise CaseError(
                    [f"case file: nested more than {MAX_DEPTH} levels deep (line {mark.line + 1})"]
                )
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


def text_keys() -> frozenset[str]:
    """Keys whose values are text in the case models (``Text`` fields, and ``case_id``).

    The case loader and the variant-table reader keep a plain value under one of these keys as
    the text the user typed, so that a revision ``1.10`` is not read as the number 1.1.
    """
    global _TEXT_KEYS
    if _TEXT_KEYS is None:
        text_validator = get_args(Text)[1].func
        found, seen = {"case_id"}, set()

        def walk(model):
            if model in seen:
                return
            seen.add(model)
            for name, info in model.model_fields.items():
                marks = list(info.metadata)
                stack = [info.annotation]
                while stack:
                    annotation = stack.pop()
                    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
                        walk(annotation)
                    if get_origin(annotation) is Annotated:
                        marks += get_args(annotation)[1:]
                    stack.extend(get_args(annotation))
                if any(getattr(m, "func", None) is text_validator for m in marks):
                    found.add(info.alias or name)

        for model in (HeatSinkCase, SingleFinCase):
            walk(model)
        _TEXT_KEYS = frozenset(found)
    return _TEXT_KEYS


_TEXT_KEYS: frozenset[str] | None = None

#: YAML's implicit tags that would turn a text field's value into something else: revision
#: ``1.10`` into 1.1, ``010`` into 8, ``NO`` into false, ``2024-05-01`` into a date. (``null``
#: and ``~`` keep their meaning: no value.)
_RETYPED_TAGS = frozenset(f"tag:yaml.org,2002:{t}" for t in ("int", "float", "bool", "timestamp"))


def _construct_mapping(loader, node, deep=False):
    seen = {}
    for key_node, value_node in node.value:
        # A plain scalar under a text key stays the text the user typed.
        if (
            isinstance(value_node, yaml.ScalarNode)
            and value_node.style is None
            and value_node.tag in _RETYPED_TAGS
            and value_node.value != ""
            and isinstance(key_node, yaml.ScalarNode)
            and key_node.value in text_keys()
        ):
            value_node.tag = "tag:yaml.org,2002:str"
    for key_node, _ in node.value:
        key = loader.construct_object(key_node, deep=deep)
        if not isinstance(key, str | int | float | bool) and key is not None:
            raise CaseError(
                [
                    f"case file: a key must be plain text (line {key_node.start_mark.line + 1}, "
                    f"got a {type(key).__name__})"
                ]
            )
        if key in seen:
            raise CaseError(
                [
                    f"{key}: given twice in the same block (lines {seen[key] + 1} and "
                    f"{key_node.start_mark.line + 1}); keep one"
                ]
            )
        seen[key] = key_node.start_mark.line
    return loader.construct_mapping(node, deep=deep)


_UniqueKeyLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)


def _looks_like_path(text: str) -> bool:
    if "\n" in text:
        return False
    if text.strip().endswith((".yaml", ".yml")):
        return True
    try:
        return len(text) < 4096 and Path(text).is_file()
    except OSError:
        return False


def _read(source) -> tuple[dict, Path | None]:
    path = None
    if isinstance(source, Mapping):
        return copy.deepcopy(dict(source)), None
    if isinstance(source, Path) or (isinstance(source, str) and _looks_like_path(source)):
        path = Path(source)
        try:
            data_bytes = path.read_bytes()
        except FileNotFoundError:
            raise CaseError([f"case file: not found (got '{path}')"]) from None
        except OSError as exc:
            raise CaseError([f"case file: cannot be read (got '{path}': {exc.strerror})"]) from None
        if len(data_bytes) > MAX_CASE_BYTES:
            raise CaseError(
                [f"case file: {len(data_bytes)} bytes; at most {MAX_CASE_BYTES} are read"]
            )
        try:
            text = data_bytes.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise CaseError(
                [
                    f"case file: not UTF-8 text (byte 0x{data_bytes[exc.start]:02x} at offset "
                    f"{exc.start}); save it as UTF-8"
                ]
            ) from None
    elif isinstance(source, str):
        text = source
    else:
        raise CaseError(
            [f"case: expected a YAML file path, YAML text or a dict (got {type(source).__name__})"]
        )
    if len(text) > MAX_CASE_BYTES:
        raise CaseError([f"case: {len(text)} characters; at most {MAX_CASE_BYTES} are read"])
    try:
        data = yaml.load(text, Loader=_UniqueKeyLoader)  # noqa: S506 - SafeLoader subclass
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark
        where = f" at line {mark.line + 1}, column {mark.column + 1}" if mark else ""
        raise CaseError([f"case file: YAML syntax error{where}: {exc.problem}"]) from None
    except yaml.YAMLError as exc:
        raise CaseError([f"case file: YAML syntax error: {exc}"]) from None
    if not isinstance(data, dict):
        got = "an empty file" if data is None else f"{type(data).__name__} {_shown(data)}"
        raise CaseError([f"case file: expected a mapping of keys at the top (got {got})"])
    return data, path


def _unwrap(annotation):
    while True:
        origin = get_origin(annotation)
        if origin is Annotated:
            annotation = get_args(annotation)[0]
        elif origin in (Union, types.UnionType):
            args = [a for a in get_args(annotation) if a is not type(None)]
            if len(args) != 1:
                return annotation
            annotation = args[0]
        else:
            return annotation


def _annotation_at(root, loc):
    annotation = root
    for part in loc:
        annotation = _unwrap(annotation)
        origin = get_origin(annotation)
        if isinstance(annotation, type) and issubclass(annotation, BaseModel):
            field = annotation.model_fields.get(part) if isinstance(part, str) else None
            if field is None:
                return None
            annotation = field.annotation
        elif origin is list and isinstance(part, int):
            annotation = get_args(annotation)[0]
        elif origin is dict:
            annotation = get_args(annotation)[1]
        else:
            return None
    return _unwrap(annotation)


def _path(loc) -> str:
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        else:
            out += f".{part}" if out else str(part)
    return out


def _join(path: str, message: str) -> str:
    return f"{path}: {message}" if path else message


def _describe(error: dict, root) -> list[str]:
    loc, kind, value = tuple(error["loc"]), error["type"], error.get("input")
    path = _path(loc)
    if kind == "finkit":
        return [_join(path, error["ctx"]["message"])]
    if kind == "finkit_many":
        return [
            _join(f"{path}.{sub}" if path and sub else (sub or path), message)
            for sub, message in json.loads(error["ctx"]["problems"])
        ]
    if kind == "missing":
        return [_join(path, "missing (required)")]
    if kind == "extra_forbidden":
        parent = _annotation_at(root, loc[:-1])
        allowed = list(parent.model_fields) if isinstance(parent, type) else []
        close = difflib.get_close_matches(str(loc[-1]), allowed, n=1)
        hint = f"; did you mean '{close[0]}'?" if close else ""
        return [_join(path, f"unknown key{hint} (allowed: {', '.join(allowed)})")]
    if kind in ("model_type", "model_attributes_type", "dict_type"):
        target = _annotation_at(root, loc)
        keys = ""
        if isinstance(target, type) and issubclass(target, BaseModel):
            keys = f"; keys: {', '.join(target.model_fields)}"
        return [_join(path, f"expected a mapping (got {_shown(value)}{keys})")]
    if kind == "literal_error":
        target = _annotation_at(root, loc)
        allowed = get_args(target) if get_origin(target) is Literal else ()
        shown = ", ".join(allowed) if allowed else error["ctx"].get("expected", "")
        return [_join(path, f"not allowed (got {_shown(value)}; allowed: {shown})")]
    if kind == "list_type":
        return [_join(path, f"expected a list (got {_shown(value)})")]
    if kind in ("string_type", "str_type"):
        return [_join(path, f"expected text (got {_shown(value)})")]
    return [_join(path, f"{error['msg']} (got {_shown(value)})")]


def _errors_of(exc: ValidationError, root) -> list[str]:
    lines: list[str] = []
    for error in exc.errors(include_url=False):
        lines.extend(_describe(error, root))
    return lines


# --------------------------------------------------------------------------------------------
# Checks across sections (run on the raw data, so they appear together with field errors)


def _get(data, *keys):
    for key in keys:
        if isinstance(key, int) and isinstance(data, list) and -len(data) <= key < len(data):
            data = data[key]
        elif isinstance(key, str) and isinstance(data, dict) and key in data:
            data = data[key]
        else:
            return None
    return data


def _si(data, kind, *keys):
    value = _get(data, *keys)
    try:
        return None if value is None else to_si(value, kind, "")
    except InputError:
        return None


def _materials_module():
    try:
        from finkit.physics.properties import materials
    except ImportError:  # the materials table is not there: the model will report it
        return None
    return materials


def _validated_user_materials(entries: Mapping[str, UserMaterial]) -> dict[str, dict]:
    """Check ``materials:`` entries against the material table; return them as SI mappings.

    The mappings are the case-file form that ``get_material(key, user_materials)`` accepts.
    Raises :class:`CaseError` naming ``materials.<key>`` for each entry the table refuses (e.g. a
    new key without thermal_conductivity, or an unknown finish).
    """
    user = {key: entry.model_dump() for key, entry in entries.items()}
    module = _materials_module()
    if not user or module is None:
        return user
    errors = []
    for key, entry in user.items():
        try:
            module.get_material(key, {key: entry})
        except InputError as exc:
            text = str(exc)
            for prefix in (f"user_materials[{key!r}]: ", f"{key}: "):
                if text.startswith(prefix):
                    text = text[len(prefix) :]
            errors.append(f"materials.{key}: {text}")
    if errors:
        raise CaseError(errors)
    return user


def _raw_user_materials(raw, out: list[str]):
    """User materials built from the raw data, or ``None`` if they cannot be built."""
    entries = raw.get("materials")
    if not entries:
        return {}
    try:
        valid = TypeAdapter(dict[Key, UserMaterial]).validate_python(entries)
    except ValidationError:
        return None  # reported by the main pass
    try:
        return _validated_user_materials(valid)
    except CaseError as exc:
        out.extend(exc.errors)
        return None


def _check_material(raw, user, path: tuple, finish_path=None, *, has_emissivity=False, out):
    """Check a material key (and a finish for it) against the material table."""
    module = _materials_module()
    key = _get(raw, *path)
    if module is None or not isinstance(key, str) or not key.strip():
        return
    key = key.strip()
    if user is None:
        if key in (raw.get("materials") or {}):
            return  # the user's own entry is invalid and reported already
        user = {}
    table = module.list_materials(user)
    if key not in table:
        out.append(f"{_path(path)}: unknown material (got '{key}'; allowed: {', '.join(table)})")
        return
    if finish_path is None:
        return
    finish = _get(raw, *finish_path)
    if finish is None and raw.get("kind") == "single-fin":
        finish = "bare"
    if not isinstance(finish, str):
        return
    finish = finish.strip()
    material = module.get_material(key, user)
    if finish in material.emissivity:
        return
    if has_emissivity and finish in module.FINISHES:
        return  # the emissivity is given explicitly, the finish is only a label
    allowed = ", ".join(material.emissivity) or "none"
    out.append(
        f"{_path(finish_path)}: not available for material '{key}' (got '{finish}'; "
        f"allowed: {allowed}; or give the emissivity)"
        if _path(finish_path) == "sink.finish"
        else f"{_path(finish_path)}: not available for material '{key}' (got '{finish}'; "
        f"allowed: {allowed})"
    )


def _present(block) -> set[str]:
    return {k for k, v in block.items() if v is not None} if isinstance(block, dict) else set()


def _structure_heat_sink(raw) -> tuple[list[str], dict]:
    """Block-level rules checked on the raw data; returns messages and the data for pydantic.

    A block that the sink type does not use is reported here and left out of the data given to
    pydantic, so that its contents do not produce a second round of messages.
    """
    out: list[str] = []
    interface = _get(raw, "source", "interface")
    if isinstance(interface, dict):
        problem = _interface_problem(_present(interface))
        if problem:
            out.append(_join("source.interface", problem))
    flow = _get(raw, "air", "flow")
    if isinstance(flow, dict):
        problem = _flow_problem(_present(flow))
        if problem:
            out.append(_join("air.flow", problem))
    sink = raw.get("sink")
    if isinstance(sink, dict) and sink.get("type") in ("plate-fin", "pin-fin"):
        problems = _sink_block_problems(
            sink["type"], sink.get("fins") is not None, sink.get("pins") is not None
        )
        out += [_join(f"sink.{sub}", message) for sub, message in problems]
        unused = "pins" if sink["type"] == "plate-fin" else "fins"
        if unused in sink:
            raw = {**raw, "sink": {k: v for k, v in sink.items() if k != unused}}
    return out, raw


def _positive(value):
    return value if value is not None and value > 0 else None


def _cross_checks_heat_sink(raw) -> list[str]:
    out: list[str] = []
    flow = _get(raw, "air", "flow")
    sink_type = _get(raw, "sink", "type")
    is_natural = isinstance(flow, dict) and "natural" in flow
    if is_natural and sink_type == "pin-fin":
        out.append(
            "air.flow.natural: natural convection is not supported for sink.type 'pin-fin' in "
            "this version (got pin-fin; allowed: plate-fin)"
        )
    if is_natural and _get(raw, "air", "bypass") is not None:
        out.append("air.bypass: applies to forced flow only (air.flow is natural); remove it")

    inlet = _si(raw, "temperature", "air", "inlet_temperature")
    limit = _si(raw, "temperature", "limit", "temperature")
    if inlet is not None and limit is not None and limit <= inlet:
        out.append(
            f"limit.temperature: must be above air.inlet_temperature (got "
            f"{_fmt(limit, 'temperature')}; air.inlet_temperature is {_fmt(inlet, 'temperature')})"
        )

    for side, base_side in (("footprint_length", "length"), ("footprint_width", "width")):
        fp = _positive(_si(raw, "length", "source", side))
        base = _positive(_si(raw, "length", "sink", "base", base_side))
        if fp is not None and base is not None and fp > base:
            out.append(
                f"source.{side}: larger than sink.base.{base_side} (got {_fmt(fp, 'length')}; "
                f"sink.base.{base_side} is {_fmt(base, 'length')})"
            )

    sweeps = raw.get("sweeps")
    if isinstance(sweeps, list):
        for i, name in enumerate(sweeps):
            if name == "airflow" and is_natural:
                out.append(f"sweeps[{i}]: 'airflow' needs forced flow (air.flow is natural)")
            if name in ("fin_count", "fin_thickness") and sink_type == "pin-fin":
                out.append(f"sweeps[{i}]: '{name}' applies to plate-fin sinks only")

    user = _raw_user_materials(raw, out)
    has_emissivity = _get(raw, "sink", "emissivity") is not None
    _check_material(
        raw, user, ("sink", "material"), ("sink", "finish"), has_emissivity=has_emissivity, out=out
    )
    return out


def _cross_checks_single_fin(raw) -> list[str]:
    out: list[str] = []
    ambient = _si(raw, "temperature", "conditions", "ambient_temperature")
    limit = _si(raw, "temperature", "limit", "temperature")
    if ambient is not None and limit is not None and limit <= ambient:
        out.append(
            f"limit.temperature: must be above conditions.ambient_temperature (got "
            f"{_fmt(limit, 'temperature')}; conditions.ambient_temperature is "
            f"{_fmt(ambient, 'temperature')})"
        )
    user = _raw_user_materials(raw, out)
    _check_material(raw, user, ("fin", "material"), ("fin", "finish"), out=out)
    keys = _get(raw, "study", "materials")
    if isinstance(keys, list):
        for i in range(len(keys)):
            _check_material(raw, user, ("study", "materials", i), out=out)
    return out


_CROSS_CHECKS = {"heat-sink": _cross_checks_heat_sink, "single-fin": _cross_checks_single_fin}


# --------------------------------------------------------------------------------------------
# Public functions


def load_case(source) -> HeatSinkCase | SingleFinCase:
    """Read and validate a case; every physical value of the result is an SI float.

    Parameters
    ----------
    source : str, pathlib.Path or dict
        Path to a YAML file (``.yaml``/``.yml``), YAML text, or the case as a dict
        (e.g. the dictionary injected into a notebook). [-]

    Returns
    -------
    HeatSinkCase or SingleFinCase
        The validated, frozen case. ``case.entered`` holds the case as written.

    Raises
    ------
    CaseError
        With ``.errors``, one line per problem (all problems at once), e.g.
        ``sink.fins.thickness: expected a length, got '3 W'``.
    """
    raw, path = _read(source)
    kind = raw.get("kind")
    if kind not in _ROOTS:
        got = "missing" if kind is None else f"not allowed (got {_shown(kind)}"
        message = (
            "kind: missing (required; allowed: heat-sink, single-fin)"
            if kind is None
            else f"kind: {got}; allowed: heat-sink, single-fin)"
        )
        errors = [message]
        try:
            _Common.model_validate(raw)
        except ValidationError as exc:
            errors += _errors_of(exc, _Common)
        raise CaseError(errors)

    root = _ROOTS[kind]
    errors: list[str] = []
    previous = raw.get("previous_revision")
    if path is not None and isinstance(previous, dict) and isinstance(previous.get("source"), str):
        if not Path(previous["source"]).is_absolute():
            # Relative to the case file, kept absolute so that a note (which receives the case
            # as a mapping) finds it too.
            where = str((path.parent / previous["source"]).resolve())
            raw = {**raw, "previous_revision": {**previous, "source": where}}
    data = raw
    if kind == "heat-sink":
        errors, data = _structure_heat_sink(raw)
    case = None
    try:
        case = root.model_validate(data)
    except ValidationError as exc:
        errors += _errors_of(exc, root)
    errors += _CROSS_CHECKS[kind](raw)
    if errors:
        raise CaseError(list(dict.fromkeys(errors)))
    case._entered = copy.deepcopy(raw)
    case._source_path = path
    return case


def case_inputs_sha256(case: Case) -> str:
    """SHA-256 (hex) of the canonical JSON of the validated SI content of a case.

    Canonical: every float rounded to 12 significant figures, then ``json.dumps`` with sorted
    keys, no spaces, UTF-8. Two case files that differ only in units, comments, key order or
    defaults written out give the same digest. ``case.entered`` is not part of it.

    Parameters
    ----------
    case : Case
        A validated case from :func:`load_case`. [-]

    Returns
    -------
    str
        64 hexadecimal characters.
    """
    content = _rounded(case.model_dump(mode="json", exclude={"previous_revision"}))
    text = json.dumps(
        content, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False
    )
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _rounded(value):
    """Floats to 12 significant figures, so that unit round-off (221 degF -> 378.15000000000003 K)
    does not change the digest."""
    if isinstance(value, float):
        return float(f"{value:.12g}")
    if isinstance(value, dict):
        return {k: _rounded(v) for k, v in value.items()}
    if isinstance(value, list):
        return [_rounded(v) for v in value]
    return value


def read_case(source) -> dict:
    """A case as entered (a mapping, unit strings kept) from a path, YAML text or a mapping.

    Reads and parses only; :func:`load_case` validates.
    """
    return _read(source)[0]
