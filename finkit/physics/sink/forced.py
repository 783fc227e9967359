"""Forced convection: fins and base to air (the thermal chain of a forced-air sink)."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from finkit.constants import STANDARD_GRAVITY
from finkit.physics.correlations import forced
from finkit.physics.fins import analytic as fins
from finkit.physics.fins.analytic.groups import one_dimensional_fin_warnings
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink.airflow import (
    _Airflow,
    _is_shrouded,
    _pin_flow,
    solve_airflow,
)
from finkit.physics.sink.inputs import (
    FILM_ITERATIONS,
    FILM_TOLERANCE,
    Air,
    HeatSource,
    ModelOptions,
    _passage_thickness,
)
from finkit.physics.sink.results import (
    SinkSolution,
    _above_base,
)
from finkit.physics.spreading import spreading_resistance_rectangular_series

__all__ = [
    "RICHARDSON_LIMIT",
    "base_spreading",
    "buoyancy_warnings",
]

#: Richardson number ``Gr_L/Re_L^2`` above which buoyancy is not negligible beside the forced
#: flow. Forced convection dominates for ``Gr/Re^2 << 1``, free convection for ``>> 1`` and
#: both matter near 1 (Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed.,
#: section 9.9; from memory); finkit warns an order of magnitude early (common practice, no
#: source).
RICHARDSON_LIMIT = 0.1

#: Highest film temperature an iterate of the mixed-convection loop is evaluated at [K] (inside
#: the air-property table, which ends at 500 K).
_HOTTEST_FILM = 495.0


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


def buoyancy_warnings(base_excess, film_temperature, length, velocity) -> tuple[str, ...]:
    """A warning when buoyancy is not negligible beside the forced flow (low flow) [-].

    ``Ri = Gr_L/Re_L^2 = g beta dT L / V^2`` with ``beta = 1/T_film`` (ideal gas), ``dT`` the
    mean base excess over the inlet air, ``L`` the base length along the flow and ``V`` the
    channel velocity. finkit's forced-convection h leaves free convection out; above
    :data:`RICHARDSON_LIMIT` the warning says so (no credit is taken for the buoyant flow,
    which is conservative where it assists and may not be where it opposes).

    Parameters
    ----------
    base_excess : float or array_like
        Mean base temperature less the inlet air temperature [K].
    film_temperature : float or array_like
        Film temperature, inlet plus half the excess [K].
    length : float or array_like
        Base length along the flow [m].
    velocity : float or array_like
        Air velocity between the fins [m s⁻¹].
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        ri = (
            STANDARD_GRAVITY
            * np.asarray(base_excess, float)
            / np.asarray(film_temperature, float)
            * np.asarray(length, float)
            / np.asarray(velocity, float) ** 2
        )
    ri = ri[np.isfinite(ri)]
    if ri.size == 0 or np.max(ri) <= RICHARDSON_LIMIT:
        return ()
    high = float(np.max(ri))
    return (
        f"mixed convection: Richardson number Gr_L/Re_L^2 = {high:.2g} is above "
        f"{RICHARDSON_LIMIT:g}: at this low flow buoyancy is not negligible beside the forced "
        "flow, and finkit's forced-convection h leaves it out (no credit taken: conservative "
        "where buoyancy assists, not where it opposes the flow); treat the result as an "
        "estimate and check with a test",
    )


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

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink; its base length, width and thickness are used [-].
    material : SinkMaterial
        Sink metal; its thermal conductivity [W m⁻¹ K⁻¹] is used.
    source : HeatSource
        The device; its footprint length and width [m] are used.
    sink_resistance : float or array_like
        Resistance from the finned face of the base to the air (fins and exposed base) [K W⁻¹].
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
    # Long by design: the thermal chain node by node from the air to the junction, every node an
    # array of the batch.
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
    geometry,
    material,
    source,
    air,
    flow,
    bypass,
    options,
    *,
    power=None,
    limit=None,
    airflow=None,
    mixed=None,
):
    """Forced convection in either mode: ``power`` given, or ``limit=(node, temperature)``.

    ``airflow``: the :func:`solve_airflow` result of these same inputs, when the caller has it
    (the airflow does not depend on the power, so both design questions can share one).
    ``mixed``: with ``options.free_convection`` set, ``mixed(G_forced, base_excess) ->
    (G, G_rad)`` (:func:`finkit.physics.sink.mixed.mixed_conductance` bound to the design).
    """
    if airflow is None:
        airflow = solve_airflow(geometry, flow, air, bypass, options)
    inlet = air_properties(air.inlet_temperature, air.pressure)
    is_shrouded = _is_shrouded(bypass)
    t_in = np.asarray(air.inlet_temperature, float)
    base_excess = np.zeros_like(t_in)
    credit = options.free_convection
    radiation = 0.0
    for _ in range(FILM_ITERATIONS):
        if credit is not None:
            # The first pass (forced alone) can be far too hot at a weak flow; later passes
            # fall back as the free conductance comes in. The result is checked below.
            base_excess = np.minimum(base_excess, _HOTTEST_FILM - t_in)
        film = air_properties(t_in + 0.5 * base_excess, air.pressure)
        conv = _forced_convection(
            geometry, material, film, airflow, inlet.density, is_shrouded, options
        )
        if credit is not None:
            combined, radiation = mixed(1.0 / conv.sink_resistance, base_excess)
            conv = replace(conv, sink_resistance=1.0 / combined)
        if limit is None:
            q = np.asarray(power, float)
        else:
            r_sp, r_base, r_sp_centre = _chain(geometry, material, source, conv.sink_resistance)
            node, t_limit = limit
            above_base = _above_base(node, r_sp + r_base, source, r_sp_centre + r_base)
            q = np.maximum(t_limit - t_in, 0.0) / (conv.sink_resistance + above_base)
        previous, base_excess = base_excess, q * conv.sink_resistance
        if np.all(np.abs(base_excess - previous) <= FILM_TOLERANCE):
            break
    if limit is None:
        # At a given power the film passes need only the sink resistance: the chain above the
        # base once, from the last pass (the same numbers as computing it on every pass).
        r_sp, r_base, r_sp_centre = _chain(geometry, material, source, conv.sink_resistance)
    if credit is not None and np.any(t_in + 0.5 * base_excess > _HOTTEST_FILM):
        air_properties(t_in + 0.5 * base_excess, air.pressure)  # raises the range error
    mass_flow = inlet.density * airflow.sink_volume_flow
    q_rad = np.asarray(q * conv.sink_resistance * radiation, float)
    if credit is None:
        buoyancy = buoyancy_warnings(
            base_excess, t_in + 0.5 * base_excess, geometry.base_length, conv.channel_velocity
        )
    else:
        buoyancy = ()
    sol = _assemble(
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
        convection_heat_rate=q - q_rad,
        radiation_heat_rate=q_rad + 0.0 * np.asarray(q, float),
        h=conv.heat_transfer_coefficient,
        eta_f=conv.fin_efficiency,
        eta_o=conv.surface_efficiency,
        airflow=airflow,
        channel_velocity=conv.channel_velocity,
        reynolds=conv.reynolds_number,
        warnings=conv.warnings + airflow.warnings + buoyancy,
    )
    if credit is None:
        return sol
    # Part of the heat leaves by free convection and radiation, not into the forced stream:
    # the mixed-mean outlet from all of it over m_dot c_p is an upper bound (kept), capped at
    # the base temperature, which the air cannot exceed.
    return replace(
        sol, outlet_air_temperature=np.minimum(sol.outlet_air_temperature, sol.base_temperature)
    )
