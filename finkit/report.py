"""Tables, figures and text of the calculation notes, built from a :class:`finkit.model.CaseResult`.

The notebook templates in ``templates/`` stay thin (STYLE.md 2.5): each code cell calls one
function of this module and shows what it returns. Every function returns a
:class:`finkit.present.Fragment` (escaped HTML: tables, text, equations, or a figure embedded as
a PNG); the ``plot_*`` functions return the :class:`matplotlib.figure.Figure` itself, so tests can
inspect axes, labels and lines, and the matching ``figure_*`` functions embed it with a caption.

No physics lives here. Every number comes from :mod:`finkit.model` (``run_case``, ``note_sweep``,
``fin_temperature_profile``, ``system_curve``, ``fan_pressure``, ``volume_flow_for_power``,
``single_fin_profiles``) or :mod:`finkit.single_fin`; this module only converts units for
display (:mod:`finkit.units`), picks plot ranges, and formats.

Figures are drawn on :class:`matplotlib.figure.Figure` objects with the Agg canvas (no pyplot
state, no display backend), with one style and one set of colours for every note. matplotlib is
imported when the first figure is drawn, not when this module is imported.
"""

from __future__ import annotations

import datetime as _dt
import functools
import math
from collections.abc import Iterable, Mapping
from contextlib import contextmanager
from pathlib import Path
from typing import Any

import numpy as np

from finkit import present
from finkit.constants import ZERO_CELSIUS
from finkit.parameters import case_from_parameters
from finkit.units import format_quantity, from_si

__all__ = [
    "figure_calibration",
    "plot_calibration",
    "COLOURS",
    "airflow_table",
    "assumptions",
    "cautions",
    "derived_geometry_table",
    "figure_allowable_vs_inlet",
    "figure_fan_system",
    "figure_fin_efficiency_vs_length",
    "figure_fin_profile",
    "figure_fin_profiles_study",
    "figure_fin_tip_profiles",
    "figure_resistance_breakdown",
    "figure_sweep",
    "figure_vs_airflow",
    "fin_assumptions",
    "fin_cautions",
    "fin_headline",
    "fin_method_section",
    "fin_tip_table",
    "headline",
    "inputs_table",
    "method_section",
    "node_table",
    "plot_allowable_vs_inlet",
    "plot_fan_system",
    "plot_fin_efficiency_vs_length",
    "plot_fin_profile",
    "plot_fin_profiles_study",
    "plot_fin_tip_profiles",
    "plot_resistance_breakdown",
    "plot_sweep",
    "plot_vs_airflow",
    "references",
    "resistance_table",
    "review_section",
    "run",
    "sweep_figures",
    "sweep_names",
    "title_block",
    "verdict_page",
    "changes_since_line",
    "changes_since_section",
    "case_from_parameters",
    "plot_figures",
    "at_governing",
    "H_SCATTER",
    "warnings_section",
]

#: The colours of every finkit plot (our own choice; colour-blind-distinguishable hues).
COLOURS = {
    "primary": "#1f4e79",  # the quantity plotted
    "secondary": "#c0661b",  # the stated power / second quantity
    "tertiary": "#2f7d4f",
    "quaternary": "#7a4a9c",
    "air": "#3b8fc4",  # air temperatures, operating flow
    "limit": "#b3202a",  # temperature limit
    "margin": "#e07b84",  # limit less the required margin
    "muted": "#707070",
}
#: Stacked-bar colours of the resistance chain, inlet air to junction.
CHAIN_COLOURS = ("#1f4e79", "#4f86b5", "#8fb8d8", "#c0661b", "#e3a36b")

_STYLE = {
    "font.family": "DejaVu Sans",
    "font.size": 10.0,
    "axes.titlesize": 10.5,
    "axes.labelsize": 10.0,
    "xtick.labelsize": 9.0,
    "ytick.labelsize": 9.0,
    "legend.fontsize": 8.5,
    "legend.frameon": True,
    "legend.framealpha": 0.9,
    "axes.grid": True,
    "grid.alpha": 0.35,
    "grid.linewidth": 0.6,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "lines.linewidth": 1.8,
    "axes.prop_cycle": None,  # replaced below (cycler needs matplotlib)
}

_FIGSIZE = (6.6, 3.4)

#: The scatter of convection correlations against their own data, quoted wherever a note
#: speaks of it (common practice, no source gives one number).
H_SCATTER = "±15-25 %"
_FIGSIZE_TALL = (6.6, 4.4)
_FIGSIZE_WIDE = (7.0, 3.4)

# Display units of the notes.
_T = ("temperature", "degC")
_DT = ("temperature_difference", "K")
_R = ("thermal_resistance", "K/W")
_H = ("heat_transfer_coefficient", "W/m^2/K")

_NODE_NAMES = {"junction": "Junction", "case": "Case", "base": "Base under the source"}


# --------------------------------------------------------------------------------------------
# Small helpers (formatting, markup from escaped parts)


def _fan_changes(result) -> str:
    """`` (1 fan stopped)`` when the governing condition changes the fans, else empty."""
    gov = getattr(result, "governing", None)
    changes = [c for c in getattr(gov, "changes", ()) if "fan" in c]
    return f" ({', '.join(changes)})" if changes else ""


def _air(result, capital: bool = False) -> str:
    """The air the sink is referred to: inlet air (forced flow) or ambient air (still air)."""
    word = "ambient air" if _is_natural(result) else "inlet air"
    return word.capitalize() if capital else word


def at_governing(result):
    """The result seen at its governing condition (inputs and states of that condition).

    Tables and figures of the results section describe the condition the verdict is about;
    a case without scenarios is its own governing condition.
    """
    from dataclasses import replace

    gov = getattr(result, "governing", None)
    if gov is None or gov.solution is None or result.solution is gov.solution:
        return result
    return replace(result, inputs=gov.inputs, solution=gov.solution, allowable=gov.allowable)


def _at_governing(func):
    """Decorator: call ``func`` with the result seen at its governing condition."""

    @functools.wraps(func)
    def wrapper(result, *args, **kwargs):
        return func(at_governing(result), *args, **kwargs)

    return wrapper


def run(case: Any, solved: str | None = None):
    """Validate a case (dict as entered, YAML text or path) and solve it.

    Parameters
    ----------
    case : mapping, str or path-like
        The case as entered (the ``case`` parameter of a template), or a validated case. [-]
    solved : str, optional
        File in which ``finkit note`` left the solution it computed for results.json
        (:func:`finkit.handover.write_solved`); used only when it is for these very inputs and this
        finkit version, otherwise the case is solved here. [-]

    Returns
    -------
    finkit.model.CaseResult
        ``finkit.model.run_case(finkit.case.load_case(case))``. [-]
    """
    from finkit.case import Case, load_case

    validated = case if isinstance(case, Case) else load_case(case)
    if solved:
        from finkit.handover import read_solved

        handed = read_solved(solved, validated)
        if handed is not None:
            result = handed["result"]
            if "comparison" in handed:
                _remember_comparison(result, handed["comparison"])
            return result
    from finkit.model import run_case

    return run_case(validated)


_NBSP = "\u00a0"


def _c(kelvin: float) -> str:
    """``318.15`` -> ``45.0 °C`` (no line break between number and unit)."""
    return format_quantity(float(kelvin), *_T).replace(" ", _NBSP)


def _k(kelvin_difference: float) -> str:
    return format_quantity(float(kelvin_difference), *_DT).replace(" ", _NBSP)


def _q(value: float, kind: str, unit: str, decimals: int | None = None) -> str:
    if decimals is None and kind == "power":
        decimals = 1
    return format_quantity(float(value), kind, unit, decimals).replace(" ", _NBSP)


def _res(value: float) -> str:
    """A thermal resistance to 3 significant figures."""
    return f"{_sig(value, 3)}{_NBSP}K/W"


def _eff(value: float) -> str:
    """An efficiency to 3 decimals."""
    return f"{float(value):.3f}"


def _pct(value: float) -> str:
    return f"{float(value):.1f}{_NBSP}%"


def _sig(x: float, digits: int = 3) -> str:
    """A plain number to ``digits`` significant figures."""
    return format(float(x), f".{digits}g")


def _f(value: Any) -> float:
    return float(np.asarray(value, dtype=float))


def _join(*parts: Any) -> present.Fragment:
    """Fragments and text in sequence (text escaped)."""
    return present.Fragment("".join(present.escape(p) for p in parts if p is not None))


def _bullets(items: Iterable[Any]) -> present.Fragment:
    """An unordered list; each item escaped (a Fragment item is kept as markup)."""
    return present.bullets(items)


def _numbered(items: Iterable[Any]) -> present.Fragment:
    return present.bullets(items, ordered=True, css_class="fk-refs")


def _is_heat_sink(result) -> bool:
    return getattr(result.case, "kind", "heat-sink") == "heat-sink"


def _is_natural(result) -> bool:
    from finkit.sink import NaturalConvection

    return isinstance(result.inputs.flow, NaturalConvection)


def _is_fan(result) -> bool:
    from finkit.sink import FanDriven

    return isinstance(result.inputs.flow, FanDriven)


def _is_plate(result) -> bool:
    from finkit.geometry import PlateFinSink

    return isinstance(result.inputs.geometry, PlateFinSink)


def _node(result) -> str:
    return result.inputs.limit_node


def _node_name(result) -> str:
    return _NODE_NAMES[_node(result)]


@contextmanager
def _style():
    import matplotlib
    from cycler import cycler

    style = dict(_STYLE)
    style["axes.prop_cycle"] = cycler(
        color=[
            COLOURS["primary"],
            COLOURS["secondary"],
            COLOURS["tertiary"],
            COLOURS["quaternary"],
            COLOURS["air"],
            COLOURS["muted"],
        ]
    )
    with matplotlib.rc_context(style):
        yield


def _figure(size=_FIGSIZE, nrows=1, ncols=1, **kwargs):
    """A new Figure (Agg canvas, no pyplot) and its axes array."""
    from matplotlib.figure import Figure

    fig = Figure(figsize=size, layout="constrained")
    axes = fig.subplots(nrows, ncols, squeeze=False, **kwargs)
    return fig, axes


def _cfm_axis(ax, where="top"):
    """A secondary flow axis in CFM on an axis in m³/s."""
    factor = from_si(1.0, "volume_flow", "CFM")
    sec = ax.secondary_xaxis(where, functions=(lambda q: q * factor, lambda c: c / factor))
    sec.set_xlabel("Volume flow [CFM]")
    if ax.get_xscale() == "log":
        _plain_log_ticks(sec)
    return sec


def _limit_lines(ax, result, *, vertical=False, offset=0.0, label_node=True):
    """The limit (dashed) and the limit less the required margin (dotted), in °C - offset."""
    inputs = result.inputs
    limit_c = from_si(inputs.limit_temperature, *_T) - offset
    usable_c = from_si(inputs.limit_temperature - inputs.required_margin, *_T) - offset
    node = _node(result) if label_node else "limit"
    draw = ax.axvline if vertical else ax.axhline
    draw(
        limit_c,
        color=COLOURS["limit"],
        linestyle="--",
        linewidth=1.4,
        label=f"Limit {_c(inputs.limit_temperature)} ({node})",
    )
    if inputs.required_margin > 0:
        draw(
            usable_c,
            color=COLOURS["margin"],
            linestyle=":",
            linewidth=1.6,
            label=f"Limit less required margin {_k(inputs.required_margin)}",
        )


#: Figures drawn at the governing condition (their caption names it when it is a scenario).
_AT_GOVERNING = {
    "fin_profile",
    "allowable_vs_inlet",
    "vs_airflow",
    "fan_system",
    "resistance_breakdown",
    "uncertainty_distribution",
    "tornado",
}


def _caption(result, key: str, text: str) -> str:
    gov = getattr(result, "governing", None)
    if gov is not None and gov.name != "nominal" and (key in _AT_GOVERNING or key[:6] == "sweep:"):
        text += f" Operating condition: '{gov.name}' (governing)."
    return f"Figure {_figure_number(result, key)}. {text}"


def _figure_plan(result) -> list[str]:
    if not _is_heat_sink(result):
        return ["fin_tip_profiles", "fin_efficiency_vs_length", "fin_profiles_study"]
    plan = ["calibration"] if getattr(_review_of(result), "calibration", None) else []
    plan += [*_uncertainty_figure_keys(result), "fin_profile", "allowable_vs_inlet", "vs_airflow"]
    if not _is_natural(result):
        plan.append("fan_system")
    plan.append("resistance_breakdown")
    plan += [f"sweep:{name}" for name in sweep_names(result)]
    return plan


def _figure_number(result, key: str) -> int:
    return _figure_plan(result).index(key) + 1


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
        row = [name, changes, _c(r.inlet_temperature), _c(r.node_temperature)]
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
            "Allowable power (limit less the margin)",
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
    """
    previous = getattr(result.case, "previous_revision", None)
    if previous is None:
        return None
    cached = _COMPARISONS.get(id(result))
    if cached is not None and cached[0] is result:
        return cached[1]
    from finkit.compare import Revision, compare, load_revision
    from finkit.errors import FinkitError

    current = Revision(
        label=f"this note ({result.case.case_id})",
        source="case",
        entered=result.case.entered,
        results=result.to_json_dict(),
        is_hash_ok=True,
    )
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
    """One line for page 1: what changed since the previous revision and what it did."""
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
    """The changes since the previous revision in full (empty without a previous revision)."""
    from finkit.compare import changes_table

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


_SI_UNITS = {
    "power": "W",
    "footprint_length": "m",
    "footprint_width": "m",
    "junction_to_case": "K/W",
    "resistance": "K/W",
    "area_resistance": "K·m²/W",
    "thickness": "m",
    "thermal_conductivity": "W/(m·K)",
    "width": "m",
    "length": "m",
    "height": "m",
    "diameter": "m",
    "transverse_pitch": "m",
    "longitudinal_pitch": "m",
    "inner_radius": "m",
    "outer_radius": "m",
    "inlet_temperature": "K",
    "surroundings_temperature": "K",
    "base_temperature": "K",
    "ambient_temperature": "K",
    "tip_temperature": "K",
    "temperature": "K",
    "required_margin": "K",
    "altitude": "m",
    "volume_flow": "m³/s",
    "approach_velocity": "m/s",
    "pressure": "Pa",
    "rating_density": "kg/m³",
    "density": "kg/m³",
    "side_gap": "m",
    "top_gap": "m",
    "heat_transfer_coefficient": "W/(m²·K)",
    "heat_transfer_coefficients": "W/(m²·K)",
    "emissivity": "-",
    "pressure_factor": "-",
    "count": "-",
}
_ABSOLUTE = {
    "inlet_temperature",
    "surroundings_temperature",
    "base_temperature",
    "ambient_temperature",
    "tip_temperature",
    "temperature",
}
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
    from finkit.units import KINDS, to_si

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


def _si_text(path: tuple, value: Any, entered: Any = None) -> str:
    """The SI value of one input with its unit (absolute temperatures also in °C)."""
    from finkit.units import KINDS

    if value is None:
        return "—"
    if isinstance(value, bool | str):
        return str(value)
    name = next((str(p) for p in reversed(path) if isinstance(p, str)), "")
    unit = _SI_UNITS.get(name)
    is_absolute = name in _ABSOLUTE
    if isinstance(value, list | tuple):
        numbers = [v for v in value if isinstance(v, int | float) and not isinstance(v, bool)]
        if len(numbers) != len(value):
            return ", ".join(str(v) for v in value)
        if unit is None and isinstance(entered, list | tuple) and entered:
            kind = _infer_kind(entered[0], numbers[0])
            unit = _PRETTY_UNITS.get(KINDS[kind][0], KINDS[kind][0]) if kind else None
        text = ", ".join(_sig(v, 4) for v in numbers)
        return f"{text} {unit}" if unit and unit != "-" else text
    if not isinstance(value, int | float):
        return str(value)
    if unit is None:
        kind = _infer_kind(entered, float(value))
        if kind is not None:
            unit = _PRETTY_UNITS.get(KINDS[kind][0], KINDS[kind][0])
            is_absolute = kind == "temperature"
    if is_absolute and unit == "K":
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
        si_text = _si_text(path, _lookup(si, path), value)
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
            rows.append((_path_text(path), "(default)", _si_text(path, value)))
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


# --------------------------------------------------------------------------------------------
# Method, assumptions, warnings


_REFS = {
    "incropera": "Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of "
    "Heat and Mass Transfer, 6th ed., Wiley, 2007 (fins: section 3.6, Tables 3.4 and 3.5; "
    "radiation exchange: chapter 13).",
    "teertstra": "Teertstra, P., Yovanovich, M.M., Culham, J.R., Lemczyk, T., Analytical forced "
    "convection modeling of plate fin heat sinks, Proc. 15th IEEE SEMI-THERM Symposium, 1999, "
    "pp. 34-41.",
    "vdi": "VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G1 (Gnielinski, V.); VDI-Wärmeatlas, "
    "9th ed., 2002, sec. Gb 7 (plane gap).",
    "gnielinski": "Gnielinski, V., New equations for heat and mass transfer in turbulent pipe and "
    "channel flow, Int. Chem. Eng. 16, 359-368, 1976.",
    "shah_london": "Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic "
    "Press, 1978.",
    "muzychka": "Muzychka, Y.S., Yovanovich, M.M., Pressure drop in laminar developing flow in "
    "noncircular ducts: a scaling and modeling approach, J. Fluids Eng. 131(11), 111105, 2009.",
    "kays_london": "Kays, W.M., London, A.L., Compact Heat Exchangers, 3rd ed., McGraw-Hill, "
    "1984, ch. 5 (entrance and exit losses; effectiveness-NTU).",
    "rennels": "Rennels, D.C., Hudson, H.M., Pipe Flow: A Practical and Comprehensive Guide, "
    "Wiley, 2012 (jet contraction ratio).",
    "culham_muzychka": "Culham, J.R., Muzychka, Y.S., Optimization of plate fin heat sinks using "
    "entropy generation minimization, IEEE Trans. Comp. Pack. Technol. 24(2), 159-165, 2001.",
    "zukauskas": "Zukauskas, A., Heat transfer from tubes in crossflow, Advances in Heat "
    "Transfer 8, 93-160, 1972; Zukauskas, A., Convective heat transfer in cross flow, in Kakac, "
    "Shah & Aung (eds.), Handbook of Single-Phase Convective Heat Transfer, Wiley, 1987.",
    "gaddis": "Gaddis, E.S., Gnielinski, V., Pressure drop in cross flow across tube bundles, "
    "Int. Chem. Eng. 25(1), 1-15, 1985 (also VDI Heat Atlas, 2nd ed., 2010, ch. L1).",
    "bar_cohen": "Bar-Cohen, A., Rohsenow, W.M., Thermally optimum spacing of vertical, natural "
    "convection cooled, parallel plates, J. Heat Transfer 106(1), 116-123, 1984.",
    "elenbaas": "Elenbaas, W., Heat dissipation of parallel plates by free convection, Physica "
    "9(1), 1-28, 1942.",
    "churchill_chu": "Churchill, S.W., Chu, H.H.S., Correlating equations for laminar and "
    "turbulent free convection from a vertical plate, Int. J. Heat Mass Transfer 18, "
    "1323-1329, 1975.",
    "vdi_bank": "Gnielinski, V., Heat transfer in cross-flow around single rows of tubes and "
    "through tube bundles, in VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G7.",
    "song_lee_au": "Song, S., Lee, S., Au, V., Closed-form equation for thermal constriction/"
    "spreading resistances with variable resistance boundary condition, Proc. IEPS Conference, "
    "1994, pp. 111-121.",
    "yovanovich_series": "Yovanovich, M.M., Muzychka, Y.S., Culham, J.R., Spreading resistance "
    "of isoflux rectangles and strips on compound flux channels, J. Thermophys. Heat Transfer "
    "13(4), 495-500, 1999.",
    "atmosphere": "U.S. Standard Atmosphere, 1976, NOAA/NASA/USAF, Washington DC, 1976; "
    "ISO 2533:1975 Standard Atmosphere.",
    "coolprop": "Bell, I.H., Wronski, J., Quoilin, S., Lemort, V., Pure and pseudo-pure fluid "
    "thermophysical property evaluation and the open-source thermophysical property library "
    "CoolProp, Ind. Eng. Chem. Res. 53(6), 2498-2508, 2014 (dry air, tabulated by finkit).",
    "bypass": "Lee, S., Optimum design and selection of heat sinks, IEEE Trans. CPMT-A 18(4), "
    "812-817, 1995 (flow bypass as parallel branches at one pressure difference).",
}


def _reference_keys(result) -> list[str]:
    if not _is_heat_sink(result):
        return ["incropera"]
    opts = result.inputs.options
    keys = []
    if _is_natural(result):
        method = getattr(opts, "natural_channel_method", "bar_cohen_rohsenow")
        keys += ["bar_cohen" if method == "bar_cohen_rohsenow" else "elenbaas", "churchill_chu"]
        keys += ["incropera"]
    elif _is_plate(result):
        if opts.plate_channel_method in ("teertstra", "lower"):
            keys += ["teertstra"]
        if opts.plate_channel_method in ("vdi", "lower"):
            keys += ["vdi", "gnielinski"]
        keys += ["shah_london", "muzychka"]
        keys += (
            ["kays_london", "rennels"] if opts.loss_model == "kays_london" else ["culham_muzychka"]
        )
        keys += ["incropera"]
    else:
        method = getattr(opts, "pin_bank_method", "lower")
        keys += ["zukauskas"] if method in ("zukauskas", "lower") else []
        keys += ["vdi_bank"] if method in ("gnielinski", "lower") else []
        keys += ["gaddis", "kays_london", "incropera"]
    if not _is_natural(result) and result.inputs.bypass is not None:
        keys.append("bypass")
    keys += ["yovanovich_series", "atmosphere", "coolprop"]
    return list(dict.fromkeys(keys))


def _cite(result, key: str) -> str:
    return f"[{_reference_keys(result).index(key) + 1}]"


def references(result) -> present.Fragment:
    """The numbered reference list of the method section (only the sources this case uses).

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]

    Returns
    -------
    present.Fragment
        An ordered list of full citations. [-]
    """
    return _join(
        present.heading("References", 3), _numbered(_REFS[k] for k in _reference_keys(result))
    )


def method_section(result) -> present.Fragment:
    """How the numbers were obtained: the thermal chain and each correlation used, cited.

    Which paragraphs appear depends on the case: plate or pin fins, forced (given flow or fan)
    or natural convection, bypass, the channel and loss models chosen in the model options.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Paragraphs, equations (offline SVG) and the reference list. [-]
    """
    cite = lambda key: _cite(result, key)  # noqa: E731 - local shorthand
    opts = result.inputs.options
    parts: list[Any] = [
        present.text(
            f"The heat flows from the junction to the {_air(result)} through a chain of "
            "resistances in series: junction to case (from the device data), the interface "
            "material, spreading from the source footprint into the base, one-dimensional "
            "conduction through the base, and the sink (fins and exposed base to the air). The "
            f"sink resistance is referred to the {_air(result)} temperature and includes the "
            "heating of the air along "
            "the sink."
        ),
        present.equation(
            r"T_j = T_{in} + Q\,\left(R_{jc} + R_{int} + R_{sp} + R_{base} + R_{sink}\right)"
        ),
        present.text(
            "Two questions are answered with the same equations: the node temperatures at the "
            "stated power, and the allowable power, the power at which the limit node reaches "
            "the limit less the required margin."
        ),
        present.heading("Air", 3),
        present.text(
            f"Dry air. The pressure is that of the standard atmosphere at the stated altitude "
            f"{cite('atmosphere')}; the temperature is the stated {_air(result)} temperature, "
            "not the standard-atmosphere one. Properties (density, viscosity, conductivity, "
            f"specific heat, Prandtl number) come from CoolProp {cite('coolprop')}, tabulated and "
            "interpolated by finkit."
        ),
    ]
    if _is_natural(result):
        method = getattr(opts, "natural_channel_method", "bar_cohen_rohsenow")
        parts += [
            present.heading("Natural convection from vertical plate fins", 3),
            present.text(
                "The channels between the fins (and the base between them) use the composite "
                "correlation for symmetric isothermal vertical parallel plates "
                + (
                    f"of Bar-Cohen & Rohsenow {cite('bar_cohen')}"
                    if method == "bar_cohen_rohsenow"
                    else f"of Elenbaas {cite('elenbaas')}"
                )
                + ", with the Elenbaas number built on the fin spacing S and the fin length L "
                "in the vertical direction, properties at the film temperature:"
            ),
            present.equation(
                r"Nu_S = \dfrac{h\,S}{k_a} = \left[\dfrac{576}{El^2} + \dfrac{2.87}{El^{1/2}}"
                r"\right]^{-1/2},\quad El = Ra_S\,\dfrac{S}{L},\quad Ra_S = \dfrac{g\,\beta\,"
                r"(T_b - T_{in})\,S^3}{\nu\,\alpha}"
                if method == "bar_cohen_rohsenow"
                else r"Nu_S = \dfrac{El}{24}\left[1 - e^{-35/El}\right]^{3/4}"
            ),
            present.text(
                f"The outer faces of the two end fins use the vertical-plate correlation of "
                f"Churchill & Chu {cite('churchill_chu')}. Radiation leaves the array through the "
                "channel openings (each channel a two-surface enclosure with an effective "
                "emissivity) and from the outer surfaces, at the mean surface temperature, to "
                f"surroundings at the stated temperature {cite('incropera')}. Because h depends "
                "on the base temperature, the heat balance is solved for the base temperature by "
                "a bracketed root search."
            ),
        ]
    elif _is_plate(result):
        channel = opts.plate_channel_method
        parts.append(present.heading("Forced convection in the fin channels", 3))
        teertstra = [
            present.text(
                f"The laminar-developing model is the composite of Teertstra et al. "
                f"{cite('teertstra')}, on the channel Reynolds number built on the fin "
                "spacing b and the channel velocity, reduced by b/L. Its h is referred to "
                "the inlet air: the heating of the air along the channel is inside it."
            ),
            present.equation(
                r"Nu_b = \dfrac{h\,b}{k_a} = \left[\left(\dfrac{Re_b^{*}\,Pr}{2}\right)^{-3}"
                r" + \left(0.664\,\sqrt{Re_b^{*}}\,Pr^{1/3}\sqrt{1+\dfrac{3.65}"
                r"{\sqrt{Re_b^{*}}}}\right)^{-3}\right]^{-1/3},\quad Re_b^{*} = "
                r"\dfrac{V_{ch}\,b}{\nu}\,\dfrac{b}{L}"
            ),
        ]
        vdi = present.text(
            f"The second model is the VDI plane-gap correlation {cite('vdi')}: laminar "
            "developing flow, the transition interpolation between Re = 2300 and 10^4 on the "
            f"gap diameter 2b, and the Gnielinski turbulent equation {cite('gnielinski')}; its "
            "h is referred to the local bulk air, so the air heating is taken into account by "
            f"effectiveness-NTU for an isothermal base {cite('kays_london')}."
        )
        if channel == "lower":
            parts += [
                present.text(
                    "Two accepted models are evaluated and the one giving the higher sink "
                    "resistance (less heat transfer) is used, design by design. Near and above "
                    "Re_Dh = 2300 they bracket the channel flow: a heat-sink channel is far "
                    "shorter than the laminar entry length 0.05 Re_Dh D_h, so its boundary "
                    "layers are still developing and laminar, unless an upstream fan trips "
                    "them into transition. Taking the lower heat transfer is finkit's "
                    "conservative choice; the correlation spread shows both."
                ),
                *teertstra,
                vdi,
            ]
        elif channel == "teertstra":
            parts += [*teertstra]
        else:
            parts.append(vdi)
        parts.append(
            present.text(
                "The outer faces of the two end fins are not counted: the flow model sends "
                "air only through the channels between fins (conservative)."
            )
        )
        parts.append(
            present.equation(
                r"\varepsilon = 1 - e^{-NTU},\quad NTU = \dfrac{\eta_o\,h\,A_t}{\dot m\,c_p},"
                r"\quad R_{sink} = \dfrac{1}{\varepsilon\,\dot m\,c_p}\ \ \mathrm{(bulk\ h)},"
                r"\quad R_{sink} = \dfrac{1}{\eta_o\,h\,A_t}\ \ \mathrm{(inlet\ h)}"
            )
        )
    else:
        parts += [
            present.heading("Forced convection across the pin array", 3),
            present.text(
                {
                    "lower": "Two accepted tube-bank correlations are evaluated and the lower h "
                    "is used, design by design (finkit's conservative choice; neither was "
                    "fitted to short pins on a heated base, and the correlation spread shows "
                    "both). ",
                    "zukauskas": "",
                    "gnielinski": "",
                }[getattr(opts, "pin_bank_method", "lower")]
                + f"Zukauskas {cite('zukauskas')} works on the Reynolds number at the largest "
                "velocity between pins, with the row correction C2 for fewer than 20 rows and "
                "the property-ratio factor (Pr/Pr_s)^1/4 taken as 1 for air. Its published "
                "table steps where its constants change (up to 27 %); finkit joins "
                "neighbouring branches over a factor 1.4 in Re_D,max on the side where the "
                "table is higher, so h is continuous and never above the table. Gnielinski "
                f"{cite('vdi_bank')} treats each pin as a body streamed over half its "
                "circumference, l = pi D/2, at the velocity in the void fraction psi, with an "
                "arrangement factor f_A and a row factor for fewer than 10 rows. The base "
                "between the pins uses the laminar flat-plate mean coefficient "
                f"{cite('incropera')}. The h is referred to the local bulk air, so the air "
                "heating is taken into account by effectiveness-NTU for an isothermal base "
                f"{cite('kays_london')}."
            ),
            present.equation(
                r"Nu_D = C\,C_2(N_L)\,Re_{D,max}^{\,m}\,Pr^{0.36},\quad Nu_l = f_A\left[0.3"
                r" + \sqrt{Nu_{lam}^2 + Nu_{turb}^2}\right],\quad Re_{\psi,l} = "
                r"\dfrac{V\,l}{\psi\,\nu}"
            ),
            present.equation(
                r"\varepsilon = 1 - e^{-NTU},\quad NTU = \dfrac{\eta_o\,h\,A_t}{\dot m\,c_p}"
            ),
        ]
    # Fin efficiency (all)
    if _is_plate(result):
        parts += [
            present.heading("Fin and surface efficiency", 3),
            present.text(
                "Each fin is a one-dimensional fin of uniform thickness t with the area-mean h, "
                "adiabatic at the tip on the corrected length L_c = H + t/2"
                + (
                    f" {cite('incropera')}, since the tips see the still air."
                    if _is_natural(result)
                    else " when the tip sees the air (a gap above the tips) and on the real "
                    f"height H when a shroud touches the tips {cite('incropera')}."
                )
                + " The fins and the exposed base together give the surface efficiency:"
            ),
            present.equation(
                r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c},\quad m = \sqrt{\dfrac{2h}{k\,t}},"
                r"\quad \eta_o = 1 - \dfrac{A_f}{A_t}\,(1 - \eta_f)"
            ),
        ]
    else:
        parts += [
            present.heading("Pin and surface efficiency", 3),
            present.text(
                "Each pin is a one-dimensional fin of diameter D, adiabatic at the tip on the "
                "corrected length L_c = H + D/4 when the tip sees the air and on H when a "
                f"shroud touches the tips {cite('incropera')}."
            ),
            present.equation(
                r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c},\quad m = \sqrt{\dfrac{4h}{k\,D}},"
                r"\quad \eta_o = 1 - \dfrac{N A_f}{A_t}\,(1 - \eta_f)"
            ),
        ]
    if not _is_natural(result):
        parts.append(present.heading("Pressure drop, bypass and operating point", 3))
        if _is_plate(result):
            loss = (
                f"Kays & London {cite('kays_london')} (jet contraction ratio from Rennels & "
                f"Hudson {cite('rennels')})"
                if opts.loss_model == "kays_london"
                else f"Culham & Muzychka {cite('culham_muzychka')}"
            )
            parts += [
                present.text(
                    "The pressure drop across the fins adds the entrance contraction, the "
                    "developing-flow apparent friction in the rectangular channels (Shah & "
                    f"London {cite('shah_london')}, composite form of Muzychka & Yovanovich "
                    f"{cite('muzychka')}; Fanning friction factor) and the exit expansion, with "
                    f"loss coefficients from {loss}:"
                ),
                present.equation(
                    r"\Delta p = \left[K_c + 4 f_{app}\,\dfrac{L}{D_h} + K_e\right]\,"
                    r"\dfrac{\rho\,V_{ch}^2}{2}"
                ),
            ]
        else:
            parts.append(
                present.text(
                    "The pressure drop across the pin array follows Gaddis & Gnielinski "
                    f"{cite('gaddis')} (laminar and turbulent parts, in-line or staggered)."
                )
            )
        flow_text = "Pressure drop and fan use the inlet air density and viscosity. "
        if result.inputs.bypass is not None:
            flow_text += (
                "With clearance between the sink and the duct, the flow splits between the fins "
                "and the gaps so that both branches see the same pressure difference "
                f"{cite('bypass')}. "
            )
        if _is_fan(result):
            flow_text += (
                "The fan curve, scaled from its rating density to the inlet air density (fan "
                "laws: at a given speed and volume flow the pressure is proportional to the "
                "density), is crossed with this system curve to give the operating point."
            )
        else:
            flow_text += "The volume flow is given in the case file."
        parts.append(present.text(flow_text))
    parts += [
        present.heading("Spreading and base conduction", 3),
        present.text(
            "The source is centred on the base. Spreading from its footprint (2a x 2b) into "
            "the base (2c x 2d), with the sink resistance as a uniform coefficient "
            "h = 1/(R_sink A_base) on the finned face, follows the exact series for an isoflux "
            f"rectangle on a rectangular plate {cite('yovanovich_series')}, summed to 4 terms "
            "per plate-to-source edge ratio (within 0.5 % of the converged series). It gives "
            "both the footprint mean (R_sp, used for the case and junction) and the footprint "
            "centre, the hottest point of the base (the base limit node and touch check):"
        ),
        present.equation(
            r"R_{sp} = \dfrac{1}{2a^2cdk}\sum_m \dfrac{\sin^2(a\delta_m)\,\phi(\delta_m)}"
            r"{\delta_m^3} + \dfrac{1}{2b^2cdk}\sum_n \dfrac{\sin^2(b\lambda_n)\,"
            r"\phi(\lambda_n)}{\lambda_n^3} + \dfrac{1}{a^2b^2cdk}\sum_m\sum_n "
            r"\dfrac{\sin^2(a\delta_m)\sin^2(b\lambda_n)\,\phi(\beta_{mn})}"
            r"{\delta_m^2\lambda_n^2\beta_{mn}}"
        ),
        present.equation(
            r"\delta_m = \dfrac{m\pi}{c},\quad \lambda_n = \dfrac{n\pi}{d},\quad "
            r"\beta_{mn} = \sqrt{\delta_m^2+\lambda_n^2},\quad \phi(z) = "
            r"\dfrac{z + (h/k)\tanh(z t_b)}{z\tanh(z t_b) + h/k}"
        ),
        present.text(
            "The one-dimensional base resistance is t_b/(k A_base); the interface resistance is "
            "the area-specific resistance (or bond-line thickness over conductivity) over the "
            "footprint area."
        ),
        references(result),
    ]
    return _join(*parts)


def assumptions(result) -> present.Fragment:
    """The modelling assumptions of this heat-sink case, as a list.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A bulleted list. [-]
    """
    items = [
        "Steady state at the stated power; no transients, no power cycling.",
        "All the power leaves through the heat sink: no heat through the board or the "
        "enclosure (conservative for the junction).",
        f"Junction to case {_q(_f(result.solution.junction_to_case_resistance), *_R)} "
        "is taken from the device data for the heat-flow path into the sink.",
        "The source is centred on the base and heats its footprint uniformly. The case and "
        "junction sit on the base temperature averaged over the footprint; the centre of the "
        "footprint, the hottest point of the base, is reported too and is the base limit node "
        "and the base touch temperature (spreading resistance to the centre from the exact "
        "rectangular series).",
        "Fins are one-dimensional (temperature uniform across the fin thickness or pin "
        "section), with a uniform heat transfer coefficient over their surface, a constant "
        "conductivity, and an isothermal base at the mean base temperature (fin-efficiency "
        "model).",
        (
            "Dry still air at the stated ambient temperature"
            if _is_natural(result)
            else "Dry air at the stated inlet temperature, uniform over the inlet"
        )
        + ", at the pressure of the standard atmosphere at the stated altitude.",
        "Material conductivity and finish emissivity are constant, taken from the finkit "
        "material table unless the case file overrides them.",
    ]
    if _is_natural(result):
        items += [
            "Vertical base with vertical fins in still air, free to draw air from below and "
            "release it above; no enclosure walls, chimney or neighbouring heat sources.",
            "Air properties for convection at the film temperature (ambient air and base mean).",
            "Radiation from an isothermal sink at its mean surface temperature to surroundings "
            "at the stated surroundings temperature.",
        ]
    else:
        items += [
            "Air properties for heat transfer at the film temperature (inlet air and mean "
            "base), iterated with the solution; pressure drop and fan at the inlet air density "
            "and viscosity.",
            "Radiation is not credited in forced convection (conservative; usually below "
            "about 10 % of the heat).",
            "Pressure drop of the sink only (and its bypass): no filter, grille, bend or "
            "enclosure loss unless the model options add one.",
        ]
        if result.inputs.bypass is not None:
            items.append(
                "Bypass: the fins and the gaps see the same pressure difference; mixing and "
                "momentum exchange at the sink exit are neglected (expect about ±10-20 % on "
                "the flow through the fins)."
            )
        if _is_fan(result):
            items.append(
                "The fan curve scales with air density at constant speed (fan laws); the fan "
                "sees the full system pressure drop with no inlet or outlet system effect."
            )
    return _bullets(items)


def warnings_section(result) -> present.Fragment:
    """The model's warnings (validity ranges left, 1-D fin validity, anything unusual).

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]

    Returns
    -------
    present.Fragment
        A badge and a list of warnings, or a statement that there are none. [-]
    """
    if not result.warnings:
        if not _is_heat_sink(result):
            return present.text(
                "No warning: the fins are one-dimensional (transverse Biot number below 0.1). "
                "No correlation is used: the heat transfer coefficient is an input."
            )
        return present.text(
            "No warning: every correlation was used inside its stated range and the fins are "
            "one-dimensional (transverse Biot number below 0.1)."
        )
    count = len(result.warnings)
    return _join(
        present.badge("warn", f"{count} WARNING" + ("S" if count > 1 else "")),
        present.text(
            "The results below rest on correlations used outside their stated range or on "
            "assumptions that are stretched; judge their effect before relying on the margin."
        ),
        _bullets(result.warnings),
    )


# --------------------------------------------------------------------------------------------
# Results tables (heat sink)


@_at_governing
def headline(result) -> present.Fragment:
    """Pass or fail against the limit, the margin and the allowable power.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A badge, a one-sentence verdict and the check table. [-]
    """
    r = result.results
    inputs = result.inputs
    sol = result.solution
    node = _node(result)
    t_node = inputs.limit_temperature - r["temperature_margin"]
    t_in = _f(sol.inlet_air_temperature)
    rise = t_node - t_in
    margin = r["temperature_margin"]
    required = r["required_margin"]
    power = _f(sol.power)
    nominal_ok = margin >= required
    ok = result.status == "pass"
    verdict = (
        f"At {_q(power, 'power', 'W')} with {_c(t_in)} {_air(result)} the {node} reaches "
        f"{_c(t_node)}: {_k(margin)} below the {_c(inputs.limit_temperature)} limit"
    )
    verdict += (
        f", meeting the required margin of {_k(required)}."
        if nominal_ok
        else f", short of the required margin of {_k(required)} by {_k(required - margin)}."
    )
    table = _scenario_table_of(result)
    if table is not None:
        gov = table.governing_row
        verdict += (
            f" Of the {len(table.rows)} operating scenarios (nominal included) the governing "
            f"one is '{gov.name}': {_k(gov.margin)} margin, {gov.status}. The overall status "
            "is that of the governing scenario."
        )
    margin_share = (
        f"{margin / rise * 100:.1f} % of the rise above {_air(result)}" if rise > 0 else "—"
    )
    allowable_power = r["allowable_power"]
    rows = [
        (
            f"{_node_name(result)} temperature at the stated power",
            _c(t_node),
            f"limit {_c(inputs.limit_temperature)}",
            present.badge(t_node <= inputs.limit_temperature),
        ),
        (
            "Margin below the limit",
            f"{_k(margin)} ({margin_share})",
            f"required {_k(required)}",
            present.badge(nominal_ok),
        ),
        (
            "Allowable power at the limit less the margin",
            _q(allowable_power, "power", "W"),
            f"stated {_q(power, 'power', 'W')} ({allowable_power / power * 100:.0f} %)",
            present.badge(allowable_power >= power),
        ),
        (
            "Power at the limit (no margin)",
            _q(r["power_at_limit"], "power", "W"),
            "for information",
            present.badge("info"),
        ),
    ]
    if table is not None:
        gov = table.governing_row
        rows.append(
            (
                f"Governing scenario '{gov.name}': margin",
                _k(gov.margin),
                f"required {_k(gov.required_margin)}",
                present.badge(gov.status == "pass"),
            )
        )
    return _join(
        present.Fragment(
            f'<p class="fk-verdict">{present.escape(present.badge(ok, "PASS" if ok else "FAIL"))} '
            f"{present.escape(verdict)}</p>"
        ),
        present.html_table(rows, header=("Check", "Result", "Against", "Status")),
    )


def _review_of(result):
    return getattr(result, "review", None)


def _scenario_table_of(result):
    review = _review_of(result)
    table = getattr(review, "scenarios", None)
    return table if table is not None and getattr(table, "rows", None) else None


@_at_governing
def node_table(result) -> present.Fragment:
    """Node temperatures from the junction down to the inlet air, at the stated power.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A table: node, temperature [°C], rise above the inlet air [K], remark. [-]
    """
    sol = result.solution
    t_in = _f(sol.inlet_air_temperature)
    node = _node(result)
    limit_text = f"limit node; limit {_c(result.inputs.limit_temperature)}"
    rows = [
        ("Junction", sol.junction_temperature, limit_text if node == "junction" else ""),
        ("Case", sol.case_temperature, limit_text if node == "case" else ""),
        (
            "Base under the source, centre",
            sol.source_base_centre_temperature,
            (limit_text + "; " if node == "base" else "") + "hottest sink surface",
        ),
        (
            "Base under the source, footprint mean",
            sol.source_base_temperature,
            "the case sits on it",
        ),
        ("Base, mean (fin roots)", sol.base_temperature, ""),
        (
            f"Fin tip (fin in the array, referred to the {_air(result)})",
            sol.fin_tip_temperature,
            "",
        ),
    ]
    if not _is_natural(result):
        rows.append(("Outlet air (mixed mean, through the fins)", sol.outlet_air_temperature, ""))
    rows.append((f"{_air(result, True)}", sol.inlet_air_temperature, "stated"))
    body = [(name, _c(_f(t)), _k(_f(t) - t_in), remark) for name, t, remark in rows]
    return present.html_table(
        body,
        header=("Node", "Temperature", f"Rise above {_air(result)}", "Remark"),
        caption=f"Node temperatures at the stated power {_q(_f(sol.power), 'power', 'W')}.",
    )


@_at_governing
def resistance_table(result) -> present.Fragment:
    """The resistance chain, its temperature differences at the stated power and shares.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A table: resistance, value [K/W], ΔT at the stated power [K], share [%], model. [-]
    """
    sol = result.solution
    power = _f(sol.power)
    total = _f(sol.total_resistance)
    sink_model = "convection and radiation" if _is_natural(result) else "convection"
    chain = [
        ("Junction to case R_jc", sol.junction_to_case_resistance, "device data"),
        ("Interface R_int", sol.interface_resistance, "case file, over the footprint"),
        ("Spreading R_sp", sol.spreading_resistance, "Song, Lee & Au"),
        ("Base conduction R_base", sol.base_conduction_resistance, "t_b / (k A_base)"),
        (f"Sink to {_air(result)} R_sink", sol.sink_resistance, sink_model),
    ]
    rows = [
        (
            name,
            _res(_f(value)),
            _k(power * _f(value)),
            _pct(_f(value) / total * 100),
            model,
        )
        for name, value, model in chain
    ]
    rows.append(
        (
            present.Fragment(f"<strong>Total, junction to {_air(result)}</strong>"),
            _res(total),
            _k(power * total),
            _pct(100.0),
            "",
        )
    )
    return present.html_table(
        rows,
        header=("Resistance", "Value", "ΔT at stated power", "Share", "Model"),
        caption=f"Thermal resistances in series, junction to {_air(result)}.",
    )


@_at_governing
def airflow_table(result) -> present.Fragment:
    """Air side at the stated power: flows, velocities, pressure drop, h and efficiencies.

    For natural convection: h, the convection and radiation shares and the efficiencies.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A two-column table. [-]
    """
    sol = result.solution
    r = result.results
    rows = []
    if _is_natural(result):
        rows += [
            ("Heat by convection", _q(_f(sol.convection_heat_rate), "power", "W")),
            ("Heat by radiation", _q(_f(sol.radiation_heat_rate), "power", "W")),
            ("Radiation share", _pct(r["radiation_fraction"] * 100)),
            ("Rayleigh number on the fin spacing Ra_S", _sig(_f(sol.reynolds_number))),
        ]
    else:
        q = _f(sol.volume_flow)
        rows += [
            (
                "Total volume flow at the sink",
                f"{_q(q, 'volume_flow', 'm^3/s')} ({_q(q, 'volume_flow', 'CFM')})",
            ),
            (
                "Through the fins",
                f"{_q(_f(sol.sink_volume_flow), 'volume_flow', 'm^3/s')} "
                f"({_q(_f(sol.sink_volume_flow), 'volume_flow', 'CFM')})",
            ),
            ("Bypass share of the flow", _pct(r["bypass_fraction"] * 100)),
            ("Approach velocity (duct section)", _q(_f(sol.approach_velocity), "velocity", "m/s")),
            (
                "Channel velocity between fins"
                if _is_plate(result)
                else "Largest velocity between pins",
                _q(_f(sol.channel_velocity), "velocity", "m/s"),
            ),
            (
                "Modified channel Reynolds number Re_b* = Re_b b/L"
                if _is_plate(result)
                else "Pin Reynolds number Re_D,max",
                _sig(_f(sol.reynolds_number)),
            ),
            (
                "Static pressure drop",
                f"{_q(_f(sol.pressure_drop), 'pressure', 'Pa')} "
                f"({_q(_f(sol.pressure_drop), 'pressure', 'inH2O')})",
            ),
            ("Mass flow through the fins", f"{_sig(_f(sol.mass_flow) * 1000)} g/s"),
        ]
    rows += [
        (
            "Heat transfer coefficient h (area mean)",
            _q(_f(sol.heat_transfer_coefficient), "heat_transfer_coefficient", "W/m^2/K"),
        ),
        ("Fin efficiency η_f", _eff(_f(sol.fin_efficiency))),
        ("Surface efficiency η_o", _eff(_f(sol.surface_efficiency))),
    ]
    return present.key_value_table(rows, header=("Air side at the stated power", "Value"))


# --------------------------------------------------------------------------------------------
# Figures (heat sink)


@_at_governing
def plot_fin_profile(result):
    """Temperature along one fin of the array at the stated power (matplotlib Figure).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Temperature [°C] against distance from the base [mm], with the inlet (and outlet) air
        and the limit marked. [-]
    """
    from finkit.model import fin_temperature_profile

    p = fin_temperature_profile(result.inputs, result.solution)
    sol = result.solution
    x_mm = from_si(p["x"], "length", "mm")
    t_c = from_si(p["temperature"], *_T)
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        name = "plate fin" if _is_plate(result) else "pin"
        ax.plot(x_mm, t_c, color=COLOURS["primary"], label=f"Temperature along a {name}")
        ax.plot([x_mm[0]], [t_c[0]], "o", color=COLOURS["primary"], markersize=5)
        ax.annotate(
            f"root (mean base) {_c(p['base_temperature'])}",
            (x_mm[0], t_c[0]),
            xytext=(8, 8),
            textcoords="offset points",
            fontsize=8.5,
        )
        ax.annotate(
            f"tip {_c(t_c[-1] + 273.15)}",
            (x_mm[-1], t_c[-1]),
            xytext=(-8, -14),
            textcoords="offset points",
            ha="right",
            fontsize=8.5,
        )
        ax.axhline(
            from_si(sol.inlet_air_temperature, *_T),
            color=COLOURS["air"],
            linestyle="-.",
            linewidth=1.3,
            label=f"{_air(result, True)} {_c(_f(sol.inlet_air_temperature))}",
        )
        if not _is_natural(result):
            ax.axhline(
                from_si(sol.outlet_air_temperature, *_T),
                color=COLOURS["air"],
                linestyle=(0, (1, 1.5)),
                linewidth=1.3,
                label=f"Outlet air {_c(_f(sol.outlet_air_temperature))}",
            )
        if result.inputs.limit_node == "base":
            # The limit applies to metal only when it is the base's; a junction or case limit
            # drawn over fin temperatures would be read as a fin limit.
            _limit_lines(ax, result)
        ax.set_xlabel("Distance from the fin root [mm]")
        ax.set_ylabel("Temperature [°C]")
        ax.set_xlim(0, x_mm[-1])
        # headroom for the root label above the hottest point (it ran into the title)
        low, high = ax.get_ylim()
        ax.set_ylim(low, high + 0.12 * (high - low))
        ax.set_title(
            f"η_f = {_eff(_f(sol.fin_efficiency))}, h = "
            f"{_q(p['heat_transfer_coefficient'], 'heat_transfer_coefficient', 'W/m^2/K')}, "
            f"k = {_q(p['thermal_conductivity'], 'thermal_conductivity', 'W/m/K')}",
            loc="left",
        )
        fig.legend(loc="outside lower center", ncol=3, fontsize=8)
    return fig


def figure_fin_profile(result) -> present.Fragment:
    """:func:`plot_fin_profile` embedded with its caption."""
    from finkit.model import is_fin_tip_exposed

    tip = (
        "exposed (adiabatic on the corrected length)"
        if is_fin_tip_exposed(result.inputs)
        else "shrouded (adiabatic)"
    )
    return present.figure(
        plot_fin_profile(result),
        caption=_caption(
            result,
            "fin_profile",
            "Temperature along one fin of the array at the stated power: area-mean h, mean base "
            f"temperature at the root, tip {tip}, referred to the {_air(result)}."
            + (
                ""
                if _is_natural(result)
                else " Near the outlet the air is warmer and the fin correspondingly hotter."
            ),
        ),
    )


def _inlet_range(result) -> np.ndarray:
    from finkit.model import note_inlet_range

    return note_inlet_range(result.inputs)


@_at_governing
def plot_allowable_vs_inlet(result):
    """Allowable power against the inlet air temperature (matplotlib Figure).

    Two curves: at the limit less the required margin, and at the limit itself. The stated
    power, the case's inlet temperature and the limit (less margin) are marked.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Allowable power [W] against inlet air temperature [°C]. [-]
    """
    from dataclasses import replace

    from finkit.model import note_sweep

    inputs = result.inputs
    values = _inlet_range(result)
    with_margin = note_sweep(inputs, "inlet_temperature", values)
    no_margin = note_sweep(replace(inputs, required_margin=0.0), "inlet_temperature", values)
    x = from_si(values, *_T)
    power = _f(result.solution.power)
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        ax.plot(
            x,
            with_margin["allowable_power"],
            color=COLOURS["primary"],
            label="Allowable power, limit less required margin",
        )
        if inputs.required_margin > 0:
            ax.plot(
                x,
                no_margin["allowable_power"],
                color=COLOURS["primary"],
                linestyle="--",
                linewidth=1.2,
                alpha=0.7,
                label="Power at the limit (no margin)",
            )
        ax.axhline(
            power,
            color=COLOURS["secondary"],
            linewidth=1.5,
            label=f"Stated power {_q(power, 'power', 'W')}",
        )
        ax.axvline(
            from_si(inputs.air.inlet_temperature, *_T),
            color=COLOURS["air"],
            linestyle="-.",
            linewidth=1.3,
            label=f"Case {_air(result)} {_c(_f(inputs.air.inlet_temperature))}",
        )
        _limit_lines(ax, result, vertical=True)
        ax.plot(
            [from_si(inputs.air.inlet_temperature, *_T)],
            [result.results["allowable_power"]],
            "o",
            color=COLOURS["primary"],
            markersize=5,
        )
        ax.set_xlabel(f"{_air(result, True)} temperature [°C]")
        ax.set_ylabel("Power [W]")
        ax.set_ylim(bottom=0)
        ax.set_xlim(x[0], x[-1])
        fig.legend(loc="outside lower center", ncol=3, fontsize=8)
    return fig


def figure_allowable_vs_inlet(result) -> present.Fragment:
    """:func:`plot_allowable_vs_inlet` embedded with its caption."""
    return present.figure(
        plot_allowable_vs_inlet(result),
        caption=_caption(
            result,
            "allowable_vs_inlet",
            f"Allowable power against the {_air(result)} temperature, everything else as in the "
            f"case. Where the solid curve lies above the stated power the {_node(result)} stays "
            "at least the required margin below its limit. The dot is the case.",
        ),
    )


def _airflow_range(result) -> np.ndarray:
    from finkit.model import note_airflow_range

    return note_airflow_range(result.solution)


def _h_range(result) -> np.ndarray:
    from finkit.model import note_h_range

    return note_h_range(result.solution)


@_at_governing
def plot_vs_airflow(result):
    """Allowable power and fin efficiency against airflow (forced) or h (natural).

    Forced convection: total volume flow from 1/4 to 2.5 times the operating flow, given
    directly (the fan is replaced by that flow). Natural convection: the heat transfer
    coefficient on every air-side surface from 1/2 to 2 times the correlation value, a
    sensitivity to the correlation.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Two panels sharing the x axis: allowable power [W] and fin efficiency [-]. [-]
    """
    from finkit.model import note_sweep

    natural = _is_natural(result)
    name = "heat_transfer_coefficient" if natural else "airflow"
    values = _h_range(result) if natural else _airflow_range(result)
    s = note_sweep(result.inputs, name, values)
    sol = result.solution
    power = _f(sol.power)
    with _style():
        fig, axes = _figure(_FIGSIZE_TALL, nrows=2, sharex=True)
        top, bottom = axes[0, 0], axes[1, 0]
        top.plot(
            values,
            s["allowable_power"],
            color=COLOURS["primary"],
            label="Allowable power, limit less required margin",
        )
        top.axhline(
            power,
            color=COLOURS["secondary"],
            linewidth=1.5,
            label=f"Stated power {_q(power, 'power', 'W')}",
        )
        bottom.plot(
            values, s["fin_efficiency"], color=COLOURS["tertiary"], label="Fin efficiency η_f"
        )
        if natural:
            x0 = _f(sol.heat_transfer_coefficient)
            label = f"Correlation value {_q(x0, 'heat_transfer_coefficient', 'W/m^2/K')}"
            bottom.set_xlabel("Heat transfer coefficient h [W/(m²·K)]")
        else:
            x0 = _f(sol.volume_flow)
            label = (
                f"Operating flow {_q(x0, 'volume_flow', 'm^3/s')} ({_q(x0, 'volume_flow', 'CFM')})"
            )
            bottom.set_xlabel("Total volume flow at the sink [m³/s]")
        for ax in (top, bottom):
            ax.axvline(x0, color=COLOURS["air"], linestyle="-.", linewidth=1.3, label=label)
            ax.set_xscale("log")
        if not natural:
            _cfm_axis(top)
        top.plot(
            [x0], [result.results["allowable_power"]], "o", color=COLOURS["primary"], markersize=5
        )
        top.set_ylabel("Power [W]")
        top.set_ylim(bottom=0)
        bottom.set_ylabel("Fin efficiency [-]")
        bottom.set_ylim(min(0.5, float(np.min(s["fin_efficiency"])) - 0.05), 1.0)
        top.legend(loc="lower right")
        bottom.legend(loc="lower left")
        _plain_log_ticks(bottom)
    return fig


def _plain_log_ticks(ax) -> None:
    """Ticks at 1, 2, 5 x 10^n with plain numbers on a logarithmic x axis."""
    from matplotlib.ticker import LogLocator, NullFormatter, ScalarFormatter

    fmt = ScalarFormatter(useOffset=False)
    fmt.set_scientific(False)
    ax.xaxis.set_major_locator(LogLocator(base=10, subs=(1.0, 2.0, 5.0)))
    ax.xaxis.set_major_formatter(fmt)
    ax.xaxis.set_minor_formatter(NullFormatter())


def figure_vs_airflow(result) -> present.Fragment:
    """:func:`plot_vs_airflow` embedded with its caption."""
    if _is_natural(result):
        text = (
            "Sensitivity to the heat transfer coefficient: allowable power and fin efficiency "
            "if every air-side surface had the h on the x axis instead of the correlation "
            "value (radiation unchanged). It shows how much the result leans on the "
            "natural-convection correlation."
        )
    else:
        text = (
            "Allowable power and fin efficiency against the total volume flow approaching the "
            "sink (given directly, with the same bypass), everything else as in the case."
        )
    return present.figure(plot_vs_airflow(result), caption=_caption(result, "vs_airflow", text))


@_at_governing
def plot_fan_system(result):
    """Fan and system curves with the operating point, or the system curve for a given flow.

    The flow needed to carry the stated power at the limit less the required margin is marked
    (the temperature limit expressed as a flow).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved forced-convection heat-sink case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Static pressure [Pa] against volume flow [m³/s], with a CFM axis on top. [-]
    """
    from finkit.model import fan_pressure, system_curve, volume_flow_for_power

    inputs = result.inputs
    sol = result.solution
    q_op = _f(sol.volume_flow)
    dp_op = _f(sol.pressure_drop)
    needed = volume_flow_for_power(inputs)
    fan = fan_pressure(inputs, np.array([0.0])) if _is_fan(result) else None
    q_max = max(q_op, needed or 0.0) * 1.5
    if fan is not None:
        q_max = fan["free_delivery"] * 1.05
    q = np.linspace(q_max / 200.0, q_max, 120)
    system = system_curve(inputs, q)
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        ax.plot(
            q,
            system["pressure_drop"],
            color=COLOURS["primary"],
            label="System: sink" + (" with bypass" if inputs.bypass is not None else ""),
        )
        if fan is not None:
            qf = np.linspace(0.0, fan["free_delivery"], 120)
            curves = fan_pressure(inputs, qf)
            ax.plot(
                qf,
                curves["at_inlet"],
                color=COLOURS["secondary"],
                label=f"Fan{_fan_changes(result)} at inlet air density "
                f"{curves['inlet_density']:.3f} kg/m³",
            )
            if abs(curves["inlet_density"] - curves["rating_density"]) > 1e-3:
                ax.plot(
                    qf,
                    curves["rated"],
                    color=COLOURS["secondary"],
                    linestyle="--",
                    linewidth=1.1,
                    alpha=0.7,
                    label=f"Fan as rated, {curves['rating_density']:.3f} kg/m³",
                )
            point_label = "Operating point"
        else:
            point_label = "Given flow"
            ax.axvline(q_op, color=COLOURS["air"], linestyle="-.", linewidth=1.3)
        ax.plot(
            [q_op],
            [dp_op],
            "o",
            color="black",
            markersize=6,
            zorder=5,
            label=f"{point_label} {_sig(from_si(q_op, 'volume_flow', 'CFM'))} CFM, "
            f"{_sig(dp_op)} Pa",
        )
        if needed is not None:
            ax.axvline(
                needed,
                color=COLOURS["margin"],
                linestyle=":",
                linewidth=1.8,
                label=f"Flow needed at limit less margin {_q(needed, 'volume_flow', 'CFM')}",
            )
        else:
            ax.text(
                0.02,
                0.02,
                "No flow up to 20x the operating flow meets the limit less margin",
                transform=ax.transAxes,
                color=COLOURS["limit"],
                fontsize=8.5,
            )
        ax.set_xlabel("Volume flow [m³/s]")
        ax.set_ylabel("Static pressure [Pa]")
        ax.set_xlim(0, q_max)
        ax.set_ylim(bottom=0)
        _cfm_axis(ax)
        ax.legend(loc="upper right" if fan is not None else "upper left", fontsize=8)
    return fig


def figure_fan_system(result) -> present.Fragment:
    """:func:`plot_fan_system` embedded with its caption (a remark for natural convection)."""
    if _is_natural(result):
        return present.text("Natural convection: no fan and no system curve.")
    if _is_fan(result):
        text = (
            "Fan and system curves. The system is the sink"
            + (" and its bypass gaps in parallel" if result.inputs.bypass is not None else "")
            + " at the inlet air density; the operating point is where they cross. The dotted "
            "line is the smallest total flow that carries the stated power with the limit node "
            "at the limit less the required margin: the fan must deliver at least this."
        )
    else:
        text = (
            "System curve of the sink at the inlet air density and the given flow. The dotted "
            "line is the smallest total flow that carries the stated power with the limit node "
            "at the limit less the required margin."
        )
    return present.figure(plot_fan_system(result), caption=_caption(result, "fan_system", text))


@_at_governing
def plot_resistance_breakdown(result):
    """Temperature budget: rises across each resistance, at the stated and allowable power.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Horizontal stacked bars of temperature rise above the inlet air [K] across R_sink,
        R_base, R_sp, R_int and R_jc, with the limit marked. [-]
    """
    inputs = result.inputs
    names = ("R_sink", "R_base", "R_sp", "R_int", "R_jc")
    fields = (
        "sink_resistance",
        "base_conduction_resistance",
        "spreading_resistance",
        "interface_resistance",
        "junction_to_case_resistance",
    )
    states = [(f"Stated power\n{_q(_f(result.solution.power), 'power', 'W')}", result.solution)]
    if result.allowable is not None:
        states.append(
            (f"Allowable power\n{_q(_f(result.allowable.power), 'power', 'W')}", result.allowable)
        )
    t_in = _f(result.solution.inlet_air_temperature)
    with _style():
        fig, axes = _figure(_FIGSIZE_WIDE)
        ax = axes[0, 0]
        for row, (_label, sol) in enumerate(states):
            left = 0.0
            for i, (name, field) in enumerate(zip(names, fields, strict=True)):
                r = _f(getattr(sol, field))
                width = _f(sol.power) * r
                ax.barh(
                    row,
                    width,
                    left=left,
                    color=CHAIN_COLOURS[i],
                    edgecolor="white",
                    height=0.55,
                    label=name if row == 0 else None,
                )
                if width > 4.0:
                    ax.text(
                        left + width / 2,
                        row,
                        f"{_sig(r, 2)} K/W\n{width:.1f} K",
                        ha="center",
                        va="center",
                        fontsize=7.5,
                        color="white" if i < 2 or i == 3 else "black",
                    )
                left += width
        ax.set_yticks(range(len(states)), [s[0] for s in states])
        ax.invert_yaxis()
        _limit_lines(ax, result, vertical=True, offset=from_si(t_in, *_T))
        ax.set_xlabel(f"Temperature rise above the {_air(result)} [K]")
        ax.set_xlim(0, (inputs.limit_temperature - t_in) * 1.08)
        ax.grid(axis="y", visible=False)
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.22), ncol=4, fontsize=8)
        end = {"base": "end of R_sp", "case": "end of R_int", "junction": "end of the bar"}
        ax.set_title(f"Limit node: {_node(result)} ({end[_node(result)]})", loc="left", fontsize=9)
    return fig


def figure_resistance_breakdown(result) -> present.Fragment:
    """:func:`plot_resistance_breakdown` embedded with its caption."""
    return present.figure(
        plot_resistance_breakdown(result),
        caption=_caption(
            result,
            "resistance_breakdown",
            f"Temperature budget from the {_air(result)} to the junction: the rise across each "
            "resistance (labelled with its value) at the stated power and at the allowable "
            "power, against the limit and the limit less the required margin.",
        ),
    )


# --------------------------------------------------------------------------------------------
# Sweeps listed in the case


_SWEEP_AXIS = {
    "inlet_temperature": ("Inlet air temperature [°C]", "temperature", "degC"),
    "airflow": ("Total volume flow at the sink [m³/s]", "volume_flow", "m^3/s"),
    "fin_count": ("Fin count [-]", "dimensionless", ""),
    "fin_height": ("Fin height [mm]", "length", "mm"),
    "fin_thickness": ("Fin thickness [mm]", "length", "mm"),
    "altitude": ("Altitude [m]", "length", "m"),
    "power": ("Power [W]", "power", "W"),
    "heat_transfer_coefficient": (
        "Heat transfer coefficient h [W/(m²·K)]",
        "heat_transfer_coefficient",
        "W/m^2/K",
    ),
}


def sweep_names(result) -> list[str]:
    """The sweeps of ``case.sweeps`` not already drawn by the fixed figures, in case order.

    ``inlet_temperature`` is the allowable-power figure; ``airflow`` (forced) and
    ``heat_transfer_coefficient`` (natural) are the efficiency figure.
    """
    drawn = {"inlet_temperature", "heat_transfer_coefficient" if _is_natural(result) else "airflow"}
    return [s for s in getattr(result.case, "sweeps", []) if s not in drawn]


def _sweep_values(result, name: str) -> tuple[np.ndarray, float]:
    """Values (SI) and the case's own value of a sweep (``finkit.model.note_sweep_values``)."""
    from finkit.model import note_sweep_values

    values, case_value, _ = note_sweep_values(
        result.inputs, result.solution, float(result.case.air.altitude), name
    )
    return values, case_value


@_at_governing
def plot_sweep(result, name: str):
    """Limit-node temperature at the stated power and allowable power against one input.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    name : str
        A sweep name of ``finkit.model.NOTE_SWEEPS``. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Left: limit-node temperature [°C] with the limit marked; right: allowable power [W]
        with the stated power (no right panel for a power sweep). [-]
    """
    from finkit.model import note_sweep

    values, case_value = _sweep_values(result, name)
    s = note_sweep(result.inputs, name, values)
    label, kind, unit = _SWEEP_AXIS[name]
    label = label.replace("Inlet air", _air(result, True))
    x = values if not unit else from_si(values, kind, unit)
    x0 = case_value if not unit else from_si(case_value, kind, unit)
    power = _f(result.solution.power)
    panels = 1 if name == "power" else 2
    with _style():
        fig, axes = _figure(_FIGSIZE_WIDE if panels == 2 else _FIGSIZE, ncols=panels)
        left = axes[0, 0]
        marker = "o" if name == "fin_count" else None
        left.plot(
            x,
            from_si(s["limit_node_temperature"], *_T),
            color=COLOURS["primary"],
            marker=marker,
            markersize=3,
            label=f"{_node_name(result)} at {_q(power, 'power', 'W')}",
        )
        _limit_lines(left, result)
        left.set_ylabel("Temperature [°C]")
        left.set_xlabel(label)
        if name == "power":
            left.set_xlabel(label)
        for ax in axes[0]:
            ax.axvline(x0, color=COLOURS["air"], linestyle="-.", linewidth=1.3, label="Case value")
        left.legend(loc="best", fontsize=7.5)
        if panels == 2:
            right = axes[0, 1]
            right.plot(
                x,
                s["allowable_power"],
                color=COLOURS["primary"],
                marker=marker,
                markersize=3,
                label="Allowable power, limit less margin",
            )
            right.axhline(
                power,
                color=COLOURS["secondary"],
                linewidth=1.5,
                label=f"Stated power {_q(power, 'power', 'W')}",
            )
            right.set_ylabel("Power [W]")
            right.set_xlabel(label)
            right.set_ylim(bottom=0)
            right.legend(loc="best", fontsize=7.5)
        if name == "airflow":
            for ax in axes[0]:
                ax.set_xscale("log")
    return fig


def figure_sweep(result, name: str) -> present.Fragment:
    """:func:`plot_sweep` embedded with its caption."""
    label = _SWEEP_AXIS[name][0].split(" [")[0].replace("Inlet air", _air(result, True)).lower()
    extra = ""
    if _is_fan(result) and name in ("fin_count", "fin_height", "fin_thickness", "altitude"):
        extra = " The fan operating point is found again for each value."
    if name == "altitude":
        extra += (
            f" Only the air pressure changes with altitude; the {_air(result)} temperature is kept."
        )
    return present.figure(
        plot_sweep(result, name),
        caption=_caption(
            result,
            f"sweep:{name}",
            f"Sweep of the {label}, everything else as in the case: the {_node(result)} "
            "temperature at the stated power against its limit"
            + ("" if name == "power" else ", and the allowable power against the stated power")
            + f".{extra}",
        ),
    )


def plot_figures(result) -> present.Fragment:
    """Every standard figure of a heat-sink note, with headings, at the governing condition.

    Fin temperature profile; allowable power against the inlet air; allowable power and fin
    efficiency against airflow (h in natural convection); fan and system curves (fan-driven
    cases); the temperature budget; then the case's own sweeps.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Headings and figures. [-]
    """
    parts = [
        present.heading("Temperature along a fin", 3),
        figure_fin_profile(result),
        present.heading(f"Allowable power and {_air(result)} temperature", 3),
        figure_allowable_vs_inlet(result),
        present.heading(
            "Allowable power and fin efficiency"
            + (" against h" if _is_natural(result) else " against airflow"),
            3,
        ),
        figure_vs_airflow(result),
    ]
    if not _is_natural(result):
        parts += [present.heading("Fan and system curves", 3), figure_fan_system(result)]
    parts += [present.heading("Temperature budget", 3), figure_resistance_breakdown(result)]
    if sweep_names(result):
        parts += [present.heading("Sweeps listed in the case", 3), sweep_figures(result)]
    return _join(*parts)


def sweep_figures(result) -> present.Fragment:
    """Every sweep the case lists that the fixed figures do not already show.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        The figures in the order of ``case.sweeps``, or a sentence when there are none. [-]
    """
    names = sweep_names(result)
    listed = list(getattr(result.case, "sweeps", []))
    if not names:
        if listed:
            return present.text("The sweeps the case lists are shown in the figures above.")
        return present.text("The case lists no further sweep.")
    return _join(*(figure_sweep(result, name) for name in names))


# --------------------------------------------------------------------------------------------
# Cautions


def _conditions_where(result, test) -> list[str]:
    table = result.conditions
    return [] if table is None else [r.name for r in table.rows if test(r)]


def _names(names: list[str]) -> str:
    return ", ".join(f"'{n}'" for n in names)


def cautions(result) -> present.Fragment:
    """What the calculation does not cover, each caution shown only where it applies.

    A caution says what was done where the case covers it (a failed fan or a dusty filter
    checked as a scenario) and what to do where it does not. Natural-convection notes say
    nothing of fans, inlet or outlet air or shrouds.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A bulleted list, with the hottest surface temperatures of the governing condition. [-]
    """
    gov = result.governing
    sol = gov.solution if gov is not None and gov.solution is not None else result.solution
    where = f" in the governing condition '{gov.name}'" if gov is not None else ""
    items = [
        f"Touchable hot surfaces: the base under the source reaches about "
        f"{_c(_f(sol.source_base_centre_temperature))}{where} (at its centre) and the "
        f"fin tips {_c(_f(sol.fin_tip_temperature))}. If the sink or anything it heats can be "
        "touched, compare with the accessible-surface limits of the product's safety standard "
        "for the material and contact time that apply; finkit does not judge this."
        + (
            " The touch-temperature check in section 2 compares them with the case's own limit."
            if getattr(_review_of(result), "touch", None) is not None
            else ""
        ),
    ]
    if not _is_natural(result):
        fan = result.case.air.flow.fan
        failed = _conditions_where(result, lambda r: "stopped" in " ".join(r.changes))
        if fan is not None and failed:
            items.append(
                f"Fan failure was checked: {_names(failed)} (stopped fans taken out of the fan "
                "combination, with the leak through them where the case gives it). A fan-fail "
                "alarm or shutdown is still needed if the product must not run on with a "
                "stopped fan for long; check the time it takes against the product's policy."
            )
        elif fan is not None and fan.count > 1:
            items.append(
                f"Fan failure was not checked: the case has {fan.count} fans and no scenario "
                "with a stopped fan. With one fan stopped (N+1 designs) the flow drops by more "
                "than that fan's share, since air can recirculate through the stopped fan; add "
                "a scenario with failed_fans."
            )
        elif fan is not None:
            items.append(
                "Fan failure: the case has one fan; if it stops the sink is left to natural "
                "convection and will overheat at this power. The product needs fan monitoring "
                "and a shutdown or power reduction."
            )
        else:
            items.append(
                "Airflow is stated, not computed from a fan: confirm it at the worst case "
                "(fan ageing, supply voltage, a stopped fan, a loaded filter)."
            )
        dusty = _conditions_where(
            result, lambda r: any(w in " ".join(r.changes) for w in ("filter", "dust", "fouling"))
        )
        if dusty:
            items.append(
                f"Dust and filter loading were checked: {_names(dusty)}. Heavier loading than "
                "assumed there, or narrow fin gaps, foul faster; keep the maintenance interval "
                "that the scenario assumes."
            )
        else:
            items.append(
                "Dust and filter loading were not checked: a loaded filter or dust on the fins "
                "raises the pressure drop and cuts the flow, and narrow fin gaps foul fastest. "
                "Add a scenario with a filter, deposit_thickness or fouling_resistance."
            )
        bypass = result.inputs.bypass
        items.append(
            "Flow bypass: air takes the easiest path. "
            + (
                "The modelled gaps round the sink divert part of the flow (air side, section 1); "
                if bypass is not None
                else "No bypass gap is stated, so all the air is taken to pass through the fins; "
            )
            + "cables, missing blanking or a looser enclosure can divert far more."
        )
    else:
        items += [
            "Natural convection needs free inflow below and outflow above the fins. Covers, "
            "nearby walls, another mounting orientation or neighbouring hot parts change h "
            "strongly; radiation depends on the finish staying as specified.",
            "Dust on the fins and finish ageing lower both convection and radiation.",
        ]
    items += [
        f"Correlations carry a scatter of typically {H_SCATTER} in h"
        + ("" if _is_natural(result) else " and more in pressure drop")
        + "; judge the margin against the temperature rise above the "
        + ("surrounding air" if _is_natural(result) else "inlet air")
        + ", not the absolute temperature.",
    ]
    calibration = getattr(_review_of(result), "calibration", None)
    if calibration is None:
        items.append(
            "Confirm by test: measure the case (or junction) temperature rise on a prototype "
            "in the real enclosure at the stated power, and compare the rise, not the absolute "
            "temperature."
        )
    else:
        items.append(
            f"Test data were compared ({len(calibration.names)} point(s), section 2)"
            + (
                "; the model reads low against them, so the calibrated result on page 1 is the "
                "one to sign against unless the difference is explained."
                if calibration.reads_low
                else "."
            )
        )
    items += [
        "Interface materials: datasheet resistances are typical values at laboratory pressure; "
        "use the real mounting pressure and a tolerance.",
        "This note is an engineering calculation aid. It does not replace local codes, the "
        "product's safety standard or the judgement of a licensed or otherwise qualified "
        "engineer, who remains responsible for the design.",
    ]
    return _bullets(items)


# --------------------------------------------------------------------------------------------
# Single fin


def _study(result):
    from finkit.single_fin import solve_single_fin

    return solve_single_fin(result.case)


_TIP_NAMES = {
    "convective": "Convective tip (case A)",
    "adiabatic": "Adiabatic tip (case B)",
    "adiabatic, corrected length": "Adiabatic tip, corrected length L_c",
    "prescribed": "Prescribed tip temperature (case C)",
    "infinite": "Infinitely long fin (case D)",
}


def fin_headline(result) -> present.Fragment:
    """The headline fin: heat rate, efficiency, effectiveness, tip temperature, resistance.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]

    Returns
    -------
    present.Fragment
        A verdict line and a table. [-]
    """
    case = result.case
    fin, cond = case.fin, case.conditions
    r = result.results
    rows = [
        ("Profile and tip", f"{fin.profile}, {fin.tip or 'pointed'} tip"),
        ("Material", fin.material),
        (
            "Base / ambient temperature",
            f"{_c(cond.base_temperature)} / {_c(cond.ambient_temperature)}",
        ),
        (
            "Heat transfer coefficient h",
            _q(cond.heat_transfer_coefficient, "heat_transfer_coefficient", "W/m^2/K"),
        ),
        ("Heat rate of the fin", _q(r["fin_heat_rate"], "power", "W", 3)),
        ("Fin efficiency η_f", _sig(r["fin_efficiency"])),
        ("Fin effectiveness ε_f", _sig(r["fin_effectiveness"])),
        ("Fin resistance R_f = θ_b / q_f", _q(r["sink_resistance"], "thermal_resistance", "K/W")),
        (
            "Tip temperature",
            "—" if r["fin_tip_temperature"] is None else f"{r['fin_tip_temperature']:.1f} °C",
        ),
    ]
    if fin.profile in ("rectangular", "triangular", "parabolic"):
        rows.append(("Width (results are for this width)", _q(fin.width, "length", "mm")))
    effective = r["fin_effectiveness"] >= 2.0
    verdict = (
        f"The fin carries {_q(r['fin_heat_rate'], 'power', 'W', 3)} at an efficiency of "
        f"{_sig(r['fin_efficiency'])} and an effectiveness of {_sig(r['fin_effectiveness'])}"
        + (" (worthwhile: above about 2)." if effective else " (below about 2: hardly worthwhile).")
    )
    badge = present.badge("info" if effective else "warn", "RESULT")
    parts = [
        present.Fragment(
            f'<p class="fk-verdict">{present.escape(badge)} {present.escape(verdict)}</p>'
        ),
        present.key_value_table(rows, header=("Headline fin", "Value")),
    ]
    if case.limit is None:
        parts.append(present.text("The case gives no temperature limit: nothing to pass or fail."))
    return _join(*parts)


def fin_tip_table(result) -> present.Fragment:
    """The tip conditions compared (uniform profiles).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]

    Returns
    -------
    present.Fragment
        A table: tip condition, heat rate [W], efficiency [-], ratio to the convective tip. [-]
    """
    rows = _study(result).tip_comparison
    if not rows:
        return present.text(
            "The tip conditions are compared for fins of uniform section only; this profile "
            "ends in a point or is annular."
        )
    body = [
        (
            _TIP_NAMES.get(row["tip"], row["tip"]),
            _q(row["heat_rate"], "power", "W", 3),
            "— (infinite area)" if row["tip"] == "infinite" else _eff(row["efficiency"]),
            f"{row['ratio_to_convective']:.3f}",
        )
        for row in rows
    ]
    return present.html_table(
        body,
        header=("Tip condition", "Heat rate", "Efficiency", "Ratio to convective tip"),
        caption="Tip conditions of Incropera et al. Table 3.4 for the headline fin.",
    )


def plot_fin_tip_profiles(result):
    """Temperature along the fin for each tip condition (matplotlib Figure).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case of uniform section. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Temperature [°C] against distance from the base [mm]. [-]
    """
    study = _study(result)
    case = result.case
    cond = case.conditions
    prof = study.profiles
    x_mm = from_si(prof["x"], "length", "mm")
    t_inf_c = from_si(cond.ambient_temperature, *_T)
    styles = {
        "convective": ("-", COLOURS["primary"]),
        "adiabatic": ("--", COLOURS["secondary"]),
        "prescribed": ("-.", COLOURS["quaternary"]),
        "infinite": (":", COLOURS["tertiary"]),
    }
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        for tip, (ls, colour) in styles.items():
            if tip in prof:
                ax.plot(
                    x_mm,
                    t_inf_c + np.asarray(prof[tip]),
                    linestyle=ls,
                    color=colour,
                    label=_TIP_NAMES[tip],
                )
        ax.axhline(
            t_inf_c,
            color=COLOURS["air"],
            linestyle="-.",
            linewidth=1.2,
            label=f"Ambient {_c(cond.ambient_temperature)}",
        )
        if case.limit is not None:
            ax.axhline(
                from_si(case.limit.temperature, *_T),
                color=COLOURS["limit"],
                linestyle="--",
                linewidth=1.4,
                label=f"Limit {_c(case.limit.temperature)}",
            )
        ax.set_xlabel("Distance from the fin base [mm]")
        ax.set_ylabel("Temperature [°C]")
        ax.set_xlim(0, x_mm[-1])
        ax.legend(loc="best")
    return fig


def figure_fin_tip_profiles(result) -> present.Fragment:
    """:func:`plot_fin_tip_profiles` embedded with its caption (a remark if not available)."""
    if not _study(result).profiles:
        return present.text("Temperature profiles are drawn for fins of uniform section only.")
    return present.figure(
        plot_fin_tip_profiles(result),
        caption=_caption(
            result,
            "fin_tip_profiles",
            "Temperature along the headline fin for each tip condition (Incropera et al. "
            "Table 3.4).",
        ),
    )


def _h_shades(count: int) -> list[str]:
    """Shades of purple, light (low h) to dark (high h): h in every single-fin plot."""
    from matplotlib.colors import LinearSegmentedColormap

    cmap = LinearSegmentedColormap.from_list("fk_h", ["#c9b3e3", COLOURS["quaternary"], "#2e1340"])
    if count == 1:
        return [COLOURS["quaternary"]]
    return [cmap(i / (count - 1)) for i in range(count)]


#: Colours of the materials of a single-fin study, in study order.
MATERIAL_COLOURS = (
    COLOURS["primary"],
    COLOURS["secondary"],
    COLOURS["tertiary"],
    COLOURS["quaternary"],
    COLOURS["air"],
    COLOURS["muted"],
)


def plot_fin_efficiency_vs_length(result):
    """Fin efficiency against length, one panel per material, one curve per h.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Efficiency [-] against fin length [mm] (shades of blue from low to high h), the
        case's length marked. [-]
    """
    study = _study(result).length_study
    case = result.case
    length_mm = from_si(study["length"], "length", "mm")
    materials = list(dict.fromkeys(c["material"] for c in study["curves"]))
    hs = sorted({c["heat_transfer_coefficient"] for c in study["curves"]})
    shades = _h_shades(len(hs))
    own = (
        case.fin.length
        if case.fin.length is not None
        else case.fin.outer_radius - case.fin.inner_radius
    )
    ncols = min(len(materials), 3)
    nrows = math.ceil(len(materials) / ncols)
    with _style():
        fig, axes = _figure((6.8, 2.9 * nrows + 0.5), nrows=nrows, ncols=ncols, sharey=True)
        for j, ax in enumerate(axes.flat):
            if j >= len(materials):
                ax.set_visible(False)
                continue
            material = materials[j]
            for c in sorted(
                (c for c in study["curves"] if c["material"] == material),
                key=lambda c: c["heat_transfer_coefficient"],
            ):
                h = c["heat_transfer_coefficient"]
                own_h = h == case.conditions.heat_transfer_coefficient
                ax.plot(
                    length_mm,
                    c["efficiency"],
                    color=shades[hs.index(h)],
                    linewidth=2.4 if own_h else 1.3,
                    label=_q(h, *_H) + (" (case)" if own_h else ""),
                )
            ax.axvline(
                from_si(own, "length", "mm"),
                color=COLOURS["muted"],
                linestyle="-.",
                linewidth=1.2,
                label="Case length",
            )
            ax.set_title(material, fontsize=9.5)
            ax.set_xlabel("Fin length [mm]")
            ax.set_ylim(0, 1.02)
            ax.set_xlim(0, length_mm[-1])
            if j % ncols == 0:
                ax.set_ylabel("Fin efficiency [-]")
        handles, labels = axes.flat[0].get_legend_handles_labels()
        fig.legend(
            handles, labels, loc="outside lower center", ncol=min(len(labels), 5), fontsize=8
        )
    return fig


def figure_fin_efficiency_vs_length(result) -> present.Fragment:
    """:func:`plot_fin_efficiency_vs_length` embedded with its caption."""
    return present.figure(
        plot_fin_efficiency_vs_length(result),
        caption=_caption(
            result,
            "fin_efficiency_vs_length",
            "Fin efficiency against length for the materials and heat transfer coefficients "
            "of the study (same section and tip condition; the case's own h drawn thicker).",
        ),
    )


def plot_fin_profiles_study(result):
    """Temperature along the fin for each study material and each study h.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case of uniform section. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Two panels of temperature [°C] against distance from the base [mm]. [-]
    """
    from finkit.model import single_fin_profiles

    p = single_fin_profiles(result.case)
    case = result.case
    x_mm = from_si(p["x"], "length", "mm")
    shades = _h_shades(len(p["by_coefficient"]))
    with _style():
        fig, axes = _figure(_FIGSIZE_WIDE, ncols=2, sharey=True)
        left, right = axes[0, 0], axes[0, 1]
        for i, c in enumerate(p["by_material"]):
            left.plot(
                x_mm,
                from_si(c["temperature"], *_T),
                color=MATERIAL_COLOURS[i % len(MATERIAL_COLOURS)],
                label=f"{c['material']} (k = {_sig(c['thermal_conductivity'])} W/(m·K))",
            )
        for i, c in enumerate(p["by_coefficient"]):
            right.plot(
                x_mm,
                from_si(c["temperature"], *_T),
                color=shades[i],
                label=_q(c["heat_transfer_coefficient"], *_H),
            )
        left.set_title(
            f"h = {_q(case.conditions.heat_transfer_coefficient, *_H)}",
            fontsize=9.5,
        )
        right.set_title(f"{case.fin.material}", fontsize=9.5)
        for ax in (left, right):
            ax.axhline(
                from_si(p["ambient_temperature"], *_T),
                color=COLOURS["air"],
                linestyle="-.",
                linewidth=1.2,
                label=f"Ambient {_c(p['ambient_temperature'])}",
            )
            if case.limit is not None:
                ax.axhline(
                    from_si(case.limit.temperature, *_T),
                    color=COLOURS["limit"],
                    linestyle="--",
                    linewidth=1.4,
                    label=f"Limit {_c(case.limit.temperature)}",
                )
            ax.set_xlabel("Distance from the fin base [mm]")
            ax.set_xlim(0, x_mm[-1])
            ax.legend(loc="lower left", fontsize=7.5)
        left.set_ylabel("Temperature [°C]")
    return fig


def figure_fin_profiles_study(result) -> present.Fragment:
    """:func:`plot_fin_profiles_study` embedded with its caption."""
    from finkit.single_fin import UNIFORM_PROFILES

    if result.case.fin.profile not in UNIFORM_PROFILES:
        return present.text("Temperature profiles are drawn for fins of uniform section only.")
    return present.figure(
        plot_fin_profiles_study(result),
        caption=_caption(
            result,
            "fin_profiles_study",
            "Temperature along the fin with the case's tip condition: left, each study material "
            "at the case's h; right, each study h with the case's material.",
        ),
    )


def fin_method_section(result) -> present.Fragment:
    """Method of a single-fin study: Incropera et al. Table 3.4 / 3.5 forms.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]

    Returns
    -------
    present.Fragment
        Paragraphs, equations and the reference. [-]
    """
    fin = result.case.fin
    parts: list[Any] = [
        present.text(
            "One fin at a prescribed base temperature T_b in air at T_inf with a uniform heat "
            "transfer coefficient h, steady one-dimensional conduction along the fin "
            "(Incropera et al. [1], section 3.6). With the excess temperature θ = T - T_inf:"
        ),
    ]
    if fin.profile in ("rectangular", "pin"):
        section = (
            r"P = 2(w + t),\ A_c = w\,t"
            if fin.profile == "rectangular"
            else r"P = \pi D,\ A_c = \pi D^2/4"
        )
        parts += [
            present.equation(
                r"m = \sqrt{\dfrac{h P}{k A_c}},\quad M = \sqrt{h P k A_c}\,\theta_b,\quad "
                + section
            ),
            present.text("Tip conditions (Table 3.4): convective tip (case A),"),
            present.equation(
                r"\dfrac{\theta(x)}{\theta_b} = \dfrac{\cosh m(L-x) + (h/mk)\sinh m(L-x)}"
                r"{\cosh mL + (h/mk)\sinh mL},\quad q_f = M\,\dfrac{\sinh mL + (h/mk)\cosh mL}"
                r"{\cosh mL + (h/mk)\sinh mL}",
                label="(A)",
            ),
            present.text(
                "adiabatic tip (case B), also used with the corrected length L_c = L + A_c/P,"
            ),
            present.equation(
                r"\dfrac{\theta(x)}{\theta_b} = \dfrac{\cosh m(L-x)}{\cosh mL},"
                r"\quad q_f = M \tanh mL",
                label="(B)",
            ),
            present.text("prescribed tip temperature (case C) and infinitely long fin (case D):"),
            present.equation(
                r"\dfrac{\theta(x)}{\theta_b} = \dfrac{(\theta_L/\theta_b)\sinh mx + \sinh m(L-x)}"
                r"{\sinh mL},\qquad \dfrac{\theta(x)}{\theta_b} = e^{-mx},\ q_f = M",
                label="(C), (D)",
            ),
        ]
    else:
        parts.append(
            present.text(
                f"The {fin.profile} profile uses the closed-form efficiency of Table 3.5 "
                "(Bessel-function solutions), with q_f = η_f h A_f θ_b."
            )
        )
    parts += [
        present.text("Efficiency, effectiveness and resistance of the fin:"),
        present.equation(
            r"\eta_f = \dfrac{q_f}{h A_f \theta_b},\quad \varepsilon_f = \dfrac{q_f}{h A_{c,b}"
            r"\theta_b},\quad R_f = \dfrac{\theta_b}{q_f}"
        ),
        present.text(
            "A fin is worthwhile when its effectiveness is above about 2. The one-dimensional "
            "model holds while the transverse Biot number h (t/2)/k (or h (D/4)/k) is well "
            "below 1; finkit warns above 0.1."
        ),
        present.heading("References", 3),
        _numbered([_REFS["incropera"]]),
    ]
    return _join(*parts)


def fin_assumptions(result) -> present.Fragment:
    """Assumptions of a single-fin study, as a list."""
    return _bullets(
        [
            "Steady state; one-dimensional conduction along the fin (uniform temperature over "
            "each cross-section).",
            "Uniform heat transfer coefficient over the whole fin surface, as given; in a real "
            "array h varies along the fin and with the neighbouring fins.",
            "Constant thermal conductivity at the tabulated value of each material; no contact "
            "resistance at the fin root (the base temperature is the root temperature).",
            "Uniform ambient temperature; radiation not included (or folded into h by the user).",
            "No heat generation in the fin.",
            "The results are per fin of the given width (1 m when no width is given).",
        ]
    )


def fin_cautions(result) -> present.Fragment:
    """Cautions of a single-fin study, as a list."""
    return _bullets(
        [
            "Touchable hot surfaces: the fin base is at "
            f"{_c(result.case.conditions.base_temperature)}; "
            "compare with the accessible-surface limits of the product's safety standard if "
            "it can be touched.",
            "The heat transfer coefficient is an input, not a result: tables of h suit only "
            "early concept work. Use a correlation for the real flow before sizing.",
            "Confirm by test on a prototype before relying on the numbers.",
            "This note is an engineering calculation aid. It does not replace local codes, the "
            "product's safety standard or the judgement of a licensed or otherwise qualified "
            "engineer.",
        ]
    )


# --------------------------------------------------------------------------------------------
# Review checks (finkit.review results carried by the CaseResult)


def _scenario_section(result) -> list[Any]:
    table = _scenario_table_of(result)
    if table is None:
        return []
    forced = not _is_natural(result)
    show_power = len({round(float(row.power), 9) for row in table.rows}) > 1
    rows = []
    for row in table.rows:
        name = present.escape(row.name) + (" (governing)" if row.is_governing else "")
        label = present.Fragment(
            f"<strong>{name}</strong><br>"
            f'<span class="fk-small">{present.escape(row.description)}</span>'
        )
        cells = [label, _c(row.inlet_temperature)]
        if show_power:
            cells.append(_q(row.power, "power", "W"))
        if forced:
            cells.append(f"{_sig(from_si(row.volume_flow, 'volume_flow', 'CFM'), 3)}{_NBSP}CFM")
        cells += [
            _c(row.node_temperature),
            _k(row.margin),
            _q(row.allowable_power, "power", "W"),
            present.badge(row.status == "pass"),
        ]
        rows.append(cells)
    header = ["Scenario", f"{_air(result, True)}"] + (["Power"] if show_power else [])
    if forced:
        header.append("Total flow")
    header += [f"{_node_name(result)}", "Margin", "Allowable power", "Status"]
    return [
        present.heading("Operating scenarios", 3),
        present.text(
            "Each scenario of the case file re-solved with the full model"
            + ("" if _is_natural(result) else " (airflow, bypass, air heating)")
            + "; the governing scenario is the one with the least margin."
        ),
        present.html_table(
            rows,
            header=header,
            caption=f"Scenarios; required margin {_k(result.inputs.required_margin)}"
            + ("." if show_power else f"; power {_q(table.rows[0].power, 'power', 'W')} in all."),
        ),
    ]


def _touch_section(result) -> list[Any]:
    touch = getattr(_review_of(result), "touch", None)
    if touch is None:
        return []
    rows = [
        (surface, _c(t), present.badge(t <= touch.limit_temperature))
        for surface, t in touch.surface_temperatures.items()
    ]
    return [
        present.heading("Touch temperature", 3),
        present.text(touch.statement),
        present.html_table(
            rows,
            header=("Accessible surface", "Temperature", f"≤ {_c(touch.limit_temperature)}"),
            caption=(
                f"At {_c(touch.reference_ambient)} reference ambient "
                f"({_c(touch.inlet_temperature)} at the sink), {_q(touch.power, 'power', 'W')}; "
                f"limit basis: {touch.basis}"
            ),
        ),
    ]


def _calibration_section(result) -> list[Any]:
    cal = getattr(_review_of(result), "calibration", None)
    if cal is None:
        return []
    rows = [
        (
            name,
            node,
            _c(meas),
            _c(t_in),
            _c(unc),
            _c(pred),
            _k(res),
        )
        for name, node, meas, t_in, unc, pred, res in zip(
            cal.names,
            cal.nodes,
            cal.measured,
            cal.inlet_temperatures,
            cal.predicted_uncalibrated,
            cal.predicted,
            cal.residuals,
            strict=True,
        )
    ]
    applied = (
        "The multiplier is applied to every result of this note."
        if cal.is_applied
        else "The multiplier is not applied: the results of this note are the model as stated."
    )
    return [
        present.heading("Calibration to test data", 3),
        present.text(applied),
        present.text(cal.statement),
        present.html_table(
            rows,
            header=(
                "Point",
                "Node",
                "Measured",
                "Inlet air",
                "Model as stated",
                "Model calibrated",
                "Residual",
            ),
        ),
    ]


def plot_calibration(result):
    """Measured against predicted temperatures of the case's test points, before and after.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with measurements. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Predicted [°C] against measured [°C] for the model as stated and with the fitted
        multiplier, with the line of perfect agreement. [-]
    """
    cal = _review_of(result).calibration
    measured = from_si(np.asarray(cal.measured, float), *_T)
    stated = from_si(np.asarray(cal.predicted_uncalibrated, float), *_T)
    fitted = from_si(np.asarray(cal.predicted, float), *_T)
    low = float(min(measured.min(), stated.min(), fitted.min())) - 3.0
    high = float(max(measured.max(), stated.max(), fitted.max())) + 3.0
    with _style():
        fig, axes = _figure((4.8, 3.5))
        ax = axes[0, 0]
        ax.plot(
            [low, high],
            [low, high],
            color=COLOURS["muted"],
            linewidth=1.0,
            label="Perfect agreement",
        )
        ax.plot(measured, stated, "o", color=COLOURS["secondary"], label="Model as stated")
        ax.plot(
            measured,
            fitted,
            "s",
            color=COLOURS["primary"],
            label=f"Model with multiplier {cal.multiplier:.3f} (empirical)",
        )
        for name, x, y in zip(cal.names, measured, fitted, strict=True):
            ax.annotate(name, (x, y), textcoords="offset points", xytext=(6, -10), fontsize=8)
        ax.set_xlim(low, high)
        ax.set_ylim(low, high)
        ax.set_aspect("equal")
        ax.set_xlabel("Measured temperature [°C]")
        ax.set_ylabel("Predicted temperature [°C]")
        ax.grid(True, alpha=0.3)
        ax.legend(loc="upper left")
    return fig


def figure_calibration(result) -> present.Fragment:
    """:func:`plot_calibration` embedded with its caption (empty without measurements)."""
    if getattr(_review_of(result), "calibration", None) is None:
        return present.text("")
    return present.figure(
        plot_calibration(result),
        caption=_caption(
            result,
            "calibration",
            "Measured against predicted temperatures at the case's test points, with the model "
            "as stated and with the fitted multiplier. The multiplier is empirical: it absorbs "
            "every difference between the model and this test set-up, not only the correlation.",
        ),
    )


def _spread_section(result) -> list[Any]:
    spread = getattr(_review_of(result), "spread", None)
    if spread is None or not getattr(spread, "rows", None):
        return []
    forced = not _is_natural(result)
    rows = []
    for row in spread.rows:
        label = row.label.replace(", ", ",\u200b ")
        cells = [
            present.Fragment(f"<strong>{present.escape(label)}</strong>")
            if row.is_chosen
            else label,
            _c(row.node_temperature),
            _res(row.sink_resistance),
        ]
        if forced:
            cells.append(_q(row.pressure_drop, "pressure", "Pa"))
        cells.append(_q(row.allowable_power, "power", "W"))
        rows.append(cells)
    header = ["Correlations", _node_name(result), "R_sink"]
    if forced:
        header.append("Pressure drop")
    header.append("Allowable power")
    return [
        present.heading("Spread between accepted correlations", 3),
        present.text(spread.statement),
        present.html_table(rows, header=header, caption="The case's own choice in bold."),
    ]


def review_section(result) -> present.Fragment:
    """What the reviewer checks beyond the nominal result (``result.review``).

    Operating scenarios with the governing one, the touch-temperature check, the calibration
    to test data and the spread between accepted correlations, each shown when the case has
    it. The input sanity flags are among the warnings.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Subsections with tables, or one sentence when the case asks for none. [-]
    """
    parts = (
        _scenario_section(result)
        + _touch_section(result)
        + _calibration_section(result)
        + _spread_section(result)
    )
    if not parts:
        return present.text(
            "The case lists no scenario, touch check or measurement, and finkit has a single "
            "accepted correlation for its physics."
        )
    return _join(*parts)


# --------------------------------------------------------------------------------------------
# --- uncertainty and model-form sections ---
#
# Section 7 of the heat-sink note. The uncertainty part (Monte Carlo over the case's tolerances
# and the tornado chart, finkit.uncertainty through CaseResult.uncertainty) appears only when
# the case has a ``tolerances`` block; the model-form check (finkit.model.model_form_check, which
# calls finkit.conduction.compare_with_chain) covers plate-fin sinks and says so for pin fins.

__all__ += [  # extends the list at the top of the module
    "figure_tornado",
    "figure_uncertainty_distribution",
    "model_form_section",
    "model_form_table",
    "monte_carlo_table",
    "plot_tornado",
    "plot_uncertainty_distribution",
    "tolerance_table",
    "uncertainty_section",
]

#: Display names of the inputs a tolerance may vary (finkit.uncertainty.TOLERANCE_INPUTS).
_TOLERANCE_NAMES = {
    "heat_transfer": "Air-side heat transfer coefficient h (factor)",
    "fan_pressure": "Fan pressure (factor on the curve)",
    "pressure_drop": "Sink pressure drop (factor)",
    "airflow": "Given airflow (factor)",
    "power": "Source power",
    "interface_resistance": "Interface resistance R_int",
    "junction_to_case": "Junction to case R_jc",
    "inlet_temperature": "Inlet air temperature",
    "thermal_conductivity": "Sink conductivity k",
}
#: Short names for the tornado chart.
_TORNADO_NAMES = {
    "heat_transfer": "h factor",
    "fan_pressure": "Fan pressure factor",
    "pressure_drop": "Pressure-drop factor",
    "airflow": "Airflow factor",
    "power": "Power",
    "interface_resistance": "R_int",
    "junction_to_case": "R_jc",
    "inlet_temperature": "Inlet air",
    "thermal_conductivity": "Conductivity k",
}


def _uncertainty_of(result):
    return getattr(result, "uncertainty", None)


def _uncertainty_figure_keys(result) -> list[str]:
    """Figures of the uncertainty part, in order (they come before section 8's plots)."""
    u = _uncertainty_of(result)
    if u is None:
        return []
    return ["uncertainty_distribution"] + (["tornado"] if u.tornado.bars else [])


def _tolerance_value(name: str, value: float, *, difference: bool = False) -> str:
    """One value of a toleranced input in its display unit (a difference in K for °C)."""
    from finkit.uncertainty import TOLERANCE_INPUTS

    kind = TOLERANCE_INPUTS[name].kind
    if kind == "dimensionless":  # a factor on the case value (nominal 1)
        return f"{float(value) * 100:.3g}{_NBSP}%" if difference else f"×{float(value):.2f}"
    if kind == "temperature":
        return _k(value) if difference else _c(value)
    if kind == "power":
        return _q(value, "power", "W", 2 if difference else 1)
    if kind == "thermal_resistance":
        return f"{_sig(value, 3)}{_NBSP}K/W"
    if kind == "thermal_conductivity":
        return f"{_sig(value, 3)}{_NBSP}W/(m·K)"
    return _sig(value, 4)


def _tolerance_spread(name: str, tol) -> str:
    """The width of a tolerance as the case states it, with what it stands for."""
    if tol.low is not None:
        text = f"{_tolerance_value(name, tol.low)} to {_tolerance_value(name, tol.high)}"
        if tol.distribution == "normal":
            text += f" (mean ±{_NBSP}{tol.sigmas:g}{_NBSP}σ)"
        elif tol.distribution == "triangular":
            text += " (mode at the nominal value)"
        return text
    if tol.relative is not None:
        text = f"±{_sig(tol.relative * 100, 3)}{_NBSP}%"
    else:
        text = "±" + _tolerance_value(name, tol.absolute, difference=True)
    if tol.distribution == "normal":
        text += f" ({tol.sigmas:g}{_NBSP}σ)"
    else:
        text += f"{_NBSP}(bounds)"
    return text


def _tolerance_distribution(tol) -> str:
    if tol.distribution == "normal" and tol.truncation is not None:
        return f"normal, cut at ±{tol.truncation:g}{_NBSP}σ"
    return tol.distribution


def tolerance_table(result) -> present.Fragment:
    """The tolerances the Monte Carlo used: input, distribution, spread, nominal, σ, source.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with ``uncertainty`` (a ``tolerances`` block). [-]

    Returns
    -------
    present.Fragment
        A table, one row per toleranced input in sampling order; empty without tolerances. [-]
    """
    from finkit.uncertainty import TOLERANCE_INPUTS, nominal_value

    u = _uncertainty_of(result)
    if u is None:
        return present.Fragment("")
    tolerances = u.monte_carlo.tolerances
    rows = []
    for name in (n for n in TOLERANCE_INPUTS if n in tolerances):
        tol = tolerances[name]
        nominal = nominal_value(result.inputs, name)
        rows.append(
            (
                _TOLERANCE_NAMES.get(name, name).replace("Inlet air", _air(result, True)),
                _tolerance_distribution(tol),
                _tolerance_spread(name, tol),
                _tolerance_value(name, nominal),
                _tolerance_value(name, math.sqrt(tol.variance(nominal)), difference=True),
                tol.source or "— (not stated)",
            )
        )
    return present.html_table(
        rows,
        header=("Input", "Distribution", "Spread", "Nominal (case)", "σ sampled", "Source"),
        caption="Tolerances of the case file (the user's, not finkit's). Each input is sampled "
        "independently about its case value; 'σ sampled' is the standard deviation of the "
        "distribution as sampled (truncation included).",
    )


def _count_text(count: int) -> str:
    return f"{count:,}".replace(",", _NBSP)


def _probability_text(probability: float, count: int, upper: float) -> str:
    exceed = round(probability * count)
    if exceed == 0:
        head = f"0 (no sample of {_count_text(count)})"
    else:
        head = (
            f"{_sig(probability * 100, 2)}{_NBSP}% ({_count_text(exceed)} of {_count_text(count)})"
        )
    return f"{head}; at most {_sig(upper * 100, 2)}{_NBSP}% at 95{_NBSP}% confidence"


def monte_carlo_table(result) -> present.Fragment:
    """The Monte Carlo headline: samples, nominal and mean, percentiles, exceedance.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with ``uncertainty``. [-]

    Returns
    -------
    present.Fragment
        A table of the limit-node temperature (nominal, mean and σ, P50 to P99.9, each with its
        distance below the limit) and the probabilities of exceeding the limit and the limit
        less the required margin with their 95 % upper bounds; empty without tolerances. [-]
    """
    u = _uncertainty_of(result)
    if u is None:
        return present.Fragment("")
    mc = u.monte_carlo
    limit = mc.limit_temperature
    usable = limit - mc.required_margin
    node = _node_name(result)
    nominal = mc.summary()["nominal_limit_node_temperature"]
    mean = mc.mean()
    sampling = f"{mc.method.replace('-', ' ')} sampling" + (
        f", seed {mc.seed}" if mc.seed is not None else ""
    )
    rows: list[tuple[Any, ...]] = [
        ("Samples", f"{_count_text(mc.count)} ({sampling})", ""),
        (
            "Deterministic: every input at its value in the governing condition",
            _c(nominal),
            _k(limit - nominal),
        ),
        (
            "Mean of the samples (standard deviation)",
            f"{_c(mean)} (σ{_NBSP}{_k(mc.std())})",
            _k(limit - mean),
        ),
    ]
    for p, value in mc.percentiles().items():
        label = f"P{p:g}: {p:g} % of samples at or below" + (" (median)" if p == 50.0 else "")
        rows.append((label, _c(value), _k(limit - value)))
    rows += [
        (
            f"Probability above the limit {_c(limit)}",
            _probability_text(
                mc.probability_exceeding_limit, mc.count, mc.exceedance_upper_bound(limit)
            ),
            "",
        ),
        (
            f"Probability above the limit less the required margin {_c(usable)}",
            _probability_text(
                mc.probability_exceeding_usable_limit, mc.count, mc.exceedance_upper_bound(usable)
            ),
            "",
        ),
    ]
    return present.html_table(
        rows,
        header=(f"{node} temperature at the stated power", "Value", "Below the limit"),
        caption=f"{node} temperature over the tolerances; the upper bounds are one-sided 95 % "
        "Clopper-Pearson bounds on the exceedance probability.",
    )


def _uncertainty_reading(result) -> list[Any]:
    """What the Monte Carlo numbers mean and what they do not."""
    u = _uncertainty_of(result)
    mc = u.monte_carlo
    items = [
        "They are the spread of this model's answer when the user's tolerances (from the case "
        "file) vary independently; they leave out the choice of correlation and of the "
        "one-dimensional chain (see the correlation spread and the model-form check), the "
        "geometry tolerances and inputs that move together.",
    ]
    if "heat_transfer" in mc.tolerances:
        items.append(
            f"Convection correlations scatter by about {H_SCATTER} in h against their own data "
            "(common practice; no source gives one number): compare the h tolerance above "
            "with that."
        )
    else:
        items.append(
            "The case gives no tolerance on the air-side h. Convection correlations scatter by "
            f"about {H_SCATTER} in h against their own data (common practice; no source gives "
            "one number), so the spread above is too narrow."
        )
    items += [
        f"A zero count is not a zero probability: {_count_text(mc.count)} samples cannot show a "
        f"probability much below 3/n = {_sig(3.0 / mc.count * 100, 2)} %, hence the 95 % upper "
        "bounds. The limit with its required margin still governs the design.",
    ]
    return [present.text("What these numbers mean, and what they do not:"), _bullets(items)]


def uncertainty_section(result) -> present.Fragment:
    """The uncertainty part of the note: a plain statement, the tolerances and the headline.

    Shown only when the case has a ``tolerances`` block (``result.uncertainty``); the figures
    are :func:`figure_uncertainty_distribution` and :func:`figure_tornado`.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Heading, statement, :func:`tolerance_table`, :func:`monte_carlo_table` and what the
        numbers mean; an empty fragment when the case has no tolerances. [-]
    """
    u = _uncertainty_of(result)
    if u is None:
        return present.Fragment("")
    mc = u.monte_carlo
    pct = mc.percentiles()
    limit = mc.limit_temperature
    usable = limit - mc.required_margin
    nominal = mc.summary()["nominal_limit_node_temperature"]
    above = round(mc.probability_exceeding_usable_limit * mc.count)
    statement = (
        f"Run at the governing condition '{u.condition}' (the tolerances spread about its "
        f"inputs). With the inputs scattered as in the table below, the {_node(result)} at the "
        f"stated power is at or below {_c(pct[50.0])} in half of {_count_text(mc.count)} "
        f"samples and at or below {_c(pct[95.0])} in 95 % of them (deterministic "
        f"{_c(nominal)}). "
        + (
            f"No sample exceeds the limit less the required margin ({_c(usable)})"
            if above == 0
            else f"{_count_text(above)} of the samples exceed the limit less the required "
            f"margin ({_c(usable)})"
        )
        + (
            "; none exceeds the limit."
            if mc.probability_exceeding_limit == 0
            else f"; {_sig(mc.probability_exceeding_limit * 100, 2)} % exceed the limit "
            f"{_c(limit)} itself."
        )
    )
    return _join(
        present.heading("Uncertainty from the input tolerances", 3),
        present.text(statement),
        tolerance_table(result),
        monte_carlo_table(result),
        *_uncertainty_reading(result),
    )


def plot_uncertainty_distribution(result):
    """Histogram of the limit-node temperature over the Monte Carlo samples.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with ``uncertainty``. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Share of samples per bin [%] against the limit-node temperature [°C], with the
        nominal, the P95 and P99 values, the limit and the limit less the required margin. [-]
    """
    mc = _uncertainty_of(result).monte_carlo
    t_c = from_si(np.asarray(mc.limit_node_temperature, float), *_T)
    nominal = mc.summary()["nominal_limit_node_temperature"]
    pct = mc.percentiles()
    limit_c = from_si(mc.limit_temperature, *_T)
    count = t_c.size
    low, high = float(np.min(t_c)), float(np.max(t_c))
    bins = int(min(80, max(20, round(math.sqrt(count) / 2))))
    span = max(high - low, 0.5)
    edges = np.linspace(low, low + span, bins + 1)
    width = float(edges[1] - edges[0])
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        ax.hist(
            t_c,
            bins=edges,
            weights=np.full(count, 100.0 / count),
            color=COLOURS["primary"],
            alpha=0.85,
            edgecolor="white",
            linewidth=0.4,
            label=f"{_count_text(count)} samples",
        )
        ax.axvline(
            from_si(nominal, *_T),
            color=COLOURS["secondary"],
            linestyle="-.",
            linewidth=1.6,
            label=f"Deterministic {_c(nominal)}",
        )
        for p, style in ((95.0, (0, (4, 2))), (99.0, (0, (1, 1.5)))):
            ax.axvline(
                from_si(pct[p], *_T),
                color=COLOURS["quaternary"],
                linestyle=style,
                linewidth=1.3,
                label=f"P{p:g} {_c(pct[p])}",
            )
        _limit_lines(ax, result, vertical=True)
        ax.set_xlabel(f"{_node_name(result)} temperature [°C]")
        ax.set_ylabel(f"Samples per {_sig(width, 2)} K bin [%]")
        ax.set_xlim(low - 0.05 * span, max(low + span, limit_c) + 0.08 * span)
        ax.set_ylim(bottom=0)
        fig.legend(loc="outside lower center", ncol=3, fontsize=8)
    return fig


def figure_uncertainty_distribution(result) -> present.Fragment:
    """:func:`plot_uncertainty_distribution` with its caption; empty without tolerances."""
    u = _uncertainty_of(result)
    if u is None:
        return present.Fragment("")
    return present.figure(
        plot_uncertainty_distribution(result),
        caption=_caption(
            result,
            "uncertainty_distribution",
            f"Distribution of the {_node(result)} temperature at the stated power over the "
            "Monte Carlo samples of the tolerances, against the limit and the limit less the "
            "required margin.",
        ),
    )


def plot_tornado(result):
    """Tornado chart: the limit-node temperature with each input at the ends of its interval.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with ``uncertainty``. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Horizontal bars from the nominal temperature [°C] to the temperature with the input at
        its low and its high end, largest swing on top, labelled with the swing [K]. [-]
    """
    tornado = _uncertainty_of(result).tornado
    bars = tornado.bars
    nominal_c = from_si(tornado.nominal_temperature, *_T)
    reach = max(
        [abs(b.low_temperature - tornado.nominal_temperature) for b in bars]
        + [abs(b.high_temperature - tornado.nominal_temperature) for b in bars]
        + [0.1]
    )
    height = max(2.4, 0.62 * len(bars) + 1.5)
    with _style():
        fig, axes = _figure((_FIGSIZE[0], height))
        ax = axes[0, 0]
        labels = []
        for row, bar in enumerate(bars):
            for end, t, colour in (
                ("low", bar.low_temperature, COLOURS["air"]),
                ("high", bar.high_temperature, COLOURS["secondary"]),
            ):
                d = t - tornado.nominal_temperature
                ax.barh(
                    row,
                    abs(d),
                    left=nominal_c + min(d, 0.0),
                    height=0.6,
                    color=colour,
                    edgecolor="white",
                    label=f"Input at its {end} end" if row == 0 else None,
                )
            ax.text(
                nominal_c + reach * 1.08,
                row,
                f"{bar.swing:.1f} K",
                va="center",
                ha="left",
                fontsize=8.5,
            )
            name = _TORNADO_NAMES.get(bar.name, bar.name).replace("Inlet air", _air(result, True))
            labels.append(
                f"{name}\n"
                f"{_tolerance_value(bar.name, bar.low_value)} to "
                f"{_tolerance_value(bar.name, bar.high_value)}"
            )
        ax.axvline(
            nominal_c,
            color="black",
            linewidth=1.1,
            label=f"Deterministic {_c(tornado.nominal_temperature)}",
        )
        ax.set_yticks(range(len(bars)), labels, fontsize=8)
        ax.set_ylim(len(bars) - 0.5, -0.5)  # largest swing on top
        ax.set_xlim(nominal_c - reach * 1.25, nominal_c + reach * 1.35)
        ax.grid(axis="y", visible=False)
        ax.set_xlabel(f"{_node_name(result)} temperature [°C]")
        ax.text(
            nominal_c + reach * 1.08,
            -0.5,
            "Swing",
            va="bottom",
            ha="left",
            fontsize=8.5,
            fontweight="bold",
        )
        fig.legend(loc="outside lower center", ncol=3, fontsize=8)
    return fig


def figure_tornado(result) -> present.Fragment:
    """:func:`plot_tornado` with its caption; empty without tolerances (or none of width)."""
    u = _uncertainty_of(result)
    if u is None or not u.tornado.bars:
        return present.Fragment("")
    coverage = u.tornado.coverage
    return present.figure(
        plot_tornado(result),
        caption=_caption(
            result,
            "tornado",
            f"Sensitivity: each input alone set to the ends of its central "
            f"{_sig(coverage * 100, 3)} % interval, every other input at its case value, and "
            f"the {_node(result)} temperature at the stated power; sorted by swing. The swings "
            "do not add up to the Monte Carlo spread: independent inputs combine roughly as "
            "the root of the sum of squares.",
        ),
    )


# --- model form


def model_form_table(result, check=None) -> present.Fragment:
    """The 1-D chain against 3-D conduction: resistances from the source to the air.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved plate-fin heat-sink case. [-]
    check : finkit.model.ModelFormCheck, optional
        The check already computed (``finkit.model.model_form_check(result)`` otherwise). [-]

    Returns
    -------
    present.Fragment
        Columns: the chain with Song-Lee-Au spreading (as in the note), the chain with the
        exact spreading series, the 3-D conduction solution; rows R_sp, R_base, R_array, mean
        source to air, and the difference from 3-D [%] and at the stated power [K]. A sentence
        when not covered. [-]
    """
    from finkit.model import model_form_check

    check = model_form_check(result) if check is None else check
    if not check.is_covered:
        return present.text(f"Not covered: {check.reason}.")
    c = check.comparison

    def diff(relative: float, kelvin: float) -> str:
        text = f"{relative * 100:+.1f}{_NBSP}% ({kelvin:+.2f}{_NBSP}K)"
        return text.replace("-", "\u2212")

    total = present.Fragment("<strong>Mean source to air</strong>")
    rows = [
        (
            "Spreading R_sp",
            _res(c.spreading_resistance_song_lee_au),
            _res(c.spreading_resistance_series),
            "—",
        ),
        ("Base conduction R_base", _res(c.base_resistance), _res(c.base_resistance), "—"),
        (
            "Fins and exposed base R_array",
            _res(c.array_resistance),
            _res(c.array_resistance),
            "—",
        ),
        (
            total,
            _res(c.chain_resistance_song_lee_au),
            _res(c.chain_resistance_series),
            _res(c.conduction_resistance),
        ),
        (
            "Difference from 3-D",
            diff(c.relative_difference_song_lee_au, check.temperature_difference_song_lee_au),
            diff(c.relative_difference_series, check.temperature_difference_series),
            "reference",
        ),
    ]
    args = check.arguments
    return present.html_table(
        rows,
        header=(
            "Resistance",
            "1-D chain, Song-Lee-Au spreading (this note)",
            "1-D chain, exact spreading series",
            "3-D conduction (finite volumes)",
        ),
        caption=(
            "Resistances from the mean source temperature to the air, all with "
            f"h = {_q(args['heat_transfer_coefficient'], *_H)} on every fin and base surface "
            f"and k = {_q(args['thermal_conductivity'], 'thermal_conductivity', 'W/m/K')}. "
            "Differences (R_chain - R_3D)/R_3D, positive where the chain is conservative, and "
            f"in K at the stated power {_q(check.power, 'power', 'W')}."
        ),
    )


def _mesh_statement(check) -> str:
    cell = _q(check.mesh_cell_size, "length", "mm")
    if check.is_extrapolated:
        counts = ", ".join(_count_text(n) for n in check.cell_counts[:-1])
        text = (
            f"Mesh: three nested meshes of a quarter of the sink (the rest by symmetry) with "
            f"{counts} and {_count_text(check.cell_counts[-1])} solid cells (coarsest cell "
            f"about {cell}); the 3-D resistance is their Richardson extrapolation. "
        )
        if math.isfinite(check.grid_convergence_index):
            fine = (check.finest_resistance - check.comparison.conduction_resistance) / (
                check.comparison.conduction_resistance
            )
            text += (
                f"The finest mesh alone gives a resistance {fine * 100:+.2f} % from it, a grid "
                f"convergence index of {_sig(check.grid_convergence_index * 100, 2)} % "
                "(Roache); the extrapolated value is expected to be closer than that to the "
                "mesh-independent answer. "
            )
        else:
            text += (
                "The three meshes do not converge monotonically, so no discretisation error "
                "is estimated here. "
            )
    else:
        text = (
            f"Mesh: one mesh of a quarter of the sink (the rest by symmetry) with "
            f"{_count_text(check.cell_counts[0])} solid cells (level {check.levels[0]} of "
            f"a coarsest cell of about {cell}); nested meshes would exceed the time a note "
            "allows, so its discretisation error is not estimated here. "
        )
    return text + (
        "A mesh-refinement study on finer meshes: finkit.conduction.refine_study with the "
        "same inputs."
    )


def model_form_section(result) -> present.Fragment:
    """Model-form check: is the simple 1-D chain good enough for this sink?

    For plate-fin sinks, the chain of the note (spreading under a uniform h, 1-D base, fins of
    efficiency η_f on an isothermal root) against steady 3-D conduction in the base and fins
    with the same h (:func:`finkit.model.model_form_check`); for pin-fin sinks a sentence that
    the check does not cover them.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Heading, what is compared, :func:`model_form_table`, the verdict, what it means for the
        margin, and the mesh. [-]
    """
    from finkit.model import model_form_check

    heading = present.heading("Model-form check: 1-D chain against 3-D conduction", 3)
    check = model_form_check(result)
    if not check.is_covered:
        return _join(
            heading,
            present.text(
                "Not covered for this sink: the three-dimensional conduction model of finkit "
                "(finkit.conduction) covers plate-fin sinks only, so the one-dimensional chain "
                "of this pin-fin sink (spreading under a uniform h, pins of efficiency η_f on "
                "an isothermal base) is not checked against a conduction solution. Judge the "
                "spreading resistance and the pin-root assumption on their own."
            ),
        )
    c = check.comparison
    sol = result.solution
    if _is_natural(result):
        left_out = (
            "Radiation is left out of both: the check is made at the convective h alone (with "
            "radiation the effective h is higher and the spreading resistance somewhat larger). "
        )
        also = "which also holds radiation"
    else:
        left_out = ""
        also = "which also holds the heating of the air along the sink"
    parts: list[Any] = [
        heading,
        present.text(
            "The chain of this note treats the base with a spreading resistance under a "
            "uniform h and the fins as one-dimensional on an isothermal root. To show whether "
            "that is good enough for this sink, finkit solves the steady three-dimensional "
            "conduction in the base and fins (finite volumes), with the solved h on every fin "
            "and exposed-base surface and the source footprint heated uniformly, and compares "
            "the resistance from the mean source temperature to the air. The interface and "
            "junction-to-case resistances are the same in both models and are left out. "
            + left_out
            + "R_array below is the fins and exposed base at the solved h "
            f"({_res(c.array_resistance)}), not the note's R_sink "
            f"({_res(_f(sol.sink_resistance))}), {also}."
        ),
        model_form_table(result, check),
    ]
    verdict = c.verdict[:1].upper() + c.verdict[1:] + "."
    margin = result.results["temperature_margin"]
    dt = check.temperature_difference_song_lee_au
    side = "above (conservative)" if dt >= 0 else "below (not conservative)"
    meaning = (
        "At the stated power the chain of this note puts the mean source temperature "
        f"{abs(dt):.2f}{_NBSP}K {side} the 3-D conduction solution"
    )
    if margin > 0:
        share = abs(dt) / margin
        meaning += f": {_sig(share * 100, 2)} % of the {_k(margin)} margin below the limit. "
        meaning += (
            "The simple chain is good enough for this sink (its model-form error is below a "
            "tenth of the margin, finkit's rule)."
            if share < 0.1
            else "That is not small against the margin: weigh the 3-D result, or a finer "
            "model, before relying on the margin."
        )
    else:
        meaning += f"; the case has no margin ({_k(margin)}), so " + (
            "the chain is on the safe side." if dt >= 0 else "this error adds to the shortfall."
        )
    parts += [
        present.Fragment(
            f'<p class="fk-verdict">{present.escape(present.badge("info", "VERDICT"))} '
            f"{present.escape(verdict)}</p>"
        ),
        present.text(meaning),
        present.text(_mesh_statement(check), css_class="fk-small"),
    ]
    return _join(*parts)
