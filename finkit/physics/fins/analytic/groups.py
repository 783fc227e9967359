"""Input checks, fin cross-sections and a fin's dimensionless groups (m, Biot number, L_c)."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import InputError
from finkit.validity import ValidityRange

__all__ = [
    "ANNULAR_TIP_CONDITIONS",
    "AnnularFinResult",
    "FinSection",
    "ONE_DIMENSIONAL_FIN_RANGE",
    "ProfileFinResult",
    "SCHMIDT_ANNULAR_RANGE",
    "TIP_CONDITIONS",
    "UniformFinResult",
    "corrected_length",
    "fin_parameter",
    "one_dimensional_fin_warnings",
    "pin_fin_section",
    "rectangular_fin_section",
    "transverse_biot_number",
]

#: Tip conditions accepted by :func:`uniform_fin` (Incropera et al. 2007, Table 3.4, cases A-D).
TIP_CONDITIONS = ("convective", "adiabatic", "prescribed", "infinite")

#: Tip conditions accepted by :func:`annular_fin`: "convective" uses the corrected radius
#: ``r2 + t/2`` with an adiabatic tip there, "adiabatic" uses ``r2`` itself.
ANNULAR_TIP_CONDITIONS = ("convective", "adiabatic")

#: One-dimensional fin conduction: the transverse Biot number ``h (A_c/P) / k`` should be small.
ONE_DIMENSIONAL_FIN_RANGE = ValidityRange(
    method="1-D fin conduction",
    quantity="transverse Biot number h (A_c/P)/k",
    low=0.0,
    high=0.1,
    source="common practice, no source",
)

#: Range in which the Schmidt approximation was compared with the exact annular efficiency
#: here (error within about -1.5 %; docs/methods.md b2, checked numerically).
SCHMIDT_ANNULAR_RANGE = ValidityRange(
    method="Schmidt (1949) annular fin approximation",
    quantity="m (r2c - r1)",
    low=0.0,
    high=1.0,
    source="compared with the exact Bessel solution for r2c/r1 <= 4 (finkit methods b2)",
)

# atanh(0.99): the length beyond which a fin with an adiabatic tip carries >= 99 % of the
# infinite-fin heat rate (Incropera's rounded value is mL >= 2.65).
_ATANH_099 = float(np.arctanh(0.99))


class FinSection(NamedTuple):
    """Cross-section of a fin of uniform section.

    Attributes
    ----------
    perimeter : array_like
        Wetted perimeter of the cross-section [m].
    cross_section_area : array_like
        Area of the cross-section normal to the base-to-tip direction [m²].
    """

    perimeter: np.ndarray
    cross_section_area: np.ndarray


class UniformFinResult(NamedTuple):
    """Result of :func:`uniform_fin`.

    Attributes
    ----------
    heat_rate : array_like
        Heat flow entering the fin at its base [W].
    efficiency : array_like
        Heat leaving the fin surface / (h A_f θ_b) [-].
    effectiveness : array_like
        heat_rate / (h A_c θ_b): fin heat rate over the heat the bare base area would lose [-].
    thermal_resistance : array_like
        θ_b / heat_rate [K W⁻¹].
    fin_parameter : array_like
        m = sqrt(h P / (k A_c)) [m⁻¹].
    fin_surface_area : array_like
        A_f used in the efficiency: P L, plus A_c for the convective tip; inf for the
        infinitely long fin [m²].
    transverse_biot_number : array_like
        h (A_c/P) / k: small values justify the 1-D model [-].
    """

    heat_rate: np.ndarray
    efficiency: np.ndarray
    effectiveness: np.ndarray
    thermal_resistance: np.ndarray
    fin_parameter: np.ndarray
    fin_surface_area: np.ndarray
    transverse_biot_number: np.ndarray


class AnnularFinResult(NamedTuple):
    """Result of :func:`annular_fin`.

    Attributes
    ----------
    heat_rate : array_like
        Heat flow entering the fin at its base radius [W].
    efficiency : array_like
        heat_rate / (h A_f θ_b) [-].
    effectiveness : array_like
        heat_rate / (h 2π r1 t θ_b) [-].
    thermal_resistance : array_like
        θ_b / heat_rate [K W⁻¹].
    fin_parameter : array_like
        m = sqrt(2 h / (k t)) [m⁻¹].
    fin_surface_area : array_like
        A_f = 2π (r2c² - r1²), both faces (tip face folded in through r2c) [m²].
    """

    heat_rate: np.ndarray
    efficiency: np.ndarray
    effectiveness: np.ndarray
    thermal_resistance: np.ndarray
    fin_parameter: np.ndarray
    fin_surface_area: np.ndarray


class ProfileFinResult(NamedTuple):
    """Result of the tapered-profile fins (triangular, concave parabolic, conical).

    Attributes
    ----------
    heat_rate : array_like
        η h A_f θ_b with the exact surface area, as the textbook tabulates it [W].
    efficiency : array_like
        Efficiency of the slender-fin solution (adiabatic tip) [-].
    fin_surface_area : array_like
        Exact surface area of the profile [m²].
    thermal_resistance : array_like
        θ_b / heat_rate [K W⁻¹].
    fin_parameter : array_like
        m = sqrt(2h/(k t)) (straight fins) or sqrt(4h/(k D)) (pins), base thickness or
        diameter [m⁻¹].
    """

    heat_rate: np.ndarray
    efficiency: np.ndarray
    fin_surface_area: np.ndarray
    thermal_resistance: np.ndarray
    fin_parameter: np.ndarray


# --------------------------------------------------------------------------------------------
# input checks
# --------------------------------------------------------------------------------------------


def _positive(name: str, value, unit: str, allow_inf: bool = False) -> np.ndarray:
    """Return ``value`` as a float array; raise InputError unless every element is > 0."""
    arr = np.asarray(value, dtype=float)
    ok = arr > 0.0
    if not allow_inf:
        ok &= np.isfinite(arr)
    if not np.all(ok):
        bad = arr[~ok] if arr.ndim else arr
        shown = float(np.ravel(bad)[0])
        limit = "> 0" if allow_inf else "finite and > 0"
        raise InputError(f"{name} = {shown!r} is not allowed; it must be {limit} [{unit}]")
    return arr


def _finite(name: str, value, unit: str) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(arr)):
        shown = float(np.ravel(arr[~np.isfinite(arr)] if arr.ndim else arr)[0])
        raise InputError(f"{name} = {shown!r} is not allowed; it must be a finite number [{unit}]")
    return arr


def _check_tip(tip, allowed: tuple[str, ...]) -> str:
    if not isinstance(tip, str) or tip not in allowed:
        raise InputError(f"tip = {tip!r} is not allowed; use one of: {', '.join(allowed)}")
    return tip


# --------------------------------------------------------------------------------------------
# sections and dimensionless groups
# --------------------------------------------------------------------------------------------


def rectangular_fin_section(fin_thickness, fin_width, include_edges: bool = True) -> FinSection:
    """Perimeter and area of a straight fin of rectangular section.

    Parameters
    ----------
    fin_thickness : array_like
        Fin thickness t [m].
    fin_width : array_like
        Fin width w, the side of the section normal to the thickness (for a plate fin in a heat
        sink this is the fin's extent along the flow) [m].
    include_edges : bool, default True
        True: exact perimeter ``P = 2 (w + t)``. False: the thin-fin form ``P = 2 w`` (the two
        edges of width t are neglected, so that ``m = sqrt(2 h / (k t))`` exactly) [-].

    Returns
    -------
    FinSection
        ``perimeter`` [m] and ``cross_section_area = w t`` [m²].

    Notes
    -----
    Incropera et al. (2007), section 3.6.4: ``A_c = w t``, ``P = 2 w + 2 t``, and ``P ≈ 2 w`` for
    ``w >> t``.

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, section 3.6.
    """
    t = _positive("fin_thickness", fin_thickness, "m")
    w = _positive("fin_width", fin_width, "m")
    perimeter = 2.0 * (w + t) if include_edges else 2.0 * w + 0.0 * t
    return FinSection(perimeter, w * t)


def pin_fin_section(pin_diameter) -> FinSection:
    """Perimeter ``π D`` and area ``π D²/4`` of a cylindrical pin.

    Parameters
    ----------
    pin_diameter : array_like
        Pin diameter D [m].

    Returns
    -------
    FinSection
        ``perimeter`` [m] and ``cross_section_area`` [m²].
    """
    d = _positive("pin_diameter", pin_diameter, "m")
    return FinSection(np.pi * d, 0.25 * np.pi * d * d)


def fin_parameter(perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient):
    """Fin parameter ``m = sqrt(h P / (k A_c))``.

    Parameters
    ----------
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Convective coefficient h on the fin surface [W m⁻² K⁻¹].

    Returns
    -------
    numpy.ndarray
        m [m⁻¹].
    """
    p = _positive("perimeter", perimeter, "m")
    a = _positive("cross_section_area", cross_section_area, "m²")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    return np.sqrt(h * p / (k * a))


def corrected_length(fin_length, perimeter, cross_section_area):
    """Corrected fin length ``L_c = L + A_c / P`` that folds the tip face into the side surface.

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L [m].
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].

    Returns
    -------
    numpy.ndarray
        L_c [m]: ``L + t/2`` for a thin rectangular fin with ``P = 2 w`` (``L + t w/(2(w+t))``
        with the exact perimeter), ``L + D/4`` for a pin.

    Notes
    -----
    With ``L_c`` the convective-tip fin (case A) is replaced by an adiabatic-tip fin (case B),
    ``q_f ≈ M tanh(m L_c)`` (Incropera et al. 2007, eq. 3.89). The error is small when the
    transverse Biot number is small; this was checked here against the exact case A.

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, section 3.6.4.
    """
    length = _positive("fin_length", fin_length, "m", allow_inf=True)
    p = _positive("perimeter", perimeter, "m")
    a = _positive("cross_section_area", cross_section_area, "m²")
    return length + a / p


def transverse_biot_number(
    perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient
):
    """Transverse Biot number ``Bi = h (A_c / P) / k`` of a fin section.

    Parameters
    ----------
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Convective coefficient h [W m⁻² K⁻¹].

    Returns
    -------
    numpy.ndarray
        Bi [-]: ``h (t/2)/k`` for a thin plate fin, ``h (D/4)/k`` for a pin.

    Notes
    -----
    The 1-D fin model assumes a uniform temperature over each cross-section; it needs ``Bi << 1``.
    See :data:`ONE_DIMENSIONAL_FIN_RANGE` and :func:`one_dimensional_fin_warnings`.
    """
    p = _positive("perimeter", perimeter, "m")
    a = _positive("cross_section_area", cross_section_area, "m²")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    return h * (a / p) / k


def one_dimensional_fin_warnings(biot_number, threshold: float = 0.1) -> list[str]:
    """Messages for a case whose transverse Biot number is too large for the 1-D fin model.

    Parameters
    ----------
    biot_number : array_like
        Transverse Biot number ``h (A_c/P)/k``, e.g. from :func:`transverse_biot_number` or
        ``UniformFinResult.transverse_biot_number``; NaNs are ignored [-].
    threshold : float, default 0.1
        Largest acceptable value; 0.1 is common practice, no source [-].

    Returns
    -------
    list of str
        Empty when every value is at or below ``threshold``; otherwise one line the caller can
        show in a note.
    """
    bi = np.asarray(biot_number, dtype=float)
    finite = bi[np.isfinite(bi)]
    if finite.size == 0 or float(finite.max()) <= threshold:
        return []
    shown = f"{float(finite.max()):.3g}"
    if finite.size > 1:
        shown = f"up to {shown}"
    return [
        f"1-D fin conduction: transverse Biot number h (A_c/P)/k = {shown} exceeds {threshold:g} "
        "(common practice, no source); the temperature varies across the fin section and the "
        "1-D fin result is less accurate"
    ]
