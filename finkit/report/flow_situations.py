"""Method text of the situations beyond one source in plain forced or natural convection:
the free-convection credit, the free stream and several sources."""

from __future__ import annotations

from typing import Any

from finkit.report import present

__all__ = [
    "free_convection_credit",
    "free_convection_method",
    "free_stream_method",
    "several_sources_method",
]


def free_convection_credit(result):
    """The case's free-convection credit (mixed convection), or None.

    Parameters
    ----------
    result : CaseResult
        The solved case. [-]
    """
    options = getattr(getattr(result, "inputs", None), "options", None)
    return getattr(options, "free_convection", None)


def free_convection_method(result, cite) -> list[Any]:
    """The mixed-convection paragraph, when the case credits free convection at a weak flow.

    Parameters
    ----------
    result : CaseResult
        The solved case. [-]
    cite : callable
        Citation marker of a reference key. [-]
    """
    credit = free_convection_credit(result)
    if credit is None:
        return []
    direction = {
        "upward": "the forced flow rises, so buoyancy aids it",
        "horizontal": "the forced flow is horizontal, so buoyancy crosses it",
    }[credit.forced_flow]
    natural_model = (
        f"the fin-array correlation of Jones & Smith {cite('jones_smith')}"
        if credit.orientation == "horizontal-base-fins-up"
        else f"the channel correlation of Bar-Cohen & Rohsenow {cite('bar_cohen')} and, on the "
        f"end-fin outer faces, Churchill & Chu {cite('churchill_chu')}"
    )
    return [
        present.heading("Free convection beside the weak forced flow", 3),
        present.text(
            f"The case credits free convection at this low flow ({direction}; orientation "
            f"'{credit.orientation}'). The sink's forced-convection conductance G_F = 1/R_sink "
            "(air heating included) and its natural-convection conductance G_N in that "
            f"orientation ({natural_model}), at the same base temperature, are combined by "
            "Churchill's rule for "
            f"assisting and transverse flows with n = 3 {cite('churchill_mixed')}; of the "
            "exponents 3 to 4 in use, 3 gives the lowest combined value (conservative). The "
            "rule is applied to the whole sink's conductances referred to the inlet air "
            "(finkit's choice): it tends to the forced model at high velocity and to the "
            "natural-convection model as the flow stops. "
            + (
                "Radiation to the surroundings is credited in parallel (envelope method), as in "
                "natural convection."
                if credit.radiation
                else "No radiation is credited."
            )
            + " A downward flow, which buoyancy opposes, gets no credit (refused in the case "
            "file). The outlet air temperature is kept at or below the base temperature."
        ),
        present.equation(
            r"G = \left(G_F^{\,3} + G_N^{\,3}\right)^{1/3}"
            + (r" + G_{rad}" if credit.radiation else "")
            + r",\quad R_{sink} = 1/G"
        ),
    ]


def several_sources_method(result, cite) -> list[Any]:
    """The method paragraphs of a case with several sources (none otherwise).

    Parameters
    ----------
    result : CaseResult
        The solved case. [-]
    cite : callable
        Citation marker of a reference key. [-]
    """
    if getattr(result.inputs, "sources", None) is None:
        return []
    return [
        present.heading("Several sources on the base", 3),
        present.text(
            "The sink model takes the total power of all sources; it gives the mean temperature "
            "of the finned face of the base, T_b = T_in + Q R_sink. Above it, the temperature "
            "of the base on the source side is the superposition of the spreading solutions of "
            "every source: each source is an isoflux rectangle placed where it sits on a "
            "rectangular plate with adiabatic edges, cooled on the finned face by a uniform "
            "coefficient h = 1/(R_sink A_base) (the boundary the single-source chain uses), "
            f"solved as a Fourier cosine series {cite('yovanovich_series')} "
            f"{cite('muzychka_eccentric')}. A base with different conductivities in its plane "
            "and through its thickness (a vapour chamber or heat pipes, as effective "
            "conductivities from the supplier) is the same problem on a plate of conductivity "
            "sqrt(k_in k_through) and thickness t sqrt(k_in/k_through) "
            f"{cite('muzychka_orthotropic')}. Each source's case sits on the base temperature "
            "averaged over its footprint; its base limit node is the highest base temperature "
            "found over its footprint."
        ),
        present.equation(
            r"T_{case,i} = T_b + \sum_j G_{ij}\,Q_j + \Delta T_{air,i} + Q_i R_{int,i},\qquad "
            r"T_{j,i} = T_{case,i} + Q_i R_{jc,i}"
        ),
        present.text(
            "Air placement: the air is taken to warm linearly from inlet to outlet; the sink "
            "resistance already holds the mean warming, so a source centred downstream of the "
            "middle of the base adds (T_out - T_in)(x/L - 1/2); no credit is taken upstream "
            "(conservative). In natural convection no placement term is added. Every source is "
            "checked against its own limit; the governing source has the least margin over its "
            "required margin. The allowable power scales every source by the same factor until "
            "the governing one reaches its limit less its margin; the power of one source with "
            "the others held is a linear estimate about the stated state."
        ),
    ]


def free_stream_method(cite) -> list[Any]:
    """The note's paragraph on a sink standing unshrouded in an approach stream.

    Parameters
    ----------
    cite : callable
        Citation marker of a reference key. [-]
    """
    return [
        present.text(
            "No duct: the sink stands unshrouded in the approach stream, and the share of the "
            f"stream that passes through the fins follows Lee's bypass balance {cite('bypass')} "
            f"as Simons & Schmidt applied it {cite('simons_schmidt')}. The stream through the "
            "fins and the stream round the sink leave the same approach section and meet "
            "again at the sink exit at one static pressure; the bypass stream loses nothing, "
            "the fin stream loses the pressure drop above and its channel velocity head. With "
            "the bypass region unbounded (the free stream) the approach dynamic head drives "
            "the fins:"
        ),
        present.equation(
            r"\dfrac{\rho\,V_{app}^2}{2} = \dfrac{\rho\,V_{ch}^2}{2} + \Delta p(Q_{hs}),"
            r"\quad V_{ch} = \dfrac{Q_{hs}}{A_{ch}},"
            r"\quad \text{bypass share} = 1 - \dfrac{Q_{hs}}{V_{app}\,W\,H}"
        ),
        present.text(
            "V_app is the undisturbed stream's velocity at the sink, over the fin height; a "
            "given volume flow is read as V_app W H. Any confinement round the sink would speed "
            "up the bypass stream and push more air through the fins, and the low pressure in "
            "the sink's wake is not credited: both make this the conservative end of the model. "
            "The fin tips see the air (corrected fin length, open-top channels). The balance is "
            "one-dimensional (no leakage out of the open fin tops along the flow); Lee's model "
            "was compared with measurements for sinks in ducts with clearance, and its "
            "free-stream limit carries about ±10-20 % on the fin flow. finkit applies it for "
            "approach velocities of 1-20 m/s and warns outside."
        ),
    ]
