"""Text and tables of the trade-study note, from the headline to the cautions."""

from __future__ import annotations

import numpy as np

from finkit.case.units import format_quantity
from finkit.model.trade.case_study import design_axes
from finkit.report import present
from finkit.report.formatting import _join
from finkit.report.trade.study import (
    _COLUMNS,
    _DESIGN,
    _NBSP,
    OBJECTIVE_TEXT,
    ChosenDesign,
    TradeNote,
)

__all__ = [
    "cautions",
    "comparison_table",
    "feasibility_table",
    "front_table",
    "headline",
    "method_section",
    "study_table",
    "title_block",
    "warnings_section",
]


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
    for name, values in design_axes(block).items():
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
    """How the designs were evaluated, what the front is and how the design was chosen.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
    block = note.block
    kept = (
        "Everything else of the case is kept: the heat source and interface, the air "
        "(inlet temperature, altitude), the "
        + (
            "natural convection"
            if note.is_natural
            else "fan or given flow and the bypass statement"
        )
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
    """One paragraph: the chosen design against the case's design, with the limit check.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
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
    """How many designs can be made, meet the limit, lie on the front; why the others fail.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
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
    """Validity messages of the chosen design's solution (and of the case's design).

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
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
    """What the trade study does not cover.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
    from finkit.report.formatting import _bullets, _is_free_stream

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
    if _is_free_stream(note.result) and not note.is_natural:
        items.append(
            "Every design stands unshrouded in the same approach stream; the share of the "
            "stream through its fins is re-solved for each design (Lee's bypass balance, free "
            "stream): a denser or taller fin array sends more of the stream round the sink."
        )
    elif bypass is not None and not note.is_natural:
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
