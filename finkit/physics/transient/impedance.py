"""Thermal impedance: the step response of the network and its Foster and Cauer ladders."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError
from finkit.physics.transient.modal import reduce
from finkit.physics.transient.network import ThermalNetwork
from finkit.physics.transient.profiles import PowerProfile
from finkit.physics.transient.simulate import simulate_transient, steady_temperatures

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
    red = reduce(network)
    eig = np.linalg.eigvals(red.a).real
    return np.sort(-1.0 / eig, axis=1)


def step_response(
    network: ThermalNetwork, node: str = "junction", points: int = 120, method: str = "exact"
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
        ``"exact"`` or a ``solve_ivp`` method (see :func:`simulate_transient`). [-]

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
    red = reduce(network)
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


#: Root-mean-square relative residual of a Foster fit taken as exact (no further starts) [-].
EXACT_FIT = 1e-12


def _nonnegative_least_squares(a: np.ndarray, y: np.ndarray) -> np.ndarray:
    """``min |a x - y|`` subject to ``x >= 0`` (Lawson & Hanson's active-set method).

    Lawson, C.L. and Hanson, R.J., Solving Least Squares Problems, Prentice-Hall, 1974,
    chapter 23 (algorithm NNLS). For the few columns of a Foster fit.
    """
    n = a.shape[1]
    x = np.linalg.lstsq(a, y, rcond=None)[0]
    if np.all(x > 0):  # the unconstrained solution is feasible: it is the answer
        return x
    x = np.zeros(n)
    passive = np.zeros(n, bool)
    tol = 10.0 * np.finfo(float).eps * np.abs(a).sum(axis=0).max() * max(a.shape)
    w = a.T @ (y - a @ x)
    for _ in range(3 * n):
        if passive.all() or np.max(np.where(passive, -np.inf, w)) <= tol:
            break
        passive[np.argmax(np.where(passive, -np.inf, w))] = True
        for _ in range(3 * n):
            z = np.zeros(n)
            z[passive] = np.linalg.lstsq(a[:, passive], y, rcond=None)[0]
            if np.all(z[passive] > 0):
                x = z
                break
            neg = passive & (z <= 0)
            step = np.min(x[neg] / (x[neg] - z[neg]))
            x = x + step * (z - x)
            passive &= x > tol
            x[~passive] = 0.0
        w = a.T @ (y - a @ x)
    return x


def _foster_projection(log_tau, t, target, floor):
    """Variable projection of a Foster fit: for given time constants, the best amplitudes.

    Returns the residual, the amplitudes (series resistance first; pairs at least ``floor``)
    and the Jacobian of the residual in ``log_tau`` (Kaufman's approximation).
    """
    tau = np.exp(log_tau)
    decay = np.exp(-t[:, None] / tau)
    basis = np.hstack([np.ones((t.size, 1)), 1.0 - decay])
    lower = np.concatenate([[0.0], np.full(tau.size, floor)])
    amp = lower + _nonnegative_least_squares(basis, target - basis @ lower)
    residual = basis @ amp - target
    free = amp > lower
    d_basis = -(t[:, None] / tau) * decay * amp[1:]  # d(residual)/d(log tau_j)
    if np.any(free):
        q = np.linalg.qr(basis[:, free])[0]
        d_basis = d_basis - q @ (q.T @ d_basis)
    return residual, amp, d_basis


def _levenberg_marquardt(fun, x0, lower, upper, max_iter=300, tol=1e-13):
    """Minimise ``|r(x)|²`` within a box by Levenberg-Marquardt, steps clipped to the box.

    ``fun(x) -> (residual, extra, jacobian)``. Marquardt's diagonal scaling; a step is kept
    only if it lowers the cost (Nocedal & Wright, Numerical Optimization, 2nd ed., Springer,
    2006, section 10.3). Returns ``(x, residual, extra)``.
    """
    x = np.clip(np.asarray(x0, float), lower, upper)
    r, extra, jac = fun(x)
    cost = r @ r
    damping = 1e-3
    for _ in range(max_iter):
        grad = jac.T @ r
        normal = jac.T @ jac
        scale = np.maximum(np.diag(normal), 1e-300)
        found = False
        while damping < 1e12:
            step = np.linalg.solve(normal + damping * np.diag(scale), -grad)
            x_new = np.clip(x + step, lower, upper)
            r_new, extra_new, jac_new = fun(x_new)
            cost_new = r_new @ r_new
            if cost_new < cost:
                found = True
                break
            damping *= 4.0
        if not found:
            break
        moved = np.max(np.abs(x_new - x))
        gain = cost - cost_new
        x, r, extra, jac, cost = x_new, r_new, extra_new, jac_new, cost_new
        damping = max(damping / 3.0, 1e-12)
        if gain <= tol * cost or moved <= tol * (1.0 + np.max(np.abs(x))):
            break
    return x, r, extra


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
    Least squares on the response's log-spaced times, minimising ``(Z_fit - Z) / Z(∞)``, by
    variable projection (Golub & Pereyra [1]_): for given time constants the resistances
    enter linearly, so they are the best non-negative least-squares amplitudes (Lawson &
    Hanson's NNLS; the series resistance ``R_0 >= 0``, each pair's ``R_i >= 1e-12 Z(∞)``), and
    only the ``ln tau_i`` are searched, by Levenberg-Marquardt with Kaufman's Jacobian [2]_,
    each ``tau_i`` bounded to the fitted times (a faster pair is indistinguishable from
    ``R_0``, a slower one from a resistance that never settles). Three starts with time
    constants log-spaced over the full, the inner 60 % and the inner 30 % of the log time
    range; the best fit is kept (a start that fits to ``1e-12`` r.m.s. ends the search).
    Checked against ``scipy.optimize.least_squares`` on all ``2n + 1`` parameters (tests).

    References
    ----------
    .. [1] Golub, G.H. and Pereyra, V., "The differentiation of pseudo-inverses and nonlinear
       least squares problems whose variables separate", SIAM Journal on Numerical Analysis
       10(2), 413-432, 1973. doi:10.1137/0710036
    .. [2] Kaufman, L., "A variable projection method for solving separable nonlinear least
       squares problems", BIT 15, 49-57, 1975. doi:10.1007/BF01932995
    """
    n = int(term_count)
    if not 1 <= n <= 8:
        raise InputError(f"term_count: must be 1-8 (got {term_count!r})")
    t = response.time
    z_ss = float(response.steady_resistance[design])
    target = response.impedance[design] / z_ss

    def fun(log_tau):
        return _foster_projection(log_tau, t, target, 1e-12)

    lo_t, hi_t = np.log(t[0]), np.log(t[-1])
    best = None
    for frac in (0.0, 0.2, 0.35):
        lo, hi = lo_t + frac * (hi_t - lo_t), hi_t - frac * (hi_t - lo_t)
        start = np.linspace(lo, hi, n) if n > 1 else np.array([0.5 * (lo + hi)])
        log_tau, residual, amp = _levenberg_marquardt(fun, start, lo_t, hi_t)
        cost = float(residual @ residual)
        if best is None or cost < best[0]:
            best = (cost, log_tau, residual, amp)
        if cost <= t.size * EXACT_FIT**2:  # the ladder reproduces the response: done
            break
    _, log_tau, residual, amp = best
    tau = np.exp(log_tau)
    order = np.argsort(tau)
    return FosterLadder(
        amp[1:][order] * z_ss,
        tau[order],
        float(amp[0] * z_ss),
        float(np.max(np.abs(residual))),
        f"least squares (variable projection) on {t.size} log-spaced times of the step "
        f"response: a series resistance and {n} RC pairs, every R and tau positive, tau "
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
