"""The transient part of a heat-sink note: time to the limit after an event, thermal impedance.

Built from ``result.transient`` (:class:`finkit.model.transient.TransientResult`), with the
figure style of :mod:`finkit.report`. No physics lives here; every number comes from
:func:`finkit.model.transient.run_transient`. The note template calls one function,
:func:`transient_section`, which returns an empty fragment when the case has no
``transient:`` block.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.report import present
from finkit.report.ahead import shareable
from finkit.report.formatting import (
    _FIGSIZE,
    COLOURS,
    _bullets,
    _c,
    _figure,
    _join,
    _sig,
    _style,
)

__all__ = [
    "figure_thermal_impedance",
    "figure_transient_history",
    "impedance_table",
    "plot_thermal_impedance",
    "plot_transient_history",
    "transient_cautions",
    "transient_section",
    "transient_table",
]

_NODE_LABELS = {
    "junction": "Junction",
    "case": "Case",
    "base": "Base under the source",
    "base_plate": "Base plate (fin roots)",
    "fins": "Fins (mean)",
}
_NODE_COLOURS = {
    "junction": COLOURS["primary"],
    "case": COLOURS["secondary"],
    "base": COLOURS["tertiary"],
    "base_plate": COLOURS["quaternary"],
    "fins": COLOURS["air"],
}


def _transient(result):
    return getattr(result, "transient", None)


def _label(node: str, count: int) -> str:
    if node.startswith("fin_"):
        k = int(node[4:])
        where = "root" if k == 1 else "tip" if k == count else f"{k} of {count}"
        return f"Fin node {where}"
    return _NODE_LABELS.get(node, node)


def _seconds(value: float) -> str:
    """A time in s, with minutes beside it from 2 min on."""
    text = f"{value:.0f}\u00a0s" if value >= 100.0 else f"{_sig(value, 3)}\u00a0s"
    if value >= 120.0:
        text += f" ({_sig(value / 60.0, 3)}\u00a0min)"
    return text


def _reached_text(t) -> str:
    if t.is_limit_reached:
        return _seconds(t.time_to_limit)
    return f"not reached in {_seconds(t.duration - (t.event_time or 0.0))}"


def _plotted_nodes(t) -> list[int]:
    """Indices of the nodes drawn: the chain, and the root and tip of a fin ladder."""
    names = t.solution.node_names
    fins = [i for i, n in enumerate(names) if n.startswith("fin_")]
    keep = [i for i, n in enumerate(names) if not n.startswith("fin_")]
    if fins:
        keep += [fins[0], fins[-1]] if len(fins) > 1 else fins
    return keep


# --------------------------------------------------------------------------------------------
# Tables


def transient_table(result, *, compact: bool = False) -> present.Fragment:
    """The event, the time to the limit against the required response time, and the peaks.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with a ``transient:`` block. [-]
    compact : bool
        Leave out the table of the event and the verdict (the note says them in a sentence
        with the badge). [-]

    Returns
    -------
    present.Fragment
        Two tables: the event and the verdict; the start, peak and final temperature of each
        node. Empty without a transient. [-]
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    badge = present.badge(t.status) if t.status else present.badge("info", "NOT CHECKED")
    rows = [
        ("Start", f"steady state of '{t.start_condition}'"),
        ("Event", "none" if t.event_condition is None else f"'{t.event_condition}' at "
                                                            f"{_seconds(t.event_time)}"),
        ("Limit", f"{_c(t.limit_temperature)} at the {t.limit_node}"),
        ("Time to the limit after the event" if t.event_condition else "Time to the limit",
         _reached_text(t)),
        ("Required response time",
         "not stated" if t.required_response_time is None
         else _seconds(t.required_response_time)),
        ("Verdict", badge),
        ("Simulated", _seconds(t.duration)),
    ]  # fmt: skip
    sol = t.solution
    names = sol.node_names
    fin_count = sum(n.startswith("fin_") for n in names)
    capacity = t.heat_capacities
    temps = [
        (
            _label(n, fin_count),
            _c(sol.temperature[0, i, 0]),
            _c(sol.peak_temperature[0, i]),
            _c(sol.final_temperature[0, i]),
            _sig(capacity[n], 4) if capacity.get(n, 0.0) > 0 else "none",
        )
        for i, n in enumerate(names)
    ]
    return _join(
        present.key_value_table(rows, caption="Event and time to the limit")
        if compact is False
        else present.Fragment(""),
        present.html_table(
            temps,
            header=["Node", "At the start", "Peak", "At the end", "Heat capacity [J/K]"],
            caption="Node temperatures of the transient and the heat capacity of each node",
        ),
    )


def impedance_table(result) -> present.Fragment:
    """The RC ladders fitted to the junction's thermal impedance, for a circuit simulator.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with a ``transient:`` block. [-]

    Returns
    -------
    present.Fragment
        The Foster ladder (series resistance, then R, tau, C of each pair), how it was fitted
        and its largest error; the Cauer ladder where the conversion was numerically safe.
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    f, c = t.foster, t.cauer
    rows: list[tuple[Any, ...]] = [
        ("R0 (series)", _sig(f.series_resistance, 4), "-", "-")
        + (() if c is None else ("-", _sig(c.series_resistance, 4)))
    ]
    for k, (r, tau, cap) in enumerate(
        zip(f.resistance, f.time_constant, f.capacitance, strict=True)
    ):
        row: tuple[Any, ...] = (f"element {k + 1}", _sig(r, 4), _sig(tau, 4), _sig(cap, 4))
        if c is not None:
            row += (_sig(c.capacitance[k], 4), _sig(c.resistance[k], 4))
        rows.append(row)
    header = ["Element", "Foster R [K/W]", "Foster tau [s]", "Foster C [J/K]"]
    if c is not None:
        header += ["Cauer C to ambient [J/K]", "Cauer R to next [K/W]"]
    cauer_text = (
        " The Cauer ladder beside it has the same input impedance (a continued-fraction "
        "expansion of the Foster admittance, accepted only where the two agree to 1e-6 over the "
        "ladder's frequencies); its last R ends at the inlet air."
        if c is not None
        else " No Cauer ladder is given: the conversion from the Foster ladder was not "
        "numerically safe for these time constants."
    )
    return _join(
        present.html_table(
            rows,
            header=header,
            caption=f"RC ladders of the junction at '{t.impedance_condition}' (inlet air = "
            "ambient node): Z(t) = R0 + sum R_i (1 - exp(-t/tau_i))",
        ),
        present.text(
            f"Foster ladder fitted by {f.method}; largest difference from the model's step "
            f"response {_sig(f.max_error * 100, 2)} % of the steady junction-to-inlet-air "
            f"resistance {_sig(t.impedance.steady_resistance[0], 3)} K/W.{cauer_text} The "
            "ladders reproduce the junction's impedance only: their inner nodes are not "
            "physical temperatures and may not be joined to other networks."
        ),
    )


# --------------------------------------------------------------------------------------------
# Figures


def plot_transient_history(result):
    """Node temperatures against time, with the limit and the event marked.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with a ``transient:`` block. [-]

    Returns
    -------
    matplotlib.figure.Figure
        Temperature [°C] of the chain's nodes (and the root and tip of a fin ladder) against
        time [s or min], the limit dashed, the event and the end of the required response
        time as vertical lines, the power on a second axis when it changes. [-]
    """
    t = _transient(result)
    sol = t.solution
    in_minutes = t.duration > 1200.0
    scale, unit = (60.0, "min") if in_minutes else (1.0, "s")
    x = sol.time / scale
    fin_count = sum(n.startswith("fin_") for n in sol.node_names)
    with _style():
        fig, axes = _figure(_FIGSIZE)
        ax = axes[0, 0]
        for i in _plotted_nodes(t):
            name = sol.node_names[i]
            fin_colour = COLOURS["air" if name == "fin_1" else "muted"]
            colour = _NODE_COLOURS.get(name, fin_colour)
            ax.plot(x, sol.temperature[0, i] - ZERO_CELSIUS, label=_label(name, fin_count),
                    color=colour, linewidth=1.6 if name == t.limit_node else 1.1)  # fmt: skip
        ax.axhline(t.limit_temperature - ZERO_CELSIUS, color=COLOURS["limit"],
                   linestyle="--", linewidth=1.4,
                   label=f"Limit {_c(t.limit_temperature)} ({t.limit_node})")  # fmt: skip
        start = t.event_time or 0.0
        if t.event_time is not None:
            ax.axvline(t.event_time / scale, color=COLOURS["muted"], linestyle="-.",
                       linewidth=1.2, label=f"Event: {t.event_condition}")  # fmt: skip
        if t.required_response_time is not None:
            ax.axvline((start + t.required_response_time) / scale, color=COLOURS["margin"],
                       linestyle=":", linewidth=1.6,
                       label=f"Required response {_seconds(t.required_response_time)}")  # fmt: skip
        if t.is_limit_reached:
            ax.plot([(start + t.time_to_limit) / scale], [t.limit_temperature - ZERO_CELSIUS],
                    marker="o", color=COLOURS["limit"], linestyle="none",
                    label=f"Limit reached {_seconds(t.time_to_limit)} after the event")  # fmt: skip
        ax.set_xlabel(f"Time [{unit}]")
        ax.set_ylabel("Temperature [°C]")
        ax.set_xlim(0.0, t.duration / scale)
        if np.ptp(sol.power) > 1e-9:
            ax2 = ax.twinx()
            ax2.plot(x, sol.power, color=COLOURS["secondary"], linewidth=0.8,
                     alpha=0.6, drawstyle="default")  # fmt: skip
            ax2.set_ylabel("Power [W]", color=COLOURS["secondary"])
            ax2.grid(False)
            ax2.set_ylim(0.0, 1.15 * float(np.max(sol.power)))
        ax.legend(loc="center right", fontsize=7.5)
    return fig


def figure_transient_history(result) -> present.Fragment:
    """:func:`plot_transient_history` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case (an empty fragment without a transient). [-]
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    what = (
        f"after '{t.event_condition}' takes over at {_seconds(t.event_time)}"
        if t.event_condition
        else "under the stated power history"
    )
    return present.figure(
        plot_transient_history(result),
        caption=f"Figure T1. Node temperatures from the steady state of '{t.start_condition}' "
        f"{what}; the limit of the {t.limit_node} dashed"
        + ("" if t.required_response_time is None else ", the required response time dotted")
        + ".",
    )


def plot_thermal_impedance(result):
    """The junction's thermal impedance ``Z(t)`` and the fitted Foster ladder (log time).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with a ``transient:`` block. [-]

    Returns
    -------
    matplotlib.figure.Figure
        ``Z(t)`` [K/W] against time [s] on a log axis: the model's step response and the
        fitted ladder, and the steady resistance. [-]
    """
    t = _transient(result)
    z = t.impedance
    with _style():
        fig, axes = _figure()
        ax = axes[0, 0]
        ax.semilogx(z.time, z.impedance[0], color=COLOURS["primary"], linewidth=2.2,
                    label="Lumped model, 1 W step")  # fmt: skip
        ax.semilogx(z.time, t.foster.impedance(z.time), color=COLOURS["secondary"],
                    linestyle="--", linewidth=1.2,
                    label=f"Foster ladder, {t.foster.resistance.size} pairs")  # fmt: skip
        ax.axhline(z.steady_resistance[0], color=COLOURS["muted"], linestyle=":",
                   linewidth=1.0,
                   label=f"Steady {_sig(z.steady_resistance[0], 3)} K/W")  # fmt: skip
        ax.set_xlabel("Time after the power step [s]")
        ax.set_ylabel("Junction rise per watt Z(t) [K/W]")
        ax.set_ylim(bottom=0.0)
        ax.legend(loc="upper left")
    return fig


def figure_thermal_impedance(result) -> present.Fragment:
    """:func:`plot_thermal_impedance` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case (an empty fragment without a transient). [-]
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    return present.figure(
        plot_thermal_impedance(result),
        caption=f"Figure T2. Thermal impedance of the junction to the inlet air at "
        f"'{t.impedance_condition}' (the governing condition): rise per watt after a power "
        "step from rest, and the fitted Foster ladder.",
    )


# --------------------------------------------------------------------------------------------
# Text


def transient_cautions(result) -> present.Fragment:
    """What the transient does not cover, and who decides on the protection.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with a ``transient:`` block. [-]

    Returns
    -------
    present.Fragment
        A bulleted list. [-]
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    caps = t.heat_capacities
    device = caps.get("junction", 0.0) + caps.get("case", 0.0)
    items = [
        "The time to the limit rests on the heat capacities and on the heat transfer of the "
        "condition after the event; both carry the scatter of the steady model (h about "
        "+-15-25 %). Confirm the protection with a test on the product: stop the fan (or "
        "apply the event) at full power and record the time until the junction (or the "
        "sensor that triggers the protection) reaches its limit.",
        "The protection itself (fan-failure detection, throttling, shutdown) and its own delay "
        "are outside this calculation; the required response time is the user's figure.",
    ]
    if device == 0.0:
        items.append(
            "No device heat capacity was given, so the die and package hold no heat here: the "
            "junction follows the sink at once, which shortens the time to the limit "
            "(conservative)."
        )
    if t.event_condition is not None:
        items.append(
            "The change of condition is taken as instantaneous (a fan stops, the air "
            "settles at once); a fan that runs down over seconds buys a little more time."
        )
    items.append(
        "This note is an engineering calculation aid. Whether the response time is "
        "acceptable is decided against the product's safety standard and by a licensed or "
        "otherwise qualified engineer, who remains responsible for the design."
    )
    return _bullets(items)


@shareable
def transient_section(result) -> present.Fragment:
    """The note's transient section: event, time to the limit, history, impedance, ladders.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Heading; the verdict in a sentence; :func:`transient_table`;
        :func:`figure_transient_history`; the model (nodes, heat capacities, assumptions,
        lumping numbers and warnings); :func:`figure_thermal_impedance`;
        :func:`impedance_table`; :func:`transient_cautions`. Empty when the case has no
        ``transient:`` block. [-]
    """
    t = _transient(result)
    if t is None:
        return present.Fragment("")
    sol = t.solution
    node = sol.node_names.index(t.limit_node)
    final = sol.final_temperature[0, node]
    after = f"after '{t.event_condition}' takes over at {_seconds(t.event_time)}" if (
        t.event_condition) else "under the stated power history"  # fmt: skip
    if t.is_limit_reached:
        verdict = (
            f"Starting from the steady state of '{t.start_condition}', the {t.limit_node} "
            f"reaches its limit {_c(t.limit_temperature)} {_seconds(t.time_to_limit)} "
            + (
                f"after '{t.event_condition}' took over at {_seconds(t.event_time)}."
                if t.event_condition
                else "after the start."
            )
        )
    else:
        verdict = (
            f"Starting from the steady state of '{t.start_condition}', the {t.limit_node} "
            f"does not reach its limit {_c(t.limit_temperature)} {after}; its peak is "
            f"{_c(sol.peak_temperature[0, node])} and it ends at {_c(final)}."
        )
    if t.required_response_time is not None:
        verdict += f" The product needs {_seconds(t.required_response_time)} to respond: " + (
            "enough time (PASS)." if t.status == "pass" else "the limit comes first (FAIL)."
        )
    heading = "Transient: time to the limit" + (
        f" after '{t.event_condition}'" if t.event_condition else ""
    )
    dynamic = sum(1 for c in t.heat_capacities.values() if c > 0)
    lump = t.lumping
    model_text = (
        f"Lumped RC network of {t.node_count} nodes ({dynamic} with a heat capacity, "
        f"{t.fin_nodes} per fin), solved with scipy's BDF integrator between the changes of "
        "condition and power. Lumping numbers at the shortest time of interest "
        f"({_seconds(lump['time'])}): fin Biot number (mH)^2 = "
        f"{_sig(lump['fin_biot_number'], 2)}, fin Fourier number alpha t/H^2 = "
        f"{_sig(lump['fin_fourier_number'], 2)}, base Fourier number = "
        f"{_sig(lump['base_fourier_number'], 2)} (one node per fin is adequate when the "
        "fin Fourier number is above 1 or its Biot number below 0.1: common practice, no "
        "source)."
    )
    from finkit.model.transient import ASSUMPTIONS

    badge = present.badge(t.status) if t.status else present.badge("info", "NOT CHECKED")
    parts = [
        present.heading(heading, 3),
        present.Fragment(
            f'<p class="fk-verdict">{present.escape(badge)} {present.escape(verdict)} '
            f"Simulated: {present.escape(_seconds(t.duration))}.</p>"
        ),
        transient_table(result, compact=True),
        figure_transient_history(result),
        present.heading("Transient model", 4),
        present.text(model_text),
        present.text("Assumptions: " + " ".join(ASSUMPTIONS), css_class="fk-small"),
    ]
    if t.warnings:
        parts.append(present.bullets(t.warnings, css_class="fk-list fk-warnings"))
    parts += [
        present.heading("Thermal impedance", 4),
        figure_thermal_impedance(result),
        impedance_table(result),
        present.heading("Cautions on the transient", 4),
        transient_cautions(result),
    ]
    return _join(*parts)
