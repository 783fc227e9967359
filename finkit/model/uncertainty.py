"""Uncertainty of a heat-sink result: Monte Carlo over input tolerances, and a tornado chart.

Every input of a heat-sink case is known only within a tolerance: the convection correlation
scatters, the interface material varies from part to part, the fan curve has a tolerance, the
inlet air is warmer on some days. This module gives each such input a distribution
(:class:`Tolerance`), draws all samples at once, and solves the heat sink for every sample in
ONE vectorised call of :func:`finkit.physics.sink.solve_temperatures` (the sampled inputs are
arrays that
broadcast, see :mod:`finkit.physics.sink`). From the samples it gives the percentiles of the
junction,
case and base temperatures, their mean and standard deviation, and the probability that the
limit node exceeds its limit (and the limit less the required margin).

:func:`sensitivity` gives the data of a tornado chart: each input moved alone to the ends of its
central interval (others nominal), sorted by the swing of the limit-node temperature.

Inputs that may carry a tolerance (:data:`TOLERANCE_INPUTS`):

============================  ====================================================  ==========
name                          what varies                                           forms
============================  ====================================================  ==========
``heat_transfer``             factor on the air-side h (correlation scatter)         relative
``fan_pressure``              factor on the fan curve's pressure (fan cases)         relative
``pressure_drop``             factor on the sink's pressure drop (forced flow)       relative
``airflow``                   given volume flow or approach velocity                 relative
``power``                     source power [W]                                       all
``interface_resistance``      interface resistance [K W⁻¹]                           all
``junction_to_case``          junction-to-case resistance [K W⁻¹]                    all
``inlet_temperature``         inlet air temperature [K]                              absolute
``thermal_conductivity``      sink metal conductivity [W m⁻¹ K⁻¹]                    all
============================  ====================================================  ==========

Exactness and reproducibility
-----------------------------
An input whose tolerance has zero width is not sampled at all: it stays the scalar of the
deterministic case, so with every tolerance zero the Monte Carlo solve *is* the deterministic
solve, broadcast to the sample count (bit-for-bit equal). Samples come from a seeded
:class:`numpy.random.Generator`; inputs are drawn in the fixed order of
:data:`TOLERANCE_INPUTS`, so the same tolerances and seed give the same samples whatever the
order of the mapping. Every distribution is sampled by its inverse CDF from uniform numbers,
which also allows Latin-hypercube sampling (:mod:`scipy.stats.qmc`).

When the inlet temperature varies and the case's surroundings (radiation) temperature equals the
nominal inlet temperature, the surroundings move with the inlet air (the room is at one
temperature); a surroundings temperature set apart from the inlet stays fixed.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from typing import NamedTuple

import numpy as np

from finkit.errors import InputError
from finkit.model.design import SinkInputs, limit_node_temperature, solve
from finkit.physics.sink.inputs import FanDriven, GivenVelocity, GivenVolumeFlow, NaturalConvection
from finkit.physics.sink.results import SinkSolution
from finkit.probability import binomial_upper_bound
from finkit.tolerance import (
    DISTRIBUTIONS,
    ONE_SOURCE_TOLERANCES,
    TOLERANCE_INPUTS,
    Tolerance,
)

__all__ = [
    "DISTRIBUTIONS",
    "PERCENTILES",
    "TOLERANCE_INPUTS",
    "MonteCarloResult",
    "Tolerance",
    "Tornado",
    "TornadoBar",
    "monte_carlo",
    "nominal_value",
    "sensitivity",
]

#: Percentiles reported by :class:`MonteCarloResult` [%].
PERCENTILES = (50.0, 90.0, 95.0, 99.0, 99.9)


def _check_tolerances(inputs: SinkInputs, tolerances: Mapping[str, Tolerance]) -> None:
    flow = inputs.flow
    for name, tol in tolerances.items():
        if name not in TOLERANCE_INPUTS:
            raise InputError(
                f"tolerances: unknown input {name!r}; allowed: {', '.join(TOLERANCE_INPUTS)}"
            )
        if inputs.sources is not None and name in ONE_SOURCE_TOLERANCES:
            allowed = [n for n in TOLERANCE_INPUTS if n not in ONE_SOURCE_TOLERANCES]
            raise InputError(
                f"tolerances.{name}: not yet available with several sources; allowed with "
                f"them: {', '.join(allowed)}"
            )
        if not isinstance(tol, Tolerance):
            raise InputError(f"tolerances.{name}: expected a Tolerance, got {type(tol).__name__}")
        spec = TOLERANCE_INPUTS[name]
        if tol.relative is not None and not spec.allows_relative:
            raise InputError(
                f"tolerances.{name}: a relative tolerance is not allowed ({spec.description}); "
                "give absolute or low and high"
            )
        if tol.relative is None and not spec.allows_absolute:
            raise InputError(
                f"tolerances.{name}: only a relative tolerance is allowed ({spec.description})"
            )
        if name == "fan_pressure" and not isinstance(flow, FanDriven):
            raise InputError("tolerances.fan_pressure: applies to fan-driven cases only")
        if name == "pressure_drop" and isinstance(flow, NaturalConvection):
            raise InputError("tolerances.pressure_drop: does not apply to natural convection")
        if name == "airflow" and not isinstance(flow, (GivenVolumeFlow, GivenVelocity)):
            raise InputError(
                "tolerances.airflow: applies to a given volume flow or velocity only "
                "(use fan_pressure for a fan)"
            )
        nominal = nominal_value(inputs, name)
        lo, _ = tol.support(nominal)
        if spec.minimum is not None and (lo < spec.minimum or (spec.is_strict and lo <= 0)):
            raise InputError(
                f"tolerances.{name}: the distribution reaches {lo:.6g}, below the smallest "
                f"allowed value {spec.minimum:g} of the {spec.description}; narrow it, "
                "or use a truncated normal, uniform or triangular distribution"
            )


def nominal_value(inputs: SinkInputs, name: str) -> float:
    """Nominal (case) value of a tolerance input [SI]; factors are relative to the case (1.0).

    Parameters
    ----------
    inputs : SinkInputs
        The deterministic case. [-]
    name : str
        One of :data:`TOLERANCE_INPUTS`. [-]
    """
    o, s = inputs.options, inputs.source
    values = {
        "heat_transfer": lambda: o.heat_transfer_factor,
        "fan_pressure": lambda: o.fan_pressure_factor,
        "pressure_drop": lambda: o.pressure_drop_factor,
        "airflow": lambda: 1.0,
        "power": lambda: s.power,
        "interface_resistance": lambda: s.interface_resistance,
        "junction_to_case": lambda: s.junction_to_case_resistance,
        "inlet_temperature": lambda: inputs.air.inlet_temperature,
        "thermal_conductivity": lambda: inputs.material.thermal_conductivity,
    }
    if name not in values:
        raise InputError(f"tolerances: unknown input {name!r}; allowed: {', '.join(values)}")
    value = np.asarray(values[name](), dtype=float)
    if value.ndim:
        raise InputError(f"tolerances.{name}: the nominal value must be a scalar (got an array)")
    return float(value)


def _with_values(inputs: SinkInputs, values: Mapping[str, np.ndarray | float]) -> SinkInputs:
    """A copy of ``inputs`` with the named tolerance inputs replaced (arrays or scalars)."""
    options, source, air, material, flow = (
        inputs.options,
        inputs.source,
        inputs.air,
        inputs.material,
        inputs.flow,
    )
    opt_fields = {
        "heat_transfer": "heat_transfer_factor",
        "fan_pressure": "fan_pressure_factor",
        "pressure_drop": "pressure_drop_factor",
    }
    src_fields = {
        "power": "power",
        "interface_resistance": "interface_resistance",
        "junction_to_case": "junction_to_case_resistance",
    }
    opt = {opt_fields[k]: v for k, v in values.items() if k in opt_fields}
    src = {src_fields[k]: v for k, v in values.items() if k in src_fields}
    if opt:
        options = replace(options, **opt)
    if src:
        source = replace(source, **src)
    if "thermal_conductivity" in values:
        material = replace(material, thermal_conductivity=values["thermal_conductivity"])
    if "inlet_temperature" in values:
        t_new = values["inlet_temperature"]
        sur = air.surroundings_temperature
        follows = sur is None or float(np.asarray(sur)) == float(np.asarray(air.inlet_temperature))
        air = replace(
            air,
            inlet_temperature=t_new,
            surroundings_temperature=(sur if sur is None or not follows else t_new),
        )
    if "airflow" in values:
        factor = values["airflow"]
        if isinstance(flow, GivenVolumeFlow):
            flow = GivenVolumeFlow(np.asarray(flow.volume_flow, float) * factor)
        else:
            flow = GivenVelocity(np.asarray(flow.approach_velocity, float) * factor)
    return replace(inputs, options=options, source=source, air=air, material=material, flow=flow)


# --------------------------------------------------------------------------------------
# Monte Carlo
# --------------------------------------------------------------------------------------


def _percentile(values: np.ndarray, q) -> np.ndarray:
    return np.percentile(values, q)


@dataclass(frozen=True)
class MonteCarloResult:
    """Samples and statistics of a Monte Carlo run (temperatures absolute [K]).

    Attributes
    ----------
    samples : dict of str to numpy.ndarray
        The sampled value of every input that varied, shape (count,) [SI].
    junction_temperature, case_temperature, base_temperature, source_base_temperature :
    numpy.ndarray
        Node temperatures of every sample [K]; ``base_temperature`` is the mean base (fin roots),
        ``source_base_temperature`` the base under the source.
    limit_node_temperature : numpy.ndarray
        Temperature of the case's limit node for every sample [K].
    pressure_drop, volume_flow : numpy.ndarray
        Sink pressure drop [Pa] and total volume flow [m³ s⁻¹] (NaN in natural convection).
    nominal : SinkSolution
        The deterministic solution (every input at its case value).
    limit_node : str
        ``junction``, ``case`` or ``base``.
    limit_temperature, required_margin : float
        The case's limit [K] and required margin [K].
    tolerances : dict of str to Tolerance
        The tolerances used.
    seed : int or None
        Seed of the generator (None when a Generator was passed).
    method : str
        ``random`` or ``latin-hypercube``.
    source_exceedance : dict of str to float
        With several sources: the share of the samples in which each source's limit node is
        above its own limit, and under ``"any source"`` the share in which at least one is;
        empty otherwise [-]. ``limit_node_temperature`` is then the governing source's.
    nominal_limit_node_temperature : float or None
        The limit node of the deterministic solution, when it is not the solution's own
        (several sources: the governing source's) [K].
    """

    samples: dict[str, np.ndarray]
    junction_temperature: np.ndarray
    case_temperature: np.ndarray
    base_temperature: np.ndarray
    source_base_temperature: np.ndarray
    limit_node_temperature: np.ndarray
    pressure_drop: np.ndarray
    volume_flow: np.ndarray
    nominal: SinkSolution
    limit_node: str
    limit_temperature: float
    required_margin: float
    tolerances: dict[str, Tolerance] = field(default_factory=dict)
    seed: int | None = None
    method: str = "random"
    source_exceedance: dict[str, float] = field(default_factory=dict)
    nominal_limit_node_temperature: float | None = None

    QUANTITIES = (
        "junction_temperature",
        "case_temperature",
        "base_temperature",
        "source_base_temperature",
        "limit_node_temperature",
        "pressure_drop",
        "volume_flow",
    )

    @property
    def count(self) -> int:
        """Number of samples [-]."""
        return int(self.limit_node_temperature.size)

    def _values(self, quantity: str) -> np.ndarray:
        if quantity not in self.QUANTITIES:
            raise InputError(f"quantity: got {quantity!r}; allowed: {', '.join(self.QUANTITIES)}")
        return getattr(self, quantity)

    def _nominal(self, quantity: str) -> float:
        if quantity == "limit_node_temperature":
            if self.nominal_limit_node_temperature is not None:
                return float(self.nominal_limit_node_temperature)
            return float(self.nominal.node_temperature(self.limit_node))
        return float(getattr(self.nominal, quantity))

    def percentile(self, q, quantity: str = "limit_node_temperature"):
        """Percentile(s) ``q`` [%] of a quantity over the samples [unit of the quantity].

        Parameters
        ----------
        q : float or array_like
            Percentile(s), 0 to 100. [%]
        quantity : str, optional
            One of :attr:`QUANTITIES`. [-]
        """
        return _percentile(self._values(quantity), q)

    def percentiles(self, quantity: str = "limit_node_temperature") -> dict[float, float]:
        """The :data:`PERCENTILES` of a quantity, as {percent: value}.

        Parameters
        ----------
        quantity : str, optional
            One of :attr:`QUANTITIES`. [-]
        """
        values = self.percentile(PERCENTILES, quantity)
        return {p: float(v) for p, v in zip(PERCENTILES, values, strict=True)}

    def mean(self, quantity: str = "limit_node_temperature") -> float:
        """Sample mean, summed about the nominal value (exact when nothing varies).

        Parameters
        ----------
        quantity : str, optional
            One of :attr:`QUANTITIES`. [-]
        """
        x = self._values(quantity)
        ref = self._nominal(quantity)
        if not np.isfinite(ref):
            return float(np.mean(x))
        return ref + float(np.mean(x - ref))

    def std(self, quantity: str = "limit_node_temperature") -> float:
        """Sample standard deviation (n - 1 in the denominator) [unit of the quantity].

        Parameters
        ----------
        quantity : str, optional
            One of :attr:`QUANTITIES`. [-]
        """
        x = self._values(quantity)
        if x.size < 2:
            return 0.0
        ref = self._nominal(quantity)
        d = x - ref if np.isfinite(ref) else x  # about the nominal: exactly 0 when nothing varies
        return float(np.sqrt(np.sum((d - np.mean(d)) ** 2) / (x.size - 1)))

    def probability_exceeding(self, temperature, quantity: str = "limit_node_temperature"):
        """Fraction of samples strictly above ``temperature`` [-].

        Parameters
        ----------
        temperature : float
            Threshold, in the unit of ``quantity``: [Pa] for ``pressure_drop``, [m³ s⁻¹] for
            ``volume_flow``, [K] for a temperature.
        quantity : str, optional
            One of :attr:`QUANTITIES`. [-]
        """
        return float(np.mean(self._values(quantity) > temperature))

    @property
    def probability_exceeding_limit(self) -> float:
        """Fraction of samples with the limit node above the limit [-]."""
        return self.probability_exceeding(self.limit_temperature)

    @property
    def probability_exceeding_usable_limit(self) -> float:
        """Fraction of samples with the limit node above the limit less the margin [-]."""
        return self.probability_exceeding(self.limit_temperature - self.required_margin)

    def exceedance_upper_bound(self, temperature, confidence: float = 0.95) -> float:
        """One-sided upper confidence bound on the exceedance probability [-].

        Clopper-Pearson (exact binomial) bound for ``k`` exceedances in ``n`` samples:
        ``Beta.ppf(confidence, k + 1, n - k)``; with no exceedance it is close to the
        "rule of three" ``3/n`` at 95 %. It states how small a probability the sample count
        can show.

        Parameters
        ----------
        temperature : float
            Threshold on the limit-node temperature. [K]
        confidence : float, optional
            One-sided confidence level, in (0, 1). [-]

        References
        ----------
        Clopper, C.J., Pearson, E.S., "The use of confidence or fiducial limits illustrated in
        the case of the binomial", Biometrika 26(4), 404-413, 1934.
        """
        n = self.count
        k = int(np.sum(self.limit_node_temperature > temperature))
        if k >= n:
            return 1.0
        return binomial_upper_bound(k, n, confidence)

    def summary(self) -> dict[str, float]:
        """Headline numbers for a note: name -> value (temperatures in K, probabilities [-])."""
        out = {
            "samples": float(self.count),
            "nominal_limit_node_temperature": self._nominal("limit_node_temperature"),
            "mean_limit_node_temperature": self.mean(),
            "std_limit_node_temperature": self.std(),
            "probability_exceeding_limit": self.probability_exceeding_limit,
            "probability_exceeding_usable_limit": self.probability_exceeding_usable_limit,
            "upper_95_probability_exceeding_limit": self.exceedance_upper_bound(
                self.limit_temperature
            ),
        }
        for p, v in self.percentiles().items():
            out[f"p{p:g}_limit_node_temperature"] = v
        for p, v in self.percentiles("junction_temperature").items():
            out[f"p{p:g}_junction_temperature"] = v
        for p, v in self.percentiles("base_temperature").items():
            out[f"p{p:g}_base_temperature"] = v
        for name, share in self.source_exceedance.items():
            out[f"probability_exceeding_limit_{name.replace(' ', '_')}"] = share
        return out


def _uniforms(count: int, dims: int, rng: np.random.Generator, method: str) -> np.ndarray:
    if dims == 0:
        return np.empty((count, 0))
    if method == "random":
        return rng.random((count, dims))
    if method == "latin-hypercube":
        from scipy.stats import qmc

        return qmc.LatinHypercube(d=dims, rng=rng).random(count)
    raise InputError(f"sampling method: got {method!r}; allowed: random, latin-hypercube")


def _draw(
    inputs: SinkInputs, tolerances: Mapping[str, Tolerance], count, rng, method
) -> dict[str, np.ndarray | float]:
    """Sampled (arrays) or constant (scalars) values of every toleranced input, in fixed order."""
    names = [n for n in TOLERANCE_INPUTS if n in tolerances]
    varying = [n for n in names if not tolerances[n].is_degenerate(nominal_value(inputs, n))]
    u = _uniforms(count, len(varying), rng, method)
    values: dict[str, np.ndarray | float] = {}
    for name in names:
        tol, nominal = tolerances[name], nominal_value(inputs, name)
        if name in varying:
            values[name] = tol.quantile(u[:, varying.index(name)], nominal)
        else:
            constant = tol.constant(nominal)
            if constant != nominal:
                values[name] = constant
    return values


def monte_carlo(
    inputs: SinkInputs,
    tolerances: Mapping[str, Tolerance],
    samples: int = 100_000,
    seed: int | np.random.Generator | None = 0,
    method: str = "random",
    *,
    nominal: SinkSolution | None = None,
) -> MonteCarloResult:
    """Monte Carlo of the node temperatures over the input tolerances, in one vectorised solve.

    Parameters
    ----------
    inputs : SinkInputs
        The deterministic case (:func:`finkit.model.sink_inputs`); its input values are the
        nominal values [SI].
    tolerances : mapping of str to Tolerance
        Tolerance per input name of :data:`TOLERANCE_INPUTS`; inputs not named stay nominal. [-]
    samples : int
        Number of samples [-].
    seed : int, numpy.random.Generator or None
        Seed of :func:`numpy.random.default_rng` (0 by default, so that a note is reproducible),
        or a Generator [-].
    method : {"random", "latin-hypercube"}
        Independent random numbers, or a Latin hypercube (stratified marginals; the inputs
        remain independent) [-].
    nominal : SinkSolution, optional
        ``solve(inputs)`` when the caller has it already (not solved again) [-].

    Returns
    -------
    MonteCarloResult
        Samples, node temperatures [K], percentiles, probabilities of exceeding the limit.

    Raises
    ------
    InputError
        Unknown input, a form the input does not allow, a tolerance that does not apply to the
        flow (fan, given flow, natural convection), or a distribution reaching non-physical
        values (negative power, conductivity, factor).

    Notes
    -----
    Each input is sampled independently from its distribution by the inverse CDF of a uniform
    number; an input of zero width is not sampled and keeps its scalar value, so that zero
    tolerances reproduce :func:`finkit.model.solve` exactly.
    """
    count = int(samples)
    if count < 1:
        raise InputError(f"samples: got {samples!r}; must be a whole number >= 1")
    _check_tolerances(inputs, tolerances)
    rng = seed if isinstance(seed, np.random.Generator) else np.random.default_rng(seed)
    values = _draw(inputs, tolerances, count, rng, method)
    nominal = solve(inputs) if nominal is None else nominal
    sol = solve(_with_values(inputs, values)) if values else nominal

    def full(a):
        return np.array(np.broadcast_to(np.asarray(a, dtype=float), (count,)))

    sampled = {k: full(v) for k, v in values.items()}
    exceedance: dict[str, float] = {}
    nominal_node = None
    if inputs.sources is not None:
        # several sources: each against its own limit, sample by sample
        over = np.stack(
            [
                np.broadcast_to(np.asarray(sol.sources.node(node), float)[..., k], (count,)) > limit
                for k, (node, limit, _) in enumerate(inputs.limits)
            ],
            axis=-1,
        )
        exceedance = {
            name: float(np.mean(over[:, k])) for k, name in enumerate(inputs.sources.names)
        }
        exceedance["any source"] = float(np.mean(np.any(over, axis=-1)))
        nominal_node = float(limit_node_temperature(inputs, nominal))
    return MonteCarloResult(
        samples=sampled,
        junction_temperature=full(sol.junction_temperature),
        case_temperature=full(sol.case_temperature),
        base_temperature=full(sol.base_temperature),
        source_base_temperature=full(sol.source_base_temperature),
        limit_node_temperature=full(limit_node_temperature(inputs, sol)),
        pressure_drop=full(sol.pressure_drop),
        volume_flow=full(sol.volume_flow),
        nominal=nominal,
        limit_node=inputs.limit_node,
        limit_temperature=float(inputs.limit_temperature),
        required_margin=float(inputs.required_margin),
        tolerances=dict(tolerances),
        seed=None if isinstance(seed, np.random.Generator) else seed,
        method=method,
        source_exceedance=exceedance,
        nominal_limit_node_temperature=nominal_node,
    )


# --------------------------------------------------------------------------------------
# Sensitivity (tornado)
# --------------------------------------------------------------------------------------


class TornadoBar(NamedTuple):
    """One bar of a tornado chart.

    Attributes
    ----------
    name : str
        Input name (:data:`TOLERANCE_INPUTS`).
    low_value, high_value : float
        The input at the lower and upper end of its central interval [SI].
    low_temperature, high_temperature : float
        The limit-node temperature with the input at ``low_value`` / ``high_value`` and all
        others nominal [K].
    swing : float
        ``|high_temperature - low_temperature|`` [K].
    """

    name: str
    low_value: float
    high_value: float
    low_temperature: float
    high_temperature: float
    swing: float


@dataclass(frozen=True)
class Tornado:
    """Tornado-chart data: bars sorted by swing, largest first.

    Attributes
    ----------
    bars : tuple of TornadoBar
        One bar per input with a tolerance of non-zero width.
    nominal_temperature : float
        The limit-node temperature with every input nominal [K].
    limit_node : str
        The node the temperatures refer to.
    coverage : float
        Central probability of each bar's input interval [-] (1 = the whole range of a bounded
        distribution).
    """

    bars: tuple[TornadoBar, ...]
    nominal_temperature: float
    limit_node: str
    coverage: float

    @property
    def names(self) -> tuple[str, ...]:
        """Input names, largest swing first."""
        return tuple(b.name for b in self.bars)


def sensitivity(
    inputs: SinkInputs,
    tolerances: Mapping[str, Tolerance],
    coverage: float = 0.95,
    *,
    nominal: SinkSolution | None = None,
) -> Tornado:
    """One-at-a-time sensitivity of the limit-node temperature (tornado-chart data).

    Each toleranced input is set to the lower and upper end of its central ``coverage``
    interval, i.e. its ``(1 - coverage)/2`` and ``(1 + coverage)/2`` quantiles, with every other
    input nominal; all 2 m cases are solved in one vectorised call.

    Parameters
    ----------
    inputs : SinkInputs
        The deterministic case [SI].
    tolerances : mapping of str to Tolerance
        As in :func:`monte_carlo`. [-]
    coverage : float
        Central probability of the interval, in (0, 1] [-]; 0.95 puts a normal input at
        ±1.96 σ and a uniform one at 95 % of its range. The same coverage for every input keeps
        the bars comparable across distributions.
    nominal : SinkSolution, optional
        ``solve(inputs)`` when the caller has it already (not solved again) [-].

    Returns
    -------
    Tornado
        Bars sorted by swing (largest first) and the nominal temperature [K].
    """
    if not 0.0 < coverage <= 1.0:
        raise InputError(f"coverage: got {coverage!r}; must be in (0, 1]")
    _check_tolerances(inputs, tolerances)
    nominal_sol = solve(inputs) if nominal is None else nominal
    t_nominal = float(limit_node_temperature(inputs, nominal_sol))
    names = [
        n
        for n in TOLERANCE_INPUTS
        if n in tolerances and not tolerances[n].is_degenerate(nominal_value(inputs, n))
    ]
    if not names:
        return Tornado((), t_nominal, inputs.limit_node, coverage)
    m = len(names)
    p = np.array([(1.0 - coverage) / 2.0, (1.0 + coverage) / 2.0])
    values: dict[str, np.ndarray] = {}
    ends = {}
    for i, name in enumerate(names):
        nominal = nominal_value(inputs, name)
        lo_hi = np.asarray(tolerances[name].quantile(p, nominal), float)
        ends[name] = lo_hi
        column = np.full(2 * m, nominal)
        column[2 * i : 2 * i + 2] = lo_hi
        values[name] = column
    sol = solve(_with_values(inputs, values))
    t = np.broadcast_to(np.asarray(limit_node_temperature(inputs, sol), float), (2 * m,))
    bars = [
        TornadoBar(
            name=name,
            low_value=float(ends[name][0]),
            high_value=float(ends[name][1]),
            low_temperature=float(t[2 * i]),
            high_temperature=float(t[2 * i + 1]),
            swing=float(abs(t[2 * i + 1] - t[2 * i])),
        )
        for i, name in enumerate(names)
    ]
    bars.sort(key=lambda b: b.swing, reverse=True)
    return Tornado(tuple(bars), t_nominal, inputs.limit_node, coverage)
