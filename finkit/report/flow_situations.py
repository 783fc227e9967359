"""Method text of the flow situations beyond plain forced or natural convection."""

from __future__ import annotations

from typing import Any

from finkit.report import present

__all__ = ["free_convection_credit", "free_convection_method"]


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
