"""Mixed convection at low forced flow: free convection and radiation credited beside a weak stream.

The combination rule is Churchill's, ``G^3 = G_forced^3 + G_free^3`` (Churchill, AIChE J. 23(1),
1977; Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., section 9.9, Eq. 9.64).
The checks are its two limits (identities): pure forced convection at high velocity and the
natural-convection model as the flow stops, plus the case-file rules.
"""

from __future__ import annotations

import copy

import numpy as np
import pytest
import yaml

from finkit.case import load_case
from finkit.errors import InputError
from finkit.model import run_case
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink import (
    Air,
    GivenVelocity,
    HeatSource,
    NaturalConvection,
    SinkMaterial,
    solve_allowable_power,
    solve_temperatures,
)
from finkit.physics.sink.inputs import FreeConvectionCredit, ModelOptions
from finkit.physics.sink.mixed import combine_conductances

# An invented sink (demo-style data, not from a source).
SINK = PlateFinSink(
    base_width=0.10,
    base_length=0.10,
    base_thickness=0.006,
    fin_count=12,
    fin_thickness=0.0015,
    fin_height=0.04,
)
METAL = SinkMaterial(thermal_conductivity=200.0, emissivity=0.85)
SOURCE = HeatSource(power=20.0, footprint_length=0.03, footprint_width=0.03)
AIR = Air(inlet_temperature=300.0)
WITH_RADIATION = ModelOptions(free_convection=FreeConvectionCredit(radiation=True))
CONVECTION_ONLY = ModelOptions(free_convection=FreeConvectionCredit(radiation=False))


@pytest.mark.identity
def test_churchill_combination_is_the_cube_root_of_the_sum_of_cubes():
    # Incropera et al. 6th ed. Eq. 9.64 with n = 3 and the plus sign (assisting/transverse).
    assert combine_conductances(3.0, 4.0) == pytest.approx(91.0 ** (1 / 3), rel=1e-15)
    assert combine_conductances(3.0, 0.0) == pytest.approx(3.0, rel=1e-15)
    assert combine_conductances(0.0, 4.0, 0.5) == pytest.approx(4.5, rel=1e-15)


@pytest.mark.identity
def test_mixed_tends_to_forced_convection_at_high_velocity():
    forced = solve_temperatures(SINK, METAL, SOURCE, AIR, GivenVelocity(10.0))
    mixed = solve_temperatures(
        SINK, METAL, SOURCE, AIR, GivenVelocity(10.0), options=CONVECTION_ONLY
    )
    assert mixed.sink_resistance == pytest.approx(forced.sink_resistance, rel=2e-4)
    assert mixed.sink_resistance < forced.sink_resistance  # a credit, however small


@pytest.mark.identity
def test_mixed_tends_to_natural_convection_as_the_flow_stops():
    natural = solve_temperatures(SINK, METAL, SOURCE, AIR, NaturalConvection())
    mixed = solve_temperatures(
        SINK, METAL, SOURCE, AIR, GivenVelocity(0.005), options=WITH_RADIATION
    )
    assert mixed.sink_resistance == pytest.approx(natural.sink_resistance, rel=2e-3)
    assert mixed.base_temperature == pytest.approx(natural.base_temperature, abs=0.05)
    assert mixed.radiation_heat_rate == pytest.approx(natural.radiation_heat_rate, rel=5e-3)
    # The forced stream alone cannot carry 20 W at 5 mm/s (the air would leave the table).


@pytest.mark.identity
def test_the_credit_lies_between_the_two_models_and_grows_as_the_flow_falls():
    velocities = np.array([0.05, 0.1, 0.3, 1.0, 3.0])
    forced = solve_temperatures(SINK, METAL, SOURCE, AIR, GivenVelocity(velocities))
    mixed = solve_temperatures(
        SINK, METAL, SOURCE, AIR, GivenVelocity(velocities), options=CONVECTION_ONLY
    )
    gain = forced.sink_resistance / mixed.sink_resistance
    assert np.all(gain > 1.0)
    assert np.all(np.diff(gain) < 0)  # more credit at lower flow
    # Never more than the sum of the two conductances (Churchill's rule lies below it).
    natural = solve_temperatures(SINK, METAL, SOURCE, AIR, NaturalConvection())
    free = natural.convection_heat_rate / (natural.base_temperature - 300.0)
    assert np.all(1.0 / mixed.sink_resistance < 1.0 / forced.sink_resistance + 1.01 * free)
    # The outlet air is never hotter than the base.
    assert np.all(mixed.outlet_air_temperature <= mixed.base_temperature)


@pytest.mark.identity
def test_allowable_power_with_the_credit_puts_the_node_at_its_limit():
    sol = solve_allowable_power(
        SINK,
        METAL,
        SOURCE,
        AIR,
        GivenVelocity(np.array([0.1, 0.5])),
        "junction",
        360.0,
        options=WITH_RADIATION,
    )
    again = solve_temperatures(
        SINK,
        METAL,
        HeatSource(power=sol.power, footprint_length=0.03, footprint_width=0.03),
        AIR,
        GivenVelocity(np.array([0.1, 0.5])),
        options=WITH_RADIATION,
    )
    assert again.junction_temperature == pytest.approx(360.0, abs=0.01)


def test_a_downward_flow_is_refused_in_one_line():
    with pytest.raises(InputError, match="free_convection.forced_flow: got 'downward'"):
        FreeConvectionCredit(forced_flow="downward")


@pytest.fixture(scope="module")
def plate_case(demo_case_file):
    raw = yaml.safe_load(demo_case_file("nb200-plate-fan").read_text(encoding="utf-8"))
    for key in (
        "scenarios",
        "transient",
        "tolerances",
        "monte_carlo",
        "measurements",
        "calibration",
    ):
        raw.pop(key, None)
    raw["air"]["flow"] = {"approach_velocity": "0.3 m/s"}
    raw["air"].pop("bypass", None)
    return raw


def test_the_case_credit_lowers_the_junction_and_silences_the_richardson_warning(plate_case):
    plain = run_case(load_case(plate_case))
    credited = copy.deepcopy(plate_case)
    credited["air"]["flow"]["free_convection"] = {
        "orientation": "vertical-fins",
        "forced_flow": "upward",
        "radiation": True,
    }
    mixed = run_case(load_case(credited))
    assert mixed.results["junction_temperature"] < plain.results["junction_temperature"]
    assert any(w.startswith("mixed convection: Richardson") for w in plain.warnings)
    assert not any(w.startswith("mixed convection: Richardson") for w in mixed.warnings)


@pytest.mark.parametrize(
    ("block", "message"),
    [
        (
            {"orientation": "vertical-fins", "forced_flow": "downward"},
            "air.flow.free_convection.forced_flow: got 'downward'; allowed: upward, horizontal",
        ),
        (
            {"orientation": "sideways", "forced_flow": "upward"},
            "air.flow.free_convection.orientation: got 'sideways'; allowed: vertical-fins, "
            "horizontal-base-fins-up",
        ),
    ],
)
def test_a_bad_free_convection_block_gets_a_one_line_error(plate_case, block, message):
    bad = copy.deepcopy(plate_case)
    bad["air"]["flow"]["free_convection"] = block
    with pytest.raises(InputError) as err:
        load_case(bad)
    assert message in str(err.value)
    assert "\n" not in str(err.value).strip()


def test_free_convection_with_natural_flow_or_a_hand_given_h_is_refused(plate_case):
    natural = copy.deepcopy(plate_case)
    natural["air"]["flow"] = {
        "natural": {"orientation": "vertical-fins"},
        "free_convection": {"orientation": "vertical-fins", "forced_flow": "upward"},
    }
    with pytest.raises(InputError, match="free_convection: applies to a forced flow only"):
        load_case(natural)
    by_hand = copy.deepcopy(plate_case)
    by_hand["air"]["flow"]["free_convection"] = {
        "orientation": "vertical-fins",
        "forced_flow": "upward",
    }
    by_hand["sink"]["heat_transfer_coefficient_override"] = "40 W/(m^2*K)"
    with pytest.raises(InputError, match="cannot be combined with"):
        load_case(by_hand)


@pytest.mark.shape
def test_the_credit_broadcasts_over_designs_as_one_solve_per_design():
    counts = np.array([8, 12, 16])
    sinks = PlateFinSink(
        base_width=0.10,
        base_length=0.10,
        base_thickness=0.006,
        fin_count=counts,
        fin_thickness=0.0015,
        fin_height=0.04,
    )
    together = solve_temperatures(
        sinks, METAL, SOURCE, AIR, GivenVelocity(0.2), options=WITH_RADIATION
    )
    for i, n in enumerate(counts):
        one = solve_temperatures(
            PlateFinSink(
                base_width=0.10,
                base_length=0.10,
                base_thickness=0.006,
                fin_count=int(n),
                fin_thickness=0.0015,
                fin_height=0.04,
            ),
            METAL,
            SOURCE,
            AIR,
            GivenVelocity(0.2),
            options=WITH_RADIATION,
        )
        # The film loop stops when every design has converged (1e-3 K), so a design solved
        # alone may stop one pass earlier.
        assert together.junction_temperature[i] == pytest.approx(one.junction_temperature, abs=2e-3)


def test_a_trade_study_accepts_the_credit(demo_case_file):
    from finkit.model.trade.case_study import run_trade_study

    raw = yaml.safe_load(demo_case_file("nb200-trade-study").read_text(encoding="utf-8"))
    raw["air"]["flow"] = {
        "approach_velocity": "0.4 m/s",
        "free_convection": {"orientation": "vertical-fins", "forced_flow": "upward"},
    }
    raw["air"]["bypass"] = {"side_gap": "0 mm", "top_gap": "0 mm"}
    raw.pop("scenarios", None)
    raw["tolerances"] = {k: v for k, v in raw.get("tolerances", {}).items() if k != "fan_pressure"}
    note = run_trade_study(load_case(raw))
    assert note.optimum is not None or note.front is not None


def test_free_convection_on_a_pin_fin_sink_is_refused_in_one_line(demo_case_file):
    raw = yaml.safe_load(demo_case_file("nb300-pin-ducted").read_text(encoding="utf-8"))
    raw["air"]["flow"]["free_convection"] = {
        "orientation": "vertical-fins",
        "forced_flow": "upward",
    }
    with pytest.raises(InputError) as err:
        load_case(raw)
    text = str(err.value)
    assert "air.flow.free_convection: needs a natural-convection model" in text
    assert "pin-fin" in text and "\n" not in text.strip()
