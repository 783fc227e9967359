"""Tolerances of case inputs: which inputs may carry one and the distribution of each.

A light module (numpy only; the normal distribution from finkit.probability) so that the
case schema can validate a ``tolerances`` block without loading the solver. The Monte Carlo and
sensitivity studies that use these tolerances are in :mod:`finkit.model.uncertainty`, which
re-exports every name here.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from finkit.errors import InputError
from finkit.probability import normal_cdf, normal_quantile

#: Distributions a :class:`Tolerance` may have.
DISTRIBUTIONS = ("normal", "uniform", "triangular")

#: Default truncation of a normal tolerance, in standard deviations [-]. A physical input cannot
#: take any value: the tails beyond ±4 σ (6.3e-5 of the probability) are cut so that a factor,
#: a power or a conductivity never becomes negative. The truncation lowers the variance by the
#: factor ``1 - 2 a φ(a) / (2 Φ(a) - 1)`` = 0.99893 at a = 4 (see :meth:`Tolerance.variance`).
DEFAULT_TRUNCATION = 4.0


class _InputSpec(NamedTuple):
    kind: str  # units kind of the value (finkit.case.units.KINDS)
    difference_kind: str  # units kind of an absolute spread
    allows_relative: bool
    allows_absolute: bool  # absolute spread and low/high bounds
    minimum: float | None  # lowest allowed value of a sample (None: unbounded)
    is_strict: bool  # samples must be > minimum (else >=)
    description: str


#: Inputs that may carry a tolerance, in the order they are sampled.
TOLERANCE_INPUTS: dict[str, _InputSpec] = {
    "heat_transfer": _InputSpec(
        "dimensionless", "dimensionless", True, False, 0.0, True, "factor on the air-side h"
    ),
    "fan_pressure": _InputSpec(
        "dimensionless", "dimensionless", True, False, 0.0, True, "factor on the fan pressure"
    ),
    "pressure_drop": _InputSpec(
        "dimensionless", "dimensionless", True, False, 0.0, True, "factor on the sink pressure drop"
    ),
    "airflow": _InputSpec(
        "dimensionless", "dimensionless", True, False, 0.0, True, "factor on the given airflow"
    ),
    "power": _InputSpec("power", "power", True, True, 0.0, False, "source power"),
    "interface_resistance": _InputSpec(
        "thermal_resistance", "thermal_resistance", True, True, 0.0, False, "interface resistance"
    ),
    "junction_to_case": _InputSpec(
        "thermal_resistance",
        "thermal_resistance",
        True,
        True,
        0.0,
        False,
        "junction-to-case resistance",
    ),
    "inlet_temperature": _InputSpec(
        "temperature", "temperature_difference", False, True, 0.0, True, "inlet air temperature"
    ),
    "thermal_conductivity": _InputSpec(
        "thermal_conductivity",
        "thermal_conductivity",
        True,
        True,
        0.0,
        True,
        "sink conductivity",
    ),
}

#: Tolerance inputs that describe one source's chain or the base's one conductivity: not
#: available with several sources (each source has its own interface and RθJC; the base field
#: takes its conductivity from the layout).
ONE_SOURCE_TOLERANCES = ("interface_resistance", "junction_to_case", "thermal_conductivity")


# --------------------------------------------------------------------------------------
# Tolerances
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Tolerance:
    """The distribution of one input about its nominal (case) value.

    Give exactly one form of the width: ``relative`` (a fraction of the nominal value),
    ``absolute`` (in the input's SI unit), or both ``low`` and ``high`` (absolute SI bounds).

    Attributes
    ----------
    distribution : {"normal", "uniform", "triangular"}
        Shape of the distribution [-].
    relative : float, optional
        Width as a fraction of the nominal value, e.g. 0.10 for 10 % [-]. For ``normal`` it is
        ``sigmas`` standard deviations; for ``uniform`` and ``triangular`` the half-range.
    absolute : float, optional
        Width in the input's SI unit (a difference, e.g. K for the inlet temperature) [SI].
        Meaning as for ``relative``.
    low, high : float, optional
        Absolute bounds [SI]. ``uniform``: the range; ``triangular``: the range, with the mode at
        the nominal value (which must lie between them); ``normal``: the interval mean ±
        ``sigmas`` standard deviations (mean at the midpoint).
    sigmas : float
        For ``normal``: how many standard deviations the width stands for (1: the width is σ;
        2: the width is a ±2 σ, about 95 %, interval) [-]. Must stay 1 for the other shapes.
    truncation : float or None
        For ``normal``: samples are limited to mean ± ``truncation`` σ [-]; None for none
        (only where the input may take any sign). Default :data:`DEFAULT_TRUNCATION`.
    source : str
        Where the tolerance comes from (datasheet, correlation paper, common practice), for the
        calculation note [-].

    Examples
    --------
    >>> Tolerance("normal", relative=0.20, sigmas=2).standard_deviation(1.0)  # ±20 % at 2 σ
    0.1
    """

    distribution: str = "normal"
    relative: float | None = None
    absolute: float | None = None
    low: float | None = None
    high: float | None = None
    sigmas: float = 1.0
    truncation: float | None = DEFAULT_TRUNCATION
    source: str = ""

    def __post_init__(self):
        if self.distribution not in DISTRIBUTIONS:
            raise InputError(
                f"tolerance distribution: got {self.distribution!r}; "
                f"allowed: {', '.join(DISTRIBUTIONS)}"
            )
        forms = [
            n
            for n, v in (("relative", self.relative), ("absolute", self.absolute))
            if v is not None
        ]
        bounds = [n for n in ("low", "high") if getattr(self, n) is not None]
        if bounds:
            forms.append("low and high")
        if len(forms) != 1:
            raise InputError(
                "tolerance: give exactly one of relative | absolute | low and high "
                f"(got {', '.join(forms) if forms else 'none'})"
            )
        if len(bounds) == 1:
            raise InputError(f"tolerance: {bounds[0]} needs the other bound as well")
        for name in ("relative", "absolute"):
            value = getattr(self, name)
            if value is not None and not (np.isfinite(value) and value >= 0):
                raise InputError(f"tolerance {name}: got {value!r}; must be a finite number >= 0")
        if bounds and not (np.isfinite(self.low) and np.isfinite(self.high)):
            raise InputError(f"tolerance low, high: got {self.low!r}, {self.high!r}; not finite")
        if bounds and self.low > self.high:
            raise InputError(
                f"tolerance low, high: got {self.low!r} > {self.high!r}; low must not exceed high"
            )
        if not (np.isfinite(self.sigmas) and self.sigmas > 0):
            raise InputError(f"tolerance sigmas: got {self.sigmas!r}; must be > 0")
        if self.distribution != "normal" and self.sigmas != 1.0:
            raise InputError(
                f"tolerance sigmas: applies to the normal distribution only "
                f"(got sigmas = {self.sigmas!r} with {self.distribution!r})"
            )
        if self.truncation is not None and not (self.truncation > 0):
            raise InputError(f"tolerance truncation: got {self.truncation!r}; must be > 0 or None")

    # -- resolved parameters ---------------------------------------------------------------
    def _width(self, nominal: float) -> float:
        if self.relative is not None:
            return self.relative * abs(nominal)
        return self.absolute

    def _params(self, nominal: float) -> tuple[float, float, float]:
        """(a, b, c): normal -> (mean, sigma, -); uniform -> (low, high, -);
        triangular -> (low, mode, high)."""
        nominal = float(nominal)
        if self.low is not None:
            lo, hi = float(self.low), float(self.high)
            if self.distribution == "normal":
                return 0.5 * (lo + hi), 0.5 * (hi - lo) / self.sigmas, 0.0
            if self.distribution == "uniform":
                return lo, hi, 0.0
            if not lo <= nominal <= hi:
                raise InputError(
                    f"tolerance low, high: {lo:.6g} to {hi:.6g} must bracket the nominal value "
                    f"{nominal:.6g} (the mode of the triangular distribution)"
                )
            return lo, nominal, hi
        w = self._width(nominal)
        if self.distribution == "normal":
            return nominal, w / self.sigmas, 0.0
        if self.distribution == "uniform":
            return nominal - w, nominal + w, 0.0
        return nominal - w, nominal, nominal + w

    def is_degenerate(self, nominal: float) -> bool:
        """True when the distribution is a single point (zero width).

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].
        """
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            return b == 0.0
        if self.distribution == "uniform":
            return a == b
        return a == c

    def constant(self, nominal: float) -> float:
        """The single value of a degenerate tolerance [SI].

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].
        """
        a, _, _ = self._params(nominal)
        return a

    def mean(self, nominal: float) -> float:
        """Mean of the distribution [SI].

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].
        """
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            return a
        if self.distribution == "uniform":
            return 0.5 * (a + b)
        return (a + b + c) / 3.0

    def standard_deviation(self, nominal: float) -> float:
        """Standard deviation of the (untruncated) parent distribution [SI].

        For ``normal`` this is σ before truncation; :meth:`variance` includes the truncation.

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].
        """
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            return b
        return float(np.sqrt(self.variance(nominal)))

    def variance(self, nominal: float) -> float:
        """Variance of the sampled distribution, truncation included [SI²].

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].

        Notes
        -----
        normal truncated at ±a σ: ``σ² (1 - 2 a φ(a) / (2 Φ(a) - 1))``; uniform on [l, h]:
        ``(h - l)²/12``; triangular (l, m, h): ``(l² + m² + h² - l m - l h - m h)/18``
        (standard results, e.g. Johnson, Kotz & Balakrishnan, Continuous Univariate
        Distributions, Wiley).
        """
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            if self.truncation is None:
                return b * b
            t = self.truncation
            z = normal_cdf(t) - normal_cdf(-t)
            return b * b * (1.0 - 2.0 * t * np.exp(-0.5 * t * t) / np.sqrt(2 * np.pi) / z)
        if self.distribution == "uniform":
            return (b - a) ** 2 / 12.0
        lo, mode, hi = a, b, c
        return (lo * lo + mode * mode + hi * hi - lo * mode - lo * hi - mode * hi) / 18.0

    def support(self, nominal: float) -> tuple[float, float]:
        """Lowest and highest value a sample can take [SI] (±inf for an untruncated normal).

        Parameters
        ----------
        nominal : float
            The nominal (case) value of the input [SI].
        """
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            if self.truncation is None:
                return (-np.inf, np.inf) if b > 0 else (a, a)
            return a - self.truncation * b, a + self.truncation * b
        if self.distribution == "uniform":
            return a, b
        return a, c

    def quantile(self, probability, nominal: float):
        """Inverse CDF: the value below which a fraction ``probability`` of samples lie [SI].

        Parameters
        ----------
        probability : float or array_like
            Probabilities in [0, 1] [-].
        nominal : float
            The nominal (case) value of the input [SI].
        """
        u = np.asarray(probability, dtype=float)
        a, b, c = self._params(nominal)
        if self.distribution == "normal":
            if self.truncation is None:
                tiny = np.finfo(float).tiny
                return a + b * normal_quantile(np.clip(u, tiny, 1.0 - np.finfo(float).epsneg))
            lo = normal_cdf(-self.truncation)
            hi = normal_cdf(self.truncation)
            return a + b * normal_quantile(lo + u * (hi - lo))
        if self.distribution == "uniform":
            return a + u * (b - a)
        lo, mode, hi = a, b, c
        span = hi - lo
        f_mode = (mode - lo) / span
        left = lo + np.sqrt(u * span * (mode - lo))
        right = hi - np.sqrt((1.0 - u) * span * (hi - mode))
        return np.where(u < f_mode, left, right)
