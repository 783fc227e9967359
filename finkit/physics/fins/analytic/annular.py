"""The annular fin of rectangular profile (modified Bessel functions)."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError
from finkit.physics.fins.analytic.groups import (
    ANNULAR_TIP_CONDITIONS,
    AnnularFinResult,
    _check_tip,
    _finite,
    _positive,
)

__all__ = [
    "annular_fin",
    "annular_fin_efficiency",
    "annular_fin_efficiency_schmidt",
]


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
