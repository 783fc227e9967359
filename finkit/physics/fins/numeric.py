"""The steady 1-D fin equation solved numerically (``scipy.integrate.solve_bvp``).

For what the closed forms of :mod:`finkit.physics.fins.analytic` cannot do: a cross-section that
varies
along the fin, a conductivity that depends on temperature, a heat transfer coefficient that
depends on the local excess temperature (natural convection), and radiation to surroundings.
One boundary-value problem per call (scalar inputs); the solver is not vectorised over fins.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import NamedTuple

import numpy as np
from scipy.integrate import solve_bvp

from finkit.constants import STEFAN_BOLTZMANN
from finkit.errors import InputError, SolverError

__all__ = ["NUMERIC_TIP_CONDITIONS", "NumericFinResult", "solve_fin"]

#: Tip conditions accepted by :func:`solve_fin`.
NUMERIC_TIP_CONDITIONS = ("convective", "adiabatic", "prescribed")

# Gauss-Legendre rule used on every mesh interval for the surface integrals.
_GAUSS_NODES, _GAUSS_WEIGHTS = np.polynomial.legendre.leggauss(5)
# Relative distance from a pointed tip (zero cross-section) where the domain is cut.
_POINTED_TIP_OFFSET = 1e-7


class NumericFinResult(NamedTuple):
    """Result of :func:`solve_fin`.

    Attributes
    ----------
    x : numpy.ndarray
        Mesh positions from the base (0) towards the tip [m].
    temperature : numpy.ndarray
        Fin temperature at ``x`` [K].
    heat_flow : numpy.ndarray
        Heat conducted along the fin towards the tip, ``-k A_c dT/dx``, at ``x`` [W].
    heat_rate : float
        Heat entering the fin at its base [W].
    convected_heat_rate : float
        Heat convected from the fin surface (tip face included for the convective tip) [W].
    radiated_heat_rate : float
        Net heat radiated from the fin surface (tip face included for the convective tip) [W].
    tip_conducted_heat_rate : float
        Heat conducted out through a prescribed-temperature tip (0 for the other tips) [W].
    efficiency : float
        (convected + radiated) / (A_f q''_s(T_b)): surface loss over the loss of a fin at the base
        temperature everywhere [-].
    fin_surface_area : float
        A_f = ∫ P dx, plus A_c(L) for the convective tip [m²].
    converged : bool
        True when ``solve_bvp`` reported success (status 0).
    message : str
        The solver's message.
    """

    x: np.ndarray
    temperature: np.ndarray
    heat_flow: np.ndarray
    heat_rate: float
    convected_heat_rate: float
    radiated_heat_rate: float
    tip_conducted_heat_rate: float
    efficiency: float
    fin_surface_area: float
    converged: bool
    message: str


def _scalar(name: str, value, unit: str, low: float, high: float = np.inf, open_low=False) -> float:
    arr = np.asarray(value, dtype=float)
    if arr.ndim != 0:
        raise InputError(
            f"{name} has shape {arr.shape}; solve_fin solves one fin per call, "
            f"give a number [{unit}]"
        )
    v = float(arr)
    ok = np.isfinite(v) and (v > low if open_low else v >= low) and v <= high
    if not ok:
        lo = f"> {low:g}" if open_low else f">= {low:g}"
        hi = "" if np.isinf(high) else f" and <= {high:g}"
        raise InputError(f"{name} = {v!r} is not allowed; it must be finite, {lo}{hi} [{unit}]")
    return v


def _as_function(name: str, value, unit: str, positive: bool = True) -> Callable:
    """Wrap a number or a callable into a vectorised callable returning float arrays."""
    if callable(value):

        def wrapped(arg, _f=value):
            return np.broadcast_to(np.asarray(_f(arg), dtype=float), np.shape(arg))

        return wrapped
    v = _scalar(name, value, unit, 0.0, open_low=positive)

    def constant(arg, _v=v):
        return np.full(np.shape(arg), _v)

    return constant


def solve_fin(
    fin_length,
    perimeter,
    cross_section_area,
    thermal_conductivity,
    base_temperature,
    ambient_temperature,
    heat_transfer_coefficient=0.0,
    emissivity=0.0,
    surroundings_temperature=None,
    view_factor=1.0,
    tip: str = "convective",
    tip_temperature=None,
    tolerance: float = 1e-6,
    max_nodes: int = 20_000,
    raise_on_failure: bool = True,
) -> NumericFinResult:
    """Solve the steady 1-D fin equation with variable section, k(T), h(θ) and radiation.

    Parameters
    ----------
    fin_length : float
        Base-to-tip length L [m].
    perimeter : float or callable
        Perimeter P [m], or a vectorised function ``P(x)`` of the distance from the base x [m].
    cross_section_area : float or callable
        Cross-section area A_c [m²], or a vectorised function ``A_c(x)``. ``A_c(0)`` must be > 0;
        if ``A_c(L) <= 0`` (pointed tip) the domain ends at ``L (1 - 1e-7)``, which changes the
        efficiency of a triangular fin by about 2e-8 relative [m²].
    thermal_conductivity : float or callable
        Fin conductivity k [W m⁻¹ K⁻¹], or a vectorised function ``k(T)`` of the absolute
        temperature T [K].
    base_temperature : float
        Fin base temperature T_b (absolute) [K].
    ambient_temperature : float
        Air temperature T∞ (absolute) [K].
    heat_transfer_coefficient : float or callable, default 0.0
        Convective coefficient h [W m⁻² K⁻¹], or a vectorised function ``h(θ)`` of the local
        excess temperature ``θ = T - T∞`` [K]. A callable must accept any sign of θ during the
        iterations, e.g. ``lambda th: c * np.abs(th) ** 0.25`` [W m⁻² K⁻¹].
    emissivity : float, default 0.0
        Grey-body total hemispherical emissivity of the fin surface, 0…1 [-].
    surroundings_temperature : float, optional
        Radiating surroundings temperature T_sur (absolute); defaults to ``ambient_temperature``
        [K].
    view_factor : float, default 1.0
        View factor F from the fin surface to the surroundings, 0…1 [-].
    tip : {"convective", "adiabatic", "prescribed"}, default "convective"
        "convective": the tip face of area ``A_c(L)`` convects and radiates like the sides;
        "adiabatic": no heat through the tip; "prescribed": ``T(L) = tip_temperature`` [-].
    tip_temperature : float, optional
        Absolute tip temperature for ``tip="prescribed"`` [K].
    tolerance : float, default 1e-6
        ``tol`` of ``solve_bvp`` on the scaled problem (relative collocation residual); the heat
        rates are then typically accurate to 1e-9 relative for smooth problems [-].
    max_nodes : int, default 20000
        Largest mesh ``solve_bvp`` may build [-].
    raise_on_failure : bool, default True
        Raise :class:`SolverError` if the solver fails; with False return ``converged=False`` [-].

    Returns
    -------
    NumericFinResult
        Profile (x [m], temperature [K], heat_flow [W]), base heat rate, convected, radiated and
        tip-conducted heat [W], efficiency [-], fin surface area [m²], converged flag, message.

    Raises
    ------
    InputError
        For non-scalar or out-of-range input, or a missing tip temperature.
    SolverError
        If ``solve_bvp`` does not converge (also after a continuation in the emissivity).

    Notes
    -----
    Governing equation, x from the base (finkit methods d):

    .. math::
        \\frac{d}{dx}\\left[k(T) A_c(x) \\frac{dT}{dx}\\right] = P(x)\\, q''_s(T),\\qquad
        q''_s = h(\\theta)\\,\\theta + \\varepsilon \\sigma F (T^4 - T_{sur}^4)

    solved as the first-order system ``T' = -q/(k A_c)``, ``q' = -P q''_s`` (q is the heat flowing
    towards the tip) on ``ξ = x/L`` with ``θ`` scaled by ``T_b - T∞`` and q by
    ``k(T_b) A_c(0) (T_b - T∞)/L``. The initial guess is the constant-property adiabatic-tip fin
    with h linearised at the base. If the first attempt fails and radiation is present, the
    emissivity is ramped up in steps, each solution seeding the next (continuation).

    Surface heat losses are integrated independently of the base heat rate, with a 5-point
    Gauss-Legendre rule on each mesh interval of the solver's C¹ interpolant, so the energy
    balance ``heat_rate = convected + radiated + tip_conducted`` is a check of the solution.
    Efficiency: surface loss over ``A_f q''_s(T_b)``, which reduces to Incropera's definition for
    constant h and no radiation.

    References
    ----------
    .. [1] Kierzenka, J., Shampine, L.F., "A BVP solver based on residual control and the MATLAB
       PSE", ACM Trans. Math. Softw. 27(3), 299-316, 2001 (the algorithm of ``solve_bvp``).
    .. [2] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, section 3.6.
    """
    # Long by design: the fin BVP in order (checks, right-hand side and boundary conditions, initial
    # guess, solve, surface integrals, result); the closures share the problem's arrays.
    if not isinstance(tip, str) or tip not in NUMERIC_TIP_CONDITIONS:
        raise InputError(
            f"tip = {tip!r} is not allowed; use one of: {', '.join(NUMERIC_TIP_CONDITIONS)}"
        )
    length = _scalar("fin_length", fin_length, "m", 0.0, open_low=True)
    t_b = _scalar("base_temperature", base_temperature, "K", 0.0, open_low=True)
    t_inf = _scalar("ambient_temperature", ambient_temperature, "K", 0.0, open_low=True)
    eps = _scalar("emissivity", emissivity, "-", 0.0, 1.0)
    view = _scalar("view_factor", view_factor, "-", 0.0, 1.0)
    t_sur = (
        t_inf
        if surroundings_temperature is None
        else _scalar("surroundings_temperature", surroundings_temperature, "K", 0.0, open_low=True)
    )
    tol = _scalar("tolerance", tolerance, "-", 0.0, 1.0, open_low=True)
    if tip == "prescribed":
        if tip_temperature is None:
            raise InputError("tip_temperature is missing; tip='prescribed' needs it [K]")
        t_tip = _scalar("tip_temperature", tip_temperature, "K", 0.0, open_low=True)

    perim = _as_function("perimeter", perimeter, "m")
    area = _as_function("cross_section_area", cross_section_area, "m²")
    cond = _as_function("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    if callable(heat_transfer_coefficient):
        h_of = _as_function("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    else:
        h_value = _scalar("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹", 0.0)

        def h_of(th, _v=h_value):
            return np.full(np.shape(th), _v)

    a_base = float(area(np.array(0.0)))
    p_base = float(perim(np.array(0.0)))
    k_base = float(cond(np.array(t_b)))
    for name, v, unit in (
        ("cross_section_area at the base", a_base, "m²"),
        ("perimeter at the base", p_base, "m"),
        ("thermal_conductivity at the base temperature", k_base, "W m⁻¹ K⁻¹"),
    ):
        if not (np.isfinite(v) and v > 0.0):
            raise InputError(f"{name} = {v!r} is not allowed; it must be finite and > 0 [{unit}]")

    xi_end = 1.0
    if float(area(np.array(length))) <= 0.0:
        xi_end = 1.0 - _POINTED_TIP_OFFSET

    theta_scale = t_b - t_inf if abs(t_b - t_inf) > 1e-9 else 1.0
    theta_base_hat = (t_b - t_inf) / theta_scale
    q_scale = k_base * a_base * theta_scale / length  # [W]
    sigma_f = STEFAN_BOLTZMANN * view

    def surface_flux(temp, emissivity_now):
        th = temp - t_inf
        return h_of(th) * th + emissivity_now * sigma_f * (temp**4 - t_sur**4)

    def make_problem(emissivity_now):
        def rhs(xi, y):
            x = xi * length
            temp = t_inf + theta_scale * y[0]
            d_theta = -y[1] * (k_base * a_base) / (cond(temp) * area(x))
            d_q = (
                -(length**2)
                / (k_base * a_base * theta_scale)
                * perim(x)
                * surface_flux(temp, emissivity_now)
            )
            return np.vstack((d_theta, d_q))

        def bc(ya, yb):
            first = ya[0] - theta_base_hat
            if tip == "adiabatic":
                second = yb[1]
            elif tip == "prescribed":
                second = yb[0] - (t_tip - t_inf) / theta_scale
            else:
                temp_l = t_inf + theta_scale * yb[0]
                a_tip = max(float(area(np.array(xi_end * length))), 0.0)
                flux = float(surface_flux(np.array(temp_l), emissivity_now))
                second = yb[1] - a_tip * flux / q_scale
            return np.array([first, second])

        return rhs, bc

    # Initial guess: constant-property adiabatic fin with h linearised at the base.
    flux_base = float(surface_flux(np.array(t_b), eps))
    h_lin = abs(flux_base / (t_b - t_inf)) if abs(t_b - t_inf) > 1e-9 else 1.0
    ml = min(np.sqrt(max(h_lin, 1e-12) * p_base / (k_base * a_base)) * length, 50.0)
    xi = np.linspace(0.0, xi_end, 41)
    shape = np.cosh(ml * (1.0 - xi)) / np.cosh(ml)
    dshape = -ml * np.sinh(ml * (1.0 - xi)) / np.cosh(ml)
    guess_theta = theta_base_hat * shape
    guess_q = -theta_base_hat * dshape
    if tip == "prescribed":
        end = (t_tip - t_inf) / theta_scale
        guess_theta = guess_theta + xi * (end - guess_theta[-1])
        guess_q = guess_q - (end - theta_base_hat * shape[-1])
    y_guess = np.vstack((guess_theta, guess_q))

    rhs, bc = make_problem(eps)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        sol = solve_bvp(rhs, bc, xi, y_guess, tol=tol, max_nodes=max_nodes)
    if sol.status != 0 and eps > 0.0:
        # continuation: ramp the emissivity from zero, each solution seeding the next
        mesh, y_now = xi, y_guess
        for fraction in (0.0, 0.25, 0.5, 0.75, 1.0):
            rhs, bc = make_problem(eps * fraction)
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                sol = solve_bvp(rhs, bc, mesh, y_now, tol=tol, max_nodes=max_nodes)
            if sol.status != 0:
                break
            mesh, y_now = sol.x, sol.y
    converged = sol.status == 0
    if not converged and raise_on_failure:
        raise SolverError(
            f"solve_fin: scipy solve_bvp did not converge (status {sol.status}: "
            f"{sol.message.strip()}); try a looser tolerance or a shorter fin"
        )

    # Surface integrals with Gauss-Legendre on each mesh interval.
    lo, hi = sol.x[:-1], sol.x[1:]
    half = 0.5 * (hi - lo)
    mid = 0.5 * (hi + lo)
    xi_q = (mid[:, None] + half[:, None] * _GAUSS_NODES[None, :]).ravel()
    w_q = (half[:, None] * _GAUSS_WEIGHTS[None, :]).ravel() * length
    temp_q = t_inf + theta_scale * sol.sol(xi_q)[0]
    p_q = perim(xi_q * length)
    th_q = temp_q - t_inf
    convected = float(np.sum(w_q * p_q * h_of(th_q) * th_q))
    radiated = float(np.sum(w_q * p_q * eps * sigma_f * (temp_q**4 - t_sur**4)))
    surface_area = float(np.sum(w_q * p_q))

    temperature = t_inf + theta_scale * sol.y[0]
    heat_flow = q_scale * sol.y[1]
    tip_conducted = 0.0
    if tip == "convective":
        a_tip = max(float(area(np.array(xi_end * length))), 0.0)
        th_l = temperature[-1] - t_inf
        convected += a_tip * float(h_of(np.array(th_l))) * th_l
        radiated += a_tip * eps * sigma_f * (temperature[-1] ** 4 - t_sur**4)
        surface_area += a_tip
    elif tip == "prescribed":
        tip_conducted = float(heat_flow[-1])

    ideal = surface_area * float(surface_flux(np.array(t_b), eps))
    efficiency = (convected + radiated) / ideal if ideal != 0.0 else float("nan")
    return NumericFinResult(
        x=sol.x * length,
        temperature=temperature,
        heat_flow=heat_flow,
        heat_rate=float(heat_flow[0]),
        convected_heat_rate=convected,
        radiated_heat_rate=float(radiated),
        tip_conducted_heat_rate=tip_conducted,
        efficiency=float(efficiency),
        fin_surface_area=surface_area,
        converged=bool(converged),
        message=str(sol.message),
    )
