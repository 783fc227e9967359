"""The single-fin case: a fin profile, its conditions and the study it asks for."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import (
    BaseModel,
    BeforeValidator,
    ConfigDict,
    model_validator,
)

from finkit.case.heat_sink import (
    Case,
    HeatSinkCase,
    SingleFinLimit,
)
from finkit.case.parts import (
    HeatTransferCoefficient,
    Key,
    Length,
    Temperature,
    TitleBlock,
    _case_id,
    _fail,
    _fail_many,
    _fmt,
    _Model,
)

__all__ = [
    "Conditions",
    "Fin",
    "SingleFinCase",
    "Study",
]


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
