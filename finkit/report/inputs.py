"""The entry (:func:`run`), title block, inputs as entered and in SI, derived geometry, and the
comparison with the previous revision.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

import datetime as _dt
import math
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from finkit.case.parameters import case_from_parameters  # noqa: F401 - re-exported: templates call report.case_from_parameters
from finkit.constants import ZERO_CELSIUS
from finkit.report import present
from finkit.report.formatting import (
    _NBSP,
    _air,
    _bullets,
    _c,
    _f,
    _is_heat_sink,
    _is_natural,
    _is_plate,
    _join,
    _k,
    _node,
    _node_cell,
    _node_name,
    _q,
    _review_of,
    _sig,
)

__all__ = [
    "case_from_parameters",
    "changes_since",
    "changes_since_line",
    "changes_since_section",
    "derived_geometry_table",
    "inputs_table",
    "run",
    "title_block",
    "verdict_page",
]


def run(case: Any, solved: str | None = None):
    """Validate a case (dict as entered, YAML text or path) and solve it.

    Parameters
    ----------
    case : mapping, str or path-like
        The case as entered (the ``case`` parameter of a template), or a validated case. [-]
    solved : str, optional
        File in which ``finkit note`` left the solution it computed for results.json
        (:func:`finkit.model.handover.write_solved`); used only when it is for these very inputs
        and this
        finkit version, otherwise the case is solved here. [-]

    Returns
    -------
    finkit.model.CaseResult
        ``finkit.model.run_case(finkit.case.load_case(case))``. [-]
    """
    from finkit.case.heat_sink import Case
    from finkit.case.schema import load_case

    validated = case if isinstance(case, Case) else load_case(case)
    if solved:
        from finkit.model.handover import read_solved

        handed = read_solved(solved, validated)
        if handed is not None:
            result = handed["result"]
            if "comparison" in handed:
                _remember_comparison(result, handed["comparison"])
            if "sections_folder" in handed:
                from finkit.report.ahead import remember_folder

                remember_folder(result, handed["sections_folder"])
            return result
    from finkit.model.run import run_case

    return run_case(validated)


# --------------------------------------------------------------------------------------------
# Title block and inputs


def title_block(result, note_time: str = "") -> present.Fragment:
    """Title of the note and its document data from the case's ``title_block``.

    The page frame of a rendered note already shows the case id, execution time, finkit version,
    inputs hash and the sign-off table, so they are not repeated here. When ``note_time`` is
    empty (a template run by hand in JupyterLab) the block says so: that copy is not issued.

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]
    note_time : str, optional
        ISO 8601 execution time injected by ``finkit.notes.render_note``. [-]

    Returns
    -------
    present.Fragment
        Heading, description and a table of project, part, revision, company and names. [-]
    """
    case = result.case
    tb = case.title_block
    kind = "Heat-sink thermal calculation" if _is_heat_sink(result) else "Single-fin study"
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
                present.badge(
                    "warn",
                    f"DRAFT: run by hand at {now}; issue it with 'finkit note'",
                ),
            )
        )
    parts = [present.heading(f"{tb.part}: {kind.lower()}", 1)]
    if tb.description:
        parts.append(present.text(tb.description))
    parts.append(present.key_value_table(rows, header=("Document data", "")))
    return _join(*parts)


def _k3(kelvin_difference: float) -> str:
    """A temperature difference to 3 significant figures (margins)."""
    return f"{_sig(kelvin_difference)}{_NBSP}K"


def _margin_text(margin: float, required: float) -> str:
    """A margin read against the required one; a negative margin reads 'above the limit'."""
    if margin < 0:
        return f"{_sig(-margin)}{_NBSP}K above the limit"
    if margin < required:
        return (
            f"{_sig(margin)}{_NBSP}K, {_sig(required - margin)}{_NBSP}K short of the required "
            f"{_sig(required)}{_NBSP}K"
        )
    return f"{_sig(margin)}{_NBSP}K (required {_sig(required)}{_NBSP}K)"


def _ranked_warnings(result) -> list[str]:
    """Warnings, most serious first: a model that reads low, scenarios that check nothing
    harsher, input flags, then validity messages."""

    def rank(w: str) -> int:
        if w.startswith("calibration:"):
            return 0
        if (
            "checks nothing harsher" in w
            or "milder than the nominal" in w
            or w.startswith("scenarios: none given")
        ):
            return 1
        flags = getattr(_review_of(result), "flags", ()) or ()
        return 2 if w in flags else 3

    return sorted(result.warnings, key=rank)


def _condition_rows(table, *, compact: bool) -> list[tuple]:
    rows = []
    for r in sorted(table.rows, key=lambda r: (not r.is_governing, r.name != "nominal")):
        name = r.name + (" (governing)" if r.is_governing else "")
        changes = ", ".join(r.changes) if r.changes else "as stated"
        row = [name, changes, _c(r.inlet_temperature), _node_cell(r, table)]
        row += [_margin_text(r.margin, r.required_margin) if not compact else _k3(r.margin)]
        row += [_q(r.allowable_power, "power", "W"), present.badge(r.status == "pass")]
        rows.append(tuple(row))
    return rows


def verdict_page(result, note_time: str = "") -> present.Fragment:
    """Page 1 of a heat-sink note: the verdict on the governing condition and the sign-off.

    Status; the governing condition and why it governs; its limit-node temperature against the
    limit, its margin against the required margin and its allowable power against the stated
    power (all from that one condition); the calibrated result beside it when test data read
    higher than the model; the number of warnings with the most serious ones; a compact table
    of every condition; and the sign-off block. Software details are in the provenance footer.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    note_time : str, optional
        ISO 8601 execution time injected by ``finkit.notes.render_note``; empty for a copy run
        by hand (marked DRAFT). [-]

    Returns
    -------
    present.Fragment
        The first page. [-]
    """
    # Long by design: page 1 of the note in reading order (verdict, governing condition, headline
    # numbers, sign-off block).
    case, tb = result.case, result.case.title_block
    table = result.conditions
    gov = result.governing
    node = _node(result)
    ok = result.status == "pass"
    date = note_time[:10] if note_time else "DRAFT (not issued)"
    parts = [present.heading(f"{tb.part}: heat-sink thermal calculation", 1)]
    if tb.description:
        parts.append(present.text(tb.description, css_class="fk-lede"))
    doc = [
        ("Project", tb.project, "Part", tb.part),
        ("Revision", tb.revision, "Date", date),
        ("Company", tb.company or "—", "Case", case.case_id),
    ]
    parts.append(present.html_table(doc, css_class="fk-docdata"))
    if not note_time:
        now = _dt.datetime.now().astimezone().isoformat(timespec="seconds")
        parts.append(
            present.badge("warn", f"DRAFT: run by hand at {now}; issue it with 'finkit note'")
        )

    verdict = (
        f"{'Passes' if ok else 'Fails'} on the governing condition '{gov.name}'"
        + (f" ({gov.description})" if gov.description else "")
        + f": {node} {_c(gov.node_temperature)} against the {_c(gov.limit_temperature)} "
        f"limit, margin {_margin_text(gov.margin, gov.required_margin)}."
    )
    parts.append(
        present.Fragment(
            f'<div class="fk-verdict-box fk-verdict-{"pass" if ok else "fail"}">'
            f'<p class="fk-verdict">{present.escape(present.badge(ok, "PASS" if ok else "FAIL"))}'
            f" {present.escape(verdict)}</p>"
            f'<p class="fk-small">Why it governs: {present.escape(table.reason)}.</p></div>'
        )
    )
    parts.append(changes_since_line(result))
    rise = gov.node_temperature - gov.inlet_temperature
    share = f" ({gov.margin / rise * 100:.0f} % of the rise)" if rise > 0 else ""
    checks = [
        (
            f"{_node_name(result)} temperature",
            _c(gov.node_temperature),
            f"limit {_c(gov.limit_temperature)}",
            present.badge(gov.node_temperature <= gov.limit_temperature),
        ),
        (
            "Margin below the limit",
            f"{_k3(gov.margin)}{share}",
            f"required {_k(gov.required_margin)}",
            present.badge(gov.margin >= gov.required_margin),
        ),
        (
            "Allowable power (limit less the margin)"
            + (", every source scaled alike" if gov.sources else ""),
            _q(gov.allowable_power, "power", "W"),
            f"stated {_q(gov.power, 'power', 'W')}",
            present.badge(gov.allowable_power >= gov.power),
        ),
        (
            "Power at the limit (no margin)",
            _q(gov.power_at_limit, "power", "W"),
            "for information",
            present.badge("info"),
        ),
    ]
    least = table.least_allowable_power_row
    if least is not gov and least.allowable_power < gov.allowable_power:
        checks.append(
            (
                f"Least allowable power: '{least.name}'",
                _q(least.allowable_power, "power", "W"),
                f"stated {_q(least.power, 'power', 'W')}",
                present.badge(least.allowable_power >= least.power),
            )
        )
    review = _review_of(result)
    calibration = getattr(review, "calibration", None)
    other = getattr(review, "calibrated_governing", None)
    if calibration is not None and other is not None:
        which = "uncalibrated" if calibration.is_applied else "calibrated"
        checks.append(
            (
                f"Same condition, {which} (x{_sig(calibration.multiplier)} on "
                f"{'h' if calibration.target == 'heat_transfer' else 'R_sink'})",
                _c(other["limit_node_temperature"] + ZERO_CELSIUS),
                f"margin {_margin_text(other['temperature_margin'], other['required_margin'])}; "
                f"allowable {_q(other['allowable_power'], 'power', 'W')}",
                present.badge(
                    "warn" if calibration.reads_low else "info",
                    "READS LOW" if calibration.reads_low else "INFO",
                ),
            )
        )
    parts.append(
        present.html_table(
            checks,
            header=("Check at the governing condition", "Result", "Against", ""),
            css_class="fk-checks",
        )
    )

    if gov.sources:
        from finkit.report.sources import source_rows_table

        parts.append(
            _join(
                present.text(
                    f"Each source against its own limit at '{gov.name}'; the governing source "
                    f"'{gov.governing_source}' leads (details in section 1):",
                    css_class="fk-small",
                ),
                source_rows_table(result, compact=True),
            )
        )
    ranked = _ranked_warnings(result)
    if ranked:
        shown = ranked[:3]
        more = len(ranked) - len(shown)
        parts.append(
            _join(
                present.text(
                    f"{len(ranked)} warning{'s' if len(ranked) > 1 else ''}; the most serious:"
                    + (f" (and {more} more in section 7)" if more else ""),
                    css_class="fk-small",
                ),
                _bullets(_one_line(w, 320) for w in shown),
            )
        )
    else:
        parts.append(present.text("No warning.", css_class="fk-small"))
    parts.append(
        present.html_table(
            _condition_rows(table, compact=True),
            header=(
                "Condition",
                "Changes from nominal",
                f"{_air(result, True)}",
                f"{_node_name(result)}",
                "Margin",
                "Allowable power",
                "",
            ),
            caption=f"Every operating condition checked ({len(table.rows)}), governing first.",
            css_class="fk-conditions",
        )
    )
    names = [
        ("Prepared by", tb.prepared_by),
        ("Checked by", tb.checked_by),
        ("Approved by", tb.approved_by),
    ]
    parts.append(
        present.html_table(
            [(role, name or "", "", "") for role, name in names],
            header=("Sign-off", "Name", "Signature", "Date"),
            css_class="fk-signoff-table",
        )
    )
    return present.Fragment(
        '<section class="fk-page1">' + "".join(present.escape(p) for p in parts) + "</section>"
    )


_COMPARISONS: dict[int, tuple[Any, Any]] = {}


def changes_since(result):
    """The comparison of this case with its ``previous_revision`` (None without one).

    Solved once per result (the page-1 line and the section share it). A previous revision
    that cannot be read gives a :class:`finkit.errors.FinkitError` instance instead, which the
    note shows as text.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    previous = getattr(result.case, "previous_revision", None)
    if previous is None:
        return None
    cached = _COMPARISONS.get(id(result))
    if cached is not None and cached[0] is result:
        return cached[1]
    from finkit.errors import FinkitError
    from finkit.report.compare import Revision, compare, load_revision, remember_margin

    current = Revision(
        label=f"this note ({result.case.case_id})",
        source="case",
        entered=result.case.entered,
        results=result.to_json_dict(),
        is_hash_ok=True,
    )
    remember_margin(result.case.entered, result.results)  # solved in full: no second solve
    try:
        comparison: Any = compare(load_revision(previous.source), current)
    except FinkitError as exc:
        comparison = exc
    _remember_comparison(result, comparison)
    return comparison


def _remember_comparison(result, comparison) -> None:
    if len(_COMPARISONS) > 8:
        _COMPARISONS.clear()
    _COMPARISONS[id(result)] = (result, comparison)


def changes_since_line(result) -> present.Fragment:
    """One line for page 1: what changed since the previous revision and what it did.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    comparison = changes_since(result)
    if comparison is None:
        return present.Fragment("")
    revision = result.case.previous_revision.revision
    if isinstance(comparison, Exception):
        return present.text(
            f"Changes since revision {revision}: not compared ({comparison}).", css_class="fk-small"
        )
    flag = (
        " The previous revision's results do not match its inputs (edited by hand?)."
        if comparison.old.is_hash_ok is False
        else ""
    )
    return present.text(
        f"Changes since revision {revision}: {comparison.summary_line()}.{flag}",
        css_class="fk-changes",
    )


def changes_since_section(result) -> present.Fragment:
    """The changes since the previous revision in full (empty without a previous revision).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    from finkit.report.compare import changes_table

    comparison = changes_since(result)
    if comparison is None:
        return present.Fragment("")
    revision = result.case.previous_revision.revision
    parts: list[Any] = [present.heading(f"Changes since revision {revision}", 2)]
    if isinstance(comparison, Exception):
        parts.append(present.text(f"The previous revision could not be compared: {comparison}"))
        return _join(*parts)
    g = comparison.governing
    parts.append(
        present.text(
            f"Compared with {Path(comparison.old.label).name} ({comparison.old.source}). Status "
            f"{g['old_status']} -> {g['new_status']}; governing condition {g['old_condition']} "
            f"-> {g['new_condition']}"
            + (
                f"; governing margin {g['old_margin']:.3g} K -> {g['new_margin']:.3g} K "
                f"({comparison.margin_change:+.3g} K)."
                if comparison.margin_change is not None
                else "."
            )
        )
    )
    if comparison.notes:
        parts.append(_bullets(comparison.notes))
    parts.append(changes_table(comparison))
    return _join(*parts)


def _one_line(text: str, limit: int = 220) -> str:
    line = " ".join(str(text).split())
    return line if len(line) <= limit else line[: limit - 1] + "…"


_NOT_INPUTS = {"case_id", "kind", "title_block", "previous_revision"}

#: Blocks whose items (scenarios, measurements, tolerances) take one row each in the inputs
#: table; their own sections show them in full.
_GROUPED_BLOCKS = {"scenarios", "measurements", "tolerances"}
_TEXT_FIELDS = {"name", "description", "source", "basis", "distribution"}

#: Defaults listed in the inputs table (the last part of the field path): values a case left
#: out that change the answer and that a reviewer should see.
_NOTABLE_DEFAULTS = {
    "surroundings_temperature",
    "altitude",
    "rating_density",
    "arrangement",
    "required_margin",
    "junction_to_case",
    "emissivity",
    "finish",
    "measurement_uncertainty",
    "apply",
    "target",
    "ambient_temperature",
}


_PRETTY_UNITS = {
    "m^2": "m²",
    "K*m^2/W": "K·m²/W",
    "W/m/K": "W/(m·K)",
    "W/m^2/K": "W/(m²·K)",
    "m^3/s": "m³/s",
    "kg/m^3": "kg/m³",
    "": "-",
}


def _leaves(data: Any, path: tuple = ()) -> list[tuple[tuple, Any]]:
    """(path, value) of every leaf; lists of mappings are walked with integer indexes."""
    if isinstance(data, Mapping):
        out = []
        for key, value in data.items():
            out += _leaves(value, (*path, key))
        return out
    if isinstance(data, list | tuple) and any(isinstance(v, Mapping) for v in data):
        out = []
        for i, value in enumerate(data):
            out += _leaves(value, (*path, i))
        return out
    return [(path, data)]


def _lookup(data: Any, path: tuple) -> Any:
    for key in path:
        if isinstance(key, int) and isinstance(data, list | tuple) and key < len(data):
            data = data[key]
        elif isinstance(data, Mapping) and key in data:
            data = data[key]
        else:
            return None
    return data


def _path_text(path: tuple) -> str:
    """``a.b[0].c`` with a break opportunity after each dot (long paths wrap in a table)."""
    text = ""
    for part in path:
        text += f"[{part}]" if isinstance(part, int) else (f".\u200b{part}" if text else str(part))
    return text


def _number_unit(value: float, unit: str | None) -> str:
    text = _sig(value, 4)
    return f"{text}\u00a0{unit}" if unit and unit != "-" else text


def _infer_kind(entered: Any, value: float) -> str | None:
    """The unit kind under which ``entered`` converts to ``value`` (SI), if any."""
    from finkit.case.units import KINDS, to_si

    if not isinstance(entered, str):
        return None
    order = ["temperature_difference", *(k for k in KINDS if k != "temperature_difference")]
    for kind in order:
        try:
            x = to_si(entered, kind, "")
        except Exception:  # noqa: BLE001 - not this kind
            continue
        if math.isclose(x, value, rel_tol=1e-9, abs_tol=1e-15):
            return kind
    return None


def _si_text(case: Any, path: tuple, value: Any, entered: Any = None) -> str:
    """The SI value of one input with its unit (absolute temperatures also in °C).

    The unit comes from the field's type in the case schema (:func:`unit_kind_at`); only a
    value inside a block whose fields have no fixed kind (a tolerance's ``low``/``high``) takes
    its kind from the unit it was entered with.
    """
    from finkit.case.fields import unit_kind_at
    from finkit.case.units import KINDS

    if value is None:
        return "—"
    if isinstance(value, bool | str):
        return str(value)
    kind = unit_kind_at(case, path)
    if kind is None:
        sample = entered[0] if isinstance(entered, list | tuple) and entered else entered
        number = value[0] if isinstance(value, list | tuple) and value else value
        if isinstance(number, int | float) and not isinstance(number, bool):
            kind = _infer_kind(sample, float(number))
    unit = _PRETTY_UNITS.get(KINDS[kind][0], KINDS[kind][0]) if kind else None
    if isinstance(value, list | tuple):
        numbers = [v for v in value if isinstance(v, int | float) and not isinstance(v, bool)]
        if len(numbers) != len(value):
            return ", ".join(str(v) for v in value)
        text = ", ".join(_sig(v, 4) for v in numbers)
        return f"{text} {unit}" if unit and unit != "-" else text
    if not isinstance(value, int | float):
        return str(value)
    if kind == "temperature":
        return f"{_number_unit(value, 'K')} ({_c(value)})"
    return _number_unit(value, unit)


def _entered_text(value: Any) -> str:
    if isinstance(value, list | tuple):
        return ", ".join(str(v) for v in value)
    return str(value)


def inputs_table(result) -> present.Fragment:
    """The case inputs as entered and in SI, plus the defaults the case file left out.

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]

    Returns
    -------
    present.Fragment
        A table with columns input, as entered, SI value used (absolute temperatures also in
        °C); a default appears as '(default)' in the entered column. [-]
    """
    case = result.case
    entered = case.entered
    si = case.model_dump(mode="json")
    rows = []
    seen = set()
    grouped: dict[tuple, list[tuple[str, str, str]]] = {}
    for path, value in _leaves(entered):
        if path[0] in _NOT_INPUTS:
            continue
        seen.add(path)
        si_text = _si_text(case, path, _lookup(si, path), value)
        if path[0] in _GROUPED_BLOCKS and len(path) > 2:
            # One row per scenario, measurement or tolerance: each is shown in full in its
            # own section, so the appendix keeps it to one line.
            field_name = ".".join(str(k) for k in path[2:])
            grouped.setdefault(path[:2], []).append((field_name, _entered_text(value), si_text))
            if len(grouped[path[:2]]) == 1:
                rows.append(path[:2])
            continue
        rows.append((_path_text(path), _entered_text(value), si_text))
    # Scenarios, measurements and tolerances are shown in full in their own sections (page 1
    # and section 2, the calibration table, the tolerance table): one row per block here.
    where = {
        "scenarios": "every condition on page 1 and in section 2",
        "measurements": "the calibration table, section 2",
        "tolerances": "the tolerance table, section 3",
    }
    out_rows, shown_blocks = [], set()
    for row in rows:
        if isinstance(row, tuple) and row in grouped:
            block = row[0]
            if block in shown_blocks:
                continue
            shown_blocks.add(block)
            names = [
                str(item.get("name", key)) if isinstance(item, Mapping) else str(key)
                for key, item in (
                    enumerate(entered[block])
                    if isinstance(entered[block], list)
                    else entered[block].items()
                )
            ]
            out_rows.append((block, ", ".join(names), f"in full in {where.get(block, 'the note')}"))
        else:
            out_rows.append(row)
    rows = out_rows
    for path, value in _leaves(si):
        if path[0] in _NOT_INPUTS or path in seen or value in (None, [], {}):
            continue
        if any(path[:i] in seen for i in range(1, len(path))):
            continue  # inside a value given as a whole (e.g. a list)
        if path[-1] not in _NOTABLE_DEFAULTS:
            continue
        parent = _lookup(entered, path[:-1]) if len(path) > 1 else entered
        if isinstance(parent, Mapping):
            rows.append((_path_text(path), "(default)", _si_text(case, path, value)))
    return present.html_table(
        rows,
        header=("Input", "As entered", "SI value used"),
        css_class="fk-inputs",
        caption=(
            "Inputs of the case file; '(default)' marks a value the file left out that a "
            "reviewer should know (other defaults, such as sampling settings, are not listed)."
        ),
    )


def derived_geometry_table(result) -> present.Fragment:
    """Geometry the model derives from the inputs (spacing, counts, areas, mass).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A table of derived quantities with units. [-]
    """
    g = result.inputs.geometry
    rows = []
    if _is_plate(result):
        rows += [
            ("Fin spacing (clear gap) b", _q(g.fin_spacing, "length", "mm")),
            ("Fin pitch", _q(g.fin_pitch, "length", "mm")),
            ("Channels", int(_f(g.channel_count))),
            ("Channel aspect ratio b/H", _sig(_f(g.channel_aspect_ratio))),
        ]
    else:
        rows += [
            ("Pins", int(_f(g.pin_count))),
            ("Rows along the flow N_L", int(_f(g.row_count))),
            ("Pins per row", int(_f(g.pins_per_row))),
            ("Diagonal pitch S_D", _q(g.diagonal_pitch, "length", "mm")),
            ("Smallest free-flow ratio", _sig(_f(g.min_free_flow_ratio))),
        ]
    rows += [
        ("Exposed base area (between fins)", _q(g.base_exposed_area, "area", "cm^2")),
        (
            "Total wetted area (as modelled" + ("" if _is_natural(result) else ", shrouded") + ")",
            _q(_total_area(g), "area", "cm^2"),
        ),
        ("Sink mass", f"{_sig(result.results['mass'])} kg"),
        (
            "Thermal conductivity of the sink",
            _q(result.inputs.material.thermal_conductivity, "thermal_conductivity", "W/m/K"),
        ),
        ("Emissivity of the finish", _sig(_f(result.inputs.material.emissivity), 2)),
    ]
    # Two quantities per row: the table is a reference list, not a headline.
    half = (len(rows) + 1) // 2
    left, right = rows[:half], rows[half:] + [("", "")] * (2 * half - len(rows))
    paired = [(*a, *b) for a, b in zip(left, right, strict=True)]
    return present.html_table(
        paired,
        header=("Derived quantity", "Value", "Derived quantity", "Value"),
        css_class="fk-kv fk-derived",
    )


def _total_area(g) -> float:
    area = getattr(g, "total_area_shrouded", None)
    if area is None:
        area = g.total_area
    return _f(area)
