"""What an operating scenario changes: its definition, combining scenarios, reading them from
a case's blocks, and the text of its changes (solving them is :mod:`finkit.model.review.scenarios`).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.physics.airflow.operating_point import power_law_pressure_drop

__all__ = [
    "FilterLoss",
    "Scenario",
    "combine_scenarios",
    "scenario_changes",
    "scenarios_from_blocks",
]

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
        """Pressure drop at a volume flow [Pa] (:func:`.airflow.power_law_pressure_drop`).

        Parameters
        ----------
        volume_flow : float or array_like
            Volume flow through the filter. [m³ s⁻¹]
        """
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

    Parameters
    ----------
    name : str
        Name of the combined scenario. [-]
    description : str
        Its description. [-]
    parts : sequence of Scenario
        The scenarios applied together. [-]

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

    Parameters
    ----------
    blocks : sequence of ScenarioBlock
        The case's validated ``scenarios`` blocks (SI). [-]
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


def scenario_changes(scenario: Scenario) -> tuple[str, ...]:
    """What a scenario changes from nominal, one readable item each (SI shown in °C, m, W).

    Parameters
    ----------
    scenario : Scenario
        The scenario. [-]
    """
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
