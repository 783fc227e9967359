"""The explorer's controls: what each one sets in a case, its unit, range and step."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from finkit.case.units import from_si

__all__ = ["CONTROL_NAMES", "ControlSpec", "control_specs", "source_power_control"]

#: Every control an explorer may show, in display order (a case shows those that apply).
CONTROL_NAMES = (
    "fin_count",
    "fin_height",
    "fin_thickness",
    "pin_diameter",
    "pin_height",
    "transverse_pitch",
    "longitudinal_pitch",
    "base_thickness",
    "material",
    "finish",
    "fan_pressure_factor",
    "fan_count",
    "volume_flow",
    "approach_velocity",
    "inlet_temperature",
    "altitude",
    "power",
)

# Blocks that do not change the nominal result; left out of the live solve (kept when saving).
_NOT_NOMINAL = (
    "scenarios", "touch", "tolerances", "monte_carlo", "trade_study", "sweeps", "transient",
)  # fmt: skip

# Unit symbols shown in control descriptions.
_SYMBOL = {
    "mm": "mm",
    "degC": "°C",
    "W": "W",
    "m": "m",
    "CFM": "CFM",
    "m/s": "m/s",
    "-": "-",
    "in": "in",
    "degF": "°F",
    "ft": "ft",
    "ft/min": "ft/min",
}

#: Display unit systems of the explorer (:meth:`Explorer.set_unit_system`).
UNIT_SYSTEMS = ("SI", "US")
#: US customary display unit and slider step for each SI display unit of a control (the
#: others, CFM, W, counts and factors, are the same in both systems).
_US_UNIT = {"mm": ("in", 0.005), "degC": ("degF", 1.0), "m": ("ft", 100.0), "m/s": ("ft/min", 10.0)}
#: Units of the numbers and plots in each system: temperature, temperature difference, length,
#: pressure.
_DISPLAY = {
    "SI": {"temperature": "degC", "difference": "K", "length": "mm", "pressure": "Pa"},
    "US": {"temperature": "degF", "difference": "°F", "length": "in", "pressure": "inH2O"},
}


def _convert(value: float, kind: str, unit_from: str, unit_to: str) -> float:
    """A display value from one unit to another (temperatures with their offsets)."""
    if unit_from == unit_to:
        return float(value)
    from finkit.case.units import to_si

    return float(from_si(to_si(f"{float(value)!r} {unit_from}", kind, "explorer"), kind, unit_to))


@dataclass(frozen=True)
class ControlSpec:
    """One control of the explorer: where its value goes in the case and how it is shown.

    Attributes
    ----------
    name : str
        Control name, one of :data:`CONTROL_NAMES`.
    path : tuple of str
        Path of the value in the case mapping, e.g. ``("sink", "fins", "height")``.
    label : str
        Text before the unit in the description.
    kind : str or None
        Quantity kind of :mod:`finkit.case.units` (``length``, ``temperature``, ...); None for a
        count, a factor or a key.
    unit : str
        Display unit of the control (``mm``, ``degC``, ``W``, ``m``, ``CFM``, ``m/s``, ``-``).
    minimum, maximum, step : float
        Slider range and step in the display unit (unused for keys).
    value : Any
        Start value in the display unit (the case's value).
    """

    name: str
    path: tuple[str, ...]
    label: str
    kind: str | None
    unit: str
    minimum: float
    maximum: float
    step: float
    value: Any

    @property
    def description(self) -> str:
        """``"Fin height [mm]"``: the label and its unit."""
        return f"{self.label} [{_SYMBOL.get(self.unit, self.unit)}]"

    def entered(self, value) -> Any:
        """The value as a case file would hold it: ``"27.5 mm"``, ``14``, ``0.9``, a key.

        Parameters
        ----------
        value : float or str
            The control's value. [the control's unit, :attr:`unit`]
        """
        if self.kind is None:
            if self.unit == "-" and isinstance(self.value, int | np.integer):
                return int(round(value))
            return value if isinstance(value, str) else float(format(float(value), ".6g"))
        return f"{float(value):.6g} {self.unit}"


def _round_to(value: float, step: float) -> float:
    return float(np.round(value / step) * step)


def _slider_range(value: float, low: float, high: float, step: float) -> tuple[float, float]:
    """A range that holds ``value``, rounded to ``step``."""
    lo = min(_round_to(low, step), value)
    hi = max(_round_to(high, step), value)
    return max(lo, step), hi


def _length(name, path, label, si, low, high, step=0.1) -> ControlSpec:
    mm = float(from_si(si, "length", "mm"))
    lo, hi = _slider_range(mm, low, high, step)
    return ControlSpec(name, path, label, "length", "mm", lo, hi, step, mm)


def control_specs(case) -> list[ControlSpec]:
    """The controls of a validated heat-sink case, with ranges around its values.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        A validated case. [-]

    Returns
    -------
    list of ControlSpec
        In the order of :data:`CONTROL_NAMES`; only those that apply to the case. [-]

    Notes
    -----
    Ranges are wide enough for exploration and are not limits of the models: a combination
    the case schema rejects (fins that do not fit, pins that touch) is reported by the
    explorer, not prevented by the sliders.
    """
    # Long by design: a table: one ControlSpec per control the case offers, in display order.
    s = case.sink
    specs: list[ControlSpec] = []
    if s.type == "plate-fin":
        f = s.fins
        width_mm = float(from_si(s.base.width, "length", "mm"))
        n_max = max(2 * f.count, f.count + 10)
        n_max = int(min(n_max, max(f.count, np.floor(width_mm / 1.0))))
        specs.append(
            ControlSpec(
                "fin_count", ("sink", "fins", "count"), "Fin count", None, "-", 2, n_max, 1, f.count
            )
        )
        h_mm, t_mm = f.height * 1e3, f.thickness * 1e3
        specs.append(
            _length(
                "fin_height",
                ("sink", "fins", "height"),
                "Fin height",
                f.height,
                3.0,
                max(2.5 * h_mm, 60.0),
                0.5,
            )
        )
        specs.append(
            _length(
                "fin_thickness",
                ("sink", "fins", "thickness"),
                "Fin thickness",
                f.thickness,
                0.3,
                max(3.0 * t_mm, 4.0),
                0.1,
            )
        )
    else:
        p = s.pins
        d_mm = p.diameter * 1e3
        for name, key, label, si, low, high, step in (
            ("pin_diameter", "diameter", "Pin diameter", p.diameter, 0.5, max(3 * d_mm, 8.0), 0.1),
            ("pin_height", "height", "Pin height", p.height, 3.0, max(2.5e3 * p.height, 60.0), 0.5),
            (
                "transverse_pitch",
                "transverse_pitch",
                "Pitch across the flow",
                p.transverse_pitch,
                1.0,
                max(2.5e3 * p.transverse_pitch, 20.0),
                0.1,
            ),
            (
                "longitudinal_pitch",
                "longitudinal_pitch",
                "Pitch along the flow",
                p.longitudinal_pitch,
                1.0,
                max(2.5e3 * p.longitudinal_pitch, 20.0),
                0.1,
            ),
        ):
            specs.append(_length(name, ("sink", "pins", key), label, si, low, high, step))
    tb_mm = s.base.thickness * 1e3
    specs.append(
        _length(
            "base_thickness",
            ("sink", "base", "thickness"),
            "Base thickness",
            s.base.thickness,
            1.0,
            max(3.0 * tb_mm, 15.0),
            0.5,
        )
    )
    specs.append(
        ControlSpec("material", ("sink", "material"), "Material", None, "key", 0, 0, 0, s.material)
    )
    specs.append(
        ControlSpec("finish", ("sink", "finish"), "Finish", None, "key", 0, 0, 0, s.finish)
    )
    flow = case.air.flow
    if flow.fan is not None:
        specs.append(
            ControlSpec(
                "fan_pressure_factor",
                ("air", "flow", "fan", "pressure_factor"),
                "Fan pressure factor",
                None,
                "-",
                min(0.3, flow.fan.pressure_factor),
                max(1.5, flow.fan.pressure_factor),
                0.01,
                float(flow.fan.pressure_factor),
            )
        )
        specs.append(
            ControlSpec(
                "fan_count",
                ("air", "flow", "fan", "count"),
                f"Fans ({flow.fan.arrangement})",
                None,
                "-",
                1,
                max(4, flow.fan.count),
                1,
                int(flow.fan.count),
            )
        )
    elif flow.volume_flow is not None:
        cfm = float(from_si(flow.volume_flow, "volume_flow", "CFM"))
        lo, hi = _slider_range(cfm, 0.2 * cfm, 3.0 * cfm, 0.1)
        specs.append(
            ControlSpec(
                "volume_flow",
                ("air", "flow", "volume_flow"),
                "Volume flow",
                "volume_flow",
                "CFM",
                lo,
                hi,
                0.1,
                cfm,
            )
        )
    elif flow.approach_velocity is not None:
        v = float(flow.approach_velocity)
        lo, hi = _slider_range(v, 0.2 * v, 3.0 * v, 0.05)
        specs.append(
            ControlSpec(
                "approach_velocity",
                ("air", "flow", "approach_velocity"),
                "Approach velocity",
                "velocity",
                "m/s",
                lo,
                hi,
                0.05,
                v,
            )
        )
    t_in = float(from_si(case.air.inlet_temperature, "temperature", "degC"))
    limit = float(from_si(case.limit.temperature, "temperature", "degC"))
    specs.append(
        ControlSpec(
            "inlet_temperature",
            ("air", "inlet_temperature"),
            "Inlet air",
            "temperature",
            "degC",
            min(-20.0, t_in),
            max(_round_to(limit, 1.0), t_in),
            0.5,
            t_in,
        )
    )
    altitude = float(case.air.altitude)
    specs.append(
        ControlSpec(
            "altitude",
            ("air", "altitude"),
            "Altitude",
            "length",
            "m",
            min(0.0, altitude),
            max(5000.0, altitude),
            50.0,
            altitude,
        )
    )
    if case.sources:
        # several sources: one power control each (``power_<name>``)
        for source in case.sources:
            power = float(source.power)
            step = 0.1 if power < 20 else 0.5
            lo, hi = _slider_range(power, 0.1 * power, 3.0 * power, step)
            specs.append(
                ControlSpec(
                    source_power_control(source.name),
                    ("sources", source.name, "power"),
                    f"Power, {source.name}",
                    "power",
                    "W",
                    lo,
                    hi,
                    step,
                    power,
                )
            )
        return specs
    power = float(case.source.power)
    step = 0.1 if power < 20 else 0.5
    lo, hi = _slider_range(power, 0.1 * power, 3.0 * power, step)
    specs.append(
        ControlSpec("power", ("source", "power"), "Power", "power", "W", lo, hi, step, power)
    )
    return specs


def source_power_control(name: str) -> str:
    """Name of the power control of the source ``name`` (several sources) [-].

    Parameters
    ----------
    name : str
        The source's name in the case. [-]
    """
    return "power_" + "".join(c if c.isalnum() else "_" for c in name)


def _item(node, key):
    """``node[key]``, or the item of a list named ``key`` (a source); None when absent."""
    if isinstance(node, dict):
        return node.get(key)
    if isinstance(node, list):
        return next((x for x in node if isinstance(x, dict) and x.get("name") == key), None)
    return None


def _get(mapping: dict, path: tuple[str, ...]):
    node = mapping
    for key in path:
        node = _item(node, key)
        if node is None:
            return None
    return node


def _set(mapping: dict, path: tuple[str, ...], value) -> None:
    node = mapping
    for key in path[:-1]:
        node = _item(node, key) if isinstance(node, list) else node.setdefault(key, {})
    node[path[-1]] = value


def _nominal(mapping: dict) -> dict:
    """The case mapping without the blocks that do not change the nominal result."""
    out = {k: v for k, v in mapping.items() if k not in _NOT_NOMINAL}
    calibration = out.get("calibration")
    if not (isinstance(calibration, dict) and calibration.get("apply")):
        out.pop("calibration", None)
        out.pop("measurements", None)
    return out


def _empty(ax) -> None:
    """Remove what an update drew, keeping the axes and their ticks (much faster than clear)."""
    for artist in [*ax.lines, *ax.patches, *ax.texts, *ax.collections]:
        artist.remove()
    legend = ax.get_legend()
    if legend is not None:
        legend.remove()
    ax.set_autoscale_on(True)
