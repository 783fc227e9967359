"""Transient of the heat-sink chain (finkit.physics.transient, finkit.model.transient).

Identities of the lumped model (analytic exponential, steady end state, energy balance, modal
expansion), a published lumped-capacitance example, the fitted RC ladders, the case block.
"""

from __future__ import annotations

import copy
from pathlib import Path

import numpy as np
import pytest
import yaml

from finkit.case import CaseError, load_case
from finkit.errors import InputError
from finkit.model import run_case
from finkit.physics import transient as tr
from finkit.physics.properties.materials import get_material

DEMO = Path(__file__).resolve().parents[1] / "demo_cases"
ZERO_C = 273.15


def single_node(capacity, conductance, inlet=300.0):
    """One node with a heat capacity, tied to the air; the power enters it."""
    return tr.ThermalNetwork(
        ("node",),
        np.zeros((1, 1, 1)),
        np.array([[conductance]]),
        np.array([[capacity]]),
        np.array([inlet]),
    )


def raw(name="nb200-plate-fan.yaml") -> dict:
    data = yaml.safe_load((DEMO / name).read_text(encoding="utf-8"))
    for key in ("tolerances", "monte_carlo", "measurements", "calibration", "transient"):
        data.pop(key, None)
    return data


@pytest.fixture(scope="module")
def plate_fan():
    """The demo fan-cooled case solved at every condition (no transient block)."""
    case = load_case(raw())
    return case, run_case(case)


def network_of(case, row, fin_nodes=1, **capacities):
    material = get_material(case.sink.material)
    i = row.inputs
    return tr.chain_network(
        row.solution,
        i.geometry,
        i.material.thermal_conductivity,
        material.density,
        material.specific_heat,
        fin_node_count=fin_nodes,
        **capacities,
    )


def rows_of(result):
    return {row.name: row for row in result.conditions.rows}


# --------------------------------------------------------------------------------------
# One node: the analytic exponential


@pytest.mark.identity
def test_single_node_step_matches_exponential():
    # Identity: C dT/dt = P - G (T - T_in) from T_in gives T - T_in = P R (1 - exp(-t/RC)).
    c, g, p = 150.0, 0.8, 25.0
    tau, rise = c / g, p / g
    times = np.linspace(0.0, 6.0 * tau, 301)
    sol = tr.simulate_transient(
        single_node(c, g), p, times[-1], initial_temperature=[[300.0]], sample_times=times
    )
    expected = rise * -np.expm1(-times / tau)
    got = sol.temperature[0, 0] - 300.0
    assert np.max(np.abs(got - expected)) / rise < 1e-6


@pytest.mark.identity
def test_single_node_time_to_limit_is_analytic():
    # Identity: the limit T_in + dT_lim is reached at t = -RC ln(1 - dT_lim / (P R)).
    c, g, p, dt_lim = 150.0, 0.8, 25.0, 20.0
    sol = tr.simulate_transient(
        single_node(c, g), p, 2000.0, initial_temperature=[[300.0]], limit_node="node",
        limit_temperature=300.0 + dt_lim,
    )  # fmt: skip
    expected = -(c / g) * np.log(1.0 - dt_lim / (p / g))
    assert sol.time_to_limit[0] == pytest.approx(expected, rel=1e-6)


@pytest.mark.published
def test_incropera_example_5_1_thermocouple():
    # Source: Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer,
    # 6th ed., Example 5.1 (thermocouple junction, lumped capacitance): h = 400 W/m^2 K,
    # k = 20 W/m K, c = 400 J/kg K, rho = 8500 kg/m^3; a sphere with a 1 s time constant has
    # D = 6 h tau / (rho c) = 0.706 mm; from 25 degC in a 200 degC gas it reads 199 degC after
    # t = 5.2 s. Inputs confirmed against a public textbook-companion reproduction of the
    # example (which prints D = 7.06e-4 m, t = 5.16 s); the book's printed 5.2 s is from
    # memory. Tolerance from its 2 significant figures: +-0.05 s (1 %).
    h, c, rho = 400.0, 400.0, 8500.0
    diameter = 6.0 * h * 1.0 / (rho * c)
    assert diameter == pytest.approx(7.06e-4, rel=5e-3)
    area, volume = np.pi * diameter**2, np.pi * diameter**3 / 6.0
    net = single_node(rho * c * volume, h * area, inlet=200.0 + ZERO_C)
    sol = tr.simulate_transient(
        net, 0.0, 10.0, initial_temperature=[[25.0 + ZERO_C]], limit_node="node",
        limit_temperature=199.0 + ZERO_C,
    )  # fmt: skip
    assert sol.time_to_limit[0] == pytest.approx(5.2, abs=0.05)


# --------------------------------------------------------------------------------------
# The chain network: steady start, steady end, energy


@pytest.mark.identity
@pytest.mark.parametrize("fin_nodes", [1, 5])
def test_network_steady_state_is_the_steady_solution(plate_fan, fin_nodes):
    # Identity: the conductances are built so that the network's steady state is the steady
    # chain of finkit.sink (junction, case, base under the source, mean base).
    case, result = plate_fan
    for row in result.conditions.rows:
        net = network_of(case, row, fin_nodes)
        t = tr.steady_temperatures(net, float(row.solution.power))[0]
        s = row.solution
        expected = [s.junction_temperature, s.case_temperature, s.source_base_temperature,
                    s.base_temperature]  # fmt: skip
        assert np.allclose(t[:4], np.ravel(expected), rtol=0, atol=1e-6)


def _with_scenario(name, scenario):
    data = raw(name)
    data["scenarios"] = [scenario]
    case = load_case(data)
    return case, run_case(case)


@pytest.mark.identity
@pytest.mark.parametrize(
    ("name", "scenario", "fin_nodes"),
    [
        ("nb200-plate-fan.yaml", None, 1),
        ("nb200-plate-fan.yaml", None, 6),
        ("nb100-natural.yaml", {"name": "warm", "inlet_temperature_rise": "8 K"}, 1),
        ("nb300-pin-ducted.yaml", {"name": "weak", "heat_transfer_factor": 0.7}, 3),
    ],
)
def test_long_time_limit_is_the_final_condition(plate_fan, name, scenario, fin_nodes):
    # Identity: after the event the network relaxes to the steady solution of the final
    # condition (every node of the chain, to solver tolerance).
    if scenario is None:
        case, result = plate_fan
        first, final = rows_of(result)["hot-day"], rows_of(result)["hot-day-one-fan"]
    else:
        case, result = _with_scenario(name, scenario)
        first, final = result.conditions.rows
    nets = [network_of(case, first, fin_nodes), network_of(case, final, fin_nodes)]
    slowest = max(tr.foster_from_network(n)[0].time_constant.max() for n in nets)
    sol = tr.simulate_transient(
        nets, float(final.solution.power), 40.0 * slowest, switch_times=[60.0],
        initial_temperature=tr.steady_temperatures(nets[0], float(first.solution.power)),
    )  # fmt: skip
    s = final.solution
    expected = np.ravel([s.junction_temperature, s.case_temperature, s.source_base_temperature,
                         s.base_temperature])  # fmt: skip
    assert np.allclose(sol.final_temperature[0, :4], expected, rtol=0, atol=1e-5)


@pytest.mark.identity
def test_energy_balance_over_a_pulse_train(plate_fan):
    # Identity: energy supplied = energy stored in the node capacities + energy convected to
    # the air (integrated alongside the temperatures), over pulses and a change of condition.
    case, result = plate_fan
    rows = rows_of(result)
    nets = [
        network_of(case, rows["hot-day"], 4, junction_heat_capacity=0.5, case_heat_capacity=6.0),
        network_of(case, rows["one-fan-failed"], 4, junction_heat_capacity=0.5,
                   case_heat_capacity=6.0),
    ]  # fmt: skip
    power = tr.pulse_train(90.0, 10.0, 40.0, 0.25, 600.0, start=5.0)
    sol = tr.simulate_transient(nets, power, 600.0, switch_times=[130.0])
    supplied = sol.supplied_energy[0]
    assert supplied == pytest.approx(10.0 * 600.0 + 80.0 * 10.0 * 15, rel=1e-12)
    assert sol.stored_energy[0] + sol.convected_energy[0] == pytest.approx(supplied, rel=1e-6)
    assert sol.stored_energy[0] > 0


@pytest.mark.shape
def test_designs_solve_together_as_separately(plate_fan):
    # Identity: two designs in one block-diagonal solve equal two single solves.
    case, result = plate_fan
    rows = rows_of(result)
    a, b = network_of(case, rows["nominal"]), network_of(case, rows["hot-day"])
    both = tr.ThermalNetwork(
        a.node_names,
        np.concatenate([a.conductance, b.conductance]),
        np.concatenate([a.air_conductance, b.air_conductance]),
        np.concatenate([a.heat_capacity, b.heat_capacity]),
        np.concatenate([a.inlet_temperature, b.inlet_temperature]),
    )
    times = np.linspace(0, 900, 31)
    together = tr.simulate_transient(both, 60.0, 900.0, sample_times=times)
    for k, net in enumerate((a, b)):
        alone = tr.simulate_transient(
            net, 60.0, 900.0, sample_times=times,
            initial_temperature=tr.steady_temperatures(net, 60.0),
        )  # fmt: skip
        assert np.allclose(together.temperature[k], alone.temperature[0], atol=1e-5)


@pytest.mark.identity
def test_lumping_numbers_flag_short_times(plate_fan):
    # Identity: the fin Fourier number alpha t / H^2 scales with t; a short pulse on a
    # 30 mm aluminium fin (H^2/alpha about 10 s) is flagged, a 2-minute response is not.
    case, result = plate_fan
    row = result.nominal
    m = get_material(case.sink.material)
    args = (row.solution, row.inputs.geometry, m.thermal_conductivity, m.density, m.specific_heat)
    short, long = tr.lumping_numbers(*args, 1.0), tr.lumping_numbers(*args, 120.0)
    alpha = m.thermal_conductivity / (m.density * m.specific_heat)
    assert float(long.fin_fourier_number) == pytest.approx(alpha * 120.0 / 0.03**2, rel=1e-12)
    assert bool(short.is_fin_lumping_poor) and not bool(long.is_fin_lumping_poor)
    # Identity: (mH)^2 recovered from eta_f = tanh(mH)/(mH).
    x = np.sqrt(float(long.fin_biot_number))
    assert np.tanh(x) / x == pytest.approx(float(row.solution.fin_efficiency), rel=1e-9)


# --------------------------------------------------------------------------------------
# Thermal impedance and ladders


@pytest.mark.identity
def test_modal_foster_is_the_step_response(plate_fan):
    # Identity: the modal expansion of the linear network is its step response.
    case, result = plate_fan
    net = network_of(case, result.governing, 5, junction_heat_capacity=0.3)
    response = tr.step_response(net)
    exact = tr.foster_from_network(net)[0]
    z = exact.impedance(response.time)
    assert np.max(np.abs(z - response.impedance[0])) / response.steady_resistance[0] < 1e-7
    assert exact.steady_resistance == pytest.approx(response.steady_resistance[0], rel=1e-9)


@pytest.mark.identity
@pytest.mark.parametrize(("fin_nodes", "terms"), [(1, 2), (5, 4), (5, 3)])
def test_fitted_foster_reproduces_the_step_response(plate_fan, fin_nodes, terms):
    # Identity (stated tolerance): the fitted ladder is within 1 % of the steady resistance of
    # the step response at every fitted time, and ends on the steady resistance within 1 %.
    case, result = plate_fan
    net = network_of(case, result.governing, fin_nodes)
    response = tr.step_response(net)
    ladder = tr.fit_foster(response, terms)
    z_ss = response.steady_resistance[0]
    assert np.all(ladder.resistance > 0) and np.all(ladder.time_constant > 0)
    assert ladder.series_resistance >= 0
    assert ladder.max_error < 0.01
    assert np.max(np.abs(ladder.impedance(response.time) - response.impedance[0])) < 0.01 * z_ss
    assert ladder.steady_resistance == pytest.approx(z_ss, rel=0.01)


@pytest.mark.identity
def test_cauer_ladder_has_the_foster_impedance():
    # Identity: the Cauer ladder of a Foster ladder has the same step response (simulated as a
    # network of its own) and the same input impedance.
    foster = tr.FosterLadder(np.array([0.1, 0.3, 0.5]), np.array([1.0, 20.0, 300.0]), 0.05)
    cauer = tr.cauer_from_foster(foster)
    assert cauer is not None
    assert np.all(cauer.resistance > 0) and np.all(cauer.capacitance > 0)
    net = cauer.network(300.0)
    response = tr.step_response(net, node=net.node_names[0])
    assert np.max(np.abs(response.impedance[0] - foster.impedance(response.time))) < 1e-7
    # Identity: a single pair is its own Cauer ladder (C = tau / R).
    one = tr.cauer_from_foster(tr.FosterLadder(np.array([2.0]), np.array([10.0])))
    assert one.resistance[0] == pytest.approx(2.0) and one.capacitance[0] == pytest.approx(5.0)


@pytest.mark.identity
def test_cauer_of_the_chain_recovers_the_base_plate(plate_fan):
    # Identity: for the default chain (device without capacity) the first Cauer stage holds
    # the base plate's own capacity, rho c W L t_b, behind the device-to-base resistance.
    case, result = plate_fan
    net = network_of(case, result.governing)
    foster = tr.foster_from_network(net)[0]
    cauer = tr.cauer_from_foster(foster)
    assert cauer.capacitance[0] == pytest.approx(net.heat_capacity[0, 3], rel=1e-6)
    s = result.governing.solution
    r_device = float(s.junction_to_case_resistance + s.interface_resistance
                     + s.spreading_resistance + s.base_conduction_resistance)  # fmt: skip
    assert cauer.series_resistance == pytest.approx(r_device, rel=1e-6)


# --------------------------------------------------------------------------------------
# Power profiles


@pytest.mark.identity
def test_power_profiles():
    p = tr.pulse_train(80.0, 20.0, 60.0, 0.25, 200.0)
    assert list(p.time) == [0.0, 15.0, 60.0, 75.0, 120.0, 135.0, 180.0, 195.0]
    assert p.at(10.0) == 80.0 and p.at(15.0) == 20.0 and p.at(500.0) == 20.0
    # Identity: energy of a pulse train = high * on-time + low * off-time.
    assert p.energy(0.0, 200.0) == pytest.approx(80.0 * 60 + 20.0 * 140)
    table = tr.PowerProfile(np.array([0.0, 10.0]), np.array([0.0, 100.0]), "linear")
    assert table.at(5.0) == 50.0 and table.energy(0.0, 20.0) == pytest.approx(500 + 1000)
    with pytest.raises(InputError, match="start at 0 s"):
        tr.PowerProfile(np.array([1.0, 2.0]), np.array([1.0, 2.0]))


@pytest.mark.identity
def test_linear_ramp_matches_analytic():
    # Identity: a single node under P = a t from rest: theta = a R (t - tau (1 - exp(-t/tau))).
    c, g, a = 100.0, 0.5, 0.2
    tau = c / g
    ramp = tr.PowerProfile(np.array([0.0, 1000.0]), np.array([0.0, a * 1000.0]), "linear")
    times = np.linspace(0.0, 1000.0, 51)
    sol = tr.simulate_transient(single_node(c, g), ramp, 1000.0,
                                initial_temperature=[[300.0]], sample_times=times)  # fmt: skip
    expected = a / g * (times - tau * -np.expm1(-times / tau))
    assert np.max(np.abs(sol.temperature[0, 0] - 300.0 - expected)) < 1e-6 * expected[-1]


# --------------------------------------------------------------------------------------
# The case block


def with_transient(block, name="nb200-plate-fan.yaml"):
    data = raw(name)
    data["transient"] = block
    return data


BLOCK = {
    "start_condition": "hot-day",
    "event": {"at": "60 s", "condition": "hot-day-one-fan"},
    "duration": "1 h",
    "required_response_time": "120 s",
}


def test_case_transient_result_and_json_units():
    result = run_case(load_case(with_transient(BLOCK)))
    t = result.transient
    rows = rows_of(result)
    # Identity: the history starts on the start condition's steady state and the peak of a
    # fan failure at constant power is the final condition's steady state.
    assert t.solution.temperature[0, 0, 0] == pytest.approx(
        float(rows["hot-day"].solution.junction_temperature), abs=1e-6
    )
    assert t.solution.peak_temperature[0, 0] == pytest.approx(
        float(rows["hot-day-one-fan"].solution.junction_temperature), abs=1e-3
    )
    assert t.status == "pass" and not t.is_limit_reached
    assert t.check_line().startswith("time to limit after hot-day-one-fan at 60 s: not reached")
    payload = result.to_json_dict()["transient"]

    def numbers_have_units(node):
        if isinstance(node, dict):
            if "value" in node or "values" in node:
                assert isinstance(node.get("unit"), str), node
                return
            for v in node.values():
                numbers_have_units(v)
        elif isinstance(node, list):
            for v in node:
                numbers_have_units(v)
        else:
            assert not isinstance(node, float), "a bare number in the transient entry"

    numbers_have_units(payload)
    assert payload["impedance"]["condition"] == result.governing.name


def test_case_transient_reaches_the_limit_and_fails():
    # A lower limit and a power pulse: the limit is reached after the event, too soon.
    steps = [{"at": "0 s", "power": "40 W"}, {"at": "60 s", "power": "46 W"}]
    data = with_transient({**BLOCK, "power": {"steps": steps}})
    data["limit"]["temperature"] = "100 degC"
    data["limit"]["required_margin"] = "0 K"
    result = run_case(load_case(data))
    t = result.transient
    assert t.is_limit_reached and 0 < t.time_to_limit < 120.0
    assert t.status == "fail"
    assert any(w.startswith("transient: the junction reaches its limit") for w in result.warnings)
    assert "(required response 120 s): fail" in t.check_line()


def test_material_without_specific_heat_is_refused():
    data = with_transient(BLOCK)
    data["materials"] = {
        "my-alloy": {
            "thermal_conductivity": "180 W/m/K",
            "density": "2700 kg/m^3",
            "emissivity": {"anodised-black": 0.85},
            "source": "supplier",
        }
    }
    data["sink"]["material"] = "my-alloy"
    with pytest.raises(InputError, match="has no specific_heat"):
        run_case(load_case(data))


@pytest.mark.parametrize(
    ("change", "message"),
    [
        ({"event": {"at": "60 s", "condition": "fan-out"}},
         "transient.event.condition: no condition named 'fan-out' (allowed: nominal, hot-day"),
        ({"duration": "100 s"},
         "transient.duration: must cover the required response time after the event: at "
         "least 180 s (got 100 s)"),
        ({"duration": "3 W"}, "transient.duration: expected a time, got '3 W'"),
        ({"power": {"pulses": {"high": "80 W", "period": "60 s", "duty_cycle": 1.5}}},
         "transient.power.pulses.duty_cycle: must be at most 1 (got 1.5)"),
        ({"power": {"steps": [{"at": "10 s", "power": "40 W"}]}},
         "transient.power.steps: the first step must be at 0 s (got 10 s)"),
        ({"power": {}}, "transient.power: give exactly one of steps, pulses, table (got none)"),
        ({"fin_nodes": 50}, "transient.fin_nodes: must be at most 20 (got 50)"),
        ({"event": {"at": "2 h", "condition": "one-fan-failed"}, "required_response_time": None},
         "transient.event.at: must be before the end of the run"),
    ],
)  # fmt: skip
def test_block_errors_are_one_line_naming_the_field(change, message):
    block = {**BLOCK, **change}
    block = {k: v for k, v in block.items() if v is not None}
    with pytest.raises(CaseError) as info:
        load_case(with_transient(block))
    assert any(line.startswith(message) for line in info.value.errors), info.value.errors


def test_case_without_block_has_no_transient():
    data = copy.deepcopy(raw())
    assert run_case(load_case(data)).transient is None
