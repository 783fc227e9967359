"""Natural convection: the best whole number of plate fins for a vertical sink in still air."""

from __future__ import annotations

from dataclasses import replace
from typing import NamedTuple

import numpy as np

from finkit.case.bounds import ManufacturingBounds
from finkit.errors import InputError
from finkit.model.design import SinkInputs, allowable, solve
from finkit.physics.correlations.natural import optimum_fin_spacing_bar_cohen_rohsenow
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink.inputs import NaturalConvection

__all__ = [
    "NaturalFinCountOptimum",
    "optimum_fin_count_natural",
]


# --------------------------------------------------------------------------------------
# Natural convection: best whole number of fins
# --------------------------------------------------------------------------------------


class NaturalFinCountOptimum(NamedTuple):
    """Best fin count of a vertical plate-fin sink in natural convection.

    Attributes
    ----------
    fin_count : int
        The best count [-].
    fin_spacing : float
        Its clear gap [m].
    value : float
        The objective at the best count: heat rate [W] or limit-node temperature [K].
    fin_counts : numpy.ndarray
        Every count evaluated [-].
    values : numpy.ndarray
        The objective at every count [W or K].
    fin_spacings : numpy.ndarray
        Gap of every count [m].
    optimum_spacing_bar_cohen_rohsenow : float
        ``S_opt = 2.714 (g β ΔT / (ν α L))^(-1/4)`` for the fin length and the base excess of the
        best design, air at its film temperature; NaN for an orientation other than
        ``"vertical-fins"`` (the optimum is for vertical fins) [m].
    objective : str
        ``heat_rate`` or ``junction_temperature``.
    """

    fin_count: int
    fin_spacing: float
    value: float
    fin_counts: np.ndarray
    values: np.ndarray
    fin_spacings: np.ndarray
    optimum_spacing_bar_cohen_rohsenow: float
    objective: str


def optimum_fin_count_natural(
    inputs: SinkInputs,
    *,
    objective: str = "heat_rate",
    base_temperature_difference: float | None = None,
    fin_counts=None,
    bounds: ManufacturingBounds | None = None,
) -> NaturalFinCountOptimum:
    """Best whole number of vertical plate fins in natural convection, fin size fixed.

    Parameters
    ----------
    inputs : SinkInputs
        A natural-convection plate-fin case (fin thickness and height are kept) [SI].
    objective : {"heat_rate", "junction_temperature"}
        ``heat_rate``: most heat at a fixed base excess temperature (the classic optimum-spacing
        question); ``junction_temperature``: coolest junction at the case's power [-].
    base_temperature_difference : float, optional
        Base minus inlet air temperature for ``heat_rate`` [K]; default: the case's mean base
        excess at its power.
    fin_counts : array_like of int, optional
        Counts to evaluate; default every count from 2 up to the one that leaves the minimum
        gap of ``bounds``. [-]
    bounds : ManufacturingBounds, optional
        Only ``min_fin_gap`` is used, for the default counts. [-]

    Returns
    -------
    NaturalFinCountOptimum
        Best count, its spacing, the objective over all counts, and the Bar-Cohen & Rohsenow
        optimum spacing for comparison.

    Notes
    -----
    For ``heat_rate`` the heat is found with :func:`finkit.physics.sink.solve_allowable_power` with
    the
    limit on the ``base`` node and the source spread over the whole base with no interface or
    junction resistance, so that the spreading resistance vanishes; the base node then differs
    from the mean base only by the one-dimensional conduction through the base plate,
    ``Q t_b / (k W L)``, well under 1 % of the excess for usual plates. All counts are solved in
    one vectorised call.

    The Bar-Cohen & Rohsenow optimum maximises ``Nu_S / S²`` (heat per unit volume) of an
    array of isothermal, zero-thickness plates. A real array differs: fins have thickness (a
    fixed base width holds fewer channels), fin efficiency is below one, the two outer faces
    and the base see other coefficients, and the count is a whole number. The best count's gap
    therefore agrees with ``S_opt`` only approximately (see the tests).

    References
    ----------
    Bar-Cohen, A., Rohsenow, W.M., "Thermally optimum spacing of vertical, natural convection
    cooled, parallel plates", J. Heat Transfer 106(1), 116-123, 1984.
    """
    if not isinstance(inputs.flow, NaturalConvection):
        raise InputError("optimum_fin_count_natural: needs a natural-convection case")
    if not isinstance(inputs.geometry, PlateFinSink):
        raise InputError("optimum_fin_count_natural: needs a plate-fin case")
    if objective not in ("heat_rate", "junction_temperature"):
        raise InputError(f"objective: got {objective!r}; allowed: heat_rate, junction_temperature")
    g = inputs.geometry
    w, t = float(g.base_width), float(g.fin_thickness)
    if fin_counts is None:
        bounds = ManufacturingBounds() if bounds is None else bounds
        gap = max(bounds.min_fin_gap, 1e-6)
        n_max = int(np.floor((w + gap) / (t + gap) + 1e-9))
        if n_max < 2:
            raise InputError(
                "optimum_fin_count_natural: not even two fins fit with the minimum gap"
            )
        counts = np.arange(2, n_max + 1, dtype=float)
    else:
        counts = np.asarray(fin_counts, float).ravel()
    geometry = replace(g, fin_count=counts)
    spacings = np.asarray(geometry.fin_spacing, float)
    t_in = float(np.asarray(inputs.air.inlet_temperature))
    if objective == "heat_rate":
        theta = base_temperature_difference
        if theta is None:
            theta = float(solve(inputs).base_temperature) - t_in
        if not theta > 0:
            raise InputError(f"base_temperature_difference: got {theta!r}; must be > 0 K")
        source = replace(
            inputs.source,
            footprint_length=float(g.base_length),
            footprint_width=w,
            interface_resistance=0.0,
            junction_to_case_resistance=0.0,
        )
        sol = allowable(
            replace(inputs, source=source, limit_node="base", limit_temperature=t_in + theta),
            margin=0.0,
            geometry=geometry,
        )
        values = np.asarray(sol.power, float)
        i = int(np.argmax(values))
        film_excess = theta
    else:
        sol = solve(inputs, geometry=geometry)
        values = np.asarray(sol.junction_temperature, float)
        i = int(np.argmin(values))
        film_excess = float(np.asarray(sol.base_temperature)[i]) - t_in
    film = t_in + 0.5 * film_excess
    air = air_properties(film, inputs.air.pressure)
    nu = float(air.kinematic_viscosity)
    alpha = float(air.thermal_diffusivity)
    s_opt = (
        float(
            optimum_fin_spacing_bar_cohen_rohsenow(
                float(g.base_length), film_excess, film, nu, alpha
            )
        )
        if inputs.flow.orientation == "vertical-fins"
        else float("nan")  # Bar-Cohen & Rohsenow's optimum is for vertical fins only
    )
    return NaturalFinCountOptimum(
        fin_count=int(counts[i]),
        fin_spacing=float(spacings[i]),
        value=float(values[i]),
        fin_counts=counts,
        values=values,
        fin_spacings=spacings,
        optimum_spacing_bar_cohen_rohsenow=s_opt,
        objective=objective,
    )
