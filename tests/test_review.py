"""Tests of finkit.model.review (scenarios, touch, calibration, correlation spread, input flags) and
finkit.case.review_blocks (the case-file blocks).

Most checks are identities: a scenario re-solved inside a case must equal the same conditions
written as a case of their own; a deposit layer must equal thicker fins for the flow; a
one-parameter least-squares fit must recover a multiplier that generated its data, with the
textbook standard error. The demo cases serve only as realistic geometries here.
"""

from __future__ import annotations

import copy
import types
from dataclasses import asdict, replace
from pathlib import Path

import numpy as np
import pytest
import yaml
from hypothesis import given, settings
from hypothesis import strategies as st

from finkit.case import load_case
from finkit.case.review_blocks import ReviewBlockError, load_review_blocks
from finkit.errors import InputError
from finkit.model import allowable, run_case, sink_inputs, solve
from finkit.model.review import (
    JUNCTION_TO_CASE_FLAG,
    FilterLoss,
    Measurement,
    Scenario,
    apply_calibration,
    apply_scenario,
    calibrate,
    correlation_spread,
    measurements_from_blocks,
    run_scenarios,
    sanity_flags,
    scenarios_from_blocks,
    touch_temperature_check,
)
from finkit.physics.airflow import power_law_pressure_drop
from finkit.physics.correlations import natural
from finkit.physics.properties.air import air_properties
from finkit.physics.sink import GivenVolumeFlow, ModelOptions, sink_pressure_drop

DEMO = Path(__file__).resolve().parents[1] / "demo_cases"
C0 = 273.15


def raw(name: str) -> dict:
    return yaml.safe_load((DEMO / f"{name}.yaml").read_text(encoding="utf-8"))


def inputs_of(data: dict):
    case = load_case(data)
    return case, sink_inputs(case)


@pytest.fixture(scope="module")
def fan_case():
    return inputs_of(raw("nb200-plate-fan"))


@pytest.fixture(scope="module")
def natural_case():
    return inputs_of(raw("nb100-natural"))


@pytest.fixture(scope="module")
def pin_case():
    return inputs_of(raw("nb300-pin-ducted"))


def assert_same_state(row, inputs, rtol=1e-9):
    """A scenario row equals a solve of ``inputs`` written by hand."""
    sol = solve(inputs)
    np.testing.assert_allclose(row.node_temperature, sol.node_temperature(inputs.limit_node), rtol)
    np.testing.assert_allclose(row.junction_temperature, sol.junction_temperature, rtol)
    np.testing.assert_allclose(row.fin_tip_temperature, sol.fin_tip_temperature, rtol)
    np.testing.assert_allclose(row.sink_resistance, sol.sink_resistance, rtol)
    if np.isfinite(row.volume_flow):
        np.testing.assert_allclose(row.volume_flow, sol.volume_flow, rtol)
        np.testing.assert_allclose(row.sink_volume_flow, sol.sink_volume_flow, rtol)
        np.testing.assert_allclose(row.pressure_drop, sol.pressure_drop, rtol)
    np.testing.assert_allclose(row.allowable_power, allowable(inputs).power, rtol)


# --------------------------------------------------------------------------------------
# Scenarios
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_scenarios_equal_each_scenario_run_as_its_own_case(fan_case):
    # Identity: a scenario is the same physics as a case file with those conditions written in.
    case, inputs = fan_case
    base = raw("nb200-plate-fan")
    scenarios = [
        Scenario("hot", inlet_temperature=60.0 + C0),
        Scenario("high", altitude=2000.0),
        Scenario("more-power", power=52.0),
        Scenario("slow-fan", fan_speed_ratio=0.8),
    ]
    table = run_scenarios(inputs, scenarios, case.air.flow.fan)

    own = {name: copy.deepcopy(base) for name in ("hot", "high", "more-power", "slow-fan")}
    own["hot"]["air"]["inlet_temperature"] = "60 degC"
    own["high"]["air"]["altitude"] = "2000 m"
    own["more-power"]["source"]["power"] = "52 W"
    fan = own["slow-fan"]["air"]["flow"]["fan"]
    # Fan laws at constant density: Q ∝ N, dp ∝ N² (Common practice, no source).
    fan["volume_flow"] = [f"{float(q.split()[0]) * 0.8} CFM" for q in fan["volume_flow"]]
    fan["pressure"] = [f"{float(p.split()[0]) * 0.64} inH2O" for p in fan["pressure"]]

    for name, data in own.items():
        assert_same_state(table.row(name), inputs_of(data)[1])
    assert_same_state(table.row("nominal"), inputs)


@pytest.mark.identity
def test_natural_and_pin_scenarios_equal_own_cases(natural_case, pin_case):
    # Identity, as above, for natural convection (radiation surroundings move with the inlet air
    # when the scenario does not state them) and for a ducted pin-fin sink.
    _, nat_inputs = natural_case
    data = raw("nb100-natural")
    data["air"]["inlet_temperature"] = "55 degC"
    data["air"]["surroundings_temperature"] = "55 degC"
    row = run_scenarios(nat_inputs, [Scenario("hot", inlet_temperature=55.0 + C0)]).row("hot")
    assert_same_state(row, inputs_of(data)[1])

    _, pin_inputs = pin_case
    data = raw("nb300-pin-ducted")
    data["air"]["altitude"] = "0 m"
    data["source"]["power"] = "70 W"
    row = run_scenarios(pin_inputs, [Scenario("sea", altitude=0.0, power=70.0)]).row("sea")
    assert_same_state(row, inputs_of(data)[1])


@pytest.mark.identity
def test_failed_fan_with_sealed_stopped_fan_equals_the_running_fans_alone():
    # Identity: 2 fans in parallel with one stopped and sealed = a case with one fan.
    data = raw("nb200-plate-fan")
    data["air"]["flow"]["fan"]["count"] = 2
    case, inputs = inputs_of(data)
    table = run_scenarios(inputs, [Scenario("one-down", failed_fans=1)], case.air.flow.fan)
    single = raw("nb200-plate-fan")
    single["air"]["flow"]["fan"]["count"] = 1
    del single["scenarios"]  # its failed-fan scenario needs two fans
    single.pop("transient", None)  # its event names a scenario
    assert_same_state(table.row("one-down"), inputs_of(single)[1])


@pytest.mark.shape
def test_failed_fan_gives_less_flow_and_higher_temperature():
    # Physical direction: fewer running fans, and air leaking back through the stopped one,
    # move less air through the sink and run it hotter.
    data = raw("nb200-plate-fan")
    data["air"]["flow"]["fan"]["count"] = 3
    case, inputs = inputs_of(data)
    leak = 25.0 / 0.004**2  # 25 Pa drives 4 l/s back through a stopped fan [Pa s² m⁻⁶]
    table = run_scenarios(
        inputs,
        [
            Scenario("one-down", failed_fans=1),
            Scenario("one-down-leaking", failed_fans=1, stopped_fan_resistance=leak),
        ],
        case.air.flow.fan,
    )
    nominal, down, leaking = (table.row(n) for n in ("nominal", "one-down", "one-down-leaking"))
    assert nominal.volume_flow > down.volume_flow > leaking.volume_flow
    assert nominal.junction_temperature < down.junction_temperature < leaking.junction_temperature
    assert nominal.allowable_power > down.allowable_power > leaking.allowable_power
    with pytest.raises(InputError, match=r"scenarios\[too-many\]\.failed_fans"):
        apply_scenario(inputs, Scenario("too-many", failed_fans=3), case.air.flow.fan)
    with pytest.raises(InputError, match=r"scenarios\[x\]\.failed_fans: needs"):
        apply_scenario(inputs, Scenario("x", failed_fans=1))


@pytest.mark.identity
def test_filter_and_dust_scenarios_equal_hand_built_inputs(fan_case):
    # Identity: the scenario fields map onto the model options a user could set by hand.
    case, inputs = fan_case
    q_ref, dp_ref = 0.01, 20.0
    deposit, k_dep = 0.15e-3, 0.08  # 0.15 mm of dust with k = 0.08 W/m/K (invented)
    dusty = Scenario(
        "dusty",
        filter=FilterLoss(q_ref, dp_ref),
        deposit_thickness=deposit,
        deposit_conductivity=k_dep,
        pressure_drop_factor=1.2,
        heat_transfer_factor=0.9,
        fouling_resistance=1e-4,
    )
    row = run_scenarios(inputs, [dusty], case.air.flow.fan).row("dusty")
    by_hand = replace(
        inputs,
        options=ModelOptions(
            extra_pressure_drop=lambda q: power_law_pressure_drop(q, q_ref, dp_ref),
            deposit_thickness=deposit,
            fouling_resistance=1e-4 + deposit / k_dep,
            pressure_drop_factor=1.2,
            heat_transfer_factor=0.9,
        ),
    )
    assert_same_state(row, by_hand)
    clean = run_scenarios(inputs, []).row("nominal")
    assert row.volume_flow < clean.volume_flow
    assert row.junction_temperature > clean.junction_temperature


@pytest.mark.identity
def test_deposit_layer_is_thicker_fins_for_the_flow(fan_case, pin_case):
    # Identity: a layer delta on each face leaves the flow the passages of fins 2 delta thicker
    # (pins 2 delta larger), so the pressure drop equals that of the thicker clean metal.
    rho, mu = 1.1, 1.9e-5
    for (_, inputs), field, q in (
        (fan_case, "fin_thickness", 0.006),
        (pin_case, "pin_diameter", 0.007),
    ):
        g = inputs.geometry
        delta = 0.2e-3
        thick = replace(g, **{field: getattr(g, field) + 2 * delta})
        fouled = sink_pressure_drop(g, q, rho, mu, options=ModelOptions(deposit_thickness=delta))
        np.testing.assert_allclose(fouled, sink_pressure_drop(thick, q, rho, mu), rtol=1e-12)
        assert fouled > sink_pressure_drop(g, q, rho, mu)


@pytest.mark.identity
def test_zero_fouling_reproduces_the_clean_result_exactly(fan_case, natural_case, pin_case):
    # Identity: a scenario that states zero fouling, zero deposit and unit factors is the case.
    none = Scenario(
        "clean",
        fouling_resistance=0.0,
        deposit_thickness=0.0,
        deposit_conductivity=1.0,
        heat_transfer_factor=1.0,
    )
    for case, inputs in (fan_case, natural_case, pin_case):
        extra = {} if case.air.flow.natural else {"pressure_drop_factor": 1.0}
        table = run_scenarios(inputs, [replace(none, **extra)], case.air.flow.fan)
        a, b = table.row("nominal"), table.row("clean")
        for name in ("junction_temperature", "fin_tip_temperature", "allowable_power"):
            assert getattr(a, name) == getattr(b, name)
        assert a.pressure_drop == b.pressure_drop or np.isnan(a.pressure_drop)


@pytest.mark.identity
def test_governing_scenario_is_the_least_margin_one(fan_case):
    case, inputs = fan_case
    scenarios = [
        Scenario("cool", inlet_temperature=35.0 + C0),
        Scenario("hot", inlet_temperature=58.0 + C0),
        Scenario("high", altitude=3000.0),
    ]
    table = run_scenarios(inputs, scenarios, case.air.flow.fan)
    margins = [r.margin for r in table.rows]
    assert sum(r.is_governing for r in table.rows) == 1
    assert table.governing == table.rows[int(np.argmin(margins))].name == "hot"
    assert table.status == table.governing_row.status
    for r in table.rows:
        np.testing.assert_allclose(r.margin, r.limit_temperature - r.node_temperature)
        assert r.status == ("pass" if r.margin >= r.required_margin else "fail")


@pytest.mark.identity
@settings(max_examples=25, deadline=None)
@given(st.lists(st.floats(20.0, 70.0), min_size=1, max_size=4))
def test_governing_is_argmin_for_any_scenario_set(inlets):
    # Identity: whatever the scenarios, the marked row is the one with the least margin.
    _, inputs = _PIN
    scenarios = [
        Scenario(f"s{k}", inlet_temperature=t + C0, power=40.0 + 5 * k)
        for k, t in enumerate(inlets)
    ]
    table = run_scenarios(inputs, scenarios)
    margins = np.array([r.margin for r in table.rows])
    assert table.governing_row.margin == margins.min()
    assert [r.is_governing for r in table.rows].count(True) == 1


_PIN = inputs_of(raw("nb300-pin-ducted"))


def test_scenario_errors_name_the_field(natural_case, pin_case):
    _, nat = natural_case
    with pytest.raises(InputError, match=r"^scenarios\[f\]\.fan_speed_ratio: applies to a fan"):
        apply_scenario(nat, Scenario("f", fan_speed_ratio=0.9))
    with pytest.raises(InputError, match=r"^scenarios\[p\]\.pressure_drop_factor"):
        apply_scenario(nat, Scenario("p", pressure_drop_factor=1.5))
    with pytest.raises(InputError, match=r"^scenarios\[d\]\.deposit_thickness: .* closes"):
        apply_scenario(nat, Scenario("d", deposit_thickness=5e-3))
    with pytest.raises(InputError, match=r"^scenarios\[d\]\.deposit_thickness: .* pins"):
        apply_scenario(pin_case[1], Scenario("d", deposit_thickness=2.5e-3))
    with pytest.raises(InputError, match="names must be unique"):
        run_scenarios(nat, [Scenario("a", power=1.0), Scenario("a", power=2.0)])


# --------------------------------------------------------------------------------------
# Touch temperature
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_touch_check_is_judged_at_the_reference_not_at_the_case_inlet(fan_case, natural_case):
    # Identity: the check re-solves with air (and radiation surroundings) at the reference
    # ambient; the case's own inlet temperature must not matter.
    for _, inputs in (fan_case, natural_case):
        ref = 25.0 + C0
        a = touch_temperature_check(inputs, 80.0 + C0, ref, "example only")
        warmer = replace(
            inputs,
            air=replace(
                inputs.air, inlet_temperature=ref + 30.0, surroundings_temperature=ref + 30.0
            ),
        )
        b = touch_temperature_check(warmer, 80.0 + C0, ref, "example only")
        assert a.hottest_temperature == b.hottest_temperature
        sol = solve(
            inputs, air=replace(inputs.air, inlet_temperature=ref, surroundings_temperature=ref)
        )
        assert a.surface_temperatures["base"] == float(sol.source_base_centre_temperature)
        assert a.surface_temperatures["fin_tips"] == float(sol.fin_tip_temperature)
        assert a.hottest_temperature == max(a.surface_temperatures.values())


def test_touch_pass_fail_and_surfaces(fan_case):
    _, inputs = fan_case
    ref = 25.0 + C0
    probe = touch_temperature_check(inputs, 90.0 + C0, ref, "example only")
    hot = probe.hottest_temperature
    assert touch_temperature_check(inputs, hot + 0.1, ref, "x").status == "pass"
    assert touch_temperature_check(inputs, hot - 0.1, ref, "x").status == "fail"
    tips = touch_temperature_check(inputs, hot + 0.1, ref, "x", surfaces=["fin_tips"])
    assert tips.hottest_surface == "fin_tips"
    assert tips.hottest_temperature <= hot
    preheated = touch_temperature_check(inputs, hot + 0.1, ref, "x", inlet_preheat=5.0)
    assert preheated.hottest_temperature > hot
    assert "no table of touch limits" in probe.statement
    with pytest.raises(InputError, match=r"^touch\.surfaces"):
        touch_temperature_check(inputs, hot, ref, "x", surfaces=["handle"])
    with pytest.raises(InputError, match=r"^touch\.limit_temperature"):
        touch_temperature_check(inputs, ref - 1.0, ref, "x")


# --------------------------------------------------------------------------------------
# Calibration
# --------------------------------------------------------------------------------------

POINTS = [  # (volume flow m³/s, power W, inlet K, node): an invented test plan
    (0.004, 30.0, 295.0, "base"),
    (0.006, 45.0, 298.0, "junction"),
    (0.008, 40.0, 300.0, "base"),
    (0.005, 35.0, 296.0, "fin_tip"),
    (0.007, 50.0, 299.0, "case"),
    (0.009, 55.0, 297.0, "base"),
]


def synthetic(inputs, factor_name, true_value, noise, seed):
    """Measurements generated by the model with a known multiplier, plus Gaussian noise."""
    rng = np.random.default_rng(seed)
    generator = replace(inputs, options=replace(inputs.options, **{factor_name: true_value}))
    out = []
    for k, (q, p, t_in, node) in enumerate(POINTS):
        sol = solve(
            generator,
            flow=GivenVolumeFlow(q),
            source=replace(inputs.source, power=p),
            air=replace(inputs.air, inlet_temperature=t_in, surroundings_temperature=t_in),
        )
        t = {
            "junction": sol.junction_temperature,
            "case": sol.case_temperature,
            "base": sol.source_base_centre_temperature,
            "fin_tip": sol.fin_tip_temperature,
        }[node]
        out.append(
            Measurement(f"p{k}", node, float(t) + rng.normal(0.0, noise), p, t_in, volume_flow=q)
        )
    return out


@pytest.mark.identity
def test_calibration_recovers_a_known_multiplier_without_noise(fan_case):
    # Identity: data made with multiplier 0.8 and no noise is fitted exactly, residuals ~0.
    _, inputs = fan_case
    cal = calibrate(inputs, synthetic(inputs, "heat_transfer_factor", 0.8, 0.0, 0))
    np.testing.assert_allclose(cal.multiplier, 0.8, rtol=1e-6)
    assert np.max(np.abs(cal.residuals)) < 1e-5


@pytest.mark.identity
@pytest.mark.parametrize("seed", [1, 2, 3])
def test_calibration_recovers_a_known_multiplier_within_its_standard_error(fan_case, seed):
    # Statistics: an unbiased fit lands within 3 standard errors of the truth (99.7 % for a
    # normal estimate); the standard error is of the size sigma / sqrt(sum J²).
    _, inputs = fan_case
    for target, factor, true in (
        ("heat_transfer", "heat_transfer_factor", 0.8),
        ("sink_resistance", "sink_resistance_factor", 1.25),
    ):
        data = synthetic(inputs, factor, true, 0.3, seed)
        cal = calibrate(inputs, data, target=target)
        assert abs(cal.multiplier - true) < 3.0 * cal.standard_error
        assert 0.0 < cal.standard_error < 0.05
        assert cal.degrees_of_freedom == len(POINTS) - 1
        np.testing.assert_allclose(cal.residuals, cal.predicted - cal.measured)
        assert "empirical" in cal.statement


@pytest.mark.published
def test_calibration_matches_regression_through_the_origin(fan_case):
    # A model linear in the multiplier: with h given by hand and an inlet-referenced channel model
    # (no film-temperature feedback), the fin-tip rise is T_tip - T_in = c * P R_sink0 / cosh(mL).
    # Then least squares is regression through the origin: c = Σxy/Σx²,
    # se = sqrt(Σ(y - c x)² / (n - 1) / Σx²).
    # From memory: N. R. Draper, H. Smith, Applied Regression Analysis, 3rd ed., Wiley, 1998,
    # regression through the origin (one parameter).
    _, inputs = fan_case
    linear = replace(
        inputs,
        flow=GivenVolumeFlow(0.006),
        bypass=None,
        options=ModelOptions(heat_transfer_coefficient_override=45.0),
    )
    rng = np.random.default_rng(7)
    power = np.array([20.0, 30.0, 40.0, 50.0, 60.0])
    inlet = np.array([295.0, 300.0, 297.0, 305.0, 299.0])
    unit = solve(
        linear,
        source=replace(linear.source, power=power),
        air=replace(linear.air, inlet_temperature=inlet, surroundings_temperature=inlet),
    )
    x = unit.fin_tip_temperature - inlet
    y = 1.15 * x + rng.normal(0.0, 0.4, x.size)
    data = [
        Measurement(f"m{k}", "fin_tip", float(inlet[k] + y[k]), float(power[k]), float(inlet[k]))
        for k in range(x.size)
    ]
    cal = calibrate(linear, data, target="sink_resistance")
    c = np.sum(x * y) / np.sum(x * x)
    se = np.sqrt(np.sum((y - c * x) ** 2) / (x.size - 1) / np.sum(x * x))
    np.testing.assert_allclose(cal.multiplier, c, rtol=1e-6)
    np.testing.assert_allclose(cal.standard_error, se, rtol=1e-3)


@pytest.mark.identity
def test_apply_calibration_reproduces_the_fitted_predictions(natural_case):
    # Identity: the calibrated inputs give the predictions the fit reported (natural convection,
    # sink-resistance target), and the calibrated sink resistance is the multiplier times the
    # uncalibrated one at the same base temperature.
    _, inputs = natural_case
    data = [
        Measurement("a", "base", 70.0 + C0, 12.0, 25.0 + C0),
        Measurement("b", "junction", 95.0 + C0, 18.0, 30.0 + C0),
        Measurement("c", "base", 80.0 + C0, 15.0, 28.0 + C0),
    ]
    cal = calibrate(inputs, data, target="sink_resistance")
    calibrated = apply_calibration(inputs, cal)
    for k, m in enumerate(data):
        sol = solve(
            calibrated,
            source=replace(inputs.source, power=m.power),
            air=replace(
                inputs.air,
                inlet_temperature=m.inlet_temperature,
                surroundings_temperature=m.inlet_temperature,
            ),
        )
        np.testing.assert_allclose(sol.node_temperature(m.node), cal.predicted[k], rtol=1e-9)
    assert calibrated.options.sink_resistance_factor == cal.multiplier
    assert np.isfinite(cal.standard_error)
    with pytest.raises(InputError, match=r"^calibration\.target"):
        calibrate(inputs, data, target="fins")


# --------------------------------------------------------------------------------------
# Correlation spread
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_correlation_spread_plate_fin_forced(fan_case):
    _, inputs = fan_case
    spread = correlation_spread(inputs)
    assert len(spread.rows) == 6  # lower/teertstra/vdi x kays_london/culham_muzychka
    chosen = spread.chosen
    assert chosen is spread.rows[0]
    sol = solve(inputs)
    assert chosen.junction_temperature == float(sol.junction_temperature)
    for q, value in spread.spread.items():
        values = [getattr(r, q) for r in spread.rows]
        np.testing.assert_allclose(value, max(values) - min(values))
    # The loss model changes only the pressure drop side; with a fan the flow moves with it.
    by_loss = {
        r.methods["loss_model"]: r
        for r in spread.rows
        if r.methods["plate_channel_method"] == "teertstra"
    }
    assert by_loss["kays_london"].pressure_drop != by_loss["culham_muzychka"].pressure_drop
    assert by_loss["kays_london"].volume_flow != by_loss["culham_muzychka"].volume_flow


@pytest.mark.identity
@pytest.mark.parametrize("stem", ["nb200-plate-fan", "nb100-natural", "nb400-board-sources"])
def test_correlation_spread_takes_the_chosen_rows_known_states(stem):
    # Identity: a caller that has solve(inputs) and allowable(inputs) already (the governing
    # row of the scenario table) hands them over; the spread is the same to the last digit.
    inputs = run_case(load_case(raw(stem))).conditions.governing_row.inputs
    fresh = correlation_spread(inputs)
    handed = correlation_spread(inputs, stated=solve(inputs), at_margin=allowable(inputs))
    # (NaN pressure drop and flow in still air compare equal here)
    np.testing.assert_equal([asdict(r) for r in handed.rows], [asdict(r) for r in fresh.rows])
    np.testing.assert_equal(handed.spread, fresh.spread)


@pytest.mark.identity
def test_correlation_spread_pin_fin_shows_both_correlations(pin_case):
    # Issue 12: pin fins get a model-form spread (Zukauskas, Gnielinski and their lower
    # envelope, the default); the chosen row is the envelope and is the hotter of the two.
    _, inputs = pin_case
    spread = correlation_spread(inputs)
    assert spread.axes == {"pin_bank_method": ("lower", "zukauskas", "gnielinski")}
    rows = {r.methods["pin_bank_method"]: r for r in spread.rows}
    assert spread.chosen is rows["lower"]
    assert rows["zukauskas"].sink_resistance != rows["gnielinski"].sink_resistance
    assert rows["lower"].sink_resistance == pytest.approx(
        max(rows["zukauskas"].sink_resistance, rows["gnielinski"].sink_resistance), rel=1e-6
    )
    assert spread.spread["junction_temperature"] > 0.0
    assert "Model-form spread over 3 combinations" in spread.statement


@pytest.mark.published
def test_natural_channel_elenbaas_option(natural_case):
    # The Elenbaas option uses Nu_S = El/24 [1 - exp(-35/El)]^(3/4) on the channel faces.
    # From memory: W. Elenbaas, Physica 9 (1942) 1-28, as quoted by Bar-Cohen & Rohsenow,
    # J. Heat Transfer 106 (1984) 116-123.
    _, inputs = natural_case
    el_inputs = replace(inputs, options=ModelOptions(natural_channel_method="elenbaas"))
    sol = solve(el_inputs)
    g = inputs.geometry
    t_in = float(sol.inlet_air_temperature)
    surface = float(sol.base_temperature)
    film = air_properties(0.5 * (t_in + surface), inputs.air.pressure)
    nat = natural.plate_fin_array_natural(
        g.fin_spacing,
        g.fin_height,
        g.base_length,
        g.fin_thickness,
        g.fin_count,
        g.base_width,
        surface,
        t_in,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
    )
    El = float(nat.elenbaas)
    expected = (
        El / 24.0 * (1.0 - np.exp(-35.0 / El)) ** 0.75 * film.thermal_conductivity / g.fin_spacing
    )
    np.testing.assert_allclose(sol.heat_transfer_coefficient, expected, rtol=1e-9)
    spread = correlation_spread(inputs)
    assert {r.methods["natural_channel_method"] for r in spread.rows} == {
        "bar_cohen_rohsenow",
        "elenbaas",
    }


@pytest.mark.identity
def test_natural_spread_vanishes_in_the_fully_developed_limit():
    # Both channel correlations tend to Nu_S = El/24 as El -> 0 (buoyancy-driven plane
    # Poiseuille flow, derived in finkit.physics.correlations.natural), so very tight fins show
    # almost no model-form spread, while the demo's open fins show some.
    data = raw("nb100-natural")
    data["sink"]["fins"]["count"] = 30  # 1.4 mm gaps
    _, tight = inputs_of(data)
    assert correlation_spread(tight).relative_spread["sink_resistance"] < 1e-4
    with pytest.raises(InputError, match="natural_channel_method"):
        ModelOptions(natural_channel_method="guess")


# --------------------------------------------------------------------------------------
# Sanity flags
# --------------------------------------------------------------------------------------


class Overlay:
    """A case with extra attributes (fields the lead will add to the schema)."""

    def __init__(self, base, **extra):
        self._base, self._extra = base, extra

    def __getattr__(self, name):
        if name in self._extra:
            value = self._extra[name]
            return value
        return getattr(self._base, name)


def with_fields(case, **blocks):
    """``with_fields(case, air={'preheat_allowance': 5.0})`` adds fields inside blocks."""
    return Overlay(case, **{b: Overlay(getattr(case, b), **f) for b, f in blocks.items()})


@pytest.mark.parametrize(
    "name", ["nb100-natural", "nb200-plate-fan", "nb300-pin-ducted", "nb-fin-study"]
)
def test_no_flags_on_demo_cases(name):
    assert sanity_flags(load_case(raw(name))) == []


def test_flag_junction_to_case_like_theta_ja():
    data = raw("nb200-plate-fan")
    del data["source"]["junction_to_case_basis"]  # the demo states its basis; here it is unknown
    data["source"]["junction_to_case"] = f"{JUNCTION_TO_CASE_FLAG + 3} K/W"
    data["limit"]["temperature"] = "500 degC"  # budget large: the absolute threshold fires
    # (the 500 degC limit is itself flagged as outside air-cooled electronics; not counted)
    flags = [f for f in sanity_flags(load_case(data)) if not f.startswith("limit.temperature")]
    assert len(flags) == 1 and flags[0].startswith("source.junction_to_case:")
    assert "JESD51-2A" in flags[0]
    # A junction-to-case drop eating most of the budget also fires (here 45 W x 1 K/W = 45 K of
    # the 55 K from inlet to limit).
    data = raw("nb200-plate-fan")
    del data["source"]["junction_to_case_basis"]
    data["source"]["junction_to_case"] = "1 K/W"
    case = load_case(data)
    assert [f for f in sanity_flags(case) if f.startswith("source.junction_to_case")]
    stated = with_fields(case, source={"junction_to_case_basis": "jesd51-14-top"})
    assert sanity_flags(stated) == []
    plain = raw("nb200-plate-fan")
    del plain["source"]["junction_to_case_basis"]
    as_ja = with_fields(load_case(plain), source={"junction_to_case_basis": "theta-ja"})
    assert sanity_flags(as_ja)[0].startswith("source.junction_to_case: 0.35 K/W is stated as θJA")


def test_flag_room_ambient_inlet_without_preheat():
    data = raw("nb300-pin-ducted")
    data["air"]["inlet_temperature"] = "23 degC"
    case = load_case(data)
    flags = sanity_flags(case)
    assert len(flags) == 1 and flags[0].startswith("air.inlet_temperature: 23.0 degC")
    assert sanity_flags(with_fields(case, air={"preheat_allowance": 0.0})) == []
    data["air"]["inlet_temperature"] = "27 degC"  # outside 20-25 degC ± 1 K
    assert sanity_flags(load_case(data)) == []


def test_flag_heat_transfer_coefficient_by_hand():
    case = load_case(raw("nb300-pin-ducted"))
    flags = sanity_flags(with_fields(case, sink={"heat_transfer_coefficient_override": 50.0}))
    assert len(flags) == 1 and flags[0].startswith("sink.heat_transfer_coefficient_override")


def test_flag_tight_natural_convection_gaps():
    data = raw("nb100-natural")
    data["sink"]["fins"]["count"] = 20  # gap 3.2 mm, under half the optimum of about 8 mm
    flags = sanity_flags(load_case(data))
    assert len(flags) == 1 and flags[0].startswith("sink.fins: fin gap 3.16 mm")
    data["sink"]["fins"]["count"] = 14  # gap 5.5 mm: no flag
    assert sanity_flags(load_case(data)) == []


# --------------------------------------------------------------------------------------
# Case-file blocks
# --------------------------------------------------------------------------------------

BLOCKS = {
    "air": {"preheat_allowance": "10 K"},  # ignored by load_review_blocks
    "scenarios": [
        {"name": "hot-day", "description": "Design day", "inlet_temperature": "60 degC"},
        {
            "name": "one-fan-down",
            "failed_fans": 1,
            "stopped_fan_leak": {"volume_flow": "5 CFM", "pressure_drop": "20 Pa"},
        },
        {
            "name": "dusty",
            "filter": {"volume_flow": "20 CFM", "pressure_drop": "15 Pa"},
            "deposit_thickness": "0.1 mm",
            "deposit_conductivity": "0.1 W/m/K",
        },
    ],
    "touch": {
        "limit_temperature": "70 degC",
        "reference_ambient": "25 degC",
        "basis": "example only: check against your standard",
    },
    "measurements": [
        {
            "name": "tp1",
            "node": "base",
            "measured_temperature": "71.3 degC",
            "power": "40 W",
            "inlet_temperature": "23 degC",
            "volume_flow": "12 CFM",
        },
    ],
    "calibration": {"target": "heat_transfer"},
}


def test_review_blocks_load_in_si(fan_case):
    blocks = load_review_blocks(BLOCKS)
    assert blocks.scenarios[0].inlet_temperature == pytest.approx(333.15)
    assert blocks.scenarios[2].deposit_thickness == pytest.approx(1e-4)
    assert blocks.touch.surfaces == ["base", "fin_tips"]
    assert blocks.calibration.apply is False
    scenarios = scenarios_from_blocks(blocks.scenarios)
    # 1 CFM = 4.719474e-4 m³/s (exact from ft³/min); R = dp / Q²
    np.testing.assert_allclose(
        scenarios[1].stopped_fan_resistance, 20.0 / (5 * 4.719474432e-4) ** 2
    )
    assert scenarios[2].filter.volume_flow == pytest.approx(20 * 4.719474432e-4)
    (m,) = measurements_from_blocks(blocks.measurements)
    assert m.measured_temperature == pytest.approx(344.45)
    case, inputs = fan_case
    hot = apply_scenario(inputs, scenarios[0], case.air.flow.fan)
    assert hot.air.inlet_temperature == pytest.approx(333.15)


@pytest.mark.parametrize(
    "edit, message",
    [
        (
            {"scenarios": [{"name": "hot", "inlet_temperature": "3 W"}]},
            "scenarios[0].inlet_temperature: expected",
        ),
        ({"scenarios": [{"name": "nominal", "power": "3 W"}]}, "scenarios[0].name: 'nominal'"),
        ({"scenarios": [{"name": "x"}]}, "scenarios[0]: scenario 'x' changes nothing"),
        (
            {
                "scenarios": [
                    {
                        "name": "x",
                        "stopped_fan_leak": {"volume_flow": "1 CFM", "pressure_drop": "5 Pa"},
                    }
                ]
            },
            "scenarios[0].stopped_fan_leak: needs failed_fans",
        ),
        (
            {"scenarios": [{"name": "x", "power": "5 W", "colour": "red"}]},
            "scenarios[0].colour: unknown key",
        ),
        (
            {"touch": {"limit_temperature": "70 degC", "reference_ambient": "25 degC"}},
            "touch.basis: missing",
        ),
        (
            {
                "touch": {
                    "limit_temperature": "20 degC",
                    "reference_ambient": "25 degC",
                    "basis": "x",
                }
            },
            "touch.limit_temperature: must be above reference_ambient",
        ),
        (
            {
                "measurements": [
                    {
                        "name": "m",
                        "node": "lid",
                        "measured_temperature": "50 degC",
                        "power": "5 W",
                        "inlet_temperature": "20 degC",
                    }
                ]
            },
            "measurements[0].node: not allowed (got 'lid'",
        ),
        ({"calibration": {"target": "heat_transfer"}}, "calibration: needs measurements"),
    ],
)
def test_review_block_errors_are_one_line_naming_the_field(edit, message):
    with pytest.raises(ReviewBlockError) as info:
        load_review_blocks(edit)
    assert any(line.startswith(message) for line in info.value.errors), info.value.errors
    assert all("\n" not in line for line in info.value.errors)


def test_sink_review_options_errors_are_one_line():
    with pytest.raises(InputError, match=r"^deposit_thickness: got -0.001 m; must be >= 0$"):
        ModelOptions(deposit_thickness=-1e-3)


def test_overlay_is_only_a_test_helper():
    # The Overlay stands in for schema fields not yet wired; check it does what it says.
    ns = types.SimpleNamespace(a=1, b=types.SimpleNamespace(c=2))
    o = with_fields(ns, b={"d": 3})
    assert (o.a, o.b.c, o.b.d) == (1, 2, 3)


def test_a_scenario_that_cannot_be_solved_is_named_in_the_error():
    from finkit.errors import PropertyRangeError

    data = raw("nb200-plate-fan")
    data["scenarios"][0].pop("inlet_temperature_rise")
    data["scenarios"][0]["inlet_temperature"] = "300 degC"  # beyond the air-property table
    with pytest.raises(PropertyRangeError, match=r"^scenarios\[hot-day\]: .*air-property range"):
        run_case(load_case(data))
