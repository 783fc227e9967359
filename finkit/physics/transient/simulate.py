"""Solving the lumped network in time (:func:`simulate_transient`) and at steady state.

The history is exact by default (:mod:`finkit.physics.transient.modal`); the stiff ODE
solvers of ``scipy.integrate`` remain selectable (``method=``) and take over where the exact
solution is not possible. SciPy is imported only then.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from finkit.errors import InputError, SolverError
from finkit.physics.transient.modal import (
    first_crossing,
    interior_maxima,
    modes,
    piece,
    reduce,
    search_grid,
)
from finkit.physics.transient.network import ThermalNetwork
from finkit.physics.transient.profiles import PowerProfile

__all__ = [
    "METHODS",
    "TransientSolution",
    "simulate_transient",
    "steady_temperatures",
]

# --------------------------------------------------------------------------------------
# Solving
# --------------------------------------------------------------------------------------


def steady_temperatures(network: ThermalNetwork, power) -> np.ndarray:
    """Steady node temperatures of a network at a constant power [K], shape (designs, n).

    Parameters
    ----------
    network : ThermalNetwork
        The network. [-]
    power : float or array
        Power into the power node [W], one value or one per design.

    Returns
    -------
    ndarray
        Absolute node temperatures [K].
    """
    k = network.matrix()
    q = network.air_conductance * network.inlet_temperature[:, None]
    q = q.copy()
    q[:, network.power_node] += np.broadcast_to(np.asarray(power, float), (k.shape[0],))
    return np.linalg.solve(k, q[:, :, None])[:, :, 0]


@dataclass(frozen=True)
class TransientSolution:
    """Node temperatures against time of one or more designs.

    Attributes
    ----------
    node_names : tuple of str
        Node names. [-]
    time : ndarray, shape (m,)
        Output times, increasing; a time appears twice where the power or the condition
        changes (the values before and after) [s].
    temperature : ndarray, shape (designs, n, m)
        Node temperatures [K].
    power : ndarray, shape (m,)
        Power at each output time [W].
    peak_temperature : ndarray, shape (designs, n)
        Highest temperature of each node, interior maxima included (``"exact"``; the ODE
        methods take it at their steps) [K].
    time_to_limit : ndarray, shape (designs,)
        First time the limit node reaches the limit temperature; NaN if it never does (or no
        limit was given) [s].
    supplied_energy : ndarray, shape (designs,)
        Energy put in by the power [J].
    convected_energy : ndarray, shape (designs,)
        Energy carried to the air (integrated exactly, or by the ODE solver alongside the
        temperatures) [J].
    stored_energy : ndarray, shape (designs,)
        Change of the energy held by the node capacities [J].
    switch_times : tuple of float
        Times the condition changed [s].
    method : str
        How the history was obtained: ``"exact"`` (eigen-decomposition of each piece) or the
        ``solve_ivp`` method, with the reason where the exact solution was not possible. [-]
    """

    node_names: tuple[str, ...]
    time: np.ndarray
    temperature: np.ndarray
    power: np.ndarray
    peak_temperature: np.ndarray
    time_to_limit: np.ndarray
    supplied_energy: np.ndarray
    convected_energy: np.ndarray
    stored_energy: np.ndarray
    switch_times: tuple[float, ...] = field(default=())
    method: str = "exact"

    def node(self, name: str) -> np.ndarray:
        """Temperature history of one node, shape (designs, m) [K].

        Parameters
        ----------
        name : str
            The node, one of ``node_names`` [-].
        """
        try:
            return self.temperature[:, self.node_names.index(name), :]
        except ValueError:
            raise InputError(f"node: got {name!r}; allowed: {', '.join(self.node_names)}") from None

    @property
    def final_temperature(self) -> np.ndarray:
        """Node temperatures at the end, shape (designs, n) [K]."""
        return self.temperature[:, :, -1]


#: Methods of :func:`simulate_transient`: the exact solution, or a stiff ``solve_ivp`` method.
METHODS = ("exact", "BDF", "LSODA", "Radau")


def simulate_transient(
    networks: Sequence[ThermalNetwork] | ThermalNetwork,
    power: PowerProfile | float,
    duration: float,
    *,
    switch_times: Sequence[float] = (),
    initial_temperature=None,
    limit_node: str | None = None,
    limit_temperature=None,
    sample_times=None,
    method: str = "exact",
    rtol: float = 1e-8,
    atol: float = 1e-8,
) -> TransientSolution:
    """The history of the lumped network through condition changes and a power history.

    Parameters
    ----------
    networks : ThermalNetwork or sequence of ThermalNetwork
        The network of each condition in turn (same nodes and capacities; conductances and
        inlet air differ). [-]
    power : PowerProfile or float
        Power into the power node against time [W].
    duration : float
        End time [s].
    switch_times : sequence of float
        Time at which each following network takes over (one fewer than ``networks``) [s].
    initial_temperature : array or None
        Node temperatures at t = 0, shape (designs, n) [K]; None = the steady state of the
        first network at the power at t = 0.
    limit_node : str or None
        Node whose limit is watched. [-]
    limit_temperature : float or array or None
        The limit [K]; the first time the node reaches it is ``time_to_limit``.
    sample_times : array or None
        Report the history at these times only (sorted, within [0, duration]; a time where
        the power or condition changes is reported twice, before and after) [s]; None = the
        search grid of each piece (``"exact"``: 33 even points plus 12 per decade from a
        tenth of the fastest time constant) or the solver's own steps plus 9 points per
        piece. Peaks and the time to the limit never depend on the samples.
    method : str
        ``"exact"`` (default): each piece solved exactly through the eigen-decomposition of
        the network (:mod:`finkit.physics.transient.modal`); where the network's modes are
        not real and decaying (a non-symmetric network), ``"BDF"`` is used instead and
        ``TransientSolution.method`` says why. Or a stiff ``scipy.integrate.solve_ivp``
        method: ``"BDF"``, ``"LSODA"`` or ``"Radau"``. [-]
    rtol : float
        Relative tolerance of the ODE solver (not used by ``"exact"``) [-].
    atol : float
        Absolute tolerance of the ODE solver on temperatures above the first inlet air (not
        used by ``"exact"``) [K].

    Returns
    -------
    TransientSolution
        History, peaks, time to the limit and the energy balance.

    Raises
    ------
    InputError
        On inconsistent networks or times.
    SolverError
        If the ODE solver fails.

    Notes
    -----
    The history is solved in pieces between every change of condition or power, within which
    the network is linear with constant coefficients and the power linear in time.
    ``"exact"``: each piece is a sum of decaying exponentials plus an affine part (module
    notes of :mod:`~finkit.physics.transient.modal`); the peaks are the largest of its values
    on a search grid and of its interior maxima (where its derivative, searched for sign
    changes on the grid, is zero); the time to the limit is the first upward crossing, found
    by a bracketed root search on the exact solution; the convected energy is its exact
    integral. The ODE methods integrate the convected heat alongside the temperatures, take
    peaks at the solver's steps and the time to the limit from its event location.
    """
    nets = [networks] if isinstance(networks, ThermalNetwork) else list(networks)
    switches = [float(s) for s in switch_times]
    if len(switches) != len(nets) - 1:
        raise InputError("switch_times: give one time per network after the first")
    if any(not 0 < s < duration for s in switches) or switches != sorted(switches):
        raise InputError("switch_times: must increase and lie inside (0, duration)")
    if method not in METHODS:
        raise InputError(f"method: got {method!r}; allowed: {', '.join(METHODS)}")
    profile = power if isinstance(power, PowerProfile) else PowerProfile.constant(power)
    first = nets[0]
    names = first.node_names
    for net in nets[1:]:
        if net.node_names != names or not np.array_equal(net.heat_capacity, first.heat_capacity):
            raise InputError("networks: every condition must have the same nodes and capacities")
    reduced = [reduce(net) for net in nets]
    designs, n = first.design_count, len(names)
    t_ref = first.inlet_temperature
    limit_index, limit = None, None
    if limit_node is not None and limit_temperature is not None:
        limit_index = names.index(limit_node)
        limit = np.broadcast_to(np.asarray(limit_temperature, float), (designs,)) - t_ref
    if initial_temperature is None:
        theta0 = steady_temperatures(first, profile.at(0.0)) - t_ref[:, None]
    else:
        theta0 = (
            np.broadcast_to(np.asarray(initial_temperature, float), (designs, n)) - t_ref[:, None]
        )
    # Pieces between every change of condition or power.
    knots = {0.0, float(duration), *switches}
    knots |= {float(t) for t in profile.time if 0.0 < t < duration}
    knots = sorted(knots)
    pieces = _Pieces(nets, reduced, profile, knots, switches, t_ref, limit_index, limit)
    used = method
    if method == "exact":
        found = [modes(red) for red in reduced]
        reasons = [why for mode, why in found if mode is None]
        if reasons:
            used = f"BDF ({reasons[0]}: no exact solution)"
            out = _integrate_ivp(pieces, theta0, sample_times, "BDF", rtol, atol)
        else:
            out = _integrate_exact(pieces, [mode for mode, _ in found], theta0, sample_times)
    else:
        out = _integrate_ivp(pieces, theta0, sample_times, method, rtol, atol)
    times, temps, powers, peak, time_to_limit, convected, theta_end = out
    time = np.concatenate(times) if times else np.zeros(0)
    theta = np.concatenate(temps, axis=2) if temps else np.zeros((designs, n, 0))
    stored = np.sum(first.heat_capacity * (theta_end - theta0), axis=1)
    supplied = np.full(designs, profile.energy(0.0, float(duration)))
    return TransientSolution(
        node_names=names,
        time=time,
        temperature=theta + t_ref[:, None, None],
        power=np.concatenate(powers) if powers else np.zeros(0),
        peak_temperature=peak + t_ref[:, None],
        time_to_limit=time_to_limit,
        supplied_energy=supplied,
        convected_energy=np.array(convected, float),
        stored_energy=stored,
        switch_times=tuple(switches),
        method=used,
    )


@dataclass(frozen=True)
class _Pieces:
    """What both integrators need: the conditions, the power and the pieces between knots."""

    nets: list
    reduced: list
    profile: PowerProfile
    knots: list
    switches: list
    t_ref: np.ndarray
    limit_index: int | None
    limit: np.ndarray | None

    def __iter__(self):
        """``(t0, t1, condition index, p0, slope)`` of each piece in turn."""
        for t0, t1 in zip(self.knots[:-1], self.knots[1:], strict=True):
            k = int(np.searchsorted(self.switches, t0, side="right"))
            p0 = float(self.profile.at(t0))
            p1 = float(self.profile.at(t1)) if self.profile.interpolation == "linear" else p0
            yield t0, t1, k, p0, (p1 - p0) / (t1 - t0)


def _integrate_exact(pieces: _Pieces, found, theta0, sample_times):
    """The history piece by piece from the exact solution of each (module ``modal``)."""
    designs, n = theta0.shape
    state = theta0[:, pieces.reduced[0].dynamic]
    times, temps, powers = [], [], []
    peak = np.full((designs, n), -np.inf)
    time_to_limit = np.full(designs, np.nan)
    convected = np.zeros(designs)
    st = None if sample_times is None else np.asarray(sample_times, float)
    for t0, t1, k, p0, slope in pieces:
        net, mode, length = pieces.nets[k], found[k], t1 - t0
        d_air = net.inlet_temperature - pieces.t_ref
        part = piece(pieces.reduced[k], mode, state, d_air, p0, slope, length, net.air_conductance)
        grid = search_grid(mode.rate, length)
        values = part.value(grid)
        maxima = interior_maxima(part, grid, part.slope(grid))
        peak = np.maximum(peak, values.max(axis=2))
        np.maximum.at(peak, (maxima[0], maxima[1]), maxima[4])
        pending = np.isnan(time_to_limit)
        if pieces.limit_index is not None and np.any(pending):
            cross = first_crossing(part, grid, values, maxima, pieces.limit_index,
                                   pieces.limit, pending)  # fmt: skip
            time_to_limit = np.where(pending & np.isfinite(cross), t0 + cross, time_to_limit)
        if st is None:
            ts, tv = t0 + grid, values
            ts[-1] = t1
        else:
            ts = st[(st >= t0) & (st <= t1)]
            tv = part.value(ts - t0)
        if ts.size:
            times.append(ts)
            temps.append(tv)
            powers.append(p0 + slope * (ts - t0))
        convected = convected + part.convected
        state = part.dynamic_end
    theta_end = part.value(np.array([length]))[:, :, 0]
    return times, temps, powers, peak, time_to_limit, convected, theta_end


def _integrate_ivp(pieces: _Pieces, theta0, sample_times, method, rtol, atol):
    """The history by ``scipy.integrate.solve_ivp`` (a stiff method, the exact Jacobian)."""
    # imported here: the exact solution needs neither (0.1 s of imports in a check)
    from scipy import sparse
    from scipy.integrate import solve_ivp

    designs, n = theta0.shape
    dyn = pieces.reduced[0].dynamic
    d = dyn.size
    limit_index, limit = pieces.limit_index, pieces.limit
    y = np.concatenate([theta0[:, dyn].ravel(), np.zeros(designs)])
    times, temps, powers = [], [], []
    peak = np.full((designs, n), -np.inf)
    time_to_limit = np.full(designs, np.nan)
    for t0, t1, k, p0, slope in pieces:
        red, net = pieces.reduced[k], pieces.nets[k]
        d_air = net.inlet_temperature - pieces.t_ref
        g_air = net.air_conductance  # (B, n)
        # Convected heat = Σ g_air (θ_all - θ_in) = w θd + w_air d_air + w_p P
        w = np.einsum("bn,bnd->bd", g_air, red.m)
        w_air = np.einsum("bn,bn->b", g_air, red.m_air) - g_air.sum(axis=1)
        w_p = np.einsum("bn,bn->b", g_air, red.m_p)
        forcing_air = red.b_air * d_air[:, None]
        jac = sparse.bmat(
            [
                [sparse.block_diag(list(red.a)), sparse.csr_matrix((designs * d, designs))],
                [sparse.block_diag(list(w[:, None, :])), sparse.csr_matrix((designs, designs))],
            ],
            format="csc",
        )
        if method == "LSODA":  # LSODA takes the Jacobian as a function, dense
            dense = jac.toarray()

            def jac(t, state, dense=dense):
                return dense

        def rhs(t, state, red=red, w=w, w_air=w_air, w_p=w_p, forcing_air=forcing_air,
                d_air=d_air, t0=t0, p0=p0, slope=slope):  # fmt: skip
            p = p0 + slope * (t - t0)
            th = state[: designs * d].reshape(designs, d)
            dth = np.einsum("bij,bj->bi", red.a, th) + forcing_air + red.b_p * p
            q = np.einsum("bd,bd->b", w, th) + w_air * d_air + w_p * p
            return np.concatenate([dth.ravel(), q])

        def all_nodes(state, t, red=red, d_air=d_air, t0=t0, p0=p0, slope=slope):
            p = p0 + slope * (np.asarray(t) - t0)
            th = state[: designs * d].reshape(designs, d, -1)
            return (
                np.einsum("bnd,bdm->bnm", red.m, th)
                + (red.m_air * d_air[:, None])[:, :, None]
                + red.m_p[:, :, None] * np.atleast_1d(p)[None, None, :]
            )

        events = []
        if limit_index is not None:
            for b in range(designs):

                def crossing(t, state, b=b, all_nodes=all_nodes):
                    return all_nodes(state[:, None], t)[b, limit_index, 0] - limit[b]

                crossing.direction = 1.0
                events.append(crossing)
        sol = solve_ivp(rhs, (t0, t1), y, method=method, jac=jac, rtol=rtol, atol=atol,
                        dense_output=True, events=events or None)  # fmt: skip
        if not sol.success:
            raise SolverError(f"transient: the ODE solver failed between {t0} s and {t1} s: "
                              f"{sol.message}")  # fmt: skip
        if limit_index is not None:
            start = all_nodes(y[:, None], t0)[:, limit_index, 0]
            for b in range(designs):
                if np.isnan(time_to_limit[b]):
                    if start[b] >= limit[b]:
                        time_to_limit[b] = t0
                    elif sol.t_events[b].size:
                        time_to_limit[b] = float(sol.t_events[b][0])
        peak = np.maximum(peak, all_nodes(sol.y, sol.t).max(axis=2))
        if sample_times is None:
            ts = np.unique(np.concatenate([sol.t, np.linspace(t0, t1, 9)]))
        else:
            st = np.asarray(sample_times, float)
            ts = st[(st >= t0) & (st <= t1)]
        if ts.size:
            states = sol.sol(ts)
            temps.append(all_nodes(states, ts))
            times.append(ts)
            powers.append(p0 + slope * (ts - t0))
        y = sol.y[:, -1]
    theta_end = all_nodes(y[:, None], pieces.knots[-1])[:, :, 0]
    return times, temps, powers, peak, time_to_limit, y[designs * d :].copy(), theta_end
