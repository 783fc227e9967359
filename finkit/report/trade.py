"""Tables, figures and text of the trade-study note (``templates/trade_study_note.ipynb``).

:func:`run` validates a case with a ``trade_study:`` block, solves the case's own design
(:func:`finkit.model.run_case`), evaluates every design of the block's grid or sample in one
vectorised call (:mod:`finkit.model.trade`), finds the Pareto front of the block's objectives and
the
chosen design per the block's ``objective``:

* ``coolest`` -- plate fins: :func:`finkit.model.trade.minimise_junction_temperature` on the limit
  node; pin fins: the coolest design of the grid or sample;
* ``lightest-meeting-limit`` -- plate fins: :func:`finkit.model.trade.minimise_mass_meeting_limit`;
  pin fins: the lightest design of the grid or sample that meets the limit with the margin;
* ``pareto`` -- the lightest design on the front that meets the limit with the margin.

The plate-fin optimisers search every fin count that fits, fin thickness from the minimum of
the manufacturing bounds up to the top of the block's thickness range, and fin height from the
bottom of the block's height range up to the envelope (and the aspect-ratio bound); their
result need not be a point of the grid.

The chosen design and the case's design are evaluated again as one-design studies by the same
function as the grid (:func:`finkit.model.trade.plate_fin_designs` or
:func:`finkit.model.trade.pin_fin_designs`), so the comparison table holds like-for-like numbers.

No physics lives here: every number comes from :mod:`finkit.model` or :mod:`finkit.model.trade`.
Figures use the style and colours of :mod:`finkit.report.formatting`; every function returns a
:class:`finkit.report.present.Fragment` (``plot_*`` return the matplotlib Figure).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from itertools import combinations
from pathlib import Path
from typing import Any

import numpy as np

from finkit.case.units import format_quantity, from_si
from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError, SolverError
from finkit.report import present
from finkit.report.formatting import COLOURS, _figure, _join, _style

__all__ = [
    "ChosenDesign",
    "OBJECTIVE_TEXT",
    "TEMPLATE",
    "TradeNote",
    "cautions",
    "comparison_table",
    "feasibility_table",
    "figure_design_space",
    "figure_front",
    "front_table",
    "headline",
    "method_section",
    "plot_design_space",
    "plot_front",
    "results_json",
    "run",
    "study_table",
    "template_path",
    "title_block",
    "warnings_section",
]

#: File name of the trade-study note template in the top-level ``templates/`` folder.
TEMPLATE = "trade_study_note.ipynb"

#: What each ``trade_study.objective`` asks, in words.
OBJECTIVE_TEXT = {
    "coolest": "the coolest design (limit node) for this fan or flow",
    "lightest-meeting-limit": "the lightest design that keeps the limit node the required "
    "margin below its limit",
    "pareto": "the lightest design on the Pareto front that meets the limit with the margin",
}

# Display of each study column: label, kind, unit, axis label.
_COLUMNS = {
    "sink_resistance": ("Sink resistance", "thermal_resistance", "K/W", "R_sink [K/W]"),
    "total_resistance": ("Total resistance", "thermal_resistance", "K/W", "R_total [K/W]"),
    "junction_temperature": ("Junction temperature", "temperature", "degC", "T_j [°C]"),
    "limit_node_temperature": ("Limit-node temperature", "temperature", "degC", "T_node [°C]"),
    "pressure_drop": ("Pressure drop", "pressure", "Pa", "Pressure drop [Pa]"),
    "mass": ("Mass", "mass", "g", "Mass [g]"),
}
_DESIGN = {
    "fin_count": ("Fin count", None, "-"),
    "fin_thickness": ("Fin thickness", "length", "mm"),
    "fin_height": ("Fin height", "length", "mm"),
    "fin_spacing": ("Fin gap", "length", "mm"),
    "pin_diameter": ("Pin diameter", "length", "mm"),
    "pin_height": ("Pin height", "length", "mm"),
    "transverse_pitch": ("Pitch across the flow", "length", "mm"),
    "longitudinal_pitch": ("Pitch along the flow", "length", "mm"),
    "pin_count": ("Pin count", None, "-"),
}
_NBSP = "\u00a0"


def template_path() -> Path:
    """The trade-study note template, ``finkit/templates/trade_study_note.ipynb`` (package data)."""
    return Path(__file__).resolve().parents[1] / "templates" / TEMPLATE


# --------------------------------------------------------------------------------------------
# The study


@dataclass(frozen=True)
class ChosenDesign:
    """One design evaluated as a one-design trade study (same code as the grid).

    Attributes
    ----------
    label : str
        What this design is (``"Case design"``, ``"Chosen design"``).
    how : str
        How it was found (optimiser, grid, the case file).
    design : dict of str to float
        Design variables (:attr:`finkit.model.trade.TradeStudy.design`) [SI].
    values : dict of str to float
        Results (:attr:`finkit.model.trade.TradeStudy.RESULTS`) [SI].
    violations : str
        Manufacturing bounds or envelope it breaks ("" if none).
    meets_limit : bool
        Limit node at least the required margin below the limit.
    active_bounds : tuple of str
        Bounds the optimiser's result sits on (empty for other designs).
    grid_index : int or None
        Index in the study when the design is a point of it.
    inputs : finkit.model.SinkInputs
        The case with this design's geometry.
    warnings : tuple of str
        Validity messages of this design's solution.
    """

    label: str
    how: str
    design: dict[str, float]
    values: dict[str, float]
    violations: str
    meets_limit: bool
    active_bounds: tuple[str, ...] = ()
    grid_index: int | None = None
    inputs: Any = field(default=None, repr=False)
    warnings: tuple[str, ...] = ()


@dataclass(frozen=True)
class TradeNote:
    """Everything the trade-study note shows (built by :func:`run`).

    Attributes
    ----------
    result : finkit.model.CaseResult
        The case as designed.
    block : finkit.case.explore_blocks.TradeStudyBlock
        The case's ``trade_study`` block.
    study : finkit.model.trade.TradeStudy
        Every design of the grid or sample.
    objectives : tuple of str
        Columns minimised for the Pareto front (``pressure_drop`` dropped in natural
        convection).
    front : numpy.ndarray of int
        Indices of the front designs (feasible designs only).
    chosen : ChosenDesign or None
        The design the block's objective picks (None when no design meets the limit).
    chosen_error : str
        Why there is no chosen design ("" when there is one).
    case_design : ChosenDesign
        The case's own design, evaluated like the grid.
    optimum : finkit.model.trade.OptimumDesign or None
        The optimiser's result (plate fins with ``coolest`` or ``lightest-meeting-limit``).
    """

    result: Any
    block: Any
    study: Any
    objectives: tuple[str, ...]
    front: np.ndarray
    chosen: ChosenDesign | None
    chosen_error: str
    case_design: ChosenDesign
    optimum: Any = None

    @property
    def is_plate(self) -> bool:
        return self.study.sink_type == "plate-fin"

    @property
    def is_natural(self) -> bool:
        from finkit.physics.sink.inputs import NaturalConvection

        return isinstance(self.result.inputs.flow, NaturalConvection)


def _relaxed(bounds, envelope):
    """Bounds widened by 1e-9 (relative): a design on a bound stays feasible after round-off."""
    from dataclasses import replace

    from finkit.case.bounds import Envelope

    b = replace(
        bounds,
        min_fin_gap=bounds.min_fin_gap * (1 - 1e-9),
        min_fin_thickness=bounds.min_fin_thickness * (1 - 1e-9),
        max_fin_aspect_ratio=bounds.max_fin_aspect_ratio * (1 + 1e-9),
        min_pin_diameter=bounds.min_pin_diameter * (1 - 1e-9),
        min_pin_gap=bounds.min_pin_gap * (1 - 1e-9),
        max_pin_aspect_ratio=bounds.max_pin_aspect_ratio * (1 + 1e-9),
    )
    e = Envelope(
        envelope.base_width,
        envelope.base_length,
        envelope.base_thickness,
        envelope.max_height * (1 + 1e-9),
    )
    return b, e


def _one(inputs, sink_type, design, bounds, envelope):
    """A one-design TradeStudy (same code as the grid)."""
    from finkit.model import trade

    if sink_type == "plate-fin":
        return trade.plate_fin_designs(
            inputs,
            [design["fin_count"]],
            [design["fin_height"]],
            [design["fin_thickness"]],
            bounds,
            envelope,
        )
    return trade.pin_fin_designs(
        inputs,
        [design["pin_diameter"]],
        [design["pin_height"]],
        [design["transverse_pitch"]],
        [design["longitudinal_pitch"]],
        bounds,
        envelope,
    )


def _evaluated(label, how, inputs, sink_type, design, bounds, envelope, **extra) -> ChosenDesign:
    """A design's results (solved without bounds) and the bounds it breaks."""
    from finkit.model.design import solve
    from finkit.case.bounds import Envelope, ManufacturingBounds

    free = ManufacturingBounds(0.0, 0.0, np.inf, 0.0, 0.0, np.inf)
    open_envelope = Envelope(envelope.base_width, envelope.base_length, envelope.base_thickness)
    solved = _one(inputs, sink_type, design, free, open_envelope)
    checked = _one(inputs, sink_type, design, bounds, envelope)
    values = {name: float(getattr(solved, name)[0]) for name in solved.RESULTS}
    one = solved.inputs_for(0)
    return ChosenDesign(
        label=label,
        how=how,
        design={k: float(v[0]) for k, v in solved.design.items()},
        values=values,
        violations=str(checked.reasons[0]),
        # The optimiser meets the limit to 1e-6 K; a design on the limit counts as meeting it.
        meets_limit=bool(values["temperature_margin"] >= solved.required_margin - 1e-6),
        inputs=one,
        warnings=tuple(solve(one).warnings),
        **extra,
    )


def _axes(block, sink_type):
    from finkit.case.explore_blocks import to_trade_axes

    return to_trade_axes(block)


def _study(inputs, block, bounds, envelope):
    from finkit.model import trade

    axes = _axes(block, block.sink_type)
    grid = block.sampling == "grid"
    if block.sink_type == "plate-fin":
        if grid:
            return trade.plate_fin_grid(
                inputs,
                axes["fin_count"],
                axes["fin_height"],
                axes["fin_thickness"],
                bounds,
                envelope,
            )
        n_lo, n_hi = axes["fin_count"]
        return trade.plate_fin_sample(
            inputs,
            block.samples,
            (int(np.ceil(n_lo)), int(np.floor(n_hi))),
            axes["fin_height"],
            axes["fin_thickness"],
            bounds,
            envelope,
            method=block.sampling,
            seed=block.seed,
        )
    if grid:
        return trade.pin_fin_grid(
            inputs,
            axes["pin_diameter"],
            axes["pin_height"],
            axes["transverse_pitch"],
            axes.get("longitudinal_pitch"),
            bounds,
            envelope,
        )
    return trade.pin_fin_sample(
        inputs,
        block.samples,
        axes["pin_diameter"],
        axes["pin_height"],
        axes["transverse_pitch"],
        axes.get("longitudinal_pitch"),
        bounds,
        envelope,
        method=block.sampling,
        seed=block.seed,
    )


def _case_design(inputs) -> dict[str, float]:
    from finkit.physics.geometry import PlateFinSink

    g = inputs.geometry
    if isinstance(g, PlateFinSink):
        return {
            "fin_count": float(g.fin_count),
            "fin_height": float(g.fin_height),
            "fin_thickness": float(g.fin_thickness),
        }
    return {
        "pin_diameter": float(g.pin_diameter),
        "pin_height": float(g.pin_height),
        "transverse_pitch": float(g.transverse_pitch),
        "longitudinal_pitch": float(g.longitudinal_pitch),
    }


def run(case: Any) -> TradeNote:
    """Validate a case with a ``trade_study:`` block and run the study.

    Parameters
    ----------
    case : mapping, str or path-like
        The case as entered (a template's ``case`` parameter), a YAML file, or a validated
        case. It must hold a ``trade_study`` block. [-]

    Returns
    -------
    TradeNote
        The case's result, the study, its front and the chosen design. [-]

    Raises
    ------
    finkit.errors.InputError
        The case has no ``trade_study`` block, or its variables do not match the sink type.
    """
    from finkit.case.explore_blocks import to_bounds, to_envelope
    from finkit.case.schema import Case, load_case
    from finkit.model import trade
    from finkit.model.run import run_case

    validated = case if isinstance(case, Case) else load_case(case)
    block = getattr(validated, "trade_study", None)
    if block is None:
        raise InputError(
            "trade_study: missing; the trade-study note needs a trade_study block (see "
            "demo_cases/nb200-trade-study.yaml)"
        )
    if block.sink_type != validated.sink.type:
        raise InputError(
            f"trade_study: varies {block.sink_type} variables but sink.type is "
            f"{validated.sink.type!r}"
        )
    result = run_case(validated)
    inputs = result.inputs
    bounds = to_bounds(block)
    envelope = to_envelope(block, inputs)
    study = _study(inputs, block, bounds, envelope)
    objectives = tuple(block.pareto)
    from finkit.physics.sink.inputs import NaturalConvection

    if isinstance(inputs.flow, NaturalConvection):
        objectives = tuple(o for o in objectives if o != "pressure_drop")
    front = study.pareto(objectives) if len(objectives) >= 2 else np.array([], dtype=int)
    sink_type = study.sink_type
    chosen, error, optimum = None, "", None
    relaxed_bounds, relaxed_envelope = _relaxed(bounds, envelope)
    axes = _axes(block, sink_type)
    try:
        if sink_type == "plate-fin" and block.objective != "pareto":
            search = {
                "min_fin_height": float(np.min(axes["fin_height"])),
                "max_fin_thickness": float(np.max(axes["fin_thickness"])),
            }
            if block.objective == "coolest":
                optimum = trade.minimise_junction_temperature(
                    inputs, bounds, envelope, node=inputs.limit_node, **search
                )
            else:
                optimum = trade.minimise_mass_meeting_limit(inputs, bounds, envelope, **search)
            design = {
                "fin_count": float(optimum.fin_count),
                "fin_height": optimum.fin_height,
                "fin_thickness": optimum.fin_thickness,
            }
            chosen = _evaluated(
                "Chosen design",
                f"optimiser: {OBJECTIVE_TEXT[block.objective]}",
                inputs,
                sink_type,
                design,
                relaxed_bounds,
                relaxed_envelope,
                active_bounds=optimum.active_bounds,
            )
        else:
            if block.objective == "coolest":
                index = study.best("limit_node_temperature")
            elif block.objective == "lightest-meeting-limit":
                index = study.best("mass", require_limit=True)
            else:
                meets = front[study.meets_limit[front]]
                if meets.size == 0:
                    raise SolverError(
                        "no design on the Pareto front meets the limit with the required margin"
                    )
                index = int(meets[np.argmin(study.mass[meets])])
            design = {k: float(v[index]) for k, v in study.design.items() if k != "pin_count"}
            if sink_type == "plate-fin":
                design.pop("fin_spacing", None)
            chosen = _evaluated(
                "Chosen design",
                f"best of the {'grid' if block.sampling == 'grid' else 'sample'}: "
                f"{OBJECTIVE_TEXT[block.objective]}",
                inputs,
                sink_type,
                design,
                bounds,
                envelope,
                grid_index=index,
            )
    except SolverError as exc:
        error = str(exc)
    case_design = _evaluated(
        "Case design",
        "as in the case file",
        inputs,
        sink_type,
        _case_design(inputs),
        bounds,
        envelope,
    )
    return TradeNote(
        result=result,
        block=block,
        study=study,
        objectives=objectives,
        front=np.asarray(front, dtype=int),
        chosen=chosen,
        chosen_error=error,
        case_design=case_design,
        optimum=optimum,
    )


def results_json(case: Any) -> dict:
    """``results.json`` of a trade-study note: the case's results plus the study's summary.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase, mapping or path-like
        A case with a ``trade_study`` block. [-]

    Returns
    -------
    dict
        :meth:`finkit.model.CaseResult.to_json_dict` with a ``trade_study`` entry: objective,
        design counts, and the chosen and case designs (design variables in m, results in the
        units of :data:`finkit.model.RESULT_UNITS`: K/W, °C, Pa, m³/s, kg, W, K). [-]
    """
    note = run(case)
    out = note.result.to_json_dict()
    study = note.study

    def design_json(d: ChosenDesign | None):
        if d is None:
            return None
        values = {}
        for name, value in d.values.items():
            is_temperature = name.endswith("_temperature")
            if not np.isfinite(value):
                values[name] = None
            else:
                values[name] = value - ZERO_CELSIUS if is_temperature else value
        return {
            "how": d.how,
            "design": d.design,
            "results": values,
            "meets_limit": d.meets_limit,
            "violations": d.violations,
            "active_bounds": list(d.active_bounds),
        }

    out["trade_study"] = {
        "objective": note.block.objective,
        "pareto_objectives": list(note.objectives),
        "designs": len(study),
        "feasible": int(np.sum(study.is_feasible)),
        "meet_limit": int(np.sum(study.meets_limit)),
        "front": int(note.front.size),
        "chosen": design_json(note.chosen),
        "chosen_error": note.chosen_error,
        "case_design": design_json(note.case_design),
    }
    return out


# --------------------------------------------------------------------------------------------
# Formatting helpers


def _fmt(value: float, kind: str | None, unit: str) -> str:
    if value is None or not np.isfinite(value):
        return "—"
    if kind is None:
        return f"{value:.0f}"
    if kind == "mass":
        return f"{value * 1e3:.0f}{_NBSP}g"
    if kind == "thermal_resistance":
        return f"{value:.3f}{_NBSP}K/W"
    if kind == "length":
        mm = value * 1e3
        return f"{mm:.{1 if mm >= 10 else 2}f}{_NBSP}mm"
    if kind == "power":
        return f"{value:.1f}{_NBSP}W"
    if kind == "pressure":
        return f"{value:.1f}{_NBSP}Pa"
    return format_quantity(value, kind, unit).replace(" ", _NBSP)


def _plain(value: float, kind: str | None, unit: str) -> str:
    """A value of the case file's kind with no trailing zeros (``10 mm``, ``0.8 mm``)."""
    if kind is None:
        return f"{value:g}"
    return format_quantity(value, kind, unit).replace(" ", _NBSP)


def _design_text(d: ChosenDesign) -> str:
    x = d.design
    if "fin_count" in x:
        return (
            f"{x['fin_count']:.0f} fins, {x['fin_thickness'] * 1e3:.2f} mm thick, "
            f"{x['fin_height'] * 1e3:.1f} mm tall (gap {x['fin_spacing'] * 1e3:.2f} mm)"
        )
    return (
        f"pins {x['pin_diameter'] * 1e3:.2f} mm in diameter, {x['pin_height'] * 1e3:.1f} mm tall, "
        f"pitch {x['transverse_pitch'] * 1e3:.2f} x {x['longitudinal_pitch'] * 1e3:.2f} mm"
    )


def _c(kelvin: float) -> str:
    return format_quantity(float(kelvin), "temperature", "degC").replace(" ", _NBSP)


def _k(kelvin: float) -> str:
    return format_quantity(float(kelvin), "temperature_difference", "K").replace(" ", _NBSP)


# --------------------------------------------------------------------------------------------
# Text and tables


def title_block(note: TradeNote, note_time: str = "") -> present.Fragment:
    """Title of the trade-study note and its document data (the case's ``title_block``).

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    note_time : str, optional
        ISO 8601 execution time injected by ``finkit.notes.render_note``; empty marks a copy
        run by hand (a draft). [-]

    Returns
    -------
    present.Fragment
        Heading, description and the document data table. [-]
    """
    import datetime as _dt

    tb = note.result.case.title_block
    rows = [
        ("Project", tb.project),
        ("Part", tb.part),
        ("Revision", tb.revision),
        ("Company", tb.company),
        ("Prepared by", tb.prepared_by),
        ("Checked by", tb.checked_by),
        ("Approved by", tb.approved_by),
    ]
    if not note_time:
        now = _dt.datetime.now().astimezone().isoformat(timespec="seconds")
        rows.append(
            (
                "Status of this copy",
                present.badge("warn", f"DRAFT: run by hand at {now}; issue it with 'finkit note'"),
            )
        )
    parts = [present.heading(f"{tb.part}: trade study of the fins", 1)]
    if tb.description:
        parts.append(present.text(tb.description))
    parts.append(present.key_value_table(rows, header=("Document data", "")))
    return _join(*parts)


def study_table(note: TradeNote) -> present.Fragment:
    """What the study varies, the envelope, the manufacturing bounds and the objective.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]

    Returns
    -------
    present.Fragment
        A table: item, value, source. [-]
    """
    block, study = note.block, note.study
    entered = note.result.case.entered.get("trade_study", {})
    rows = []
    grid = block.sampling == "grid"
    for name, values in _axes(block, study.sink_type).items():
        label, kind, unit = _DESIGN[name]
        arr = np.atleast_1d(np.asarray(values, float))
        lo, hi = _plain(float(arr.min()), kind, unit), _plain(float(arr.max()), kind, unit)
        what = f"{lo} to {hi}" + (f", {arr.size} values" if grid else ", sampled")
        rows.append((f"Varied: {label.lower()}", what, "case file"))
    if not grid:
        rows.append(
            (
                "Sampling",
                f"{block.sampling}, {block.samples} designs, seed {block.seed}",
                "case file",
            )
        )
    env = study.envelope
    rows += [
        (
            "Envelope: base (fixed)",
            f"{env.base_width * 1e3:.1f} x {env.base_length * 1e3:.1f} x "
            f"{env.base_thickness * 1e3:.1f} mm (width x length x thickness)",
            "case file (sink.base)",
        ),
        (
            "Envelope: overall height, base included",
            _plain(env.max_height, "length", "mm"),
            "case file" if block.max_height is not None else "the case's present height",
        ),
    ]
    given = entered.get("bounds", {}) if isinstance(entered, dict) else {}
    b = study.bounds
    names = (
        ("min_fin_gap", "Minimum fin gap", "length"),
        ("min_fin_thickness", "Minimum fin thickness", "length"),
        ("max_fin_aspect_ratio", "Maximum fin height / gap", None),
    )
    if not note.is_plate:
        names = (
            ("min_pin_diameter", "Minimum pin diameter", "length"),
            ("min_pin_gap", "Minimum gap between pins", "length"),
            ("max_pin_aspect_ratio", "Maximum pin height / diameter", None),
        )
    for key, label, kind in names:
        value = getattr(b, key)
        text = _plain(value, kind, "mm") if kind else f"{value:g}"
        source = (
            "case file (the user's process)"
            if key in given
            else "finkit default: common practice, no source"
        )
        rows.append((f"Bound: {label.lower()}", text, source))
    rows.append(("Objective", f"{block.objective}: {OBJECTIVE_TEXT[block.objective]}", "case file"))
    rows.append(
        (
            "Pareto objectives (all minimised)",
            ", ".join(_COLUMNS[o][0].lower() for o in note.objectives),
            "case file"
            + (
                " (pressure drop left out: natural convection)"
                if note.is_natural and "pressure_drop" in block.pareto
                else ""
            ),
        )
    )
    return present.html_table(
        rows,
        header=("Item", "Value", "Source"),
        caption="The trade study: design variables, envelope, manufacturing bounds, objective.",
    )


def method_section(note: TradeNote) -> present.Fragment:
    """How the designs were evaluated, what the front is and how the design was chosen."""
    block = note.block
    kept = (
        "Everything else of the case is kept: the heat source and interface, the air "
        "(inlet temperature, altitude), the "
        + ("natural convection" if note.is_natural else "fan or given flow and the bypass gaps")
        + ", the material and finish, the limit and its required margin."
    )
    evaluated = (
        f"Each of the {len(note.study)} designs of the "
        + (
            "grid (every combination of the values above)"
            if block.sampling == "grid"
            else f"{block.sampling} sample"
        )
        + " is first checked against the manufacturing bounds and the envelope; those that "
        "cannot be made are not solved. The others are solved by the same heat-sink model as "
        "the calculation note (finkit.physics.sink: fins, channel or pin-bank correlations, "
        "air heating"
        + ("" if note.is_natural else ", fan operating point with bypass")
        + ") in one vectorised call, at the case's power, and their allowable power at the "
        "limit less the required margin."
    )
    front = (
        "A design is on the Pareto front when no other design that can be made is at least as "
        "good in every objective ("
        + ", ".join(_COLUMNS[o][0].lower() for o in note.objectives)
        + ") and better in one. The front holds the only designs worth choosing between; "
        "which one is right depends on what the product values (lower temperature, lower "
        "pressure drop for the fan, lower mass)."
    )
    if note.optimum is not None:
        chosen = (
            "The chosen design comes from the optimiser: every feasible fin count is screened "
            "on a grid of thickness and height in one vectorised solve, then the best counts are "
            "polished with a gradient method (finkit.model.trade). It searches every fin count "
            "that "
            "fits, fin thickness from the minimum bound up to the top of the thickness range, "
            "fin height from the bottom of the height range up to the envelope and the "
            "height/gap bound; its result need not be a point of the grid."
        )
    else:
        chosen = (
            f"The chosen design is the best point of the "
            f"{'grid' if block.sampling == 'grid' else 'sample'} for the objective: "
            f"{OBJECTIVE_TEXT[block.objective]}."
        )
    same = (
        "The chosen design and the case's design are solved again, one at a time, by the same "
        "function as the grid, so the comparison table compares like with like."
    )
    return _join(
        present.text(kept),
        present.text(evaluated),
        present.text(front),
        present.text(chosen),
        present.text(same),
    )


def headline(note: TradeNote) -> present.Fragment:
    """One paragraph: the chosen design against the case's design, with the limit check."""
    case = note.case_design
    if note.chosen is None:
        return _join(
            present.Fragment(
                f'<p class="fk-verdict">{present.badge(False, "NO DESIGN").__html__()} '
                + present.escape("No design in the study meets the objective: ")
                + f"{present.escape(note.chosen_error)}</p>"
            )
        )
    c = note.chosen
    node = note.study.limit_node
    limit = note.study.limit_temperature
    mass_change = (c.values["mass"] / case.values["mass"] - 1.0) * 100.0
    text = (
        f"Chosen design ({c.how}): {_design_text(c)}. Its {node} reaches "
        f"{_c(c.values['limit_node_temperature'])} at the case's power, "
        f"{_k(c.values['temperature_margin'])} below the {_c(limit)} limit "
        f"(required margin {_k(note.study.required_margin)}); mass "
        f"{_fmt(c.values['mass'], 'mass', 'g')} ({mass_change:+.0f} % against the case's "
        f"{_fmt(case.values['mass'], 'mass', 'g')})"
    )
    if not note.is_natural:
        text += f", pressure drop {_fmt(c.values['pressure_drop'], 'pressure', 'Pa')}"
    text += "."
    if c.active_bounds:
        text += " It sits on: " + "; ".join(c.active_bounds) + "."
    return _join(
        present.Fragment(
            f'<p class="fk-verdict">{present.badge(c.meets_limit).__html__()} '
            f"{present.escape(text)}</p>"
        )
    )


def comparison_table(note: TradeNote) -> present.Fragment:
    """The chosen design against the case's design: geometry, results, limit and bounds.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]

    Returns
    -------
    present.Fragment
        A table: quantity, case design, chosen design, change. [-]
    """
    case, chosen = note.case_design, note.chosen
    designs = [case] + ([chosen] if chosen is not None else [])
    rows = []
    names = [k for k in _DESIGN if k in case.design]
    for name in names:
        label, kind, unit = _DESIGN[name]
        cells = [_fmt(d.design[name], kind, unit) for d in designs]
        rows.append((label, *cells, _change(case.design[name], chosen, name, True)))
    height = "fin_height" if note.is_plate else "pin_height"
    rows.append(
        (
            "Overall height, base included",
            *[
                _fmt(d.design[height] + note.study.envelope.base_thickness, "length", "mm")
                for d in designs
            ],
            "",
        )
    )
    results = [
        "limit_node_temperature",
        "temperature_margin",
        "allowable_power",
        "sink_resistance",
        "total_resistance",
    ]
    if not note.is_natural:
        results += ["pressure_drop", "volume_flow"]
    results.append("mass")
    labels = {
        "limit_node_temperature": (
            f"{note.study.limit_node.capitalize()} temperature",
            "temperature",
            "degC",
        ),
        "temperature_margin": ("Margin below the limit", "temperature_difference", "K"),
        "allowable_power": ("Allowable power (limit less margin)", "power", "W"),
        "sink_resistance": ("Sink resistance", "thermal_resistance", "K/W"),
        "total_resistance": ("Junction to inlet air resistance", "thermal_resistance", "K/W"),
        "pressure_drop": ("Sink pressure drop", "pressure", "Pa"),
        "volume_flow": ("Volume flow through the fins", "volume_flow", "CFM"),
        "mass": ("Mass (metal, base included)", "mass", "g"),
    }
    for name in results:
        label, kind, unit = labels[name]
        rows.append(
            (
                label,
                *[_fmt(d.values[name], kind, unit) for d in designs],
                _change(case.values[name], chosen, name, False),
            )
        )
    rows.append(
        (
            f"Meets the limit with the {_k(note.study.required_margin)} margin",
            *[present.badge(d.meets_limit) for d in designs],
            "",
        )
    )
    rows.append(
        (
            "Manufacturing bounds and envelope",
            *[d.violations or "met" for d in designs],
            "",
        )
    )
    header = ["Quantity", "Case design"] + (["Chosen design"] if chosen else []) + ["Change"]
    return present.html_table(
        rows,
        header=header,
        caption="The chosen design against the case's design, both at the case's power, air "
        "and " + ("natural convection." if note.is_natural else "fan or flow."),
    )


def _change(case_value, chosen, name, is_design) -> str:
    if chosen is None:
        return ""
    new = chosen.design[name] if is_design else chosen.values[name]
    if not (np.isfinite(case_value) and np.isfinite(new)) or case_value == 0:
        return "—"
    if name in ("limit_node_temperature", "temperature_margin"):
        return f"{new - case_value:+.1f}{_NBSP}K"
    if name == "fin_count":
        return f"{new - case_value:+.0f}"
    return f"{(new / case_value - 1) * 100:+.0f}{_NBSP}%"


def feasibility_table(note: TradeNote) -> present.Fragment:
    """How many designs can be made, meet the limit, lie on the front; why the others fail."""
    study = note.study
    n = len(study)
    rows = [
        ("Designs in the study", n),
        ("Can be made (bounds and envelope met)", int(np.sum(study.is_feasible))),
        ("... and meet the limit with the margin", int(np.sum(study.meets_limit))),
        ("On the Pareto front", int(note.front.size)),
        ("... and meet the limit with the margin", int(np.sum(study.meets_limit[note.front]))),
    ]
    if np.any(study.is_extrapolated):
        rows.append(
            (
                "Solved at a lower power and scaled (very hot designs)",
                int(np.sum(study.is_extrapolated)),
            )
        )
    reasons = study.reasons
    for reason in sorted({r for r in reasons if r}):
        rows.append((f"Cannot be made: {reason}", int(np.sum(reasons == reason))))
    return present.html_table(
        rows, header=("Designs", "Count"), caption="Feasibility of the designs of the study."
    )


def front_table(note: TradeNote, rows: int = 15) -> present.Fragment:
    """Front designs that meet the limit, lightest first (at most ``rows`` of them).

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    rows : int, optional
        Most rows shown; when the front holds more, they are picked evenly from lightest to
        heaviest. [-]

    Returns
    -------
    present.Fragment
        A table of design variables and results. [-]
    """
    study = note.study
    meets = note.front[study.meets_limit[note.front]]
    order = meets[np.argsort(study.mass[meets], kind="stable")]
    shown = order
    if order.size > rows:
        shown = order[np.unique(np.round(np.linspace(0, order.size - 1, rows)).astype(int))]
    names = [k for k in _DESIGN if k in study.design and k != "pin_count"]
    cols = ["limit_node_temperature", "sink_resistance"]
    if not note.is_natural:
        cols.append("pressure_drop")
    cols.append("mass")
    chosen_index = note.chosen.grid_index if note.chosen is not None else None
    mark = chosen_index is not None and chosen_index in set(shown.tolist())
    body = []

    def number(value: float, kind: str | None, unit: str = "") -> str:
        # The unit is in the column heading; the cell holds the number only.
        return _fmt(value, kind, unit).rsplit(_NBSP, 1)[0]

    for i in shown:
        cells = [number(float(study.design[k][i]), _DESIGN[k][1]) for k in names]
        cells += [number(float(getattr(study, c)[i]), _COLUMNS[c][1], _COLUMNS[c][2]) for c in cols]
        cells.append(number(float(study.allowable_power[i]), "power"))
        if mark:
            cells.append("chosen" if int(i) == chosen_index else "")
        body.append(cells)
    short = {
        "fin_count": "Fins",
        "fin_thickness": "Thickness [mm]",
        "fin_height": "Height [mm]",
        "fin_spacing": "Gap [mm]",
        "pin_diameter": "Diameter [mm]",
        "pin_height": "Height [mm]",
        "transverse_pitch": "Pitch across [mm]",
        "longitudinal_pitch": "Pitch along [mm]",
        "limit_node_temperature": f"{study.limit_node.capitalize()} [°C]",
        "sink_resistance": "R_sink [K/W]",
        "pressure_drop": "Δp [Pa]",
        "mass": "Mass [g]",
    }
    header = [short[k] for k in names] + [short[c] for c in cols] + ["Allowable power [W]"]
    if mark:
        header.append("")
    caption = f"Pareto-front designs that meet the limit with the margin: {order.size}" + (
        f", {len(shown)} shown, picked evenly from lightest to heaviest."
        if order.size > rows
        else ", lightest first."
    )
    if not body:
        return present.text("No design on the Pareto front meets the limit with the margin.")
    return present.html_table(body, header=header, caption=caption)


def warnings_section(note: TradeNote) -> present.Fragment:
    """Validity messages of the chosen design's solution (and of the case's design)."""
    items = []
    for d in (note.chosen, note.case_design):
        if d is None:
            continue
        items += [f"{d.label}: {w}" for w in d.warnings]
    if not items:
        return present.text(
            "No model left its validity range for the chosen design or the case's design."
        )
    from finkit.report.formatting import _bullets

    return _bullets(items)


def cautions(note: TradeNote) -> present.Fragment:
    """What the trade study does not cover."""
    from finkit.report.formatting import _bullets

    bypass = note.result.inputs.bypass
    items = [
        "Manufacturing bounds are the user's to set for the chosen process and supplier; "
        "finkit's default values are common practice, no source. A design on a bound (see the "
        "headline) is only as good as that bound.",
        "The grid is coarse: the front between grid points is not resolved. Use the chosen "
        "design's numbers, not values read off the plots, and check the chosen design with "
        "its own calculation note ('finkit note' on a case with that geometry).",
    ]
    chosen = note.chosen
    if chosen is not None and (
        chosen.values["temperature_margin"] < note.study.required_margin + 0.5
    ):
        items.append(
            f"The chosen design keeps only the required {_k(note.study.required_margin)} "
            f"margin (it has {_k(chosen.values['temperature_margin'])}): lightest-meeting-limit "
            "designs sit on the limit by construction. Any input worse than stated (power, "
            "inlet air, fan, dust, tolerances) puts it over; run the chosen design's own note "
            "with the case's scenarios and tolerances before adopting it."
        )
    if bypass is not None and not note.is_natural:
        items.append(
            "The bypass gaps are kept as in the case for every design. In a duct of fixed "
            "height a shorter fin leaves a larger gap above the tips, so more air bypasses the "
            "fins than modelled here: short-fin designs are optimistic. Re-check the chosen "
            "design with the gap its duct really leaves."
        )
    if not note.is_natural:
        items.append(
            "The same fan (or flow) serves every design; a design with a higher pressure drop "
            "moves the operating point, which is included, but fan noise and power are not."
        )
    items += [
        "Mass is the metal of base and fins only (no clips, heat pipes or fasteners).",
        "Operating scenarios, the touch check and the tolerances of the case are not re-run "
        "for each design; run them on the chosen design's own case.",
        "This note is an engineering calculation aid. It does not replace the judgement of a "
        "qualified engineer, who remains responsible for the design.",
    ]
    return _bullets(items)


# --------------------------------------------------------------------------------------------
# Figures


def _display(name: str, values):
    values = np.asarray(values, float)
    if name == "mass":
        return values * 1e3
    if name.endswith("_temperature"):
        return from_si(values, "temperature", "degC")
    return values


def _marker_value(d: ChosenDesign | None, name: str):
    if d is None:
        return None
    v = d.values[name]
    return float(_display(name, v)) if np.isfinite(v) else None


def plot_front(note: TradeNote, pair: tuple[str, str] | None = None):
    """One 2-D projection of the study's designs, the front and the chosen design.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    pair : (str, str), optional
        The x and y objectives; default the first two of :attr:`TradeNote.objectives`. The
        colour shows the third objective (or the limit-node temperature with two). [-]

    Returns
    -------
    matplotlib.figure.Figure
        Designs that can be made and meet the limit (coloured), that miss the limit (grey),
        the front (black edge), the chosen design (star) and the case's design (diamond). [-]
    """
    study = note.study
    x_name, y_name = pair or note.objectives[:2]
    others = [o for o in note.objectives if o not in (x_name, y_name)]
    c_name = others[0] if others else "limit_node_temperature"
    x = _display(x_name, study.column(x_name))
    y = _display(y_name, study.column(y_name))
    c = _display(c_name, study.column(c_name))
    meets = study.meets_limit
    misses = study.is_feasible & ~meets
    on_front = np.zeros(len(study), dtype=bool)
    on_front[note.front] = True
    finite = np.isfinite(c[study.is_feasible])
    vmin, vmax = (
        (float(np.min(c[study.is_feasible][finite])), float(np.max(c[study.is_feasible][finite])))
        if np.any(finite)
        else (0.0, 1.0)
    )
    with _style():
        from matplotlib.cm import ScalarMappable
        from matplotlib.colors import Normalize
        from matplotlib.lines import Line2D

        fig, axes = _figure((6.6, 5.0))
        ax = axes[0, 0]
        norm = Normalize(vmin=vmin, vmax=vmax)
        grey = "#c8c8c8"
        for mask, size, edge in ((misses & ~on_front, 9, 0.0), (misses & on_front, 22, 0.6)):
            ax.scatter(
                x[mask],
                y[mask],
                s=size,
                color=grey,
                edgecolors="black" if edge else "none",
                linewidths=edge,
                zorder=1 + (edge > 0),
            )
        for mask, size, edge, alpha in (
            (meets & ~on_front, 10, 0.0, 0.55),
            (meets & on_front, 22, 0.6, 1.0),
        ):
            ax.scatter(
                x[mask],
                y[mask],
                c=c[mask],
                s=size,
                cmap="viridis",
                norm=norm,
                edgecolors="black" if edge else "none",
                linewidths=edge,
                alpha=alpha,
                zorder=2 + (edge > 0),
            )
        handles = [
            Line2D([], [], linestyle="", marker="o", markersize=4, color=grey),
            Line2D([], [], linestyle="", marker="o", markersize=4, color="#21918c"),
            Line2D(
                [],
                [],
                linestyle="",
                marker="o",
                markersize=5,
                markerfacecolor="none",
                markeredgecolor="black",
            ),
        ]
        labels = [
            f"Misses the limit with margin ({int(np.sum(misses))})",
            f"Meets it ({int(np.sum(meets))}); colour: {_COLUMNS[c_name][0].lower()}",
            f"On the Pareto front ({int(np.sum(on_front))})",
        ]
        for d, marker, size, colour in (
            (note.case_design, "D", 60, "white"),
            (note.chosen, "*", 220, COLOURS["limit"]),
        ):
            xv, yv = _marker_value(d, x_name), _marker_value(d, y_name)
            if xv is None or yv is None:
                continue
            ax.scatter(
                [xv],
                [yv],
                marker=marker,
                s=size,
                color=colour,
                edgecolors="black",
                linewidths=1.0,
                zorder=5,
            )
            handles.append(
                Line2D(
                    [],
                    [],
                    linestyle="",
                    marker=marker,
                    markersize=11 if marker == "*" else 7,
                    markerfacecolor=colour,
                    markeredgecolor="black",
                )
            )
            labels.append(d.label + (f" ({note.block.objective})" if d is note.chosen else ""))
        colourbar = fig.colorbar(ScalarMappable(norm=norm, cmap="viridis"), ax=ax, pad=0.02)
        colourbar.set_label(_COLUMNS[c_name][3] if c_name in _COLUMNS else c_name)
        ax.set_xlabel(_COLUMNS[x_name][3])
        ax.set_ylabel(_COLUMNS[y_name][3])
        fig.legend(handles, labels, loc="outside lower center", ncol=2, fontsize=8)
    return fig


def figure_front(note: TradeNote) -> present.Fragment:
    """Every 2-D projection of the front (:func:`plot_front`), each with its caption."""
    parts = []
    pairs = list(combinations(note.objectives, 2))
    for number, pair in enumerate(pairs, start=1):
        others = [o for o in note.objectives if o not in pair]
        colour = _COLUMNS[others[0]][0].lower() if others else "limit-node temperature"
        caption = (
            f"Figure {number}. {_COLUMNS[pair[1]][0]} against {_COLUMNS[pair[0]][0].lower()} of "
            f"every design that can be made, coloured by {colour}. Grey: misses the limit with "
            "the required margin. Black edge: on the Pareto front of "
            + ", ".join(_COLUMNS[o][0].lower() for o in note.objectives)
            + " (a front in more than two objectives need not look like a front in one "
            "projection). Star: the chosen design; diamond: the case's design."
        )
        parts.append(present.figure(plot_front(note, pair), caption=caption))
    return _join(*parts)


def _slice(study, note: TradeNote):
    """Designs of the grid at the chosen (or case) value of the variables not plotted.

    Returns the mask of the slice, its description and the slice value of each fixed
    variable [m].
    """
    if note.block.sampling != "grid":
        return np.ones(len(study), dtype=bool), "", {}
    ref = note.chosen or note.case_design
    if note.is_plate:
        fixed = ["fin_thickness"]
    else:
        fixed = ["pin_height"] + (["longitudinal_pitch"] if note.block.longitudinal_pitch else [])
    keep = np.ones(len(study), dtype=bool)
    text, at = [], {}
    for name in fixed:
        values = np.unique(study.design[name])
        nearest = float(values[np.argmin(np.abs(values - ref.design[name]))])
        keep &= np.isclose(study.design[name], nearest)
        text.append(f"{_DESIGN[name][0].lower()} {nearest * 1e3:.2f} mm")
        at[name] = nearest
    return keep, ", ".join(text), at


def plot_design_space(note: TradeNote):
    """Which designs can be made and which meet the limit, over two design variables.

    Plate fins: fin count against fin height; pins: pin diameter against the pitch across
    the flow. For a grid only the slice at the grid value nearest the chosen design's other
    variables is shown.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]

    Returns
    -------
    matplotlib.figure.Figure
    """
    study = note.study
    keep, fixed, at = _slice(study, note)
    if note.is_plate:
        x_name, y_name = "fin_count", "fin_height"
    else:
        x_name, y_name = "pin_diameter", "transverse_pitch"
    x = study.design[x_name] * (1.0 if x_name == "fin_count" else 1e3)
    y = study.design[y_name] * 1e3
    groups = [
        (~study.is_feasible, "x", "#9a9a9a", "Cannot be made"),
        (study.is_feasible & ~study.meets_limit, "o", "#e3a36b", "Misses the limit with margin"),
        (study.meets_limit, "o", COLOURS["primary"], "Meets the limit with margin"),
    ]
    on_front = np.zeros(len(study), dtype=bool)
    on_front[note.front] = True
    with _style():
        fig, axes = _figure((6.6, 5.2))
        ax = axes[0, 0]
        for mask, marker, colour, label in groups:
            m = mask & keep
            ax.scatter(
                x[m],
                y[m],
                marker=marker,
                s=22,
                color=colour,
                label=f"{label} ({int(np.sum(m))})",
                linewidths=1.0 if marker == "x" else 0,
            )
        m = on_front & keep
        ax.scatter(
            x[m],
            y[m],
            s=60,
            facecolors="none",
            edgecolors="black",
            linewidths=0.9,
            label=f"On the Pareto front ({int(np.sum(m))})",
        )
        for d, marker, size, colour in (
            (note.case_design, "D", 60, "white"),
            (note.chosen, "*", 220, COLOURS["limit"]),
        ):
            if d is None:
                continue
            off = {k: v for k, v in at.items() if not np.isclose(d.design[k], v, rtol=1e-6)}
            label = d.label
            if off:
                label += (
                    " ("
                    + ", ".join(f"{_DESIGN[k][0].lower()} {d.design[k] * 1e3:.2f} mm" for k in off)
                    + ": off this slice)"
                )
            xv = d.design[x_name] * (1.0 if x_name == "fin_count" else 1e3)
            ax.scatter(
                [xv],
                [d.design[y_name] * 1e3],
                marker=marker,
                s=size,
                color="none" if off else colour,
                edgecolors=colour if off and colour != "white" else "black",
                linewidths=1.0,
                label=label,
                zorder=5,
            )
        env = study.envelope
        if note.is_plate and np.isfinite(env.max_height):
            ax.axhline(
                (env.max_height - env.base_thickness) * 1e3,
                color=COLOURS["limit"],
                linestyle="--",
                linewidth=1.2,
                label="Tallest fin the envelope admits",
            )
        ax.set_xlabel(f"{_DESIGN[x_name][0]}" + (" [-]" if x_name == "fin_count" else " [mm]"))
        ax.set_ylabel(f"{_DESIGN[y_name][0]} [mm]")
        if fixed:
            ax.set_title(f"Slice of the grid at {fixed}", loc="left", fontsize=9)
        fig.legend(loc="outside lower center", ncol=2, fontsize=8)
    return fig


def figure_design_space(note: TradeNote) -> present.Fragment:
    """:func:`plot_design_space` embedded with its caption."""
    number = len(list(combinations(note.objectives, 2))) + 1
    what = "fin count and fin height" if note.is_plate else "pin diameter and pitch across the flow"
    caption = (
        f"Figure {number}. The design space over {what}: which designs the manufacturing bounds "
        "and the envelope allow, and which of those keep the limit node the required margin "
        "below its limit at the case's power. The star is the chosen design (it may lie "
        "between grid points), the diamond the case's design."
    )
    return present.figure(plot_design_space(note), caption=caption)
