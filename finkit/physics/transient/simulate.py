"""Solving the lumped network in time (:func:`simulate_transient`) and at steady state."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
from scipy import sparse
from scipy.integrate import solve_ivp

from finkit.errors import InputError, SolverError
from finkit.physics.transient.network import ThermalNetwork
from finkit.physics.transient.profiles import PowerProfile

__all__ = [
    "TransientSolution",
    "simulate_transient",
    "steady_temperatures",
]

# --------------------------------------------------------------------------------------
# Solving
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Reduced:
    """A network reduced to its nodes with capacity (the others follow algebraically)."""

    dynamic: np.ndarray  # indices of nodes with capacity
    a: np.ndarray  # (B, d, d): dθd/dt = a θd + b_p P   (θ = T - T_ref)
    b_air: np.ndarray  # (B, d) times (T_in - T_ref)
    b_p: np.ndarray  # (B, d)
    m: np.ndarray  # (B, n, d): θ_all = m θd + m_air (T_in - T_ref) + m_p P
    m_air: np.ndarray  # (B, n)
    m_p: np.ndarray  # (B, n)


def _reduce(network: ThermalNetwork) -> _Reduced:
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
    a = (-k_dd - k_da @ alg_d) / c[:, :, None]
    b_air = (air[:, dyn] - np.einsum("bij,bj->bi", k_da, alg_air)) / c
    b_p = (e_p[dyn][None, :] - np.einsum("bij,bj->bi", k_da, alg_p)) / c
    m = np.zeros((b, n, dyn.size))
    m[:, dyn, np.arange(dyn.size)] = 1.0
    m[:, alg, :] = alg_d
    m_air = np.zeros((b, n))
    m_air[:, alg] = alg_air
    m_p = np.zeros((b, n))
    m_p[:, alg] = alg_p
    return _Reduced(dyn, a, b_air, b_p, m, m_air, m_p)


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
        Highest temperature of each node [K].
    time_to_limit : ndarray, shape (designs,)
        First time the limit node reaches the limit temperature; NaN if it never does (or no
        limit was given) [s].
    supplied_energy : ndarray, shape (designs,)
        Energy put in by the power [J].
    convected_energy : ndarray, shape (designs,)
        Energy carried to the air (integrated alongside the temperatures) [J].
    stored_energy : ndarray, shape (designs,)
        Change of the energy held by the node capacities [J].
    switch_times : tuple of float
        Times the condition changed [s].
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
    method: str = "BDF",
    rtol: float = 1e-8,
    atol: float = 1e-8,
) -> TransientSolution:
    """Integrate the lumped network through condition changes and a power history.

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
        solver's own steps plus 9 points per piece. Peaks use the solver's steps either way.
    method : str
        ``solve_ivp`` method, a stiff one: ``"BDF"`` (default), ``"LSODA"`` or ``"Radau"``. [-]
    rtol : float
        Relative tolerance of the solver [-].
    atol : float
        Absolute tolerance on temperatures above the first inlet air [K].

    Returns
    -------
    TransientSolution
        History, peaks, time to the limit and the energy balance.

    Raises
    ------
    InputError
        On inconsistent networks or times.
    SolverError
        If the integrator fails.
    """
    nets = [networks] if isinstance(networks, ThermalNetwork) else list(networks)
    switches = [float(s) for s in switch_times]
    if len(switches) != len(nets) - 1:
        raise InputError("switch_times: give one time per network after the first")
    if any(not 0 < s < duration for s in switches) or switches != sorted(switches):
        raise InputError("switch_times: must increase and lie inside (0, duration)")
    if method not in ("BDF", "LSODA", "Radau"):
        raise InputError(f"method: got {method!r}; allowed: BDF, LSODA, Radau")
    profile = power if isinstance(power, PowerProfile) else PowerProfile.constant(power)
    first = nets[0]
    names = first.node_names
    for net in nets[1:]:
        if net.node_names != names or not np.array_equal(net.heat_capacity, first.heat_capacity):
            raise InputError("networks: every condition must have the same nodes and capacities")
    reduced = [_reduce(net) for net in nets]
    dyn = reduced[0].dynamic
    designs, n, d = first.design_count, len(names), dyn.size
    t_ref = first.inlet_temperature
    limit_index = None
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
    y = np.concatenate([theta0[:, dyn].ravel(), np.zeros(designs)])
    times, temps, powers = [], [], []
    peak = np.full((designs, n), -np.inf)
    time_to_limit = np.full(designs, np.nan)
    convected = np.zeros(designs)
    for t0, t1 in zip(knots[:-1], knots[1:], strict=True):
        k = int(np.searchsorted(switches, t0, side="right"))
        red, net = reduced[k], nets[k]
        d_air = net.inlet_temperature - t_ref
        p0 = float(profile.at(t0))
        p1 = float(profile.at(t1)) if profile.interpolation == "linear" else p0
        slope = (p1 - p0) / (t1 - t0)
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
        convected = y[designs * d :]
    time = np.concatenate(times) if times else np.zeros(0)
    theta = np.concatenate(temps, axis=2) if temps else np.zeros((designs, n, 0))
    temperature = theta + t_ref[:, None, None]
    theta_end = all_nodes(y[:, None], knots[-1])[:, :, 0]
    cap = first.heat_capacity
    stored = np.sum(cap * (theta_end - theta0), axis=1)
    supplied = np.full(designs, profile.energy(0.0, float(duration)))
    peak = peak + t_ref[:, None]
    return TransientSolution(
        node_names=names,
        time=time,
        temperature=temperature,
        power=np.concatenate(powers) if powers else np.zeros(0),
        peak_temperature=peak,
        time_to_limit=time_to_limit,
        supplied_energy=supplied,
        convected_energy=convected.copy(),
        stored_energy=stored,
        switch_times=tuple(switches),
    )
