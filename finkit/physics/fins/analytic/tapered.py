"""Tapered straight fins and pins: triangular, parabolic and conical profiles."""

from __future__ import annotations

import numpy as np

from finkit.physics.fins.analytic.groups import (
    ProfileFinResult,
    _finite,
    _positive,
)

__all__ = [
    "pin_fin_concave_parabolic",
    "pin_fin_conical",
    "straight_fin_concave_parabolic",
    "straight_fin_triangular",
]


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
