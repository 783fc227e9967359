"""Natural convection with radiation (plate fins: vertical, or horizontal base with fins up)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError, SolverError
from finkit.physics.airflow.roots import bracketed_root
from finkit.physics.correlations import natural
from finkit.physics.fins import analytic as fins
from finkit.physics.fins.analytic.groups import one_dimensional_fin_warnings
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.radiation import plate_fin_radiation
from finkit.physics.sink.forced import (
    _adiabatic_fin,
    _assemble,
    base_spreading,
)
from finkit.physics.sink.inputs import (
    Air,
    ModelOptions,
    _passage_thickness,
)

__all__ = ["natural_heat_rate"]
from finkit.physics.sink.results import (
    _above_base,
)
from finkit.validity import check_range

# --------------------------------------------------------------------------------------
# Natural convection with radiation (plate fins)
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
    geometry: PlateFinSink,
    material,
    air: Air,
    base_excess,
    options: ModelOptions,
    orientation: str = "vertical-fins",
) -> _NaturalState:
    """Heat leaving a plate-fin sink in still air at a given base excess temperature [W].

    Convection, ``"vertical-fins"``: Bar-Cohen & Rohsenow channel coefficient on the channel
    faces and the base between fins, Churchill & Chu on the outer faces of the two end fins.
    ``"horizontal-base-fins-up"``: the Jones & Smith array coefficient on every surface. Fin
    efficiency of the adiabatic-tip fin with corrected length. Radiation: envelope method at the
    mean surface temperature T_in + eta_o (T_b - T_in) (docs/methods.md g2, g3, g5).
    """
    t_in = np.asarray(air.inlet_temperature, float)
    t_sur = t_in if air.surroundings_temperature is None else air.surroundings_temperature
    base_excess = np.asarray(base_excess, float)
    surface = t_in + base_excess
    film = air_properties(t_in + 0.5 * base_excess, air.pressure)
    passage = _passage_thickness(geometry.fin_thickness, options)
    spacing = geometry.fin_spacing - (passage - geometry.fin_thickness)
    if orientation == "horizontal-base-fins-up":
        up = natural.horizontal_fin_array_natural(
            spacing,
            surface,
            t_in,
            film.density,
            film.dynamic_viscosity,
            film.thermal_conductivity,
            film.prandtl,
        )
        nan = np.full(np.shape(up.rayleigh_spacing), np.nan)
        nat = natural.PlateFinArrayNatural(
            rayleigh_spacing=up.rayleigh_spacing,
            elenbaas=nan,
            nusselt_spacing=up.nusselt_spacing,
            heat_transfer_coefficient=up.heat_transfer_coefficient,
            rayleigh_length=nan,
            nusselt_length=nan,
            # one array coefficient: the end fins' outer faces get the same h
            outer_face_heat_transfer_coefficient=up.heat_transfer_coefficient,
            optimum_spacing=nan,
            channel_area=nan,
            outer_face_area=nan,
        )
        channel_h = nat.heat_transfer_coefficient
    else:
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


def natural_heat_rate(geometry, material, air: Air, base_excess, options: ModelOptions, flow):
    """Heat leaving the sink by natural convection and radiation at a base excess [W].

    The state of the natural-convection model of ``flow.orientation`` (convective and
    radiative heat, h, efficiencies); used on its own by the natural-convection solve and
    beside a weak forced flow by :mod:`finkit.physics.sink.mixed`.

    Parameters
    ----------
    geometry : PlateFinSink
        The sink [-].
    material : SinkMaterial
        Conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    air : Air
        Inlet air and surroundings [K], pressure [Pa].
    base_excess : array_like
        Mean base temperature less the inlet air temperature [K].
    options : ModelOptions
        Model options [-].
    flow : NaturalConvection
        The orientation [-].
    """
    orientation = _checked_orientation(geometry, flow)
    return _natural_heat_rate(geometry, material, air, base_excess, options, orientation)


def _checked_orientation(geometry, flow) -> str:
    """The orientation of ``flow`` when finkit covers it for ``geometry``; else one-line errors."""
    orientation = natural.natural_orientation_check(flow.orientation)
    if not isinstance(geometry, PlateFinSink):
        raise InputError(
            "sink.type: natural convection is covered for plate fins only (no published "
            "pin-fin array correlation for still air could be confirmed for finkit)"
        )
    return orientation


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
    # Long by design: the broadcast shape of every input, the base-excess root (power given or limit
    # given) and the solution's nodes, which share the residual's closures.
    orientation = _checked_orientation(geometry, flow)
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
            return (
                _natural_heat_rate(geometry, material, air, theta, options, orientation).power
                - target
            )

    else:
        node, t_limit = limit

        def residual(theta):
            # The spreading boundary is the surface's own conductance (always positive);
            # theta / power is not, where radiation from warm surroundings comes in.
            state = _natural_heat_rate(geometry, material, air, theta, options, orientation)
            above = rest(1.0 / state.surface_conductance, node)
            return t_in + theta + np.maximum(state.power, 0.0) * above - t_limit

    theta = _find_base_excess(residual, shape, t_in, t_sur)
    state = _natural_heat_rate(geometry, material, air, theta, options, orientation)
    q = state.power
    with np.errstate(divide="ignore", invalid="ignore"):
        r_sink = np.where(q != 0, theta / q, 1.0 / state.surface_conductance)
    spread = base_spreading(geometry, material, source, 1.0 / state.surface_conductance)
    if orientation == "horizontal-base-fins-up":
        warnings = check_range(natural.JONES_SMITH_RANGE, state.rayleigh)
    else:
        warnings = list(
            natural.plate_fin_natural_warnings(
                state.elenbaas, rayleigh_length=state.rayleigh_length
            )
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
