"""Design exploration: trade studies, Pareto fronts and optimisers for a heat sink in an envelope.

A trade study keeps everything of a case (source, air, fan or flow, limit) and the base plate
(the envelope: width, length, base thickness) and varies the fins: count, height and thickness
for plate fins; diameter, pitches and height for pin fins. Every design of a grid or a sample
is solved in ONE vectorised call of :mod:`finkit.physics.sink` (the geometry fields are flat
arrays), so
10^4-10^5 designs take seconds, not hours.

Manufacturing bounds (:class:`ManufacturingBounds`) flag designs that cannot be made with the
chosen process; their defaults are editable examples of common practice for extruded or
bonded-fin aluminium sinks, **not** values from a standard.

The two usual design questions are answered by :func:`minimise_junction_temperature` (coolest
design for this fan and envelope) and :func:`minimise_mass_meeting_limit` (lightest design that
keeps the limit node the required margin below its limit). Both enumerate the fin count (an
integer) in a vectorised screening pass, then polish the continuous thickness and height of the
best counts with :func:`scipy.optimize.minimize`; see :func:`minimise_junction_temperature` for
why this was chosen over a stochastic global method.

For natural convection, :func:`optimum_fin_count_natural` finds the best whole number of fins
at a fixed base temperature (or at the case's power) and reports the Bar-Cohen & Rohsenow
optimum spacing beside it.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import NamedTuple

import numpy as np
from scipy import optimize
from scipy.stats import qmc

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.errors import InputError, NotSupportedError, SolverError
from finkit.model.design import SinkInputs, allowable, solve
from finkit.physics.correlations.natural import optimum_fin_spacing_bar_cohen_rohsenow
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink import NaturalConvection, SinkSolution

__all__ = [
    "VIOLATIONS",
    "Envelope",
    "ManufacturingBounds",
    "NaturalFinCountOptimum",
    "OptimumDesign",
    "TradeStudy",
    "minimise_junction_temperature",
    "minimise_mass_meeting_limit",
    "optimum_fin_count_natural",
    "pareto_front",
    "pin_fin_designs",
    "pin_fin_grid",
    "pin_fin_sample",
    "plate_fin_designs",
    "plate_fin_grid",
    "plate_fin_sample",
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
        """A design variable or a result by name."""
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
            forced convection; sink resistance and mass in natural convection.
        require_limit : bool
            Only designs that meet the limit with the required margin take part.
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
        """Index of the feasible design with the smallest value of a column."""
        usable = self.meets_limit if require_limit else self.is_feasible
        values = np.where(usable, self.column(objective), np.nan)
        if not np.any(np.isfinite(values)):
            raise SolverError(
                "trade study: no feasible design"
                + (" meets the limit with the required margin" if require_limit else "")
            )
        return int(np.nanargmin(values))

    def inputs_for(self, index: int) -> SinkInputs:
        """The case inputs with the geometry of design ``index``."""
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


# --------------------------------------------------------------------------------------
# Pareto front
# --------------------------------------------------------------------------------------


def _front_2d(points: np.ndarray) -> np.ndarray:
    """Non-dominated mask of unique 2-D points (sort + sweep)."""
    order = np.lexsort((points[:, 1], points[:, 0]))
    second = points[order, 1]
    best_before = np.concatenate(([np.inf], np.minimum.accumulate(second)[:-1]))
    keep = np.zeros(len(points), dtype=bool)
    keep[order] = second < best_before
    return keep


def _front_nd(points: np.ndarray) -> np.ndarray:
    """Non-dominated mask of unique points, any dimension (filter, O(n * front size))."""
    order = np.lexsort(points.T[::-1])
    p = points[order]
    index = np.arange(len(p))
    i = 0
    while i < len(p):
        # Points not dominated by p[i] (p[i] itself stays: unique points differ somewhere).
        keep = np.any(p < p[i], axis=1)
        keep[i] = True
        p, index = p[keep], index[keep]
        i = int(np.sum(keep[:i])) + 1
    mask = np.zeros(len(points), dtype=bool)
    mask[order[index]] = True
    return mask


def pareto_front(objectives) -> np.ndarray:
    """Mask of the non-dominated rows when every column is minimised.

    Parameters
    ----------
    objectives : array_like, shape (n, k)
        One row per design, one column per objective (smaller is better) [any units]. Rows
        with a NaN are left out (never on the front).

    Returns
    -------
    numpy.ndarray of bool, shape (n,)
        True for rows that no other row dominates. Row a dominates row b when a is no worse in
        every column and better in at least one; identical rows do not dominate each other, so
        duplicates of a front point are all on the front.

    Notes
    -----
    Duplicate rows are merged first (:func:`numpy.unique`). Two objectives: sort by the first
    (then the second) and keep each point whose second value is below every earlier one,
    O(n log n). More objectives: after a lexicographic sort the first remaining point is
    non-dominated; remove everything it dominates and repeat, O(n · front size).

    Examples
    --------
    >>> pareto_front([[1, 5], [2, 3], [3, 4], [4, 1]]).tolist()
    [True, True, False, True]
    """
    values = np.asarray(objectives, dtype=float)
    if values.ndim != 2:
        raise InputError(
            f"objectives: expected a 2-D array (designs x objectives), got {values.ndim}-D"
        )
    n = values.shape[0]
    mask = np.zeros(n, dtype=bool)
    valid = np.all(np.isfinite(values), axis=1)
    if not np.any(valid) or values.shape[1] == 0:
        return mask
    unique, inverse = np.unique(values[valid], axis=0, return_inverse=True)
    if unique.shape[1] == 1:
        front = unique[:, 0] == unique[:, 0].min()
    elif unique.shape[1] == 2:
        front = _front_2d(unique)
    else:
        front = _front_nd(unique)
    mask[np.flatnonzero(valid)] = front[np.ravel(inverse)]
    return mask


# --------------------------------------------------------------------------------------
# Evaluating designs
# --------------------------------------------------------------------------------------


def _plate_violations(n, height, thickness, envelope: Envelope, bounds: ManufacturingBounds):
    w = envelope.base_width
    with np.errstate(divide="ignore", invalid="ignore"):
        gap = (w - n * thickness) / (n - 1.0)
        flags = np.where((n < 2) | ~(gap > 0), _FIT, 0)
        flags |= np.where(gap < bounds.min_fin_gap, _GAP, 0)
        flags |= np.where(thickness < bounds.min_fin_thickness, _THICK, 0)
        flags |= np.where(height / gap > bounds.max_fin_aspect_ratio, _ASPECT, 0)
    flags |= np.where(
        envelope.base_thickness + height > envelope.max_height * (1 + 1e-12), _HEIGHT, 0
    )
    return flags.astype(int), gap


def _pin_violations(d, height, st, sl, arrangement, envelope, bounds: ManufacturingBounds):
    w, length = envelope.base_width, envelope.base_length
    diag = np.sqrt(sl**2 + (st / 2.0) ** 2)
    fit = (st <= d) | (d > w) | (d > length)
    if arrangement == "inline":
        fit |= sl <= d
        gap = np.minimum(st, sl) - d
    else:
        fit |= (diag <= d) | (2.0 * sl <= d)
        per_row = np.floor((w - d) / st + 1e-9) + 1.0
        rows = np.floor((length - d) / sl + 1e-9) + 1.0
        shifted = np.where((per_row - 0.5) * st + d <= w * (1 + 1e-9), per_row, per_row - 1.0)
        fit |= (rows >= 2) & (shifted < 1)
        gap = np.minimum(np.minimum(st, diag), 2.0 * sl) - d
    flags = np.where(fit, _FIT, 0)
    flags |= np.where(gap < bounds.min_pin_gap, _GAP, 0)
    flags |= np.where(d < bounds.min_pin_diameter, _THICK, 0)
    flags |= np.where(height / d > bounds.max_pin_aspect_ratio, _ASPECT, 0)
    flags |= np.where(
        envelope.base_thickness + height > envelope.max_height * (1 + 1e-12), _HEIGHT, 0
    )
    return flags.astype(int)


def _solve_designs(inputs: SinkInputs, with_allowable: bool):
    """Temperatures at the case's power and, if asked, the allowable power (one call each).

    A design so poor that at the case's power its air film would leave the air-property table
    (or its natural-convection root the bracket) makes the whole batch fail; only then the
    batch is solved again with the power of every hot design lowered so that its base excess
    stays below the table, and its temperature rises scaled back up linearly (flagged).

    Returns (solution, allowable power or None, is_extrapolated, scale).
    """
    t_in = float(np.asarray(inputs.air.inlet_temperature))
    usable = inputs.limit_temperature - inputs.required_margin
    power = np.asarray(inputs.source.power, float)
    at_limit = allowable(inputs) if usable > t_in and with_allowable else None
    try:
        sol = solve(inputs)
        is_hot, scale = np.zeros(np.shape(sol.power), dtype=bool), 1.0
    except (InputError, SolverError):
        if usable <= t_in:
            raise
        if at_limit is None:
            at_limit = allowable(inputs)
        # Base excess at the case's power, estimated with the resistance at the limit.
        theta = power * np.asarray(at_limit.sink_resistance, float)
        theta_max = 2.0 * (_FILM_CEILING - t_in) / 1.3
        scale = np.maximum(theta / theta_max, 1.0)
        sol = solve(inputs, source=replace(inputs.source, power=power / scale))
        is_hot = scale > 1.0
    allowable_power = None
    if with_allowable:
        allowable_power = np.asarray(at_limit.power, float) if at_limit is not None else 0.0
    return sol, allowable_power, is_hot, scale


def _evaluate(
    inputs: SinkInputs,
    sink_type: str,
    design: dict[str, np.ndarray],
    violations: np.ndarray,
    envelope: Envelope,
    bounds: ManufacturingBounds,
    with_allowable: bool,
) -> TradeStudy:
    n = violations.size
    ok = violations == 0
    base = replace(
        inputs,
        geometry=replace(
            inputs.geometry,
            base_width=envelope.base_width,
            base_length=envelope.base_length,
            base_thickness=envelope.base_thickness,
        ),
    )
    nan = np.full(n, np.nan)
    results = {name: nan.copy() for name in TradeStudy.RESULTS}
    extrapolated = np.zeros(n, dtype=bool)
    if sink_type == "pin-fin":
        design["pin_count"] = nan.copy()
    if np.any(ok):
        sub = _inputs_with(base, sink_type, {k: v[ok] for k, v in design.items()})
        sol, p_allow, is_hot, scale = _solve_designs(sub, with_allowable)
        t_in = np.asarray(sol.inlet_air_temperature, float)
        lift = np.broadcast_to(scale, np.shape(sol.power))

        def at_power(values):
            return t_in + (np.asarray(values, float) - t_in) * lift

        node = sol.node_temperature(inputs.limit_node)
        results["sink_resistance"][ok] = sol.sink_resistance
        results["total_resistance"][ok] = sol.total_resistance
        results["junction_temperature"][ok] = at_power(sol.junction_temperature)
        results["limit_node_temperature"][ok] = at_power(node)
        results["base_temperature"][ok] = at_power(sol.base_temperature)
        results["pressure_drop"][ok] = sol.pressure_drop
        results["volume_flow"][ok] = sol.sink_volume_flow
        results["mass"][ok] = sub.geometry.mass(sub.material.density)
        if p_allow is not None:
            results["allowable_power"][ok] = p_allow
        elif with_allowable:
            results["allowable_power"][ok] = 0.0
        results["temperature_margin"][ok] = (
            inputs.limit_temperature - results["limit_node_temperature"][ok]
        )
        extrapolated[ok] = np.broadcast_to(is_hot, np.shape(sol.power))
        if sink_type == "pin-fin":
            design["pin_count"][ok] = sub.geometry.pin_count
    return TradeStudy(
        sink_type=sink_type,
        design=design,
        **results,
        violations=violations,
        is_extrapolated=extrapolated,
        limit_node=inputs.limit_node,
        limit_temperature=float(inputs.limit_temperature),
        required_margin=float(inputs.required_margin),
        inputs=base,
        envelope=envelope,
        bounds=bounds,
    )


def _plate_study(inputs, n, height, thickness, bounds, envelope, with_allowable) -> TradeStudy:
    if not isinstance(inputs.geometry, PlateFinSink):
        raise InputError("trade study: plate-fin variables need a plate-fin case (sink.type)")
    bounds = ManufacturingBounds() if bounds is None else bounds
    envelope = Envelope.of(inputs) if envelope is None else envelope
    n, height, thickness = (np.asarray(a, float).ravel() for a in (n, height, thickness))
    if np.any(np.abs(n - np.round(n)) > 1e-9):
        raise InputError("fin_counts: every fin count must be a whole number")
    violations, gap = _plate_violations(n, height, thickness, envelope, bounds)
    design = {
        "fin_count": n,
        "fin_height": height,
        "fin_thickness": thickness,
        "fin_spacing": gap,
    }
    return _evaluate(inputs, "plate-fin", design, violations, envelope, bounds, with_allowable)


def _pin_study(inputs, d, height, st, sl, bounds, envelope, with_allowable) -> TradeStudy:
    if not isinstance(inputs.geometry, PinFinSink):
        raise InputError("trade study: pin-fin variables need a pin-fin case (sink.type)")
    bounds = ManufacturingBounds() if bounds is None else bounds
    envelope = Envelope.of(inputs) if envelope is None else envelope
    d, height, st, sl = (np.asarray(a, float).ravel() for a in (d, height, st, sl))
    violations = _pin_violations(d, height, st, sl, inputs.geometry.arrangement, envelope, bounds)
    design = {
        "pin_diameter": d,
        "pin_height": height,
        "transverse_pitch": st,
        "longitudinal_pitch": sl,
    }
    return _evaluate(inputs, "pin-fin", design, violations, envelope, bounds, with_allowable)


def plate_fin_designs(
    inputs: SinkInputs,
    fin_counts,
    fin_heights,
    fin_thicknesses,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    with_allowable: bool = True,
) -> TradeStudy:
    """Given plate-fin designs (arrays that broadcast together, flattened), one vectorised call.

    Parameters are those of :func:`plate_fin_grid`, but element by element, not combined:
    design i is ``(fin_counts[i], fin_heights[i], fin_thicknesses[i])`` [-, m, m].
    """
    n, h, t = np.broadcast_arrays(
        *(np.asarray(a, float) for a in (fin_counts, fin_heights, fin_thicknesses))
    )
    return _plate_study(inputs, n, h, t, bounds, envelope, with_allowable)


def pin_fin_designs(
    inputs: SinkInputs,
    pin_diameters,
    pin_heights,
    transverse_pitches,
    longitudinal_pitches,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    with_allowable: bool = True,
) -> TradeStudy:
    """Given pin-fin designs (arrays that broadcast together, flattened), one vectorised call."""
    d, h, st, sl = np.broadcast_arrays(
        *(
            np.asarray(a, float)
            for a in (pin_diameters, pin_heights, transverse_pitches, longitudinal_pitches)
        )
    )
    return _pin_study(inputs, d, h, st, sl, bounds, envelope, with_allowable)


def plate_fin_grid(
    inputs: SinkInputs,
    fin_counts,
    fin_heights,
    fin_thicknesses,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    with_allowable: bool = True,
) -> TradeStudy:
    """Every combination of fin count, height and thickness, solved in one vectorised call.

    Parameters
    ----------
    inputs : SinkInputs
        The case (source, air, fan or flow, limit); its fins are replaced [SI].
    fin_counts : array_like of int
        Fin counts [-].
    fin_heights : array_like
        Fin heights, base to tip [m].
    fin_thicknesses : array_like
        Fin thicknesses [m].
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source).
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height.
    with_allowable : bool
        Also solve the allowable power at the limit less the margin (a second vectorised call).

    Returns
    -------
    TradeStudy
        ``len(fin_counts) * len(fin_heights) * len(fin_thicknesses)`` designs, count varying
        slowest.
    """
    n, h, t = np.meshgrid(
        np.asarray(fin_counts, float),
        np.asarray(fin_heights, float),
        np.asarray(fin_thicknesses, float),
        indexing="ij",
    )
    return _plate_study(inputs, n, h, t, bounds, envelope, with_allowable)


def _unit_samples(count: int, dims: int, method: str, seed) -> np.ndarray:
    if method == "random":
        return np.random.default_rng(seed).random((count, dims))
    if method == "latin-hypercube":
        return qmc.LatinHypercube(d=dims, rng=np.random.default_rng(seed)).random(count)
    if method == "sobol":
        return qmc.Sobol(d=dims, rng=np.random.default_rng(seed)).random(count)
    raise InputError(f"sampling method: got {method!r}; allowed: random, latin-hypercube, sobol")


def _check_range(name, pair):
    lo, hi = (float(v) for v in pair)
    if not (np.isfinite(lo) and np.isfinite(hi) and hi >= lo):
        raise InputError(f"{name}: got ({lo!r}, {hi!r}); need two finite values, low <= high")
    return lo, hi


def plate_fin_sample(
    inputs: SinkInputs,
    samples: int,
    fin_count_range: tuple[int, int],
    fin_height_range: tuple[float, float],
    fin_thickness_range: tuple[float, float],
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    method: str = "latin-hypercube",
    seed: int | None = 0,
    with_allowable: bool = True,
) -> TradeStudy:
    """Plate-fin designs sampled in a box (Latin hypercube, Sobol or random), one call.

    Parameters
    ----------
    inputs : SinkInputs
        The case [SI].
    samples : int
        Number of designs [-].
    fin_count_range : (int, int)
        Lowest and highest fin count, both included [-].
    fin_height_range, fin_thickness_range : (float, float)
        Low and high fin height and thickness [m].
    bounds, envelope, with_allowable
        As in :func:`plate_fin_grid`.
    method : {"latin-hypercube", "sobol", "random"}
        Sampler of :mod:`scipy.stats.qmc` or independent uniform numbers [-].
    seed : int or None
        Seed of the generator [-].
    """
    n_lo, n_hi = _check_range("fin_count_range", fin_count_range)
    h = _check_range("fin_height_range", fin_height_range)
    t = _check_range("fin_thickness_range", fin_thickness_range)
    u = _unit_samples(int(samples), 3, method, seed)
    counts = np.minimum(np.floor(n_lo + u[:, 0] * (n_hi - n_lo + 1.0)), n_hi)
    heights = h[0] + u[:, 1] * (h[1] - h[0])
    thicknesses = t[0] + u[:, 2] * (t[1] - t[0])
    return _plate_study(inputs, counts, heights, thicknesses, bounds, envelope, with_allowable)


def pin_fin_grid(
    inputs: SinkInputs,
    pin_diameters,
    pin_heights,
    transverse_pitches,
    longitudinal_pitches=None,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    with_allowable: bool = True,
) -> TradeStudy:
    """Every combination of pin diameter, height and pitches, solved in one vectorised call.

    Parameters
    ----------
    inputs : SinkInputs
        A pin-fin case; its pins are replaced (the arrangement is kept) [SI].
    pin_diameters, pin_heights, transverse_pitches : array_like
        Values of each variable [m].
    longitudinal_pitches : array_like, optional
        Values of the longitudinal pitch [m]; None: equal to the transverse pitch (square or
        equilateral-like grid), which keeps the grid three-dimensional.
    bounds, envelope, with_allowable
        As in :func:`plate_fin_grid`.
    """
    if longitudinal_pitches is None:
        d, h, st = np.meshgrid(
            np.asarray(pin_diameters, float),
            np.asarray(pin_heights, float),
            np.asarray(transverse_pitches, float),
            indexing="ij",
        )
        sl = st
    else:
        d, h, st, sl = np.meshgrid(
            np.asarray(pin_diameters, float),
            np.asarray(pin_heights, float),
            np.asarray(transverse_pitches, float),
            np.asarray(longitudinal_pitches, float),
            indexing="ij",
        )
    return _pin_study(inputs, d, h, st, sl, bounds, envelope, with_allowable)


def pin_fin_sample(
    inputs: SinkInputs,
    samples: int,
    pin_diameter_range: tuple[float, float],
    pin_height_range: tuple[float, float],
    transverse_pitch_range: tuple[float, float],
    longitudinal_pitch_range: tuple[float, float] | None = None,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    method: str = "latin-hypercube",
    seed: int | None = 0,
    with_allowable: bool = True,
) -> TradeStudy:
    """Pin-fin designs sampled in a box, one vectorised call (see :func:`plate_fin_sample`).

    ``longitudinal_pitch_range`` None samples the longitudinal pitch equal to the transverse.
    """
    ranges = [
        _check_range("pin_diameter_range", pin_diameter_range),
        _check_range("pin_height_range", pin_height_range),
        _check_range("transverse_pitch_range", transverse_pitch_range),
    ]
    if longitudinal_pitch_range is not None:
        ranges.append(_check_range("longitudinal_pitch_range", longitudinal_pitch_range))
    u = _unit_samples(int(samples), len(ranges), method, seed)
    cols = [lo + u[:, i] * (hi - lo) for i, (lo, hi) in enumerate(ranges)]
    sl = cols[3] if len(cols) == 4 else cols[2]
    return _pin_study(inputs, cols[0], cols[1], cols[2], sl, bounds, envelope, with_allowable)


# --------------------------------------------------------------------------------------
# Optimisers (plate fins)
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class OptimumDesign:
    """The design an optimiser found, with its results.

    Attributes
    ----------
    objective : str
        ``junction_temperature`` (coolest) or ``mass`` (lightest meeting the limit).
    fin_count : int
    fin_thickness, fin_height, fin_spacing : float
        The design [m].
    junction_temperature, limit_node_temperature : float
        At the case's power [K].
    sink_resistance : float
        [K W⁻¹].
    pressure_drop : float
        [Pa] (NaN in natural convection).
    mass : float
        [kg].
    allowable_power : float
        At the limit less the required margin [W].
    temperature_margin : float
        ``limit - limit_node_temperature`` [K].
    meets_limit : bool
        Margin at least the required margin.
    active_bounds : tuple of str
        Bounds the optimum sits on (e.g. ``fin gap at minimum``).
    inputs : SinkInputs
        The case with the optimum geometry.
    solution : SinkSolution
        Its solution at the case's power.
    screen : TradeStudy
        The screening grid (every feasible count).
    evaluations : int
        Designs solved in all (screen, polish, finite differences) [-].
    polished_counts : tuple of int
        Fin counts whose thickness and height were polished.
    """

    objective: str
    fin_count: int
    fin_thickness: float
    fin_height: float
    fin_spacing: float
    junction_temperature: float
    limit_node_temperature: float
    sink_resistance: float
    pressure_drop: float
    mass: float
    allowable_power: float
    temperature_margin: float
    meets_limit: bool
    active_bounds: tuple[str, ...]
    inputs: SinkInputs = field(repr=False)
    solution: SinkSolution = field(repr=False)
    screen: TradeStudy = field(repr=False)
    evaluations: int = 0
    polished_counts: tuple[int, ...] = ()


class _PlateSpace:
    """Feasible plate-fin designs of one fin count mapped onto the unit square.

    ``u_t`` in [0, 1] runs the thickness from the minimum to the largest that keeps the minimum
    gap (or the search maximum); ``u_h`` runs the height from the search minimum to the lower of
    the envelope and the aspect-ratio limit at that thickness. Every point of the square is a
    feasible design, so the manufacturing bounds become box bounds.
    """

    def __init__(self, envelope, bounds, min_fin_height, max_fin_thickness):
        self.w = envelope.base_width
        self.h_env = envelope.max_fin_height
        self.g_min = max(bounds.min_fin_gap, 1e-6)
        self.t_min = max(bounds.min_fin_thickness, 1e-6)
        self.t_max = max_fin_thickness
        self.ar = bounds.max_fin_aspect_ratio
        self.h_min = min_fin_height
        if self.h_min > self.h_env:
            raise InputError(
                f"min_fin_height: {self.h_min:g} m exceeds the envelope's fin height "
                f"{self.h_env:g} m"
            )
        if self.h_min > self.ar * self.g_min:
            raise InputError(
                f"min_fin_height: {self.h_min:g} m exceeds max_fin_aspect_ratio x min_fin_gap "
                f"= {self.ar * self.g_min:g} m; lower it"
            )
        if self.t_max < self.t_min:
            raise InputError(
                f"max_fin_thickness: {self.t_max:g} m is below min_fin_thickness {self.t_min:g} m"
            )

    def counts(self) -> np.ndarray:
        """Fin counts with at least one feasible design."""
        n_max = int(np.floor((self.w + self.g_min) / (self.t_min + self.g_min) + 1e-9))
        return np.arange(2, max(n_max, 1) + 1, dtype=float)

    def thickness_high(self, n):
        return np.minimum(self.t_max, (self.w - (n - 1.0) * self.g_min) / n)

    def design(self, n, u_t, u_h):
        t = self.t_min + u_t * (self.thickness_high(n) - self.t_min)
        gap = (self.w - n * t) / (n - 1.0)
        h_high = np.minimum(self.h_env, self.ar * gap)
        h = self.h_min + u_h * (h_high - self.h_min)
        return t, h, gap

    def unit(self, n, thickness, height):
        """Inverse of :meth:`design`: unit coordinates of a feasible design."""
        t_hi = float(self.thickness_high(n))
        u_t = (thickness - self.t_min) / (t_hi - self.t_min) if t_hi > self.t_min else 0.0
        gap = (self.w - n * thickness) / (n - 1.0)
        h_hi = min(self.h_env, self.ar * gap)
        u_h = (height - self.h_min) / (h_hi - self.h_min) if h_hi > self.h_min else 0.0
        return np.clip(np.array([u_t, u_h], float), 0.0, 1.0)

    def active(self, n, u_t, u_h, tol=1e-3) -> tuple[str, ...]:
        out = []
        t_hi = float(self.thickness_high(n))
        if u_t <= tol:
            out.append("fin thickness at minimum")
        if u_t >= 1 - tol:
            out.append(
                "fin gap at minimum" if t_hi < self.t_max else "fin thickness at search maximum"
            )
        t, h, gap = self.design(n, u_t, u_h)
        if u_h >= 1 - tol:
            out.append(
                "fin height at envelope"
                if self.h_env <= self.ar * float(gap)
                else "fin height/gap at maximum"
            )
        if u_h <= tol:
            out.append("fin height at search minimum")
        return tuple(out)


class _Evaluator:
    """Vectorised, cached evaluation of plate-fin designs (unit-square coordinates)."""

    def __init__(self, inputs: SinkInputs, space: _PlateSpace, node: str):
        self.inputs, self.space, self.node = inputs, space, node
        self.evaluations = 0
        self.cache: dict[bytes, tuple] = {}

    def many(self, n, u_t, u_h):
        """(node temperature [K], mass [kg]) of many designs of count(s) n, one call."""
        n, u_t, u_h = np.broadcast_arrays(*(np.asarray(a, float) for a in (n, u_t, u_h)))
        t, h, _ = self.space.design(n, u_t, u_h)
        geometry = replace(self.inputs.geometry, fin_count=n, fin_thickness=t, fin_height=h)
        sol = solve(self.inputs, geometry=geometry)
        self.evaluations += n.size
        temperature = np.broadcast_to(np.asarray(sol.node_temperature(self.node), float), n.shape)
        mass = np.asarray(geometry.mass(self.inputs.material.density), float)
        return temperature, np.broadcast_to(mass, n.shape)

    def joint(self, counts, x, step=1e-6):
        """Values and central-difference gradients of several counts at once.

        ``x`` holds ``(u_t, u_h)`` of every count in ``counts``, flattened; the 5 stencil points
        of every count are solved in one vectorised call. Returns node temperatures (K,),
        their gradients (K, 2), masses (K,) and mass gradients (K, 2).
        """
        key = x.tobytes()
        if key not in self.cache:
            u = np.asarray(x, float).reshape(-1, 2)
            du = np.array([[0, 0], [step, 0], [-step, 0], [0, step], [0, -step]], float)
            pts = u[:, None, :] + du[None, :, :]  # (K, 5, 2)
            n = np.repeat(np.asarray(counts, float), 5)
            temperature, mass = self.many(n, pts[..., 0].ravel(), pts[..., 1].ravel())
            temperature, mass = temperature.reshape(-1, 5), mass.reshape(-1, 5)

            def grad(v):
                return np.column_stack((v[:, 1] - v[:, 2], v[:, 3] - v[:, 4])) / (2 * step)

            self.cache = {key: (temperature[:, 0], grad(temperature), mass[:, 0], grad(mass))}
        return self.cache[key]


def _check_plate_case(inputs: SinkInputs):
    if not isinstance(inputs.geometry, PlateFinSink):
        raise NotSupportedError(
            "optimiser: plate-fin cases only (use pin_fin_grid or pin_fin_sample with "
            "pareto_front for pin fins)"
        )
    if np.ndim(inputs.source.power) or np.ndim(inputs.air.inlet_temperature):
        raise InputError("optimiser: the case must be a single scenario (scalar power and inlet)")


def _screen(inputs, space: _PlateSpace, screen_points: int, node: str, evaluator):
    if node not in ("junction", inputs.limit_node):
        raise InputError(f"node: got {node!r}; use 'junction' or the case's limit node")
    counts = space.counts()
    grid = np.linspace(0.0, 1.0, screen_points)
    n, u_t, u_h = np.meshgrid(counts, grid, grid, indexing="ij")
    n, u_t, u_h = n.ravel(), u_t.ravel(), u_h.ravel()
    t, h, _ = space.design(n, u_t, u_h)
    study = _plate_study(
        inputs,
        n,
        h,
        t,
        ManufacturingBounds(
            min_fin_gap=space.g_min * (1 - 1e-9),
            min_fin_thickness=space.t_min * (1 - 1e-9),
            max_fin_aspect_ratio=space.ar * (1 + 1e-9),
        ),
        Envelope(
            inputs.geometry.base_width,
            inputs.geometry.base_length,
            inputs.geometry.base_thickness,
            float(inputs.geometry.base_thickness) + space.h_env * (1 + 1e-9),
        ),
        False,
    )
    evaluator.evaluations += n.size
    temperature = study.junction_temperature if node == "junction" else study.limit_node_temperature
    return study, n, u_t, u_h, np.asarray(temperature, float), np.asarray(study.mass, float)


def _result(objective, inputs, n, u, space, screen, evaluator, polished) -> OptimumDesign:
    t, h, gap = space.design(float(n), u[0], u[1])
    t, h, gap = float(t), float(h), float(gap)
    best = replace(
        inputs, geometry=replace(inputs.geometry, fin_count=int(n), fin_thickness=t, fin_height=h)
    )
    sol = solve(best)
    usable = best.limit_temperature - best.required_margin
    p_allow = (
        float(allowable(best).power)
        if usable > float(np.asarray(best.air.inlet_temperature))
        else 0.0
    )
    node_t = float(sol.node_temperature(best.limit_node))
    margin = best.limit_temperature - node_t
    return OptimumDesign(
        objective=objective,
        fin_count=int(n),
        fin_thickness=t,
        fin_height=h,
        fin_spacing=gap,
        junction_temperature=float(sol.junction_temperature),
        limit_node_temperature=node_t,
        sink_resistance=float(sol.sink_resistance),
        pressure_drop=float(sol.pressure_drop),
        mass=float(best.geometry.mass(best.material.density)),
        allowable_power=p_allow,
        temperature_margin=margin,
        meets_limit=bool(margin >= best.required_margin - 1e-9),
        active_bounds=space.active(float(n), u[0], u[1]),
        inputs=best,
        solution=sol,
        screen=screen,
        evaluations=evaluator.evaluations + 2,
        polished_counts=tuple(int(c) for c in sorted(polished)),
    )


def _polish_counts(best_by_count: dict[int, float], polish_counts: int) -> list[int]:
    ranked = sorted((v, c) for c, v in best_by_count.items() if np.isfinite(v))
    return [c for _, c in ranked[:polish_counts]]


def minimise_junction_temperature(
    inputs: SinkInputs,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    node: str = "junction",
    min_fin_height: float = 5e-3,
    max_fin_thickness: float = 4e-3,
    screen_points: int = 9,
    polish_counts: int = 5,
) -> OptimumDesign:
    """The coolest plate-fin design for this fan (or flow) inside the envelope and bounds.

    Parameters
    ----------
    inputs : SinkInputs
        A plate-fin case; its fan or flow, power and air are kept [SI].
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source).
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height.
    node : {"junction", limit node}
        The temperature minimised [-].
    min_fin_height : float
        Lowest fin height searched [m].
    max_fin_thickness : float
        Thickest fin searched [m].
    screen_points : int
        Points per continuous variable in the screening grid (per fin count) [-].
    polish_counts : int
        How many of the best screened fin counts are polished [-]; the neighbours of the best
        polished count are always polished too.

    Returns
    -------
    OptimumDesign
        The design, its results and the screening study.

    Notes
    -----
    Method. The fin count is an integer with a few tens of feasible values, so it is
    *enumerated*: every feasible count is screened on a ``screen_points²`` grid of thickness
    and height in one vectorised solve. For fixed count the problem is smooth in thickness and
    height, and a change of variables maps the feasible region (minimum thickness, minimum gap,
    aspect ratio, envelope height) onto the unit square, so the bounds become box bounds. The
    best counts are then polished with :func:`scipy.optimize.minimize` (L-BFGS-B) using central
    finite differences evaluated in one vectorised call per gradient. A mixed-integer
    differential evolution was not chosen: it is stochastic, needs thousands of evaluations
    where this needs a few hundred, and gives no proof that every count was looked at.
    """
    _check_plate_case(inputs)
    bounds = ManufacturingBounds() if bounds is None else bounds
    envelope = Envelope.of(inputs) if envelope is None else envelope
    base = _with_envelope(inputs, envelope)
    space = _PlateSpace(envelope, bounds, min_fin_height, max_fin_thickness)
    evaluator = _Evaluator(base, space, node)
    screen, n, u_t, u_h, temperature, _ = _screen(base, space, screen_points, node, evaluator)
    best_by_count = {}
    start = {}
    for c in np.unique(n):
        sel = np.flatnonzero(n == c)
        i = sel[np.nanargmin(temperature[sel])] if np.any(np.isfinite(temperature[sel])) else None
        if i is not None:
            best_by_count[int(c)] = float(temperature[i])
            start[int(c)] = np.array([u_t[i], u_h[i]])

    def polish(counts):
        def fun(x):
            value, grad, _, _ = evaluator.joint(counts, x)
            return float(np.sum(value)), grad.ravel()

        x0 = np.concatenate([start[c] for c in counts])
        res = optimize.minimize(
            fun,
            x0,
            jac=True,
            method="L-BFGS-B",
            bounds=[(0.0, 1.0)] * x0.size,
            options={"maxiter": 100, "ftol": 1e-13, "gtol": 1e-9},
        )
        x = np.clip(res.x, 0.0, 1.0).reshape(-1, 2)
        values = evaluator.many(np.asarray(counts, float), x[:, 0], x[:, 1])[0]
        for c, u, value in zip(counts, x, values, strict=True):
            # Never worse than the screen.
            results[c] = (
                (u, float(value)) if value <= best_by_count[c] else (start[c], best_by_count[c])
            )

    results = {}
    todo = _polish_counts(best_by_count, polish_counts)
    while todo:
        polish(todo)
        best = min(results, key=lambda c: results[c][1])
        todo = [c for c in (best - 1, best + 1) if c in start and c not in results]
    best = min(results, key=lambda c: results[c][1])
    return _result(
        "junction_temperature", base, best, results[best][0], space, screen, evaluator, results
    )


def minimise_mass_meeting_limit(
    inputs: SinkInputs,
    bounds: ManufacturingBounds | None = None,
    envelope: Envelope | None = None,
    *,
    min_fin_height: float = 5e-3,
    max_fin_thickness: float = 4e-3,
    screen_points: int = 9,
    polish_counts: int = 5,
) -> OptimumDesign:
    """The lightest plate-fin design that keeps the limit node the required margin below its limit.

    Parameters are those of :func:`minimise_junction_temperature`. The constraint is
    ``T_node <= limit - required_margin`` at the case's power, for the case's limit node.

    Returns
    -------
    OptimumDesign
        The lightest design found (constraint met to 1e-6 K).

    Raises
    ------
    SolverError
        When no design in the envelope and bounds meets the limit with the margin (the message
        gives the coolest temperature reachable).

    Notes
    -----
    Same enumeration and change of variables as :func:`minimise_junction_temperature`; each of
    the best counts (lightest screened design meeting the limit) is polished with SLSQP, the
    mass as objective and the temperature margin as an inequality constraint, both with
    vectorised central-difference gradients. A polished point that breaks the constraint is
    replaced by the best screened point of its count.
    """
    _check_plate_case(inputs)
    bounds = ManufacturingBounds() if bounds is None else bounds
    envelope = Envelope.of(inputs) if envelope is None else envelope
    base = _with_envelope(inputs, envelope)
    node = base.limit_node
    usable = base.limit_temperature - base.required_margin
    space = _PlateSpace(envelope, bounds, min_fin_height, max_fin_thickness)
    evaluator = _Evaluator(base, space, node)
    screen, n, u_t, u_h, temperature, mass = _screen(base, space, screen_points, node, evaluator)
    meets = temperature <= usable
    if not np.any(meets):
        coolest = minimise_junction_temperature(
            inputs,
            bounds,
            envelope,
            node=node,
            min_fin_height=min_fin_height,
            max_fin_thickness=max_fin_thickness,
            screen_points=screen_points,
            polish_counts=polish_counts,
        )
        if coolest.limit_node_temperature > usable:
            raise SolverError(
                f"no design in the envelope and bounds keeps the {node} at or below the limit "
                f"less the margin ({usable - 273.15:.2f} degC); the coolest reaches "
                f"{coolest.limit_node_temperature - 273.15:.2f} degC "
                f"({coolest.fin_count} fins)"
            )
        c = coolest.fin_count
        best_by_count = {c: coolest.mass}
        start = {c: space.unit(c, coolest.fin_thickness, coolest.fin_height)}
        evaluator.evaluations += coolest.evaluations
    else:
        best_by_count, start = {}, {}
        for c in np.unique(n[meets]):
            sel = np.flatnonzero((n == c) & meets)
            i = sel[np.argmin(mass[sel])]
            best_by_count[int(c)] = float(mass[i])
            start[int(c)] = np.array([u_t[i], u_h[i]])
    results = {}

    def polish(counts):
        k = len(counts)

        def objective(x):
            _, _, m, grad_m = evaluator.joint(counts, x)
            return float(np.sum(m)), grad_m.ravel()

        def margin(x):
            return usable - evaluator.joint(counts, x)[0]

        def margin_jac(x):
            grad = evaluator.joint(counts, x)[1]
            jac = np.zeros((k, 2 * k))
            for j in range(k):
                jac[j, 2 * j : 2 * j + 2] = -grad[j]
            return jac

        x0 = np.concatenate([start[c] for c in counts])
        res = optimize.minimize(
            objective,
            x0,
            jac=True,
            method="SLSQP",
            bounds=[(0.0, 1.0)] * x0.size,
            constraints=[{"type": "ineq", "fun": margin, "jac": margin_jac}],
            options={"maxiter": 100, "ftol": 1e-12},
        )
        x = np.clip(res.x, 0.0, 1.0).reshape(-1, 2)
        t_u, m_u = evaluator.many(np.asarray(counts, float), x[:, 0], x[:, 1])
        for c, u, t_c, m_c in zip(counts, x, t_u, m_u, strict=True):
            # A point that breaks the constraint, or is heavier, falls back to the screen.
            ok = t_c <= usable + 1e-6 and m_c <= best_by_count[c]
            results[c] = (u, float(m_c)) if ok else (start[c], best_by_count[c])

    todo = _polish_counts(best_by_count, polish_counts)
    while todo:
        polish(todo)
        best = min(results, key=lambda c: results[c][1])
        todo = [c for c in (best - 1, best + 1) if c in start and c not in results]
    best = min(results, key=lambda c: results[c][1])
    return _result("mass", base, best, results[best][0], space, screen, evaluator, results)


def _with_envelope(inputs: SinkInputs, envelope: Envelope) -> SinkInputs:
    return replace(
        inputs,
        geometry=replace(
            inputs.geometry,
            base_width=envelope.base_width,
            base_length=envelope.base_length,
            base_thickness=envelope.base_thickness,
        ),
    )


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
        best design, air at its film temperature [m].
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
        gap of ``bounds``.
    bounds : ManufacturingBounds, optional
        Only ``min_fin_gap`` is used, for the default counts.

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
    s_opt = float(
        optimum_fin_spacing_bar_cohen_rohsenow(float(g.base_length), film_excess, film, nu, alpha)
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
