"""Optimisers for plate fins: screen every fin count on a grid, then polish the best."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np
from scipy import optimize

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.errors import InputError, NotSupportedError, SolverError
from finkit.model.design import SinkInputs, allowable, solve
from finkit.model.trade.designs import (
    TradeStudy,
)
from finkit.model.trade.evaluate import (
    _plate_study,
)
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "OptimumDesign",
    "minimise_junction_temperature",
    "minimise_mass_meeting_limit",
]


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
        A plate-fin case; its fan or flow, power and air are kept. [-]
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source). [-]
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height. [-]
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

    Parameters
    ----------
    inputs : SinkInputs
        A plate-fin case; its fan or flow, power and air are kept. [-]
    bounds : ManufacturingBounds, optional
        Manufacturing limits (defaults: common practice, no source). [-]
    envelope : Envelope, optional
        Base plate and maximum height; default the case's base and present overall height. [-]
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
