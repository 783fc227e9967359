"""Formatting shared by the note sections.

Display units, number and temperature text, the figure style (one style and one set of colours
for every note: figures are drawn on :class:`matplotlib.figure.Figure` with the Agg canvas, no
pyplot state; matplotlib is imported when the first figure is drawn), figure numbers and
captions, and small markup helpers.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

import functools
from collections.abc import Iterable
from contextlib import contextmanager
from typing import Any

import numpy as np

from finkit.case.units import format_quantity, from_si
from finkit.report import present

__all__ = [
    "CHAIN_COLOURS",
    "COLOURS",
    "H_SCATTER",
    "at_governing",
    "sweep_names",
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

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
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
    from finkit.physics.sink.inputs import NaturalConvection

    return isinstance(result.inputs.flow, NaturalConvection)


def _is_fan(result) -> bool:
    from finkit.physics.sink.inputs import FanDriven

    return isinstance(result.inputs.flow, FanDriven)


def _is_free_stream(result) -> bool:
    """True where the sink stands unshrouded in an approach stream (``air.bypass.free_stream``)."""
    from finkit.physics.sink.inputs import FreeStream

    return isinstance(getattr(result.inputs, "bypass", None), FreeStream)


def _is_plate(result) -> bool:
    from finkit.physics.geometry import PlateFinSink

    return isinstance(result.inputs.geometry, PlateFinSink)


def _governing_source(result) -> dict | None:
    """The governing source's row of a case with several sources (None otherwise)."""
    rows = getattr(result, "sources", ()) or ()
    return rows[0] if rows else None


def _node_cell(row, table) -> str:
    """A condition's limit-node temperature; with several sources, the source named when it is
    not the one the column header names (the governing condition's governing source)."""
    text = _c(row.node_temperature)
    source = getattr(row, "governing_source", None)
    if source and source != table.governing_row.governing_source:
        text += f" ({source})"
    return text


def _node(result) -> str:
    source = _governing_source(result)
    if source is not None:
        return f"{source['name']} {source['limit_node']}"
    return result.inputs.limit_node


def _node_name(result) -> str:
    source = _governing_source(result)
    if source is not None:
        return f"{_NODE_NAMES[source['limit_node']]} ({source['name']})"
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
    "base_map",
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
    source = _governing_source(result)
    if source is not None and key in ("allowable_vs_inlet", "vs_airflow", "fan_system"):
        text += (
            " With several sources every source's power is scaled alike and each is held to "
            "its own limit; a change of slope marks where another source starts to govern. "
            f"The limit lines are those of the governing source '{source['name']}'."
        )
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
    # several sources: no single chain for a budget; the base map instead
    plan.append("base_map" if _governing_source(result) is not None else "resistance_breakdown")
    plan += [f"sweep:{name}" for name in sweep_names(result)]
    return plan


def _figure_number(result, key: str) -> int:
    return _figure_plan(result).index(key) + 1


def _review_of(result):
    return getattr(result, "review", None)


def _plain_log_ticks(ax) -> None:
    """Ticks at 1, 2, 5 x 10^n with plain numbers on a logarithmic x axis."""
    from matplotlib.ticker import LogLocator, NullFormatter, ScalarFormatter

    fmt = ScalarFormatter(useOffset=False)
    fmt.set_scientific(False)
    ax.xaxis.set_major_locator(LogLocator(base=10, subs=(1.0, 2.0, 5.0)))
    ax.xaxis.set_major_formatter(fmt)
    ax.xaxis.set_minor_formatter(NullFormatter())


def sweep_names(result) -> list[str]:
    """The sweeps of ``case.sweeps`` not already drawn by the fixed figures, in case order.

    ``inlet_temperature`` is the allowable-power figure; ``airflow`` (forced) and
    ``heat_transfer_coefficient`` (natural) are the efficiency figure.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    drawn = {"inlet_temperature", "heat_transfer_coefficient" if _is_natural(result) else "airflow"}
    return [s for s in getattr(result.case, "sweeps", []) if s not in drawn]


def _uncertainty_of(result):
    return getattr(result, "uncertainty", None)


def _uncertainty_figure_keys(result) -> list[str]:
    """Figures of the uncertainty part, in order (they come before section 8's plots)."""
    u = _uncertainty_of(result)
    if u is None:
        return []
    return ["uncertainty_distribution"] + (["tornado"] if u.tornado.bars else [])
