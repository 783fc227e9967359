"""The explorer itself: controls, live solve, plots, saving the case."""

from __future__ import annotations

import copy
import datetime as _dt
import io
import time
from dataclasses import replace
from pathlib import Path
from typing import Any

import numpy as np

from finkit.case.units import from_si
from finkit.errors import FinkitError, InputError, NotSupportedError
from finkit.explorer.controls import (
    _DISPLAY,
    _US_UNIT,
    UNIT_SYSTEMS,
    _convert,
    _get,
    _nominal,
    _round_to,
    _set,
    control_specs,
)
from finkit.explorer.drawing import _Drawing
from finkit.report import present

__all__ = ["Explorer", "explore"]


class Explorer(_Drawing):
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
        # Long by design: builds the widgets and wires their callbacks, one block per group of
        # controls.
        import ipywidgets as widgets

        from finkit.case.heat_sink import Case
        from finkit.case.schema import load_case

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

    def png(self, dpi: float | None = None) -> bytes:
        """The current plots as PNG bytes.

        Kept as an image widget rather than an interactive widget backend (ipympl): measured
        on the plate-fin demo, ``savefig`` costs about 130 ms of a 300 ms update and nearly
        all of it is Agg rendering, which such a backend does too (it also sends PNG frames);
        PNG compression is under 10 ms of it. The backend would add a dependency and a
        JupyterLab extension for no gain in speed.

        Parameters
        ----------
        dpi : float, optional
            Resolution; default the explorer's own. [dots per inch]
        """
        buffer = io.BytesIO()
        self.figure.savefig(buffer, format="png", dpi=dpi or self._dpi, facecolor="white")
        return buffer.getvalue()

    def save_figure(self, path, dpi: float = 120.0) -> Path:
        """Write the current plots to a PNG file; returns the path.

        Parameters
        ----------
        path : path-like
            PNG file to write. [-]
        dpi : float, optional
            Resolution. [dots per inch]
        """
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
