"""Correlation spread: the case solved with each plausible correlation, the spread reported."""

from __future__ import annotations

import itertools
from dataclasses import dataclass, replace

import numpy as np

from finkit.model.design import SinkInputs, airflow_of, limit_node_temperature, solve
from finkit.model.review.scenarios import (
    _allowable_power,
)
from finkit.physics.correlations import forced
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink.inputs import (
    NATURAL_CHANNEL_METHODS,
    PLATE_CHANNEL_CHOICES,
    NaturalConvection,
)
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "CorrelationSpread",
    "SPREAD_QUANTITIES",
    "SpreadRow",
    "correlation_spread",
]


# --------------------------------------------------------------------------------------
# Correlation spread
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class SpreadRow:
    """Headline results with one combination of correlations.

    Attributes
    ----------
    label : str
        The combination, e.g. ``plate_channel_method=vdi, loss_model=kays_london`` [-].
    methods : dict
        Option name -> method key [-].
    is_chosen : bool
        The case's own combination [-].
    junction_temperature, node_temperature : float
        At the stated power [K].
    sink_resistance : float
        [K W⁻¹].
    pressure_drop : float
        [Pa] (NaN in natural convection).
    volume_flow : float
        [m³ s⁻¹] (NaN in natural convection).
    allowable_power : float
        At the limit less the required margin [W].
    """

    label: str
    methods: dict[str, str]
    is_chosen: bool
    junction_temperature: float
    node_temperature: float
    sink_resistance: float
    pressure_drop: float
    volume_flow: float
    allowable_power: float


SPREAD_QUANTITIES = (
    "junction_temperature",
    "node_temperature",
    "sink_resistance",
    "pressure_drop",
    "volume_flow",
    "allowable_power",
)


@dataclass(frozen=True)
class CorrelationSpread:
    """Model-form spread: the same case with each accepted alternative correlation.

    Attributes
    ----------
    rows : tuple of SpreadRow
        Every combination of the alternatives that apply (the chosen one first).
    axes : dict
        Option name -> the methods tried [-]; empty when finkit has only one accepted
        correlation for this case's physics.
    spread : dict
        Quantity -> max - min over the rows (same unit as the quantity).
    relative_spread : dict
        Quantity -> spread over the chosen row's value; for temperatures, over the chosen
        row's rise above the inlet air (prediction error is judged against the rise) [-].
    statement : str
        One line for the note [-].
    """

    rows: tuple[SpreadRow, ...]
    axes: dict[str, tuple[str, ...]]
    spread: dict[str, float]
    relative_spread: dict[str, float]
    statement: str

    @property
    def chosen(self) -> SpreadRow:
        """The case's own combination."""
        return next(r for r in self.rows if r.is_chosen)


def _spread_axes(inputs: SinkInputs) -> dict[str, tuple[str, ...]]:
    if isinstance(inputs.flow, NaturalConvection):
        # The two channel correlations are for vertical fins; other orientations have one.
        vertical = inputs.flow.orientation == "vertical-fins"
        candidates = {"natural_channel_method": NATURAL_CHANNEL_METHODS} if vertical else {}
    elif isinstance(inputs.geometry, PlateFinSink):
        candidates = {
            "plate_channel_method": PLATE_CHANNEL_CHOICES,
            "loss_model": forced.LOSS_MODELS,
        }
    else:
        # Pin banks: two heat-transfer correlations (Zukauskas, Gnielinski) and their lower
        # envelope; one pressure-drop method (forced.PIN_BANK_PRESSURE_DROP_METHODS).
        candidates = {"pin_bank_method": forced.PIN_BANK_METHODS}
    return {k: tuple(v) for k, v in candidates.items() if len(v) > 1}


def correlation_spread(
    inputs: SinkInputs,
    *,
    stated: SinkSolution | None = None,
    at_margin: SinkSolution | None = None,
) -> CorrelationSpread:
    """Headline results with each accepted alternative correlation, and their spread.

    Parameters
    ----------
    inputs : SinkInputs
        The case; its own model choices give the chosen row. [-]
    stated : SinkSolution, optional
        ``solve(inputs)`` when the caller has it (the chosen row is then not solved again) [-].
    at_margin : SinkSolution, optional
        ``allowable(inputs)`` when the caller has it, likewise [-].

    Returns
    -------
    CorrelationSpread
        One row per combination of the alternatives that apply to the case (plate-fin forced
        flow: ``sink.PLATE_CHANNEL_CHOICES`` x ``forced.LOSS_MODELS``; natural convection:
        ``sink.NATURAL_CHANNEL_METHODS``; pin fins: ``forced.PIN_BANK_METHODS``), each a full
        re-solve
        (with a fan, the operating point moves with the loss model), and the spread
        ``max - min`` of each headline quantity, absolute and relative to the chosen model.

    Notes
    -----
    The spread shows model-form uncertainty between accepted correlations only; each
    correlation also has its own scatter against its data (often ±15 % or more), which the
    spread does not include.
    """
    axes = _spread_axes(inputs)
    chosen = {name: getattr(inputs.options, name) for name in axes}
    combos = [dict(zip(axes, values, strict=True)) for values in itertools.product(*axes.values())]
    combos.sort(key=lambda c: c != chosen)
    if not combos:
        combos = [{}]
    rows = []
    # The heat-transfer correlation does not move the flow; the loss model (and the pin
    # bank's method, by its pressure drop) can: one airflow per combination of those.
    airflows = {}
    for combo in combos:
        variant = replace(inputs, options=replace(inputs.options, **combo))
        flow_key = (variant.options.loss_model, variant.options.pin_bank_method)
        if flow_key not in airflows:
            airflows[flow_key] = airflow_of(variant)
        airflow = airflows[flow_key]
        is_chosen = combo == chosen
        sol = stated if is_chosen and stated is not None else solve(variant, airflow=airflow)
        rows.append(
            SpreadRow(
                label=", ".join(f"{k}={v}" for k, v in combo.items()) or "as chosen",
                methods=dict(combo),
                is_chosen=is_chosen,
                junction_temperature=float(sol.junction_temperature),
                node_temperature=float(limit_node_temperature(inputs, sol)),
                sink_resistance=float(sol.sink_resistance),
                pressure_drop=float(sol.pressure_drop),
                volume_flow=float(sol.volume_flow),
                allowable_power=_allowable_power(
                    variant, airflow, stated=sol, known=at_margin if is_chosen else None
                ),
            )
        )
    chosen_row = rows[0]
    spread, relative = {}, {}
    for q in SPREAD_QUANTITIES:
        values = np.array([getattr(r, q) for r in rows])
        if np.all(np.isnan(values)):
            spread[q] = relative[q] = float("nan")
            continue
        spread[q] = float(np.nanmax(values) - np.nanmin(values))
        reference = getattr(chosen_row, q)
        if q.endswith("temperature"):
            # relative to the rise above the inlet air, not to the absolute temperature
            reference = reference - float(np.max(inputs.air.inlet_temperature))
        relative[q] = spread[q] / reference if reference else float("nan")
    if axes:
        tried = "; ".join(f"{k}: {', '.join(v)}" for k, v in axes.items())
        statement = (
            f"Model-form spread over {len(rows)} combinations of accepted correlations "
            f"({tried}): junction "
            f"temperature {spread['junction_temperature']:.1f} K, sink resistance "
            f"{100 * relative['sink_resistance']:.0f} % of the chosen model. Each correlation's "
            "own scatter against its data comes on top."
        )
    else:
        statement = (
            "finkit has one accepted correlation for this case's physics; no model-form spread "
            "can be shown. The correlation's own scatter against its data still applies."
        )
    return CorrelationSpread(
        rows=tuple(rows), axes=axes, spread=spread, relative_spread=relative, statement=statement
    )
