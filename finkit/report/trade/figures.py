"""Figures of the trade-study note: the Pareto front and the design space."""

from __future__ import annotations

from itertools import combinations

import numpy as np

from finkit.case.units import from_si
from finkit.report import present
from finkit.report.formatting import COLOURS, _figure, _join, _style
from finkit.report.trade.study import (
    _COLUMNS,
    _DESIGN,
    ChosenDesign,
    TradeNote,
)

__all__ = [
    "figure_design_space",
    "figure_front",
    "plot_design_space",
    "plot_front",
]


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
    # Long by design: one figure: axes, front, chosen design, case design, limits and labels.
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
    """Every 2-D projection of the front (:func:`plot_front`), each with its caption.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
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
    """:func:`plot_design_space` embedded with its caption.

    Parameters
    ----------
    note : TradeNote
        From :func:`run`. [-]
    """
    number = len(list(combinations(note.objectives, 2))) + 1
    what = "fin count and fin height" if note.is_plate else "pin diameter and pitch across the flow"
    caption = (
        f"Figure {number}. The design space over {what}: which designs the manufacturing bounds "
        "and the envelope allow, and which of those keep the limit node the required margin "
        "below its limit at the case's power. The star is the chosen design (it may lie "
        "between grid points), the diamond the case's design."
    )
    return present.figure(plot_design_space(note), caption=caption)
