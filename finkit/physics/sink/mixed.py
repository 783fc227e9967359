"""Mixed convection at low forced flow: free convection (and radiation) beside a weak stream.

At a low approach velocity the forced-convection correlations give h below what buoyancy
alone would give (h well under 1 W m⁻² K⁻¹ as the flow stops), which no real sink shows. When
the case asks for it (``ModelOptions.free_convection``), the sink's forced and natural
conductances are combined by Churchill's power rule for assisting and transverse flows

    G_conv = (G_forced^n + G_free^n)^(1/n),   n = 3

(Churchill, S.W., "A comprehensive correlating equation for laminar, assisting, forced and free
convection", AIChE J. 23(1), 10-16, 1977; Incropera, DeWitt, Bergman & Lavine, Fundamentals of
Heat and Mass Transfer, 6th ed., Wiley, 2007, section 9.9, Eq. 9.64: n = 3 fits assisting and
transverse flows best, 7/2 or 4 being better for transverse flow over horizontal plates,
cylinders and spheres; taking 3 gives the lower combined value of the three, conservative).
Radiation, when credited, is added in parallel: ``G = G_conv + G_rad``.

Choice made here (finkit's, stated in the note): the rule is applied to the whole sink's
conductances referred to the inlet air, not to Nusselt numbers of one surface. ``G_forced`` is
the forced model's ``1/R_sink`` with the heating of the air inside it; ``G_free`` and
``G_rad`` are the natural-convection model's convective and radiative heat over the base
excess, at the same base excess. The rule then tends to the forced model at high velocity
(``G_free << G_forced``) and to the natural-convection model as the flow stops
(``G_forced -> 0`` with the mass flow), its two limits. A downward (opposing) flow is
refused: Churchill's minus sign lowers h and has no accepted form near flow reversal.
"""

from __future__ import annotations

import numpy as np

from finkit.physics.sink.inputs import Air, FreeConvectionCredit, ModelOptions, NaturalConvection
from finkit.physics.sink.natural import natural_heat_rate

__all__ = ["CHURCHILL_EXPONENT", "combine_conductances", "free_conductances", "mixed_conductance"]

#: Exponent of Churchill's combination for assisting and transverse flows (Incropera et al.
#: 6th ed. Eq. 9.64).
CHURCHILL_EXPONENT = 3.0

#: Smallest base excess at which the free conductances are evaluated [K] (h of natural
#: convection goes to 0 with the excess; the combination needs a finite value).
_SMALLEST_EXCESS = 1e-6


def combine_conductances(forced, free, radiation=0.0, exponent=CHURCHILL_EXPONENT):
    """Churchill's combination of forced and free convection, radiation in parallel [W K⁻¹].

    Parameters
    ----------
    forced : float or array_like
        Forced-convection conductance of the sink, inlet-referenced [W K⁻¹].
    free : float or array_like
        Natural-convection conductance of the same sink at the same base excess [W K⁻¹].
    radiation : float or array_like, optional
        Radiation conductance, heat over base excess [W K⁻¹]; 0 = no credit.
    exponent : float, optional
        Churchill's exponent n [-].

    Examples
    --------
    >>> round(float(combine_conductances(3.0, 4.0)), 6)  # (27 + 64)^(1/3)
    4.497941
    """
    forced = np.asarray(forced, float)
    free = np.asarray(free, float)
    return (forced**exponent + free**exponent) ** (1.0 / exponent) + np.asarray(radiation, float)


def free_conductances(
    geometry, material, air: Air, base_excess, options: ModelOptions, credit: FreeConvectionCredit
):
    """Natural-convection and radiation conductances of the sink at a base excess [W K⁻¹].

    Both are heat over the mean base excess above the inlet air (radiation zero unless
    ``credit.radiation``), from the natural-convection model of the stated orientation
    (:mod:`finkit.physics.sink.natural`); calibration factors apply as there.

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink [-].
    material : SinkMaterial
        Conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    air : Air
        Inlet air and surroundings [K], pressure [Pa].
    base_excess : array_like
        Mean base temperature less the inlet air temperature [K].
    options : ModelOptions
        Model options (calibration factors) [-].
    credit : FreeConvectionCredit
        The orientation and whether radiation is credited [-].
    """
    theta = np.maximum(np.asarray(base_excess, float), _SMALLEST_EXCESS)
    # An iterate hotter than the air-property table is evaluated at its edge (film 495 K).
    theta = np.minimum(theta, 2.0 * (495.0 - np.asarray(air.inlet_temperature, float)))
    state = natural_heat_rate(
        geometry, material, air, theta, options, NaturalConvection(credit.orientation)
    )
    free = np.asarray(state.convection_heat_rate, float) / theta
    radiation = (
        np.asarray(state.radiation_heat_rate, float) / theta if credit.radiation else 0.0 * free
    )
    return free, radiation


def mixed_conductance(geometry, material, air: Air, options: ModelOptions, forced, base_excess):
    """Sink conductance with the case's free-convection credit, and its radiation part [W K⁻¹].

    The forced solve calls this once per film-temperature pass (``options.free_convection``
    set): ``(G, G_rad)`` with ``G = (G_forced^3 + G_free^3)^(1/3) + G_rad``.

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink [-].
    material : SinkMaterial
        Conductivity [W m⁻¹ K⁻¹] and emissivity [-].
    air : Air
        Inlet air and surroundings [K], pressure [Pa].
    options : ModelOptions
        Model options with ``free_convection`` set [-].
    forced : array_like
        Forced-convection conductance ``1/R_sink`` [W K⁻¹].
    base_excess : array_like
        Mean base temperature less the inlet air temperature [K].
    """
    free, radiation = free_conductances(
        geometry, material, air, base_excess, options, options.free_convection
    )
    return combine_conductances(forced, free, radiation), radiation
