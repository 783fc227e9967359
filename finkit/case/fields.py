"""Field types shared by the case-file schema and its optional blocks (pydantic v2).

Every value written with a unit is converted to SI once, here at the boundary
(:func:`finkit.case.units.to_si`); a bad value becomes a one-line message that the case loader
prefixes with the field's path. Used by :mod:`finkit.case.schema`, :mod:`finkit.case.review_blocks`
and
:mod:`finkit.case.explore_blocks`.
"""

from __future__ import annotations

import json
import math
from collections.abc import Mapping
from typing import Annotated, Any, NamedTuple, get_args

from pydantic import BaseModel, BeforeValidator, ConfigDict, Field
from pydantic_core import PydanticCustomError

from finkit.case.units import format_quantity, to_si
from finkit.errors import InputError

__all__ = [
    "SHOW_UNIT",
    "StrictModel",
    "Text",
    "fail",
    "fail_at",
    "fail_many",
    "format_bound",
    "UnitKind",
    "quantity",
    "shown",
    "unit_kind_at",
    "whole",
]

#: Unit in which a bound of each kind is printed in an error message.
SHOW_UNIT = {
    "length": "mm",
    "temperature": "degC",
    "temperature_difference": "K",
    "area": "mm^2",
    "thermal_resistance": "K/W",
    "area_resistance": "K*m^2/W",
    "power": "W",
    "velocity": "m/s",
    "volume_flow": "m^3/s",
    "pressure": "Pa",
    "density": "kg/m^3",
    "specific_heat": "J/kg/K",
    "heat_capacity": "J/K",
    "time": "s",
    "thermal_conductivity": "W/m/K",
    "heat_transfer_coefficient": "W/m^2/K",
    "dimensionless": "",
}


class StrictModel(BaseModel):
    """A block of a case file: unknown keys are errors; validated blocks are immutable."""

    model_config = ConfigDict(extra="forbid", frozen=True)


def fail(message: str) -> PydanticCustomError:
    """A field's problem, reported as its one-line message.

    Parameters
    ----------
    message : str
        The one-line message. [-]
    """
    return PydanticCustomError("finkit", "{message}", {"message": message})


def fail_many(problems: list[tuple[str, str]]) -> PydanticCustomError:
    """Several problems found by one model check: (field relative to the model, message).

    Parameters
    ----------
    problems : list of (str, str)
        (field relative to the model, one-line message) of each problem. [-]
    """
    return PydanticCustomError("finkit_many", "{problems}", {"problems": json.dumps(problems)})


def fail_at(field: str, message: str) -> PydanticCustomError:
    """One problem of a model check, placed on one of the model's fields.

    Parameters
    ----------
    field : str
        Name of the field, relative to the model. [-]
    message : str
        The one-line message. [-]
    """
    return fail_many([(field, message)])


def shown(value) -> str:
    """A value as the user wrote it, for a message.

    Parameters
    ----------
    value : object
        The value as written in the case file. [-]
    """
    return f"'{value}'" if isinstance(value, str) else repr(value)


def format_bound(value_si: float, kind: str, unit: str | None = None) -> str:
    """A quantity in the unit a message shows for its kind (``unit`` overrides).

    Parameters
    ----------
    value_si : float
        The quantity in SI (the SI unit of its kind). [SI unit of kind]
    kind : str
        Kind of quantity, a key of :data:`SHOW_UNIT`. [-]
    unit : str, optional
        Display unit, e.g. ``"mm"``; None: ``SHOW_UNIT[kind]``. [-]
    """
    return format_quantity(value_si, kind, SHOW_UNIT[kind] if unit is None else unit)


#: Unit symbols named in the hint for an implausible bare number, by kind.
_SI_WORDS = {"length": "metres", "volume_flow": "m^3/s", "velocity": "m/s"}


class UnitKind(NamedTuple):
    """The unit kind of a quantity field (a key of :data:`finkit.case.units.KINDS`), carried in
    the field's type, so that a reader of a validated case knows each number's unit from the
    schema rather than from the field's name (:func:`unit_kind_at`)."""

    kind: str


def unit_kind_at(case: BaseModel, path: tuple) -> str | None:
    """The unit kind of the field at ``path`` in a validated case, from its type.

    Parameters
    ----------
    case : pydantic.BaseModel
        A validated case (or any part of one). [-]
    path : tuple
        Keys (field names) and list indexes from ``case`` to the field, as in the case file. [-]

    Returns
    -------
    str or None
        The field's :class:`UnitKind` (a key of :data:`finkit.case.units.KINDS`); None when the
        field is not a quantity (a count, a factor, a name) or the path does not lead to a
        field of a model. [-]
    """
    node: Any = case
    for depth, key in enumerate(path):
        last = depth == len(path) - 1
        if isinstance(node, BaseModel) and isinstance(key, str):
            field = type(node).model_fields.get(key)
            if field is None:
                return None
            if last:
                return _kind_in(field.metadata) or _kind_in_type(field.annotation)
            node = getattr(node, key)
        elif isinstance(key, int) and isinstance(node, list | tuple) and key < len(node):
            node = node[key]
        elif isinstance(node, Mapping) and key in node:
            node = node[key]
        else:
            return None
    return None


def _kind_in(metadata) -> str | None:
    return next((m.kind for m in metadata if isinstance(m, UnitKind)), None)


def _kind_in_type(annotation) -> str | None:
    """The UnitKind inside an annotation (``Quantity``, ``tuple[Quantity, ...]``, ``X | None``)."""
    found = _kind_in(getattr(annotation, "__metadata__", ()))
    if found:
        return found
    for arg in get_args(annotation):
        found = _kind_in_type(arg)
        if found:
            return found
    return None


def quantity(
    kind: str,
    *,
    gt=None,
    ge=None,
    le=None,
    show: str | None = None,
    bare_max: float | None = None,
    hint: str = "",
):
    """A float field given with a unit in the case file and stored in SI.

    ``gt``/``ge``/``le`` are bounds in SI; ``show`` is the unit used to print a bound. A bare
    number (no unit) above ``bare_max`` [SI] is refused with a hint that it was read in SI and
    probably meant ``hint`` (``fin height: 30 m ... did you mean '30 mm'?``).

    Parameters
    ----------
    kind : str
        Kind of quantity, as in :func:`finkit.case.units.to_si`. [-]
    gt : float, optional
        The value must be greater than this. [SI unit of kind]
    ge : float, optional
        The value must be at least this. [SI unit of kind]
    le : float, optional
        The value must be at most this. [SI unit of kind]
    show : str, optional
        Display unit of a bound in a message; None: ``SHOW_UNIT[kind]``. [-]
    bare_max : float, optional
        Largest bare number (no unit) accepted; None: no such check. [SI unit of kind]
    hint : str, optional
        Unit suggested for a refused bare number, e.g. ``"mm"``. [-]
    """

    def limit(bound: float) -> str:
        return "0" if bound == 0 else format_bound(bound, kind, show)

    def convert(value):
        try:
            x = to_si(value, kind, "")
        except InputError as exc:
            raise fail(str(exc)) from None
        if not math.isfinite(x):
            raise fail(f"must be a finite number (got {shown(value)})")
        is_bare = isinstance(value, int | float) and not isinstance(value, bool)
        if bare_max is not None and is_bare and x > bare_max:
            raise fail(
                f"{value:g} {_SI_WORDS.get(kind, 'SI')} is implausible here: bare numbers are SI "
                f"{_SI_WORDS.get(kind, 'units')}; did you mean '{value:g} {hint}'?"
            )
        if gt is not None and not x > gt:
            raise fail(f"must be greater than {limit(gt)} (got {shown(value)})")
        if ge is not None and not x >= ge:
            raise fail(f"must be at least {limit(ge)} (got {shown(value)})")
        if le is not None and not x <= le:
            raise fail(f"must be at most {limit(le)} (got {shown(value)})")
        return x

    unit = show or SHOW_UNIT.get(kind, "")
    return Annotated[
        float,
        UnitKind(kind),
        BeforeValidator(convert, json_schema_input_type=float | str),
        Field(
            description=f"{kind.replace('_', ' ')}: a number with a unit, e.g. '1 {unit}' "
            "(a bare number is SI)"
        ),
    ]


def whole(minimum: int, maximum: int | None = None):
    """A whole-number field of at least ``minimum`` and at most ``maximum`` (``3.0`` is 3).

    Parameters
    ----------
    minimum : int
        Smallest value allowed. [-]
    maximum : int, optional
        Largest value allowed; None: no upper limit. [-]
    """

    def convert(value):
        ok = isinstance(value, int) and not isinstance(value, bool)
        if isinstance(value, float) and value.is_integer():
            value, ok = int(value), True
        if not ok or value < minimum:
            raise fail(f"must be a whole number of at least {minimum} (got {shown(value)})")
        if maximum is not None and value > maximum:
            raise fail(f"must be at most {maximum} (got {value})")
        return value

    return Annotated[int, BeforeValidator(convert, json_schema_input_type=int | float)]


def _text(value):
    if isinstance(value, bool) or value is None:
        raise fail(f"expected text (got {shown(value)})")
    if isinstance(value, (int, float)):
        value = str(value)
    if not isinstance(value, str) or not value.strip():
        raise fail(f"expected non-empty text (got {shown(value)})")
    return value.strip()


#: Non-empty text (numbers are taken as their text), stripped.
Text = Annotated[str, BeforeValidator(_text, json_schema_input_type=str | int | float)]
