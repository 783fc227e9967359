"""Evaluating designs: a grid or sample of plate-fin or pin-fin designs solved in one call."""

from __future__ import annotations

from dataclasses import replace

import numpy as np
from scipy.stats import qmc

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.errors import InputError, SolverError
from finkit.model.design import SinkInputs, allowable, solve
from finkit.model.trade.designs import (
    _ASPECT,
    _FILM_CEILING,
    _FIT,
    _GAP,
    _HEIGHT,
    _THICK,
    TradeStudy,
    _inputs_with,
)
from finkit.physics.geometry import PinFinSink, PlateFinSink

__all__ = [
    "pin_fin_designs",
    "pin_fin_grid",
    "pin_fin_sample",
    "plate_fin_designs",
    "plate_fin_grid",
    "plate_fin_sample",
]


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

    Parameters
    ----------
    inputs : SinkInputs
        The case (source, air, fan or flow, limit); its fins are replaced. [-]
    fin_counts : array_like of int
        Fin count of each design. [-]
    fin_heights : array_like
        Fin height of each design, base to tip. [m]
    fin_thicknesses : array_like
        Fin thickness of each design. [m]
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source). [-]
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height. [-]
    with_allowable : bool
        Also solve the allowable power at the limit less the margin (a second vectorised
        call). [-]
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
    """Given pin-fin designs (arrays that broadcast together, flattened), one vectorised call.

    Parameters
    ----------
    inputs : SinkInputs
        A pin-fin case; its pins are replaced (the arrangement is kept). [-]
    pin_diameters, pin_heights : array_like
        Pin diameter and pin height of each design. [m]
    transverse_pitches, longitudinal_pitches : array_like
        Transverse and longitudinal pitch of each design. [m]
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source). [-]
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height. [-]
    with_allowable : bool
        Also solve the allowable power at the limit less the margin (a second vectorised
        call). [-]
    """
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
        Manufacturing limits (defaults: common practice, no source). [-]
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height. [-]
    with_allowable : bool
        Also solve the allowable power at the limit less the margin (a second vectorised
        call). [-]

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
        As in :func:`plate_fin_grid`. [-]
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
        As in :func:`plate_fin_grid`. [-]
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

    Parameters
    ----------
    inputs : SinkInputs
        A pin-fin case; its pins are replaced (the arrangement is kept). [-]
    samples : int
        Number of designs. [-]
    pin_diameter_range, pin_height_range, transverse_pitch_range : (float, float)
        Low and high pin diameter, pin height and transverse pitch. [m]
    longitudinal_pitch_range : (float, float), optional
        Low and high longitudinal pitch; None: equal to the transverse pitch. [m]
    bounds, envelope, with_allowable
        As in :func:`plate_fin_grid`. [-]
    method : {"latin-hypercube", "sobol", "random"}
        Sampler of :mod:`scipy.stats.qmc` or independent uniform numbers. [-]
    seed : int or None
        Seed of the generator. [-]
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
