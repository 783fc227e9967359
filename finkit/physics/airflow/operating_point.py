"""The fan operating point against a system curve, vectorised over designs."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import InputError, SolverError
from finkit.physics.airflow.fans import (
    FanCurve,
    SystemPressureDrop,
)
from finkit.physics.airflow.roots import (
    bracketed_root,
)

__all__ = [
    "OperatingPoint",
    "operating_point",
    "power_law_pressure_drop",
]


# --------------------------------------------------------------------------------------
# Operating point
# --------------------------------------------------------------------------------------


class OperatingPoint(NamedTuple):
    """Where a fan curve crosses a system curve, for each design.

    Attributes
    ----------
    volume_flow : numpy.ndarray
        Volume flow through the fan [m³ s⁻¹]; NaN where there is no operating point.
    pressure_drop : numpy.ndarray
        Fan static pressure at that flow, equal to the system pressure drop [Pa].
    is_converged : numpy.ndarray of bool
        False where there is no operating point or the solver did not converge.
    is_in_stall_region : numpy.ndarray of bool
        True where the point lies on a positive-slope (stall) part of the fan curve.
    """

    volume_flow: np.ndarray
    pressure_drop: np.ndarray
    is_converged: np.ndarray
    is_in_stall_region: np.ndarray


def _fan_balance(fan: FanCurve, system_pressure_drop, density, maxiter):
    """Solve fan pressure = system pressure drop; returns (RootResult, density ratio)."""
    ratio = fan.density_ratio(density)

    def residual(q):
        return fan.pressure(q) * ratio - np.asarray(system_pressure_drop(q), dtype=float)

    bounds = fan._piece_boundaries
    values = [np.asarray(residual(np.float64(b)), dtype=float) for b in bounds]
    shape = np.broadcast_shapes(*(v.shape for v in values), np.shape(ratio))
    g = np.stack([np.broadcast_to(v, shape) for v in values])
    m = bounds.size - 1
    with np.errstate(invalid="ignore"):
        nonneg = g[:m] >= 0
    # the crossing at the highest flow: the last piece whose left end has fan >= system
    k = (m - 1) - np.argmax(nonneg[::-1], axis=0)
    has_left = np.any(nonneg, axis=0)
    g_free = g[m]
    at_free = g_free == 0
    k_idx = np.expand_dims(k, 0)
    lower = np.take(bounds, k)
    upper = np.take(bounds, k + 1)
    f_lower = np.take_along_axis(g, k_idx, axis=0)[0]
    f_upper = np.take_along_axis(g, k_idx + 1, axis=0)[0]
    # no operating point: nothing on the table with fan >= system, or the system would need
    # a negative pressure at free delivery
    possible = has_left & ~(g_free > 0)
    f_lower = np.where(possible, f_lower, np.nan)
    lower = np.where(at_free, fan.free_delivery, lower)
    f_lower = np.where(at_free, 0.0, f_lower)
    q_scale = fan.free_delivery
    result = bracketed_root(
        lambda q: np.broadcast_to(residual(q), shape),
        lower,
        upper,
        lower_value=f_lower,
        upper_value=f_upper,
        xatol=1e-13 * q_scale,
        xrtol=1e-12,
        maxiter=maxiter,
    )
    return result, ratio


def _failure_message(where: str, fan: FanCurve, converged) -> str:
    bad = ~np.asarray(converged, dtype=bool)
    first = np.argwhere(bad)[0] if bad.ndim else ()
    label = f" '{fan.name}'" if fan.name else ""
    return (
        f"{where}: the fan curve{label} (shut-off {fan.shut_off_pressure:.4g} Pa, free delivery "
        f"{fan.free_delivery:.4g} m³/s) gives no converged operating point for "
        f"{int(bad.sum())} of {bad.size} design(s) (first at index {tuple(int(i) for i in first)})"
        "; check that the system pressure drop at zero flow is below the shut-off pressure"
    )


def operating_point(
    fan: FanCurve,
    system_pressure_drop: SystemPressureDrop,
    density=None,
    *,
    raise_on_failure: bool = False,
    maxiter: int = 100,
) -> OperatingPoint:
    """Operating point of a fan against a system curve, for every design at once.

    Parameters
    ----------
    fan : FanCurve
        The fan (or combination of fans), rated at ``fan.rating_density`` [-].
    system_pressure_drop : callable
        ``dp(volume_flow) -> pressure_drop``: system pressure drop [Pa] at a volume flow
        [m³ s⁻¹], >= 0 and increasing with flow; ``volume_flow`` is passed as a scalar or as an
        array of the batch shape, and the shape of the result defines the batch of designs.
        It must be computed for the same air as the fan, at ``density``.
    density : float or array_like, optional
        Air density at the fan [kg m⁻³], broadcast with the batch; the fan pressure is scaled by
        ``density / fan.rating_density``. None: the rating density.
    raise_on_failure : bool, default False
        Raise :class:`~finkit.errors.SolverError` if any design has no converged operating
        point (use for a single design); otherwise such designs get NaN and a False flag [-].
    maxiter : int, default 100
        Iteration limit of the bracketed solver [-].

    Returns
    -------
    OperatingPoint
        ``volume_flow`` [m³ s⁻¹], ``pressure_drop`` [Pa], ``is_converged``,
        ``is_in_stall_region``, each of the batch shape (numpy scalars for a single design).

    Notes
    -----
    Solves ``dp_fan(Q) rho/rho_rating = dp_sys(Q)`` on ``0 <= Q <= Q_free`` (docs/methods.md h).
    The fan table is cut into monotone pieces at its local extrema; the residual is evaluated
    at the cuts and the root is bracketed in the piece with the highest-flow sign change from
    fan-above to fan-below system, so the stable crossing on the falling part of the curve is
    found when there are several. Within a falling piece the root is unique. Two crossings
    inside one rising piece, with neither end showing a sign change, are not detected.
    The root is found by :func:`bracketed_root` to ~1e-12 relative in flow.

    Examples
    --------
    >>> fan = FanCurve([0.0, 0.02], [60.0, 0.0])
    >>> point = operating_point(fan, lambda q: 1.0e5 * q**2)
    >>> round(float(point.volume_flow), 6), bool(point.is_converged)
    (0.013723, True)
    """
    result, ratio = _fan_balance(fan, system_pressure_drop, density, maxiter)
    q = np.asarray(result.x)
    if raise_on_failure and not np.all(result.is_converged):
        raise SolverError(_failure_message("operating_point", fan, result.is_converged))
    pressure = np.asarray(fan.pressure(q) * ratio)
    stall = np.asarray(fan.is_in_stall_region(q))
    return OperatingPoint(q[()], pressure[()], np.asarray(result.is_converged)[()], stall[()])


def power_law_pressure_drop(
    volume_flow, reference_volume_flow, reference_pressure_drop, exponent=2.0
):
    """Pressure drop of a component given by one rated point, ``dp = dp_ref (Q/Q_ref)^n``.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow [m³ s⁻¹], >= 0.
    reference_volume_flow : float or array_like
        Flow of the rated point [m³ s⁻¹], > 0.
    reference_pressure_drop : float or array_like
        Pressure drop at the rated point [Pa], >= 0.
    exponent : float or array_like, default 2
        Exponent ``n`` [-]: 2 for fully turbulent losses (grilles, filters at high flow),
        1 for laminar ones; heat sinks lie in between, typically 1.2-1.8.

    Returns
    -------
    numpy.ndarray or float
        Pressure drop [Pa], for use as an extra system loss (enclosure, filter, grille).

    Notes
    -----
    ``dp = K Q^n`` is the quick system model of docs/methods.md h (common practice, no source);
    the density of the rated point is assumed to be the operating one.
    """
    q = np.asarray(volume_flow, dtype=float)
    q_ref = np.asarray(reference_volume_flow, dtype=float)
    if np.any(~(q_ref > 0)):
        raise InputError(f"reference_volume_flow = {reference_volume_flow!r} m³/s; must be > 0")
    if np.any(~(np.asarray(reference_pressure_drop, dtype=float) >= 0)):
        raise InputError(f"reference_pressure_drop = {reference_pressure_drop!r} Pa; must be >= 0")
    n = np.asarray(exponent, dtype=float)
    if np.any(~(n > 0)):
        raise InputError(f"exponent = {exponent!r}; must be > 0")
    ratio = np.abs(q) / q_ref
    return (np.sign(q) * reference_pressure_drop * ratio**n)[()]
