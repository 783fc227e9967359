"""The uncertainty (Monte Carlo, tornado) and model-form sections of a heat-sink note.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from finkit.case.units import from_si
from finkit.report import present
from finkit.report.ahead import shareable
from finkit.report.formatting import (
    _FIGSIZE,
    _H,
    _NBSP,
    _T,
    COLOURS,
    H_SCATTER,
    _air,
    _bullets,
    _c,
    _caption,
    _f,
    _figure,
    _is_natural,
    _join,
    _k,
    _limit_lines,
    _node,
    _node_name,
    _q,
    _res,
    _sig,
    _style,
    _uncertainty_of,
)

__all__ = [
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

#: Display names of the inputs a tolerance may vary (finkit.model.uncertainty.TOLERANCE_INPUTS).
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


def _tolerance_value(name: str, value: float, *, difference: bool = False) -> str:
    """One value of a toleranced input in its display unit (a difference in K for °C)."""
    from finkit.model.uncertainty import TOLERANCE_INPUTS

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
    from finkit.model.uncertainty import TOLERANCE_INPUTS, nominal_value

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
    if mc.source_exceedance:
        shares = ", ".join(
            f"{name} {_sig(share * 100, 2)} %"
            for name, share in mc.source_exceedance.items()
            if name != "any source"
        )
        statement += (
            f" Each source against its own limit, share of the samples above it: {shares}; "
            f"at least one source: {_sig(mc.source_exceedance['any source'] * 100, 2)} %."
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


@shareable
def figure_uncertainty_distribution(result) -> present.Fragment:
    """:func:`plot_uncertainty_distribution` with its caption; empty without tolerances.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case, with ``uncertainty`` when it has a ``tolerances`` block. [-]
    """
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


@shareable
def figure_tornado(result) -> present.Fragment:
    """:func:`plot_tornado` with its caption; empty without tolerances (or none of width).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case, with ``uncertainty`` when it has a ``tolerances`` block. [-]
    """
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
    from finkit.model.model_form import model_form_check

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
        "A mesh-refinement study on finer meshes: finkit.physics.conduction.refine_study with the "
        "same inputs."
    )


@shareable
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
    from finkit.model.model_form import model_form_check

    heading = present.heading("Model-form check: 1-D chain against 3-D conduction", 3)
    check = model_form_check(result)
    if not check.is_covered and getattr(result.inputs, "sources", None) is not None:
        return _join(
            heading,
            present.text(
                f"Not covered for this case: {check.reason}. Judge that assumption on its own; "
                "a source near a base edge or over few fins is where it is least exact."
            ),
        )
    if not check.is_covered:
        return _join(
            heading,
            present.text(
                "Not covered for this sink: the three-dimensional conduction model of finkit "
                "(finkit.physics.conduction) covers plate-fin sinks only, so the one-dimensional "
                "chain "
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
