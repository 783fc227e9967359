"""Flow through an unshrouded heat sink standing in an approach stream (free-stream bypass).

A sink with no duct round it does not take the whole approach stream: the fins resist the
flow, the air ahead of the sink slows down and most of it goes round. The balance below is the
one-dimensional bypass model of Lee (1995), as Simons & Schmidt (1997) applied it, taken to
the limit of an unbounded bypass region (docs/methods.md h, "free stream").
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import InputError
from finkit.physics.airflow.fans import SystemPressureDrop
from finkit.physics.airflow.roots import bracketed_root
from finkit.validity import ValidityRange

__all__ = [
    "FREE_STREAM_APPROACH_VELOCITY",
    "FreeStreamSplit",
    "sink_flow_free_stream_lee",
]


FREE_STREAM_APPROACH_VELOCITY = ValidityRange(
    method="Lee (1995) bypass balance, sink in a free stream",
    quantity="approach velocity V_app [m/s]",
    low=1.0,
    high=20.0,
    source=(
        "common practice, no source: a pressure-driven balance needs forced flow well above "
        "buoyancy-driven speeds (the Richardson check warns separately) and low-speed, "
        "incompressible air"
    ),
)
"""Range of the approach velocity over which finkit applies the free-stream bypass balance.

No range is published for the free-stream limit of Lee's model; these bounds are finkit's own
(common practice, no source), stated so that a case outside them is warned about."""


class FreeStreamSplit(NamedTuple):
    """The share of an approach stream that passes through an unshrouded sink.

    Attributes
    ----------
    approach_volume_flow : numpy.ndarray
        Flow the undisturbed stream carries through the sink's frontal area,
        ``V_app A_fr`` [m³ s⁻¹].
    sink_volume_flow : numpy.ndarray
        Flow through the fins [m³ s⁻¹].
    bypass_volume_flow : numpy.ndarray
        ``approach_volume_flow - sink_volume_flow``: the part of the stream aimed at the sink
        that goes round it [m³ s⁻¹].
    bypass_fraction : numpy.ndarray
        ``bypass_volume_flow / approach_volume_flow`` [-] (0 at zero flow).
    channel_velocity : numpy.ndarray
        Mean velocity in the narrowest section of the fins, ``sink_volume_flow /
        exit_flow_area`` [m s⁻¹].
    bypass_velocity : numpy.ndarray
        Velocity of the stream passing the sink [m s⁻¹]; the approach velocity for an
        unbounded stream.
    pressure_drop : numpy.ndarray
        Static pressure drop of the finned region at its flow [Pa].
    is_converged : numpy.ndarray of bool
        False where the balance could not be solved (NaN results).
    """

    approach_volume_flow: np.ndarray
    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    bypass_fraction: np.ndarray
    channel_velocity: np.ndarray
    bypass_velocity: np.ndarray
    pressure_drop: np.ndarray
    is_converged: np.ndarray


def sink_flow_free_stream_lee(
    approach_velocity,
    frontal_area,
    exit_flow_area,
    sink_pressure_drop: SystemPressureDrop,
    density,
    *,
    bypass_area=np.inf,
    maxiter: int = 100,
) -> FreeStreamSplit:
    """Flow through an unshrouded heat sink in an approach stream (Lee's bypass balance).

    Parameters
    ----------
    approach_velocity : float or array_like
        Velocity of the undisturbed stream ahead of the sink, over the height of the fins
        [m s⁻¹], >= 0.
    frontal_area : float or array_like
        Frontal area of the finned region, base width times fin height [m²], > 0.
    exit_flow_area : float or array_like
        Free-flow area of the narrowest section of the fins (between plate fins; between the
        pins of a transverse row) [m²], 0 < ``exit_flow_area`` <= ``frontal_area``.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa]: entrance, friction and exit losses,
        increasing, ``dp(0) = 0``, called with arrays of the batch shape.
    density : float or array_like
        Air density [kg m⁻³].
    bypass_area : float or array_like, default inf
        Flow area of the region round the sink that the bypass stream passes through [m²],
        >= 0. ``inf`` (the default) is the free stream; a finite value is Lee's duct with
        clearance, and 0 a duct that touches the sink (all the flow through the fins).
    maxiter : int, default 100
        Iteration limit [-].

    Returns
    -------
    FreeStreamSplit
        Approach, sink and bypass flows [m³ s⁻¹], bypass fraction [-], channel and bypass
        velocities [m s⁻¹], sink pressure drop [Pa], convergence flags; batch shape.

    Notes
    -----
    **Model** (Lee 1995; Simons & Schmidt 1997). Two streams leave the same upstream section,
    where the stream has velocity ``V_app`` and total pressure ``p_0 = p_1 + rho V_app²/2``, and
    meet again at the sink exit at one static pressure ``p_2``. The bypass stream loses
    nothing; the stream through the fins loses the sink's pressure drop ``dp_hs`` (entrance,
    friction, exit) and leaves the fins with its channel velocity ``V_ch``. Bernoulli along
    each stream and continuity over the approach section give::

        p_0 - p_2 = rho V_b² / 2                      (bypass, no loss)
        p_0 - p_2 = rho V_ch² / 2 + dp_hs(Q_hs)        (fins; V_ch = Q_hs / A_ch)
        V_app (A_fr + A_b) = Q_hs + V_b A_b             (continuity)

    For a sink whose loss is a constant multiple ``K`` of the channel head and ``A_ch = A_fr``
    the first two lines give ``V_b = V_ch sqrt(1 + K)`` and continuity then Lee's closed form
    (with the bypass loss-free)::

        V_ch / V_app = (1 + A_b/A_fr) / (1 + (A_b/A_fr) sqrt(1 + K))

    The form is confirmed three ways: the derivation above; Lee's printed closed form, recalled
    from memory **[R]** (the paper itself was not available); and an independent public
    heat-sink evaluation script (function ``evalHSIncomingAir``, found by code search) that
    solves the same balance as a quadratic in ``V_app`` for a duct: ``V_b² = V_ch² + 2 dp_hs /
    rho`` with continuity over the duct; the tests reproduce that quadratic.

    **Free stream** (``A_b -> inf``): the bypass stream is the undisturbed stream,
    ``V_b = V_app``, and the balance reduces to::

        rho V_app² / 2 = rho V_ch² / 2 + dp_hs(Q_hs)

    the approach stream's dynamic head drives the fins. ``dp_hs -> 0`` gives
    ``V_ch -> V_app`` (a sink that does not resist the flow takes its share of the stream);
    ``A_b -> 0`` gives ``Q_hs -> V_app A_fr`` (the fully ducted sink). Solved for ``Q_hs`` in
    ``[0, V_app A_fr]`` by :func:`bracketed_root`: the residual
    ``rho V_ch²/2 + dp_hs - rho V_b²/2`` rises with ``Q_hs``, is negative at 0 and not negative
    at ``V_app A_fr`` (where ``V_ch >= V_app >= V_b``).

    **Choices, each the conservative one** (less flow through the fins):

    * The bypass region is unbounded (``bypass_area = inf``). Any finite region round the sink
      speeds up the bypass stream and pushes more air through the fins; Lee's model leaves
      its size open, and the free stream is its lower bound on the fin flow.
    * The pressure behind the sink is the free-stream static pressure. The low pressure in
      the wake of a bluff body, which would draw more air through the fins, is not credited.
    * The air leaving the fins is taken to lose its whole channel velocity head
      ``rho V_ch²/2`` (Lee's form), on top of the exit loss already in ``dp_hs``; the velocity
      is that of the narrowest section. Read strictly, a Kays & London exit coefficient ``K_e``
      already carries the stream from ``V_ch`` down to ``sigma V_ch`` over the frontal area,
      which would leave only ``sigma² rho V_ch²/2``; Lee's full head is the larger loss. (The
      duct-with-gaps network of :mod:`finkit.physics.sink.airflow` counts the same head on its
      fin branch, so as its gaps widen it tends to this model.)
    * No air leaks out of the open top or sides of the fins along the flow (a 1-D balance
      cannot see it); leakage lowers the flow over the downstream part of the fins, so a long
      sink (length well above its fin height) is optimistic in this respect.

    **Assumptions and validity.** ``V_app`` is the mean velocity of the undisturbed stream over
    the fin height where the sink stands, outside the board's boundary layer and outside the
    wake of upstream parts; steady, incompressible, isothermal flow (properties at the
    inlet). Lee's model was compared with measurements for sinks in ducts with clearance;
    the free-stream limit is a consequence of the same balance, not separately validated:
    expect about ±10-20 % on the fin flow (docs/methods.md h, common practice, no source).
    Range of the approach velocity finkit applies it to: :data:`FREE_STREAM_APPROACH_VELOCITY`.

    References
    ----------
    .. [1] Lee, S., "Optimum design and selection of heat sinks", IEEE Trans. Comp., Packag.,
       Manuf. Technol. A 18(4), 812-817, 1995.
    .. [2] Simons, R.E., Schmidt, R.R., "A simple method to estimate heat sink air flow
       bypass", Electronics Cooling 3(2), 36-37, 1997.
    .. [3] Jonsson, H., Moshfegh, B., "Modeling of the thermal and hydraulic performance of
       plate fin, strip fin, and pin fin heat sinks -- influence of flow bypass", IEEE Trans.
       Comp. Packag. Technol. 24(2), 142-149, 2001 (bypass measurements and a physical
       bypass model of the same kind).

    Examples
    --------
    A sink whose losses are three channel velocity heads takes half the approach velocity
    (``1/sqrt(1 + 3)``):

    >>> split = sink_flow_free_stream_lee(
    ...     2.0, 1e-3, 1e-3, lambda q: 3.0 * 0.5 * 1.2 * (q / 1e-3) ** 2, 1.2
    ... )
    >>> round(float(split.channel_velocity), 6), round(float(split.bypass_fraction), 6)
    (1.0, 0.5)
    """
    velocity = np.asarray(approach_velocity, dtype=float)
    frontal = np.asarray(frontal_area, dtype=float)
    exit_area = np.asarray(exit_flow_area, dtype=float)
    rho = np.asarray(density, dtype=float)
    b_area = np.asarray(bypass_area, dtype=float)
    if np.any(~(velocity >= 0)) or np.any(np.isinf(velocity)):
        raise InputError(f"approach_velocity = {approach_velocity!r} m/s; must be finite and >= 0")
    if np.any(~(frontal > 0)) or np.any(np.isinf(frontal)):
        raise InputError(f"frontal_area = {frontal_area!r} m²; must be finite and > 0")
    if np.any(~(exit_area > 0)) or np.any(exit_area > frontal * (1.0 + 1e-12)):
        raise InputError(
            f"exit_flow_area = {exit_flow_area!r} m²; must be > 0 and not above the frontal area"
        )
    if np.any(~(rho > 0)):
        raise InputError(f"density = {density!r} kg/m³; must be > 0")
    if np.any(~(b_area >= 0)):
        raise InputError(f"bypass_area = {bypass_area!r} m²; must be >= 0 (inf: free stream)")

    q_approach = velocity * frontal
    is_free = np.isinf(b_area)
    is_closed = b_area == 0
    b_safe = np.where(is_free | is_closed, 1.0, b_area)

    def bypass_velocity(q):
        with np.errstate(invalid="ignore"):
            finite = velocity + (q_approach - q) / b_safe
        return np.where(is_free, velocity, finite)

    def residual(q):
        dp = np.asarray(sink_pressure_drop(q), float)
        return 0.5 * rho * ((q / exit_area) ** 2 - bypass_velocity(q) ** 2) + dp

    shape = np.broadcast_shapes(
        q_approach.shape,
        exit_area.shape,
        rho.shape,
        b_area.shape,
        np.shape(np.asarray(sink_pressure_drop(q_approach), float)),
    )
    upper = np.broadcast_to(q_approach, shape)
    lower = np.zeros(shape)
    has_flow = upper > 0
    # a closed bypass or no flow: nothing to solve (all the flow through the fins, or none)
    trivial = ~has_flow | np.broadcast_to(is_closed, shape)
    r_low = np.where(trivial, -1.0, residual(lower))
    r_high = np.where(trivial, 1.0, residual(upper))
    root = bracketed_root(
        residual,
        lower,
        upper,
        lower_value=r_low,
        upper_value=r_high,
        xatol=0.0,
        xrtol=1e-12,
        maxiter=maxiter,
    )
    q_sink = np.where(trivial, upper, np.asarray(root.x, float))
    converged = trivial | np.asarray(root.is_converged, bool)
    q_sink = np.where(converged, q_sink, np.nan)
    q_bypass = upper - q_sink
    with np.errstate(invalid="ignore", divide="ignore"):
        fraction = np.where(has_flow, q_bypass / np.where(has_flow, upper, 1.0), 0.0)
    channel = q_sink / exit_area
    v_bypass = np.where(np.broadcast_to(is_closed, shape), 0.0, bypass_velocity(q_sink))
    dp_sink = np.asarray(sink_pressure_drop(np.where(converged, q_sink, 0.0)), float)
    dp_sink = np.where(converged, dp_sink, np.nan)

    def out(v):
        return np.array(np.broadcast_to(v, shape), dtype=float)[()]

    return FreeStreamSplit(
        out(upper),
        out(q_sink),
        out(q_bypass),
        out(fraction),
        out(channel),
        out(v_bypass),
        out(dp_sink),
        np.array(np.broadcast_to(converged, shape))[()],
    )
