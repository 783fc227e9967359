"""Interactive design explorer for a heat-sink case (ipywidgets, in JupyterLab or headless).

``explore(case)`` builds controls from a case -- fin geometry (or pin geometry), base
thickness, material and finish, airflow (fan pressure factor and fan count, or the given volume
flow or approach velocity), inlet air temperature, altitude and power -- and shows, for the
current settings, the headline numbers and four plots: node temperatures against the limit,
allowable power against the inlet air temperature, the fan and system curves with the
operating point (natural convection: the heat carried by convection and by radiation), and
fin efficiency against fin (or pin) height. Every control's description names its
unit; every change recomputes at once (a few vectorised calls, well under a second).

No physics lives here. Each update turns the controls into a case mapping *as entered*
(``"27.5 mm"``, ``"45 degC"``), validates it with :func:`finkit.case.load_case` and solves it
with :func:`finkit.model.run_case`; the curves come from :func:`finkit.model.note_sweep`,
:func:`finkit.model.system_curve` and :func:`finkit.model.fan_pressure`. The numbers shown are
therefore exactly those of ``finkit check`` and ``finkit note`` on the saved case, which
:meth:`Explorer.save_case` writes (units as entered; unchanged fields kept as written).

The nominal design only: operating scenarios, the touch check, tolerances (Monte Carlo), the
trade study and the note's sweeps are left out of the live solve (they are kept in the saved
case). Measurements and calibration are kept when the case applies the calibration.

Example (in a notebook)::

    from finkit.explorer import explore

    explorer = explore("demo_cases/nb200-plate-fan.yaml")
    explorer                       # shows the controls and plots
    explorer.save_case("nb200-taller-fins.yaml")
"""

from __future__ import annotations

import copy
import datetime as _dt
import io
import time
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np

from finkit.case.units import format_quantity, from_si
from finkit.constants import ZERO_CELSIUS
from finkit.errors import FinkitError, InputError, NotSupportedError
from finkit.report import present

__all__ = ["CONTROL_NAMES", "ControlSpec", "Explorer", "explore"]

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
_NOT_NOMINAL = ("scenarios", "touch", "tolerances", "monte_carlo", "trade_study", "sweeps")

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
        """The value as a case file would hold it: ``"27.5 mm"``, ``14``, ``0.9``, a key."""
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
    power = float(case.source.power)
    step = 0.1 if power < 20 else 0.5
    lo, hi = _slider_range(power, 0.1 * power, 3.0 * power, step)
    specs.append(
        ControlSpec("power", ("source", "power"), "Power", "power", "W", lo, hi, step, power)
    )
    return specs


def _get(mapping: dict, path: tuple[str, ...]):
    node = mapping
    for key in path:
        if not isinstance(node, dict) or key not in node:
            return None
        node = node[key]
    return node


def _set(mapping: dict, path: tuple[str, ...], value) -> None:
    node = mapping
    for key in path[:-1]:
        node = node.setdefault(key, {})
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


class Explorer:
    """Controls, headline numbers and live plots for one heat-sink case.

    Build it with :func:`explore`. In a notebook the explorer displays itself (its
    :attr:`widget`); without a front end every method still works, so tests and scripts can
    set controls, call :meth:`update` and read :attr:`numbers`.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase, mapping, str or path-like
        The case: validated, as entered (a dict), a YAML file or YAML text. [-]
    dpi : float, optional
        Resolution of the plot image. [dots per inch]

    Attributes
    ----------
    controls : dict of str to ipywidgets.Widget
        The controls by name (:data:`CONTROL_NAMES`); values in the unit of the description.
    specs : dict of str to ControlSpec
        What each control sets in the case.
    result : finkit.model.CaseResult or None
        The last solved state (None if the last settings could not be solved).
    numbers : dict of str to float
        The numbers shown, in the units of :data:`finkit.model.RESULT_UNITS` (°C, W, K/W,
        m³/s, Pa, kg, -), taken from ``result.results``.
    error : str
        Why the last settings could not be solved ("" when they could).
    seconds : float
        Wall time of the last :meth:`update` (solve and drawing). [s]
    figure : matplotlib.figure.Figure
        The four plots, redrawn by every update.
    """

    #: Numbers shown in the read-out, in order (names of ``CaseResult.results``).
    SHOWN = (
        "limit_node_temperature",
        "temperature_margin",
        "allowable_power",
        "power_at_limit",
        "junction_temperature",
        "case_temperature",
        "source_base_temperature",
        "base_temperature",
        "fin_tip_temperature",
        "sink_resistance",
        "total_resistance",
        "volume_flow",
        "sink_volume_flow",
        "pressure_drop",
        "heat_transfer_coefficient",
        "fin_efficiency",
        "surface_efficiency",
        "mass",
    )

    def __init__(self, case, *, dpi: float = 80.0):
        import ipywidgets as widgets

        from finkit.case.schema import Case, load_case

        validated = case if isinstance(case, Case) else load_case(case)
        if getattr(validated, "kind", None) != "heat-sink":
            raise NotSupportedError(
                f"explorer: case kind {validated.kind!r} is not supported; use a heat-sink case"
            )
        self._case = validated
        self._entered = validated.entered
        self._source = validated.source_path
        self._dpi = float(dpi)
        self.specs = {spec.name: spec for spec in control_specs(validated)}
        self._si_specs = dict(self.specs)
        self.unit_system = "SI"
        self._initial = {name: spec.value for name, spec in self.specs.items()}
        self._hold = False
        self.result = None
        self.numbers: dict[str, float] = {}
        self.error = ""
        self.seconds = 0.0
        self._user_materials = validated.user_materials() or None
        self._surroundings_offset = self._offset(validated)

        style = {"description_width": "190px"}
        layout = widgets.Layout(width="100%", max_width="440px")
        self.controls: dict[str, Any] = {}
        for name, spec in self.specs.items():
            if name == "material":
                control = widgets.Dropdown(
                    options=self._material_options(),
                    value=spec.value,
                    description="Material [k in W/(m·K)]",
                    style=style,
                    layout=layout,
                )
            elif name == "finish":
                control = widgets.Dropdown(
                    options=self._finish_options(self._initial["material"]),
                    value=spec.value,
                    description="Finish [emissivity, -]",
                    style=style,
                    layout=layout,
                )
            elif spec.step == 1 and spec.unit == "-":
                control = widgets.IntSlider(
                    value=int(spec.value),
                    min=int(spec.minimum),
                    max=int(spec.maximum),
                    step=1,
                    description=spec.description,
                    continuous_update=False,
                    style=style,
                    layout=layout,
                )
            else:
                decimals = max(0, -int(np.floor(np.log10(spec.step))))
                control = widgets.FloatSlider(
                    value=float(spec.value),
                    min=float(spec.minimum),
                    max=float(spec.maximum),
                    step=float(spec.step),
                    description=spec.description,
                    readout_format=f".{decimals}f",
                    continuous_update=False,
                    style=style,
                    layout=layout,
                )
            self.controls[name] = control

        self._units = widgets.ToggleButtons(
            options=list(UNIT_SYSTEMS),
            value="SI",
            description="Units",
            tooltips=["SI (mm, °C, m/s, Pa)", "US customary (in, °F, ft/min, inH2O)"],
            style={"description_width": "60px", "button_width": "56px"},
        )
        self._readout = widgets.HTML()
        # No margin: the widgets' default 2 px margins on a 100 % width overflowed the pane by
        # 4 px and gave it a sideways scroll bar (seen in JupyterLab at 1500 px).
        self._image = widgets.Image(
            format="png", layout=widgets.Layout(width="100%", max_width="760px", margin="0px")
        )
        default_name = f"{validated.case_id}-explored.yaml"
        self._save_path = widgets.Text(
            value=default_name,
            description="Save as case [file]",
            style=style,
            layout=layout,
        )
        self._overwrite = widgets.Checkbox(
            value=False, description="overwrite", indent=False, layout=widgets.Layout(width="auto")
        )
        # Buttons size to their labels (a fixed width cut them off).
        auto = widgets.Layout(width="auto")
        self._save_button = widgets.Button(description="Save as case", icon="save", layout=auto)
        self._reset_button = widgets.Button(description="Reset to the case", layout=auto)
        self.notice = ""
        self._message = widgets.HTML()
        self._save_button.on_click(lambda _: self._save_clicked())
        self._reset_button.on_click(lambda _: self.reset())
        title = widgets.HTML(
            present.heading(f"{validated.title_block.part} ({validated.case_id})", 3).__html__()
        )
        wrap = widgets.Layout(flex_flow="row wrap", align_items="center")
        left = widgets.VBox(
            [
                title,
                self._units,
                *self.controls.values(),
                self._save_path,
                widgets.HBox([self._save_button, self._overwrite, self._reset_button], layout=wrap),
                self._message,
            ],
            layout=widgets.Layout(flex="0 1 450px", min_width="300px"),
        )
        right = widgets.VBox(
            [self._readout, self._image],
            layout=widgets.Layout(flex="1 1 500px", min_width="320px"),
        )
        # Side by side where the notebook is wide, one above the other where it is not: no
        # sideways scrolling at any width.
        self.widget = widgets.HBox([left, right], layout=widgets.Layout(flex_flow="row wrap"))

        from matplotlib.figure import Figure

        from finkit.report.formatting import _style

        with _style():  # the notes' look; axes are made once and reused by every update
            self.figure = Figure(figsize=(9.6, 7.0), dpi=self._dpi)
            self._axes = self.figure.subplots(2, 2)
            self.figure.subplots_adjust(
                left=0.14, right=0.98, bottom=0.08, top=0.95, wspace=0.25, hspace=0.42
            )
        self.update()
        for name, control in self.controls.items():
            control.observe(self._changed, names="value")
            if name == "material":
                control.observe(self._material_changed, names="value")
        self._units.observe(lambda change: self.set_unit_system(change["new"]), names="value")

    def set_unit_system(self, system: str):
        """Show controls, numbers and plots in SI or US customary units.

        Lengths mm <-> in, temperatures °C <-> °F, altitude m <-> ft, velocity m/s <-> ft/min,
        pressure Pa <-> inH2O; flows stay in CFM and powers in W. Only the display changes: a
        control left at the case's value stays exactly at it, a moved one keeps its physical
        value (rounded to the slider step of the new unit), and a saved case writes changed
        values in the units shown.

        Parameters
        ----------
        system : str
            One of :data:`UNIT_SYSTEMS`. [-]

        Returns
        -------
        finkit.model.CaseResult or None
            As :meth:`update`.
        """
        if system not in UNIT_SYSTEMS:
            raise InputError(f"explorer units: got {system!r}; allowed: {', '.join(UNIT_SYSTEMS)}")
        self._hold = True
        try:
            for name, base in self._si_specs.items():
                if base.kind is None or base.unit not in _US_UNIT:
                    continue
                unit, step = (base.unit, base.step) if system == "SI" else _US_UNIT[base.unit]
                if system == "US" and base.unit == "mm" and base.step > 0.1:
                    step = 0.02
                now = self.specs[name]
                control = self.controls[name]
                moved = control.value != self._initial[name]
                value = _convert(base.value, base.kind, base.unit, unit)
                low = _round_to(_convert(base.minimum, base.kind, base.unit, unit), step)
                high = _round_to(_convert(base.maximum, base.kind, base.unit, unit), step)
                low, high = min(low, value), max(high, value)
                current = (
                    _round_to(_convert(control.value, base.kind, now.unit, unit), step)
                    if moved
                    else value
                )
                spec = replace(base, unit=unit, minimum=low, maximum=high, step=step, value=value)
                self.specs[name] = spec
                self._initial[name] = value
                decimals = max(0, -int(np.floor(np.log10(step))))
                with control.hold_trait_notifications():
                    control.max = max(high, control.max)
                    control.min = min(low, control.min)
                    control.step = step
                    control.value = min(max(current, low), high)
                    control.min, control.max = low, high
                    control.readout_format = f".{decimals}f"
                    control.description = spec.description
            self.unit_system = system
            if self._units.value != system:
                self._units.value = system
        finally:
            self._hold = False
        return self.update()

    def _display(self, value_si: float, what: str) -> float:
        """A number in the display unit of the current system (``what`` as in _DISPLAY)."""
        unit = _DISPLAY[self.unit_system][what]
        if what == "difference":
            return float(value_si) * (1.8 if unit == "°F" else 1.0)
        kind = {"temperature": "temperature", "length": "length", "pressure": "pressure"}[what]
        return float(from_si(value_si, kind, unit))

    def _symbol(self, what: str) -> str:
        unit = _DISPLAY[self.unit_system][what]
        return {"degC": "°C", "degF": "°F"}.get(unit, unit)

    # ----------------------------------------------------------------------------------
    # Display

    def _repr_mimebundle_(self, **kwargs):
        return self.widget._repr_mimebundle_(**kwargs)

    # ----------------------------------------------------------------------------------
    # Controls

    def _material_options(self):
        from finkit.physics.properties.materials import get_material, list_materials

        out = []
        for key in list_materials(self._user_materials):
            k = get_material(key, self._user_materials).thermal_conductivity
            out.append((f"{key} (k {k:.0f})", key))
        return out

    def _finish_options(self, material_key: str):
        from finkit.physics.properties.materials import get_material

        material = get_material(material_key, self._user_materials)
        return [(f"{finish} (ε {eps:.2f})", finish) for finish, eps in material.emissivity.items()]

    def _material_changed(self, change) -> None:
        finish = self.controls["finish"]
        options = self._finish_options(change["new"])
        keys = [key for _, key in options]
        current = finish.value
        self._hold = True
        try:
            finish.options = options
            finish.value = current if current in keys else keys[0]
        finally:
            self._hold = False
        self._notice_finish(change["new"], current, finish.value)
        self.update()

    def _notice_finish(self, material: str, before: str, after: str) -> None:
        """Say on screen when a material change replaced the finish (it changes emissivity)."""
        self.notice = (
            ""
            if before == after
            else f"Finish changed from {before} to {after}: {material} has no {before} finish."
        )
        self._message.value = present.text(self.notice).__html__() if self.notice else ""

    def _changed(self, change) -> None:
        if self._hold or change["owner"] is self.controls.get("material"):
            return  # the material observer updates after fixing the finish
        self.update()

    def values(self) -> dict[str, Any]:
        """Current control values, in the unit of each control's description."""
        return {name: control.value for name, control in self.controls.items()}

    def set(self, **values) -> Any:
        """Set several controls at once, then update once.

        Parameters
        ----------
        **values
            Control name -> value in the control's unit (``fin_height=25`` is 25 mm), or a
            string with a unit (``fin_height="1.5 in"``). [-]

        Returns
        -------
        finkit.model.CaseResult or None
            As :meth:`update`.
        """
        unknown = sorted(set(values) - set(self.controls))
        if unknown:
            raise InputError(
                f"explorer controls: got {', '.join(unknown)}; allowed: {', '.join(self.controls)}"
            )
        values = {name: self._in_control_unit(name, value) for name, value in values.items()}
        self._hold = True
        try:
            if "material" in values:
                before = self.controls["finish"].value
                self.controls["material"].value = values["material"]
                self.controls["finish"].options = self._finish_options(values["material"])
                keys = [key for _, key in self.controls["finish"].options]
                if "finish" not in values and self.controls["finish"].value not in keys:
                    self.controls["finish"].value = keys[0]
                if "finish" not in values:
                    self._notice_finish(values["material"], before, self.controls["finish"].value)
            for name, value in values.items():
                if name != "material":
                    self.controls[name].value = value
        finally:
            self._hold = False
        return self.update()

    def _in_control_unit(self, name: str, value: Any) -> Any:
        """A value given to :meth:`set` in the control's display unit (``"1.5 in"`` -> 38.1)."""
        spec = self.specs[name]
        if not isinstance(value, str) or name in ("material", "finish"):
            return value
        if spec.kind is None:
            try:
                number = float(value)
            except ValueError:
                raise InputError(
                    f"explorer.{name}: got {value!r}; expected a number"
                    + ("" if spec.unit == "-" else f" in {spec.unit}")
                ) from None
            return int(number) if isinstance(spec.value, int | np.integer) else number
        from finkit.case.units import from_si, to_si

        return float(from_si(to_si(value, spec.kind, f"explorer.{name}"), spec.kind, spec.unit))

    def reset(self) -> Any:
        """Every control back to the case's value; returns :meth:`update`'s result."""
        return self.set(**self._initial)

    @staticmethod
    def _offset(case) -> float | None:
        entered = case.entered.get("air", {})
        if "surroundings_temperature" not in entered:
            return None  # defaults to the inlet temperature at every setting
        return float(case.air.surroundings_temperature - case.air.inlet_temperature)

    def changes(self) -> list[tuple[str, Any, Any]]:
        """Controls moved away from the case: (dotted path, as written, new value as entered)."""
        out = []
        for name, spec in self.specs.items():
            value = self.controls[name].value
            if value == self._initial[name]:
                continue
            before = _get(self._entered, spec.path)
            out.append((".".join(spec.path), before, spec.entered(value)))
        if self._surroundings_offset is not None and any(
            path == "air.inlet_temperature" for path, _, _ in out
        ):
            out.append(
                (
                    "air.surroundings_temperature",
                    _get(self._entered, ("air", "surroundings_temperature")),
                    self._surroundings_entered(),
                )
            )
        return out

    def _surroundings_entered(self) -> str:
        spec = self.specs["inlet_temperature"]
        t_in = _convert(self.controls["inlet_temperature"].value, "temperature", spec.unit, "degC")
        offset = float(self._surroundings_offset)
        return f"{t_in + offset:.6g} degC"

    def case_mapping(self, case_id: str | None = None) -> dict:
        """The case as entered with the current control values (a new dict).

        Fields whose control is unchanged keep what the file says (units and all); changed
        ones are written in the control's unit, e.g. ``"27.5 mm"``. When the case states a
        surroundings temperature, it follows the inlet air with the case's offset (walls warmed
        by the same air), as in the note's inlet sweep.

        Parameters
        ----------
        case_id : str, optional
            A new case id; default the case's own. [-]

        Returns
        -------
        dict
            A mapping :func:`finkit.case.load_case` accepts. [-]
        """
        mapping = copy.deepcopy(self._entered)
        for path, _, value in self.changes():
            _set(mapping, tuple(path.split(".")), value)
        if case_id is not None:
            mapping["case_id"] = case_id
        return mapping

    # ----------------------------------------------------------------------------------
    # Solve and draw

    def update(self):
        """Recompute with the current settings and redraw the numbers and plots.

        Returns
        -------
        finkit.model.CaseResult or None
            The nominal result, or None when the settings do not make a valid case or the
            model cannot solve them (:attr:`error` says why; the plots keep the last state).
        """
        from finkit.case.schema import load_case
        from finkit.model.run import run_case

        start = time.perf_counter()
        try:
            case = load_case(_nominal(self.case_mapping()))
            result = run_case(case)
            curves = self._curves(result)
        except FinkitError as exc:
            lines = getattr(exc, "errors", None) or str(exc).splitlines()
            self.error = "\n".join(lines)
            self.result = None
            self.numbers = {}
            self.seconds = time.perf_counter() - start
            self._readout.value = present.text(
                "These settings cannot be solved:\n" + self.error, css_class="fk-error"
            ).__html__()
            self._readout.value = self._readout.value.replace("<p ", '<p style="color:#b3202a" ', 1)
            return None
        self.error = ""
        self.result = result
        self.numbers = {name: result.results[name] for name in self.SHOWN}
        self._draw(result, curves)
        self._image.value = self.png()
        self.seconds = time.perf_counter() - start
        self._readout.value = self._readout_html(result)
        return result

    def _curves(self, result) -> dict[str, Any]:
        """Every curve of the plots, from finkit.model (vectorised calls)."""
        from finkit.model.sweeps import fan_pressure, note_sweep, system_curve
        from finkit.physics.sink.inputs import FanDriven, NaturalConvection

        inputs = result.inputs
        t_in = float(np.asarray(inputs.air.inlet_temperature))
        usable = inputs.limit_temperature - inputs.required_margin
        low = min(t_in - 25.0, usable - 30.0)
        high = max(inputs.limit_temperature + 3.0, t_in + 3.0)
        inlet = np.linspace(low, high, 41)
        out: dict[str, Any] = {"inlet": inlet}
        out["inlet_sweep"] = note_sweep(inputs, "inlet_temperature", inlet)
        spec = self._si_specs.get("fin_height") or self._si_specs.get("pin_height")
        heights = np.linspace(spec.minimum, spec.maximum, 36) * 1e-3
        out["heights"] = heights
        out["height_sweep"] = note_sweep(inputs, "fin_height", heights)
        if not isinstance(inputs.flow, NaturalConvection):
            q_op = float(np.asarray(result.solution.volume_flow))
            if isinstance(inputs.flow, FanDriven):
                free = float(fan_pressure(inputs, np.array([0.0]))["free_delivery"])
                q_max = free * 1.05
                qf = np.linspace(0.0, free, 60)
                out["fan"] = fan_pressure(inputs, qf)
            else:
                q_max = 2.0 * q_op
            q = np.linspace(q_max / 100.0, q_max, 60)
            out["system"] = system_curve(inputs, q)
            out["q_max"] = q_max
        return out

    def _draw(self, result, curves) -> None:
        from finkit.report.formatting import COLOURS, _style

        with _style():
            for ax in self._axes.ravel():
                _empty(ax)
            self._draw_nodes(self._axes[0, 0], result, COLOURS)
            self._draw_allowable(self._axes[0, 1], result, curves, COLOURS)
            self._draw_fan(self._axes[1, 0], result, curves, COLOURS)
            self._draw_efficiency(self._axes[1, 1], result, curves, COLOURS)

    def _draw_nodes(self, ax, result, colours) -> None:
        sol, inputs = result.solution, result.inputs
        node = inputs.limit_node
        rows = [
            ("Junction", sol.junction_temperature, node == "junction"),
            ("Case", sol.case_temperature, node == "case"),
            ("Base under source, centre", sol.source_base_centre_temperature, node == "base"),
            ("Base, mean", sol.base_temperature, False),
            ("Fin tip", sol.fin_tip_temperature, False),
        ]
        if np.isfinite(float(np.asarray(sol.outlet_air_temperature))) and self._is_forced(result):
            rows.append(("Outlet air", sol.outlet_air_temperature, False))
        rows.append(("Inlet air", sol.inlet_air_temperature, False))
        t_in = self._display(float(np.asarray(sol.inlet_air_temperature)), "temperature")
        values = [self._display(float(np.asarray(t)), "temperature") for _, t, _ in rows]
        ok = result.results["temperature_margin"] >= inputs.required_margin
        colour = [
            (colours["primary"] if ok else colours["limit"])
            if is_node
            else (colours["air"] if name.endswith("air") else "#8fb8d8")
            for name, _, is_node in rows
        ]
        y = np.arange(len(rows))
        floor = min(0.0, t_in - 5.0)
        ax.barh(y, [v - floor for v in values], left=floor, color=colour, height=0.6)
        for yi, v in zip(y, values, strict=True):
            ax.text(v, yi, f" {v:.1f}", va="center", fontsize=8)
        limit = self._display(inputs.limit_temperature, "temperature")
        usable = self._display(inputs.limit_temperature - inputs.required_margin, "temperature")
        t_sym, dt_sym = self._symbol("temperature"), self._symbol("difference")
        ax.axvline(limit, color=colours["limit"], linestyle="--", linewidth=1.4, label="Limit")
        if inputs.required_margin > 0:
            ax.axvline(
                usable,
                color=colours["margin"],
                linestyle=":",
                linewidth=1.6,
                label="Limit less margin",
            )
        ax.set_yticks(y, [name for name, _, _ in rows], fontsize=8)
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(len(rows) - 0.5, -0.5)  # first row on top (axes are reused: no invert)
        ax.set_xlim(floor, max(limit, max(values)) * 1.12 + 2.0)
        ax.set_xlabel(f"Temperature [{t_sym}]")
        verdict = "PASS" if ok else "FAIL"
        node_t = self._display(
            result.results["limit_node_temperature"] + ZERO_CELSIUS, "temperature"
        )
        margin = self._display(result.results["temperature_margin"], "difference")
        ax.set_title(
            f"{node.capitalize()} {node_t:.1f} {t_sym}, "
            f"{margin:.1f} {dt_sym} below the limit: {verdict} (nominal)",
            fontsize=9,
            loc="left",
        )
        ax.grid(axis="y", visible=False)
        ax.legend(loc="lower right", fontsize=7.5)

    def _draw_allowable(self, ax, result, curves, colours) -> None:
        t_unit, t_sym = _DISPLAY[self.unit_system]["temperature"], self._symbol("temperature")
        x = from_si(curves["inlet"], "temperature", t_unit)
        power = float(np.asarray(result.solution.power))
        t_case = self._display(
            float(np.asarray(result.inputs.air.inlet_temperature)), "temperature"
        )
        ax.plot(
            x,
            curves["inlet_sweep"]["allowable_power"],
            color=colours["primary"],
            label="Allowable, limit less margin",
        )
        ax.axhline(power, color=colours["secondary"], linewidth=1.4, label=f"Power {power:.1f} W")
        ax.axvline(t_case, color=colours["air"], linestyle="-.", linewidth=1.2)
        ax.plot([t_case], [result.results["allowable_power"]], "o", color=colours["primary"])
        ax.set_xlabel(f"Inlet air temperature [{t_sym}]")
        ax.set_ylabel("Power [W]")
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(bottom=0)
        ax.set_xlim(x[0], x[-1])
        ax.set_title(
            f"Allowable power {result.results['allowable_power']:.1f} W "
            f"at {t_case:.1f} {t_sym} inlet",
            fontsize=9,
            loc="left",
        )
        ax.legend(loc="upper right", fontsize=7.5)

    def _draw_fan(self, ax, result, curves, colours) -> None:
        if "system" not in curves:
            # Natural convection has no fan or system curve: show where the heat goes instead.
            sol = result.solution
            heat = [
                float(np.asarray(sol.convection_heat_rate)),
                float(np.asarray(sol.radiation_heat_rate)),
            ]
            y = np.arange(2)
            ax.barh(y, heat, color=[colours["primary"], colours["secondary"]], height=0.5)
            for yi, q in zip(y, heat, strict=True):
                ax.text(q, yi, f" {q:.1f} W ({q / sum(heat) * 100:.0f} %)", va="center", fontsize=8)
            ax.set_yticks(y, ["Convection", "Radiation"], fontsize=8)
            ax.relim()
            ax.autoscale_view()
            ax.set_ylim(1.5, -0.5)
            ax.set_xlim(0, max(heat) * 1.45)
            ax.set_xlabel("Heat rate [W]")
            ax.grid(axis="y", visible=False)
            h = float(np.asarray(sol.heat_transfer_coefficient))
            ax.set_title(
                f"Natural convection (no fan): h {h:.2f} W/(m²·K), heat paths",
                fontsize=9,
                loc="left",
            )
            return
        to_cfm = from_si(1.0, "volume_flow", "CFM")
        p_unit, p_sym = _DISPLAY[self.unit_system]["pressure"], self._symbol("pressure")
        to_p = from_si(1.0, "pressure", p_unit)
        system = curves["system"]
        ax.plot(
            system["volume_flow"] * to_cfm,
            system["pressure_drop"] * to_p,
            color=colours["primary"],
            label="System (sink" + (" + bypass)" if result.inputs.bypass is not None else ")"),
        )
        if "fan" in curves:
            fan = curves["fan"]
            ax.plot(
                fan["volume_flow"] * to_cfm,
                fan["at_inlet"] * to_p,
                color=colours["secondary"],
                label=f"Fan at {fan['inlet_density']:.3f} kg/m³",
            )
            label = "Operating point"
        else:
            label = "Given flow"
        q = result.results["volume_flow"]
        dp = result.results["pressure_drop"]
        ax.plot(
            [q * to_cfm],
            [dp * to_p],
            "o",
            color="black",
            zorder=5,
            label=f"{label} {q * to_cfm:.2f} CFM, {dp * to_p:.3g} {p_sym}",
        )
        ax.relim()
        ax.autoscale_view()
        ax.set_xlim(0, curves["q_max"] * to_cfm)
        ax.set_ylim(bottom=0)
        ax.set_xlabel("Total volume flow [CFM]")
        ax.set_ylabel(f"Static pressure [{p_sym}]")
        title = "Fan and system curves" if "fan" in curves else "System curve, given flow"
        if result.inputs.bypass is not None:
            title += f" (bypass {result.results['bypass_fraction'] * 100:.0f} % of the flow)"
        ax.set_title(title, fontsize=9, loc="left")
        ax.legend(loc="upper right", fontsize=7.5)

    def _draw_efficiency(self, ax, result, curves, colours) -> None:
        l_unit, l_sym = _DISPLAY[self.unit_system]["length"], self._symbol("length")
        heights = from_si(curves["heights"], "length", l_unit)
        sweep = curves["height_sweep"]
        pins = "pin_height" in self.specs
        name = "Pin height" if pins else "Fin height"
        g = result.inputs.geometry
        h0 = self._display(float(np.asarray(g.pin_height if pins else g.fin_height)), "length")
        eta = result.results["fin_efficiency"]
        ax.plot(
            heights, sweep["fin_efficiency"], color=colours["tertiary"], label="Fin efficiency η_f"
        )
        ax.plot([h0], [eta], "o", color=colours["tertiary"])
        ax.axvline(h0, color=colours["air"], linestyle="-.", linewidth=1.2)
        ax.set_xlabel(f"{name} [{l_sym}]")
        ax.set_ylabel("Fin efficiency [-]")
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(min(0.5, float(np.nanmin(sweep["fin_efficiency"])) - 0.05), 1.0)
        ax.set_xlim(heights[0], heights[-1])
        ax.set_title(
            f"Fin efficiency {eta:.3f} at {h0:.3g} {l_sym} ({name.lower()})", fontsize=9, loc="left"
        )
        ax.legend(loc="lower left", fontsize=7.5)

    @staticmethod
    def _is_forced(result) -> bool:
        from finkit.physics.sink.inputs import NaturalConvection

        return not isinstance(result.inputs.flow, NaturalConvection)

    def _readout_html(self, result) -> str:
        r = result.results
        inputs = result.inputs
        ok = r["temperature_margin"] >= inputs.required_margin
        node = inputs.limit_node
        t_sym, dt_sym = self._symbol("temperature"), self._symbol("difference")

        def temp(celsius):
            return f"{self._display(celsius + ZERO_CELSIUS, 'temperature'):.1f} {t_sym}"

        def diff(kelvin):
            return f"{self._display(kelvin, 'difference'):.1f} {dt_sym}"

        rows = [
            (
                f"{node.capitalize()} (limit node)",
                temp(r["limit_node_temperature"]),
                f"limit {temp(r['limit_temperature'])}",
            ),
            (
                "Margin below the limit",
                diff(r["temperature_margin"]),
                f"required {diff(r['required_margin'])}",
            ),
            (
                "Allowable power (limit less margin)",
                f"{r['allowable_power']:.1f} W",
                f"stated {float(np.asarray(result.solution.power)):.1f} W",
            ),
            ("Power at the limit", f"{r['power_at_limit']:.1f} W", ""),
            (
                "Sink resistance",
                f"{r['sink_resistance']:.4g} K/W",
                f"total {r['total_resistance']:.4g} K/W",
            ),
        ]
        if r["volume_flow"] is not None:
            rows += [
                (
                    "Volume flow (through the fins)",
                    format_quantity(r["volume_flow"], "volume_flow", "CFM"),
                    format_quantity(r["sink_volume_flow"], "volume_flow", "CFM"),
                ),
                (
                    "Pressure drop",
                    f"{self._display(r['pressure_drop'], 'pressure'):.3g} "
                    f"{self._symbol('pressure')}",
                    "",
                ),
            ]
        rows += [
            ("Heat transfer coefficient", f"{r['heat_transfer_coefficient']:.1f} W/(m²·K)", ""),
            (
                "Fin / surface efficiency",
                f"{r['fin_efficiency']:.3f}",
                f"{r['surface_efficiency']:.3f}",
            ),
            ("Sink mass", f"{r['mass'] * 1e3:.0f} g", ""),
        ]
        # Inline styles: a notebook has no note stylesheet. Every text is escaped.
        colour = "#2f7d4f" if ok else "#b3202a"
        cell = 'style="padding:1px 8px;white-space:nowrap;text-align:left"'
        body = "".join(
            "<tr>" + "".join(f"<td {cell}>{present.escape(v)}</td>" for v in row) + "</tr>"
            for row in rows
        )
        verdict = present.escape("PASS" if ok else "FAIL")
        head = (
            f'<div style="font-weight:bold;color:{colour};margin-bottom:4px">{verdict} '
            f"(nominal): {present.escape(node)} "
            f"{present.escape(diff(r['temperature_margin']))} below the limit</div>"
        )
        note = present.escape(
            f"Updated in {self.seconds * 1e3:.0f} ms. Scenarios, touch check and tolerances "
            "are not solved here; run 'finkit note' on the saved case."
        )
        return (
            f'{head}<table style="border-collapse:collapse;font-size:90%">{body}</table>'
            f'<div style="font-size:85%;color:#707070;max-width:420px">{note}</div>'
        )

    def png(self, dpi: float | None = None) -> bytes:
        """The current plots as PNG bytes.

        Kept as an image widget rather than an interactive widget backend (ipympl): measured
        on the plate-fin demo, ``savefig`` costs about 130 ms of a 300 ms update and nearly
        all of it is Agg rendering, which such a backend does too (it also sends PNG frames);
        PNG compression is under 10 ms of it. The backend would add a dependency and a
        JupyterLab extension for no gain in speed.
        """
        buffer = io.BytesIO()
        self.figure.savefig(buffer, format="png", dpi=dpi or self._dpi, facecolor="white")
        return buffer.getvalue()

    def save_figure(self, path, dpi: float = 120.0) -> Path:
        """Write the current plots to a PNG file; returns the path."""
        path = Path(path)
        path.write_bytes(self.png(dpi))
        return path

    # ----------------------------------------------------------------------------------
    # Save as case

    def save_case(self, path, *, case_id: str | None = None, overwrite: bool = False) -> Path:
        """Write the current settings as a case file that ``finkit check``/``note`` accept.

        The file is the case as entered with the changed controls written in their units
        (``"27.5 mm"``), every other block kept (scenarios, tolerances, ...); a header comment
        lists the changes. The whole case is validated before anything is written.

        Parameters
        ----------
        path : path-like
            YAML file to write. [-]
        case_id : str, optional
            Case id of the new case; default the file name without its suffix. It may not be
            the original case's id (the saved case's notes would overwrite the original's). [-]
        overwrite : bool, optional
            Replace an existing file. [-]

        Returns
        -------
        pathlib.Path
            The file written. [-]

        Raises
        ------
        finkit.errors.InputError
            The file exists (and ``overwrite`` is false), or the settings do not make a valid
            case (:class:`finkit.case.CaseError`, one line per problem).
        """
        import yaml

        import finkit
        from finkit.case.schema import load_case

        path = Path(path)
        if path.suffix not in (".yaml", ".yml"):
            raise InputError(f"save_case: got {str(path)!r}; the file name must end in .yaml")
        if path.exists() and not overwrite:
            raise InputError(f"save_case: {str(path)!r} exists; pass overwrite=True to replace it")
        # A saved variant is a case of its own: its notes must not land in the original's
        # folder (<out>/<case_id>/), so it never keeps the original's id.
        case_id = path.stem if case_id is None else case_id
        if case_id == self._case.case_id:
            raise InputError(
                f"save_case: case id {case_id!r} is the original case's; give the saved case an "
                "id of its own (case_id=..., or another file name)"
            )
        mapping = self.case_mapping(case_id)
        load_case(copy.deepcopy(mapping))  # raises CaseError, nothing written
        now = _dt.datetime.now().astimezone().isoformat(timespec="seconds")
        origin = str(self._source) if self._source is not None else self._case.case_id
        header = [
            f"# Saved by the finkit explorer (finkit {finkit.__version__}) on {now}.",
            f"# Based on {origin}; comments of that file are not kept.",
        ]
        changes = self.changes()
        if changes:
            header.append("# Changed:")
            header += [f"#   {p}: {before!r} -> {after!r}" for p, before, after in changes]
        else:
            header.append("# No control was changed.")
        body = yaml.safe_dump(mapping, sort_keys=False, allow_unicode=True, width=100)
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text("\n".join(header) + "\n" + body, encoding="utf-8")
        return path

    def _save_clicked(self) -> None:
        try:
            written = self.save_case(self._save_path.value, overwrite=self._overwrite.value)
        except FinkitError as exc:
            lines = getattr(exc, "errors", None) or str(exc).splitlines()
            self._message.value = present.text("Not saved: " + "\n".join(lines)).__html__()
            return
        self._message.value = present.text(
            f"Saved {written} as case {written.stem}. Check it: finkit check {written}; note: "
            f"finkit note {written} --out notes"
        ).__html__()


def explore(case, **kwargs) -> Explorer:
    """An :class:`Explorer` for a heat-sink case (path, YAML text, mapping or validated case).

    Parameters
    ----------
    case : finkit.case.HeatSinkCase, mapping, str or path-like
        The case to start from. [-]
    **kwargs
        Passed to :class:`Explorer` (``dpi``). [-]

    Returns
    -------
    Explorer
        Display it in a notebook; or set controls and call :meth:`Explorer.update`. [-]
    """
    return Explorer(case, **kwargs)
