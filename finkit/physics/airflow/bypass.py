"""Flow bypass: the split of the flow between the fin channels and the gaps around the sink."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import InputError, SolverError
from finkit.physics.airflow.fans import (
    _SHORT_DUCT_COEFFICIENT,
    FanCurve,
    SystemPressureDrop,
)
from finkit.physics.airflow.operating_point import (
    _failure_message,
    _fan_balance,
)
from finkit.physics.airflow.roots import (
    bracketed_root,
)

__all__ = [
    "BypassOperatingPoint",
    "BypassSplit",
    "bypass_gap_pressure_drop",
    "operating_point_with_bypass",
    "parallel_pressure_drop",
    "split_among_branches",
    "split_bypass",
    "split_bypass_at_approach_velocity",
]


# --------------------------------------------------------------------------------------
# Flow bypass
# --------------------------------------------------------------------------------------


def _pow16(x):
    x = x * x
    x = x * x
    x = x * x
    return x * x


def _churchill_turbulent_fanning(reynolds):
    """Transition-and-turbulent term of Churchill's (1977) smooth-duct equation (Fanning) [-].

    Churchill: ``f = [(16/Re)^12 + f_t^12]^(1/12)`` with ``f_t = 2 (A + B)^(-1/8)``,
    ``A = [2.457 ln((Re/7)^0.9)]^16``, ``B = (37530/Re)^16``; ``f_t`` vanishes in laminar flow.
    """
    a = _pow16(2.457 * 0.9 * np.log(reynolds / 7.0))
    b = _pow16(37530.0 / reynolds)
    return 2.0 / np.sqrt(np.sqrt(np.sqrt(a + b)))


def bypass_gap_pressure_drop(
    volume_flow,
    gap_area,
    gap_hydraulic_diameter,
    gap_length,
    density,
    dynamic_viscosity,
    loss_coefficient=1.0,
    friction_reynolds_product=24.0,
):
    """Static pressure drop of the clearance gaps that let air go round a heat sink.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow through the gaps [m³ s⁻¹].
    gap_area : float or array_like
        Total flow area of the gaps [m²], >= 0; 0 means no bypass (closed branch).
    gap_hydraulic_diameter : float or array_like
        Hydraulic diameter of the gaps, ``4 A / P`` [m]; about twice the gap width for a slot.
    gap_length : float or array_like
        Length of the gaps along the flow (the sink length) [m], >= 0.
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].
    loss_coefficient : float or array_like, default 1.0
        Sum of the entrance and exit loss coefficients of the gaps, on the gap velocity
        head [-]. 1.0 is one velocity head lost at the exit (sudden expansion into a much
        larger space, Borda-Carnot); a sharp entrance adds about 0.5.
    friction_reynolds_product : float or array_like, default 24.0
        Fully developed laminar ``f Re_Dh`` (Fanning) of the gap cross-section [-]: 24 for
        parallel plates (a slot much wider than high); use the Shah & London rectangular-duct
        value for a square-ish gap (14.23 for a square).

    Returns
    -------
    numpy.ndarray or float
        Pressure drop [Pa]; odd in the flow. A closed branch (``gap_area = 0``) gives 0 at
        zero flow and ``inf`` otherwise.

    Notes
    -----
    With gap velocity ``V = Q/A``, ``Re = rho V D_h / mu`` and ``L* = L / (D_h Re)``::

        dp    = [K + 4 f L / D_h] rho V² / 2                   (Fanning f; docs/methods.md e5)
        f     = [f_lam^12 + f_turb^12]^(1/12)                   (Churchill's blend)
        f_lam = sqrt((3.44 / sqrt(L*))² + (f Re)_fd²) / Re     (developing laminar, e3)
        f_turb = 2 (A + B)^(-1/8),  A = [2.457 ln((Re/7)^0.9)]^16,  B = (37530/Re)^16

    * Laminar: composite of the short-duct asymptote ``3.44/sqrt(L*)`` and the fully
      developed value (24 for parallel plates), Muzychka & Yovanovich (2009). The
      coefficient 3.44 (tagged [R] in docs/methods.md) was confirmed as the leading term of Shah's
      (1978) entry-length correlation, which independent implementations quote with the
      parallel-plate constants ``K(∞) = 0.674, C = 2.9e-5``; the tests compare the composite
      with that correlation (within 8 %).
    * Transition and turbulent: Churchill's (1977) smooth-duct equation on the hydraulic
      diameter, with its laminar term ``16/Re`` replaced by the gap's ``f_lam`` above. For a
      long circular duct (``f Re = 16``) this is Churchill's equation itself and matches
      ``fluids.friction.Churchill_1977`` / 4 (tested); for parallel plates, circular-duct
      turbulent friction on ``D_h`` is within about ±10 % (common practice, no source). The
      blend is continuous and rises with flow, which the flow-split solver needs; its
      exponent 12 is Churchill's. Roughness is not included (smooth gap walls).
    * ``K rho V²/2`` with ``K = 1`` is one velocity head, ``fluids.fittings.exit_normal``
      (tested with ``fluids.core.dP_from_K``).

    References
    ----------
    .. [1] Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic Press,
       1978 (``f Re = 24`` for parallel plates; short-duct coefficient 3.44).
    .. [2] Muzychka, Y.S., Yovanovich, M.M., "Pressure drop in laminar developing flow in
       noncircular ducts: a scaling and modeling approach", J. Fluids Eng. 131(11), 111105,
       2009. doi:10.1115/1.4000377
    .. [3] Churchill, S.W., "Friction-factor equation spans all fluid-flow regimes",
       Chemical Engineering 84(24), 91-92, 1977.
    .. [4] Churchill, S.W., Usagi, R., "A general expression for the correlation of rates of
       transfer and other phenomena", AIChE J. 18(6), 1121-1128, 1972.
       doi:10.1002/aic.690180606
    .. [5] Lee, S., "Optimum design and selection of heat sinks", IEEE Trans. Comp., Pack.,
       Manuf. Technol. A 18(4), 812-817, 1995 (bypass as a parallel flow branch).
    """
    q = np.asarray(volume_flow, dtype=float)
    area = np.asarray(gap_area, dtype=float)
    diameter = np.asarray(gap_hydraulic_diameter, dtype=float)
    length = np.asarray(gap_length, dtype=float)
    rho = np.asarray(density, dtype=float)
    mu = np.asarray(dynamic_viscosity, dtype=float)
    k = np.asarray(loss_coefficient, dtype=float)
    f_re = np.asarray(friction_reynolds_product, dtype=float)
    if np.any(~(area >= 0)):
        raise InputError(f"gap_area = {gap_area!r} m²; must be >= 0")
    if np.any((area > 0) & ~(diameter > 0)):
        raise InputError(
            f"gap_hydraulic_diameter = {gap_hydraulic_diameter!r} m; must be > 0 where gap_area > 0"
        )
    if np.any(~(length >= 0)):
        raise InputError(f"gap_length = {gap_length!r} m; must be >= 0")
    if np.any(~(rho > 0)):
        raise InputError(f"density = {density!r} kg/m³; must be > 0")
    if np.any(~(mu > 0)):
        raise InputError(f"dynamic_viscosity = {dynamic_viscosity!r} Pa s; must be > 0")
    if np.any(~(k >= 0)):
        raise InputError(f"loss_coefficient = {loss_coefficient!r}; must be >= 0")
    if np.any(~(f_re > 0)):
        raise InputError(f"friction_reynolds_product = {friction_reynolds_product!r}; must be > 0")
    is_open = area > 0
    a = np.where(is_open, area, 1.0)
    d = np.where(is_open, diameter, 1.0)
    speed = np.abs(q) / a
    reynolds = rho * speed * d / mu
    head = 0.5 * rho * speed**2
    has_length = length > 0
    l_safe = np.where(has_length, length, 1.0)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        # laminar, written without dividing by Re so that it is finite at zero flow:
        # 4 f_app (L/D) rho V²/2 = 2 mu L V / D² sqrt(3.44² D Re / L + (f Re)²)
        laminar = (
            2.0
            * mu
            * length
            * speed
            / d**2
            * np.sqrt(_SHORT_DUCT_COEFFICIENT**2 * d * reynolds / l_safe + f_re**2)
        )
        turbulent = (
            4.0 * _churchill_turbulent_fanning(np.maximum(reynolds, 1.0)) * length / d * head
        )
        # Churchill's blend, [lam^12 + turb^12]^(1/12), scaled by the larger term (no overflow)
        big = np.maximum(laminar, turbulent)
        scale = np.where(big > 0, big, 1.0)
        lam, turb = laminar / scale, turbulent / scale
        lam4, turb4 = (lam * lam) ** 2, (turb * turb) ** 2
        blend = big * np.cbrt(np.sqrt(np.sqrt(lam4 * lam4 * lam4 + turb4 * turb4 * turb4)))
        friction = np.where(has_length, blend, 0.0)
        dp = np.sign(q) * (k * head + friction)
        dp = np.where(is_open, dp, np.where(q == 0, 0.0, np.sign(q) * np.inf))
    return dp[()]


class BypassSplit(NamedTuple):
    """How a total flow divides between the fins and the bypass gaps.

    Attributes
    ----------
    sink_volume_flow : numpy.ndarray
        Flow through the finned region [m³ s⁻¹].
    bypass_volume_flow : numpy.ndarray
        Flow round the fins, through the gaps [m³ s⁻¹].
    pressure_drop : numpy.ndarray
        Common static pressure drop of both branches [Pa].
    is_converged : numpy.ndarray of bool
        False where the split could not be solved (NaN results).
    """

    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    pressure_drop: np.ndarray
    is_converged: np.ndarray


def split_bypass(
    total_volume_flow,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
    *,
    maxiter: int = 100,
) -> BypassSplit:
    """Split a total flow between the heat sink and its bypass at equal pressure drop.

    Parameters
    ----------
    total_volume_flow : float or array_like
        Flow approaching the sink and its gaps [m³ s⁻¹], >= 0.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa], increasing, called with arrays of the
        batch shape.
    bypass_pressure_drop : callable
        ``dp(volume_flow)`` of the bypass gaps [Pa], increasing, e.g. a closure over
        :func:`bypass_gap_pressure_drop`. ``inf`` at positive flow means a closed branch.
    maxiter : int, default 100
        Iteration limit [-].

    Returns
    -------
    BypassSplit
        ``sink_volume_flow``, ``bypass_volume_flow`` [m³ s⁻¹], ``pressure_drop`` [Pa] and
        ``is_converged``, of the batch shape.

    Notes
    -----
    Two parallel branches between the same upstream and downstream static pressures
    (docs/methods.md h)::

        Q_tot = Q_hs + Q_by,    dp_hs(Q_hs) = dp_by(Q_by)

    solved for the sink fraction ``x = Q_hs / Q_tot`` in [0, 1] with :func:`bracketed_root`
    (the residual ``dp_hs(x Q) - dp_by((1 - x) Q)`` rises with ``x``). If a branch needs more
    pressure at zero flow than the other at the full flow, all the flow takes the other
    branch. The balance ignores mixing and momentum exchange where the streams rejoin;
    expect ±10-20 % on ``Q_hs`` (docs/methods.md h, CP).

    References
    ----------
    .. [1] Radmehr, A., Kelkar, K.M., Kelly, P., Patankar, S.V., Kang, S.S., "Analysis of the
       effect of bypass on the performance of heat sinks using flow network modeling",
       Proc. 15th IEEE SEMI-THERM Symposium, 42-47, 1999.
    .. [2] Jonsson, H., Moshfegh, B., "Modeling of the thermal and hydraulic performance of
       plate fin, strip fin, and pin fin heat sinks -- influence of flow bypass", IEEE Trans.
       Comp. Packag. Technol. 24(2), 142-149, 2001.
    """
    q_total = np.asarray(total_volume_flow, dtype=float)
    if np.any(q_total < 0):
        raise InputError(f"total_volume_flow = {total_volume_flow!r} m³/s; must be >= 0")
    zero = np.zeros_like(q_total)
    with np.errstate(invalid="ignore"):
        r0 = np.asarray(sink_pressure_drop(zero), float) - np.asarray(
            bypass_pressure_drop(q_total), float
        )
        r1 = np.asarray(sink_pressure_drop(q_total), float) - np.asarray(
            bypass_pressure_drop(zero), float
        )
    shape = np.broadcast_shapes(q_total.shape, r0.shape, r1.shape)
    q = np.broadcast_to(q_total, shape)
    r0, r1 = np.broadcast_to(r0, shape), np.broadcast_to(r1, shape)
    # one branch takes everything: threshold or closed branches (an inf residual)
    all_bypass = (r0 >= 0) | np.isposinf(r1)
    all_sink = ((r1 <= 0) | np.isneginf(r0)) & ~all_bypass
    lower_value = np.where(all_bypass, 0.0, np.where(all_sink, -1.0, r0))
    upper_value = np.where(all_sink, 0.0, np.where(all_bypass, 1.0, r1))
    lower = np.where(all_sink, 1.0, 0.0)
    upper = np.where(all_bypass, 0.0, 1.0)

    def residual(x):
        with np.errstate(invalid="ignore"):
            return np.asarray(sink_pressure_drop(x * q), float) - np.asarray(
                bypass_pressure_drop((1.0 - x) * q), float
            )

    root = bracketed_root(
        residual,
        lower,
        upper,
        lower_value=lower_value,
        upper_value=upper_value,
        xatol=1e-10,
        xrtol=0.0,
        maxiter=maxiter,
    )
    fraction = np.asarray(root.x)
    q_sink = fraction * q
    q_bypass = q - q_sink
    dp_sink = np.asarray(sink_pressure_drop(q_sink), float)
    dp_bypass = np.asarray(bypass_pressure_drop(q_bypass), float)
    pressure = np.where(fraction > 0, dp_sink, dp_bypass)
    pressure = np.broadcast_to(pressure, shape)
    return BypassSplit(
        q_sink[()], q_bypass[()], np.array(pressure)[()], np.asarray(root.is_converged)[()]
    )


def parallel_pressure_drop(branches) -> SystemPressureDrop:
    """``dp(q)`` of several parallel branches carrying a total flow q between them [Pa].

    Parameters
    ----------
    branches : callable or sequence of callable
        ``dp(volume_flow)`` of each branch (e.g. the side gaps and the top gap of a bypass)
        [Pa].

    Returns
    -------
    callable
        The branch itself for one branch; otherwise a function that splits q at equal pressure
        drop with :func:`split_bypass` (the first branch against the rest, recursively) and
        returns the common pressure drop.
    """
    if callable(branches):
        return branches
    branches = tuple(branches)
    if len(branches) == 1:
        return branches[0]
    first, rest = branches[0], parallel_pressure_drop(branches[1:])

    def dp(q):
        return split_bypass(q, first, rest).pressure_drop

    return dp


def split_among_branches(
    total_volume_flow,
    sink_pressure_drop: SystemPressureDrop,
    bypass_branches,
    *,
    maxiter: int = 100,
) -> BypassSplit:
    """:func:`split_bypass` with the bypass as several parallel branches (side and top gaps).

    The same balance, ``Q_tot = Q_hs + sum Q_k`` at one pressure drop for the fins and every
    branch, solved for all flows at once by a damped Newton iteration (:func:`_split_newton`)
    instead of the nested split of :func:`parallel_pressure_drop`, which solves the branches'
    own split inside every step of the outer one (ten to a hundred times more pressure-drop
    evaluations). Any design where Newton does not meet its tolerance is solved by the nested
    bracketed method, which stays the reference; one branch is :func:`split_bypass` itself.

    Parameters
    ----------
    total_volume_flow : float or array_like
        Flow approaching the sink and its gaps [m³ s⁻¹], >= 0.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa].
    bypass_branches : callable or sequence of callable
        ``dp(volume_flow)`` of each bypass branch [Pa].
    maxiter : int, default 100
        Iteration limit of the nested method [-].

    Returns
    -------
    BypassSplit
        As :func:`split_bypass`; ``bypass_volume_flow`` is the sum over the branches.
    """
    branches = (bypass_branches,) if callable(bypass_branches) else tuple(bypass_branches)
    if len(branches) == 1:
        return split_bypass(total_volume_flow, sink_pressure_drop, branches[0], maxiter=maxiter)
    q_total = np.asarray(total_volume_flow, dtype=float)
    if np.any(q_total < 0):
        raise InputError(f"total_volume_flow = {total_volume_flow!r} m³/s; must be >= 0")
    a, b, ok = _split_newton(q_total, sink_pressure_drop, branches)
    if np.all(ok):
        dp = np.asarray(sink_pressure_drop(a), float)
        return BypassSplit(a[()], b[()], np.array(dp)[()], np.ones(np.shape(a), bool)[()])
    nested = split_bypass(
        q_total, sink_pressure_drop, parallel_pressure_drop(branches), maxiter=maxiter
    )
    shape = np.broadcast_shapes(np.shape(a), np.shape(nested.sink_volume_flow))
    a, b, ok = (np.broadcast_to(v, shape) for v in (a, b, ok))
    dp_newton = np.asarray(sink_pressure_drop(a), float)
    return BypassSplit(
        np.where(ok, a, nested.sink_volume_flow)[()],
        np.where(ok, b, nested.bypass_volume_flow)[()],
        np.where(ok, dp_newton, nested.pressure_drop)[()],
        (ok | np.asarray(nested.is_converged))[()],
    )


def _split_newton(q_total, dp_sink, branches, maxiter=40):
    """Damped Newton on the sink flow a and the branch flows b_k at a given total flow Q.

    Residuals: ``r_k = dp_sink(a) - dp_k(b_k)`` for each branch and ``r_Q = a + sum b - Q``.
    The Jacobian is an arrow matrix, eliminated in closed form (slopes by forward differences):
    ``da = -(r_Q + sum r_k/s_k) / (1 + s_a sum 1/s_k)``, ``db_k = (r_k + s_a da)/s_k``. A
    branch closed for a design (infinite pressure drop at a small flow) carries no flow there.
    Returns ``(a, b_total, converged)`` of the batch shape; converged where every residual is
    below 1e-9 of the sink's pressure drop at the whole flow and the last step below 1e-10 Q.
    """
    shape = np.broadcast_shapes(
        np.shape(q_total), np.shape(np.asarray(dp_sink(np.asarray(q_total, float)), float))
    )
    q = np.array(np.broadcast_to(q_total, shape), float)
    positive = q > 0
    q_safe = np.where(positive, q, 1.0)
    step = 1e-7 * q_safe
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        dp_scale = np.abs(np.asarray(dp_sink(q_safe), float))
        probe = 1e-6 * q_safe
        is_open = [
            np.isfinite(np.asarray(f(probe), float)) & np.ones(shape, bool) for f in branches
        ]
    count = max(sum(1 for o in is_open), 1)
    a = 0.6 * q_safe
    b = [np.where(o, 0.4 * q_safe / count, 0.0) for o in is_open]
    converged = np.zeros(shape, bool)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):

        def residuals(a, b):
            fa = np.asarray(dp_sink(a), float)
            fb = [
                np.where(o, np.asarray(f(x), float), fa)
                for f, x, o in zip(branches, b, is_open, strict=True)
            ]
            return fa, fb, [fa - y for y in fb]

        fa, fb, r = residuals(a, b)
        for _ in range(maxiter):
            r_q = a + sum(b) - q_safe
            sa = (np.asarray(dp_sink(a + step), float) - fa) / step
            inv = [
                np.where(o, step / (np.asarray(f(x + step), float) - y), 0.0)
                for f, x, y, o in zip(branches, b, fb, is_open, strict=True)
            ]
            sum_r = sum(np.where(o, rk * i, 0.0) for rk, i, o in zip(r, inv, is_open, strict=True))
            da = -(r_q + sum_r) / (1.0 + sa * sum(inv))
            db = [
                np.where(o, (rk + sa * da) * i, 0.0)
                for rk, i, o in zip(r, inv, is_open, strict=True)
            ]
            # damping: 0 < a, 0 <= b_k, then back onto a + sum b = Q
            new_a = np.clip(a + da, 1e-3 * a, None)
            new_b = [np.clip(x + d, 0.0, None) for x, d in zip(b, db, strict=True)]
            scale = q_safe / (new_a + sum(new_b))
            new_a, new_b = new_a * scale, [x * scale for x in new_b]
            moved = np.abs(new_a - a)
            for x, y in zip(new_b, b, strict=True):
                moved = np.maximum(moved, np.abs(x - y))
            a, b = new_a, new_b
            fa, fb, r = residuals(a, b)
            ok = moved <= 1e-10 * q_safe
            for rk in r:
                ok &= np.abs(rk) <= 1e-9 * dp_scale
            converged = ok & np.isfinite(sum(r))
            if np.all(converged | ~np.isfinite(sum(r))):
                break
    zero = ~positive
    a = np.where(zero, 0.0, a)
    b_total = np.where(zero, 0.0, sum(b))
    return a, b_total, converged | zero


def _bypass_newton(fan, pressure_ratio, dp_sink, dp_bypass, extra, maxiter=40):
    """Damped Newton on the sink flow a and the bypass branch flows b_k for a fan with bypass.

    Residuals: ``r_k = dp_sink(a) - dp_k(b_k)`` for each bypass branch and ``r_f = fan(a + sum
    b) - dp_sink(a) - extra(a + sum b)`` (fan scaled by ``pressure_ratio``). The Jacobian is an
    arrow matrix, eliminated in closed form: ``da = -(r_f + s_q sum r_k/s_k) / (s_q - s_a +
    s_q s_a sum 1/s_k)``, ``db_k = (r_k + s_a da)/s_k``. A branch that is closed for a design
    (infinite pressure drop at a small flow) carries no flow there and has no equation.
    Returns ``(a, b_total, converged)``; elements that leave the feasible box or do not meet the
    tolerance are flagged unconverged.
    """
    branches = (dp_bypass,) if callable(dp_bypass) else tuple(dp_bypass)
    q_free = fan.free_delivery
    q_max = q_free * (1.0 - 1e-9)
    step = 1e-7 * q_free
    dp_scale = fan.shut_off_pressure * float(np.max(pressure_ratio))

    def fan_side(q):
        value = fan.pressure(q) * pressure_ratio
        if extra is not None:
            value = value - np.asarray(extra(q), float)
        return value

    shape = np.shape(np.asarray(dp_sink(np.float64(0.5 * q_free)), float) * pressure_ratio)
    with np.errstate(invalid="ignore", over="ignore"):
        probe = np.full(shape, 1e-6 * q_free)
        is_open = [
            np.isfinite(np.asarray(f(probe), float)) & np.ones(shape, bool) for f in branches
        ]
    count = max(len(branches), 1)
    a = np.full(shape, 0.6 * q_free)
    b = [np.where(o, 0.1 * q_free / count, 0.0) for o in is_open]

    def residuals(a, b):
        fa = np.asarray(dp_sink(a), float)
        fb = [
            np.where(o, np.asarray(f(x), float), fa)
            for f, x, o in zip(branches, b, is_open, strict=True)
        ]
        return fa, fb, [fa - x for x in fb], fan_side(a + sum(b)) - fa

    converged = np.zeros(shape, bool)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        fa, fb, r, r_fan = residuals(a, b)
        for _ in range(maxiter):
            q = a + sum(b)
            sa = (np.asarray(dp_sink(a + step), float) - fa) / step
            slopes = [
                np.where(o, (np.asarray(f(x + step), float) - y) / step, np.inf)
                for f, x, y, o in zip(branches, b, fb, is_open, strict=True)
            ]
            sq = (fan_side(q) - fan_side(q - step)) / step
            inv = [np.where(o, 1.0 / s, 0.0) for s, o in zip(slopes, is_open, strict=True)]
            sum_r = sum(np.where(o, rk * i, 0.0) for rk, i, o in zip(r, inv, is_open, strict=True))
            da = -(r_fan + sq * sum_r) / (sq - sa + sq * sa * sum(inv))
            db = [
                np.where(o, (rk + sa * da) * i, 0.0)
                for rk, i, o in zip(r, inv, is_open, strict=True)
            ]
            # damping: stay inside 0 < a, 0 <= b_k, a + sum b < free delivery
            new_a = np.clip(a + da, 1e-3 * a, None)
            new_b = [np.clip(x + d, 0.0, None) for x, d in zip(b, db, strict=True)]
            total = new_a + sum(new_b)
            shrink = np.where(total > q_max, q_max / total, 1.0)
            new_a, new_b = new_a * shrink, [x * shrink for x in new_b]
            moved = np.abs(new_a - a)
            for x, y in zip(new_b, b, strict=True):
                moved = np.maximum(moved, np.abs(x - y))
            a, b = new_a, new_b
            fa, fb, r, r_fan = residuals(a, b)
            ok = (np.abs(r_fan) <= 1e-9 * dp_scale) & (moved <= 1e-10 * q_free)
            for rk in r:
                ok &= np.abs(rk) <= 1e-9 * dp_scale
            converged = ok
            if np.all(converged | ~np.isfinite(r_fan + sum(r))):
                break
    converged &= np.isfinite(r_fan + sum(r))
    return a, sum(b), converged


def split_bypass_at_approach_velocity(
    approach_velocity,
    duct_flow_area,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
) -> BypassSplit:
    """:func:`split_bypass` for a given approach velocity over the duct section.

    Parameters
    ----------
    approach_velocity : float or array_like
        Mean air velocity upstream of the sink, over the whole duct section [m s⁻¹], >= 0.
    duct_flow_area : float or array_like
        Free cross-section of the duct at the sink: finned region plus gaps [m²], > 0.
    sink_pressure_drop, bypass_pressure_drop : callable
        As in :func:`split_bypass` [Pa].

    Returns
    -------
    BypassSplit
        As :func:`split_bypass`, with ``Q_tot = approach_velocity * duct_flow_area``.
    """
    area = np.asarray(duct_flow_area, dtype=float)
    if np.any(~(area > 0)):
        raise InputError(f"duct_flow_area = {duct_flow_area!r} m²; must be > 0")
    velocity = np.asarray(approach_velocity, dtype=float)
    if np.any(~(velocity >= 0)):
        raise InputError(f"approach_velocity = {approach_velocity!r} m/s; must be >= 0")
    return split_bypass(velocity * area, sink_pressure_drop, bypass_pressure_drop)


class BypassOperatingPoint(NamedTuple):
    """Fan operating point of a ducted heat sink with bypass, for each design.

    Attributes
    ----------
    volume_flow : numpy.ndarray
        Total flow through the fan [m³ s⁻¹]; NaN where there is no operating point.
    sink_volume_flow : numpy.ndarray
        Part of it through the fins [m³ s⁻¹].
    bypass_volume_flow : numpy.ndarray
        Part of it round the fins [m³ s⁻¹].
    pressure_drop : numpy.ndarray
        Fan static pressure = total system pressure drop [Pa].
    sink_pressure_drop : numpy.ndarray
        Pressure drop across the sink and its gaps (without the extra loss) [Pa].
    is_converged : numpy.ndarray of bool
        False where there is no operating point or a solve did not converge.
    is_in_stall_region : numpy.ndarray of bool
        True where the point lies on a positive-slope part of the fan curve.
    """

    volume_flow: np.ndarray
    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    pressure_drop: np.ndarray
    sink_pressure_drop: np.ndarray
    is_converged: np.ndarray
    is_in_stall_region: np.ndarray


def operating_point_with_bypass(
    fan: FanCurve,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
    extra_pressure_drop: SystemPressureDrop | None = None,
    density=None,
    *,
    pressure_factor=1.0,
    raise_on_failure: bool = False,
    maxiter: int = 100,
) -> BypassOperatingPoint:
    """Fan operating point of a heat sink with bypass gaps, plus optional series losses.

    Parameters
    ----------
    fan : FanCurve
        The fan (or combination), rated at ``fan.rating_density`` [-].
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa].
    bypass_pressure_drop : callable or sequence of callable
        ``dp(volume_flow)`` of the bypass gaps [Pa]; several for gaps in parallel (side and
        top), which then share the bypass flow at equal pressure drop.
    extra_pressure_drop : callable, optional
        ``dp(volume_flow)`` of everything else in series with the duct (enclosure, filter,
        grilles) [Pa], at the total flow.
    density : float or array_like, optional
        Air density at the fan [kg m⁻³]; None: the rating density.
    pressure_factor : float or array_like, default 1.0
        Multiplier on the fan's pressure (ageing, tolerance), per design [-].
    raise_on_failure : bool, default False
        Raise :class:`~finkit.errors.SolverError` when a design has no operating point [-].
    maxiter : int, default 100
        Iteration limit of each solver level [-].

    Returns
    -------
    BypassOperatingPoint
        Total, sink and bypass flows [m³ s⁻¹], total and sink pressure drops [Pa], flags.

    Notes
    -----
    Nested solve (docs/methods.md h): the duct's system curve at a total flow is the pressure drop
    of the parallel sink/bypass pair from :func:`split_bypass`, plus the extra series loss;
    :func:`operating_point` crosses it with the fan curve. Both levels are vectorised over
    the designs.

    Fast path: for a fan curve without a stall region, the three balances (sink = bypass
    pressure drop, fan = duct pressure drop) are first solved together for the sink and bypass
    flows by a damped two-variable Newton iteration, about ten times fewer pressure-drop
    evaluations than the nested solve; any design where it does not converge to the residual
    tolerance is solved by the nested bracketed method above, which is always the reference.
    """
    factor = np.asarray(pressure_factor, dtype=float)
    branches = bypass_pressure_drop
    bypass_pressure_drop = parallel_pressure_drop(branches)

    def sink_and_bypass(q):
        return split_bypass(q, sink_pressure_drop, bypass_pressure_drop, maxiter=maxiter)

    def system(q):
        dp = np.asarray(sink_and_bypass(q).pressure_drop, dtype=float)
        if extra_pressure_drop is not None:
            dp = dp + np.asarray(extra_pressure_drop(q), dtype=float)
        return dp / factor

    ratio = fan.density_ratio(density)
    fast = None
    if not fan.has_stall_region:
        fast = _bypass_newton(
            fan, ratio * factor, sink_pressure_drop, branches, extra_pressure_drop
        )
    if fast is not None and np.all(fast[2]):
        a, b, _ = fast
        q = a + b
        dp_sink = np.asarray(sink_pressure_drop(a), float)
        split = BypassSplit(a, b, dp_sink, np.ones(np.shape(q), bool))
        converged = np.ones(np.shape(q), bool)
    else:
        result, ratio = _fan_balance(fan, system, density, maxiter)
        q = np.asarray(result.x)
        split = sink_and_bypass(np.where(np.isnan(q), 0.0, q))
        converged = np.asarray(result.is_converged) & np.asarray(split.is_converged)
        if fast is not None:
            a, b, ok = fast
            q = np.where(ok, a + b, q)
            split = BypassSplit(
                np.where(ok, a, split.sink_volume_flow),
                np.where(ok, b, split.bypass_volume_flow),
                np.where(ok, np.asarray(sink_pressure_drop(a), float), split.pressure_drop),
                np.asarray(split.is_converged) | ok,
            )
            converged = converged | ok
    if raise_on_failure and not np.all(converged):
        raise SolverError(_failure_message("operating_point_with_bypass", fan, converged))
    missing = np.isnan(q)
    shape = np.broadcast_shapes(q.shape, np.shape(split.sink_volume_flow))

    def out(v):
        return np.array(np.broadcast_to(np.where(missing, np.nan, v), shape))[()]

    return BypassOperatingPoint(
        out(q),
        out(split.sink_volume_flow),
        out(split.bypass_volume_flow),
        out(fan.pressure(q) * ratio * factor),
        out(split.pressure_drop),
        np.array(np.broadcast_to(converged, shape))[()],
        np.array(np.broadcast_to(fan.is_in_stall_region(q), shape))[()],
    )
