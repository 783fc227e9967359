"""Several heat sources on one base: each source's base, case and junction temperature.

The sink model (:mod:`finkit.physics.sink.forced`, :mod:`~finkit.physics.sink.natural`) gives
the mean temperature of the finned face, ``T_b = T_in + Q R_sink``, for the total power ``Q``
of all sources. Above it, the base temperature field is the superposition of every source's
spreading solution on the flux channel (:mod:`finkit.physics.base_field`), with the sink
resistance as a uniform coefficient ``h = 1/(R_sink A_base)`` on the finned face (the same
boundary the single-source chain uses). Each source then adds its own interface and
junction-to-case resistances::

    T_base,i  = T_b + sum_j G_ij P_j + dT_air,i       (mean under source i; peak likewise)
    T_case,i  = T_base,i + P_i R_TIM,i
    T_j,i     = T_case,i + P_i R_jc,i

**Air warming along the flow** (forced convection). The sink resistance refers the mean base
to the inlet air, so it already holds the mean warming of the air. Where a source sits along
the flow changes the air it sees: with the air assumed to warm linearly from inlet to outlet
(heat picked up evenly along the base), a source centred at ``x`` from the inlet edge sees
``(T_out - T_in)(x/L - 1/2)`` more than the mean. finkit adds this for sources downstream of
the middle and gives **no credit** upstream of it (``max(0, ...)``): a conservative choice,
since the air near the inlet warms faster than linearly when the sources sit there. In natural
convection no placement term is added (the array correlation refers to the ambient air); a
warning says so.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.physics.base_field import (
    BasePlate,
    SourceFootprint,
    base_rise_map,
    shared_rise_table,
    source_influence,
)
from finkit.physics.spreading import spreading_resistance_rectangular_series

__all__ = [
    "NATURAL_PLACEMENT_WARNING",
    "PlacedSource",
    "SourceLayout",
    "SourcesState",
    "base_map",
    "placement_offset",
    "solve_sources",
]

#: Warning for several sources in still air (no placement term for the air).
NATURAL_PLACEMENT_WARNING = (
    "sources: in natural convection the base field assumes the fins cool the base evenly; "
    "a source near the top of a vertical sink sees warmer air than this shows"
)


@dataclass(frozen=True)
class PlacedSource:
    """One device on the base.

    Attributes
    ----------
    name : str
        Its name in tables and messages.
    power : float
        Heat it dissipates into the base [W].
    footprint : SourceFootprint
        Footprint and centre on the base, from the inlet-side corner [m].
    junction_to_case_resistance : float
        RθJC for the cooled side [K W⁻¹].
    interface_resistance : float
        Interface material between its case and the base [K W⁻¹].
    """

    name: str
    power: float
    footprint: SourceFootprint
    junction_to_case_resistance: float = 0.0
    interface_resistance: float = 0.0


@dataclass(frozen=True)
class SourceLayout:
    """The sources on a base and how the base conducts.

    Attributes
    ----------
    sources : tuple of PlacedSource
        The devices, in the order of the case.
    plate : BasePlate
        The base as a plate: its size [m] and its in-plane and through-thickness conductivity
        (a solid base has both equal to the metal's) [W m⁻¹ K⁻¹].
    """

    sources: tuple[PlacedSource, ...]
    plate: BasePlate

    @property
    def total_power(self) -> float:
        """Sum of the stated source powers [W]."""
        return float(sum(s.power for s in self.sources))

    @property
    def names(self) -> tuple[str, ...]:
        """Names of the sources, in order [-]."""
        return tuple(s.name for s in self.sources)


@dataclass(frozen=True)
class SourcesState:
    """Temperatures of every source at one state of the sink (arrays over the sources).

    For many designs every array has the design axes first and the source axis last.

    Attributes
    ----------
    names : tuple of str
        Source names [-].
    power : numpy.ndarray
        Power of each source at this state [W].
    base_mean : numpy.ndarray
        Mean base temperature under each footprint [K].
    base_peak : numpy.ndarray
        Highest base temperature under each footprint [K].
    case : numpy.ndarray
        Case temperature of each source [K].
    junction : numpy.ndarray
        Junction temperature of each source [K].
    air_offset : numpy.ndarray
        Placement term of the air added to each source [K].
    peak_along, peak_across : numpy.ndarray
        Where the peak under each footprint is, from the inlet-side corner [m].
    base_temperature : numpy.ndarray
        Mean temperature of the finned face (the sink model's base node) [K].
    heat_transfer_coefficient : numpy.ndarray
        Coefficient on the finned face used for the field, ``1/(R_sink A_base)`` [W m⁻² K⁻¹].
    air_rise : numpy.ndarray
        Outlet less inlet air temperature; 0 in natural convection [K].
    """

    names: tuple[str, ...]
    power: np.ndarray
    base_mean: np.ndarray
    base_peak: np.ndarray
    case: np.ndarray
    junction: np.ndarray
    air_offset: np.ndarray
    peak_along: np.ndarray
    peak_across: np.ndarray
    base_temperature: np.ndarray
    heat_transfer_coefficient: np.ndarray
    air_rise: np.ndarray

    def node(self, node: str) -> np.ndarray:
        """Temperature of a limit node of every source [K].

        Parameters
        ----------
        node : str
            ``junction``, ``case`` or ``base`` (the peak under the footprint) [-].

        Returns
        -------
        numpy.ndarray
            The node of each source, the source axis last [K].
        """
        return {"junction": self.junction, "case": self.case, "base": self.base_peak}[node]


def placement_offset(centre_along, length: float, air_rise: float):
    """Air placement term of a source centred ``centre_along`` from the inlet edge [K].

    Parameters
    ----------
    centre_along : float or array_like
        Distance of the footprint centre (or of a point) from the inlet edge [m].
    length : float
        Base length along the flow [m].
    air_rise : float
        Outlet less inlet air temperature [K].
    """
    frac = np.asarray(centre_along, float) / length - 0.5
    return air_rise * np.maximum(frac, 0.0)


def solve_sources(
    layout: SourceLayout,
    *,
    base_temperature,
    sink_resistance,
    air_rise,
    total_power=None,
    powers=None,
) -> SourcesState:
    """Every source's temperatures from the sink's mean base temperature (superposition).

    The sink quantities may be arrays over designs (a sweep, the allowable-power steps); the
    sources then keep their shares of the stated powers and every array of the result has
    the design axes first and the source axis last.

    Parameters
    ----------
    layout : SourceLayout
        The sources and the base [-].
    base_temperature : float or array_like
        Mean temperature of the finned face from the sink model, at ``total_power`` [K].
    sink_resistance : float or array_like
        Finned face to the air (inlet in forced convection, ambient in natural) [K W⁻¹].
    air_rise : float or array_like
        Outlet less inlet air temperature (0 in natural convection) [K].
    total_power : float, array_like or None
        Total power the sink model was solved at; each source keeps its share of the stated
        powers. None: the stated powers [W].
    powers : array_like or None
        Each source's power (one design), in place of the shares of ``total_power``; the sink
        model's ``base_temperature`` and ``air_rise`` must then be for their sum [W].
    """
    stated = np.array([s.power for s in layout.sources], float)
    share = stated / stated.sum() if stated.sum() > 0 else np.full(stated.size, 1 / stated.size)
    plate = layout.plate
    footprints = [s.footprint for s in layout.sources]
    r_sink = np.asarray(sink_resistance, float)
    h = 1.0 / (r_sink * plate.length * plate.width)
    t_b = np.asarray(base_temperature, float)
    rise = np.asarray(air_rise, float)
    if powers is not None:
        # one design, powers as given: the full influence matrix
        power = np.asarray(powers, float)
        influence = source_influence(plate, footprints, float(h))
        mean = influence.mean @ power
        along, across = influence.point_along, influence.point_across
        peak, where = _peak(influence.points @ power, along, plate.length, rise)
    else:
        total = stated.sum() if total_power is None else np.asarray(total_power, float)
        t_b, r_sink, rise, total = np.broadcast_arrays(t_b, r_sink, rise, total)
        h = 1.0 / (r_sink * plate.length * plate.width)
        power = total[..., None] * share
        if _is_lone_centred(layout):
            per_watt_mean, per_watt_points, along, across = _centred_series(layout, h)
            mean = total[..., None] * per_watt_mean
            points = total[..., None, None] * per_watt_points
            peak, where = _peak(points, along, plate.length, rise)
        else:
            # Many designs (a Monte Carlo's samples): the peaks are sought block by block, the
            # same sums as forming every sample point of every design at once.
            table = shared_rise_table(plate, footprints, share, h)
            along, across = table.point_along, table.point_across
            mean = total[..., None] * table.mean
            peak, where = table.peak(total, rise, placement_offset(along, plate.length, 1.0))
    offset = placement_offset(
        np.array([f.centre_along for f in footprints]), plate.length, rise[..., None]
    )
    base_peak = t_b[..., None] + peak
    base_mean = t_b[..., None] + mean + offset
    r_int = np.array([s.interface_resistance for s in layout.sources], float)
    r_jc = np.array([s.junction_to_case_resistance for s in layout.sources], float)
    case = base_mean + power * r_int
    rows = np.arange(len(footprints))
    return SourcesState(
        names=layout.names,
        power=power,
        base_mean=base_mean,
        base_peak=base_peak,
        case=case,
        junction=case + power * r_jc,
        air_offset=offset,
        peak_along=along[rows, where],
        peak_across=across[rows, where],
        base_temperature=t_b,
        heat_transfer_coefficient=h,
        air_rise=rise,
    )


def _peak(points, along, length: float, rise):
    """Highest rise under each source with the air placement term of each sample point, and
    the index of that point [K], [-]."""
    # The peak point may lie downstream of the centre: its own placement term counts.
    field = points + placement_offset(along, length, rise[..., None, None])
    where = np.argmax(field, axis=-1)
    return np.take_along_axis(field, where[..., None], axis=-1)[..., 0], where


def _is_lone_centred(layout: SourceLayout) -> bool:
    """One source, centred on an isotropic base: the single-source chain's own series applies."""
    if len(layout.sources) != 1:
        return False
    f, plate = layout.sources[0].footprint, layout.plate
    tol = 1e-9 * max(plate.length, plate.width)
    return (
        abs(f.centre_along - plate.length / 2) <= tol
        and abs(f.centre_across - plate.width / 2) <= tol
        and plate.in_plane_conductivity == plate.through_conductivity
    )


def _centred_series(layout: SourceLayout, h):
    """Rises per watt of one centred source from the centred rectangular series (the one the
    single-source chain uses, same truncation), shaped as a SharedRiseTable's mean and points:
    the mean, and the centre as the one sample point (the hottest point of a centred source)."""
    f, plate = layout.sources[0].footprint, layout.plate
    spread = spreading_resistance_rectangular_series(
        f.length,
        f.width,
        plate.length,
        plate.width,
        plate.thickness,
        plate.in_plane_conductivity,
        h,
    )
    one_d = spread.one_dimensional
    mean = np.asarray(spread.average + one_d)[..., None]
    peak = np.asarray(spread.maximum + one_d)[..., None, None]
    return mean, peak, np.array([[f.centre_along]]), np.array([[f.centre_across]])


def base_map(layout: SourceLayout, state: SourcesState, *, points_along=81, points_across=61):
    """Plan-view base temperature of a solved state, for a map [m], [m], [K].

    Parameters
    ----------
    layout : SourceLayout
        The sources and the base [-].
    state : SourcesState
        The solved state (powers, mean base, coefficient, air rise) [-].
    points_along, points_across : int
        Grid points along and across the flow [-].

    Returns
    -------
    tuple of numpy.ndarray
        ``(along, across, temperature[across, along])``: the top-face base temperature with
        the placement term of the air [m], [m], [K].
    """
    along, across, rise = base_rise_map(
        layout.plate,
        [s.footprint for s in layout.sources],
        state.power,
        state.heat_transfer_coefficient,
        points_along=points_along,
        points_across=points_across,
    )
    offset = placement_offset(along, layout.plate.length, state.air_rise)
    return along, across, state.base_temperature + rise + offset[None, :]
