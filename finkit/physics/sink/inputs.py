"""Inputs of the heat-sink model: the source, material, air, flow situation and model options."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError
from finkit.physics.airflow.fans import FanCurve
from finkit.physics.correlations import forced

__all__ = [
    "Air",
    "Bypass",
    "DEFAULT_OPTIONS",
    "FILM_ITERATIONS",
    "FILM_TOLERANCE",
    "FREE_CONVECTION_DIRECTIONS",
    "FanDriven",
    "Flow",
    "FreeConvectionCredit",
    "FreeStream",
    "GivenVelocity",
    "GivenVolumeFlow",
    "HeatSource",
    "ModelOptions",
    "NATURAL_CHANNEL_METHODS",
    "NODES",
    "NaturalConvection",
    "PLATE_CHANNEL_CHOICES",
    "SinkMaterial",
]


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

#: Directions of a weak forced flow against gravity for which free convection may be credited:
#: ``"upward"`` (buoyancy aids the forced flow) and ``"horizontal"`` (buoyancy crosses it). Both
#: take the plus sign of Churchill's combination; a downward (opposing) flow is refused.
FREE_CONVECTION_DIRECTIONS = ("upward", "horizontal")


@dataclass(frozen=True)
class FreeConvectionCredit:
    """Credit taken for free convection, and optionally radiation, beside a weak forced flow.

    The sink's forced-convection conductance (inlet-referenced, air heating included) and its
    natural-convection conductance in the stated orientation are combined by Churchill's power
    rule ``G^n = G_forced^n + G_free^n`` with ``n = 3`` (Churchill, S.W., "A comprehensive
    correlating equation for laminar, assisting, forced and free convection", AIChE J. 23(1),
    10-16, 1977; Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., section
    9.9, Eq. 9.64, which gives n = 3 for assisting and transverse flows); radiation, when
    credited, is added in parallel. See :mod:`finkit.physics.sink.mixed`.

    Attributes
    ----------
    orientation : str
        Natural-convection orientation of the sink (a key ``natural_orientation_check`` accepts).
    forced_flow : str
        Direction of the forced flow against gravity, one of
        :data:`FREE_CONVECTION_DIRECTIONS`.
    radiation : bool
        Whether radiation to the surroundings is credited too.
    """

    orientation: str = "vertical-fins"
    forced_flow: str = "upward"
    radiation: bool = False

    def __post_init__(self):
        if self.forced_flow not in FREE_CONVECTION_DIRECTIONS:
            raise InputError(
                f"free_convection.forced_flow: got {self.forced_flow!r}; allowed: "
                f"{', '.join(FREE_CONVECTION_DIRECTIONS)} (a downward flow opposes buoyancy, "
                "which lowers h; no credit is taken for it)"
            )


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
class FreeStream:
    """The sink stands unshrouded in an approach stream: no duct, the stream goes round it.

    The third flow situation beside the fully ducted sink (no bypass) and the sink in a duct
    with clearance (:class:`Bypass`). The share of the stream through the fins comes from
    Lee's bypass balance with an unbounded bypass region
    (:func:`finkit.physics.airflow.sink_flow_free_stream_lee`); the fin tips see the air. A
    given approach velocity is that of the undisturbed stream; a given volume flow is the
    flow that stream carries through the sink's frontal area (approach velocity times base
    width times fin height). A fan is not defined against an unshrouded sink.
    """


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
    free_convection : FreeConvectionCredit or None
        Credit for free convection (and radiation) beside a weak forced flow (mixed
        convection); None (default) = forced convection alone, no credit.
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
    free_convection: FreeConvectionCredit | None = None

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
        """h after any hand override, the calibration factor and the fouling layer [W m⁻² K⁻¹].

        Parameters
        ----------
        heat_transfer_coefficient : float or array_like
            Air-side heat transfer coefficient from the correlations [W m⁻² K⁻¹].
        """
        h = np.asarray(heat_transfer_coefficient, float)
        if self.heat_transfer_coefficient_override is not None:
            h = np.asarray(self.heat_transfer_coefficient_override, float) + 0.0 * h
        h = h * self.heat_transfer_factor
        return h / (1.0 + h * np.asarray(self.fouling_resistance, float))


DEFAULT_OPTIONS = ModelOptions()


def _passage_thickness(thickness, options: ModelOptions):
    """Fin thickness (or pin diameter) the air passages see, with any deposit layer [m]."""
    return np.asarray(thickness, float) + 2.0 * np.asarray(options.deposit_thickness, float)
