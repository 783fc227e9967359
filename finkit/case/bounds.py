"""The space a sink must fit and the limits of its manufacturing process.

A light module (numpy only) so that the case schema can validate a ``trade_study`` block
without loading the solver; :mod:`finkit.model.trade` uses and re-exports both classes.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from finkit.errors import InputError
from finkit.physics.geometry import PlateFinSink

__all__ = [
    "Envelope",
    "ManufacturingBounds",
]


@dataclass(frozen=True)
class Envelope:
    """The space the sink must fit: a fixed base plate and a maximum overall height.

    Attributes
    ----------
    base_width : float
        Base width across the flow [m].
    base_length : float
        Base length along the flow [m].
    base_thickness : float
        Base plate thickness [m].
    max_height : float
        Overall height, base plus fins [m]; ``inf`` for no limit.
    """

    base_width: float
    base_length: float
    base_thickness: float
    max_height: float = np.inf

    def __post_init__(self):
        for name in ("base_width", "base_length", "base_thickness"):
            value = getattr(self, name)
            if not (np.isfinite(value) and value > 0):
                raise InputError(f"envelope {name}: got {value!r}; must be a length > 0 m")
        if not self.max_height > self.base_thickness:
            raise InputError(
                f"envelope max_height: got {self.max_height!r} m; must exceed the base "
                f"thickness {self.base_thickness:g} m"
            )

    @classmethod
    def of(cls, inputs: Any, max_height: float | None = None) -> Envelope:
        """The envelope of a case's base; ``max_height`` None = the case's present height [m].

        ``inputs`` is anything with a ``geometry`` (:class:`PlateFinSink` or ``PinFinSink``),
        e.g. :class:`finkit.model.design.SinkInputs` (not imported: the case layer sits below
        the model layer).

        Parameters
        ----------
        inputs : object
            The case's inputs, anything with a ``geometry`` (e.g.
            :class:`finkit.model.design.SinkInputs`). [-]
        max_height : float, optional
            Overall height, base plus fins; None: the case's present height. [m]
        """
        g = inputs.geometry
        fin = g.fin_height if isinstance(g, PlateFinSink) else g.pin_height
        height = float(g.base_thickness) + float(fin) if max_height is None else max_height
        return cls(float(g.base_width), float(g.base_length), float(g.base_thickness), height)

    @property
    def max_fin_height(self) -> float:
        """Tallest fin the envelope admits, ``max_height - base_thickness`` [m]."""
        return self.max_height - self.base_thickness


@dataclass(frozen=True)
class ManufacturingBounds:
    """Limits of the manufacturing process, set by the user.

    The defaults are **common practice, no source**: editable examples typical of extruded
    aluminium plate fins and of die-cast or forged pins, not facts. Ask the supplier for the
    values of the chosen process (bonded, folded, skived and machined fins allow other
    limits).

    Attributes
    ----------
    min_fin_gap : float
        Smallest clear gap between plate fins [m]; default 1.5 mm (common practice, no source).
    min_fin_thickness : float
        Thinnest plate fin [m]; default 0.8 mm (common practice, no source).
    max_fin_aspect_ratio : float
        Largest fin height over gap (extrusion die tongue ratio) [-]; default 10 (common
        practice, no source).
    min_pin_diameter : float
        Thinnest pin [m]; default 1.5 mm (common practice, no source).
    min_pin_gap : float
        Smallest clear gap between neighbouring pins [m]; default 1.5 mm (common practice,
        no source).
    max_pin_aspect_ratio : float
        Largest pin height over diameter [-]; default 10 (common practice, no source).
    """

    min_fin_gap: float = 1.5e-3
    min_fin_thickness: float = 0.8e-3
    max_fin_aspect_ratio: float = 10.0
    min_pin_diameter: float = 1.5e-3
    min_pin_gap: float = 1.5e-3
    max_pin_aspect_ratio: float = 10.0

    def __post_init__(self):
        for name in ("min_fin_gap", "min_fin_thickness", "min_pin_diameter", "min_pin_gap"):
            value = getattr(self, name)
            if not (np.isfinite(value) and value >= 0):
                raise InputError(f"bounds {name}: got {value!r}; must be a length >= 0 m")
        for name in ("max_fin_aspect_ratio", "max_pin_aspect_ratio"):
            value = getattr(self, name)
            if not value > 0:
                raise InputError(f"bounds {name}: got {value!r}; must be > 0")
