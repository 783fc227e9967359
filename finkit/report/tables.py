"""Result tables of a heat-sink note: nodes, resistances, airflow, conditions and the review checks.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from finkit.case.units import from_si
from finkit.constants import ZERO_CELSIUS
from finkit.report import present
from finkit.report.ahead import shareable
from finkit.report.formatting import (
    _NBSP,
    _T,
    COLOURS,
    _air,
    _at_governing,
    _c,
    _caption,
    _eff,
    _f,
    _figure,
    _governing_source,
    _is_free_stream,
    _is_natural,
    _is_plate,
    _join,
    _k,
    _node,
    _node_cell,
    _node_name,
    _pct,
    _q,
    _res,
    _review_of,
    _sig,
    _style,
)

__all__ = [
    "airflow_table",
    "figure_calibration",
    "headline",
    "node_table",
    "plot_calibration",
    "resistance_table",
    "review_section",
]


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
    source = _governing_source(result)
    rows = _source_node_rows(result) if source is None else _several_sources_node_rows(source)
    if source is not None:
        rows.append(("Base, hottest point of any source", sol.source_base_centre_temperature, ""))
    rows += [
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
    power = _q(_f(sol.power), "power", "W")
    caption = (
        f"Node temperatures at the stated power {power}."
        if source is None
        else f"Node temperatures of the governing source '{source['name']}' and of the sink, all "
        f"sources at their stated power ({power} in total)."
    )
    return present.html_table(
        body,
        header=("Node", "Temperature", f"Rise above {_air(result)}", "Remark"),
        caption=caption,
    )


def _source_node_rows(result) -> list[tuple]:
    """The nodes of the one source's chain (junction down to the base under it)."""
    sol = result.solution
    node = _node(result)
    limit_text = f"limit node; limit {_c(result.inputs.limit_temperature)}"
    return [
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
    ]


def _several_sources_node_rows(source: dict) -> list[tuple]:
    """The nodes of the governing source's chain (several sources; its row in °C)."""
    zc = ZERO_CELSIUS
    node = source["limit_node"]
    limit_text = f"limit node; limit {_c(source['limit_temperature'] + zc)}"
    name = source["name"]
    return [
        (f"Junction ({name})", source["junction"] + zc, limit_text if node == "junction" else ""),
        (f"Case ({name})", source["case"] + zc, limit_text if node == "case" else ""),
        (
            f"Base under {name}, peak",
            source["base_peak"] + zc,
            limit_text if node == "base" else "",
        ),
        (f"Base under {name}, footprint mean", source["base_mean"] + zc, "the case sits on it"),
    ]


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
    if _governing_source(result) is not None:
        return present.html_table(
            [
                (
                    f"Sink to {_air(result)} R_sink",
                    _res(_f(sol.sink_resistance)),
                    _k(power * _f(sol.sink_resistance)),
                    f"{sink_model}, all sources together",
                )
            ],
            header=("Resistance", "Value", "ΔT at the total power", "Model"),
            caption=(
                "With several sources there is no single chain: each source's base, case and "
                "junction follow from the superposed base field, its interface and its RθJC "
                "(table of sources)."
            ),
        )
    chain = [
        ("Junction to case R_jc", sol.junction_to_case_resistance, "device data"),
        ("Interface R_int", sol.interface_resistance, "case file, over the footprint"),
        ("Spreading R_sp", sol.spreading_resistance, "rectangular series (Yovanovich et al.)"),
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
        free = _is_free_stream(result)
        rows += [
            (
                "Approach flow over the sink's frontal area (free stream)"
                if free
                else "Total volume flow at the sink",
                f"{_q(q, 'volume_flow', 'm^3/s')} ({_q(q, 'volume_flow', 'CFM')})",
            ),
            (
                "Through the fins",
                f"{_q(_f(sol.sink_volume_flow), 'volume_flow', 'm^3/s')} "
                f"({_q(_f(sol.sink_volume_flow), 'volume_flow', 'CFM')})",
            ),
            ("Bypass share of the flow", _pct(r["bypass_fraction"] * 100)),
            (
                "Approach velocity (free stream)" if free else "Approach velocity (duct section)",
                _q(_f(sol.approach_velocity), "velocity", "m/s"),
            ),
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
# Review checks (finkit.model.review results carried by the CaseResult)


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
            _node_cell(row, table),
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


@shareable
def figure_calibration(result) -> present.Fragment:
    """:func:`plot_calibration` embedded with its caption (empty without measurements).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case (with measurements for a figure). [-]
    """
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
