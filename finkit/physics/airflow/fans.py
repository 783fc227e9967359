"""Fan curves: the fan table and its rules, density scaling, fans combined, stopped fans."""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any, NamedTuple

import numpy as np

from finkit.errors import InputError, NotSupportedError
from finkit.interpolation import MonotoneCubic
from finkit.physics.airflow.roots import (
    _scalar_root,
)

__all__ = [
    "ARRANGEMENTS",
    "FanCurve",
    "FanTableProblem",
    "STANDARD_AIR_DENSITY",
    "SystemPressureDrop",
    "fan_table_problems",
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
        """One line naming the argument, the point and the rule (``prefix`` before the name).

        Parameters
        ----------
        prefix : str, default ""
            Text put before the argument's name, e.g. ``"FanCurve."``. [-]
        """
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
        """True where the curve rises with flow (positive slope) at ``volume_flow``.

        Parameters
        ----------
        volume_flow : float or array_like
            Volume flow through the fan (or the combination) [m³ s⁻¹].
        """
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
            Parallel: flows add at equal pressure; series: pressures add at equal flow [-].
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
            How the fans are installed [-].
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
