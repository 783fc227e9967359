"""The straight fin of uniform section: four tip conditions, efficiency and effectiveness."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError
from finkit.physics.fins.analytic.groups import (
    TIP_CONDITIONS,
    UniformFinResult,
    _check_tip,
    _finite,
    _positive,
    corrected_length,
    fin_parameter,
)

__all__ = [
    "infinite_fin_length",
    "uniform_fin",
    "uniform_fin_efficiency_corrected_length",
    "uniform_fin_temperature_difference",
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
