"""Case-file blocks for design exploration: ``tolerances:``, ``monte_carlo:`` and ``trade_study:``.

These pydantic models validate the blocks and convert their values to SI with
:func:`finkit.case.units.to_si`; :func:`to_tolerances`, :func:`to_bounds`, :func:`to_envelope` and
:func:`to_trade_axes` turn them into the objects of :mod:`finkit.model.uncertainty` and
:mod:`finkit.model.trade`. Every problem is one line naming the field (:func:`explore_errors`).

``tolerances:`` -- one entry per input that varies (names of
:data:`finkit.model.uncertainty.TOLERANCE_INPUTS`). Each entry gives a ``distribution`` and exactly
one width: ``relative`` (a fraction or percentage of the nominal value), ``absolute`` (in the
input's unit; a temperature *difference* for the inlet temperature), or ``low`` and ``high``
(absolute bounds). For ``normal``, ``sigmas`` says how many standard deviations the width
stands for (default 1). ``source`` records where the tolerance comes from::

    tolerances:
      heat_transfer: {distribution: normal, relative: 20 %, sigmas: 2,
                      source: "correlation scatter, common practice"}
      interface_resistance: {distribution: uniform, low: 0.03 K/W, high: 0.08 K/W}
      power: {distribution: normal, relative: 5 %}
      inlet_temperature: {distribution: triangular, absolute: 3 K}
      fan_pressure: {distribution: uniform, relative: 10 %}

``monte_carlo:`` -- optional settings: ``samples`` (default 100000), ``seed`` (default 0),
``sampling`` (``random`` or ``latin-hypercube``), ``tornado_coverage`` (default 95 %).

``trade_study:`` -- the design variables and limits::

    trade_study:
      fin_count: {low: 8, high: 30}            # every count, or values: [10, 12, 14]
      fin_height: {low: 10 mm, high: 40 mm, points: 11}
      fin_thickness: {low: 0.8 mm, high: 2 mm, points: 7}
      max_height: 45 mm                        # overall, base included
      bounds: {min_fin_gap: 1.5 mm, min_fin_thickness: 0.8 mm, max_fin_aspect_ratio: 10}
      objective: lightest-meeting-limit        # or coolest, or pareto
      pareto: [sink_resistance, pressure_drop, mass]

Pin-fin sinks use ``pin_diameter``, ``pin_height``, ``transverse_pitch`` and (optionally)
``longitudinal_pitch`` instead of the three fin variables. With ``sampling: latin-hypercube``
(or ``sobol``, ``random``) and ``samples: N`` the ranges are sampled instead of gridded (then
``points`` is not used).
"""

from __future__ import annotations

import json
from typing import Annotated, Literal

import numpy as np
from pydantic import (
    BeforeValidator,
    ValidationError,
    model_validator,
)

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.case.fields import StrictModel, fail, fail_many, quantity, whole
from finkit.case.units import to_si
from finkit.errors import InputError
from finkit.tolerance import TOLERANCE_INPUTS, Tolerance

__all__ = [
    "BoundsBlock",
    "ExploreError",
    "MAX_SAMPLES",
    "MonteCarloBlock",
    "RangeBlock",
    "ToleranceEntry",
    "TolerancesBlock",
    "TradeStudyBlock",
    "explore_errors",
    "load_monte_carlo",
    "load_tolerances",
    "load_trade_study",
    "to_bounds",
    "to_envelope",
    "to_tolerances",
    "to_trade_axes",
]


class ExploreError(InputError):
    """A ``tolerances:``, ``monte_carlo:`` or ``trade_study:`` block that does not validate.

    Attributes
    ----------
    errors : list of str
        One line per problem, ``block.field: what is wrong``.
    """

    def __init__(self, errors: list[str]):
        self.errors = list(errors)
        super().__init__("\n".join(self.errors))


_fail, _fail_many = fail, fail_many


def _raw(kind: str):
    """Keep the value as written (str or number) after checking it converts to ``kind``.

    The conversion that needs the input's kind (a tolerance's unit depends on the input it
    belongs to) happens in the parent model; this only rejects non-scalars early.
    """

    def check(value):
        if isinstance(value, bool) or not isinstance(value, (str, int, float)):
            raise _fail(f"expected a number or a number with a unit (got {value!r})")
        return value

    return Annotated[str | float, BeforeValidator(check)]


def _si(kind: str, *, ge: float | None = None, gt: float | None = None):
    return quantity(kind, ge=ge, gt=gt)


_whole = whole


_Model = StrictModel


# --------------------------------------------------------------------------------------
# tolerances:
# --------------------------------------------------------------------------------------


class ToleranceEntry(_Model):
    """One input's tolerance, values as written (converted by :class:`TolerancesBlock`)."""

    distribution: Literal["normal", "uniform", "triangular"]
    relative: _si("dimensionless", ge=0.0) | None = None
    absolute: _raw("any") | None = None
    low: _raw("any") | None = None
    high: _raw("any") | None = None
    sigmas: _si("dimensionless", gt=0.0) = 1.0
    truncation: _si("dimensionless", gt=0.0) | None = 4.0
    source: str = ""

    @model_validator(mode="after")
    def _one_form(self):
        forms = [n for n in ("relative", "absolute") if getattr(self, n) is not None]
        given = [n for n in ("low", "high") if getattr(self, n) is not None]
        if given:
            forms.append("low and high")
        problems = []
        if len(forms) != 1:
            problems.append(
                (
                    "",
                    "give exactly one of: relative | absolute | low and high "
                    f"(got {', '.join(forms) if forms else 'none'})",
                )
            )
        elif len(given) == 1:
            missing = "high" if given[0] == "low" else "low"
            problems.append((missing, f"missing (needed with {given[0]})"))
        if self.distribution != "normal" and self.sigmas != 1.0:
            problems.append(("sigmas", "applies to distribution 'normal' only"))
        if problems:
            raise _fail_many(problems)
        return self


class TolerancesBlock(_Model):
    """The ``tolerances:`` block: one optional entry per input of
    :data:`finkit.model.uncertainty.TOLERANCE_INPUTS`."""

    heat_transfer: ToleranceEntry | None = None
    fan_pressure: ToleranceEntry | None = None
    pressure_drop: ToleranceEntry | None = None
    airflow: ToleranceEntry | None = None
    power: ToleranceEntry | None = None
    interface_resistance: ToleranceEntry | None = None
    junction_to_case: ToleranceEntry | None = None
    inlet_temperature: ToleranceEntry | None = None
    thermal_conductivity: ToleranceEntry | None = None

    @model_validator(mode="after")
    def _forms_and_units(self):
        problems = []
        for name, spec in TOLERANCE_INPUTS.items():
            entry = getattr(self, name)
            if entry is None:
                continue
            if entry.relative is not None and not spec.allows_relative:
                problems.append(
                    (f"{name}.relative", f"not allowed for {name}; give absolute or low and high")
                )
            if entry.relative is None and not spec.allows_absolute:
                problems.append((name, f"only a relative tolerance is allowed for {name}"))
                continue
            for field, kind in (
                ("absolute", spec.difference_kind),
                ("low", spec.kind),
                ("high", spec.kind),
            ):
                value = getattr(entry, field)
                if value is None:
                    continue
                try:
                    x = to_si(value, kind, "")
                except InputError as exc:
                    problems.append((f"{name}.{field}", str(exc)))
                    continue
                if field == "absolute" and x < 0:
                    problems.append((f"{name}.{field}", f"must be at least 0 (got {value!r})"))
        if not problems:
            for name in TOLERANCE_INPUTS:
                entry = getattr(self, name)
                if entry is not None and entry.low is not None and entry.high is not None:
                    kind = TOLERANCE_INPUTS[name].kind
                    if to_si(entry.low, kind, "") > to_si(entry.high, kind, ""):
                        problems.append((f"{name}.low", "must not exceed high"))
        if problems:
            raise _fail_many(problems)
        return self


def to_tolerances(block: TolerancesBlock) -> dict[str, Tolerance]:
    """The :class:`~finkit.model.uncertainty.Tolerance` of every input named in the block (SI).

    Parameters
    ----------
    block : TolerancesBlock
        The validated ``tolerances:`` block. [-]
    """
    out = {}
    for name, spec in TOLERANCE_INPUTS.items():
        entry = getattr(block, name)
        if entry is None:
            continue
        absolute = (
            None if entry.absolute is None else to_si(entry.absolute, spec.difference_kind, name)
        )
        low = None if entry.low is None else to_si(entry.low, spec.kind, name)
        high = None if entry.high is None else to_si(entry.high, spec.kind, name)
        out[name] = Tolerance(
            distribution=entry.distribution,
            relative=entry.relative,
            absolute=absolute,
            low=low,
            high=high,
            sigmas=entry.sigmas,
            truncation=entry.truncation,
            source=entry.source,
        )
    return out


#: Most Monte Carlo samples a case may ask for: one vectorised solve holds every sample in
#: memory (about 2 kB each with a fan), so 10^6 samples stay near 2 GB.
MAX_SAMPLES = 1_000_000


_MonteCarloSamples = _whole(1, MAX_SAMPLES)


class MonteCarloBlock(_Model):
    """The ``monte_carlo:`` block: sample count, seed, sampling, tornado coverage."""

    samples: _MonteCarloSamples = 100_000
    seed: _whole(0) = 0
    sampling: Literal["random", "latin-hypercube"] = "random"
    tornado_coverage: _si("dimensionless", gt=0.0) = 0.95

    @model_validator(mode="after")
    def _coverage(self):
        if self.tornado_coverage > 1.0:
            raise _fail_many([("tornado_coverage", "must be at most 100 %")])
        return self


# --------------------------------------------------------------------------------------
# trade_study:
# --------------------------------------------------------------------------------------


class RangeBlock(_Model):
    """Values of one design variable: ``values: [...]`` or ``low``, ``high`` (, ``points``)."""

    values: list[str | float] | None = None
    low: str | float | None = None
    high: str | float | None = None
    points: _whole(1) | None = None

    @model_validator(mode="after")
    def _one_form(self):
        has_range = self.low is not None or self.high is not None
        if (self.values is not None) == has_range:
            raise _fail("give exactly one of: values | low and high")
        if has_range and (self.low is None or self.high is None):
            raise _fail_many([("high" if self.high is None else "low", "missing")])
        if self.values is not None and (self.points is not None or not self.values):
            raise _fail("values: a non-empty list, without points")
        return self

    def array(self, kind: str, field: str, *, default_points: int = 9) -> np.ndarray:
        """The values in SI; a count range without ``points`` gives every whole number.

        Parameters
        ----------
        kind : str
            Kind of quantity, as in :func:`finkit.case.units.to_si` (``"count"`` for a
            whole number). [-]
        field : str
            Field path of the range, e.g. ``trade_study.fin_height``, for messages. [-]
        default_points : int, optional
            Number of values of a ``low``/``high`` range without ``points``. [-]
        """
        if self.values is not None:
            return np.array([to_si(v, kind, f"{field}.values") for v in self.values], float)
        lo, hi = to_si(self.low, kind, f"{field}.low"), to_si(self.high, kind, f"{field}.high")
        if hi < lo:
            raise InputError(f"{field}.high: must not be below low ({self.high!r} < {self.low!r})")
        if kind == "count" or field.endswith("fin_count"):
            if self.points is None:
                return np.arange(np.ceil(lo), np.floor(hi) + 1.0)
            return np.unique(np.round(np.linspace(lo, hi, self.points)))
        return np.linspace(lo, hi, self.points or default_points)

    def pair(self, kind: str, field: str) -> tuple[float, float]:
        """(low, high) in SI, for sampling.

        Parameters
        ----------
        kind : str
            Kind of quantity, as in :func:`finkit.case.units.to_si`. [-]
        field : str
            Field path of the range, e.g. ``trade_study.fin_height``, for messages. [-]
        """
        if self.values is not None:
            v = self.array(kind, field)
            return float(v.min()), float(v.max())
        return to_si(self.low, kind, f"{field}.low"), to_si(self.high, kind, f"{field}.high")


class BoundsBlock(_Model):
    """Manufacturing bounds; defaults are those of :class:`finkit.case.bounds.ManufacturingBounds`
    (common practice, no source)."""

    min_fin_gap: _si("length", ge=0.0) = ManufacturingBounds.min_fin_gap
    min_fin_thickness: _si("length", ge=0.0) = ManufacturingBounds.min_fin_thickness
    max_fin_aspect_ratio: _si("dimensionless", gt=0.0) = ManufacturingBounds.max_fin_aspect_ratio
    min_pin_diameter: _si("length", ge=0.0) = ManufacturingBounds.min_pin_diameter
    min_pin_gap: _si("length", ge=0.0) = ManufacturingBounds.min_pin_gap
    max_pin_aspect_ratio: _si("dimensionless", gt=0.0) = ManufacturingBounds.max_pin_aspect_ratio


_PLATE_AXES = ("fin_count", "fin_height", "fin_thickness")
_PIN_AXES = ("pin_diameter", "pin_height", "transverse_pitch", "longitudinal_pitch")
_PARETO = (
    "sink_resistance",
    "total_resistance",
    "junction_temperature",
    "limit_node_temperature",
    "pressure_drop",
    "mass",
)


class TradeStudyBlock(_Model):
    """The ``trade_study:`` block (see the module docstring)."""

    fin_count: RangeBlock | None = None
    fin_height: RangeBlock | None = None
    fin_thickness: RangeBlock | None = None
    pin_diameter: RangeBlock | None = None
    pin_height: RangeBlock | None = None
    transverse_pitch: RangeBlock | None = None
    longitudinal_pitch: RangeBlock | None = None
    sampling: Literal["grid", "latin-hypercube", "sobol", "random"] = "grid"
    samples: _whole(1) | None = None
    seed: _whole(0) = 0
    max_height: _si("length", gt=0.0) | None = None
    bounds: BoundsBlock = BoundsBlock()
    objective: Literal["coolest", "lightest-meeting-limit", "pareto"] = "pareto"
    pareto: list[Literal[_PARETO]] = ["sink_resistance", "pressure_drop", "mass"]  # type: ignore[valid-type]

    @model_validator(mode="after")
    def _variables(self):
        plate = [n for n in _PLATE_AXES if getattr(self, n) is not None]
        pin = [n for n in _PIN_AXES if getattr(self, n) is not None]
        problems = []
        if plate and pin:
            problems.append(("", "give plate-fin variables or pin-fin variables, not both"))
        elif plate and len(plate) != 3:
            missing = [n for n in _PLATE_AXES if n not in plate]
            problems += [(n, "missing (plate-fin trade studies vary all three)") for n in missing]
        elif pin and not all(getattr(self, n) is not None for n in _PIN_AXES[:3]):
            missing = [n for n in _PIN_AXES[:3] if getattr(self, n) is None]
            problems += [
                (n, "missing (pin-fin trade studies vary at least these)") for n in missing
            ]
        elif not plate and not pin:
            problems.append(("", "give the design variables (fin_count, fin_height, ...)"))
        if self.sampling != "grid" and self.samples is None:
            problems.append(("samples", f"required with sampling '{self.sampling}'"))
        if self.sampling == "grid" and self.samples is not None:
            problems.append(("samples", "only used with sampling other than 'grid'"))
        if len(set(self.pareto)) != len(self.pareto) or len(self.pareto) < 2:
            problems.append(("pareto", "give two or more different objectives"))
        if problems:
            raise _fail_many(problems)
        return self

    @property
    def sink_type(self) -> str:
        """``plate-fin`` or ``pin-fin``, from the variables given."""
        return "plate-fin" if self.fin_count is not None else "pin-fin"


def to_bounds(block: TradeStudyBlock | BoundsBlock) -> ManufacturingBounds:
    """The :class:`~finkit.case.bounds.ManufacturingBounds` of a block (SI).

    Parameters
    ----------
    block : TradeStudyBlock or BoundsBlock
        A validated ``trade_study:`` block (its ``bounds``) or a ``bounds`` block. [-]
    """
    b = block.bounds if isinstance(block, TradeStudyBlock) else block
    return ManufacturingBounds(**b.model_dump())


def to_envelope(block: TradeStudyBlock, inputs) -> Envelope:
    """The :class:`~finkit.case.bounds.Envelope`: the case's base and the block's ``max_height``.

    Parameters
    ----------
    block : TradeStudyBlock
        The validated ``trade_study:`` block. [-]
    inputs : object
        The case's inputs, anything with a ``geometry`` (e.g.
        :class:`finkit.model.design.SinkInputs`). [-]
    """
    return Envelope.of(inputs, block.max_height)


def to_trade_axes(block: TradeStudyBlock) -> dict[str, np.ndarray | tuple[float, float]]:
    """Design variables in SI: arrays for a grid, (low, high) pairs for sampling.

    Parameters
    ----------
    block : TradeStudyBlock
        The validated ``trade_study:`` block. [-]
    """
    names = _PLATE_AXES if block.sink_type == "plate-fin" else _PIN_AXES
    out = {}
    for name in names:
        r = getattr(block, name)
        if r is None:
            continue
        kind = "dimensionless" if name == "fin_count" else "length"
        field = f"trade_study.{name}"
        out[name] = r.array(kind, field) if block.sampling == "grid" else r.pair(kind, field)
    return out


# --------------------------------------------------------------------------------------
# Loading and messages
# --------------------------------------------------------------------------------------


def _path(prefix: str, loc) -> str:
    parts = [prefix] + [str(p) for p in loc if p != ""]
    return ".".join(parts)


def explore_errors(exc: ValidationError, prefix: str) -> list[str]:
    """One line per problem of a validation error, ``prefix.path.to.field: message``.

    Parameters
    ----------
    exc : pydantic.ValidationError
        The error raised by validating a block. [-]
    prefix : str
        Name of the block, put before every field path, e.g. ``tolerances``. [-]
    """
    lines = []
    for err in exc.errors():
        loc = [p for p in err["loc"] if not str(p).startswith(("function-", "union["))]
        loc = [p for p in loc if p not in ("str", "float", "int")]
        if err["type"] == "finkit_many":
            for field, message in json.loads(err["ctx"]["problems"]):
                lines.append(f"{_path(prefix, [*loc, field])}: {message}")
            continue
        if err["type"] == "finkit":
            message = err["ctx"]["message"]
        elif err["type"] == "extra_forbidden":
            message = "unknown field"
        elif err["type"] == "missing":
            message = "missing"
        elif err["type"] == "literal_error":
            message = f"got {err['input']!r}; allowed: {err['ctx']['expected']}"
        else:
            message = err["msg"]
        lines.append(f"{_path(prefix, loc)}: {message}")
    return list(dict.fromkeys(lines))


def _load(model, data, prefix):
    if not isinstance(data, dict):
        raise ExploreError([f"{prefix}: expected a mapping (got {type(data).__name__})"])
    try:
        return model.model_validate(data)
    except ValidationError as exc:
        raise ExploreError(explore_errors(exc, prefix)) from None


def load_tolerances(data: dict) -> TolerancesBlock:
    """Validate a ``tolerances:`` mapping; raises :class:`ExploreError` (one line per problem).

    Parameters
    ----------
    data : dict
        The ``tolerances:`` mapping as entered (unit strings kept). [-]
    """
    return _load(TolerancesBlock, data, "tolerances")


def load_monte_carlo(data: dict) -> MonteCarloBlock:
    """Validate a ``monte_carlo:`` mapping; raises :class:`ExploreError`.

    Parameters
    ----------
    data : dict
        The ``monte_carlo:`` mapping as entered. [-]
    """
    return _load(MonteCarloBlock, data, "monte_carlo")


def load_trade_study(data: dict) -> TradeStudyBlock:
    """Validate a ``trade_study:`` mapping; raises :class:`ExploreError`.

    Parameters
    ----------
    data : dict
        The ``trade_study:`` mapping as entered (unit strings kept). [-]
    """
    return _load(TradeStudyBlock, data, "trade_study")
