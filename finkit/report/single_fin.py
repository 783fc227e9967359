"""The sections and figures of a single-fin note.

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
    _FIGSIZE_WIDE,
    _H,
    _T,
    COLOURS,
    _bullets,
    _c,
    _caption,
    _eff,
    _figure,
    _join,
    _numbered,
    _q,
    _sig,
    _style,
)
from finkit.report.method import (
    _REFS,
)

__all__ = [
    "MATERIAL_COLOURS",
    "figure_fin_efficiency_vs_length",
    "figure_fin_profiles_study",
    "figure_fin_tip_profiles",
    "fin_assumptions",
    "fin_cautions",
    "fin_headline",
    "fin_method_section",
    "fin_tip_table",
    "plot_fin_efficiency_vs_length",
    "plot_fin_profiles_study",
    "plot_fin_tip_profiles",
]


# --------------------------------------------------------------------------------------------
# Single fin


def _study(result):
    from finkit.physics.single_fin import solve_single_fin

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


@shareable
def figure_fin_tip_profiles(result) -> present.Fragment:
    """:func:`plot_fin_tip_profiles` embedded with its caption (a remark if not available).

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]
    """
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


@shareable
def figure_fin_efficiency_vs_length(result) -> present.Fragment:
    """:func:`plot_fin_efficiency_vs_length` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case of uniform section. [-]
    """
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
    from finkit.model.sweeps import single_fin_profiles

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


@shareable
def figure_fin_profiles_study(result) -> present.Fragment:
    """:func:`plot_fin_profiles_study` embedded with its caption.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]
    """
    from finkit.physics.single_fin import UNIFORM_PROFILES

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


@shareable
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
    """Assumptions of a single-fin study, as a list.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]
    """
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
    """Cautions of a single-fin study, as a list.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved single-fin case. [-]
    """
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
