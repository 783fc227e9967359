"""Airflow through the sink: pressure drop of the fin region, bypass, fan operating point."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError, SolverError
from finkit.physics.airflow.bypass import (
    bypass_gap_pressure_drop,
    operating_point_with_bypass,
    split_among_branches,
)
from finkit.physics.airflow.free_stream import (
    FREE_STREAM_APPROACH_VELOCITY,
    sink_flow_free_stream_lee,
)
from finkit.physics.airflow.operating_point import operating_point
from finkit.physics.correlations import forced
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink.inputs import (
    DEFAULT_OPTIONS,
    Air,
    Bypass,
    FanDriven,
    Flow,
    FreeStream,
    GivenVelocity,
    GivenVolumeFlow,
    ModelOptions,
    _passage_thickness,
)
from finkit.validity import check_range

__all__ = [
    "STALL_WARNING",
    "sink_pressure_drop",
    "solve_airflow",
]


# --------------------------------------------------------------------------------------
# Airflow through the sink
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Airflow:
    volume_flow: np.ndarray
    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    approach_velocity: np.ndarray
    pressure_drop: np.ndarray
    warnings: tuple[str, ...] = ()


STALL_WARNING = (
    "air.flow.fan: the operating point lies on a rising (stall) part of the fan curve, where fan "
    "data are unreliable and the flow may be unstable; choose a fan or system that runs on the "
    "falling part (common practice, no source)"
)


def _sink_frontal_area(geometry) -> np.ndarray:
    """Frontal area of the finned region, across the flow [m²]."""
    if isinstance(geometry, PlateFinSink):
        return np.multiply(geometry.base_width, geometry.fin_height)
    return np.multiply(geometry.base_width, geometry.pin_height)


def _fin_height(geometry) -> np.ndarray:
    return geometry.fin_height if isinstance(geometry, PlateFinSink) else geometry.pin_height


def _is_shrouded(bypass: Bypass | FreeStream | None):
    """True (per design) where a shroud touches the fin tips: no bypass, or no top gap."""
    if bypass is None:
        return True
    if isinstance(bypass, FreeStream):
        return False
    return np.asarray(bypass.top_gap, float) <= 0


def _bypass_geometry(geometry, bypass: Bypass | None):
    """Flow area [m²] and hydraulic diameter [m] of each bypass branch, or None.

    Two branches: the two side gaps (``2 s H``, a slot of width s: ``D_h ≈ 2 s``) and the gap
    above the fin tips (``g (W + 2 s)``, ``D_h ≈ 2 g``). A branch with zero area is closed.
    """
    if bypass is None or isinstance(bypass, FreeStream):
        return None
    side, top = np.asarray(bypass.side_gap, float), np.asarray(bypass.top_gap, float)
    height = _fin_height(geometry)
    width = geometry.base_width
    branches = {
        "side": (2.0 * side * height, 2.0 * side),
        "top": (top * (width + 2.0 * side), 2.0 * top),
    }
    open_branches = {k: v for k, v in branches.items() if np.any(v[0] > 0)}
    return open_branches or None


def _bypass_pressure_drop(geometry, bypass: Bypass, branches, density, viscosity):
    """``dp(q)`` of each bypass branch [Pa] (a tuple; see ``airflow.parallel_pressure_drop``).

    The side gaps and the top gap are separate parallel branches between the same pressures
    (docs/methods.md h): at a given total they share the flow so that their pressure drops are
    equal (:func:`finkit.physics.airflow.split_bypass`). Each branch has its own friction on its own
    gap width, so unequal gaps take unequal shares; lumping them into one branch with a mean
    diameter gave up to about 15 % less bypass flow. The fan solver solves the branches
    together (one Newton system); elsewhere they are combined by nested splits.
    """
    loss = bypass.loss_coefficient

    def branch(name):
        area, diameter = branches[name]

        def dp(q):
            return bypass_gap_pressure_drop(
                q, area, diameter, geometry.base_length, density, viscosity, loss_coefficient=loss
            )

        return dp

    return tuple(branch(name) for name in branches)


def _sink_exit_area(geometry) -> np.ndarray:
    """Free-flow area of the narrowest section of the fins [m²] (between plates or pins)."""
    if isinstance(geometry, PlateFinSink):
        return np.asarray(geometry.open_frontal_area, float)
    return np.asarray(geometry.frontal_area * geometry.min_free_flow_ratio, float)


def _free_stream_airflow(geometry, flow: Flow, density, dp_sink) -> _Airflow:
    """Airflow of a sink standing unshrouded in an approach stream (:class:`FreeStream`).

    The approach velocity is given, or a volume flow over the sink's frontal area; the share
    through the fins is Lee's bypass balance with an unbounded bypass region
    (:func:`finkit.physics.airflow.sink_flow_free_stream_lee`). ``volume_flow`` of the result is
    the stream's flow through the frontal area, ``bypass_volume_flow`` the part of it that goes
    round the sink.
    """
    frontal = _sink_frontal_area(geometry)
    if isinstance(flow, GivenVelocity):
        velocity = np.asarray(flow.approach_velocity, float)
    elif isinstance(flow, GivenVolumeFlow):
        velocity = np.asarray(flow.volume_flow, float) / frontal
    elif isinstance(flow, FanDriven):
        raise InputError(
            "air.flow.fan: a fan against an unshrouded sink in a free stream has no defined "
            "system curve (the air goes round the sink); give air.flow.approach_velocity or "
            "volume_flow, or describe the duct with air.bypass side_gap and top_gap"
        )
    else:
        raise InputError("air.flow: natural convection has no forced airflow to solve")
    split = sink_flow_free_stream_lee(
        velocity, frontal, _sink_exit_area(geometry), dp_sink, density
    )
    converged = np.asarray(split.is_converged)
    if not np.all(converged):
        raise SolverError(
            "air.bypass.free_stream: the flow through the fins could not be solved for "
            f"{int(np.sum(~converged))} design(s)"
        )
    return _Airflow(
        *np.broadcast_arrays(
            np.asarray(split.approach_volume_flow, float),
            np.asarray(split.sink_volume_flow, float),
            np.asarray(split.bypass_volume_flow, float),
            np.asarray(velocity, float),
            np.asarray(split.pressure_drop, float),
        ),
        warnings=tuple(check_range(FREE_STREAM_APPROACH_VELOCITY, velocity)),
    )


def _duct_area(geometry, bypass: Bypass | None) -> np.ndarray:
    frontal = _sink_frontal_area(geometry)
    if bypass is None or isinstance(bypass, FreeStream):
        return frontal
    height = _fin_height(geometry)
    return (geometry.base_width + 2 * np.asarray(bypass.side_gap, float)) * (
        height + np.asarray(bypass.top_gap, float)
    )


def sink_pressure_drop(
    geometry,
    volume_flow,
    density,
    dynamic_viscosity,
    *,
    is_shrouded=True,
    options: ModelOptions = DEFAULT_OPTIONS,
):
    """Static pressure drop across the finned region at a volume flow through it [Pa].

    Plate fins: developing-flow apparent friction plus contraction and expansion losses;
    pin fins: the tube-bank pressure-drop method of :mod:`finkit.physics.correlations.forced`.

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs) [-].
    volume_flow : float or array_like
        Volume flow through the finned region, without the bypass [m³ s⁻¹].
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].
    is_shrouded : bool or array_like, default True
        True: a duct wall touches the fin tips (four wetted walls); False: open top (three);
        used for plate fins only [-].
    options : ModelOptions, optional
        Model choices: ``loss_model``, ``pin_bank_method``, ``deposit_thickness`` and the
        ``pressure_drop_factor`` applied to the result [-].
    """
    if isinstance(geometry, PlateFinSink):
        dp = forced.plate_fin_channel_pressure_drop(
            volume_flow,
            geometry.base_width,
            geometry.fin_count,
            _passage_thickness(geometry.fin_thickness, options),
            geometry.fin_height,
            geometry.base_length,
            density,
            dynamic_viscosity,
            is_shrouded=is_shrouded,
            loss_model=options.loss_model,
        )
    else:
        dp = _pin_flow(
            geometry, volume_flow, density, dynamic_viscosity, 1.0, 1.0, options
        ).pressure_drop
    return dp * options.pressure_drop_factor


def _pin_flow(
    geometry: PinFinSink,
    volume_flow,
    density,
    viscosity,
    conductivity,
    prandtl,
    options: ModelOptions = DEFAULT_OPTIONS,
):
    return forced.pin_fin_bank_flow(
        volume_flow,
        geometry.base_width,
        _passage_thickness(geometry.pin_diameter, options),
        geometry.pin_height,
        geometry.transverse_pitch,
        geometry.longitudinal_pitch,
        geometry.row_count,
        geometry.arrangement,
        density,
        viscosity,
        conductivity,
        prandtl,
        base_length=geometry.base_length,
        method=options.pin_bank_method,
    )


def solve_airflow(
    geometry,
    flow: Flow,
    air: Air,
    bypass: Bypass | FreeStream | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
) -> _Airflow:
    """Volume flow through the fins and round them, and the pressure drop, for a forced case.

    The approach velocity of :class:`GivenVelocity` is taken over the duct section (finned
    region plus bypass gaps); for a sink in a free stream (:class:`FreeStream`) it is the
    undisturbed stream's velocity, and the share through the fins is Lee's bypass balance.
    With a bypass, the flow splits so that the fins and the gaps see the same pressure
    difference, the fin branch with its channel velocity head as in Lee's (1995) balance
    (docs/methods.md h); the pressure drop returned is that common difference. With a fan,
    the fan curve, scaled to the inlet density and by ``options.fan_pressure_factor``, is
    crossed with that combined system curve plus any extra series loss.

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs) [-].
    flow : GivenVelocity, GivenVolumeFlow or FanDriven
        How the flow is set (velocity, volume flow or fan); :class:`NaturalConvection` raises
        :class:`InputError` [-].
    air : Air
        Inlet air temperature [K] and pressure [Pa]; the air properties are taken at the inlet.
    bypass : Bypass or FreeStream, optional
        Duct clearance round the sink, or a free stream with no duct; None = fully shrouded,
        no bypass [-].
    options : ModelOptions, optional
        Model choices, pressure-drop and fan-pressure factors, extra series loss [-].
    """
    inlet = air_properties(air.inlet_temperature, air.pressure)
    rho, mu = inlet.density, inlet.dynamic_viscosity
    shrouded = _is_shrouded(bypass)
    gaps = _bypass_geometry(geometry, bypass)

    def dp_sink(q):
        return sink_pressure_drop(geometry, q, rho, mu, is_shrouded=shrouded, options=options)

    if isinstance(bypass, FreeStream):
        return _free_stream_airflow(geometry, flow, rho, dp_sink)
    if gaps is not None:
        bypass_branches = _bypass_pressure_drop(geometry, bypass, gaps, rho, mu)
        exit_area = _sink_exit_area(geometry)
        # Designs of the batch with a gap open (a design with both gaps 0 is fully ducted).
        is_open = (np.asarray(bypass.side_gap, float) > 0) | (np.asarray(bypass.top_gap, float) > 0)

        def fin_branch(q):
            # Lee's (1995) balance: from the approach stream's total pressure to the static
            # pressure behind the sink, the fin stream spends the sink's pressure drop and
            # leaves with its channel velocity head, as the gap stream leaves with its own
            # (the gaps' one dynamic head); see docs/methods.md h.
            head = 0.5 * rho * (np.asarray(q, float) / exit_area) ** 2
            return dp_sink(q) + np.where(is_open, head, 0.0)

        def system(q):
            return split_among_branches(q, fin_branch, bypass_branches).pressure_drop

    else:
        system = dp_sink

    fan_with_bypass = None
    in_stall = False
    if isinstance(flow, FanDriven) and gaps is not None:
        fan_with_bypass = operating_point_with_bypass(
            flow.fan,
            fin_branch,
            bypass_branches,
            options.extra_pressure_drop,
            density=rho,
            pressure_factor=options.fan_pressure_factor,
        )
        in_stall = np.any(fan_with_bypass.is_in_stall_region)
        converged = np.asarray(fan_with_bypass.is_converged)
        if not np.all(converged):
            raise SolverError(
                "air.flow.fan: the fan curve does not cross the system curve for "
                f"{int(np.sum(~converged))} design(s); no operating point"
            )
        total = np.asarray(fan_with_bypass.volume_flow, float)
    elif isinstance(flow, FanDriven):
        extra, factor = options.extra_pressure_drop, options.fan_pressure_factor

        def fan_system(q):
            # fan * factor = system  <=>  fan = system / factor
            dp = system(q) + (extra(q) if extra is not None else 0.0)
            return dp / factor

        point = operating_point(flow.fan, fan_system, density=rho)
        in_stall = np.any(point.is_in_stall_region)
        if not np.all(point.is_converged):
            raise SolverError(
                "air.flow.fan: the fan curve does not cross the system curve for "
                f"{int(np.sum(~np.asarray(point.is_converged)))} design(s); no operating point"
            )
        total = np.asarray(point.volume_flow, float)
    elif isinstance(flow, GivenVolumeFlow):
        total = np.asarray(flow.volume_flow, float)
    elif isinstance(flow, GivenVelocity):
        total = np.asarray(flow.approach_velocity, float) * _duct_area(geometry, bypass)
    else:
        raise InputError("air.flow: natural convection has no forced airflow to solve")

    # With gaps, the pressure drop reported is the one both branches see (the system the fan
    # works against): the sink's own drop plus its channel velocity head.
    if fan_with_bypass is not None:
        q_sink = fan_with_bypass.sink_volume_flow
        q_bypass = fan_with_bypass.bypass_volume_flow
        dp = fan_with_bypass.sink_pressure_drop
    elif gaps is not None:
        split = split_among_branches(total, fin_branch, bypass_branches)
        q_sink, q_bypass, dp = split.sink_volume_flow, split.bypass_volume_flow, split.pressure_drop
    else:
        q_sink, q_bypass = total, np.zeros_like(total)
        dp = dp_sink(total)
    approach = total / _duct_area(geometry, bypass)
    warnings = (STALL_WARNING,) if in_stall else ()
    return _Airflow(
        *np.broadcast_arrays(
            np.asarray(total, float),
            np.asarray(q_sink, float),
            np.asarray(q_bypass, float),
            np.asarray(approach, float),
            np.asarray(dp, float),
        ),
        warnings=warnings,
    )
