"""Closed-form single fins: uniform section (four tip conditions), annular and tapered profiles.

Every function is pure and vectorised: arguments are SI floats or numpy arrays that broadcast
together, the results are arrays of the broadcast shape (or NamedTuples of them). Nothing warns;
impossible input raises :class:`finkit.errors.InputError` with a one-line message.

Conventions
-----------
* ``x`` runs from the fin base (``x = 0``) to the tip (``x = fin_length``).
* ``fin_length`` is the base-to-tip distance of a single fin: the ``fin_height`` of a plate fin
  in a heat sink, the ``pin_height`` of a pin (see the glossary in DEVELOPERS.md).
* Excess temperature ``θ = T - T∞`` [K]; ``base_temperature_difference`` is ``θ_b``.
* Fin efficiency is always *heat leaving the fin surface* divided by ``h A_f θ_b``, with ``A_f``
  the surface that exchanges heat with the air (the tip face included for the convective tip).
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import InputError
from finkit.validity import ValidityRange

__all__ = [
    "TIP_CONDITIONS",
    "ANNULAR_TIP_CONDITIONS",
    "ONE_DIMENSIONAL_FIN_RANGE",
    "SCHMIDT_ANNULAR_RANGE",
    "FinSection",
    "UniformFinResult",
    "AnnularFinResult",
    "ProfileFinResult",
    "rectangular_fin_section",
    "pin_fin_section",
    "fin_parameter",
    "corrected_length",
    "transverse_biot_number",
    "one_dimensional_fin_warnings",
    "uniform_fin",
    "uniform_fin_temperature_difference",
    "uniform_fin_efficiency_corrected_length",
    "infinite_fin_length",
    "annular_fin",
    "annular_fin_efficiency",
    "annular_fin_efficiency_schmidt",
    "straight_fin_triangular",
    "straight_fin_concave_parabolic",
    "pin_fin_conical",
    "pin_fin_concave_parabolic",
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


# --------------------------------------------------------------------------------------------
# uniform-section fin
# --------------------------------------------------------------------------------------------


def uniform_fin(
    fin_length,
    perimeter,
    cross_section_area,
    thermal_conductivity,
    heat_transfer_coefficient,
    base_temperature_difference=1.0,
    tip: str = "convective",
    tip_temperature_difference=0.0,
) -> UniformFinResult:
    """Heat rate, efficiency, effectiveness and resistance of a fin of uniform cross-section.

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L; ``inf`` is allowed (the "infinite" tip ignores it) [m].
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h on the fin surface (and tip face) [W m⁻² K⁻¹].
    base_temperature_difference : array_like, default 1.0
        θ_b = T_b - T∞; the default gives the heat rate per kelvin [K].
    tip : {"convective", "adiabatic", "prescribed", "infinite"}, default "convective"
        Tip condition (Incropera Table 3.4 cases A, B, C, D) [-].
    tip_temperature_difference : array_like, default 0.0
        θ_L = T(L) - T∞ for ``tip="prescribed"``; ignored otherwise [K].

    Returns
    -------
    UniformFinResult
        heat_rate [W], efficiency [-], effectiveness [-], thermal_resistance [K W⁻¹],
        fin_parameter m [m⁻¹], fin_surface_area [m²], transverse_biot_number [-].

    Notes
    -----
    With ``m = sqrt(hP/(kA_c))``, ``M = sqrt(hPkA_c) θ_b = k A_c m θ_b`` and ``a = h/(m k)``:

    * convective (A): ``q_f = M (tanh mL + a) / (1 + a tanh mL)``, ``A_f = P L + A_c``
    * adiabatic (B): ``q_f = M tanh mL``, ``A_f = P L``
    * prescribed (C): ``q_f = M [coth mL - (θ_L/θ_b) csch mL]``, ``A_f = P L``
    * infinite (D): ``q_f = M``, ``A_f = ∞`` (efficiency 0, its limit)

    The case A and C forms are Table 3.4 divided through by ``cosh mL`` or written with
    ``csch mL = -2 e^{-mL} / expm1(-2mL)``, so that nothing overflows for large ``mL``.

    Efficiency is the heat leaving the fin surface over ``h A_f θ_b``. For tips A, B and D this
    is ``q_f / (h A_f θ_b)``. For the prescribed tip part of ``q_f`` is conducted on through the
    tip into whatever holds it; the surface loss is ``M (1 + θ_L/θ_b) tanh(mL/2)`` (derived from
    the case C profile), so the efficiency stays the mean excess temperature over θ_b.
    Effectiveness is ``q_f / (h A_c θ_b)`` and the resistance ``θ_b / q_f``.

    Assumptions: steady, 1-D conduction along the fin, constant k and h, no radiation, no heat
    generation. The tip conditions were checked against ``scipy.integrate.solve_bvp``.

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, section 3.6.4, Table 3.4.

    Examples
    --------
    A long copper pin (D = 5 mm, k = 398, h = 100, θ_b = 75 K) loses about 8.3 W:

    >>> from finkit.physics.fins import pin_fin_section, uniform_fin
    >>> s = pin_fin_section(0.005)
    >>> r = uniform_fin(1.0, s.perimeter, s.cross_section_area, 398.0, 100.0, 75.0, tip="infinite")
    >>> round(float(r.heat_rate), 2)
    8.31
    """
    tip = _check_tip(tip, TIP_CONDITIONS)
    length = _positive("fin_length", fin_length, "m", allow_inf=True)
    p = _positive("perimeter", perimeter, "m")
    a_c = _positive("cross_section_area", cross_section_area, "m²")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")

    hp = h * p
    ka = k * a_c
    m = np.sqrt(hp / ka)
    km = ka * m  # sqrt(h P k A_c): fin heat rate of the infinite fin per kelvin [W/K]
    ml = m * length

    if tip == "prescribed":
        theta_l = _finite("tip_temperature_difference", tip_temperature_difference, "K")
        t_ml = np.tanh(ml)
        csch = -2.0 * np.exp(-ml) / np.expm1(-2.0 * ml)
        q = km * (theta_b / t_ml - theta_l * csch)
        surface_loss = km * (theta_b + theta_l) * np.tanh(0.5 * ml)
        area = p * length
        efficiency = surface_loss / (hp * length * theta_b)
        effectiveness = q / (h * a_c * theta_b)
        resistance = theta_b / q
    else:
        if tip == "convective":
            t_ml = np.tanh(ml)
            ratio = h / (m * k)
            q1 = km * (t_ml + ratio) / (1.0 + ratio * t_ml)
            area = p * length + a_c
        elif tip == "adiabatic":
            q1 = km * np.tanh(ml)
            area = p * length
        else:  # infinite
            q1 = km * np.ones_like(ml)
            area = np.full_like(ml, np.inf)
        q = q1 * theta_b
        efficiency = q1 / (h * area)
        effectiveness = q1 / (h * a_c)
        resistance = 1.0 / q1

    biot = h * a_c / (p * k)
    out = (q, efficiency, effectiveness, resistance, m, area, biot)
    shape = np.broadcast_shapes(*(np.shape(v) for v in out))
    return UniformFinResult(*(np.broadcast_to(v, shape) for v in out))


def uniform_fin_temperature_difference(
    x,
    fin_length,
    perimeter,
    cross_section_area,
    thermal_conductivity,
    heat_transfer_coefficient,
    base_temperature_difference=1.0,
    tip: str = "convective",
    tip_temperature_difference=0.0,
):
    """Excess temperature θ(x) = T(x) - T∞ along a fin of uniform cross-section.

    Parameters
    ----------
    x : array_like
        Distance from the base, ``0 <= x <= fin_length`` [m].
    fin_length : array_like
        Base-to-tip length L; ``inf`` is allowed [m].
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].
    tip : {"convective", "adiabatic", "prescribed", "infinite"}, default "convective"
        Tip condition, as in :func:`uniform_fin` [-].
    tip_temperature_difference : array_like, default 0.0
        θ_L for ``tip="prescribed"`` [K].

    Returns
    -------
    numpy.ndarray
        θ(x) [K].

    Notes
    -----
    Incropera Table 3.4 profiles rewritten with decaying exponentials only
    (``E1 = e^{-mx}``, ``E2 = e^{-m(2L-x)}``, ``a = h/(mk)``):

    * convective: ``θ/θ_b = [(1+a) E1 + (1-a) E2] / [(1+a) + (1-a) e^{-2mL}]``
    * adiabatic: the same with ``a = 0``
    * prescribed: ``θ = [θ_L e^{m(x-L)} expm1(-2mx) + θ_b e^{-mx} expm1(-2m(L-x))] / expm1(-2mL)``
    * infinite: ``θ/θ_b = e^{-mx}``

    These equal the hyperbolic forms identically and do not overflow (``mL = 1000`` is fine).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.4.
    """
    tip = _check_tip(tip, TIP_CONDITIONS)
    xx = _finite("x", x, "m")
    length = _positive("fin_length", fin_length, "m", allow_inf=True)
    x_b, length_b = np.broadcast_arrays(xx, length)
    outside = (x_b < 0.0) | (x_b > length_b * (1.0 + 1e-12))
    if np.any(outside):
        raise InputError(
            f"x = {float(x_b[outside][0])!r} is not allowed; it must lie between 0 and "
            "fin_length [m]"
        )
    m = fin_parameter(
        perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient
    )
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")

    if tip == "infinite":
        return theta_b * np.exp(-m * xx)
    if tip == "prescribed":
        theta_l = _finite("tip_temperature_difference", tip_temperature_difference, "K")
        den = np.expm1(-2.0 * m * length)
        near_tip = np.exp(m * (xx - length)) * np.expm1(-2.0 * m * xx)
        near_base = np.exp(-m * xx) * np.expm1(-2.0 * m * (length - xx))
        return (theta_l * near_tip + theta_b * near_base) / den
    if tip == "convective":
        h = np.asarray(heat_transfer_coefficient, dtype=float)
        k = np.asarray(thermal_conductivity, dtype=float)
        ratio = h / (m * k)
    else:
        ratio = 0.0
    e1 = np.exp(-m * xx)
    e2 = np.exp(-m * (2.0 * length - xx))
    num = (1.0 + ratio) * e1 + (1.0 - ratio) * e2
    den = (1.0 + ratio) + (1.0 - ratio) * np.exp(-2.0 * m * length)
    return theta_b * num / den


def uniform_fin_efficiency_corrected_length(
    fin_length, perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient
):
    """Efficiency ``tanh(m L_c) / (m L_c)`` of a uniform fin with the corrected length.

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L (not corrected) [m].
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].

    Returns
    -------
    numpy.ndarray
        η_f [-], to be used with ``A_f = P L_c``, ``L_c = L + A_c/P``.

    Notes
    -----
    Incropera et al. (2007), eq. 3.94 with eq. 3.89: the convective tip is replaced by an
    adiabatic tip at ``L_c``. Use the exact convective tip of :func:`uniform_fin` when the
    transverse Biot number is not small.

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, section 3.6.5.
    """
    lc = corrected_length(fin_length, perimeter, cross_section_area)
    m = fin_parameter(
        perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient
    )
    mlc = m * lc
    return np.tanh(mlc) / mlc


def infinite_fin_length(
    perimeter,
    cross_section_area,
    thermal_conductivity,
    heat_transfer_coefficient,
    heat_rate_ratio=0.99,
):
    """Length beyond which an adiabatic-tip fin carries a given fraction of the infinite fin.

    Parameters
    ----------
    perimeter : array_like
        Cross-section perimeter P [m].
    cross_section_area : array_like
        Cross-section area A_c [m²].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    heat_rate_ratio : array_like, default 0.99
        Required ``tanh(mL)``, i.e. q_f(adiabatic) / q_f(infinite), in (0, 1) [-].

    Returns
    -------
    numpy.ndarray
        ``L = atanh(ratio) / m`` [m]; for 0.99 this is ``2.647/m`` (Incropera rounds to 2.65/m).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Example 3.9.
    """
    ratio = np.asarray(heat_rate_ratio, dtype=float)
    if not np.all((ratio > 0.0) & (ratio < 1.0)):
        shown = float(np.ravel(ratio[~((ratio > 0) & (ratio < 1))] if ratio.ndim else ratio)[0])
        raise InputError(f"heat_rate_ratio = {shown!r} is not allowed; it must lie in (0, 1) [-]")
    m = fin_parameter(
        perimeter, cross_section_area, thermal_conductivity, heat_transfer_coefficient
    )
    return np.arctanh(ratio) / m


# --------------------------------------------------------------------------------------------
# annular fin of rectangular profile
# --------------------------------------------------------------------------------------------


def _annular_core(r1, r2c, m):
    """Exact annular efficiency in the overflow-free scaled-Bessel form (docs/methods.md b1)."""
    from scipy import special  # here: scipy.special costs 0.1 s at import

    a = m * r1
    c = m * r2c
    decay = np.exp(2.0 * (a - c))
    k1c = special.k1e(c)
    i1c = special.i1e(c)
    num = special.k1e(a) * i1c - special.i1e(a) * k1c * decay
    den = special.i0e(a) * k1c * decay + special.k0e(a) * i1c
    return 2.0 * r1 / (m * (r2c * r2c - r1 * r1)) * num / den


def _annular_inputs(
    base_radius, tip_radius, fin_thickness, thermal_conductivity, heat_transfer_coefficient, tip
):
    tip = _check_tip(tip, ANNULAR_TIP_CONDITIONS)
    r1 = _positive("base_radius", base_radius, "m")
    r2 = _positive("tip_radius", tip_radius, "m")
    t = _positive("fin_thickness", fin_thickness, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    if np.any(r2 <= r1):
        raise InputError(
            f"tip_radius = {float(np.min(r2))!r} is not allowed; it must exceed base_radius [m]"
        )
    r2c = r2 + 0.5 * t if tip == "convective" else r2
    m = np.sqrt(2.0 * h / (k * t))
    return r1, r2c, t, h, m


def annular_fin_efficiency(
    base_radius,
    tip_radius,
    fin_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    tip: str = "convective",
):
    """Exact efficiency of an annular fin of rectangular profile (modified Bessel functions).

    Parameters
    ----------
    base_radius : array_like
        Fin root radius r1 (tube outer radius) [m].
    tip_radius : array_like
        Fin outer radius r2 > r1 [m].
    fin_thickness : array_like
        Fin thickness t [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    tip : {"convective", "adiabatic"}, default "convective"
        "convective": adiabatic tip at the corrected radius ``r2c = r2 + t/2``;
        "adiabatic": adiabatic tip at ``r2`` [-].

    Returns
    -------
    numpy.ndarray
        η_f [-], referred to ``A_f = 2π (r2c² - r1²)``.

    Notes
    -----
    With ``m = sqrt(2h/(kt))``, ``a = m r1``, ``c = m r2c`` (Incropera Table 3.5):

    .. math::
        \\eta_f = \\frac{2 r_1}{m (r_{2c}^2 - r_1^2)}
        \\frac{K_1(a) I_1(c) - I_1(a) K_1(c)}{I_0(a) K_1(c) + K_0(a) I_1(c)}

    evaluated with the exponentially scaled functions ``i0e, i1e, k0e, k1e`` after multiplying
    numerator and denominator by ``e^{a-c}`` (no overflow for any ``m r2c``).

    How it was confirmed: identical to ``ht.fin_efficiency_Kern_Kraus`` (ht 1.2.0, which takes
    the already corrected diameter ``2 r2c`` and h in W m⁻² K⁻¹) and to
    :func:`finkit.physics.fins.numeric.solve_fin` on the radial fin equation (tests).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    .. [2] Kern, D.Q., Kraus, A.D., "Extended Surface Heat Transfer", McGraw-Hill, 1972.
    """
    r1, r2c, _t, _h, m = _annular_inputs(
        base_radius, tip_radius, fin_thickness, thermal_conductivity, heat_transfer_coefficient, tip
    )
    return _annular_core(r1, r2c, m)


def annular_fin(
    base_radius,
    tip_radius,
    fin_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    base_temperature_difference=1.0,
    tip: str = "convective",
) -> AnnularFinResult:
    """Heat rate, efficiency and resistance of an annular fin of rectangular profile.

    Parameters
    ----------
    base_radius : array_like
        Fin root radius r1 [m].
    tip_radius : array_like
        Fin outer radius r2 > r1 [m].
    fin_thickness : array_like
        Fin thickness t [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].
    tip : {"convective", "adiabatic"}, default "convective"
        As in :func:`annular_fin_efficiency` [-].

    Returns
    -------
    AnnularFinResult
        heat_rate [W], efficiency [-], effectiveness [-], thermal_resistance [K W⁻¹],
        fin_parameter [m⁻¹], fin_surface_area [m²].

    Notes
    -----
    ``q_f = η_f h A_f θ_b`` with ``A_f = 2π (r2c² - r1²)`` (Incropera Table 3.5).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    """
    r1, r2c, t, h, m = _annular_inputs(
        base_radius, tip_radius, fin_thickness, thermal_conductivity, heat_transfer_coefficient, tip
    )
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")
    eta = _annular_core(r1, r2c, m)
    area = 2.0 * np.pi * (r2c * r2c - r1 * r1)
    g = eta * h * area  # conductance [W/K]
    q = g * theta_b
    shape = np.shape(q)
    out = (q, eta, g / (h * 2.0 * np.pi * r1 * t), 1.0 / g, m, area)
    return AnnularFinResult(*(np.broadcast_to(v, shape) for v in out))


def annular_fin_efficiency_schmidt(
    base_radius,
    tip_radius,
    fin_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    tip: str = "convective",
):
    """Schmidt's approximation of the annular-fin efficiency.

    Parameters
    ----------
    base_radius : array_like
        Fin root radius r1 [m].
    tip_radius : array_like
        Fin outer radius r2 > r1 [m].
    fin_thickness : array_like
        Fin thickness t [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    tip : {"convective", "adiabatic"}, default "convective"
        As in :func:`annular_fin_efficiency` [-].

    Returns
    -------
    numpy.ndarray
        η_f [-].

    Notes
    -----
    ``R = r2c/r1``, ``φ = (R - 1)(1 + 0.35 ln R)``, ``η ≈ tanh(m r1 φ)/(m r1 φ)``. Compared with
    the exact form here: within about -1.5 % for ``R <= 4`` and ``m (r2c - r1) <= 1``
    (:data:`SCHMIDT_ANNULAR_RANGE`); the error grows to +4 % (R = 3) and +8 % (R = 4) at
    ``m (r2c - r1) = 2``. A fallback; prefer :func:`annular_fin_efficiency`.

    References
    ----------
    .. [1] Schmidt, T.E., "Heat transfer calculations for extended surfaces", Refrigerating
       Engineering, April 1949, pp. 351-357.
    """
    r1, r2c, _t, _h, m = _annular_inputs(
        base_radius, tip_radius, fin_thickness, thermal_conductivity, heat_transfer_coefficient, tip
    )
    ratio = r2c / r1
    phi = (ratio - 1.0) * (1.0 + 0.35 * np.log(ratio))
    z = m * r1 * phi
    return np.tanh(z) / z


# --------------------------------------------------------------------------------------------
# tapered straight fins and pins
# --------------------------------------------------------------------------------------------


def _profile_result(eta, h, area, theta_b, m) -> ProfileFinResult:
    g = eta * h * area
    q = g * theta_b
    shape = np.shape(q)
    return ProfileFinResult(*(np.broadcast_to(v, shape) for v in (q, eta, area, 1.0 / g, m)))


def straight_fin_triangular(
    fin_length,
    fin_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    fin_width=1.0,
    base_temperature_difference=1.0,
) -> ProfileFinResult:
    """Straight fin of triangular profile (thickness t at the base, zero at the tip).

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L [m].
    fin_thickness : array_like
        Base thickness t [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    fin_width : array_like, default 1.0
        Width w normal to the profile; the default gives values per metre of width [m].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].

    Returns
    -------
    ProfileFinResult
        heat_rate [W], efficiency [-], fin_surface_area ``2 w sqrt(L² + (t/2)²)`` [m²],
        thermal_resistance [K W⁻¹], fin_parameter ``m = sqrt(2h/(kt))`` [m⁻¹].

    Notes
    -----
    ``η = I1(2mL) / (mL I0(2mL))`` (evaluated as ``i1e/i0e``), slender-fin solution with the
    side area taken as ``2 w dx``; equivalently ``q_f = sqrt(2hkt) w θ_b I1(2mL)/I0(2mL)``.
    How it was confirmed: the same form appears in independent public transcriptions of
    Incropera Table 3.5 and of other textbook triangular-fin examples (found by code search), and
    :func:`finkit.physics.fins.numeric.solve_fin` on ``A_c(x) = w t (1 - x/L)`` reproduces it
    (tests).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    """
    from scipy import special  # here: scipy.special costs 0.1 s at import

    length = _positive("fin_length", fin_length, "m")
    t = _positive("fin_thickness", fin_thickness, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    w = _positive("fin_width", fin_width, "m")
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")
    m = np.sqrt(2.0 * h / (k * t))
    z = 2.0 * m * length
    eta = special.i1e(z) / (m * length * special.i0e(z))
    area = 2.0 * w * np.sqrt(length * length + 0.25 * t * t)
    return _profile_result(eta, h, area, theta_b, m)


def straight_fin_concave_parabolic(
    fin_length,
    fin_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    fin_width=1.0,
    base_temperature_difference=1.0,
) -> ProfileFinResult:
    """Straight fin of concave parabolic profile, thickness ``t (x'/L)²`` (x' from the tip).

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L [m].
    fin_thickness : array_like
        Base thickness t [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    fin_width : array_like, default 1.0
        Width w normal to the profile [m].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].

    Returns
    -------
    ProfileFinResult
        heat_rate [W], efficiency [-], fin_surface_area [m²], thermal_resistance [K W⁻¹],
        fin_parameter ``m = sqrt(2h/(kt))`` [m⁻¹].

    Notes
    -----
    ``η = 2 / [sqrt(4 (mL)² + 1) + 1]`` and
    ``A_f = w [C1 L + (L²/t) ln(t/L + C1)]``, ``C1 = sqrt(1 + (t/L)²)`` (Incropera Table 3.5).
    How it was confirmed: the efficiency follows from the power-law solution
    ``θ/θ_b = (x'/L)^p``, ``p = [-1 + sqrt(1 + 4 (mL)²)]/2``, of the slender-fin equation; the
    area was checked by quadrature of the arc length (tests).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    """
    length = _positive("fin_length", fin_length, "m")
    t = _positive("fin_thickness", fin_thickness, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    w = _positive("fin_width", fin_width, "m")
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")
    m = np.sqrt(2.0 * h / (k * t))
    ml = m * length
    eta = 2.0 / (np.sqrt(4.0 * ml * ml + 1.0) + 1.0)
    c1 = np.sqrt(1.0 + (t / length) ** 2)
    area = w * (c1 * length + length * length / t * np.log(t / length + c1))
    return _profile_result(eta, h, area, theta_b, m)


def pin_fin_conical(
    fin_length,
    pin_diameter,
    thermal_conductivity,
    heat_transfer_coefficient,
    base_temperature_difference=1.0,
) -> ProfileFinResult:
    """Conical pin fin, diameter ``D x'/L`` (x' from the tip).

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L [m].
    pin_diameter : array_like
        Base diameter D [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].

    Returns
    -------
    ProfileFinResult
        heat_rate [W], efficiency [-], fin_surface_area ``(πD/2) sqrt(L² + (D/2)²)`` [m²],
        thermal_resistance [K W⁻¹], fin_parameter ``m = sqrt(4h/(kD))`` [m⁻¹].

    Notes
    -----
    ``η = 2 I2(2mL) / (mL I1(2mL))`` (scaled Bessel functions), referred to the slender area
    ``π D L / 2``; the heat rate uses the exact conical area as the textbook does (the two differ
    by O((D/L)²)). How it was confirmed: :func:`finkit.physics.fins.numeric.solve_fin` on
    ``A_c(x) ∝ (1 - x/L)²``, ``P(x) ∝ (1 - x/L)`` (tests).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    """
    from scipy import special  # here: scipy.special costs 0.1 s at import

    length = _positive("fin_length", fin_length, "m")
    d = _positive("pin_diameter", pin_diameter, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")
    m = np.sqrt(4.0 * h / (k * d))
    ml = m * length
    eta = 2.0 * special.ive(2, 2.0 * ml) / (ml * special.i1e(2.0 * ml))
    area = 0.5 * np.pi * d * np.sqrt(length * length + 0.25 * d * d)
    return _profile_result(eta, h, area, theta_b, m)


def pin_fin_concave_parabolic(
    fin_length,
    pin_diameter,
    thermal_conductivity,
    heat_transfer_coefficient,
    base_temperature_difference=1.0,
) -> ProfileFinResult:
    """Pin fin of concave parabolic profile, diameter ``D (x'/L)²`` (x' from the tip).

    Parameters
    ----------
    fin_length : array_like
        Base-to-tip length L [m].
    pin_diameter : array_like
        Base diameter D [m].
    thermal_conductivity : array_like
        Fin conductivity k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : array_like
        Uniform convective coefficient h [W m⁻² K⁻¹].
    base_temperature_difference : array_like, default 1.0
        θ_b [K].

    Returns
    -------
    ProfileFinResult
        heat_rate [W], efficiency [-], fin_surface_area [m²], thermal_resistance [K W⁻¹],
        fin_parameter ``m = sqrt(4h/(kD))`` [m⁻¹].

    Notes
    -----
    ``η = 2 / [sqrt((4/9)(mL)² + 1) + 1]``, referred to the slender area ``π D L / 3``;
    ``A_f = (π L³/(8D)) [C3 C4 - (L/(2D)) ln(2D C4/L + C3)]``, ``C3 = 1 + 2(D/L)²``,
    ``C4 = sqrt(1 + (D/L)²)`` (Incropera Table 3.5). How it was confirmed: the efficiency follows
    from the power-law solution ``θ/θ_b = (x'/L)^p``, ``p = [-3 + sqrt(9 + 4 (mL)²)]/2``; the
    area by quadrature of the surface of revolution (tests).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.5.
    """
    length = _positive("fin_length", fin_length, "m")
    d = _positive("pin_diameter", pin_diameter, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    theta_b = _finite("base_temperature_difference", base_temperature_difference, "K")
    m = np.sqrt(4.0 * h / (k * d))
    ml = m * length
    eta = 2.0 / (np.sqrt(4.0 / 9.0 * ml * ml + 1.0) + 1.0)
    ratio = d / length
    c3 = 1.0 + 2.0 * ratio * ratio
    c4 = np.sqrt(1.0 + ratio * ratio)
    area = (
        np.pi
        * length**3
        / (8.0 * d)
        * (c3 * c4 - length / (2.0 * d) * np.log(2.0 * d * c4 / length + c3))
    )
    return _profile_result(eta, h, area, theta_b, m)
