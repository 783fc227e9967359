"""A case's trade study, run: the designs of its ``trade_study`` block solved, the Pareto front,
the chosen design (by the block's objective) and the case's own design, as a typed result.

The model-layer orchestration of the trade-study note: :func:`run_trade_study` returns a
:class:`TradeNote` that :mod:`finkit.report.trade` only formats, and :func:`trade_results_json`
is the note's results.json (the case's results plus the study's summary).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError, SolverError
from finkit.model.results import RESULT_UNITS

__all__ = [
    "OBJECTIVE_TEXT",
    "ChosenDesign",
    "TradeNote",
    "design_axes",
    "run_trade_study",
    "trade_results_json",
]


#: What each ``trade_study.objective`` asks, in words.
OBJECTIVE_TEXT = {
    "coolest": "the coolest design (limit node) for this fan or flow",
    "lightest-meeting-limit": "the lightest design that keeps the limit node the required "
    "margin below its limit",
    "pareto": "the lightest design on the Pareto front that meets the limit with the margin",
}


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
    from finkit.case.bounds import Envelope, ManufacturingBounds
    from finkit.model.design import solve

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


def design_axes(block):
    """The design variables of a ``trade_study`` block as arrays (SI), by name.

    Parameters
    ----------
    block : finkit.case.explore_blocks.TradeStudyBlock
        The validated block. [-]
    """
    from finkit.case.explore_blocks import to_trade_axes

    return to_trade_axes(block)


def _study(inputs, block, bounds, envelope):
    from finkit.model import trade

    axes = design_axes(block)
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


def run_trade_study(case: Any) -> TradeNote:
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
    # Long by design: the trade study's steps in order (validate, grid or sample, solve, front,
    # chosen design, results).
    from finkit.case.explore_blocks import to_bounds, to_envelope
    from finkit.case.heat_sink import Case
    from finkit.case.schema import load_case
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
    axes = design_axes(block)
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


def trade_results_json(case: Any) -> dict:
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
    note = run_trade_study(case)
    out = note.result.to_json_dict()
    study = note.study

    def design_json(d: ChosenDesign | None):
        if d is None:
            return None
        values = {}
        for name, value in d.values.items():
            is_temperature = RESULT_UNITS.get(name) == "degC"  # the unit, not the name
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
