"""Heat-sink models: physics invariants of the thermal chain and the two design questions.

The correlations inside are checked against their sources in test_forced.py, test_natural.py,
test_spreading.py and test_airflow.py; here the assembled chain is checked for the properties
any correct model must have.
"""

import numpy as np
import pytest

from finkit.constants import CUBIC_FOOT_PER_MINUTE as CFM
from finkit.constants import ZERO_CELSIUS
from finkit.physics.airflow import FanCurve
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink import (
    Air,
    Bypass,
    FanDriven,
    GivenVelocity,
    GivenVolumeFlow,
    HeatSource,
    NaturalConvection,
    SinkMaterial,
    solve_allowable_power,
    solve_temperatures,
)
from finkit.physics.spreading import spreading_resistance_rectangular_series

PLATE = PlateFinSink(
    base_width=0.08,
    base_length=0.06,
    base_thickness=0.005,
    fin_count=14,
    fin_thickness=0.0012,
    fin_height=0.03,
)
PINS = PinFinSink(
    base_width=0.06,
    base_length=0.06,
    base_thickness=0.004,
    pin_diameter=0.003,
    pin_height=0.025,
    transverse_pitch=0.007,
    longitudinal_pitch=0.007,
    arrangement="staggered",
)
ALUMINIUM = SinkMaterial(thermal_conductivity=200.0, emissivity=0.85, density=2700.0)
SOURCE = HeatSource(
    power=40.0,
    footprint_length=0.025,
    footprint_width=0.025,
    junction_to_case_resistance=0.35,
    interface_resistance=0.05,
)
AIR = Air(inlet_temperature=ZERO_CELSIUS + 45.0, pressure=101325.0)
# A small 60 mm-class fan, invented for the tests (not a product's data).
FAN = FanCurve(
    volume_flow=np.array([0.0, 5.0, 10.0, 15.0, 20.0]) * CFM,
    static_pressure=np.array([0.30, 0.26, 0.19, 0.10, 0.0]) * 249.0889,
)
FORCED_FLOWS = [GivenVelocity(2.0), GivenVolumeFlow(12 * CFM), FanDriven(FAN)]
BYPASSES = [None, Bypass(side_gap=0.004, top_gap=0.003)]


@pytest.mark.identity
@pytest.mark.parametrize("flow", FORCED_FLOWS, ids=lambda f: type(f).__name__)
@pytest.mark.parametrize("bypass", BYPASSES, ids=["shrouded", "bypass"])
@pytest.mark.parametrize("geometry", [PLATE, PINS], ids=["plate", "pin"])
def test_air_heating_balance_and_node_order(geometry, flow, bypass):
    # Identity: all the power leaves with the air through the fins, Q = m cp (T_out - T_in)
    # (first law, 0.1 %); the air cannot leave hotter than the base; nodes are ordered.
    sol = solve_temperatures(geometry, ALUMINIUM, SOURCE, AIR, flow, bypass)
    film = air_properties(0.5 * (sol.inlet_air_temperature + sol.base_temperature), AIR.pressure)
    heat_to_air = (
        sol.mass_flow
        * film.specific_heat
        * (sol.outlet_air_temperature - sol.inlet_air_temperature)
    )
    assert heat_to_air == pytest.approx(SOURCE.power, rel=1e-3)
    assert sol.outlet_air_temperature <= sol.base_temperature
    assert (
        sol.inlet_air_temperature
        < sol.base_temperature
        < sol.source_base_temperature
        < sol.case_temperature
        < sol.junction_temperature
    )
    assert sol.inlet_air_temperature < sol.fin_tip_temperature <= sol.base_temperature
    assert 0 < sol.fin_efficiency <= 1 and sol.fin_efficiency <= sol.surface_efficiency <= 1


@pytest.mark.identity
@pytest.mark.parametrize("geometry", [PLATE, PINS], ids=["plate", "pin"])
def test_sink_resistance_falls_as_flow_rises(geometry):
    flows = np.linspace(3, 30, 12) * CFM
    sol = solve_temperatures(geometry, ALUMINIUM, SOURCE, AIR, GivenVolumeFlow(flows))
    assert np.all(np.diff(sol.sink_resistance) < 0)
    assert np.all(np.diff(sol.pressure_drop) > 0)


@pytest.mark.identity
@pytest.mark.parametrize("bypass", BYPASSES, ids=["shrouded", "bypass"])
def test_fan_operating_point_lies_on_both_curves(bypass):
    sol = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN), bypass)
    rho = air_properties(AIR.inlet_temperature, AIR.pressure).density
    assert FAN.pressure(sol.volume_flow, density=rho) == pytest.approx(sol.pressure_drop, rel=1e-6)
    # The same flow given directly reproduces the same pressure drop (system curve).
    again = solve_temperatures(
        PLATE, ALUMINIUM, SOURCE, AIR, GivenVolumeFlow(sol.volume_flow), bypass
    )
    assert again.pressure_drop == pytest.approx(sol.pressure_drop, rel=1e-6)


@pytest.mark.identity
def test_more_bypass_gap_gives_less_flow_through_the_fins():
    gaps = np.array([0.0005, 0.002, 0.005, 0.01, 0.02])
    sol = solve_temperatures(
        PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN), Bypass(side_gap=gaps, top_gap=gaps)
    )
    assert np.all(np.diff(sol.sink_volume_flow) < 0)
    assert np.all(np.diff(sol.junction_temperature) > 0)
    given = solve_temperatures(
        PLATE, ALUMINIUM, SOURCE, AIR, GivenVolumeFlow(12 * CFM), Bypass(gaps, gaps)
    )
    assert np.all(np.diff(given.sink_volume_flow) < 0)


@pytest.mark.identity
@pytest.mark.parametrize("flow", [FanDriven(FAN), NaturalConvection()], ids=["fan", "natural"])
def test_allowable_power_falls_with_inlet_temperature_and_vanishes_at_the_limit(flow):
    limit = ZERO_CELSIUS + 105.0
    inlet = ZERO_CELSIUS + np.array([20.0, 35.0, 50.0, 65.0, 80.0, 95.0, 104.9])
    air = Air(inlet_temperature=inlet, pressure=101325.0)
    sol = solve_allowable_power(PLATE, ALUMINIUM, SOURCE, air, flow, "junction", limit)
    assert np.all(np.diff(sol.power) < 0)
    assert sol.power[-1] < 0.02 * sol.power[0]
    np.testing.assert_allclose(sol.junction_temperature, limit, atol=1e-6)
    if isinstance(flow, FanDriven):
        at_limit = solve_allowable_power(
            PLATE, ALUMINIUM, SOURCE, Air(limit, 101325.0), flow, "junction", limit
        )
        assert at_limit.power == 0.0


@pytest.mark.identity
@pytest.mark.parametrize("node", ["junction", "case", "base"])
@pytest.mark.parametrize(
    "flow", [GivenVolumeFlow(12 * CFM), FanDriven(FAN), NaturalConvection()], ids=str
)
def test_the_two_design_questions_are_inverse(node, flow):
    # Allowable power at a limit, fed back as the power, puts that node exactly at the limit.
    limit = ZERO_CELSIUS + 100.0
    allowed = solve_allowable_power(PLATE, ALUMINIUM, SOURCE, AIR, flow, node, limit)
    source = HeatSource(
        power=float(allowed.power),
        footprint_length=SOURCE.footprint_length,
        footprint_width=SOURCE.footprint_width,
        junction_to_case_resistance=SOURCE.junction_to_case_resistance,
        interface_resistance=SOURCE.interface_resistance,
    )
    sol = solve_temperatures(PLATE, ALUMINIUM, source, AIR, flow)
    assert sol.node_temperature(node) == pytest.approx(limit, abs=0.05)


@pytest.mark.identity
def test_chain_is_the_sum_of_its_resistances():
    sol = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, GivenVolumeFlow(12 * CFM))
    rise = sol.junction_temperature - sol.inlet_air_temperature
    assert rise == pytest.approx(SOURCE.power * sol.total_resistance, rel=1e-9)
    # Spreading is the exact rectangular series for the sink resistance found, as a uniform
    # coefficient 1/(R_sink A_base) on the finned face (docs/methods.md i2).
    spread = spreading_resistance_rectangular_series(
        0.025, 0.025, 0.06, 0.08, 0.005, 200.0, 1.0 / (sol.sink_resistance * 0.08 * 0.06)
    )
    assert sol.spreading_resistance == pytest.approx(spread.average, rel=1e-12)
    assert sol.source_base_centre_temperature - sol.base_temperature == pytest.approx(
        SOURCE.power * (spread.maximum + spread.one_dimensional), rel=1e-9
    )


@pytest.mark.identity
def test_film_property_iteration_has_converged(monkeypatch):
    import finkit.physics.sink.forced as chain  # the module whose loop reads the tolerance

    quick = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    monkeypatch.setattr(chain, "FILM_TOLERANCE", 1e-10)
    tight = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    assert quick.junction_temperature == pytest.approx(tight.junction_temperature, abs=0.01)


@pytest.mark.identity
def test_altitude_lowers_mass_flow_and_raises_temperatures():
    # US Standard Atmosphere 1976: about 79.5 kPa at 2000 m. A fan at fixed speed moves about
    # the same volume but less mass (common practice, no source), so the sink runs hotter.
    sea = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    high = solve_temperatures(
        PLATE, ALUMINIUM, SOURCE, Air(AIR.inlet_temperature, 79495.0), FanDriven(FAN)
    )
    assert high.mass_flow < sea.mass_flow
    assert high.volume_flow == pytest.approx(sea.volume_flow, rel=0.1)
    assert high.junction_temperature > sea.junction_temperature


@pytest.mark.published
def test_heat_transfer_coefficients_are_of_the_usual_size():
    # Common practice, no source: natural convection gives h of a few W/m²K, forced air tens.
    nat = solve_temperatures(
        PLATE, ALUMINIUM, HeatSource(10.0, 0.025, 0.025), AIR, NaturalConvection()
    )
    assert 2.0 < nat.heat_transfer_coefficient < 10.0
    forced = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    assert 10.0 < forced.heat_transfer_coefficient < 150.0
    # Common practice, no source: radiation is 20-40 % of the heat of a black natural-convection
    # sink, well below it with a bare (low-emissivity) finish.
    share = nat.radiation_heat_rate / nat.power
    assert 0.15 < share < 0.45
    bare = SinkMaterial(200.0, emissivity=0.05)
    nat_bare = solve_temperatures(
        PLATE, bare, HeatSource(10.0, 0.025, 0.025), AIR, NaturalConvection()
    )
    # The fin channels act as cavities and raise the effective emissivity of a bare finish,
    # so the share stays below about 10 % rather than below epsilon itself.
    assert nat_bare.radiation_heat_rate / nat_bare.power < 0.10
    assert nat_bare.base_temperature > nat.base_temperature


@pytest.mark.shape
def test_sweeps_are_vectorised_and_agree_with_single_points():
    counts = np.array([8.0, 12.0, 16.0, 20.0])
    geometry = PlateFinSink(0.08, 0.06, 0.005, counts, 0.0012, 0.03)
    many = solve_temperatures(geometry, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    for i, n in enumerate(counts):
        one = solve_temperatures(
            PlateFinSink(0.08, 0.06, 0.005, n, 0.0012, 0.03), ALUMINIUM, SOURCE, AIR, FanDriven(FAN)
        )
        assert many.junction_temperature[i] == pytest.approx(float(one.junction_temperature))
    grid = solve_allowable_power(
        geometry,
        ALUMINIUM,
        SOURCE,
        Air(ZERO_CELSIUS + np.array([[30.0], [50.0]]), 101325.0),
        FanDriven(FAN),
        "junction",
        ZERO_CELSIUS + 105.0,
    )
    assert grid.power.shape == (2, 4)


@pytest.mark.identity
@pytest.mark.parametrize("walls_c", [25.0, 44.0, 46.0, 70.0])
@pytest.mark.parametrize("power", [0.5, 15.0])
def test_natural_convection_with_surroundings_warmer_or_colder_than_the_air(walls_c, power):
    # Radiation exchange with walls at another temperature than the air: the heat balance
    # still closes (power = convection + net radiation) and the two design questions invert.
    air = Air(AIR.inlet_temperature, 101325.0, surroundings_temperature=ZERO_CELSIUS + walls_c)
    source = HeatSource(power, 0.025, 0.025, 0.35, 0.05)
    sol = solve_temperatures(PLATE, ALUMINIUM, source, air, NaturalConvection())
    assert sol.convection_heat_rate + sol.radiation_heat_rate == pytest.approx(power, rel=1e-6)
    limit = ZERO_CELSIUS + 100.0
    allowed = solve_allowable_power(
        PLATE, ALUMINIUM, source, air, NaturalConvection(), "junction", limit
    )
    assert allowed.junction_temperature == pytest.approx(limit, abs=1e-6)
    again = solve_temperatures(
        PLATE,
        ALUMINIUM,
        HeatSource(float(allowed.power), 0.025, 0.025, 0.35, 0.05),
        air,
        NaturalConvection(),
    )
    assert again.junction_temperature == pytest.approx(limit, abs=0.01)
    # Warmer walls leave less power for the same limit (first law on the radiation exchange).
    if walls_c > 45.0:
        cooler = solve_allowable_power(
            PLATE, ALUMINIUM, source, AIR, NaturalConvection(), "junction", limit
        )
        assert allowed.power < cooler.power


@pytest.mark.shape
def test_bypass_arrays_solve_each_design_on_its_own_terms():
    # A batch mixing shrouded and open-top designs gives each design its own answer.
    side, top = np.array([0.0, 0.002, 0.0]), np.array([0.0, 0.0, 0.002])
    many = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN), Bypass(side, top))
    for i in range(3):
        bypass = None if side[i] == top[i] == 0 else Bypass(side[i], top[i])
        one = solve_temperatures(PLATE, ALUMINIUM, SOURCE, AIR, FanDriven(FAN), bypass)
        assert many.junction_temperature[i] == pytest.approx(float(one.junction_temperature))


@pytest.mark.identity
def test_operating_point_in_the_fan_stall_region_is_warned():
    # Common practice, no source: a fan should run on the falling part of its curve.
    # An invented curve with a dip (stall) between 1 and 2 l/s, and a dense sink that crosses it
    # there.
    fan = FanCurve(np.array([0, 1, 2, 3, 4, 5]) * 1e-3, [60.0, 50.0, 55.0, 40.0, 20.0, 0.0])
    dense = PlateFinSink(0.08, 0.06, 0.005, 55, 0.0008, 0.03)
    sol = solve_temperatures(dense, ALUMINIUM, SOURCE, AIR, FanDriven(fan))
    assert any("stall" in w for w in sol.warnings)
    sparse = PlateFinSink(0.08, 0.06, 0.005, 30, 0.0008, 0.03)
    sol = solve_temperatures(sparse, ALUMINIUM, SOURCE, AIR, FanDriven(fan))
    assert not any("stall" in w for w in sol.warnings)


@pytest.mark.identity
def test_an_array_changed_in_place_is_not_answered_from_the_airflow_cache():
    heights = np.array([0.03, 0.03])
    geometry = PlateFinSink(0.08, 0.06, 0.005, 14, 0.0012, heights)
    solve_temperatures(geometry, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    heights[1] = 0.01
    changed = solve_temperatures(geometry, ALUMINIUM, SOURCE, AIR, FanDriven(FAN))
    fresh = solve_temperatures(
        PlateFinSink(0.08, 0.06, 0.005, 14, 0.0012, np.array([0.03, 0.01])),
        ALUMINIUM,
        SOURCE,
        AIR,
        FanDriven(FAN),
    )
    np.testing.assert_allclose(changed.volume_flow, fresh.volume_flow)


def test_two_callables_for_an_extra_pressure_drop_give_two_airflows():
    # Regression: the airflow was once remembered in a module-level cache keyed partly on the
    # id() of callables; a new callable could reuse an old id and get another design's flow.
    # Identity (no published value): a larger series loss must give less flow.
    from finkit.physics.sink import ModelOptions

    fan = FanCurve(
        volume_flow=[0, 0.0024, 0.0047, 0.0071, 0.0094], static_pressure=[75, 65, 47, 25, 0]
    )
    sink = PlateFinSink(0.08, 0.06, 0.005, 14, 0.0012, 0.03)
    args = (sink, SinkMaterial(200.0, 0.85), HeatSource(40.0, 0.025, 0.025, 0.35, 0.03))
    air = Air(inlet_temperature=323.15, pressure=101325.0)
    flows = []
    for scale in (1.0, 20.0):
        options = ModelOptions(extra_pressure_drop=lambda q, s=scale: s * 1e5 * q**2)
        flows.append(
            float(solve_temperatures(*args, air, FanDriven(fan), None, options).volume_flow)
        )
    assert flows[1] < flows[0]


@pytest.mark.parametrize("natural_flow", [False, True])
def test_centre_of_the_base_is_hotter_than_the_footprint_mean_and_is_the_base_limit(natural_flow):
    # Identity: the centre temperature uses the spreading resistance to the centre of the
    # footprint (psi_max >= psi_avg, Song, Lee & Au 1994), so it is at least the mean; a limit
    # on the base node is met exactly at the centre.
    sink = PlateFinSink(0.08, 0.06, 0.005, 14, 0.0012, 0.03)
    material = SinkMaterial(200.0, 0.85)
    air = Air(inlet_temperature=323.15, pressure=101325.0)
    flow = NaturalConvection() if natural_flow else GivenVelocity(2.0)
    power = 10.0 if natural_flow else 40.0
    source = HeatSource(power, 0.025, 0.025, 0.35, 0.03)
    sol = solve_temperatures(sink, material, source, air, flow)
    assert sol.source_base_centre_temperature > sol.source_base_temperature
    assert sol.node_temperature("base") == sol.source_base_centre_temperature
    limit = float(sol.source_base_centre_temperature) + 5.0
    at_limit = solve_allowable_power(sink, material, source, air, flow, "base", limit)
    assert float(at_limit.source_base_centre_temperature) == pytest.approx(limit, abs=1e-6)


def test_the_air_heating_limit_says_when_it_acts():
    # Identity: the sink resistance can never be below 1/(m_dot c_p) (all the air leaving at
    # the base temperature); when the correlation would go below, the limit is used and said.
    from finkit.physics.sink import ModelOptions

    sink = PlateFinSink(0.08, 0.06, 0.005, 14, 0.0012, 0.03)
    args = (sink, SinkMaterial(200.0, 0.85), HeatSource(2.0, 0.025, 0.025, 0.35, 0.03))
    air = Air(inlet_temperature=298.15, pressure=101325.0)
    # The inlet-referenced (Teertstra) model is the one that can go below the limit.
    options = ModelOptions(
        plate_channel_method="teertstra", heat_transfer_coefficient_override=200.0
    )
    sol = solve_temperatures(*args, air, GivenVolumeFlow(2e-5), None, options)
    assert any(w.startswith("sink resistance: the correlation gave less") for w in sol.warnings)
    normal = solve_temperatures(*args, air, GivenVolumeFlow(5e-3))
    assert not any(w.startswith("sink resistance:") for w in normal.warnings)
