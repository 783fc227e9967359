"""Airflow: fan curves, system curves, the vectorised fan operating point, and flow bypass.

A forced-air heat sink sees the flow that its fan delivers against the pressure drop of
everything in the air path. This module holds the pieces of that balance (docs/methods.md, h):

* :class:`FanCurve` -- a fan's static pressure against volume flow, from a catalogue table,
  with density scaling (fan laws), series/parallel combination, speed scaling and failed fans;
* :func:`operating_point` -- the flow at which the fan pressure equals the system pressure
  drop, solved for any number of designs at once (one bracketed root per design);
* flow bypass -- a sink in a duct with clearance gaps: the flow splits between fins and gaps so
  that both branches see the same pressure difference (:func:`split_bypass`,
  :func:`operating_point_with_bypass`), with :func:`bypass_gap_pressure_drop` for the gaps;
* :func:`bracketed_root` -- the vectorised bracketed root finder used by all of the above.

System pressure drops are passed as callables ``dp(volume_flow) -> pressure_drop`` [Pa] that
accept an array of volume flows [m³ s⁻¹] broadcast against the design arrays they close over;
the shape of their result defines the batch of designs. They must return ``dp >= 0``, rising
with flow, and use the same air density as the fan (the fan is scaled with ``density``).

Design choices, stated once:

* No operating point for a design (the system needs more pressure at zero flow than the fan's
  shut-off pressure, or the callable returns NaN) gives ``volume_flow = NaN`` and
  ``is_converged = False`` for that design; the batch never raises because of one bad design.
  Pass ``raise_on_failure=True`` for a :class:`~finkit.errors.SolverError` instead (the scalar
  convenience).
* A fan curve with a positive-slope (stall) part can cross a system curve up to three times.
  The solver returns the crossing at the highest flow (the stable one on the falling part of
  the curve) and flags ``is_in_stall_region`` when that point lies on a rising part.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any, NamedTuple

import numpy as np

from finkit.errors import InputError, NotSupportedError, SolverError
from finkit.interpolation import MonotoneCubic

__all__ = [
    "STANDARD_AIR_DENSITY",
    "ARRANGEMENTS",
    "FanCurve",
    "RootResult",
    "OperatingPoint",
    "BypassSplit",
    "BypassOperatingPoint",
    "bracketed_root",
    "operating_point",
    "power_law_pressure_drop",
    "bypass_gap_pressure_drop",
    "FanTableProblem",
    "fan_table_problems",
    "split_among_branches",
    "split_bypass",
    "split_bypass_at_approach_velocity",
    "operating_point_with_bypass",
]

#: Density of standard air at which fan curves are rated [kg m⁻³]: 20 °C, 101.325 kPa, 50 % RH
#: (AMCA 210 / ISO 5801 "standard air"; common practice, no source consulted here).
STANDARD_AIR_DENSITY = 1.2

#: Allowed values of ``arrangement`` for combined fans.
ARRANGEMENTS = ("parallel", "series")

#: Coefficient of the short-duct asymptote of the laminar apparent friction factor,
#: ``f_app Re_Dh -> 3.44 / sqrt(L*)`` (Shah & London 1978; docs/methods.md e3).
_SHORT_DUCT_COEFFICIENT = 3.44

#: Points used when a derived fan table (failed fans with a leak path) is resampled.
_RESAMPLE_POINTS = 161

_EPS = np.finfo(float).eps

SystemPressureDrop = Callable[[np.ndarray], np.ndarray]


# --------------------------------------------------------------------------------------
# Fan curve
# --------------------------------------------------------------------------------------


def _as_table(name: str, values) -> tuple[float, ...]:
    array = np.asarray(values, dtype=float)
    if array.ndim != 1:
        raise InputError(f"FanCurve.{name} must be a 1-D table of numbers, got shape {array.shape}")
    return tuple(float(v) for v in array)


class FanTableProblem(NamedTuple):
    """One way a fan table breaks the rules of :class:`FanCurve` (:func:`fan_table_problems`).

    Attributes
    ----------
    argument : str
        ``"volume_flow"`` or ``"static_pressure"``. [-]
    index : int or None
        The point it is at (None: the table as a whole). [-]
    rule : str
        Which rule: ``not_finite``, ``lengths``, ``too_few``, ``not_shut_off``,
        ``not_increasing``, ``not_positive`` or ``not_free_delivery``. [-]
    value : float
        The offending value (a count for ``lengths`` and ``too_few``) [m³ s⁻¹, Pa or -].
    """

    argument: str
    index: int | None
    rule: str
    value: float

    def text(self, prefix: str = "") -> str:
        """One line naming the argument, the point and the rule (``prefix`` before the name)."""
        where = f"{prefix}{self.argument}" + ("" if self.index is None else f"[{self.index}]")
        unit = " m³/s" if self.argument == "volume_flow" else " Pa"
        return f"{where}{_FAN_RULE_TEXT[self.rule].format(value=self.value, unit=unit)}"


_FAN_RULE_TEXT = {
    "not_finite": " = {value}; every table value must be a finite number",
    "lengths": " has {value:g} points, not as many as volume_flow; give one pressure per flow",
    "too_few": " has {value:g} point(s); at least 2 are needed (shut-off and free delivery)",
    "not_shut_off": " = {value:g}{unit}; the table must start at shut-off, with a flow of 0",
    "not_increasing": " = {value:g}{unit} is not above the point before; flows must increase "
    "from point to point",
    "not_positive": " = {value:g}{unit}; must be above 0 before free delivery (the last point)",
    "not_free_delivery": " = {value:g}{unit}; the table must end at free delivery, with a "
    "pressure of 0",
}


def fan_table_problems(volume_flow, static_pressure) -> tuple[FanTableProblem, ...]:
    """Every rule a fan table breaks, as data: the one source of the fan-table rules.

    A fan curve runs from shut-off (flow 0, the highest pressure region) to free delivery
    (pressure 0): flows finite and strictly increasing from 0, one pressure per flow, at least
    two points, pressures finite and above 0 before the last point, which is 0.
    :class:`FanCurve` raises the first problem; the case file's checks
    (:class:`finkit.case.Fan`) place each one on the case's own fields. Each table is checked
    on its own, so a length mismatch does not hide a flow that does not increase.

    Parameters
    ----------
    volume_flow : sequence of float
        Flows of the table [m³ s⁻¹].
    static_pressure : sequence of float
        Pressures of the table [Pa].

    Returns
    -------
    tuple of FanTableProblem
        Empty for a good table; at most one problem per rule and table, in table order.
    """
    flow = [float(v) for v in volume_flow]
    pressure = [float(v) for v in static_pressure]
    problems: list[FanTableProblem] = []
    for name, table in (("volume_flow", flow), ("static_pressure", pressure)):
        bad = next((i for i, v in enumerate(table) if not math.isfinite(v)), None)
        if bad is not None:
            problems.append(FanTableProblem(name, bad, "not_finite", table[bad]))
    if problems:
        return tuple(problems)
    if len(flow) != len(pressure):
        problems.append(FanTableProblem("static_pressure", None, "lengths", len(pressure)))
    if len(flow) < 2:
        problems.append(FanTableProblem("volume_flow", None, "too_few", len(flow)))
    if flow and flow[0] != 0.0:
        problems.append(FanTableProblem("volume_flow", 0, "not_shut_off", flow[0]))
    rising = next((i for i in range(1, len(flow)) if not flow[i] > flow[i - 1]), None)
    if rising is not None:
        problems.append(FanTableProblem("volume_flow", rising, "not_increasing", flow[rising]))
    if pressure:
        low = next((i for i, p in enumerate(pressure[:-1]) if not p > 0.0), None)
        if low is not None:
            problems.append(FanTableProblem("static_pressure", low, "not_positive", pressure[low]))
        if pressure[-1] != 0.0:
            last = len(pressure) - 1
            problems.append(
                FanTableProblem("static_pressure", last, "not_free_delivery", pressure[-1])
            )
    return tuple(problems)


def _check_count(name: str, value, minimum: int) -> int:
    if isinstance(value, bool) or int(value) != value or value < minimum:
        raise InputError(f"{name} = {value!r}; must be a whole number >= {minimum}")
    return int(value)


def _check_arrangement(arrangement: str) -> str:
    if arrangement not in ARRANGEMENTS:
        raise InputError(f"arrangement = {arrangement!r}; allowed: {', '.join(ARRANGEMENTS)}")
    return arrangement


def _check_positive(name: str, value) -> float:
    v = float(value)
    if not (np.isfinite(v) and v > 0):
        raise InputError(f"{name} = {value!r}; must be a finite number > 0")
    return v


@dataclass(frozen=True)
class FanCurve:
    """Static pressure of a fan (or of a fixed set of fans) against volume flow.

    The table runs from shut-off to free delivery; between its points the curve is the
    monotone piecewise-cubic (PCHIP) interpolant, which never overshoots the data and keeps
    the falling and the rising (stall) parts of the table as they are. Outside the table
    (negative flow, flow above free delivery) the curve is undefined and evaluates to NaN:
    finkit does not extrapolate a fan.

    Parameters
    ----------
    volume_flow : array_like
        Table of volume flows, strictly increasing, the first one exactly 0 (shut-off)
        [m³ s⁻¹].
    static_pressure : array_like
        Fan static pressure rise at each flow, > 0 before the last point and exactly 0 at the
        last one (free delivery) [Pa]. Read shut-off and free delivery off the catalogue curve
        if the table stops short of the axes.
    rating_density : float, default 1.2
        Air density at which the table was measured [kg m⁻³]; catalogue curves are normally
        given for standard air, 1.2 kg m⁻³ (AMCA 210 / ISO 5801; common practice).
    name : str, default ""
        Label shown in notes and error messages.

    Raises
    ------
    InputError
        One line naming the field and the index of the first bad table entry.

    Notes
    -----
    *Density* (fan laws at constant speed and size): the volume flow at a given operating
    state is unchanged and the pressure scales with density, ``dp(Q, rho) = dp_table(Q) rho /
    rho_rating`` [docs/methods.md h, CP; fan laws as in AMCA Publication 99]. Use the inlet-air
    density, e.g. at altitude.

    *Combination* of identical fans: in parallel every fan carries ``Q/n`` at the common
    pressure, so the flows of the table are multiplied by ``n``; in series every fan carries
    ``Q`` and adds its pressure, so the pressures are multiplied by ``n``. PCHIP is invariant
    under these scalings, so the combined curve is exactly the sum curve. In the stall region
    real parallel fans may share the flow unequally; the equal-share curve is kept there.

    *Stall region*: table intervals whose pressure rises with flow (positive slope). The
    intervals are listed in :attr:`stall_ranges`; an operating point on one is flagged.

    References
    ----------
    .. [1] Fritsch, F.N., Carlson, R.E., "Monotone piecewise cubic interpolation",
       SIAM J. Numer. Anal. 17(2), 238-246, 1980. doi:10.1137/0717021
    .. [2] AMCA Publication 99, Standards Handbook, Air Movement and Control Association
       International (fan laws; standard air 1.2 kg m⁻³).

    Examples
    --------
    >>> fan = FanCurve([0.0, 0.01, 0.02], [60.0, 35.0, 0.0])
    >>> round(float(fan.pressure(0.01, density=1.0)), 3)
    29.167
    >>> fan.combined(2, "parallel").free_delivery
    0.04
    """

    volume_flow: tuple[float, ...]
    static_pressure: tuple[float, ...]
    rating_density: float = STANDARD_AIR_DENSITY
    name: str = ""
    _curve: Any = field(init=False, repr=False, compare=False)  # MonotoneCubic
    _slope: object = field(init=False, repr=False, compare=False)

    def __post_init__(self):
        flow = _as_table("volume_flow", self.volume_flow)
        pressure = _as_table("static_pressure", self.static_pressure)
        problems = fan_table_problems(flow, pressure)
        if problems:
            raise InputError(problems[0].text("FanCurve."))
        density = float(self.rating_density)
        if not (np.isfinite(density) and density > 0):
            raise InputError(
                f"FanCurve.rating_density = {self.rating_density!r} kg/m³; must be > 0"
            )
        curve = MonotoneCubic(np.array(flow), np.array(pressure))
        object.__setattr__(self, "volume_flow", flow)
        object.__setattr__(self, "static_pressure", pressure)
        object.__setattr__(self, "rating_density", density)
        object.__setattr__(self, "name", str(self.name))
        object.__setattr__(self, "_curve", curve)
        object.__setattr__(self, "_slope", curve.slope)

    # -- properties -----------------------------------------------------------------

    @property
    def free_delivery(self) -> float:
        """Volume flow at zero static pressure [m³ s⁻¹]."""
        return self.volume_flow[-1]

    @property
    def shut_off_pressure(self) -> float:
        """Static pressure at zero flow, at the rating density [Pa]."""
        return self.static_pressure[0]

    @property
    def stall_ranges(self) -> tuple[tuple[float, float], ...]:
        """Flow intervals ``(low, high)`` [m³ s⁻¹] where the pressure rises with flow."""
        p = np.asarray(self.static_pressure)
        rising = np.diff(p) > 0
        ranges = []
        i = 0
        while i < rising.size:
            if rising[i]:
                j = i
                while j + 1 < rising.size and rising[j + 1]:
                    j += 1
                ranges.append((self.volume_flow[i], self.volume_flow[j + 1]))
                i = j + 1
            else:
                i += 1
        return tuple(ranges)

    @property
    def has_stall_region(self) -> bool:
        """True when the table has a positive-slope (stall) part."""
        return bool(np.any(np.diff(self.static_pressure) > 0))

    @property
    def _piece_boundaries(self) -> np.ndarray:
        """Flows that cut the table into alternately falling and rising monotone pieces."""
        rising = np.diff(self.static_pressure) > 0
        cuts = [0]
        cuts += [i for i in range(1, rising.size) if rising[i] != rising[i - 1]]
        cuts.append(len(self.volume_flow) - 1)
        return np.asarray(self.volume_flow)[cuts]

    # -- evaluation -----------------------------------------------------------------

    def density_ratio(self, density=None):
        """Ratio of the operating to the rating density, ``rho / rho_rating`` [-].

        Parameters
        ----------
        density : float or array_like, optional
            Air density at the fan inlet [kg m⁻³]; None means the rating density.
        """
        if density is None:
            return np.float64(1.0)
        rho = np.asarray(density, dtype=float)
        if np.any(~(rho > 0)):
            raise InputError(f"density = {density!r} kg/m³; must be > 0")
        return rho / self.rating_density

    def pressure(self, volume_flow, density=None):
        """Fan static pressure at a volume flow [Pa].

        Parameters
        ----------
        volume_flow : float or array_like
            Volume flow through the fan (or the combination) [m³ s⁻¹].
        density : float or array_like, optional
            Air density [kg m⁻³]; the table pressure is scaled by ``density /
            rating_density`` (fan laws at constant speed). None: rating density.

        Returns
        -------
        numpy.ndarray or float
            Static pressure [Pa]; NaN outside ``0 <= volume_flow <= free_delivery``.
        """
        q = np.asarray(volume_flow, dtype=float)
        return (self._curve(q) * self.density_ratio(density))[()]

    def slope(self, volume_flow, density=None):
        """Slope of the fan curve, d(static pressure)/d(volume flow) [Pa s m⁻³].

        Parameters
        ----------
        volume_flow : float or array_like
            Volume flow [m³ s⁻¹].
        density : float or array_like, optional
            Air density [kg m⁻³]; None: rating density.
        """
        q = np.asarray(volume_flow, dtype=float)
        return (self._slope(q) * self.density_ratio(density))[()]

    def is_in_stall_region(self, volume_flow):
        """True where the curve rises with flow (positive slope) at ``volume_flow`` [m³ s⁻¹]."""
        with np.errstate(invalid="ignore"):
            return (np.asarray(self._slope(np.asarray(volume_flow, dtype=float))) > 0)[()]

    # -- derived curves -------------------------------------------------------------

    def scaled(self, pressure_factor: float = 1.0, flow_factor: float = 1.0) -> FanCurve:
        """The curve with every pressure and every flow of the table multiplied.

        Parameters
        ----------
        pressure_factor : float, default 1
            Factor on static pressure [-], e.g. 0.9 for a 10 % degraded fan.
        flow_factor : float, default 1
            Factor on volume flow [-].

        Notes
        -----
        Fan laws for a speed change from ``N1`` to ``N2`` at the same density: ``flow_factor
        = N2/N1`` and ``pressure_factor = (N2/N1)**2`` (see :meth:`at_speed`). PCHIP is
        invariant under these scalings, so the new curve is exactly the scaled old one.
        """
        pf = _check_positive("pressure_factor", pressure_factor)
        ff = _check_positive("flow_factor", flow_factor)
        return FanCurve(
            tuple(q * ff for q in self.volume_flow),
            tuple(p * pf for p in self.static_pressure),
            self.rating_density,
            self.name,
        )

    def at_speed(self, speed_ratio: float) -> FanCurve:
        """The curve at another speed by the fan laws: ``Q ∝ N``, ``dp ∝ N²``.

        Parameters
        ----------
        speed_ratio : float
            New speed over the rated speed, ``N2/N1`` [-].
        """
        s = _check_positive("speed_ratio", speed_ratio)
        return self.scaled(pressure_factor=s * s, flow_factor=s)

    def combined(self, count: int, arrangement: str = "parallel") -> FanCurve:
        """The curve of ``count`` identical fans working together.

        Parameters
        ----------
        count : int
            Number of identical fans [-], >= 1.
        arrangement : {"parallel", "series"}
            Parallel: flows add at equal pressure; series: pressures add at equal flow.
        """
        n = _check_count("count", count, 1)
        _check_arrangement(arrangement)
        label = f"{n} × {self.name or 'fan'} in {arrangement}" if n > 1 else self.name
        if arrangement == "parallel":
            table = (tuple(q * n for q in self.volume_flow), self.static_pressure)
        else:
            table = (self.volume_flow, tuple(p * n for p in self.static_pressure))
        return FanCurve(*table, self.rating_density, label)

    def with_failed(
        self,
        count_total: int,
        count_failed: int,
        arrangement: str = "parallel",
        stopped_fan_resistance: float | None = None,
    ) -> FanCurve:
        """The curve of ``count_total`` identical fans of which ``count_failed`` are stopped.

        Parameters
        ----------
        count_total : int
            Fans installed [-], >= 1.
        count_failed : int
            Fans stopped [-], 0 <= count_failed < count_total.
        arrangement : {"parallel", "series"}
            How the fans are installed.
        stopped_fan_resistance : float, optional
            Flow resistance of one stopped fan, ``dp = R Q²`` at the rating density
            [Pa s² m⁻⁶]. None (default) ignores it: in parallel the stopped fans are taken
            as sealed (no recirculation, e.g. with back-draft shutters), in series as
            loss-free. Both are optimistic.

        Returns
        -------
        FanCurve
            Parallel: the running fans' curve minus the air that recirculates backwards
            through each stopped fan, ``Q_net(p) = n_run Q_fan(p) - n_stop sqrt(p / R)``.
            Series: the running fans' pressure minus the loss of the stopped rotors,
            ``p_net(Q) = n_run p_fan(Q) - n_stop R Q²``. With a resistance given, the derived
            curve is resampled on a fine table (PCHIP again; interpolation error ~1e-4).

        Raises
        ------
        NotSupportedError
            Parallel with a leak path on a fan whose stall region makes the net curve
            non-monotone in flow.

        Notes
        -----
        A stopped fan in parallel is a hole in the fan wall: the pressure the running fans
        make drives air back through it. This simple leak model treats it as a fixed
        quadratic resistance (no windmilling); its ``R`` comes from a test or an estimate of
        the stopped fan's open area, ``R ≈ K rho / (2 A²)`` with ``K`` of order 1-2
        (common practice, no source). Both fan and leak pressures scale with density alike,
        so the derived table is density-scaled like any other.
        """
        n = _check_count("count_total", count_total, 1)
        if isinstance(count_failed, bool) or int(count_failed) != count_failed:
            raise InputError(f"count_failed = {count_failed!r}; must be a whole number")
        m = int(count_failed)
        if not 0 <= m < n:
            raise InputError(
                f"count_failed = {m}; must be >= 0 and below count_total = {n} (a fan must run)"
            )
        _check_arrangement(arrangement)
        running = n - m
        base = self.combined(running, arrangement)
        label = f"{n} × {self.name or 'fan'} in {arrangement}, {m} stopped"
        if m == 0:
            return base
        if stopped_fan_resistance is None:
            return FanCurve(base.volume_flow, base.static_pressure, self.rating_density, label)
        r = _check_positive("stopped_fan_resistance", stopped_fan_resistance)
        q_free = self.free_delivery
        grid = np.unique(
            np.concatenate([np.linspace(0.0, q_free, _RESAMPLE_POINTS), self.volume_flow])
        )
        p = self._curve(grid)
        p[-1] = 0.0
        if arrangement == "parallel":
            net = running * grid - m * np.sqrt(p / r)
            # last crossing of zero net flow: the new shut-off
            i = np.flatnonzero((net[:-1] < 0) & (net[1:] >= 0))[-1]

            def net_flow(q):
                return running * q - m * np.sqrt(np.maximum(self._curve(q), 0.0) / r)

            q0 = _scalar_root(net_flow, grid[i], grid[i + 1])
            keep = grid > q0
            flows = np.concatenate([[0.0], net[keep]])
            pressures = np.concatenate([[float(self._curve(q0))], p[keep]])
            if np.any(np.diff(flows) <= 0):
                raise NotSupportedError(
                    "stopped_fan_resistance: with this fan's stall region the net curve of "
                    "the running fans minus the leak is not monotone in flow"
                )
        else:
            net = running * p - m * r * grid**2
            i = np.flatnonzero((net[:-1] > 0) & (net[1:] <= 0))[0]

            def net_pressure(q):
                return running * self._curve(q) - m * r * q * q

            q_end = _scalar_root(net_pressure, grid[i], grid[i + 1])
            keep = grid < q_end
            flows = np.concatenate([grid[keep], [q_end]])
            pressures = np.concatenate([net[keep], [0.0]])
        return FanCurve(flows, pressures, self.rating_density, label)


# --------------------------------------------------------------------------------------
# Vectorised bracketed root finder
# --------------------------------------------------------------------------------------


def _scalar_root(fun: Callable[[np.ndarray], np.ndarray], lower: float, upper: float) -> float:
    """The root of one bracketed equation by :func:`bracketed_root`, to about 1e-15 relative
    (in place of ``scipy.optimize.brentq``, whose import costs 0.2 s of a ``finkit check``)."""
    found = bracketed_root(fun, float(lower), float(upper))
    if not bool(found.is_converged):
        raise RuntimeError(f"no converged root in [{lower!r}, {upper!r}]")
    return float(found.x)


class RootResult(NamedTuple):
    """Roots of a batch of scalar equations.

    Attributes
    ----------
    x : numpy.ndarray
        Root of each equation [unit of the unknown]; NaN where the bracket was invalid.
    fun_value : numpy.ndarray
        Function value at ``x`` [unit of the function].
    is_converged : numpy.ndarray of bool
        True where the bracket shrank below the tolerance (or ``fun_value == 0``).
    iteration_count : int
        Iterations performed for the whole batch [-].
    """

    x: np.ndarray
    fun_value: np.ndarray
    is_converged: np.ndarray
    iteration_count: int


def bracketed_root(
    fun: Callable[[np.ndarray], np.ndarray],
    lower,
    upper,
    *,
    lower_value=None,
    upper_value=None,
    xatol: float = 0.0,
    xrtol: float = 4 * _EPS,
    maxiter: int = 100,
) -> RootResult:
    """Solve ``fun(x) = 0`` for a whole batch of brackets at once (Chandrupatla's method).

    Parameters
    ----------
    fun : callable
        ``fun(x) -> array``: elementwise in ``x``, which is always passed with the full batch
        shape (converged elements are re-evaluated at their root, so ``fun`` may close over
        arrays of the batch shape) [unit of the function].
    lower, upper : array_like
        Bracket ends, broadcast to the batch shape [unit of the unknown].
    lower_value, upper_value : array_like, optional
        ``fun`` at the bracket ends if already known (saves two calls).
    xatol, xrtol : float
        Stop where the bracket is narrower than ``xatol + xrtol |x|``
        [unit of the unknown], [-].
    maxiter : int, default 100
        Iteration limit [-].

    Returns
    -------
    RootResult
        ``x`` is NaN and ``is_converged`` False where the bracket does not change sign or a
        value is NaN; where the limit is reached ``x`` is the best point found and
        ``is_converged`` is False.

    Notes
    -----
    Chandrupatla's hybrid of inverse quadratic interpolation and bisection: each step
    interpolates through the last three points when that is safe and bisects otherwise, so it
    keeps the guaranteed bracket of bisection and converges superlinearly on smooth functions
    (typically in 6-12 steps to machine precision). Unlike a per-element loop, every step is a
    handful of array operations plus one call of ``fun`` for the batch.

    References
    ----------
    .. [1] Chandrupatla, T.R., "A new hybrid quadratic/bisection algorithm for finding the
       zero of a nonlinear function without using derivatives", Advances in Engineering
       Software 28(3), 145-149, 1997. doi:10.1016/S0965-9978(96)00051-8
    """
    a = np.asarray(lower, dtype=float)
    b = np.asarray(upper, dtype=float)
    fa = np.asarray(fun(a) if lower_value is None else lower_value, dtype=float)
    fb = np.asarray(fun(b) if upper_value is None else upper_value, dtype=float)
    shape = np.broadcast_shapes(a.shape, b.shape, fa.shape, fb.shape)
    x1, x2, f1, f2 = (
        np.array(np.broadcast_to(v, shape), dtype=float).ravel() for v in (a, b, fa, fb)
    )
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        valid = np.isfinite(x1) & np.isfinite(x2) & ~np.isnan(f1) & ~np.isnan(f2)
        valid &= np.sign(f1) * np.sign(f2) <= 0
        first_is_min = np.abs(f1) <= np.abs(f2)
        xmin_all = np.where(first_is_min, x1, x2)
        fmin_all = np.where(first_is_min, f1, f2)
        converged = valid & ((f1 == 0) | (f2 == 0))
        # points passed to ``fun``: finished elements stay at their last (finite) point
        x_eval = np.where(np.isfinite(xmin_all), xmin_all, np.where(np.isfinite(x1), x1, 0.0))
        idx = np.flatnonzero(valid & ~converged)
        x1, x2, f1, f2 = x1[idx], x2[idx], f1[idx], f2[idx]
        x3, f3 = x2.copy(), f2.copy()
        t = np.full(idx.size, 0.5)
        iterations = 0
        while idx.size and iterations < maxiter:
            iterations += 1
            x = x1 + t * (x2 - x1)
            x_eval[idx] = x
            f = np.broadcast_to(np.asarray(fun(x_eval.reshape(shape)), dtype=float), shape)
            f = f.ravel()[idx]
            # Chandrupatla (1997), Fig. 1: [x1, x2] keeps bracketing, x3 is the dropped point
            same = (f < 0) == (f1 < 0)
            x3 = np.where(same, x1, x2)
            f3 = np.where(same, f1, f2)
            x2 = np.where(same, x2, x1)
            f2 = np.where(same, f2, f1)
            x1, f1 = x, f
            better = np.abs(f1) < np.abs(f2)
            xmin = np.where(better, x1, x2)
            dx = np.abs(x2 - x1)
            tol = xatol + xrtol * np.abs(xmin)
            bad = np.isnan(f)
            done = (f == 0) | (dx <= tol)
            finished = done | bad
            if np.any(finished):
                ended = idx[finished]
                xmin_all[ended] = xmin[finished]
                fmin_all[ended] = np.where(better, f1, f2)[finished]
                converged[ended] = done[finished] & ~bad[finished]
                valid[idx[bad]] = False
                keep = ~finished
                idx, x1, x2, x3, f1, f2, f3, dx, tol = (
                    v[keep] for v in (idx, x1, x2, x3, f1, f2, f3, dx, tol)
                )
            # next step: inverse quadratic interpolation where safe, else bisection
            xi = (x1 - x2) / (x3 - x2)
            phi = (f1 - f2) / (f3 - f2)
            alpha = (x3 - x1) / (x2 - x1)
            use_iqi = (1 - np.sqrt(1 - xi) < phi) & (phi < np.sqrt(xi))
            t_iqi = f1 / (f1 - f2) * f3 / (f3 - f2) - alpha * f1 / (f3 - f1) * f2 / (f2 - f3)
            t = np.where(use_iqi & np.isfinite(t_iqi), t_iqi, 0.5)
            limit = np.minimum(0.5 * tol / np.where(dx > 0, dx, 1.0), 0.5)
            t = np.clip(t, limit, 1 - limit)
        if idx.size:  # iteration limit: keep the best point, not converged
            better = np.abs(f1) < np.abs(f2)
            xmin_all[idx] = np.where(better, x1, x2)
            fmin_all[idx] = np.where(better, f1, f2)
    root = np.where(valid, xmin_all, np.nan).reshape(shape)
    value = np.where(valid, fmin_all, np.nan).reshape(shape)
    return RootResult(root[()], value[()], (converged & valid).reshape(shape)[()], iterations)


# --------------------------------------------------------------------------------------
# Operating point
# --------------------------------------------------------------------------------------


class OperatingPoint(NamedTuple):
    """Where a fan curve crosses a system curve, for each design.

    Attributes
    ----------
    volume_flow : numpy.ndarray
        Volume flow through the fan [m³ s⁻¹]; NaN where there is no operating point.
    pressure_drop : numpy.ndarray
        Fan static pressure at that flow, equal to the system pressure drop [Pa].
    is_converged : numpy.ndarray of bool
        False where there is no operating point or the solver did not converge.
    is_in_stall_region : numpy.ndarray of bool
        True where the point lies on a positive-slope (stall) part of the fan curve.
    """

    volume_flow: np.ndarray
    pressure_drop: np.ndarray
    is_converged: np.ndarray
    is_in_stall_region: np.ndarray


def _fan_balance(fan: FanCurve, system_pressure_drop, density, maxiter):
    """Solve fan pressure = system pressure drop; returns (RootResult, density ratio)."""
    ratio = fan.density_ratio(density)

    def residual(q):
        return fan.pressure(q) * ratio - np.asarray(system_pressure_drop(q), dtype=float)

    bounds = fan._piece_boundaries
    values = [np.asarray(residual(np.float64(b)), dtype=float) for b in bounds]
    shape = np.broadcast_shapes(*(v.shape for v in values), np.shape(ratio))
    g = np.stack([np.broadcast_to(v, shape) for v in values])
    m = bounds.size - 1
    with np.errstate(invalid="ignore"):
        nonneg = g[:m] >= 0
    # the crossing at the highest flow: the last piece whose left end has fan >= system
    k = (m - 1) - np.argmax(nonneg[::-1], axis=0)
    has_left = np.any(nonneg, axis=0)
    g_free = g[m]
    at_free = g_free == 0
    k_idx = np.expand_dims(k, 0)
    lower = np.take(bounds, k)
    upper = np.take(bounds, k + 1)
    f_lower = np.take_along_axis(g, k_idx, axis=0)[0]
    f_upper = np.take_along_axis(g, k_idx + 1, axis=0)[0]
    # no operating point: nothing on the table with fan >= system, or the system would need
    # a negative pressure at free delivery
    possible = has_left & ~(g_free > 0)
    f_lower = np.where(possible, f_lower, np.nan)
    lower = np.where(at_free, fan.free_delivery, lower)
    f_lower = np.where(at_free, 0.0, f_lower)
    q_scale = fan.free_delivery
    result = bracketed_root(
        lambda q: np.broadcast_to(residual(q), shape),
        lower,
        upper,
        lower_value=f_lower,
        upper_value=f_upper,
        xatol=1e-13 * q_scale,
        xrtol=1e-12,
        maxiter=maxiter,
    )
    return result, ratio


def _failure_message(where: str, fan: FanCurve, converged) -> str:
    bad = ~np.asarray(converged, dtype=bool)
    first = np.argwhere(bad)[0] if bad.ndim else ()
    label = f" '{fan.name}'" if fan.name else ""
    return (
        f"{where}: the fan curve{label} (shut-off {fan.shut_off_pressure:.4g} Pa, free delivery "
        f"{fan.free_delivery:.4g} m³/s) gives no converged operating point for "
        f"{int(bad.sum())} of {bad.size} design(s) (first at index {tuple(int(i) for i in first)})"
        "; check that the system pressure drop at zero flow is below the shut-off pressure"
    )


def operating_point(
    fan: FanCurve,
    system_pressure_drop: SystemPressureDrop,
    density=None,
    *,
    raise_on_failure: bool = False,
    maxiter: int = 100,
) -> OperatingPoint:
    """Operating point of a fan against a system curve, for every design at once.

    Parameters
    ----------
    fan : FanCurve
        The fan (or combination of fans), rated at ``fan.rating_density``.
    system_pressure_drop : callable
        ``dp(volume_flow) -> pressure_drop``: system pressure drop [Pa] at a volume flow
        [m³ s⁻¹], >= 0 and increasing with flow; ``volume_flow`` is passed as a scalar or as an
        array of the batch shape, and the shape of the result defines the batch of designs.
        It must use the same air density as ``density``.
    density : float or array_like, optional
        Air density at the fan [kg m⁻³], broadcast with the batch; the fan pressure is scaled by
        ``density / fan.rating_density``. None: the rating density.
    raise_on_failure : bool, default False
        Raise :class:`~finkit.errors.SolverError` if any design has no converged operating
        point (use for a single design); otherwise such designs get NaN and a False flag.
    maxiter : int, default 100
        Iteration limit of the bracketed solver [-].

    Returns
    -------
    OperatingPoint
        ``volume_flow`` [m³ s⁻¹], ``pressure_drop`` [Pa], ``is_converged``,
        ``is_in_stall_region``, each of the batch shape (numpy scalars for a single design).

    Notes
    -----
    Solves ``dp_fan(Q) rho/rho_rating = dp_sys(Q)`` on ``0 <= Q <= Q_free`` (docs/methods.md h).
    The fan table is cut into monotone pieces at its local extrema; the residual is evaluated
    at the cuts and the root is bracketed in the piece with the highest-flow sign change from
    fan-above to fan-below system, so the stable crossing on the falling part of the curve is
    found when there are several. Within a falling piece the root is unique. Two crossings
    inside one rising piece, with neither end showing a sign change, are not detected.
    The root is found by :func:`bracketed_root` to ~1e-12 relative in flow.

    Examples
    --------
    >>> fan = FanCurve([0.0, 0.02], [60.0, 0.0])
    >>> point = operating_point(fan, lambda q: 1.0e5 * q**2)
    >>> round(float(point.volume_flow), 6), bool(point.is_converged)
    (0.013723, True)
    """
    result, ratio = _fan_balance(fan, system_pressure_drop, density, maxiter)
    q = np.asarray(result.x)
    if raise_on_failure and not np.all(result.is_converged):
        raise SolverError(_failure_message("operating_point", fan, result.is_converged))
    pressure = np.asarray(fan.pressure(q) * ratio)
    stall = np.asarray(fan.is_in_stall_region(q))
    return OperatingPoint(q[()], pressure[()], np.asarray(result.is_converged)[()], stall[()])


def power_law_pressure_drop(
    volume_flow, reference_volume_flow, reference_pressure_drop, exponent=2.0
):
    """Pressure drop of a component given by one rated point, ``dp = dp_ref (Q/Q_ref)^n``.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow [m³ s⁻¹], >= 0.
    reference_volume_flow : float or array_like
        Flow of the rated point [m³ s⁻¹], > 0.
    reference_pressure_drop : float or array_like
        Pressure drop at the rated point [Pa], >= 0.
    exponent : float or array_like, default 2
        Exponent ``n`` [-]: 2 for fully turbulent losses (grilles, filters at high flow),
        1 for laminar ones; heat sinks lie in between, typically 1.2-1.8.

    Returns
    -------
    numpy.ndarray or float
        Pressure drop [Pa], for use as an extra system loss (enclosure, filter, grille).

    Notes
    -----
    ``dp = K Q^n`` is the quick system model of docs/methods.md h (common practice, no source);
    the density of the rated point is assumed to be the operating one.
    """
    q = np.asarray(volume_flow, dtype=float)
    q_ref = np.asarray(reference_volume_flow, dtype=float)
    if np.any(~(q_ref > 0)):
        raise InputError(f"reference_volume_flow = {reference_volume_flow!r} m³/s; must be > 0")
    if np.any(~(np.asarray(reference_pressure_drop, dtype=float) >= 0)):
        raise InputError(f"reference_pressure_drop = {reference_pressure_drop!r} Pa; must be >= 0")
    n = np.asarray(exponent, dtype=float)
    if np.any(~(n > 0)):
        raise InputError(f"exponent = {exponent!r}; must be > 0")
    ratio = np.abs(q) / q_ref
    return (np.sign(q) * reference_pressure_drop * ratio**n)[()]


# --------------------------------------------------------------------------------------
# Flow bypass
# --------------------------------------------------------------------------------------


def _pow16(x):
    x = x * x
    x = x * x
    x = x * x
    return x * x


def _churchill_turbulent_fanning(reynolds):
    """Transition-and-turbulent term of Churchill's (1977) smooth-duct equation (Fanning) [-].

    Churchill: ``f = [(16/Re)^12 + f_t^12]^(1/12)`` with ``f_t = 2 (A + B)^(-1/8)``,
    ``A = [2.457 ln((Re/7)^0.9)]^16``, ``B = (37530/Re)^16``; ``f_t`` vanishes in laminar flow.
    """
    a = _pow16(2.457 * 0.9 * np.log(reynolds / 7.0))
    b = _pow16(37530.0 / reynolds)
    return 2.0 / np.sqrt(np.sqrt(np.sqrt(a + b)))


def bypass_gap_pressure_drop(
    volume_flow,
    gap_area,
    gap_hydraulic_diameter,
    gap_length,
    density,
    dynamic_viscosity,
    loss_coefficient=1.0,
    friction_reynolds_product=24.0,
):
    """Static pressure drop of the clearance gaps that let air go round a heat sink.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow through the gaps [m³ s⁻¹].
    gap_area : float or array_like
        Total flow area of the gaps [m²], >= 0; 0 means no bypass (closed branch).
    gap_hydraulic_diameter : float or array_like
        Hydraulic diameter of the gaps, ``4 A / P`` [m]; about twice the gap width for a slot.
    gap_length : float or array_like
        Length of the gaps along the flow (the sink length) [m], >= 0.
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].
    loss_coefficient : float or array_like, default 1.0
        Sum of the entrance and exit loss coefficients of the gaps, on the gap velocity
        head [-]. 1.0 is one velocity head lost at the exit (sudden expansion into a much
        larger space, Borda-Carnot); a sharp entrance adds about 0.5.
    friction_reynolds_product : float or array_like, default 24.0
        Fully developed laminar ``f Re_Dh`` (Fanning) of the gap cross-section [-]: 24 for
        parallel plates (a slot much wider than high); use the Shah & London rectangular-duct
        value for a square-ish gap (14.23 for a square).

    Returns
    -------
    numpy.ndarray or float
        Pressure drop [Pa]; odd in the flow. A closed branch (``gap_area = 0``) gives 0 at
        zero flow and ``inf`` otherwise.

    Notes
    -----
    With gap velocity ``V = Q/A``, ``Re = rho V D_h / mu`` and ``L* = L / (D_h Re)``::

        dp    = [K + 4 f L / D_h] rho V² / 2                   (Fanning f; docs/methods.md e5)
        f     = [f_lam^12 + f_turb^12]^(1/12)                   (Churchill's blend)
        f_lam = sqrt((3.44 / sqrt(L*))² + (f Re)_fd²) / Re     (developing laminar, e3)
        f_turb = 2 (A + B)^(-1/8),  A = [2.457 ln((Re/7)^0.9)]^16,  B = (37530/Re)^16

    * Laminar: composite of the short-duct asymptote ``3.44/sqrt(L*)`` and the fully
      developed value (24 for parallel plates), Muzychka & Yovanovich (2009). The
      coefficient 3.44 (tagged [R] in docs/methods.md) was confirmed as the leading term of Shah's
      (1978) entry-length correlation, which independent implementations quote with the
      parallel-plate constants ``K(∞) = 0.674, C = 2.9e-5``; the tests compare the composite
      with that correlation (within 8 %).
    * Transition and turbulent: Churchill's (1977) smooth-duct equation on the hydraulic
      diameter, with its laminar term ``16/Re`` replaced by the gap's ``f_lam`` above. For a
      long circular duct (``f Re = 16``) this is Churchill's equation itself and matches
      ``fluids.friction.Churchill_1977`` / 4 (tested); for parallel plates, circular-duct
      turbulent friction on ``D_h`` is within about ±10 % (common practice, no source). The
      blend is continuous and rises with flow, which the flow-split solver needs; its
      exponent 12 is Churchill's. Roughness is not included (smooth gap walls).
    * ``K rho V²/2`` with ``K = 1`` is one velocity head, ``fluids.fittings.exit_normal``
      (tested with ``fluids.core.dP_from_K``).

    References
    ----------
    .. [1] Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic Press,
       1978 (``f Re = 24`` for parallel plates; short-duct coefficient 3.44).
    .. [2] Muzychka, Y.S., Yovanovich, M.M., "Pressure drop in laminar developing flow in
       noncircular ducts: a scaling and modeling approach", J. Fluids Eng. 131(11), 111105,
       2009. doi:10.1115/1.4000377
    .. [3] Churchill, S.W., "Friction-factor equation spans all fluid-flow regimes",
       Chemical Engineering 84(24), 91-92, 1977.
    .. [4] Churchill, S.W., Usagi, R., "A general expression for the correlation of rates of
       transfer and other phenomena", AIChE J. 18(6), 1121-1128, 1972.
       doi:10.1002/aic.690180606
    .. [5] Lee, S., "Optimum design and selection of heat sinks", IEEE Trans. Comp., Pack.,
       Manuf. Technol. A 18(4), 812-817, 1995 (bypass as a parallel flow branch).
    """
    q = np.asarray(volume_flow, dtype=float)
    area = np.asarray(gap_area, dtype=float)
    diameter = np.asarray(gap_hydraulic_diameter, dtype=float)
    length = np.asarray(gap_length, dtype=float)
    rho = np.asarray(density, dtype=float)
    mu = np.asarray(dynamic_viscosity, dtype=float)
    k = np.asarray(loss_coefficient, dtype=float)
    f_re = np.asarray(friction_reynolds_product, dtype=float)
    if np.any(~(area >= 0)):
        raise InputError(f"gap_area = {gap_area!r} m²; must be >= 0")
    if np.any((area > 0) & ~(diameter > 0)):
        raise InputError(
            f"gap_hydraulic_diameter = {gap_hydraulic_diameter!r} m; must be > 0 where gap_area > 0"
        )
    if np.any(~(length >= 0)):
        raise InputError(f"gap_length = {gap_length!r} m; must be >= 0")
    if np.any(~(rho > 0)):
        raise InputError(f"density = {density!r} kg/m³; must be > 0")
    if np.any(~(mu > 0)):
        raise InputError(f"dynamic_viscosity = {dynamic_viscosity!r} Pa s; must be > 0")
    if np.any(~(k >= 0)):
        raise InputError(f"loss_coefficient = {loss_coefficient!r}; must be >= 0")
    if np.any(~(f_re > 0)):
        raise InputError(f"friction_reynolds_product = {friction_reynolds_product!r}; must be > 0")
    is_open = area > 0
    a = np.where(is_open, area, 1.0)
    d = np.where(is_open, diameter, 1.0)
    speed = np.abs(q) / a
    reynolds = rho * speed * d / mu
    head = 0.5 * rho * speed**2
    has_length = length > 0
    l_safe = np.where(has_length, length, 1.0)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        # laminar, written without dividing by Re so that it is finite at zero flow:
        # 4 f_app (L/D) rho V²/2 = 2 mu L V / D² sqrt(3.44² D Re / L + (f Re)²)
        laminar = (
            2.0
            * mu
            * length
            * speed
            / d**2
            * np.sqrt(_SHORT_DUCT_COEFFICIENT**2 * d * reynolds / l_safe + f_re**2)
        )
        turbulent = (
            4.0 * _churchill_turbulent_fanning(np.maximum(reynolds, 1.0)) * length / d * head
        )
        # Churchill's blend, [lam^12 + turb^12]^(1/12), scaled by the larger term (no overflow)
        big = np.maximum(laminar, turbulent)
        scale = np.where(big > 0, big, 1.0)
        lam, turb = laminar / scale, turbulent / scale
        lam4, turb4 = (lam * lam) ** 2, (turb * turb) ** 2
        blend = big * np.cbrt(np.sqrt(np.sqrt(lam4 * lam4 * lam4 + turb4 * turb4 * turb4)))
        friction = np.where(has_length, blend, 0.0)
        dp = np.sign(q) * (k * head + friction)
        dp = np.where(is_open, dp, np.where(q == 0, 0.0, np.sign(q) * np.inf))
    return dp[()]


class BypassSplit(NamedTuple):
    """How a total flow divides between the fins and the bypass gaps.

    Attributes
    ----------
    sink_volume_flow : numpy.ndarray
        Flow through the finned region [m³ s⁻¹].
    bypass_volume_flow : numpy.ndarray
        Flow round the fins, through the gaps [m³ s⁻¹].
    pressure_drop : numpy.ndarray
        Common static pressure drop of both branches [Pa].
    is_converged : numpy.ndarray of bool
        False where the split could not be solved (NaN results).
    """

    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    pressure_drop: np.ndarray
    is_converged: np.ndarray


def split_bypass(
    total_volume_flow,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
    *,
    maxiter: int = 100,
) -> BypassSplit:
    """Split a total flow between the heat sink and its bypass at equal pressure drop.

    Parameters
    ----------
    total_volume_flow : float or array_like
        Flow approaching the sink and its gaps [m³ s⁻¹], >= 0.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa], increasing, called with arrays of the
        batch shape.
    bypass_pressure_drop : callable
        ``dp(volume_flow)`` of the bypass gaps [Pa], increasing, e.g. a closure over
        :func:`bypass_gap_pressure_drop`. ``inf`` at positive flow means a closed branch.
    maxiter : int, default 100
        Iteration limit [-].

    Returns
    -------
    BypassSplit
        ``sink_volume_flow``, ``bypass_volume_flow`` [m³ s⁻¹], ``pressure_drop`` [Pa] and
        ``is_converged``, of the batch shape.

    Notes
    -----
    Two parallel branches between the same upstream and downstream static pressures
    (docs/methods.md h)::

        Q_tot = Q_hs + Q_by,    dp_hs(Q_hs) = dp_by(Q_by)

    solved for the sink fraction ``x = Q_hs / Q_tot`` in [0, 1] with :func:`bracketed_root`
    (the residual ``dp_hs(x Q) - dp_by((1 - x) Q)`` rises with ``x``). If a branch needs more
    pressure at zero flow than the other at the full flow, all the flow takes the other
    branch. The balance ignores mixing and momentum exchange where the streams rejoin;
    expect ±10-20 % on ``Q_hs`` (docs/methods.md h, CP).

    References
    ----------
    .. [1] Radmehr, A., Kelkar, K.M., Kelly, P., Patankar, S.V., Kang, S.S., "Analysis of the
       effect of bypass on the performance of heat sinks using flow network modeling",
       Proc. 15th IEEE SEMI-THERM Symposium, 42-47, 1999.
    .. [2] Jonsson, H., Moshfegh, B., "Modeling of the thermal and hydraulic performance of
       plate fin, strip fin, and pin fin heat sinks -- influence of flow bypass", IEEE Trans.
       Comp. Packag. Technol. 24(2), 142-149, 2001.
    """
    q_total = np.asarray(total_volume_flow, dtype=float)
    if np.any(q_total < 0):
        raise InputError(f"total_volume_flow = {total_volume_flow!r} m³/s; must be >= 0")
    zero = np.zeros_like(q_total)
    with np.errstate(invalid="ignore"):
        r0 = np.asarray(sink_pressure_drop(zero), float) - np.asarray(
            bypass_pressure_drop(q_total), float
        )
        r1 = np.asarray(sink_pressure_drop(q_total), float) - np.asarray(
            bypass_pressure_drop(zero), float
        )
    shape = np.broadcast_shapes(q_total.shape, r0.shape, r1.shape)
    q = np.broadcast_to(q_total, shape)
    r0, r1 = np.broadcast_to(r0, shape), np.broadcast_to(r1, shape)
    # one branch takes everything: threshold or closed branches (an inf residual)
    all_bypass = (r0 >= 0) | np.isposinf(r1)
    all_sink = ((r1 <= 0) | np.isneginf(r0)) & ~all_bypass
    lower_value = np.where(all_bypass, 0.0, np.where(all_sink, -1.0, r0))
    upper_value = np.where(all_sink, 0.0, np.where(all_bypass, 1.0, r1))
    lower = np.where(all_sink, 1.0, 0.0)
    upper = np.where(all_bypass, 0.0, 1.0)

    def residual(x):
        with np.errstate(invalid="ignore"):
            return np.asarray(sink_pressure_drop(x * q), float) - np.asarray(
                bypass_pressure_drop((1.0 - x) * q), float
            )

    root = bracketed_root(
        residual,
        lower,
        upper,
        lower_value=lower_value,
        upper_value=upper_value,
        xatol=1e-10,
        xrtol=0.0,
        maxiter=maxiter,
    )
    fraction = np.asarray(root.x)
    q_sink = fraction * q
    q_bypass = q - q_sink
    dp_sink = np.asarray(sink_pressure_drop(q_sink), float)
    dp_bypass = np.asarray(bypass_pressure_drop(q_bypass), float)
    pressure = np.where(fraction > 0, dp_sink, dp_bypass)
    pressure = np.broadcast_to(pressure, shape)
    return BypassSplit(
        q_sink[()], q_bypass[()], np.array(pressure)[()], np.asarray(root.is_converged)[()]
    )


def parallel_pressure_drop(branches) -> SystemPressureDrop:
    """``dp(q)`` of several parallel branches carrying a total flow q between them [Pa].

    Parameters
    ----------
    branches : callable or sequence of callable
        ``dp(volume_flow)`` of each branch (e.g. the side gaps and the top gap of a bypass).

    Returns
    -------
    callable
        The branch itself for one branch; otherwise a function that splits q at equal pressure
        drop with :func:`split_bypass` (the first branch against the rest, recursively) and
        returns the common pressure drop.
    """
    if callable(branches):
        return branches
    branches = tuple(branches)
    if len(branches) == 1:
        return branches[0]
    first, rest = branches[0], parallel_pressure_drop(branches[1:])

    def dp(q):
        return split_bypass(q, first, rest).pressure_drop

    return dp


def split_among_branches(
    total_volume_flow,
    sink_pressure_drop: SystemPressureDrop,
    bypass_branches,
    *,
    maxiter: int = 100,
) -> BypassSplit:
    """:func:`split_bypass` with the bypass as several parallel branches (side and top gaps).

    The same balance, ``Q_tot = Q_hs + sum Q_k`` at one pressure drop for the fins and every
    branch, solved for all flows at once by a damped Newton iteration (:func:`_split_newton`)
    instead of the nested split of :func:`parallel_pressure_drop`, which solves the branches'
    own split inside every step of the outer one (ten to a hundred times more pressure-drop
    evaluations). Any design where Newton does not meet its tolerance is solved by the nested
    bracketed method, which stays the reference; one branch is :func:`split_bypass` itself.

    Parameters
    ----------
    total_volume_flow : float or array_like
        Flow approaching the sink and its gaps [m³ s⁻¹], >= 0.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa].
    bypass_branches : callable or sequence of callable
        ``dp(volume_flow)`` of each bypass branch [Pa].
    maxiter : int, default 100
        Iteration limit of the nested method [-].

    Returns
    -------
    BypassSplit
        As :func:`split_bypass`; ``bypass_volume_flow`` is the sum over the branches.
    """
    branches = (bypass_branches,) if callable(bypass_branches) else tuple(bypass_branches)
    if len(branches) == 1:
        return split_bypass(total_volume_flow, sink_pressure_drop, branches[0], maxiter=maxiter)
    q_total = np.asarray(total_volume_flow, dtype=float)
    if np.any(q_total < 0):
        raise InputError(f"total_volume_flow = {total_volume_flow!r} m³/s; must be >= 0")
    a, b, ok = _split_newton(q_total, sink_pressure_drop, branches)
    if np.all(ok):
        dp = np.asarray(sink_pressure_drop(a), float)
        return BypassSplit(a[()], b[()], np.array(dp)[()], np.ones(np.shape(a), bool)[()])
    nested = split_bypass(
        q_total, sink_pressure_drop, parallel_pressure_drop(branches), maxiter=maxiter
    )
    shape = np.broadcast_shapes(np.shape(a), np.shape(nested.sink_volume_flow))
    a, b, ok = (np.broadcast_to(v, shape) for v in (a, b, ok))
    dp_newton = np.asarray(sink_pressure_drop(a), float)
    return BypassSplit(
        np.where(ok, a, nested.sink_volume_flow)[()],
        np.where(ok, b, nested.bypass_volume_flow)[()],
        np.where(ok, dp_newton, nested.pressure_drop)[()],
        (ok | np.asarray(nested.is_converged))[()],
    )


def _split_newton(q_total, dp_sink, branches, maxiter=40):
    """Damped Newton on the sink flow a and the branch flows b_k at a given total flow Q.

    Residuals: ``r_k = dp_sink(a) - dp_k(b_k)`` for each branch and ``r_Q = a + sum b - Q``.
    The Jacobian is an arrow matrix, eliminated in closed form (slopes by forward differences):
    ``da = -(r_Q + sum r_k/s_k) / (1 + s_a sum 1/s_k)``, ``db_k = (r_k + s_a da)/s_k``. A
    branch closed for a design (infinite pressure drop at a small flow) carries no flow there.
    Returns ``(a, b_total, converged)`` of the batch shape; converged where every residual is
    below 1e-9 of the sink's pressure drop at the whole flow and the last step below 1e-10 Q.
    """
    shape = np.broadcast_shapes(
        np.shape(q_total), np.shape(np.asarray(dp_sink(np.asarray(q_total, float)), float))
    )
    q = np.array(np.broadcast_to(q_total, shape), float)
    positive = q > 0
    q_safe = np.where(positive, q, 1.0)
    step = 1e-7 * q_safe
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        dp_scale = np.abs(np.asarray(dp_sink(q_safe), float))
        probe = 1e-6 * q_safe
        is_open = [
            np.isfinite(np.asarray(f(probe), float)) & np.ones(shape, bool) for f in branches
        ]
    count = max(sum(1 for o in is_open), 1)
    a = 0.6 * q_safe
    b = [np.where(o, 0.4 * q_safe / count, 0.0) for o in is_open]
    converged = np.zeros(shape, bool)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):

        def residuals(a, b):
            fa = np.asarray(dp_sink(a), float)
            fb = [
                np.where(o, np.asarray(f(x), float), fa)
                for f, x, o in zip(branches, b, is_open, strict=True)
            ]
            return fa, fb, [fa - y for y in fb]

        fa, fb, r = residuals(a, b)
        for _ in range(maxiter):
            r_q = a + sum(b) - q_safe
            sa = (np.asarray(dp_sink(a + step), float) - fa) / step
            inv = [
                np.where(o, step / (np.asarray(f(x + step), float) - y), 0.0)
                for f, x, y, o in zip(branches, b, fb, is_open, strict=True)
            ]
            sum_r = sum(np.where(o, rk * i, 0.0) for rk, i, o in zip(r, inv, is_open, strict=True))
            da = -(r_q + sum_r) / (1.0 + sa * sum(inv))
            db = [
                np.where(o, (rk + sa * da) * i, 0.0)
                for rk, i, o in zip(r, inv, is_open, strict=True)
            ]
            # damping: 0 < a, 0 <= b_k, then back onto a + sum b = Q
            new_a = np.clip(a + da, 1e-3 * a, None)
            new_b = [np.clip(x + d, 0.0, None) for x, d in zip(b, db, strict=True)]
            scale = q_safe / (new_a + sum(new_b))
            new_a, new_b = new_a * scale, [x * scale for x in new_b]
            moved = np.abs(new_a - a)
            for x, y in zip(new_b, b, strict=True):
                moved = np.maximum(moved, np.abs(x - y))
            a, b = new_a, new_b
            fa, fb, r = residuals(a, b)
            ok = moved <= 1e-10 * q_safe
            for rk in r:
                ok &= np.abs(rk) <= 1e-9 * dp_scale
            converged = ok & np.isfinite(sum(r))
            if np.all(converged | ~np.isfinite(sum(r))):
                break
    zero = ~positive
    a = np.where(zero, 0.0, a)
    b_total = np.where(zero, 0.0, sum(b))
    return a, b_total, converged | zero


def _bypass_newton(fan, pressure_ratio, dp_sink, dp_bypass, extra, maxiter=40):
    """Damped Newton on the sink flow a and the bypass branch flows b_k for a fan with bypass.

    Residuals: ``r_k = dp_sink(a) - dp_k(b_k)`` for each bypass branch and ``r_f = fan(a + sum
    b) - dp_sink(a) - extra(a + sum b)`` (fan scaled by ``pressure_ratio``). The Jacobian is an
    arrow matrix, eliminated in closed form: ``da = -(r_f + s_q sum r_k/s_k) / (s_q - s_a +
    s_q s_a sum 1/s_k)``, ``db_k = (r_k + s_a da)/s_k``. A branch that is closed for a design
    (infinite pressure drop at a small flow) carries no flow there and has no equation.
    Returns ``(a, b_total, converged)``; elements that leave the feasible box or do not meet the
    tolerance are flagged unconverged.
    """
    branches = (dp_bypass,) if callable(dp_bypass) else tuple(dp_bypass)
    q_free = fan.free_delivery
    q_max = q_free * (1.0 - 1e-9)
    step = 1e-7 * q_free
    dp_scale = fan.shut_off_pressure * float(np.max(pressure_ratio))

    def fan_side(q):
        value = fan.pressure(q) * pressure_ratio
        if extra is not None:
            value = value - np.asarray(extra(q), float)
        return value

    shape = np.shape(np.asarray(dp_sink(np.float64(0.5 * q_free)), float) * pressure_ratio)
    with np.errstate(invalid="ignore", over="ignore"):
        probe = np.full(shape, 1e-6 * q_free)
        is_open = [
            np.isfinite(np.asarray(f(probe), float)) & np.ones(shape, bool) for f in branches
        ]
    count = max(len(branches), 1)
    a = np.full(shape, 0.6 * q_free)
    b = [np.where(o, 0.1 * q_free / count, 0.0) for o in is_open]

    def residuals(a, b):
        fa = np.asarray(dp_sink(a), float)
        fb = [
            np.where(o, np.asarray(f(x), float), fa)
            for f, x, o in zip(branches, b, is_open, strict=True)
        ]
        return fa, fb, [fa - x for x in fb], fan_side(a + sum(b)) - fa

    converged = np.zeros(shape, bool)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        fa, fb, r, r_fan = residuals(a, b)
        for _ in range(maxiter):
            q = a + sum(b)
            sa = (np.asarray(dp_sink(a + step), float) - fa) / step
            slopes = [
                np.where(o, (np.asarray(f(x + step), float) - y) / step, np.inf)
                for f, x, y, o in zip(branches, b, fb, is_open, strict=True)
            ]
            sq = (fan_side(q) - fan_side(q - step)) / step
            inv = [np.where(o, 1.0 / s, 0.0) for s, o in zip(slopes, is_open, strict=True)]
            sum_r = sum(np.where(o, rk * i, 0.0) for rk, i, o in zip(r, inv, is_open, strict=True))
            da = -(r_fan + sq * sum_r) / (sq - sa + sq * sa * sum(inv))
            db = [
                np.where(o, (rk + sa * da) * i, 0.0)
                for rk, i, o in zip(r, inv, is_open, strict=True)
            ]
            # damping: stay inside 0 < a, 0 <= b_k, a + sum b < free delivery
            new_a = np.clip(a + da, 1e-3 * a, None)
            new_b = [np.clip(x + d, 0.0, None) for x, d in zip(b, db, strict=True)]
            total = new_a + sum(new_b)
            shrink = np.where(total > q_max, q_max / total, 1.0)
            new_a, new_b = new_a * shrink, [x * shrink for x in new_b]
            moved = np.abs(new_a - a)
            for x, y in zip(new_b, b, strict=True):
                moved = np.maximum(moved, np.abs(x - y))
            a, b = new_a, new_b
            fa, fb, r, r_fan = residuals(a, b)
            ok = (np.abs(r_fan) <= 1e-9 * dp_scale) & (moved <= 1e-10 * q_free)
            for rk in r:
                ok &= np.abs(rk) <= 1e-9 * dp_scale
            converged = ok
            if np.all(converged | ~np.isfinite(r_fan + sum(r))):
                break
    converged &= np.isfinite(r_fan + sum(r))
    return a, sum(b), converged


def split_bypass_at_approach_velocity(
    approach_velocity,
    duct_flow_area,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
) -> BypassSplit:
    """:func:`split_bypass` for a given approach velocity over the duct section.

    Parameters
    ----------
    approach_velocity : float or array_like
        Mean air velocity upstream of the sink, over the whole duct section [m s⁻¹], >= 0.
    duct_flow_area : float or array_like
        Free cross-section of the duct at the sink: finned region plus gaps [m²], > 0.
    sink_pressure_drop, bypass_pressure_drop : callable
        As in :func:`split_bypass` [Pa].

    Returns
    -------
    BypassSplit
        As :func:`split_bypass`, with ``Q_tot = approach_velocity * duct_flow_area``.
    """
    area = np.asarray(duct_flow_area, dtype=float)
    if np.any(~(area > 0)):
        raise InputError(f"duct_flow_area = {duct_flow_area!r} m²; must be > 0")
    velocity = np.asarray(approach_velocity, dtype=float)
    if np.any(~(velocity >= 0)):
        raise InputError(f"approach_velocity = {approach_velocity!r} m/s; must be >= 0")
    return split_bypass(velocity * area, sink_pressure_drop, bypass_pressure_drop)


class BypassOperatingPoint(NamedTuple):
    """Fan operating point of a ducted heat sink with bypass, for each design.

    Attributes
    ----------
    volume_flow : numpy.ndarray
        Total flow through the fan [m³ s⁻¹]; NaN where there is no operating point.
    sink_volume_flow : numpy.ndarray
        Part of it through the fins [m³ s⁻¹].
    bypass_volume_flow : numpy.ndarray
        Part of it round the fins [m³ s⁻¹].
    pressure_drop : numpy.ndarray
        Fan static pressure = total system pressure drop [Pa].
    sink_pressure_drop : numpy.ndarray
        Pressure drop across the sink and its gaps (without the extra loss) [Pa].
    is_converged : numpy.ndarray of bool
        False where there is no operating point or a solve did not converge.
    is_in_stall_region : numpy.ndarray of bool
        True where the point lies on a positive-slope part of the fan curve.
    """

    volume_flow: np.ndarray
    sink_volume_flow: np.ndarray
    bypass_volume_flow: np.ndarray
    pressure_drop: np.ndarray
    sink_pressure_drop: np.ndarray
    is_converged: np.ndarray
    is_in_stall_region: np.ndarray


def operating_point_with_bypass(
    fan: FanCurve,
    sink_pressure_drop: SystemPressureDrop,
    bypass_pressure_drop: SystemPressureDrop,
    extra_pressure_drop: SystemPressureDrop | None = None,
    density=None,
    *,
    pressure_factor=1.0,
    raise_on_failure: bool = False,
    maxiter: int = 100,
) -> BypassOperatingPoint:
    """Fan operating point of a heat sink with bypass gaps, plus optional series losses.

    Parameters
    ----------
    fan : FanCurve
        The fan (or combination), rated at ``fan.rating_density``.
    sink_pressure_drop : callable
        ``dp(volume_flow)`` of the finned region [Pa].
    bypass_pressure_drop : callable or sequence of callable
        ``dp(volume_flow)`` of the bypass gaps [Pa]; several for gaps in parallel (side and
        top), which then share the bypass flow at equal pressure drop.
    extra_pressure_drop : callable, optional
        ``dp(volume_flow)`` of everything else in series with the duct (enclosure, filter,
        grilles) [Pa], at the total flow.
    density : float or array_like, optional
        Air density at the fan [kg m⁻³]; None: the rating density.
    pressure_factor : float or array_like, default 1.0
        Multiplier on the fan's pressure (ageing, tolerance), per design [-].
    raise_on_failure : bool, default False
        Raise :class:`~finkit.errors.SolverError` when a design has no operating point.
    maxiter : int, default 100
        Iteration limit of each solver level [-].

    Returns
    -------
    BypassOperatingPoint
        Total, sink and bypass flows [m³ s⁻¹], total and sink pressure drops [Pa], flags.

    Notes
    -----
    Nested solve (docs/methods.md h): the duct's system curve at a total flow is the pressure drop
    of the parallel sink/bypass pair from :func:`split_bypass`, plus the extra series loss;
    :func:`operating_point` crosses it with the fan curve. Both levels are vectorised over
    the designs.

    Fast path: for a fan curve without a stall region, the three balances (sink = bypass
    pressure drop, fan = duct pressure drop) are first solved together for the sink and bypass
    flows by a damped two-variable Newton iteration, about ten times fewer pressure-drop
    evaluations than the nested solve; any design where it does not converge to the residual
    tolerance is solved by the nested bracketed method above, which is always the reference.
    """
    factor = np.asarray(pressure_factor, dtype=float)
    branches = bypass_pressure_drop
    bypass_pressure_drop = parallel_pressure_drop(branches)

    def sink_and_bypass(q):
        return split_bypass(q, sink_pressure_drop, bypass_pressure_drop, maxiter=maxiter)

    def system(q):
        dp = np.asarray(sink_and_bypass(q).pressure_drop, dtype=float)
        if extra_pressure_drop is not None:
            dp = dp + np.asarray(extra_pressure_drop(q), dtype=float)
        return dp / factor

    ratio = fan.density_ratio(density)
    fast = None
    if not fan.has_stall_region:
        fast = _bypass_newton(
            fan, ratio * factor, sink_pressure_drop, branches, extra_pressure_drop
        )
    if fast is not None and np.all(fast[2]):
        a, b, _ = fast
        q = a + b
        dp_sink = np.asarray(sink_pressure_drop(a), float)
        split = BypassSplit(a, b, dp_sink, np.ones(np.shape(q), bool))
        converged = np.ones(np.shape(q), bool)
    else:
        result, ratio = _fan_balance(fan, system, density, maxiter)
        q = np.asarray(result.x)
        split = sink_and_bypass(np.where(np.isnan(q), 0.0, q))
        converged = np.asarray(result.is_converged) & np.asarray(split.is_converged)
        if fast is not None:
            a, b, ok = fast
            q = np.where(ok, a + b, q)
            split = BypassSplit(
                np.where(ok, a, split.sink_volume_flow),
                np.where(ok, b, split.bypass_volume_flow),
                np.where(ok, np.asarray(sink_pressure_drop(a), float), split.pressure_drop),
                np.asarray(split.is_converged) | ok,
            )
            converged = converged | ok
    if raise_on_failure and not np.all(converged):
        raise SolverError(_failure_message("operating_point_with_bypass", fan, converged))
    missing = np.isnan(q)
    shape = np.broadcast_shapes(q.shape, np.shape(split.sink_volume_flow))

    def out(v):
        return np.array(np.broadcast_to(np.where(missing, np.nan, v), shape))[()]

    return BypassOperatingPoint(
        out(q),
        out(split.sink_volume_flow),
        out(split.bypass_volume_flow),
        out(fan.pressure(q) * ratio * factor),
        out(split.pressure_drop),
        np.array(np.broadcast_to(converged, shape))[()],
        np.array(np.broadcast_to(fan.is_in_stall_region(q), shape))[()],
    )
