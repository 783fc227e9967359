"""Thermal impedance: the step response of the network and its Foster and Cauer ladders."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy import optimize

from finkit.errors import InputError
from finkit.physics.transient.network import ThermalNetwork
from finkit.physics.transient.profiles import PowerProfile
from finkit.physics.transient.simulate import _reduce, simulate_transient, steady_temperatures

__all__ = [
    "CauerLadder",
    "FosterLadder",
    "StepResponse",
    "cauer_from_foster",
    "fit_foster",
    "foster_from_network",
    "step_response",
]

# --------------------------------------------------------------------------------------
# Thermal impedance and RC ladders
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class StepResponse:
    """Temperature rise of a node per watt after a power step from rest (thermal impedance).

    Attributes
    ----------
    time : ndarray
        Log-spaced times [s].
    impedance : ndarray, shape (designs, m)
        ``Z(t) = (T(t) - T_in) / P`` [K W⁻¹].
    steady_resistance : ndarray, shape (designs,)
        ``Z(∞)``, the steady node-to-inlet-air resistance [K W⁻¹].
    node : str
        The node. [-]
    """

    time: np.ndarray
    impedance: np.ndarray
    steady_resistance: np.ndarray
    node: str = "junction"


def _time_constants(network: ThermalNetwork) -> np.ndarray:
    """Time constants of the network's modes, shape (designs, d), ascending [s]."""
    red = _reduce(network)
    eig = np.linalg.eigvals(red.a).real
    return np.sort(-1.0 / eig, axis=1)


def step_response(
    network: ThermalNetwork, node: str = "junction", points: int = 120, method: str = "BDF"
) -> StepResponse:
    """Thermal impedance ``Z(t)`` of a node: rise per watt after a 1 W step from rest.

    Parameters
    ----------
    network : ThermalNetwork
        The network (its inlet air is the reference). [-]
    node : str
        Node whose rise is reported. [-]
    points : int
        Number of log-spaced times, from a tenth of the shortest to ten times the longest
        time constant of the network. [-]
    method : str
        ``solve_ivp`` method (see :func:`simulate_transient`). [-]

    Returns
    -------
    StepResponse
        Times and ``Z(t)`` [K W⁻¹].
    """
    taus = _time_constants(network)
    t_lo, t_hi = 0.1 * taus.min(), 10.0 * taus.max()
    times = np.geomspace(t_lo, t_hi, int(points))
    start = np.broadcast_to(network.inlet_temperature[:, None], network.heat_capacity.shape)
    sol = simulate_transient(
        network, PowerProfile.constant(1.0), float(times[-1]), initial_temperature=start,
        sample_times=times, method=method, rtol=1e-10, atol=1e-12,
    )  # fmt: skip
    i = network.node_names.index(node)
    rise = sol.temperature[:, i, :] - network.inlet_temperature[:, None]
    steady = steady_temperatures(network, 1.0)[:, i] - network.inlet_temperature
    return StepResponse(sol.time, rise, steady, node)


@dataclass(frozen=True)
class FosterLadder:
    """A Foster RC ladder: ``Z(t) = R_0 + Σ R_i (1 - exp(-t / tau_i))``, ``C_i = tau_i / R_i``.

    Attributes
    ----------
    resistance : ndarray
        Resistance of each parallel RC pair [K W⁻¹].
    time_constant : ndarray
        Time constant of each pair, ascending [s].
    series_resistance : float
        A resistance in series with the pairs, reached at once (the nodes of the path hold no
        heat) [K W⁻¹].
    max_error : float
        Largest difference from the fitted step response over the fitted times, as a fraction
        of the steady resistance [-].
    method : str
        How it was obtained. [-]
    """

    resistance: np.ndarray
    time_constant: np.ndarray
    series_resistance: float = 0.0
    max_error: float = 0.0
    method: str = ""

    @property
    def capacitance(self) -> np.ndarray:
        """Heat capacity of each pair ``tau_i / R_i`` [J K⁻¹]."""
        return self.time_constant / self.resistance

    @property
    def steady_resistance(self) -> float:
        """``Z(∞) = R_0 + Σ R_i`` [K W⁻¹]."""
        return float(self.series_resistance + np.sum(self.resistance))

    def impedance(self, time) -> np.ndarray:
        """``Z(t)`` of the ladder for t > 0 [K W⁻¹].

        Parameters
        ----------
        time : float or array_like
            Times after the power step [s].
        """
        t = np.asarray(time, float)[..., None]
        pairs = np.sum(self.resistance * -np.expm1(-t / self.time_constant), axis=-1)
        return self.series_resistance + pairs


def foster_from_network(network: ThermalNetwork, node: str = "junction") -> list[FosterLadder]:
    """The exact Foster ladder of a lumped network's node, one per design (modal expansion).

    The impedance of a linear RC network is a sum of decaying exponentials, one per node with
    capacity, plus a series resistance where the path to the first node with capacity holds
    no heat; residues come from the eigen-decomposition of the reduced system. Used to check
    :func:`fit_foster`.

    Parameters
    ----------
    network : ThermalNetwork
        The network. [-]
    node : str
        Node of the impedance. [-]

    Returns
    -------
    list of FosterLadder
        One ladder per design.
    """
    red = _reduce(network)
    i = network.node_names.index(node)
    out = []
    for b in range(network.design_count):
        lam, vec = np.linalg.eig(red.a[b])
        lam, vec = lam.real, vec.real
        coef = np.linalg.solve(vec, red.b_p[b])
        # θd(t) = V diag((e^{λt} - 1)/λ) V⁻¹ b_p for a 1 W step from rest; node = m θd + m_p
        r = -((red.m[b, i] @ vec) * coef) / lam
        order = np.argsort(-1.0 / lam)
        out.append(
            FosterLadder(
                r[order], -1.0 / lam[order], float(red.m_p[b, i]), 0.0,
                "modal expansion of the lumped network",
            )
        )  # fmt: skip
    return out


def fit_foster(response: StepResponse, term_count: int = 4, design: int = 0) -> FosterLadder:
    """Fit a Foster ladder (a series resistance and RC pairs) to a step response.

    Parameters
    ----------
    response : StepResponse
        The step response (thermal impedance). [-]
    term_count : int
        Number of RC pairs (1-8). [-]
    design : int
        Which design of the response. [-]

    Returns
    -------
    FosterLadder
        Pairs sorted by time constant, with the largest error over the response's times.

    Notes
    -----
    ``scipy.optimize.least_squares`` (trust-region reflective) on the response's log-spaced
    times, minimising ``(Z_fit - Z) / Z(∞)``. The parameters are ``ln R_i``, ``ln tau_i``
    (so each pair's resistance and time constant are positive) and the series resistance
    ``R_0 >= 0`` (a bound); each ``tau_i`` is bounded to the fitted times (a faster pair is
    indistinguishable from ``R_0``). Three starts with time constants log-spaced over the
    full, the inner 60 % and the inner 30 % of the log time range, ``R_0`` at the first
    value; the best fit is kept.
    """
    n = int(term_count)
    if not 1 <= n <= 8:
        raise InputError(f"term_count: must be 1-8 (got {term_count!r})")
    t = response.time
    z = response.impedance[design]
    z_ss = float(response.steady_resistance[design])

    def model(params):
        r, tau = np.exp(params[:n]), np.exp(params[n : 2 * n])
        return params[2 * n] + np.sum(r * -np.expm1(-t[:, None] / tau), axis=1)

    def residual(params):
        return (model(params) - z) / z_ss

    def jacobian(params):
        r, tau = np.exp(params[:n]), np.exp(params[n : 2 * n])
        decay = np.exp(-t[:, None] / tau)
        d_log_r = r * (1.0 - decay)
        d_log_tau = -r * (t[:, None] / tau) * decay
        return np.hstack([d_log_r, d_log_tau, np.ones((t.size, 1))]) / z_ss

    lo_t, hi_t = np.log(t[0]), np.log(t[-1])
    # Time constants within the fitted times (a faster pair would be indistinguishable from
    # the series resistance, a slower one from a resistance that never settles).
    lower = np.concatenate([np.full(n, -np.inf), np.full(n, lo_t), [0.0]])
    upper = np.concatenate([np.full(n, np.inf), np.full(n, hi_t), [np.inf]])
    best = None
    for frac in (0.0, 0.2, 0.35):
        lo, hi = lo_t + frac * (hi_t - lo_t), hi_t - frac * (hi_t - lo_t)
        taus = np.linspace(lo, hi, n) if n > 1 else np.array([0.5 * (lo + hi)])
        r0 = max(float(z[0]), 0.0)
        x0 = np.concatenate([np.full(n, np.log(max(z_ss - r0, 1e-12 * z_ss) / n)), taus, [r0]])
        fit = optimize.least_squares(residual, x0, jac=jacobian, bounds=(lower, upper),
                                     method="trf", xtol=1e-12, ftol=1e-12, gtol=1e-12,
                                     max_nfev=2000)  # fmt: skip
        if best is None or fit.cost < best.cost:
            best = fit
    r, tau = np.exp(best.x[:n]), np.exp(best.x[n : 2 * n])
    order = np.argsort(tau)
    return FosterLadder(
        r[order],
        tau[order],
        float(best.x[2 * n]),
        float(np.max(np.abs(residual(best.x)))),
        f"least squares (scipy.optimize.least_squares) on {t.size} log-spaced times of the "
        f"step response: a series resistance and {n} RC pairs, every R and tau positive, tau "
        "within the fitted times",
    )


@dataclass(frozen=True)
class CauerLadder:
    """A Cauer RC ladder: ``R_0``, then ``C_1`` to the air, ``R_1`` to the next node, ...

    The input impedance is ``Z(s) = R_0 + 1/(s C_1 + 1/(R_1 + 1/(s C_2 + ...)))``; the last
    resistance ends at the air. Unlike a Foster ladder its nodes can be joined to further
    networks (a board, an enclosure).

    Attributes
    ----------
    resistance : ndarray
        Series resistances from the first node towards the air [K W⁻¹].
    capacitance : ndarray
        Heat capacity of each node to the air (a thermal ground) [J K⁻¹].
    series_resistance : float
        Resistance from the input to the first node [K W⁻¹].
    """

    resistance: np.ndarray
    capacitance: np.ndarray
    series_resistance: float = 0.0

    def impedance_at(self, s) -> np.ndarray:
        """Input impedance at complex frequency ``s`` [K W⁻¹].

        Parameters
        ----------
        s : complex or array_like
            Complex frequency [s⁻¹].
        """
        s = np.asarray(s, complex)
        z = np.zeros_like(s)
        for r, c in zip(self.resistance[::-1], self.capacitance[::-1], strict=True):
            z = 1.0 / (s * c + 1.0 / (r + z))
        return self.series_resistance + z

    def network(self, inlet_temperature: float = 0.0) -> ThermalNetwork:
        """The ladder as a :class:`ThermalNetwork`, the power into its input node.

        Parameters
        ----------
        inlet_temperature : float
            Temperature of the ladder's reference (ambient) node [K].
        """
        n = self.resistance.size
        has_input = self.series_resistance > 0
        m = n + int(has_input)
        g = np.zeros((1, m, m))
        cap = np.zeros((1, m))
        first = int(has_input)
        if has_input:
            g[0, 0, 1] = g[0, 1, 0] = 1.0 / self.series_resistance
        for i in range(n - 1):
            g[0, first + i, first + i + 1] = g[0, first + i + 1, first + i] = (
                1.0 / self.resistance[i]
            )
        cap[0, first:] = self.capacitance
        air = np.zeros((1, m))
        air[0, -1] = 1.0 / self.resistance[-1]
        names = (("input",) if has_input else ()) + tuple(f"node_{i + 1}" for i in range(n))
        return ThermalNetwork(names, g, air, cap, np.array([float(inlet_temperature)]))


def cauer_from_foster(foster: FosterLadder, tolerance: float = 1e-6) -> CauerLadder | None:
    """The Cauer ladder with the same input impedance as a Foster ladder, or None.

    Parameters
    ----------
    foster : FosterLadder
        The Foster ladder. [-]
    tolerance : float
        Largest relative difference of the two impedances over frequencies from
        ``0.01/tau_max`` to ``100/tau_min``, for the result to be accepted [-].

    Returns
    -------
    CauerLadder or None
        None when the conversion is numerically unsafe (an element not positive, or the
        impedances differ by more than ``tolerance``).

    Notes
    -----
    The series resistance carries over unchanged. The pairs ``Z(s) = Σ R_i/(1 + s tau_i)
    = N(s)/D(s)`` are expanded as a continued fraction (Cauer's first form) of the admittance
    ``Y = D/N``, with ``s`` scaled by the longest time constant to keep the coefficients of
    similar size: alternately remove the pole at infinity (``s C_k``) from the admittance and
    the constant (``R_k``) from the remaining impedance. Every passive RC impedance has such a
    ladder with positive elements (Foster's reactance theorem); numerically the expansion loses
    digits as the time constants spread apart, hence the check.
    """
    tau_s = float(np.max(foster.time_constant))
    taus = foster.time_constant / tau_s
    poly = np.polynomial.Polynomial
    den = poly([1.0])
    for tau in taus:
        den = den * poly([1.0, tau])
    num = poly([0.0])
    for i, r in enumerate(foster.resistance):
        term = poly([r])
        for j, tau in enumerate(taus):
            if j != i:
                term = term * poly([1.0, tau])
        num = num + term
    resistances, capacitances = [], []
    y_num, y_den = den, num  # admittance Y = y_num / y_den, deg y_num = deg y_den + 1
    for k in range(taus.size):
        m = taus.size - k  # degree of y_num
        if y_den.coef.size < m or y_den.coef[m - 1] == 0:
            return None
        c = y_num.coef[m] / y_den.coef[m - 1]
        rem = poly((y_num - poly([0.0, c]) * y_den).coef[:m])  # degree m - 1
        if rem.coef[m - 1] == 0:
            return None
        r = y_den.coef[m - 1] / rem.coef[m - 1]
        nxt = poly((y_den - r * rem).coef[: m - 1]) if m > 1 else poly([0.0])  # degree m - 2
        capacitances.append(c * tau_s)
        resistances.append(r)
        y_num, y_den = rem, nxt
    ladder = CauerLadder(
        np.array(resistances), np.array(capacitances), float(foster.series_resistance)
    )
    if np.any(ladder.resistance <= 0) or np.any(ladder.capacitance <= 0):
        return None
    w = np.geomspace(0.01 / tau_s, 100.0 / float(np.min(foster.time_constant)), 200)
    s = 1j * w
    z_foster = foster.series_resistance + np.sum(
        foster.resistance / (1.0 + s[:, None] * foster.time_constant), axis=1
    )
    if np.max(np.abs(ladder.impedance_at(s) - z_foster) / np.abs(z_foster)) > tolerance:
        return None
    return ladder
