"""What a solved case gives back: the result types and the units of results.json.

:class:`CaseResult` (with :class:`ReviewResult` and :class:`UncertaintyResult`) is what a note,
a batch or another tool reads; :meth:`CaseResult.to_json_dict` is the content of
``results.json``, every number with its unit (:data:`RESULT_UNITS`).
"""

from __future__ import annotations

import datetime as _dt
import json
from dataclasses import dataclass, field
from typing import Any

import numpy as np

import finkit
from finkit.constants import ZERO_CELSIUS
from finkit.model.design import SinkInputs
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "CaseResult",
    "RESULTS_SCHEMA_VERSION",
    "RESULT_UNITS",
    "ReviewResult",
    "SOURCE_UNITS",
    "UncertaintyResult",
    "source_json",
]

#: Names and units of the results every results.json carries (null where not applicable).
RESULT_UNITS = {
    "sink_resistance": "K/W",
    "total_resistance": "K/W",
    "base_temperature": "degC",
    "source_base_temperature": "degC",
    "source_base_centre_temperature": "degC",
    "case_temperature": "degC",
    "junction_temperature": "degC",
    "fin_tip_temperature": "degC",
    "limit_node_temperature": "degC",
    "limit_temperature": "degC",
    "allowable_power": "W",
    "power_at_limit": "W",
    "temperature_margin": "K",
    "required_margin": "K",
    "pressure_drop": "Pa",
    "volume_flow": "m^3/s",
    "sink_volume_flow": "m^3/s",
    "bypass_fraction": "1",
    "approach_velocity": "m/s",
    "fin_efficiency": "1",
    "surface_efficiency": "1",
    "fin_effectiveness": "1",
    "heat_transfer_coefficient": "W/(m^2 K)",
    "outlet_air_temperature": "degC",
    "radiation_fraction": "1",
    "fin_heat_rate": "W",
    "mass": "kg",
    "power": "W",
    "inlet_temperature": "degC",
}


#: Units of each entry of a source's row (several sources on the base).
SOURCE_UNITS = {
    "power": "W",
    "base_mean": "degC",
    "base_peak": "degC",
    "case": "degC",
    "junction": "degC",
    "node_temperature": "degC",
    "limit_temperature": "degC",
    "margin": "K",
    "required_margin": "K",
    "air_offset": "K",
    "allowable_power_alone": "W",
    "centre_along": "m",
    "centre_across": "m",
    "peak_along": "m",
    "peak_across": "m",
}


def source_json(row: dict) -> dict[str, Any]:
    """One source's row for results.json: text as it is, every number with its unit.

    Parameters
    ----------
    row : dict
        A row of :func:`finkit.model.design.source_rows`. [-]
    """
    out: dict[str, Any] = {}
    for key, value in row.items():
        if key in SOURCE_UNITS:
            out[key] = {"value": _finite(value), "unit": SOURCE_UNITS[key]}
        else:
            out[key] = value
    return out


#: Version of the layout of ``results.json`` (2: a ``governing`` block, a ``conditions`` list,
#: headline ``results`` of the governing condition and ``nominal`` kept beside them).
RESULTS_SCHEMA_VERSION = 2


def _finite(value) -> float | None:
    """A float for JSON, None for NaN or infinity (strict JSON has neither)."""
    value = float(value)
    return value if np.isfinite(value) else None


def _celsius(kelvin) -> dict[str, Any]:
    return {"value": float(kelvin) - ZERO_CELSIUS, "unit": "degC"}


def _json_results(values: dict[str, float | None]) -> dict[str, dict[str, Any]]:
    return {
        name: {"value": None if value is None else float(value), "unit": RESULT_UNITS.get(name, "")}
        for name, value in values.items()
    }


@dataclass(frozen=True)
class CaseResult:
    """Everything a note, a batch or another tool needs from one case.

    A heat-sink case is solved at every operating condition: the nominal one (the case as
    stated) and each scenario. The **governing** condition is the one with the least margin;
    the headline ``status`` and ``results`` are its values, and every output leads with it.

    Attributes
    ----------
    case : finkit.case.Case
        The validated case.
    status : str
        ``"pass"`` when the limit node of the governing condition stays at least
        ``required_margin`` below the limit.
    results : dict
        Name -> value of the governing condition, in the unit of :data:`RESULT_UNITS`
        (temperatures in °C; None where not applicable).
    warnings : tuple of str
        Validity ranges left, 1-D fin validity, scenarios milder than nominal, a calibration
        that reads low, input flags.
    solution : SinkSolution or None
        The heat-sink state of the nominal condition at the stated power.
    allowable : SinkSolution or None
        The nominal state at the allowable power (limit less the required margin).
    inputs : SinkInputs or None
        The nominal physics inputs.
    review : ReviewResult or None
        The conditions (``review.scenarios``), touch check, calibration, correlation spread and
        input flags.
    uncertainty : UncertaintyResult or None
        Monte Carlo and tornado over the case's tolerances, at the governing condition.
    transient : finkit.model.transient.TransientResult or None
        Time to the limit after the case's event and the thermal impedance (``transient:``
        block); None without one.
    """

    case: Any
    status: str
    results: dict[str, float | None]
    warnings: tuple[str, ...]
    solution: SinkSolution | None = None
    allowable: SinkSolution | None = None
    inputs: SinkInputs | None = None
    review: ReviewResult | None = None
    uncertainty: UncertaintyResult | None = None
    transient: Any = None
    created: str = field(
        default_factory=lambda: _dt.datetime.now(_dt.UTC).astimezone().isoformat(timespec="seconds")
    )

    @property
    def sources(self) -> tuple[dict, ...]:
        """With several sources: each one's row at the governing condition, the governing
        source first (°C, K, W, m; see :func:`finkit.model.design.source_rows`); else empty."""
        table = self.conditions
        return table.governing_row.sources if table is not None else ()

    @property
    def conditions(self):
        """Every condition, a :class:`~finkit.model.review.ScenarioTable` (None: single fins)."""
        return None if self.review is None else self.review.scenarios

    @property
    def governing(self):
        """The governing (least-margin) condition, a :class:`finkit.model.review.ScenarioRow`."""
        return None if self.conditions is None else self.conditions.governing_row

    @property
    def nominal(self):
        """The nominal condition (the case as stated), a :class:`.review.ScenarioRow`."""
        return None if self.conditions is None else self.conditions.rows[0]

    def to_json_dict(self) -> dict:
        """The content of ``results.json`` (layout :data:`RESULTS_SCHEMA_VERSION`)."""
        from finkit.case.schema import case_inputs_sha256

        out: dict[str, Any] = {
            "schema_version": RESULTS_SCHEMA_VERSION,
            "case": self.case.case_id,
            "status": self.status,
            "created": self.created,
            "inputs_sha256": case_inputs_sha256(self.case),
            "finkit_version": finkit.__version__,
            # The case as entered: what `finkit compare` diffs, and what the hash is checked on.
            "inputs": json.loads(json.dumps(self.case.entered, default=str)),
        }
        table = self.conditions
        limit = getattr(self.case, "limit", None)
        if limit is not None:
            out["limit"] = {
                "node": limit.node,
                "temperature": {"value": limit.temperature - ZERO_CELSIUS, "unit": "degC"},
                "required_margin": {"value": limit.required_margin, "unit": "K"},
                "requirement_id": getattr(limit, "requirement_id", None),
            }
        if table is not None:
            out["governing"] = table.governing_summary()
        out["warnings"] = list(self.warnings)
        out["results"] = _json_results(self.results)
        if table is not None and table.governing_row.sources:
            # several sources: each against its own limit at the governing condition
            out["governing_source"] = table.governing_row.governing_source
            out["sources"] = [source_json(row) for row in table.governing_row.sources]
        if table is not None:
            out["nominal"] = _json_results(table.rows[0].results)
            out["conditions"] = [row.to_json_dict() for row in table.rows]
        if self.review is not None:
            out["review"] = self.review.to_json_dict()
        if self.uncertainty is not None:
            out["uncertainty"] = self.uncertainty.to_json_dict()
        if self.transient is not None:
            out["transient"] = self.transient.to_json_dict()
        return out


@dataclass(frozen=True)
class ReviewResult:
    """What a reviewer asks beyond the nominal result (see :mod:`finkit.model.review`).

    Attributes
    ----------
    scenarios : finkit.model.review.ScenarioTable or None
        Every operating condition: nominal plus each named scenario, the governing
        (least-margin) one marked.
    touch : finkit.model.review.TouchResult or None
        Hottest accessible surface at the user's reference ambient against the user's limit.
    calibration : finkit.model.review.Calibration or None
        Empirical multiplier fitted to the case's measurements (applied if the case says so).
    spread : finkit.model.review.CorrelationSpread or None
        The governing condition's results with each accepted alternative correlation.
    flags : tuple of str
        Input sanity flags (also among the result's warnings).
    calibrated_governing : dict or None
        With measurements: the governing condition solved the other way round (with the fitted
        multiplier when the case does not apply it, without it when it does), results in the
        units of :data:`RESULT_UNITS`.
    """

    scenarios: Any = None
    touch: Any = None
    calibration: Any = None
    spread: Any = None
    flags: tuple[str, ...] = ()
    calibrated_governing: dict[str, float | None] | None = None

    def to_json_dict(self) -> dict:
        """Summary for ``results.json`` (temperatures in °C, differences in K)."""
        out: dict[str, Any] = {"flags": list(self.flags)}
        if self.touch is not None:
            out["touch"] = {
                "hottest_surface": self.touch.hottest_surface,
                "hottest_temperature": _celsius(self.touch.hottest_temperature),
                "limit_temperature": _celsius(self.touch.limit_temperature),
                "status": self.touch.status,
            }
        if self.calibration is not None:
            c = self.calibration
            out["calibration"] = {
                "target": c.target,
                "multiplier": {"value": c.multiplier, "unit": "1"},
                "standard_error": {"value": _finite(c.standard_error), "unit": "1"},
                "is_applied": c.is_applied,
                "mean_underprediction": {"value": c.mean_underprediction, "unit": "K"},
                "measurement_uncertainty": {"value": c.measurement_uncertainty, "unit": "K"},
                "reads_low": c.reads_low,
            }
            if self.calibrated_governing is not None:
                out["calibration"]["governing_other"] = {
                    "is_calibrated": not c.is_applied,
                    "results": _json_results(self.calibrated_governing),
                }
        if self.spread is not None:
            out["correlation_spread"] = [
                {
                    "model": r.label,
                    "junction_temperature": {
                        "value": r.junction_temperature - ZERO_CELSIUS,
                        "unit": "degC",
                    },
                    "allowable_power": {"value": r.allowable_power, "unit": "W"},
                }
                for r in self.spread.rows
            ]
        return out


@dataclass(frozen=True)
class UncertaintyResult:
    """Monte Carlo of the node temperatures and one-at-a-time sensitivity (tornado).

    Attributes
    ----------
    monte_carlo : finkit.model.uncertainty.MonteCarloResult
        Samples, percentiles and the probability of exceeding the limit.
    tornado : finkit.model.uncertainty.Tornado
        Limit-node temperature at the low and high end of each toleranced input.
    condition : str
        The operating condition both were run at (the governing one).
    """

    monte_carlo: Any
    tornado: Any
    condition: str = "nominal"

    def to_json_dict(self) -> dict:
        """Summary for ``results.json`` (temperatures in °C, probabilities as fractions)."""
        out: dict[str, Any] = {"condition": self.condition}
        for name, value in self.monte_carlo.summary().items():
            if name.startswith("std"):
                out[name] = {"value": float(value), "unit": "K"}
            elif name.endswith("_temperature"):
                out[name] = _celsius(value)
            else:
                out[name] = {"value": float(value), "unit": "1"}
        return out
