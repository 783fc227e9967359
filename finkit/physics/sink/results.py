"""What the heat-sink model returns: the solution with every node and resistance."""

from __future__ import annotations

import contextlib
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from finkit.errors import InputError, PropertyRangeError
from finkit.physics.sink.airflow import (
    solve_airflow,
)
from finkit.physics.sink.inputs import (
    DEFAULT_OPTIONS,
    NODES,
    HeatSource,
)

__all__ = [
    "SinkSolution",
    "solve_case_airflow",
]


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

    With several sources on the base (:mod:`finkit.physics.sink.sources`), ``sources`` holds
    each source's temperatures, and the four source nodes above hold the hottest value of any
    source at that node (the case and junction of different sources may differ); the
    resistances then describe the total power spread over the whole base.
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
    sources: Any = None

    def node_temperature(self, node: str) -> np.ndarray:
        """Temperature of a limit node (``junction``, ``case`` or ``base``) [K].

        Parameters
        ----------
        node : {"junction", "case", "base"}
            The node [-].
        """
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
    :func:`solve_allowable_power` as ``airflow`` (it does not depend on the power).

    Parameters
    ----------
    geometry : PlateFinSink or PinFinSink
        The sink (fields may be arrays for a sweep over designs) [-].
    flow : GivenVelocity, GivenVolumeFlow or FanDriven
        How the flow is set (velocity, volume flow or fan) [-].
    air : Air
        Inlet air temperature [K] and pressure [Pa].
    bypass : Bypass, optional
        Duct clearance round the sink; None = fully shrouded, no bypass [-].
    options : ModelOptions, optional
        Model choices, pressure-drop and fan-pressure factors, extra series loss [-].
    """
    with _property_range_context():
        return solve_airflow(geometry, flow, air, bypass, options)


def _check_node(node: str) -> None:
    if node not in NODES:
        raise InputError(f"limit node: got {node!r}; allowed: {', '.join(NODES)}")
