"""Touch temperature: the hottest touchable surface against the limits for touch."""

from __future__ import annotations

from dataclasses import dataclass, replace

from finkit.case.review_blocks import TOUCH_SURFACES
from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.model.design import SinkInputs, solve

__all__ = [
    "TouchResult",
    "touch_temperature_check",
]


# --------------------------------------------------------------------------------------
# Touch temperature
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class TouchResult:
    """Accessible-surface temperature check at the user's reference ambient.

    Attributes
    ----------
    surface_temperatures : dict
        Accessible surface -> temperature at the reference [K]: ``base`` is the hottest base
        temperature (under the source), ``fin_tips`` the fin tip.
    hottest_surface : str
        The hottest accessible surface [-].
    hottest_temperature : float
        Its temperature [K].
    limit_temperature : float
        The user's limit [K].
    reference_ambient : float
        Room ambient of the check [K].
    inlet_temperature : float
        Air at the sink at the reference (ambient plus preheat) [K].
    power : float
        Power of the check [W].
    margin : float
        ``limit_temperature - hottest_temperature`` [K].
    status : str
        ``pass`` or ``fail`` [-].
    basis : str
        The user's statement of where the limit comes from [-].
    statement : str
        One paragraph for the note [-].
    """

    surface_temperatures: dict[str, float]
    hottest_surface: str
    hottest_temperature: float
    limit_temperature: float
    reference_ambient: float
    inlet_temperature: float
    power: float
    margin: float
    status: str
    basis: str
    statement: str


def touch_temperature_check(
    inputs: SinkInputs,
    limit_temperature: float,
    reference_ambient: float,
    basis_text: str,
    *,
    surfaces=TOUCH_SURFACES,
    inlet_preheat: float = 0.0,
    power: float | None = None,
) -> TouchResult:
    """Hottest accessible surface of the sink at a reference ambient, against a stated limit.

    Parameters
    ----------
    inputs : SinkInputs
        The case. [-]
    limit_temperature : float
        Limit from the user's own standard for that surface material and contact time [K].
        finkit ships no table of limits. (Example only -- check against your standard: some
        product-safety standards judge accessible surfaces at a 25 degC reference with limits
        of the order of 70-80 degC for brief contact with plastic, lower for metal and longer
        contact.)
    reference_ambient : float
        Room ambient at which the standard judges the surface, e.g. 25 degC [K].
    basis_text : str
        Standard, edition, clause or table row, surface material and contact time [-].
    surfaces : sequence of {"base", "fin_tips"}
        Surfaces a person can touch [-].
    inlet_preheat : float, optional
        Air temperature at the sink above the reference ambient (internal preheat) [K].
    power : float, optional
        Power of the check; default the case power [W].

    Returns
    -------
    TouchResult
        Surface temperatures, the hottest one, margin and pass/fail.

    Notes
    -----
    The sink is re-solved with the inlet air (and the radiation surroundings) at
    ``reference_ambient + inlet_preheat``. This follows the practice of judging touch
    temperatures at a stated reference ambient rather than at the maximum rated ambient (the
    position discussed for IEC 62368-1; legacy IEC 60950-1 practice rescaled instead): the user
    states the reference and the limit, finkit does not choose them. Because natural convection
    and air properties depend on the absolute temperatures, the model is re-solved rather than
    shifted by the ambient difference.

    The base temperature reported is the hottest one, under the source (conservative for the
    parts of the base a hand can reach); the fin tip temperature is that of the 1-D fin
    referred to the inlet air (conservative in forced flow).
    """
    unknown = [s for s in surfaces if s not in TOUCH_SURFACES]
    if unknown or not surfaces:
        raise InputError(
            f"touch.surfaces: got {list(surfaces)!r}; allowed: one or more of "
            f"{', '.join(TOUCH_SURFACES)}"
        )
    if not limit_temperature > reference_ambient:
        raise InputError(
            "touch.limit_temperature: must be above touch.reference_ambient "
            f"(got {limit_temperature - ZERO_CELSIUS:.1f} degC)"
        )
    if not str(basis_text).strip():
        raise InputError("touch.basis: state the standard, table row, material and contact time")
    inlet = reference_ambient + inlet_preheat
    air = replace(inputs.air, inlet_temperature=inlet, surroundings_temperature=inlet)
    source = inputs.source if power is None else replace(inputs.source, power=power)
    sol = solve(inputs, air=air, source=source)
    temps = {
        "base": float(sol.source_base_centre_temperature),  # the hottest point of the base
        "fin_tips": float(sol.fin_tip_temperature),
    }
    temps = {k: v for k, v in temps.items() if k in surfaces}
    hottest = max(temps, key=temps.get)
    margin = limit_temperature - temps[hottest]
    status = "pass" if margin >= 0 else "fail"
    statement = (
        f"Hottest accessible surface ({hottest.replace('_', ' ')}) "
        f"{temps[hottest] - ZERO_CELSIUS:.1f}\u00a0°C at a "
        f"{reference_ambient - ZERO_CELSIUS:.1f}\u00a0°C reference ambient (air at the sink "
        f"{inlet - ZERO_CELSIUS:.1f}\u00a0°C, {float(sol.power):.3g}\u00a0W), against the user's "
        f"limit {limit_temperature - ZERO_CELSIUS:.1f}\u00a0°C ({basis_text}): {status}. "
        "The limit and its basis are the user's; finkit holds no table of touch limits."
    )
    return TouchResult(
        surface_temperatures=temps,
        hottest_surface=hottest,
        hottest_temperature=temps[hottest],
        limit_temperature=float(limit_temperature),
        reference_ambient=float(reference_ambient),
        inlet_temperature=float(inlet),
        power=float(sol.power),
        margin=float(margin),
        status=status,
        basis=str(basis_text),
        statement=statement,
    )
