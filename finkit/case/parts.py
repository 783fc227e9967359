"""Field types and the parts every case shares (title block, limit, interface, material)."""

from __future__ import annotations

import re
from typing import Annotated

from pydantic import (
    BaseModel,
    BeforeValidator,
)

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
from finkit.errors import InputError
from finkit.physics.properties.atmosphere import (
    ALTITUDE_RANGE,
)  # the standard atmosphere's range [m]

__all__ = [
    "Altitude",
    "AreaResistance",
    "CASE_KINDS",
    "CaseError",
    "Conductivity",
    "CurveFlow",
    "CurvePressure",
    "Density",
    "Emissivity",
    "Factor",
    "Gap",
    "HeatTransferCoefficient",
    "Key",
    "Length",
    "Power",
    "SWEEP_NAMES",
    "Temperature",
    "TemperatureDifference",
    "ThermalResistance",
    "TitleBlock",
    "UserMaterial",
    "Velocity",
    "VolumeFlow",
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
SpecificHeat = _quantity("specific_heat", gt=0.0)
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

    For a new key ``thermal_conductivity`` [W m⁻¹ K⁻¹] is required (``name``, ``density``
    [kg m⁻³] and ``specific_heat`` [J kg⁻¹ K⁻¹] are optional); for a built-in key every value
    is optional and replaces the built-in one.
    ``emissivity`` maps a finish (``bare``, ``anodised-black``, ...) to its emissivity [-].
    ``source`` says where the values come from (printed in the note).
    """

    name: Text | None = None
    thermal_conductivity: Conductivity | None = None
    density: Density | None = None
    specific_heat: SpecificHeat | None = None
    emissivity: dict[Key, Emissivity] = {}
    source: Text
