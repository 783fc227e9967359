"""Figures of a heat-sink note and the sweeps the case lists.

Temperatures along a fin, allowable power against inlet air and airflow, fan and system curves,
the temperature budget, and one figure per sweep of ``case.sweeps``.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

import numpy as np

from finkit.case.units import from_si
from finkit.report import present
from finkit.report.ahead import group, shareable
from finkit.report.formatting import (
    _FIGSIZE,
    _FIGSIZE_TALL,
    _FIGSIZE_WIDE,
    _T,
    CHAIN_COLOURS,
    COLOURS,
    _air,
    _at_governing,
    _c,
    _caption,
    _cfm_axis,
    _eff,
    _f,
    _fan_changes,
    _figure,
    _is_fan,
    _is_natural,
    _is_plate,
    _join,
    _limit_lines,
    _node,
    _node_name,
    _plain_log_ticks,
    _q,
    _sig,
    _style,
    sweep_names,
)

__all__ = [
    "figure_allowable_vs_inlet",
    "figure_fan_system",
    "figure_fin_profile",
    "figure_resistance_breakdown",
    "figure_sweep",
    "figure_vs_airflow",
    "plot_allowable_vs_inlet",
    "plot_fan_system",
    "plot_figures",
    "plot_fin_profile",
    "plot_resistance_breakdown",
    "plot_sweep",
    "plot_vs_airflow",
    "sweep_figures",
]


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
    from finkit.model.sweeps import fin_temperature_profile

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


@shareable
def figure_fin_profile(result) -> present.Fragment:
    """:func:`plot_fin_profile` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    from finkit.model.sweeps import is_fin_tip_exposed

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
    from finkit.model.sweeps import note_inlet_range

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
    from finkit.model.design import without_margin
    from finkit.model.sweeps import note_sweep

    inputs = result.inputs
    values = _inlet_range(result)
    with_margin = note_sweep(inputs, "inlet_temperature", values)
    no_margin = note_sweep(without_margin(inputs), "inlet_temperature", values)
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


@shareable
def figure_allowable_vs_inlet(result) -> present.Fragment:
    """:func:`plot_allowable_vs_inlet` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
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
    from finkit.model.sweeps import note_airflow_range

    return note_airflow_range(result.solution)


def _h_range(result) -> np.ndarray:
    from finkit.model.sweeps import note_h_range

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
    from finkit.model.sweeps import note_sweep

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


@shareable
def figure_vs_airflow(result) -> present.Fragment:
    """:func:`plot_vs_airflow` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
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
    from finkit.model.sweeps import fan_pressure, system_curve, volume_flow_for_power

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


@shareable
def figure_fan_system(result) -> present.Fragment:
    """:func:`plot_fan_system` embedded with its caption (a remark for natural convection).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
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


@shareable
def figure_resistance_breakdown(result) -> present.Fragment:
    """:func:`plot_resistance_breakdown` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
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


def _sweep_values(result, name: str) -> tuple[np.ndarray, float]:
    """Values (SI) and the case's own value of a sweep (``finkit.model.note_sweep_values``)."""
    from finkit.model.sweeps import note_sweep_values

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
    from finkit.model.sweeps import note_sweep

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
    """:func:`plot_sweep` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    name : str
        A sweep name of ``finkit.model.NOTE_SWEEPS``. [-]
    """
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


def _figure_parts(result) -> list[str]:
    """The shareable figures :func:`plot_figures` draws, in order."""
    parts = ["figure_fin_profile", "figure_allowable_vs_inlet", "figure_vs_airflow"]
    if not _is_natural(result):
        parts.append("figure_fan_system")
    parts.append(
        "figure_base_map" if getattr(result, "sources", ()) else "figure_resistance_breakdown"
    )
    if sweep_names(result):
        parts.append("sweep_figures")
    return parts


@group(_figure_parts)
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
    if getattr(result, "sources", ()):
        from finkit.report.sources import figure_base_map

        # several sources: no single chain to draw a budget of; the base map instead
        parts += [present.heading("Base temperature under the sources", 3), figure_base_map(result)]
    else:
        parts += [present.heading("Temperature budget", 3), figure_resistance_breakdown(result)]
    if sweep_names(result):
        parts += [present.heading("Sweeps listed in the case", 3), sweep_figures(result)]
    return _join(*parts)


@shareable
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
