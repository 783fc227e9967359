"""The lumped network reduced to its nodes with capacity, and its exact solution in pieces.

Between two changes of condition or power the nodes with a heat capacity obey a linear system
with constant coefficients and a forcing linear in time (``tau = t - t0``)::

    dθ/dt = A θ + g0 + g1 tau,    A = -C⁻¹ S,

``θ = T - T_ref`` their temperatures, ``C`` their heat capacities and ``S = K_dd - K_da
K_aa⁻¹ K_ad`` the conductance matrix that remains once the nodes without capacity (which
follow at once) are eliminated (a Schur complement of the network's matrix ``K``). The exact
solution of such a piece is an affine particular solution plus the decaying modes::

    θ(tau) = u0 + u1 tau + V exp(Λ tau) V⁻¹ (θ(0) - u0),   S u1 = C g1,   S u0 = C (g0 - u1),

with ``A = V Λ V⁻¹`` (the eigenvector method of Moler & Van Loan [1]_, section 6, for the
exponential of a matrix that has a well-conditioned eigenvector basis). The affine part comes
from a linear solve, not from the eigenvalues, so the end state of a long piece is the steady
state to the accuracy of that solve.

Where ``S`` is symmetric (conductances between nodes are symmetric: every network built by
:func:`~finkit.physics.transient.network.chain_network`), ``S v = mu C v`` is a
symmetric-definite problem: ``C^(1/2) S⁻¹ C^(1/2) = Q diag(tau) Qᵀ`` gives real time
constants ``tau`` (``Λ = -1/tau``) and ``V = C^(-1/2) Q``, ``V⁻¹ = Qᵀ C^(1/2)`` (Golub & Van
Loan [2]_, section 8.7). Decomposing the inverse puts the absolute rounding error of the
symmetric eigensolver, about ``1e-16 max(tau)``, on the time constants, so the slow modes that
set a time to a limit keep full relative accuracy however stiff the network (a floored
resistance gives rates of 1e9 s⁻¹ beside 1e-2 s⁻¹). Otherwise ``A`` is decomposed as it
stands and accepted only when its eigenvalues are real and negative and its eigenvectors well
conditioned; :func:`modes` returns None when they are not, and the caller integrates that
history with the ODE solver instead.

References
----------
.. [1] Moler, C. and Van Loan, C., "Nineteen dubious ways to compute the exponential of a
   matrix, twenty-five years later", SIAM Review 45(1), 3-49, 2003. doi:10.1137/S00361445024180
.. [2] Golub, G.H. and Van Loan, C.F., Matrix Computations, 4th ed., Johns Hopkins University
   Press, 2013.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError
from finkit.physics.airflow.roots import bracketed_root
from finkit.physics.transient.network import ThermalNetwork

#: Relative tolerance on the symmetry of ``S`` and on the imaginary parts of eigenvalues [-].
SYMMETRY_TOLERANCE = 1e-10
#: Largest condition number of a non-symmetric system's eigenvector basis accepted [-].
CONDITION_LIMIT = 1e8
#: Log-spaced points per decade of the grid each piece is searched on for maxima [-].
POINTS_PER_DECADE = 12
#: Evenly spaced points of that grid [-].
EVEN_POINTS = 33


@dataclass(frozen=True)
class Reduced:
    """A network reduced to its nodes with capacity (the others follow algebraically)."""

    dynamic: np.ndarray  # indices of nodes with capacity
    a: np.ndarray  # (B, d, d): dθd/dt = a θd + b_air θ_in + b_p P   (θ = T - T_ref)
    b_air: np.ndarray  # (B, d) times (T_in - T_ref)
    b_p: np.ndarray  # (B, d)
    m: np.ndarray  # (B, n, d): θ_all = m θd + m_air (T_in - T_ref) + m_p P
    m_air: np.ndarray  # (B, n)
    m_p: np.ndarray  # (B, n)
    stiffness: np.ndarray  # (B, d, d): S, with a = -S / C
    capacity: np.ndarray  # (B, d): C of the nodes with capacity


def reduce(network: ThermalNetwork) -> Reduced:
    """The network's nodes with capacity, the others eliminated (see the module notes).

    Parameters
    ----------
    network : ThermalNetwork
        The network. [-]
    """
    cap = network.heat_capacity
    has = cap > 0
    if np.any(has != has[:1]):
        raise InputError(
            "heat capacities: a node has capacity in some designs and none in others; give all "
            "designs the same nodes"
        )
    dyn = np.flatnonzero(has[0])
    alg = np.flatnonzero(~has[0])
    if dyn.size == 0:
        raise InputError("heat capacities: no node has a heat capacity")
    k = network.matrix()
    air = network.air_conductance
    n = k.shape[1]
    e_p = np.zeros(n)
    e_p[network.power_node] = 1.0
    b = k.shape[0]
    k_dd = k[:, dyn][:, :, dyn]
    k_da = k[:, dyn][:, :, alg]
    k_ad = k[:, alg][:, :, dyn]
    k_aa = k[:, alg][:, :, alg]
    # Algebraic nodes: K_ad θd + K_aa θa = air_a θ_in + e_a P
    if alg.size:
        inv = np.linalg.inv(k_aa)
        alg_d = -inv @ k_ad  # (B, a, d)
        alg_air = np.einsum("bij,bj->bi", inv, air[:, alg])
        alg_p = np.einsum("bij,j->bi", inv, e_p[alg])
    else:
        alg_d = np.zeros((b, 0, dyn.size))
        alg_air = np.zeros((b, 0))
        alg_p = np.zeros((b, 0))
    c = cap[:, dyn]
    # C θd' = -K_dd θd - K_da θa + air_d θ_in + e_d P
    s = k_dd + k_da @ alg_d
    a = -s / c[:, :, None]
    b_air = (air[:, dyn] - np.einsum("bij,bj->bi", k_da, alg_air)) / c
    b_p = (e_p[dyn][None, :] - np.einsum("bij,bj->bi", k_da, alg_p)) / c
    m = np.zeros((b, n, dyn.size))
    m[:, dyn, np.arange(dyn.size)] = 1.0
    m[:, alg, :] = alg_d
    m_air = np.zeros((b, n))
    m_air[:, alg] = alg_air
    m_p = np.zeros((b, n))
    m_p[:, alg] = alg_p
    return Reduced(dyn, a, b_air, b_p, m, m_air, m_p, s, c)


@dataclass(frozen=True)
class Modes:
    """Eigen-decomposition ``A = V diag(rate) V⁻¹`` of a reduced network, per design."""

    rate: np.ndarray  # (B, d), real and negative [s⁻¹]
    vectors: np.ndarray  # (B, d, d)
    inverse: np.ndarray  # (B, d, d)


def modes(red: Reduced) -> tuple[Modes | None, str]:
    """The modes of a reduced network, or None with the reason they cannot be used.

    Parameters
    ----------
    red : Reduced
        The reduced network. [-]

    Returns
    -------
    tuple
        ``(Modes, "")``, or ``(None, reason)`` when the eigenvalues are not all real and
        negative or (non-symmetric ``S``) the eigenvector basis is ill conditioned.
    """
    s, c = red.stiffness, red.capacity
    scale = np.max(np.abs(s), axis=(1, 2), keepdims=True)
    if not np.all(np.isfinite(s)):
        return None, "the network's matrix is not finite"
    if np.all(np.abs(s - np.swapaxes(s, 1, 2)) <= SYMMETRY_TOLERANCE * scale):
        # C^(1/2) S⁻¹ C^(1/2): its eigenvalues are the time constants (module notes)
        root = np.sqrt(c)
        try:
            w = root[:, :, None] * np.linalg.solve(s, np.eye(c.shape[1]) * root[:, None, :])
        except np.linalg.LinAlgError:
            return None, "a mode of the network does not decay (no path to the air)"
        tau, q = np.linalg.eigh(0.5 * (w + np.swapaxes(w, 1, 2)))
        if not np.all((tau > 0) & np.isfinite(tau)):
            return None, "a mode of the network does not decay (no path to the air)"
        rate = -1.0 / tau
        vectors = q / root[:, :, None]
        inverse = np.swapaxes(q, 1, 2) * root[:, None, :]
    else:
        lam, vec = np.linalg.eig(red.a)
        if np.any(np.abs(lam.imag) > SYMMETRY_TOLERANCE * np.abs(lam).max(axis=1, keepdims=True)):
            return None, "the network's modes oscillate (complex eigenvalues)"
        # a real eigenvalue has a real eigenvector: drop the rounding in the imaginary part
        rate, vectors = lam.real, vec.real
        with np.errstate(all="ignore"):
            condition = np.linalg.cond(vectors)
        if not np.all(condition < CONDITION_LIMIT):
            return None, "the network has no well-conditioned basis of modes"
        inverse = np.linalg.inv(vectors)
    if not np.all((rate < 0) & np.isfinite(rate)):
        return None, "a mode of the network does not decay (no path to the air)"
    return Modes(rate, vectors, inverse), ""


@dataclass(frozen=True)
class Piece:
    """The exact history of one piece: every node ``alpha + beta tau + gamma · exp(rate tau)``.

    Arrays per design ``(B, ...)``; ``n`` nodes, ``d`` modes; ``tau`` from the piece's start.
    """

    alpha: np.ndarray  # (B, n) [K]
    beta: np.ndarray  # (B, n) [K s⁻¹]
    gamma: np.ndarray  # (B, n, d) [K]
    rate: np.ndarray  # (B, d) [s⁻¹]
    dynamic_end: np.ndarray  # (B, d): θd at the end [K]
    convected: np.ndarray  # (B,): heat to the air over the piece [J]

    def value(self, tau) -> np.ndarray:
        """Node excess temperatures at times ``tau``, shape (B, n, m) [K].

        Parameters
        ----------
        tau : array_like, shape (m,)
            Times from the piece's start, shared by the designs [s].
        """
        return self.alpha[:, :, None] + self._modal(tau, 0)

    def slope(self, tau) -> np.ndarray:
        """Time derivative of every node at times ``tau``, shape (B, n, m) [K s⁻¹].

        Parameters
        ----------
        tau : array_like, shape (m,)
            Times from the piece's start, shared by the designs [s].
        """
        return self._modal(tau, 1)

    def at(self, design, node, tau, order: int = 0) -> np.ndarray:
        """Entry by entry: node ``node[i]`` of design ``design[i]`` at ``tau[i]`` [K], or its
        time derivative with ``order=1`` [K s⁻¹].

        Parameters
        ----------
        design, node : ndarray of int
            Design and node of each entry. [-]
        tau : ndarray
            Time of each entry from the piece's start [s].
        order : int
            0: the excess temperature, 1: its time derivative. [-]
        """
        rate = self.rate[design]
        decay = rate**order * np.exp(rate * np.asarray(tau, float)[:, None])
        modal = np.sum(self.gamma[design, node] * decay, axis=1)
        if order == 1:
            return self.beta[design, node] + modal
        return self.alpha[design, node] + self.beta[design, node] * tau + modal

    def _modal(self, tau, order):
        """``d^order/dtau^order (beta tau + gamma · exp(rate tau))`` for order 0 or 1."""
        tau = np.asarray(tau, float)
        rate = self.rate[:, :, None]
        decay = rate**order * np.exp(rate * tau[None, None, :])
        affine = self.beta[:, :, None] * (tau if order == 0 else 1.0)
        return affine + np.einsum("bnd,bdm->bnm", self.gamma, decay)


def piece(red, mode, theta_start, d_air, p0, slope, length, g_air) -> Piece:
    """The exact solution of one piece from the state of the nodes with capacity.

    Parameters
    ----------
    red : Reduced
        The reduced network of the condition in force. [-]
    mode : Modes
        Its modes. [-]
    theta_start : ndarray, shape (B, d)
        Excess temperatures of the nodes with capacity at the start [K].
    d_air : ndarray, shape (B,)
        Inlet air minus the reference temperature [K].
    p0, slope : float
        Power at the start [W] and its rate of change [W s⁻¹].
    length : float
        Length of the piece [s].
    g_air : ndarray, shape (B, n)
        Conductance of each node to the air [W K⁻¹].
    """
    c, s = red.capacity, red.stiffness
    g0 = red.b_air * d_air[:, None] + red.b_p * p0
    g1 = red.b_p * slope
    u1 = np.linalg.solve(s, (c * g1)[:, :, None])[:, :, 0]
    u0 = np.linalg.solve(s, (c * (g0 - u1))[:, :, None])[:, :, 0]
    amp = np.einsum("bij,bj->bi", mode.inverse, theta_start - u0)  # modal amplitudes
    rate = mode.rate
    decay_end = np.exp(rate * length)
    dynamic_end = u0 + u1 * length + np.einsum("bij,bj->bi", mode.vectors, decay_end * amp)
    alpha = np.einsum("bnd,bd->bn", red.m, u0) + red.m_air * d_air[:, None] + red.m_p * p0
    beta = np.einsum("bnd,bd->bn", red.m, u1) + red.m_p * slope
    gamma = (red.m @ mode.vectors) * amp[:, None, :]
    # Heat to the air Σ g_air (θ - θ_in), integrated exactly: an affine part and the modes.
    q_alpha = np.einsum("bn,bn->b", g_air, alpha) - g_air.sum(axis=1) * d_air
    q_beta = np.einsum("bn,bn->b", g_air, beta)
    q_gamma = np.einsum("bn,bnd->bd", g_air, gamma)
    integral = np.expm1(rate * length) / rate
    convected = q_alpha * length + 0.5 * q_beta * length**2 + np.sum(q_gamma * integral, axis=1)
    return Piece(alpha, beta, gamma, rate, dynamic_end, convected)


def search_grid(rate: np.ndarray, length: float) -> np.ndarray:
    """Times within a piece where its history is searched for maxima and crossings [s].

    Evenly spaced points plus log-spaced ones from a tenth of the fastest mode's time
    constant, so that every mode's rise and fall is sampled wherever it happens.

    Parameters
    ----------
    rate : ndarray, shape (B, d)
        Eigenvalues of the piece's network (negative) [s⁻¹].
    length : float
        Length of the piece [s].
    """
    even = np.linspace(0.0, length, EVEN_POINTS)
    fastest = float(np.min(-1.0 / rate))
    start = max(0.1 * fastest, 1e-9 * length)
    if start >= length:
        return even
    count = int(np.ceil(np.log10(length / start) * POINTS_PER_DECADE)) + 1
    return np.unique(np.concatenate([even, np.geomspace(start, length, count)]))


def interior_maxima(part: Piece, grid: np.ndarray, slopes: np.ndarray):
    """Local maxima of every node strictly inside the grid's intervals.

    Parameters
    ----------
    part : Piece
        The piece. [-]
    grid : ndarray, shape (m,)
        Search times [s].
    slopes : ndarray, shape (B, n, m)
        ``part.slope(grid)`` [K s⁻¹].

    Returns
    -------
    tuple of ndarray
        ``design, node, interval, time, value``: one entry per interval where the slope
        changes from rising to falling; ``time`` is where the slope is zero (to about 1e-15
        relative), ``value`` the node's excess temperature there [-], [-], [-], [s], [K].
    """
    rising, falling = slopes[:, :, :-1] > 0, slopes[:, :, 1:] < 0
    design, node, interval = np.nonzero(rising & falling)
    if design.size == 0:
        empty = np.zeros(0)
        return design, node, interval, empty, empty
    found = bracketed_root(
        lambda tau: part.at(design, node, tau, 1), grid[interval], grid[interval + 1],
        lower_value=slopes[design, node, interval], upper_value=slopes[design, node, interval + 1],
    )  # fmt: skip
    time = np.where(np.isfinite(found.x), found.x, grid[interval])
    value = part.at(design, node, time)
    return design, node, interval, time, value


def first_crossing(part: Piece, grid, values, maxima, node: int, limit, pending) -> np.ndarray:
    """First time (from the piece start) a node reaches its limit from below, NaN if never.

    Parameters
    ----------
    part : Piece
        The piece. [-]
    grid : ndarray, shape (m,)
        Search times [s].
    values : ndarray, shape (B, n, m)
        ``part.value(grid)`` [K].
    maxima : tuple
        :func:`interior_maxima` of the piece. [-]
    node : int
        The node watched. [-]
    limit : ndarray, shape (B,)
        Its limit (excess temperature) [K].
    pending : ndarray of bool, shape (B,)
        Designs whose limit has not yet been reached. [-]

    Returns
    -------
    ndarray, shape (B,)
        ``0`` where the node starts at or above the limit; the crossing to about 1e-15
        relative where it rises through it (searched between the grid points and up to
        every interior maximum, so a brief excursion above the limit is found too) [s].
    """
    m = grid.size
    f = values[:, node, :] - limit[:, None]
    above = f >= 0
    first_point = np.where(above.any(axis=1), np.argmax(above, axis=1), m)
    design, at_node, interval, time, value = maxima
    hit = (at_node == node) & (value >= limit[design])
    first_peak = np.full(f.shape[0], m)
    peak_time = np.full(f.shape[0], np.nan)
    for b in np.unique(design[hit]):  # earliest interval with a maximum above the limit
        k = np.flatnonzero(hit & (design == b))
        k = k[np.argmin(interval[k])]
        first_peak[b], peak_time[b] = interval[k], time[k]
    out = np.full(f.shape[0], np.nan)
    out[pending & (first_point == 0)] = 0.0
    search = pending & (first_point > 0) & ((first_point < m) | (first_peak < m))
    if not np.any(search):
        return out
    # bracket: up to the earlier of the first point above and the first maximum above
    by_peak = first_peak <= first_point - 1
    k = np.where(by_peak, first_peak, first_point - 1)[search]
    lower = grid[k]
    upper = np.where(by_peak[search], peak_time[search], grid[np.minimum(k + 1, m - 1)])
    designs = np.flatnonzero(search)
    nodes = np.full(designs.size, node)
    lim = limit[search]

    def excess(tau):
        return part.at(designs, nodes, tau) - lim

    found = bracketed_root(excess, lower, upper, lower_value=f[search][np.arange(k.size), k])
    out[search] = np.where(np.isfinite(found.x), found.x, upper)
    return out
