"""Heat-sink models: the thermal chain from junction to air, and the two design questions.

A heat sink on a device is a chain of resistances in series between the junction and the
incoming air (docs/methods.md, section 0)::

    T_j = T_in + Q (R_jc + R_int + R_sp + R_base + R_sink)

* ``R_jc``: junction to case, from the device's data (the JEDEC metric RθJC);
* ``R_int``: the interface material between case and base;
* ``R_sp``: spreading from the source footprint into the base (Song, Lee & Au);
* ``R_base``: one-dimensional conduction through the base thickness;
* ``R_sink``: fins and exposed base to the *inlet* air, including the heating of the air
  along the sink (inlet-referenced correlation, or effectiveness-NTU for bulk-referenced ones).

Two questions are answered for every design, vectorised over any number of designs:

* :func:`solve_temperatures` -- at this power, how hot does each node get?
* :func:`solve_allowable_power` -- at this temperature limit on a node, how much power can the
  sink carry?

Forced convection (plate fins, pin fins): the airflow is fixed first (given velocity, given
volume flow, or the fan curve crossed with the system curve, with bypass), with pressure drop
and fan evaluated at the inlet air density and viscosity. Heat transfer uses air properties at
the film temperature between the inlet air and the mean base temperature; because that
temperature depends on the answer, a short fixed-point iteration couples them (the "property
feedback"). Natural convection (vertical plate fins plus radiation) is solved by a vectorised
bracketed root search on the base excess temperature, since h depends strongly on it.

Every function here takes SI floats or numpy arrays that broadcast together and returns a
:class:`SinkSolution` holding arrays; validity messages are collected in ``warnings``.
"""

from __future__ import annotations

import contextlib
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from typing import Literal

import numpy as np

from finkit.errors import InputError, PropertyRangeError, SolverError
from finkit.physics.airflow.bypass import (
    bypass_gap_pressure_drop,
    operating_point_with_bypass,
    split_among_branches,
)
from finkit.physics.airflow.fans import FanCurve
from finkit.physics.airflow.operating_point import operating_point
from finkit.physics.airflow.roots import bracketed_root
from finkit.physics.correlations import forced, natural
from finkit.physics.fins import analytic as fins
from finkit.physics.fins.analytic import one_dimensional_fin_warnings
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.radiation import plate_fin_radiation
from finkit.physics.spreading import spreading_resistance_rectangular_series

NATURAL_CHANNEL_METHODS = ("bar_cohen_rohsenow", "elenbaas")
"""Natural-convection channel correlations of vertical plate fins (``ModelOptions``)."""

PLATE_CHANNEL_CHOICES = ("lower", *forced.PLATE_CHANNEL_METHODS)
"""Plate-fin channel heat transfer in forced flow (``ModelOptions.plate_channel_method``):
``"lower"`` (default) solves the sink with each of ``forced.PLATE_CHANNEL_METHODS`` and keeps,
design by design, the higher sink resistance (the lower heat transfer); or one of them."""

NODES = ("junction", "case", "base")
"""Nodes a temperature limit may be placed on. ``base`` is the centre of the base surface under
the source, the hottest base temperature (``source_base_centre_temperature``); the footprint
mean is reported beside it (``source_base_temperature``)."""

FILM_ITERATIONS = 30
"""Most fixed-point passes for the film-temperature property feedback in forced convection.
The loop stops as soon as no design's base temperature moves by more than
:data:`FILM_TOLERANCE`; air properties change by well under 1 % per 10 K, so ordinary cases
converge in four to six passes."""

FILM_TOLERANCE = 1e-3
"""Convergence of the film-temperature iteration: largest change of base temperature [K]."""


# --------------------------------------------------------------------------------------
# Inputs
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class HeatSource:
    """The device on the sink: its power and footprint, and the resistances above the base.

    Attributes
    ----------
    power : float or array
        Heat dissipated into the sink [W].
    footprint_length, footprint_width : float or array
        Size of the contact area, centred on the base; length along the flow [m].
    junction_to_case_resistance : float or array
        RθJC for the cooled side [K W⁻¹]; 0 makes junction and case one node.
    interface_resistance : float or array
        Interface material between case and base [K W⁻¹].
    """

    power: float | np.ndarray
    footprint_length: float | np.ndarray
    footprint_width: float | np.ndarray
    junction_to_case_resistance: float | np.ndarray = 0.0
    interface_resistance: float | np.ndarray = 0.0

    @property
    def footprint_area(self):
        """Contact area of the source [m²]."""
        return np.multiply(self.footprint_length, self.footprint_width)


@dataclass(frozen=True)
class GivenVelocity:
    """Air approaching at a known velocity [m s⁻¹], over the duct section (fins plus bypass)."""

    approach_velocity: float | np.ndarray


@dataclass(frozen=True)
class GivenVolumeFlow:
    """A known total volume flow approaching the sink, before any bypass [m³ s⁻¹]."""

    volume_flow: float | np.ndarray


@dataclass(frozen=True)
class FanDriven:
    """Flow set by a fan (or a combination of fans) against the sink and bypass."""

    fan: FanCurve


@dataclass(frozen=True)
class NaturalConvection:
    """Buoyancy-driven flow; only vertical fins (air rising along the fin length) are covered."""

    orientation: str = "vertical-fins"


Flow = GivenVelocity | GivenVolumeFlow | FanDriven | NaturalConvection


@dataclass(frozen=True)
class Bypass:
    """Clearance between the sink and its duct, through which air can go round the fins.

    Attributes
    ----------
    side_gap : float or array
        Clearance on each side of the sink [m].
    top_gap : float or array
        Clearance above the fin tips [m]; a positive value also exposes the fin tips.
    loss_coefficient : float
        Inlet plus exit dynamic-head losses of the gap [-] (1.0 = one dynamic head, common
        practice, no source).
    """

    side_gap: float | np.ndarray = 0.0
    top_gap: float | np.ndarray = 0.0
    loss_coefficient: float = 1.0


@dataclass(frozen=True)
class Air:
    """The air entering the sink.

    Attributes
    ----------
    inlet_temperature : float or array
        Local inlet air temperature, with any preheat [K].
    pressure : float or array
        Absolute pressure (from the altitude) [Pa].
    surroundings_temperature : float or array or None
        Temperature of the surfaces the sink radiates to [K]; None means the inlet temperature.
    """

    inlet_temperature: float | np.ndarray
    pressure: float | np.ndarray = 101325.0
    surroundings_temperature: float | np.ndarray | None = None


@dataclass(frozen=True)
class SinkMaterial:
    """Conductivity and surface emissivity of the sink metal."""

    thermal_conductivity: float | np.ndarray
    emissivity: float | np.ndarray = 0.0
    density: float | np.ndarray = 0.0


@dataclass(frozen=True)
class ModelOptions:
    """Model choices and allowances of a heat-sink solve.

    The factors may be arrays (one value per design, scenario or Monte Carlo sample).

    Attributes
    ----------
    plate_channel_method : str
        Plate-fin channel heat transfer, one of :data:`PLATE_CHANNEL_CHOICES`; default
        ``"lower"``: the laminar-developing (Teertstra) and the VDI model (laminar, transition,
        turbulent) each give a sink resistance and the higher is used (conservative where the
        flow is near transition and the two bracket h).
    pin_bank_method : str
        Pin-array heat transfer, one of ``forced.PIN_BANK_METHODS``; default ``"lower"`` (the
        lower h of Zukauskas and Gnielinski).
    loss_model : str
        Entrance/exit loss model of the plate-fin channels, one of ``forced.LOSS_MODELS``.
    heat_transfer_factor : float or array
        Multiplier on the air-side heat transfer coefficient [-]: a calibration to test data,
        a correlation tolerance, or a fouling allowance. 1 = the correlation as published.
    fouling_resistance : float or array
        Air-side fouling (dust layer) resistance per unit area, in series with 1/h
        [m² K W⁻¹].
    pressure_drop_factor : float or array
        Multiplier on the sink's own pressure drop (fouled or dusty fins) [-].
    fan_pressure_factor : float or array
        Multiplier on the fan curve's pressure (ageing, voltage, tolerance) [-].
    extra_pressure_drop : callable or None
        A loss in series with the sink and its bypass, ``dp(volume_flow) -> Pa`` (filter, grille,
        enclosure), used with a fan.
    natural_channel_method : str
        Natural-convection channel coefficient of vertical plate fins, one of
        :data:`NATURAL_CHANNEL_METHODS`: ``"bar_cohen_rohsenow"`` (composite correlation,
        default) or ``"elenbaas"`` (Elenbaas's own fit). Both take the same Elenbaas number.
    deposit_thickness : float or array
        Thickness of a dust or deposit layer on every wetted face [m]. It narrows the flow
        passages: the flow and heat-transfer correlations see fins ``2 deposit_thickness``
        thicker (pins ``2 deposit_thickness`` larger in diameter), while fin conduction, fin
        count and areas stay those of the clean metal. Its thermal resistance is not included
        here; give it as ``fouling_resistance`` (layer thickness over its conductivity).
    sink_resistance_factor : float or array
        Multiplier on the sink resistance (fins and exposed base to the air, convection plus
        radiation) [-]; an empirical calibration to test data. 1 = as modelled.
    heat_transfer_coefficient_override : float or array or None
        A heat transfer coefficient given by hand, used on every air-side surface instead of
        the correlations [W m⁻² K⁻¹]; ``heat_transfer_factor`` and ``fouling_resistance`` still
        apply. None (default) = computed from the correlations.
    """

    plate_channel_method: str = "lower"
    loss_model: str = "kays_london"
    heat_transfer_factor: float | np.ndarray = 1.0
    fouling_resistance: float | np.ndarray = 0.0
    pressure_drop_factor: float | np.ndarray = 1.0
    fan_pressure_factor: float | np.ndarray = 1.0
    extra_pressure_drop: Callable | None = None
    natural_channel_method: str = "bar_cohen_rohsenow"
    deposit_thickness: float | np.ndarray = 0.0
    sink_resistance_factor: float | np.ndarray = 1.0
    heat_transfer_coefficient_override: float | np.ndarray | None = None
    pin_bank_method: str = "lower"

    def __post_init__(self):
        for name, allowed in (
            ("plate_channel_method", PLATE_CHANNEL_CHOICES),
            ("pin_bank_method", forced.PIN_BANK_METHODS),
            ("loss_model", forced.LOSS_MODELS),
        ):
            if getattr(self, name) not in allowed:
                raise InputError(
                    f"{name}: got {getattr(self, name)!r}; allowed: {', '.join(allowed)}"
                )
        if self.natural_channel_method not in NATURAL_CHANNEL_METHODS:
            raise InputError(
                f"natural_channel_method: got {self.natural_channel_method!r}; allowed: "
                f"{', '.join(NATURAL_CHANNEL_METHODS)}"
            )
        if np.any(np.asarray(self.deposit_thickness, float) < 0):
            raise InputError(f"deposit_thickness: got {self.deposit_thickness!r} m; must be >= 0")

    def effective_heat_transfer_coefficient(self, heat_transfer_coefficient):
        """h after any hand override, the calibration factor and the fouling layer [W m⁻² K⁻¹]."""
        h = np.asarray(heat_transfer_coefficient, float)
        if self.heat_transfer_coefficient_override is not None:
            h = np.asarray(self.heat_transfer_coefficient_override, float) + 0.0 * h
        h = h * self.heat_transfer_factor
        return h / (1.0 + h * np.asarray(self.fouling_resistance, float))


DEFAULT_OPTIONS = ModelOptions()


def _passage_thickness(thickness, options: ModelOptions):
    """Fin thickness (or pin diameter) the air passages see, with any deposit layer [m]."""
    return np.asarray(thickness, float) + 2.0 * np.asarray(options.deposit_thickness, float)


# --------------------------------------------------------------------------------------
# Results
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SinkSolution:
    """Every node temperature, resistance and flow quantity of a solved heat sink.

    All temperatures are absolute [K]; resistances [K W⁻¹]; flows [m³ s⁻¹]. Quantities that do
    not apply to the case (e.g. pressure drop in natural convection) are NaN.
    ``source_base_temperature`` is the base under the source averaged over the footprint (the
    case and junction sit on it); ``source_base_centre_temperature`` is its centre, the hottest
    point of the base (spreading resistance to the centre, ``psi_max``), and the ``base`` limit
    node.
    """

    power: np.ndarray
    inlet_air_temperature: np.ndarray
    outlet_air_temperature: np.ndarray
    base_temperature: np.ndarray
    source_base_temperature: np.ndarray
    source_base_centre_temperature: np.ndarray
    case_temperature: np.ndarray
    junction_temperature: np.ndarray
    fin_tip_temperature: np.ndarray
    junction_to_case_resistance: np.ndarray
    interface_resistance: np.ndarray
    spreading_resistance: np.ndarray
    base_conduction_resistance: np.ndarray
    sink_resistance: np.ndarray
    convection_heat_rate: np.ndarray
    radiation_heat_rate: np.ndarray
    heat_transfer_coefficient: np.ndarray
    fin_efficiency: np.ndarray
    surface_efficiency: np.ndarray
    volume_flow: np.ndarray
    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    approach_velocity: np.ndarray
    channel_velocity: np.ndarray
    pressure_drop: np.ndarray
    mass_flow: np.ndarray
    reynolds_number: np.ndarray
    warnings: tuple[str, ...] = field(default=())

    def node_temperature(self, node: str) -> np.ndarray:
        """Temperature of a limit node (``junction``, ``case`` or ``base``) [K]."""
        _check_node(node)
        return {
            "junction": self.junction_temperature,
            "case": self.case_temperature,
            "base": self.source_base_centre_temperature,
        }[node]

    @property
    def total_resistance(self) -> np.ndarray:
        """Junction to inlet air [K W⁻¹]."""
        return (
            self.junction_to_case_resistance
            + self.interface_resistance
            + self.spreading_resistance
            + self.base_conduction_resistance
            + self.sink_resistance
        )


def _above_base(node: str, below_source, source: HeatSource, below_source_centre=None):
    """Resistance from the mean base (fin roots) up to a limit node [K W⁻¹].

    ``below_source`` leads to the footprint-mean base temperature under the source (the case
    and junction sit on it); ``below_source_centre`` to its centre, the hottest point of the
    base, which is the ``base`` limit node when given (conservative).
    """
    if node == "base" and below_source_centre is not None:
        return below_source_centre
    above = below_source
    if node in ("case", "junction"):
        above = above + source.interface_resistance
    if node == "junction":
        above = above + source.junction_to_case_resistance
    return above


@contextlib.contextmanager
def _property_range_context():
    """Say which inputs drive a solve out of the air-property table, in one line."""
    try:
        yield
    except PropertyRangeError as exc:
        raise PropertyRangeError(
            "the solved air temperatures leave finkit's air-property range (200 to 500 K): "
            "the sink runs far too hot or the air too cold for this case; check source.power, "
            f"air.inlet_temperature, air.flow and the sink's size ({exc})"
        ) from None


def solve_case_airflow(geometry, flow, air, bypass=None, options=DEFAULT_OPTIONS):
    """:func:`solve_airflow` with the solvers' one-line message when the air leaves the
    property table; the result can be passed to :func:`solve_temperatures` and
    :func:`solve_allowable_power` as ``airflow`` (it does not depend on the power)."""
    with _property_range_context():
        return solve_airflow(geometry, flow, air, bypass, options)


def _check_node(node: str) -> None:
    if node not in NODES:
        raise InputError(f"limit node: got {node!r}; allowed: {', '.join(NODES)}")


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


def _is_shrouded(bypass: Bypass | None):
    """True (per design) where a shroud touches the fin tips: no bypass, or no top gap."""
    if bypass is None:
        return True
    return np.asarray(bypass.top_gap, float) <= 0


def _bypass_geometry(geometry, bypass: Bypass | None):
    """Flow area [m²] and hydraulic diameter [m] of each bypass branch, or None.

    Two branches: the two side gaps (``2 s H``, a slot of width s: ``D_h ≈ 2 s``) and the gap
    above the fin tips (``g (W + 2 s)``, ``D_h ≈ 2 g``). A branch with zero area is closed.
    """
    if bypass is None:
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


def _duct_area(geometry, bypass: Bypass | None) -> np.ndarray:
    frontal = _sink_frontal_area(geometry)
    if bypass is None:
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
    """
    if isinstance(geometry, PlateFinSink):
        flow = forced.plate_fin_channel_flow(
            volume_flow,
            geometry.base_width,
            geometry.fin_count,
            _passage_thickness(geometry.fin_thickness, options),
            geometry.fin_height,
            geometry.base_length,
            density,
            dynamic_viscosity,
            1.0,
            1.0,
            is_shrouded=is_shrouded,
            loss_model=options.loss_model,
        )
    else:
        flow = _pin_flow(geometry, volume_flow, density, dynamic_viscosity, 1.0, 1.0, options)
    return flow.pressure_drop * options.pressure_drop_factor


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
    bypass: Bypass | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
) -> _Airflow:
    """Volume flow through the fins and round them, and the pressure drop, for a forced case.

    The approach velocity of :class:`GivenVelocity` is taken over the duct section (finned
    region plus bypass gaps). With a bypass, the flow splits so that the fins and the gaps see
    the same pressure difference (docs/methods.md h). With a fan, the fan curve, scaled to the inlet
    density and by ``options.fan_pressure_factor``, is crossed with that combined system curve
    plus any extra series loss.
    """
    inlet = air_properties(air.inlet_temperature, air.pressure)
    rho, mu = inlet.density, inlet.dynamic_viscosity
    shrouded = _is_shrouded(bypass)
    gaps = _bypass_geometry(geometry, bypass)

    def dp_sink(q):
        return sink_pressure_drop(geometry, q, rho, mu, is_shrouded=shrouded, options=options)

    if gaps is not None:
        bypass_branches = _bypass_pressure_drop(geometry, bypass, gaps, rho, mu)

        def system(q):
            return split_among_branches(q, dp_sink, bypass_branches).pressure_drop

    else:
        system = dp_sink

    fan_with_bypass = None
    in_stall = False
    if isinstance(flow, FanDriven) and gaps is not None:
        fan_with_bypass = operating_point_with_bypass(
            flow.fan,
            dp_sink,
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

    if fan_with_bypass is not None:
        q_sink = fan_with_bypass.sink_volume_flow
        q_bypass = fan_with_bypass.bypass_volume_flow
        dp = fan_with_bypass.sink_pressure_drop
    elif gaps is not None:
        split = split_among_branches(total, dp_sink, bypass_branches)
        q_sink, q_bypass, dp = split.sink_volume_flow, split.bypass_volume_flow, split.pressure_drop
    else:
        q_sink, q_bypass = total, np.zeros_like(total)
        dp = dp_sink(total)
    approach = total / _duct_area(geometry, bypass)
    return _Airflow(
        *np.broadcast_arrays(
            np.asarray(total, float),
            np.asarray(q_sink, float),
            np.asarray(q_bypass, float),
            np.asarray(approach, float),
            np.asarray(dp, float),
        ),
        warnings=(STALL_WARNING,) if in_stall else (),
    )


# --------------------------------------------------------------------------------------
# Forced convection: fins and base to air
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Convection:
    sink_resistance: np.ndarray
    heat_transfer_coefficient: np.ndarray
    fin_efficiency: np.ndarray
    surface_efficiency: np.ndarray
    tip_ratio: np.ndarray  # fin tip excess over base excess (to the reference air)
    channel_velocity: np.ndarray
    reynolds_number: np.ndarray
    warnings: tuple[str, ...]


def _adiabatic_fin(h, k, section, length):
    """Efficiency [-] and m·L [-] of a fin with adiabatic tip at ``length`` (Table 3.4 case B)."""
    fin = fins.uniform_fin(
        length, section.perimeter, section.cross_section_area, k, h, tip="adiabatic"
    )
    return fin.efficiency, fin.fin_parameter * length


@dataclass(frozen=True)
class _Surface:
    """Air-side conductance of the finned surface for one heat-transfer model."""

    heat_transfer_coefficient: np.ndarray
    fin_efficiency: np.ndarray
    fin_parameter_length: np.ndarray  # m·L of the fins [-]
    fin_area: np.ndarray
    base_area: np.ndarray
    conductance: np.ndarray  # eta_f h A_f + h_b A_b [W/K]
    inlet_referenced: np.ndarray
    channel_velocity: np.ndarray
    reynolds_number: np.ndarray
    transverse_biot: np.ndarray
    warnings: tuple[str, ...]


def _plate_surface(geometry, material, film, airflow, is_shrouded, options, method):
    flow = forced.plate_fin_channel_flow(
        airflow.sink_volume_flow,
        geometry.base_width,
        geometry.fin_count,
        _passage_thickness(geometry.fin_thickness, options),
        geometry.fin_height,
        geometry.base_length,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
        is_shrouded=is_shrouded,
        method=method,
        loss_model=options.loss_model,
    )
    h = options.effective_heat_transfer_coefficient(flow.heat_transfer_coefficient)
    t, H, L, N = (
        geometry.fin_thickness,
        geometry.fin_height,
        geometry.base_length,
        geometry.fin_count,
    )
    # Corrected length only when the tip sees the flow (docs/methods.md, pitfall 5).
    length = np.where(is_shrouded, H, H + t / 2.0)
    plate = fins.rectangular_fin_section(t, L, include_edges=False)
    eta_f, mL = _adiabatic_fin(h, material.thermal_conductivity, plate, length)
    # Wetted fin faces: the two faces of each of the N - 1 channels. The outer faces of the
    # two end fins face the duct wall or a bypass gap, where the channel model sends no air;
    # they are not counted (conservative; the end fins' efficiency is taken as that of the
    # others, also conservative since they are cooled on one face only).
    fin_area = (N - 1.0) * 2.0 * length * L
    base_area = geometry.base_exposed_area
    return _Surface(
        heat_transfer_coefficient=np.asarray(h, float),
        fin_efficiency=np.asarray(eta_f, float),
        fin_parameter_length=np.asarray(mL, float),
        fin_area=np.asarray(fin_area, float),
        base_area=np.asarray(base_area, float),
        conductance=eta_f * h * fin_area + h * base_area,
        inlet_referenced=np.asarray(flow.is_inlet_referenced, bool),
        channel_velocity=np.asarray(flow.channel_velocity, float),
        reynolds_number=np.asarray(flow.modified_reynolds, float),
        transverse_biot=h * (t / 2.0) / material.thermal_conductivity,
        warnings=tuple(forced.plate_fin_flow_warnings(flow)),
    )


def _pin_surface(geometry, material, film, airflow, is_shrouded, options):
    flow = _pin_flow(
        geometry,
        airflow.sink_volume_flow,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
        options,
    )
    h = options.effective_heat_transfer_coefficient(flow.heat_transfer_coefficient)
    D, H = geometry.pin_diameter, geometry.pin_height
    length = np.where(is_shrouded, H, H + D / 4.0)
    eta_f, mL = _adiabatic_fin(h, material.thermal_conductivity, fins.pin_fin_section(D), length)
    fin_area = geometry.pin_count * np.pi * D * length
    base_area = geometry.base_exposed_area
    h_base = options.effective_heat_transfer_coefficient(flow.base_heat_transfer_coefficient)
    return _Surface(
        heat_transfer_coefficient=np.asarray(h, float),
        fin_efficiency=np.asarray(eta_f, float),
        fin_parameter_length=np.asarray(mL, float),
        fin_area=np.asarray(fin_area, float),
        base_area=np.asarray(base_area, float),
        conductance=eta_f * h * fin_area + h_base * base_area,
        inlet_referenced=np.asarray(flow.is_inlet_referenced, bool),
        channel_velocity=np.asarray(flow.max_velocity, float),
        reynolds_number=np.asarray(flow.reynolds_max, float),
        transverse_biot=h * (D / 4.0) / material.thermal_conductivity,
        warnings=tuple(forced.pin_fin_flow_warnings(flow)),
    )


def _surface_resistance(surface: _Surface, capacity):
    """Sink resistance (mean base to inlet air) of a surface before the clamp [K W⁻¹].

    Inlet-referenced h (Teertstra): the air heating is inside h already (docs/methods.md e2, j).
    Bulk-referenced h: isothermal-base effectiveness, eps = 1 - exp(-NTU) (docs/methods.md j).
    """
    effectiveness = -np.expm1(-surface.conductance / capacity)
    return np.where(
        surface.inlet_referenced, 1.0 / surface.conductance, 1.0 / (effectiveness * capacity)
    )


def _pick(choose_second, first: _Surface, second: _Surface) -> _Surface:
    """Element by element, ``second`` where ``choose_second`` else ``first``."""
    fields = {}
    for name in first.__dataclass_fields__:
        if name == "warnings":
            continue
        fields[name] = np.where(choose_second, getattr(second, name), getattr(first, name))
    return _Surface(**fields, warnings=tuple(dict.fromkeys(first.warnings + second.warnings)))


def _forced_convection(
    geometry, material, film, airflow: _Airflow, inlet_density, is_shrouded, options: ModelOptions
):
    """Sink resistance (mean base to inlet air) for forced flow at given film properties."""
    capacity = inlet_density * airflow.sink_volume_flow * film.specific_heat  # W/K
    warnings: list[str] = []
    if isinstance(geometry, PlateFinSink):
        args = (geometry, material, film, airflow, is_shrouded, options)
        if options.plate_channel_method == "lower":
            # The choice is made on the correlations themselves; a hand-given h then takes
            # the reference (inlet or bulk) of the model chosen, as it would with that model.
            plain = replace(options, heat_transfer_coefficient_override=None)
            plain_args = (geometry, material, film, airflow, is_shrouded, plain)
            laminar = _plate_surface(*plain_args, "teertstra")
            bracket = _plate_surface(*plain_args, "vdi")
            r_laminar = _surface_resistance(laminar, capacity)
            r_bracket = _surface_resistance(bracket, capacity)
            use_bracket = r_bracket > r_laminar
            warnings += _bracket_warning(laminar, r_laminar, r_bracket)
            if options.heat_transfer_coefficient_override is not None:
                laminar = _plate_surface(*args, "teertstra")
                bracket = _plate_surface(*args, "vdi")
            surface = _pick(use_bracket, laminar, bracket)
        else:
            surface = _plate_surface(*args, options.plate_channel_method)
    else:
        surface = _pin_surface(geometry, material, film, airflow, is_shrouded, options)
    warnings = list(surface.warnings) + warnings
    warnings += one_dimensional_fin_warnings(surface.transverse_biot)
    total_area = surface.fin_area + surface.base_area
    eta_o = 1.0 - surface.fin_area / total_area * (1.0 - surface.fin_efficiency)
    r_sink = _surface_resistance(surface, capacity)
    # An inlet-referenced model can never beat the fully heated limit m cp (guard of e2).
    clamped = r_sink < 1.0 / capacity
    if np.any(clamped):
        warnings.append(
            "sink resistance: the correlation gave less than the air-heating limit 1/(m_dot c_p) "
            f"= {float(np.max(1.0 / capacity)):.3g} K/W, so the limit is used (the air leaves "
            "at the base temperature; the correlation is outside what it can describe here)"
        )
    r_sink = np.maximum(r_sink, 1.0 / capacity) * options.sink_resistance_factor
    return _Convection(
        sink_resistance=r_sink,
        heat_transfer_coefficient=surface.heat_transfer_coefficient,
        fin_efficiency=surface.fin_efficiency,
        surface_efficiency=np.asarray(eta_o, float),
        tip_ratio=1.0 / np.cosh(surface.fin_parameter_length),
        channel_velocity=surface.channel_velocity,
        reynolds_number=surface.reynolds_number,
        warnings=tuple(dict.fromkeys(warnings)),
    )


def _bracket_warning(laminar: _Surface, r_laminar, r_bracket) -> list[str]:
    """Say by how much the two plate-channel models differ where the flow is near transition
    (the transition message of ``forced.plate_channel_transition_warnings`` names the case)."""
    if not any(w.startswith("plate channel: Re_Dh") for w in laminar.warnings):
        return []
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.asarray(r_bracket / r_laminar, float)
    ratio = ratio[np.isfinite(ratio)]
    if ratio.size == 0:
        return []
    lo, hi = 100 * (ratio.min() - 1), 100 * (ratio.max() - 1)
    shown = f"{lo:+.0f} %" if abs(hi - lo) < 0.5 else f"{lo:+.0f} % to {hi:+.0f} %"
    used = (
        "the laminar-developing value is used"
        if np.all(ratio <= 1)
        else "the VDI value is used"
        if np.all(ratio > 1)
        else "the higher of the two is used for each design"
    )
    return [
        "plate channel: near transition the VDI model gives a sink resistance "
        f"{shown} against the laminar-developing (Teertstra) model; {used} (conservative)"
    ]


def _chain(geometry, material, source: HeatSource, sink_resistance):
    """Spreading (footprint mean), base conduction and spreading to the footprint centre
    below the source for a given sink resistance [K W⁻¹]."""
    spread = base_spreading(geometry, material, source, sink_resistance)
    return spread.average, spread.one_dimensional, spread.maximum


def base_spreading(geometry, material, source: HeatSource, sink_resistance):
    """Spreading resistance of the source into the base, exact rectangular series [K W⁻¹].

    The centred ``footprint_length x footprint_width`` source on the ``base_length x
    base_width`` plate, with the sink resistance as a uniform coefficient
    ``h = 1/(R_sink A_base)`` on the finned face (docs/methods.md i2; Yovanovich, Muzychka & Culham
    1999). Both the footprint mean (``average``) and the footprint centre (``maximum``, the
    hottest point of the base) are returned, with ``one_dimensional`` = ``t/(k A_base)``.

    The equal-area-disc closed form of Song, Lee & Au (docs/methods.md i1) is not used here: it is
    up to 18 % low for small sources on long plates (5 x 5 mm on 200 x 100 mm), beyond the
    2 % allowed for a replacement of the series.
    """
    plate_area = np.multiply(geometry.base_width, geometry.base_length)
    return spreading_resistance_rectangular_series(
        source.footprint_length,
        source.footprint_width,
        geometry.base_length,
        geometry.base_width,
        geometry.base_thickness,
        material.thermal_conductivity,
        1.0 / (np.asarray(sink_resistance, float) * plate_area),
    )


def _assemble(
    *,
    power,
    air: Air,
    source: HeatSource,
    spreading,
    base_conduction,
    sink_resistance,
    mass_flow,
    spreading_centre=None,
    specific_heat,
    conv_tip_ratio,
    convection_heat_rate,
    radiation_heat_rate,
    h,
    eta_f,
    eta_o,
    airflow: _Airflow | None,
    channel_velocity,
    reynolds,
    warnings,
):
    power = np.asarray(power, float)
    t_in = np.asarray(air.inlet_temperature, float)
    base = t_in + power * sink_resistance
    source_base = base + power * (spreading + base_conduction)
    centre = spreading if spreading_centre is None else spreading_centre
    source_base_centre = base + power * (centre + base_conduction)
    case = source_base + power * source.interface_resistance
    junction = case + power * source.junction_to_case_resistance
    with np.errstate(divide="ignore", invalid="ignore"):
        outlet = t_in + np.where(mass_flow > 0, power / (mass_flow * specific_heat), np.nan)
    # Fin tip referred to the inlet air: a conservative (hotter) estimate for a hot-surface check.
    tip = t_in + (base - t_in) * conv_tip_ratio
    nan = np.full_like(power * 1.0, np.nan)
    if airflow is None:
        flows = (nan, nan, nan, nan, nan)
    else:
        flows = (
            airflow.volume_flow,
            airflow.sink_volume_flow,
            airflow.bypass_volume_flow,
            airflow.approach_velocity,
            airflow.pressure_drop,
        )
    arrays = np.broadcast_arrays(
        power,
        t_in,
        outlet,
        base,
        source_base,
        case,
        junction,
        tip,
        source.junction_to_case_resistance,
        source.interface_resistance,
        spreading,
        base_conduction,
        sink_resistance,
        convection_heat_rate,
        radiation_heat_rate,
        h,
        eta_f,
        eta_o,
        *flows,
        channel_velocity,
        mass_flow,
        reynolds,
    )
    arrays = [np.array(a, dtype=float) for a in arrays]
    (
        power,
        t_in,
        outlet,
        base,
        source_base,
        case,
        junction,
        tip,
        r_jc,
        r_int,
        r_sp,
        r_base,
        r_sink,
        q_conv,
        q_rad,
        h,
        eta_f,
        eta_o,
        volume_flow,
        sink_flow,
        bypass_flow,
        approach,
        dp,
        channel_velocity,
        mass_flow,
        reynolds,
    ) = arrays
    return SinkSolution(
        power=power,
        inlet_air_temperature=t_in,
        outlet_air_temperature=outlet,
        base_temperature=base,
        source_base_temperature=source_base,
        source_base_centre_temperature=source_base_centre,
        case_temperature=case,
        junction_temperature=junction,
        fin_tip_temperature=tip,
        junction_to_case_resistance=r_jc,
        interface_resistance=r_int,
        spreading_resistance=r_sp,
        base_conduction_resistance=r_base,
        sink_resistance=r_sink,
        convection_heat_rate=q_conv,
        radiation_heat_rate=q_rad,
        heat_transfer_coefficient=h,
        fin_efficiency=eta_f,
        surface_efficiency=eta_o,
        volume_flow=volume_flow,
        sink_volume_flow=sink_flow,
        bypass_volume_flow=bypass_flow,
        approach_velocity=approach,
        channel_velocity=channel_velocity,
        pressure_drop=dp,
        mass_flow=mass_flow,
        reynolds_number=reynolds,
        warnings=tuple(dict.fromkeys(warnings)),
    )


def _solve_forced(
    geometry, material, source, air, flow, bypass, options, *, power=None, limit=None, airflow=None
):
    """Forced convection in either mode: ``power`` given, or ``limit=(node, temperature)``.

    ``airflow``: the :func:`solve_airflow` result of these same inputs, when the caller has it
    (the airflow does not depend on the power, so both design questions can share one).
    """
    if airflow is None:
        airflow = solve_airflow(geometry, flow, air, bypass, options)
    inlet = air_properties(air.inlet_temperature, air.pressure)
    is_shrouded = _is_shrouded(bypass)
    t_in = np.asarray(air.inlet_temperature, float)
    base_excess = np.zeros_like(t_in)
    for _ in range(FILM_ITERATIONS):
        film = air_properties(t_in + 0.5 * base_excess, air.pressure)
        conv = _forced_convection(
            geometry, material, film, airflow, inlet.density, is_shrouded, options
        )
        r_sp, r_base, r_sp_centre = _chain(geometry, material, source, conv.sink_resistance)
        if limit is None:
            q = np.asarray(power, float)
        else:
            node, t_limit = limit
            above_base = _above_base(node, r_sp + r_base, source, r_sp_centre + r_base)
            q = np.maximum(t_limit - t_in, 0.0) / (conv.sink_resistance + above_base)
        previous, base_excess = base_excess, q * conv.sink_resistance
        if np.all(np.abs(base_excess - previous) <= FILM_TOLERANCE):
            break
    mass_flow = inlet.density * airflow.sink_volume_flow
    return _assemble(
        power=q,
        air=air,
        source=source,
        spreading=r_sp,
        spreading_centre=r_sp_centre,
        base_conduction=r_base,
        sink_resistance=conv.sink_resistance,
        mass_flow=mass_flow,
        specific_heat=film.specific_heat,
        conv_tip_ratio=conv.tip_ratio,
        convection_heat_rate=q,
        radiation_heat_rate=np.zeros_like(np.asarray(q, float)),
        h=conv.heat_transfer_coefficient,
        eta_f=conv.fin_efficiency,
        eta_o=conv.surface_efficiency,
        airflow=airflow,
        channel_velocity=conv.channel_velocity,
        reynolds=conv.reynolds_number,
        warnings=conv.warnings + airflow.warnings,
    )


# --------------------------------------------------------------------------------------
# Natural convection with radiation (vertical plate fins)
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _NaturalState:
    power: np.ndarray
    convection_heat_rate: np.ndarray
    radiation_heat_rate: np.ndarray
    h: np.ndarray
    eta_f: np.ndarray
    eta_o: np.ndarray
    tip_ratio: np.ndarray
    rayleigh: np.ndarray
    rayleigh_length: np.ndarray
    surface_conductance: np.ndarray  # convection + radiation conductance of the surface [W/K]
    optimum_spacing: np.ndarray
    elenbaas: np.ndarray


def _natural_heat_rate(
    geometry: PlateFinSink, material, air: Air, base_excess, options: ModelOptions
) -> _NaturalState:
    """Heat leaving a vertical plate-fin sink at a given base excess temperature [W].

    Convection: Bar-Cohen & Rohsenow channel coefficient on the channel faces and the base
    between fins, Churchill & Chu on the outer faces of the two end fins, fin efficiency of the
    adiabatic-tip fin with corrected length. Radiation: envelope method at the mean surface
    temperature T_in + eta_o (T_b - T_in) (docs/methods.md g2, g3).
    """
    t_in = np.asarray(air.inlet_temperature, float)
    t_sur = t_in if air.surroundings_temperature is None else air.surroundings_temperature
    base_excess = np.asarray(base_excess, float)
    surface = t_in + base_excess
    film = air_properties(t_in + 0.5 * base_excess, air.pressure)
    passage = _passage_thickness(geometry.fin_thickness, options)
    spacing = geometry.fin_spacing - (passage - geometry.fin_thickness)
    nat = natural.plate_fin_array_natural(
        spacing,
        geometry.fin_height,
        geometry.base_length,
        geometry.fin_thickness,
        geometry.fin_count,
        geometry.base_width,
        surface,
        t_in,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
    )
    channel_h = nat.heat_transfer_coefficient
    if options.natural_channel_method == "elenbaas":
        channel_h = (
            natural.nusselt_vertical_channel_elenbaas(nat.elenbaas)
            * film.thermal_conductivity
            / spacing
        )
    h = options.effective_heat_transfer_coefficient(channel_h)
    t, H, L, N = (
        geometry.fin_thickness,
        geometry.fin_height,
        geometry.base_length,
        geometry.fin_count,
    )
    length = H + t / 2.0
    plate = fins.rectangular_fin_section(t, L, include_edges=False)
    eta_f, mL = _adiabatic_fin(h, material.thermal_conductivity, plate, length)
    # Channel faces: 2(N-1) faces; the two outer faces of the end fins get the isolated-plate h.
    inner_fin_area = 2.0 * (N - 1) * H * L + N * t * L
    outer_fin_area = 2.0 * H * L
    base_area = geometry.base_exposed_area
    h_out = options.effective_heat_transfer_coefficient(nat.outer_face_heat_transfer_coefficient)
    eta_out, _ = _adiabatic_fin(h_out, material.thermal_conductivity, plate, length)
    conductance = eta_f * h * inner_fin_area + eta_out * h_out * outer_fin_area + h * base_area
    # Surface efficiency: heat from the real surface over that from the same surface at the
    # base temperature, each face with its own coefficient.
    eta_o = conductance / (h * (inner_fin_area + base_area) + h_out * outer_fin_area)
    q_conv = conductance * base_excess
    mean_surface = t_in + np.minimum(eta_o, 1.0) * base_excess
    rad = plate_fin_radiation(
        geometry.fin_spacing,
        H,
        L,
        t,
        N,
        geometry.base_width,
        geometry.base_length,
        geometry.base_thickness,
        material.emissivity,
        mean_surface,
        t_sur,
    )
    return _NaturalState(
        # A sink-resistance calibration divides the whole surface conductance (convection and
        # radiation) by its factor, so R_sink = theta / power scales by exactly that factor.
        power=(q_conv + rad.heat_rate) / options.sink_resistance_factor,
        convection_heat_rate=q_conv / options.sink_resistance_factor,
        radiation_heat_rate=np.asarray(rad.heat_rate, float) / options.sink_resistance_factor,
        h=np.asarray(h, float),
        eta_f=np.asarray(eta_f, float),
        eta_o=np.asarray(eta_o, float),
        tip_ratio=1.0 / np.cosh(mL),
        rayleigh=np.asarray(nat.rayleigh_spacing, float),
        rayleigh_length=np.asarray(nat.rayleigh_length, float),
        surface_conductance=(conductance + np.asarray(rad.conductance, float))
        / options.sink_resistance_factor,
        optimum_spacing=np.asarray(nat.optimum_spacing, float),
        elenbaas=np.asarray(nat.elenbaas, float),
    )


def _find_base_excess(residual, shape, inlet_temperature, surroundings_temperature, upper=400.0):
    """Vectorised bracketed root of ``residual(base_excess)`` [K].

    The bracket starts below both the inlet air and the surroundings (with cold surroundings a
    lightly loaded sink settles below the inlet air, radiation taking more than the power) and
    ends where the film temperature would leave the air-property table (≤ 495 K).
    """
    below = np.minimum(np.asarray(surroundings_temperature, float) - inlet_temperature, 0.0)
    lo = np.broadcast_to(below - 1e-6, shape).copy()
    hi = np.broadcast_to(np.minimum(upper, 2.0 * (495.0 - inlet_temperature)), shape).copy()
    res = bracketed_root(residual, lo, hi, xatol=1e-9, xrtol=1e-10)
    if not np.all(res.is_converged):
        raise SolverError(
            "natural convection: no base temperature up to "
            f"{float(np.min(hi)):.0f} K above the inlet air satisfies the heat balance; "
            "check source.power against the sink's size"
        )
    return res.x


def _solve_natural(geometry, material, source, air, flow, options, *, power=None, limit=None):
    natural.natural_orientation_check(flow.orientation)
    if not isinstance(geometry, PlateFinSink):
        raise InputError(
            "sink.type: natural convection is covered for plate fins only "
            "(no published pin-fin array method in finkit)"
        )
    t_in = np.asarray(air.inlet_temperature, float)
    t_sur = t_in if air.surroundings_temperature is None else air.surroundings_temperature

    def rest(sink_resistance, node):
        spread = base_spreading(geometry, material, source, sink_resistance)
        return _above_base(
            node,
            spread.average + spread.one_dimensional,
            source,
            spread.maximum + spread.one_dimensional,
        )

    shape = np.broadcast_shapes(
        np.shape(t_in),
        np.shape(power if power is not None else 0.0),
        np.shape(limit[1] if limit else 0.0),
        np.shape(geometry.fin_count),
        np.shape(geometry.base_width),
        np.shape(geometry.fin_height),
        np.shape(material.thermal_conductivity),
        np.shape(source.interface_resistance),
        np.shape(source.junction_to_case_resistance),
        np.shape(options.heat_transfer_factor),
        np.shape(options.fouling_resistance),
        np.shape(options.deposit_thickness),
        np.shape(options.sink_resistance_factor),
        np.shape(
            0.0
            if options.heat_transfer_coefficient_override is None
            else options.heat_transfer_coefficient_override
        ),
        np.shape(material.emissivity),
        np.shape(air.pressure),
    )
    if limit is None:
        target = np.broadcast_to(np.asarray(power, float), shape)

        def residual(theta):
            return _natural_heat_rate(geometry, material, air, theta, options).power - target

    else:
        node, t_limit = limit

        def residual(theta):
            # The spreading boundary is the surface's own conductance (always positive);
            # theta / power is not, where radiation from warm surroundings comes in.
            state = _natural_heat_rate(geometry, material, air, theta, options)
            above = rest(1.0 / state.surface_conductance, node)
            return t_in + theta + np.maximum(state.power, 0.0) * above - t_limit

    theta = _find_base_excess(residual, shape, t_in, t_sur)
    state = _natural_heat_rate(geometry, material, air, theta, options)
    q = state.power
    with np.errstate(divide="ignore", invalid="ignore"):
        r_sink = np.where(q != 0, theta / q, 1.0 / state.surface_conductance)
    spread = base_spreading(geometry, material, source, 1.0 / state.surface_conductance)
    warnings = list(
        natural.plate_fin_natural_warnings(state.elenbaas, rayleigh_length=state.rayleigh_length)
    )
    warnings += one_dimensional_fin_warnings(
        state.h * geometry.fin_thickness / 2.0 / material.thermal_conductivity
    )
    return _assemble(
        power=q,
        air=air,
        source=source,
        spreading=spread.average,
        spreading_centre=spread.maximum,
        base_conduction=spread.one_dimensional,
        sink_resistance=r_sink,
        mass_flow=np.zeros_like(q),
        specific_heat=1.0,
        conv_tip_ratio=state.tip_ratio,
        convection_heat_rate=state.convection_heat_rate,
        radiation_heat_rate=state.radiation_heat_rate,
        h=state.h,
        eta_f=state.eta_f,
        eta_o=state.eta_o,
        airflow=None,
        channel_velocity=np.full_like(q, np.nan),
        reynolds=state.rayleigh,
        warnings=warnings,
    ), state


# --------------------------------------------------------------------------------------
# The two design questions
# --------------------------------------------------------------------------------------


def solve_temperatures(
    geometry: PlateFinSink | PinFinSink,
    material: SinkMaterial,
    source: HeatSource,
    air: Air,
    flow: Flow,
    bypass: Bypass | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
    *,
    airflow=None,
) -> SinkSolution:
    """At this power, how hot does each node get?

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs).
    material : SinkMaterial
        Sink conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    source : HeatSource
        Power [W], footprint [m], RθJC and interface resistance [K W⁻¹].
    air : Air
        Inlet air temperature [K] and pressure [Pa].
    flow : GivenVelocity, GivenVolumeFlow, FanDriven or NaturalConvection
        How the air moves.
    bypass : Bypass, optional
        Duct clearance round the sink (forced convection only); None = fully shrouded.
    options : ModelOptions, optional
        Model choices, calibration and fouling allowances.
    airflow : optional
        :func:`solve_airflow` of these same inputs, to reuse (forced convection); solved here
        when not given. No result is remembered between calls.

    Returns
    -------
    SinkSolution
        Node temperatures [K], resistances [K W⁻¹], flows, efficiencies and warnings.
    """
    with _property_range_context():
        if isinstance(flow, NaturalConvection):
            state = _solve_natural(
                geometry, material, source, air, flow, options, power=source.power
            )
            return state[0]
        return _solve_forced(
            geometry,
            material,
            source,
            air,
            flow,
            bypass,
            options,
            power=source.power,
            airflow=airflow,
        )


def solve_allowable_power(
    geometry: PlateFinSink | PinFinSink,
    material: SinkMaterial,
    source: HeatSource,
    air: Air,
    flow: Flow,
    limit_node: Literal["junction", "case", "base"],
    limit_temperature,
    bypass: Bypass | None = None,
    options: ModelOptions = DEFAULT_OPTIONS,
    *,
    airflow=None,
) -> SinkSolution:
    """At this temperature limit on a node, how much power can the sink carry?

    The power in ``source`` is ignored; the returned solution is the state at the allowable
    power (its ``power`` field), with the limit node exactly at ``limit_temperature`` [K].
    Air heating and the film-temperature property feedback are included. Where the inlet air
    is already at or above the limit, the allowable power is zero. ``airflow``: as in
    :func:`solve_temperatures`.
    """
    _check_node(limit_node)
    limit = (limit_node, np.asarray(limit_temperature, float))
    if isinstance(flow, NaturalConvection):
        t_in = np.asarray(air.inlet_temperature, float)
        if np.any(limit[1] <= t_in):
            raise InputError(
                "limit.temperature: must be above the inlet air temperature for natural "
                "convection (no heat can leave otherwise)"
            )
        with _property_range_context():
            return _solve_natural(geometry, material, source, air, flow, options, limit=limit)[0]
    with _property_range_context():
        return _solve_forced(
            geometry, material, source, air, flow, bypass, options, limit=limit, airflow=airflow
        )
