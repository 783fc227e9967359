"""Power as a function of time for a transient: steps, pulse trains and tables."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError

__all__ = [
    "PowerProfile",
    "pulse_train",
]

# --------------------------------------------------------------------------------------
# Power as a function of time
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PowerProfile:
    """Power against time: breakpoints held (``step``) or joined linearly (``linear``).

    Attributes
    ----------
    time : ndarray
        Breakpoint times, strictly increasing, the first at 0 [s].
    power : ndarray
        Power at each breakpoint [W]; after the last breakpoint the last value holds.
    interpolation : str
        ``"step"`` (each value holds until the next breakpoint) or ``"linear"``. [-]
    """

    time: np.ndarray
    power: np.ndarray
    interpolation: str = "step"

    def __post_init__(self):
        t = np.atleast_1d(np.asarray(self.time, float))
        p = np.atleast_1d(np.asarray(self.power, float))
        if t.shape != p.shape or t.ndim != 1:
            raise InputError("power profile: time and power must be lists of the same length")
        if t[0] != 0.0 or np.any(np.diff(t) <= 0):
            raise InputError("power profile: times must start at 0 s and increase")
        if np.any(p < 0) or not np.all(np.isfinite(p)):
            raise InputError("power profile: power must be finite and >= 0 W")
        if self.interpolation not in ("step", "linear"):
            raise InputError(
                f"power profile: interpolation {self.interpolation!r}; allowed: step, linear"
            )
        object.__setattr__(self, "time", t)
        object.__setattr__(self, "power", p)

    @classmethod
    def constant(cls, power: float) -> PowerProfile:
        """A constant power [W].

        Parameters
        ----------
        power : float
            The power [W].
        """
        return cls(np.array([0.0]), np.array([float(power)]))

    def at(self, time) -> np.ndarray:
        """Power at ``time`` [W]; at a step the value after it.

        Parameters
        ----------
        time : float or array_like
            Times [s].
        """
        t = np.asarray(time, float)
        if self.interpolation == "linear":
            return np.interp(t, self.time, self.power)
        i = np.searchsorted(self.time, t, side="right") - 1
        return self.power[np.clip(i, 0, None)]

    def energy(self, start: float, end: float) -> float:
        """Energy supplied between ``start`` and ``end`` [J] (exact for the profile).

        Parameters
        ----------
        start, end : float
            The interval [s].
        """
        inside = self.time[(self.time > start) & (self.time < end)]
        knots = np.unique(np.concatenate([[start, end], inside]))
        if self.interpolation == "linear":
            p = self.at(knots)
            return float(np.sum(0.5 * (p[1:] + p[:-1]) * np.diff(knots)))
        return float(np.sum(self.at(knots[:-1]) * np.diff(knots)))


def pulse_train(high, low, period, duty_cycle, duration, start=0.0, count=None) -> PowerProfile:
    """A rectangular pulse train: ``high`` for ``duty_cycle * period``, then ``low``.

    Parameters
    ----------
    high : float
        Power during a pulse [W].
    low : float
        Power between pulses (and before ``start``) [W].
    period : float
        Pulse period [s].
    duty_cycle : float
        Fraction of each period at ``high``, in (0, 1] [-].
    duration : float
        End of the profile [s].
    start : float
        Time of the first pulse's rising edge [s].
    count : int or None
        Number of pulses; None = until ``duration``. [-]

    Returns
    -------
    PowerProfile
        Step profile with a breakpoint at every edge.
    """
    if not (period > 0 and 0 < duty_cycle <= 1 and duration > 0 and start >= 0):
        raise InputError("pulse train: needs period > 0, 0 < duty_cycle <= 1, duration > 0")
    width = duty_cycle * period
    times, powers = [0.0], [float(low)]
    k = 0
    while start + k * period < duration and (count is None or k < count):
        on = start + k * period
        times += [on, on + width]
        powers += [float(high), float(low)]
        k += 1
    t, p = np.array(times), np.array(powers)
    # Merge coincident edges (a pulse at t = 0; duty cycle 1) keeping the later value.
    keep = np.append(np.diff(t) > 0, True)
    t, p = t[keep], p[keep]
    if t[0] != 0.0:
        t, p = np.concatenate([[0.0], t]), np.concatenate([[float(low)], p])
    return PowerProfile(t, p)
