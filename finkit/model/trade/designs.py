"""The trade study's designs and results: envelope, bounds, the design table and its result type."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.errors import InputError, SolverError
from finkit.model.design import SinkInputs
from finkit.model.trade.pareto import (
    pareto_front,
)
from finkit.physics.sink.inputs import NaturalConvection

__all__ = [
    "TradeStudy",
    "VIOLATIONS",
]


# --------------------------------------------------------------------------------------
# Envelope and manufacturing bounds
# --------------------------------------------------------------------------------------


#: Bit flags of :attr:`TradeStudy.violations` and the reason each stands for, per sink type.
VIOLATIONS = {
    1: {"plate-fin": "fins do not fit across the base", "pin-fin": "pins overlap or do not fit"},
    2: {"plate-fin": "fin gap below minimum", "pin-fin": "pin gap below minimum"},
    4: {"plate-fin": "fin thickness below minimum", "pin-fin": "pin diameter below minimum"},
    8: {
        "plate-fin": "fin height/gap above maximum",
        "pin-fin": "pin height/diameter above maximum",
    },
    16: {"plate-fin": "taller than the envelope", "pin-fin": "taller than the envelope"},
}
_FIT, _GAP, _THICK, _ASPECT, _HEIGHT = 1, 2, 4, 8, 16

# Film temperature kept below this when a poor design is solved at the case's power [K]: the
# air-property table ends at 500 K. Hotter designs are solved at a lower power and their
# temperature rises scaled up linearly (flagged ``is_extrapolated``).
_FILM_CEILING = 480.0


# --------------------------------------------------------------------------------------
# Trade-study result
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class TradeStudy:
    """Every design of a grid or sample and its results (flat arrays of one length).

    Designs that break a manufacturing bound are not solved: their results are NaN and
    :attr:`violations` says why.

    Attributes
    ----------
    sink_type : str
        ``plate-fin`` or ``pin-fin``.
    design : dict of str to numpy.ndarray
        The design variables: plate fins ``fin_count`` [-], ``fin_height``, ``fin_thickness``,
        ``fin_spacing`` [m]; pins ``pin_diameter``, ``pin_height``, ``transverse_pitch``,
        ``longitudinal_pitch`` [m], ``pin_count`` [-].
    sink_resistance, total_resistance : numpy.ndarray
        Mean base to inlet air; junction to inlet air [K W⁻¹].
    junction_temperature, limit_node_temperature, base_temperature : numpy.ndarray
        At the case's power [K].
    pressure_drop : numpy.ndarray
        Sink pressure drop at the operating point [Pa] (NaN in natural convection).
    volume_flow : numpy.ndarray
        Volume flow through the fins [m³ s⁻¹] (NaN in natural convection).
    mass : numpy.ndarray
        Metal mass, base included [kg].
    allowable_power : numpy.ndarray
        Power that puts the limit node at the limit less the required margin [W] (NaN when not
        computed; 0 when the inlet air leaves no margin).
    temperature_margin : numpy.ndarray
        ``limit - limit_node_temperature`` [K].
    violations : numpy.ndarray of int
        Sum of :data:`VIOLATIONS` flags (0 = can be made).
    is_extrapolated : numpy.ndarray of bool
        Designs so hot at the case's power that they were solved at a lower power and scaled.
    limit_node : str
    limit_temperature, required_margin : float
        The case's limit [K] and required margin [K].
    inputs : SinkInputs
        The case the study is built on.
    envelope : Envelope
    bounds : ManufacturingBounds
    """

    sink_type: str
    design: dict[str, np.ndarray]
    sink_resistance: np.ndarray
    total_resistance: np.ndarray
    junction_temperature: np.ndarray
    limit_node_temperature: np.ndarray
    base_temperature: np.ndarray
    pressure_drop: np.ndarray
    volume_flow: np.ndarray
    mass: np.ndarray
    allowable_power: np.ndarray
    temperature_margin: np.ndarray
    violations: np.ndarray
    is_extrapolated: np.ndarray
    limit_node: str
    limit_temperature: float
    required_margin: float
    inputs: SinkInputs = field(repr=False)
    envelope: Envelope = field(repr=False)
    bounds: ManufacturingBounds = field(repr=False)

    RESULTS = (
        "sink_resistance",
        "total_resistance",
        "junction_temperature",
        "limit_node_temperature",
        "base_temperature",
        "pressure_drop",
        "volume_flow",
        "mass",
        "allowable_power",
        "temperature_margin",
    )

    def __len__(self) -> int:
        return int(self.violations.size)

    @property
    def is_feasible(self) -> np.ndarray:
        """Designs that meet every manufacturing bound and fit the envelope."""
        return self.violations == 0

    @property
    def meets_limit(self) -> np.ndarray:
        """Feasible designs whose limit node is at least the required margin below the limit."""
        with np.errstate(invalid="ignore"):
            return self.is_feasible & (self.temperature_margin >= self.required_margin)

    @property
    def reasons(self) -> np.ndarray:
        """Why each design is infeasible (``""`` for a feasible design), as an array of str."""
        out = np.full(len(self), "", dtype=object)
        for code in np.unique(self.violations):
            if code == 0:
                continue
            text = "; ".join(
                labels[self.sink_type] for bit, labels in VIOLATIONS.items() if code & bit
            )
            out[self.violations == code] = text
        return out

    def column(self, name: str) -> np.ndarray:
        """A design variable or a result by name.

        Parameters
        ----------
        name : str
            A key of :attr:`design` or one of :attr:`RESULTS`. [-]
        """
        if name in self.design:
            return self.design[name]
        if name in self.RESULTS:
            return getattr(self, name)
        raise InputError(
            f"trade study column: got {name!r}; allowed: {', '.join((*self.design, *self.RESULTS))}"
        )

    def columns(self) -> dict[str, np.ndarray]:
        """Every design variable and result, plus ``is_feasible``, ``meets_limit``, ``reason``."""
        out = dict(self.design)
        out.update({name: getattr(self, name) for name in self.RESULTS})
        out["is_feasible"] = self.is_feasible
        out["meets_limit"] = self.meets_limit
        out["is_extrapolated"] = self.is_extrapolated
        out["reason"] = self.reasons
        return out

    def pareto(
        self,
        objectives: tuple[str, ...] | None = None,
        *,
        require_limit: bool = False,
    ) -> np.ndarray:
        """Indices of the non-dominated feasible designs, all objectives minimised.

        Parameters
        ----------
        objectives : tuple of str, optional
            Result columns to minimise. Default: sink resistance, pressure drop and mass in
            forced convection; sink resistance and mass in natural convection. [-]
        require_limit : bool
            Only designs that meet the limit with the required margin take part. [-]
        """
        if objectives is None:
            objectives = ("sink_resistance", "mass")
            if not isinstance(self.inputs.flow, NaturalConvection):
                objectives = ("sink_resistance", "pressure_drop", "mass")
        values = np.column_stack([self.column(n) for n in objectives])
        usable = self.meets_limit if require_limit else self.is_feasible
        values = np.where(usable[:, None], values, np.nan)
        return np.flatnonzero(pareto_front(values))

    def best(self, objective: str = "junction_temperature", *, require_limit=False) -> int:
        """Index of the feasible design with the smallest value of a column.

        Parameters
        ----------
        objective : str
            Column to minimise (see :meth:`column`). [-]
        require_limit : bool, optional
            Only designs that meet the limit with the required margin take part. [-]
        """
        usable = self.meets_limit if require_limit else self.is_feasible
        values = np.where(usable, self.column(objective), np.nan)
        if not np.any(np.isfinite(values)):
            raise SolverError(
                "trade study: no feasible design"
                + (" meets the limit with the required margin" if require_limit else "")
            )
        return int(np.nanargmin(values))

    def inputs_for(self, index: int) -> SinkInputs:
        """The case inputs with the geometry of design ``index``.

        Parameters
        ----------
        index : int
            Position of the design in the study's flat arrays. [-]
        """
        return _inputs_with(
            self.inputs, self.sink_type, {k: v[index] for k, v in self.design.items()}
        )


def _inputs_with(inputs: SinkInputs, sink_type: str, values: dict) -> SinkInputs:
    g = inputs.geometry
    if sink_type == "plate-fin":
        geometry = replace(
            g,
            fin_count=_count(values["fin_count"]),
            fin_height=values["fin_height"],
            fin_thickness=values["fin_thickness"],
        )
    else:
        geometry = replace(
            g,
            pin_diameter=values["pin_diameter"],
            pin_height=values["pin_height"],
            transverse_pitch=values["transverse_pitch"],
            longitudinal_pitch=values["longitudinal_pitch"],
        )
    return replace(inputs, geometry=geometry)


def _count(value):
    a = np.asarray(value, dtype=float)
    return int(a) if a.ndim == 0 else a
