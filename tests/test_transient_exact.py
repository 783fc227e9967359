"""The exact (modal) solution of the lumped transient and the Foster fit, against references.

References used in these tests only: SciPy's ``solve_ivp`` (BDF at tight tolerances, through
``simulate_transient(method="BDF")``, the integrator finkit used before the exact solution) and
SciPy's ``least_squares`` (the previous Foster fit, written out here). Identities: the single
RC node's closed form, the energy balance, the limit temperature at the time to the limit.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from finkit.case import load_case
from finkit.model import run_case
from finkit.physics import transient as tr
from finkit.physics.properties.materials import get_material

DEMO = Path(__file__).resolve().parents[1] / "demo_cases" / "nb200-plate-fan.yaml"
TIGHT = {"method": "BDF", "rtol": 1e-11, "atol": 1e-11}


@pytest.fixture(scope="module")
def demo():
    """The demo case solved, and a builder of its RC network at a condition."""
    case = load_case(DEMO)
    result = run_case(case)
    rows = {row.name: row for row in result.conditions.rows}
    material = get_material(case.sink.material)

    def network(name, fin_nodes=1, junction=0.3, package=6.0):
        row = rows[name]
        return tr.chain_network(
            row.solution, row.inputs.geometry, row.inputs.material.thermal_conductivity,
            material.density, material.specific_heat, junction_heat_capacity=junction,
            case_heat_capacity=package, fin_node_count=fin_nodes,
        )  # fmt: skip

    return result, rows, network


def _both(*args, **kwargs):
    """The exact solution and the tight BDF reference of the same history."""
    exact = tr.simulate_transient(*args, **kwargs)
    reference = tr.simulate_transient(*args, **kwargs, **TIGHT)
    assert exact.method == "exact" and reference.method == "BDF"
    return exact, reference


def _assert_same_history(exact, reference, temperature_atol):
    assert np.array_equal(exact.time, reference.time)
    assert np.allclose(exact.temperature, reference.temperature, rtol=0, atol=temperature_atol)
    assert np.allclose(exact.power, reference.power, rtol=1e-14, atol=0)
    # peaks: the reference takes them at its own steps, so it may fall short, never exceed
    assert np.all(exact.peak_temperature >= reference.peak_temperature - temperature_atol)
    assert np.allclose(exact.peak_temperature, reference.peak_temperature, atol=1e-5)
    assert np.allclose(exact.convected_energy, reference.convected_energy, rtol=1e-8)
    assert np.allclose(exact.stored_energy, reference.stored_energy, rtol=1e-6, atol=1e-4)


# --------------------------------------------------------------------------------------
# One node: the closed form


@pytest.mark.identity
def test_single_node_is_the_closed_form_to_rounding():
    # Identity: C dT/dt = P - (T - T_inf)/R from T_inf integrates (integrating factor) to
    # T = T_inf + P R (1 - exp(-t/(R C))), the lumped-capacitance solution with a heat input
    # (cf. Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., chapter 5);
    # the limit T_inf + dT is reached at t = -R C ln(1 - dT/(P R)).
    c, g, p, inlet, rise_limit = 150.0, 0.8, 25.0, 300.0, 20.0
    net = tr.ThermalNetwork(("node",), np.zeros((1, 1, 1)), np.array([[g]]), np.array([[c]]),
                            np.array([inlet]))  # fmt: skip
    times = np.linspace(0.0, 6.0 * c / g, 301)
    sol = tr.simulate_transient(net, p, times[-1], initial_temperature=[[inlet]],
                                sample_times=times, limit_node="node",
                                limit_temperature=inlet + rise_limit)  # fmt: skip
    expected = p / g * -np.expm1(-times * g / c)
    assert np.max(np.abs(sol.temperature[0, 0] - inlet - expected)) < 1e-12 * p / g
    assert sol.time_to_limit[0] == pytest.approx(-(c / g) * np.log1p(-rise_limit * g / p),
                                                 rel=1e-13)  # fmt: skip
    assert sol.peak_temperature[0, 0] == pytest.approx(inlet + expected[-1], rel=1e-15)


# --------------------------------------------------------------------------------------
# The chain: against the ODE solver


@pytest.mark.crosscheck
def test_demo_fan_failure_matches_the_ode_solver(demo):
    # Cross-check: scipy solve_ivp (BDF, rtol = atol = 1e-11) on the demo's transient: the
    # steady hot day, a fan failing at 60 s, 30 min; a limit the junction crosses.
    result, rows, network = demo
    nets = [network("hot-day"), network("hot-day-one-fan")]
    start = tr.steady_temperatures(nets[0], float(rows["hot-day"].solution.power))
    final = tr.steady_temperatures(nets[1], float(rows["hot-day-one-fan"].solution.power))
    limit = 0.5 * (start[0, 0] + final[0, 0])
    samples = np.unique(np.concatenate([np.linspace(0.0, 1800.0, 1201), [60.0]]))
    exact, reference = _both(
        nets, float(rows["hot-day-one-fan"].solution.power), 1800.0, switch_times=[60.0],
        initial_temperature=start, limit_node="junction", limit_temperature=limit,
        sample_times=samples,
    )  # fmt: skip
    _assert_same_history(exact, reference, 1e-7)
    assert exact.time_to_limit[0] == pytest.approx(reference.time_to_limit[0], rel=1e-8)
    assert 60.0 < exact.time_to_limit[0] < 1800.0
    # the case's own transient is the exact one
    assert result.transient.solution.method == "exact"


@pytest.mark.crosscheck
def test_pulses_and_a_condition_change_match_the_ode_solver(demo):
    # Cross-check: scipy solve_ivp (BDF, rtol = atol = 1e-11) with four fin nodes, a pulse
    # train (90 W / 10 W, 40 s period, 25 % duty) and a fan failure at 130 s; the limit is
    # set 0.5 K under the junction's highest peak, so the first pulse reaching it counts.
    _, _, network = demo
    nets = [network("hot-day", 4), network("one-fan-failed", 4)]
    power = tr.pulse_train(90.0, 10.0, 40.0, 0.25, 600.0, start=5.0)
    probe = tr.simulate_transient(nets, power, 600.0, switch_times=[130.0])
    limit = probe.peak_temperature[0, 0] - 0.5
    samples = np.linspace(0.0, 600.0, 2401)
    exact, reference = _both(nets, power, 600.0, switch_times=[130.0], limit_node="junction",
                             limit_temperature=limit, sample_times=samples)  # fmt: skip
    _assert_same_history(exact, reference, 2e-7)
    assert exact.time_to_limit[0] == pytest.approx(reference.time_to_limit[0], abs=1e-6)


@pytest.mark.crosscheck
def test_radau_and_lsoda_stay_selectable(demo):
    # Cross-check: the other stiff solve_ivp methods agree with the exact history.
    _, _, network = demo
    nets = [network("hot-day"), network("one-fan-failed")]
    exact = tr.simulate_transient(nets, 40.0, 300.0, switch_times=[20.0])
    for method in ("Radau", "LSODA"):
        other = tr.simulate_transient(nets, 40.0, 300.0, switch_times=[20.0], method=method,
                                      sample_times=exact.time[exact.time != 20.0])  # fmt: skip
        assert other.method == method
        at = np.isin(exact.time, other.time) & (exact.time != 20.0)
        assert np.allclose(exact.temperature[:, :, at], other.temperature, atol=1e-5)


@pytest.mark.identity
def test_energy_balance_closes_to_rounding(demo):
    # Identity: supplied = convected + stored, the convected heat integrated exactly, over
    # pulses, a linear ramp and a change of condition (two designs at once).
    _, _, network = demo
    a, b = network("hot-day", 3), network("dusty-filter", 3)
    pair = [tr.ThermalNetwork(a.node_names, *(np.concatenate([getattr(x, f), getattr(y, f)])
                                               for f in ("conductance", "air_conductance",
                                                         "heat_capacity", "inlet_temperature")))
            for x, y in ((a, b), (b, a))]  # fmt: skip
    for power in (
        tr.pulse_train(70.0, 5.0, 30.0, 0.4, 400.0, start=3.0),
        tr.PowerProfile(np.array([0.0, 50.0, 200.0]), np.array([10.0, 80.0, 0.0]), "linear"),
    ):
        sol = tr.simulate_transient(pair, power, 400.0, switch_times=[90.0])
        assert np.allclose(sol.convected_energy + sol.stored_energy, sol.supplied_energy,
                           rtol=1e-11)  # fmt: skip


@pytest.mark.identity
def test_time_to_limit_finds_a_brief_excursion_between_grid_points(demo):
    # Identity: after a 60 s pulse the fin nodes keep rising, peak inside the quiet piece and
    # fall; a limit 1 mK under that peak is reached where the node equals it and not before.
    _, _, network = demo
    net = network("hot-day", 4)
    power = tr.PowerProfile(np.array([0.0, 60.0]), np.array([120.0, 0.0]))
    start = np.broadcast_to(net.inlet_temperature[:, None], net.heat_capacity.shape)
    probe = tr.simulate_transient(net, power, 900.0, initial_temperature=start)
    tip = net.node_names.index("fin_4")
    limit = probe.peak_temperature[0, tip] - 1e-3
    sol = tr.simulate_transient(net, power, 900.0, initial_temperature=start,
                                limit_node="fin_4", limit_temperature=limit)  # fmt: skip
    t_lim = sol.time_to_limit[0]
    assert 60.0 < t_lim < 900.0
    before = np.linspace(0.0, t_lim, 20001)[:-1]
    dense = tr.simulate_transient(net, power, 900.0, initial_temperature=start,
                                  sample_times=np.append(before, t_lim))  # fmt: skip
    at_limit = dense.temperature[0, tip]
    assert at_limit[-1] == pytest.approx(limit, abs=1e-9)
    assert np.all(at_limit[:-1][before != 60.0] < limit)
    # Cross-check: scipy solve_ivp (BDF, tight) locates the same crossing.
    reference = tr.simulate_transient(
        net,
        power,
        900.0,
        initial_temperature=start,
        limit_node="fin_4",
        limit_temperature=limit,
        **TIGHT,
    )
    assert t_lim == pytest.approx(reference.time_to_limit[0], abs=1e-3)


# --------------------------------------------------------------------------------------
# A network without real, decaying modes: the ODE solver takes over


ONE_WAY_RUN = {"initial_temperature": [[300.0] * 3], "sample_times": np.linspace(0, 2e3, 81)}


def _one_way(conductance):
    """Three nodes tied one way only (not a passive network): K is not symmetric."""
    return tr.ThermalNetwork(("a", "b", "c"), conductance[None], np.array([[0.2, 0.3, 0.4]]),
                             np.array([[50.0, 80.0, 120.0]]), np.array([300.0]))  # fmt: skip


@pytest.mark.crosscheck
def test_non_symmetric_network_with_real_modes_is_still_exact():
    # Cross-check: scipy solve_ivp (BDF, tight): a chain coupled one way (a triangular K,
    # real eigenvalues) is decomposed as it stands.
    net = _one_way(np.array([[0.0, 0.0, 0.0], [0.5, 0.0, 0.0], [0.0, 0.7, 0.0]]))
    exact, reference = _both(net, 30.0, 2000.0, **ONE_WAY_RUN)
    assert np.allclose(exact.temperature, reference.temperature, rtol=0, atol=1e-7)


@pytest.mark.crosscheck
def test_oscillating_modes_fall_back_to_the_ode_solver():
    # A ring coupled one way has complex eigenvalues: no real modal solution; the history is
    # the BDF one, and the solution says so.
    net = _one_way(np.array([[0.0, 0.6, 0.0], [0.0, 0.0, 0.6], [0.6, 0.0, 0.0]]))
    fallback = tr.simulate_transient(net, 30.0, 2000.0, **ONE_WAY_RUN)
    assert fallback.method.startswith("BDF (the network's modes oscillate")
    direct = tr.simulate_transient(net, 30.0, 2000.0, method="BDF", **ONE_WAY_RUN)
    assert np.array_equal(fallback.temperature, direct.temperature)
    # Identity: it still ends on the network's steady state.
    steady = tr.steady_temperatures(net, 30.0)
    long = tr.simulate_transient(net, 30.0, 2e4, **{**ONE_WAY_RUN, "sample_times": [2e4]})
    assert np.allclose(long.final_temperature, steady, atol=1e-5)


# --------------------------------------------------------------------------------------
# Impedance and the Foster fit


def _scipy_foster_cost(response, n):
    """The previous fit: scipy least_squares (trf) on ln R_i, ln tau_i and R_0 >= 0."""
    from scipy.optimize import least_squares

    t, z = response.time, response.impedance[0]
    z_ss = float(response.steady_resistance[0])

    def residual(x):
        r, tau = np.exp(x[:n]), np.exp(x[n : 2 * n])
        return (x[2 * n] + np.sum(r * -np.expm1(-t[:, None] / tau), axis=1) - z) / z_ss

    lo_t, hi_t = np.log(t[0]), np.log(t[-1])
    lower = np.concatenate([np.full(n, -np.inf), np.full(n, lo_t), [0.0]])
    upper = np.concatenate([np.full(n, np.inf), np.full(n, hi_t), [np.inf]])
    best = np.inf
    for frac in (0.0, 0.2, 0.35):
        lo, hi = lo_t + frac * (hi_t - lo_t), hi_t - frac * (hi_t - lo_t)
        taus = np.linspace(lo, hi, n) if n > 1 else np.array([0.5 * (lo + hi)])
        r0 = max(float(z[0]), 0.0)
        x0 = np.concatenate([np.full(n, np.log(max(z_ss - r0, 1e-12 * z_ss) / n)), taus, [r0]])
        fit = least_squares(residual, x0, bounds=(lower, upper), method="trf", xtol=1e-12,
                            ftol=1e-12, gtol=1e-12, max_nfev=2000)  # fmt: skip
        best = min(best, float(np.sum(fit.fun**2)))
    return best


@pytest.mark.crosscheck
@pytest.mark.parametrize(("fin_nodes", "terms"), [(1, 1), (1, 2), (1, 3), (1, 4), (5, 3)])
def test_foster_fit_is_as_good_as_scipys_least_squares(demo, fin_nodes, terms):
    # Cross-check: scipy least_squares from the same three starts; the variable-projection
    # fit reaches the same or a lower sum of squares on the demo's junction step response.
    result, _, network = demo
    response = tr.step_response(network(result.governing.name, fin_nodes))
    ladder = tr.fit_foster(response, terms)
    z_ss = response.steady_resistance[0]
    ours = np.sum(((ladder.impedance(response.time) - response.impedance[0]) / z_ss) ** 2)
    assert ours <= _scipy_foster_cost(response, terms) * (1 + 1e-6) + 1e-24
    assert np.all(ladder.resistance > 0) and ladder.series_resistance >= 0
    assert np.all(np.diff(ladder.time_constant) > 0)
    assert (
        response.time[0] <= ladder.time_constant[0]
        and ladder.time_constant[-1] <= response.time[-1]
    )


@pytest.mark.identity
def test_full_foster_fit_is_the_modal_expansion(demo):
    # Identity: with as many pairs as nodes with capacity the fit is the network's exact
    # Foster ladder (its modal expansion), and the step response is the exact one's.
    result, _, network = demo
    net = network(result.governing.name)
    response = tr.step_response(net)
    exact = tr.foster_from_network(net)[0]
    ladder = tr.fit_foster(response, 4)
    assert np.allclose(ladder.time_constant, exact.time_constant, rtol=1e-7)
    assert np.allclose(ladder.resistance, exact.resistance, rtol=1e-7)
    assert np.allclose(response.impedance[0], exact.impedance(response.time), rtol=1e-12)
    # Cross-check: scipy solve_ivp (BDF, rtol 1e-10) gives the same step response.
    bdf = tr.step_response(net, method="BDF")
    assert np.allclose(bdf.impedance, response.impedance, rtol=1e-8)
