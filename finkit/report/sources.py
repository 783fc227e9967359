"""Several sources on one base: the per-source table and the base temperature map.

Everything here shows the governing condition (as the verdict on page 1 does): each source
against its own limit, the governing source first, and a plan view of the base with the
sources outlined and the hottest point marked.
"""

from __future__ import annotations

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.report import present
from finkit.report.ahead import shareable
from finkit.report.formatting import (
    _FIGSIZE_TALL,
    _NODE_NAMES,
    _at_governing,
    _c,
    _caption,
    _figure,
    _join,
    _k,
    _q,
    _style,
)

__all__ = [
    "figure_base_map",
    "plot_base_map",
    "source_rows_table",
    "sources_section",
]


def _rows(result) -> tuple[dict, ...]:
    return tuple(getattr(result, "sources", ()) or ())


def source_rows_table(result, *, compact: bool = False) -> present.Fragment:
    """Each source at the governing condition against its own limit, governing source first.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with several sources. [-]
    compact : bool
        Fewer columns, for page 1. [-]
    """
    rows = _rows(result)
    if not rows:
        return present.text("")
    body = []
    for i, r in enumerate(rows):
        name = r["name"] + (" (governing)" if i == 0 else "")
        limit = (
            f"{_NODE_NAMES[r['limit_node']].lower()} {_c(r['limit_temperature'] + ZERO_CELSIUS)}"
        )
        status = present.badge(r["status"] == "pass")
        if compact:
            body.append(
                (
                    name,
                    _q(r["power"], "power", "W"),
                    _c(r["node_temperature"] + ZERO_CELSIUS),
                    limit,
                    f"{_k(r['margin'])} (req. {_k(r['required_margin'])})",
                    status,
                )
            )
        else:
            body.append(
                (
                    name,
                    _q(r["power"], "power", "W"),
                    _c(r["junction"] + ZERO_CELSIUS),
                    _c(r["case"] + ZERO_CELSIUS),
                    _c(r["base_mean"] + ZERO_CELSIUS),
                    _c(r["base_peak"] + ZERO_CELSIUS),
                    _k(r["air_offset"]),
                    limit,
                    f"{_k(r['margin'])} (req. {_k(r['required_margin'])})",
                    _q(r["allowable_power_alone"], "power", "W"),
                    status,
                )
            )
    if compact:
        header = ("Source", "Power", "Limit node", "Limit", "Margin", "")
    else:
        header = (
            "Source",
            "Power",
            "Junction",
            "Case",
            "Base, mean",
            "Base, peak",
            "Air placement",
            "Limit",
            "Margin",
            "Power alone",
            "",
        )
    return present.html_table(body, header=header, css_class="fk-sources")


@shareable
def sources_section(result) -> present.Fragment:
    """The per-source table with how it was computed (nothing for a single-source case).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    """
    rows = _rows(result)
    if not rows:
        return present.text("")
    gov = getattr(result, "governing", None)
    where = f" at the governing condition '{gov.name}'" if gov is not None else ""
    inputs = result.inputs
    plate = inputs.sources.plate
    spreader = result.case.sink.base.spreader
    base_text = (
        f"a solid base (k = {plate.in_plane_conductivity:.4g} W/(m·K))"
        if spreader is None
        else (
            f"a {spreader.kind.replace('-', ' ')} base with effective conductivities "
            f"{plate.in_plane_conductivity:.4g} W/(m·K) in plane and "
            f"{plate.through_conductivity:.4g} W/(m·K) through the thickness ({spreader.source})"
        )
    )
    text = (
        f"Each source against its own limit{where}, the governing source (least margin over "
        "its required margin) first. Base mean and peak: the base under the footprint from the "
        "superposed spreading solution of every source on "
        f"{base_text}, above the mean finned-face temperature the sink model gives. Air "
        "placement: the warmer air a source downstream of the middle of the base sees, with "
        "the air assumed to warm linearly along the flow (no credit is taken upstream). Power "
        "alone: the power that source could reach with the others held at theirs (a linear "
        "estimate); the allowable power on page 1 scales every source by the same factor."
    )
    parts = [
        present.heading("Sources on the base", 3),
        present.text(text),
        source_rows_table(result),
    ]
    if spreader is not None:
        parts.append(
            present.text(
                "Caution: an effective-conductivity model of a vapour chamber or heat pipes does "
                "not capture dry-out, the orientation against gravity or the power limit of the "
                "device; take those from the supplier's data for this orientation and power.",
                css_class="fk-small",
            )
        )
    return _join(*parts)


@_at_governing
def plot_base_map(result):
    """Plan view of the base temperature at the governing condition, sources outlined.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with several sources. [-]
    """
    from matplotlib.patches import Rectangle

    from finkit.physics.sink.sources import base_map

    layout, state = result.inputs.sources, result.solution.sources
    along, across, temperature = base_map(layout, state)
    celsius = temperature - ZERO_CELSIUS
    with _style():
        fig, axes = _figure(_FIGSIZE_TALL)
        ax = axes[0, 0]
        from matplotlib.ticker import MaxNLocator

        levels = MaxNLocator(nbins=14).tick_values(celsius.min(), celsius.max())
        filled = ax.contourf(along * 1e3, across * 1e3, celsius, levels=levels, cmap="inferno")
        ax.contour(
            along * 1e3, across * 1e3, celsius, levels=levels[::2], colors="white",
            linewidths=0.4, alpha=0.6,
        )  # fmt: skip
        bar = fig.colorbar(filled, ax=ax, shrink=0.9, format="%.0f")
        bar.set_label("Base temperature, source side [°C]")
        for placed in layout.sources:
            f = placed.footprint
            ax.add_patch(
                Rectangle(
                    ((f.centre_along - f.length / 2) * 1e3, (f.centre_across - f.width / 2) * 1e3),
                    f.length * 1e3,
                    f.width * 1e3,
                    fill=False,
                    edgecolor="white",
                    linewidth=1.4,
                )
            )
            ax.annotate(
                placed.name,
                (f.centre_along * 1e3, (f.centre_across + f.width / 2) * 1e3),
                xytext=(0, 3),
                textcoords="offset points",
                ha="center",
                va="bottom",
                color="white",
                fontsize=8,
                fontweight="bold",
            )
        hot = np.unravel_index(np.argmax(celsius), celsius.shape)
        x_hot, y_hot = along[hot[1]] * 1e3, across[hot[0]] * 1e3
        ax.plot(x_hot, y_hot, marker="x", color="#00b4d8", markersize=9, mew=2)
        right = x_hot < 0.6 * along[-1] * 1e3
        ax.annotate(
            f"hottest {celsius[hot]:.1f} °C",
            (x_hot, y_hot),
            xytext=(10 if right else -10, -14),
            textcoords="offset points",
            ha="left" if right else "right",
            color="black",
            fontsize=8,
            bbox={"boxstyle": "round,pad=0.2", "fc": "white", "ec": "none", "alpha": 0.85},
        )
        ax.set_xlabel("Distance from the inlet edge, along the flow [mm]")
        ax.set_ylabel("Distance from the left edge [mm]")
        ax.set_aspect("equal")
        ax.set_title("Air flow →", loc="left", fontsize=9)
    return fig


@shareable
def figure_base_map(result) -> present.Fragment:
    """:func:`plot_base_map` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case with several sources. [-]
    """
    text = (
        "Base temperature on the source side (plan view, air flowing from left to right), from "
        "the superposed spreading solution of every source with the fins as a uniform "
        "coefficient under the base, plus the air placement term downstream of the middle. "
        "Sources outlined and named; the cross marks the hottest point of the base."
    )
    return present.figure(plot_base_map(result), caption=_caption(result, "base_map", text))
