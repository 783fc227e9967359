"""The heat-sink case: sink, source, air and flow, and the optional blocks."""

from __future__ import annotations

import copy
from pathlib import Path
from typing import Literal

from pydantic import (
    PrivateAttr,
    field_validator,
    model_validator,
)

from finkit.case.explore_blocks import MonteCarloBlock, TolerancesBlock, TradeStudyBlock
from finkit.case.fields import (
    Text,
)
from finkit.case.parts import (
    _FLOW_FORMS,
    SWEEP_NAMES,
    Altitude,
    AreaResistance,
    Conductivity,
    CurveFlow,
    CurvePressure,
    Density,
    Emissivity,
    Factor,
    Gap,
    Key,
    Length,
    Power,
    Temperature,
    TemperatureDifference,
    ThermalResistance,
    TitleBlock,
    UserMaterial,
    Velocity,
    VolumeFlow,
    _case_id,
    _fail,
    _fail_many,
    _flow_problem,
    _fmt,
    _given,
    _interface_problem,
    _Model,
    _sink_block_problems,
    _whole,
)
from finkit.case.review_blocks import (
    CalibrationBlock,
    HeatTransferCoefficientOverride,
    JunctionToCaseBasis,
    MeasurementBlock,
    Name,
    PreheatAllowance,
    ReviewBlocks,
    ScenarioBlock,
    TouchBlock,
)
from finkit.case.transient_block import TransientBlock

__all__ = [
    "Air",
    "Base",
    "Bypass",
    "Case",
    "Fan",
    "Fins",
    "Flow",
    "HeatSinkCase",
    "Interface",
    "Limit",
    "Natural",
    "Pins",
    "PreviousRevision",
    "SingleFinLimit",
    "Sink",
    "Source",
    "SourceOnBase",
    "SourceLimit",
    "Spreader",
]


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
        """Interface resistance [K W⁻¹] over a contact area [m²] (the source footprint).

        Parameters
        ----------
        area : float
            Contact area, the source footprint. [m²]
        """
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


class SourceLimit(_Model):
    """A source's own limit: node, temperature [K] and required margin [K] below it."""

    node: Literal["junction", "case", "base"]
    temperature: Temperature
    required_margin: TemperatureDifference = 0.0
    requirement_id: Text | None = None


class SourceOnBase(_Model):
    """One of several sources on the base (``sources:``), placed where it sits.

    ``centre_along`` is the distance of the footprint centre from the inlet edge of the base
    (natural convection, vertical fins: from the lower edge; fins up on a horizontal base:
    from the edge where ``base.length`` starts), ``centre_across`` from the left side edge
    looking downstream (upward) [m]. ``footprint_length`` lies along the flow. Without its own
    ``limit`` the case's ``limit`` applies to the source.
    """

    name: Name
    power: Power
    footprint_length: Length
    footprint_width: Length
    centre_along: Length
    centre_across: Length
    junction_to_case: ThermalResistance = 0.0
    junction_to_case_basis: JunctionToCaseBasis | None = None
    interface: Interface
    limit: SourceLimit | None = None


class Spreader(_Model):
    """A base that spreads heat better than its metal: a vapour chamber or heat pipes.

    Represented by effective conductivities [W m⁻¹ K⁻¹] in the plane of the base and through
    its thickness, taken from the supplier (``source`` says where). These do not capture
    dry-out, orientation against gravity or the heat-pipe power limit.
    """

    kind: Literal["vapour-chamber", "heat-pipes"]
    in_plane_conductivity: Conductivity
    through_conductivity: Conductivity
    source: Text


class Base(_Model):
    """Base plate [m]: width across the flow, length along it, thickness; optional spreader."""

    width: Length
    length: Length
    thickness: Length
    spreader: Spreader | None = None


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
    """Natural convection (plate fins); ``orientation`` of the sink in still air.

    ``vertical-fins``: base vertical, fins vertical, air rising along the fin length.
    ``horizontal-base-fins-up``: base horizontal, fins standing up from it. Other orientations
    (fins hanging down, horizontal fins on a vertical base) have no correlation finkit could
    confirm and are refused (``finkit.physics.correlations.natural.SUPPORTED_ORIENTATIONS``).
    """

    orientation: Literal["vertical-fins", "horizontal-base-fins-up"]


class FreeConvection(_Model):
    """Credit for free convection beside a weak forced flow (mixed convection), by Churchill's
    combination with n = 3 (finkit.physics.sink.mixed).

    ``orientation``: the sink's natural-convection orientation (one finkit covers);
    ``forced_flow``: the forced flow's direction against gravity, ``upward`` (buoyancy aids it)
    or ``horizontal`` (buoyancy crosses it); a downward flow is refused (buoyancy opposes it and
    no credit is taken). ``radiation``: whether radiation to the surroundings is credited too.
    """

    orientation: Text
    forced_flow: Text
    radiation: bool = False

    @model_validator(mode="after")
    def _known(self):
        from finkit.physics.correlations.natural import SUPPORTED_ORIENTATIONS
        from finkit.physics.sink.inputs import FREE_CONVECTION_DIRECTIONS

        problems = []
        if self.orientation not in SUPPORTED_ORIENTATIONS:
            problems.append(
                (
                    "orientation",
                    f"got '{self.orientation}'; allowed: {', '.join(SUPPORTED_ORIENTATIONS)}",
                )
            )
        if self.forced_flow not in FREE_CONVECTION_DIRECTIONS:
            problems.append(
                (
                    "forced_flow",
                    f"got '{self.forced_flow}'; allowed: {', '.join(FREE_CONVECTION_DIRECTIONS)}"
                    " (a downward flow opposes buoyancy; leave free_convection out, no credit)",
                )
            )
        if problems:
            raise _fail_many(problems)
        return self


class Flow(_Model):
    """How air reaches the sink: exactly one of the four forms.

    ``approach_velocity`` [m s⁻¹] upstream of the sink; ``volume_flow`` [m³ s⁻¹] total flow
    approaching the sink before any bypass; ``fan`` a fan curve; ``natural`` natural convection.
    ``free_convection`` (forced forms only): credit buoyancy and radiation at a weak flow.
    """

    approach_velocity: Velocity | None = None
    volume_flow: VolumeFlow | None = None
    fan: Fan | None = None
    natural: Natural | None = None
    free_convection: FreeConvection | None = None

    @model_validator(mode="after")
    def _one_form(self):
        problem = _flow_problem(_given(self, _FLOW_FORMS))
        if problem:
            raise _fail(problem)
        if self.natural is not None and self.free_convection is not None:
            raise _fail_many(
                [("free_convection", "applies to a forced flow only (air.flow is natural)")]
            )
        return self

    @property
    def mode(self) -> str:
        """Which form was given: ``approach_velocity``, ``volume_flow``, ``fan`` or ``natural``."""
        return _given(self, _FLOW_FORMS)[0]


#: Smallest clearance [m] taken as a bypass gap; below it (and above 0) a gap carries no air
#: worth modelling and its flow network is ill-conditioned (common practice, no source).
SMALLEST_GAP = 5e-5


class Bypass(_Model):
    """Where the air can go round the sink: a duct with clearance, or no duct at all.

    ``side_gap``, ``top_gap`` [m]: clearance between the sink and its duct on each side and
    above the fin tips; a gap is 0 (the duct touches the sink) or at least
    :data:`SMALLEST_GAP`. ``free_stream: true``: no duct, the sink stands unshrouded in the
    approach stream (a board-mounted sink in a system fan's stream); the share of the stream
    through the fins comes from Lee's bypass balance (docs/methods.md h), the fin tips see the
    air, and a given volume flow means the stream's flow through the sink's frontal area.
    Without an ``air.bypass`` block the sink is taken as fully ducted.
    """

    side_gap: Gap = 0.0
    top_gap: Gap = 0.0
    free_stream: bool = False

    @model_validator(mode="after")
    def _real_gaps(self):
        given = sorted({"side_gap", "top_gap"} & self.model_fields_set)
        if self.free_stream and given:
            raise _fail_many(
                [
                    (
                        "free_stream",
                        f"true means no duct round the sink, so {' and '.join(given)} do not "
                        "apply; remove them, or set free_stream: false for a duct with clearance",
                    )
                ]
            )
        problems = [
            (
                name,
                f"{_fmt(getattr(self, name), 'length')} is too small to carry air; write 0 mm "
                f"for no gap, or at least {_fmt(SMALLEST_GAP, 'length')}",
            )
            for name in ("side_gap", "top_gap")
            if 0.0 < getattr(self, name) < SMALLEST_GAP
        ]
        if problems:
            raise _fail_many(problems)
        return self


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
        if (
            self.bypass is not None
            and self.bypass.free_stream
            and self.flow.mode
            in (
                "fan",
                "natural",
            )
        ):
            allowed = "approach_velocity or volume_flow"
            reason = (
                "a fan against an unshrouded sink has no defined system curve (the air goes "
                "round the sink)"
                if self.flow.mode == "fan"
                else "natural convection has no approach stream"
            )
            raise _fail_many(
                [
                    (
                        "bypass.free_stream",
                        f"true needs air.flow {allowed} (got {self.flow.mode}): {reason}",
                    )
                ]
            )
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
    source: Source | None = None
    sources: list[SourceOnBase] = []
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
    transient: TransientBlock | None = None

    @model_validator(mode="after")
    def _one_source_form(self):
        if (self.source is None) == (not self.sources):
            raise _fail(
                "give either source (one device, centred on the base) or sources (a list of "
                "devices, each placed on the base), not both and not neither"
            )
        names = [s.name for s in self.sources]
        repeated = sorted({n for n in names if names.count(n) > 1})
        if repeated:
            raise _fail(f"sources: each name may appear once (got {', '.join(repeated)} twice)")
        base = self.sink.base
        problems = []
        for i, s in enumerate(self.sources):
            for edge, centre, size, side, size_name in (
                ("length", s.centre_along, s.footprint_length, "centre_along", "footprint_length"),
                ("width", s.centre_across, s.footprint_width, "centre_across", "footprint_width"),
            ):
                span = (centre - size / 2, centre + size / 2)
                extent = getattr(base, edge)
                if span[0] < -1e-9 * extent or span[1] > extent * (1 + 1e-9):
                    problems.append(
                        (
                            f"sources[{i}].{side}",
                            f"{_fmt(centre, 'length')} puts {s.name!r} ({size_name} "
                            f"{_fmt(size, 'length')}) over the base edge: its centre must "
                            f"lie within {_fmt(size / 2, 'length')}…"
                            f"{_fmt(extent - size / 2, 'length')} on the base {edge} "
                            f"{_fmt(extent, 'length')}",
                        )
                    )
        if problems:
            raise _fail_many(problems)
        if self.sources:
            unavailable = [
                name
                for name, given in (
                    ("measurements", bool(self.measurements)),
                    ("calibration", self.calibration is not None),
                    ("trade_study", self.trade_study is not None),
                    ("transient", self.transient is not None),
                )
                if given
            ]
            if self.tolerances is not None:
                from finkit.tolerance import ONE_SOURCE_TOLERANCES

                unavailable += [
                    f"tolerances.{name}"
                    for name in ONE_SOURCE_TOLERANCES
                    if getattr(self.tolerances, name) is not None
                ]
            if unavailable:
                raise _fail(
                    f"{', '.join(unavailable)}: not yet available with several sources (they "
                    "act on one source's chain); run them on a single-source case of the same "
                    "sink, or remove them"
                )
        return self

    @property
    def is_multi_source(self) -> bool:
        """True when the case lists several placed sources (``sources``)."""
        return bool(self.sources)

    @property
    def total_power(self) -> float:
        """Power of the one source, or the sum over ``sources`` [W]."""
        if self.sources:
            return float(sum(s.power for s in self.sources))
        return float(self.source.power)

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
        if self.transient is not None:
            names = ["nominal"] + [s.name for s in self.scenarios]
            unknown = [
                (f"transient.{where}", f"no condition named '{name}' (allowed: {', '.join(names)})")
                for where, name in self.transient.condition_names()
                if name not in names
            ]
            if unknown:
                raise _fail_many(unknown)
        return self

    @field_validator("sweeps")
    @classmethod
    def _unique_sweeps(cls, value):
        repeated = sorted({s for s in value if value.count(s) > 1})
        if repeated:
            raise _fail(f"each sweep may appear once (got {', '.join(repeated)} more than once)")
        return value
