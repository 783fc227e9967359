"""How the sink is really cooled: the statements a forced-flow case must make, and low flow.

Builds toward the flow-situations work (unducted sinks, other orientations, mixed convection);
today: the warning when a given flow says nothing of bypass (fully ducted assumed), and the
warning when buoyancy is not negligible beside a low forced flow.
"""

from __future__ import annotations

import copy

import pytest
import yaml

from finkit.case import load_case
from finkit.constants import STANDARD_GRAVITY
from finkit.model import run_case
from finkit.model.review.flags import sanity_flags
from finkit.physics.sink.forced import RICHARDSON_LIMIT, buoyancy_warnings


@pytest.fixture(scope="module")
def pin_case(demo_case_file):
    return yaml.safe_load(demo_case_file("nb300-pin-ducted").read_text(encoding="utf-8"))


def test_a_given_flow_without_a_bypass_statement_is_flagged_as_fully_ducted(pin_case):
    silent = copy.deepcopy(pin_case)
    silent["air"].pop("bypass")
    flags = sanity_flags(load_case(silent))
    assert any(f.startswith("air.flow.volume_flow: no air.bypass is stated") for f in flags)
    # Stated (zero gaps, as the demo's duct): no flag; the result is the same either way.
    assert not any("no air.bypass" in f for f in sanity_flags(load_case(pin_case)))
    a = run_case(load_case(silent)).results
    b = run_case(load_case(pin_case)).results
    assert a["junction_temperature"] == b["junction_temperature"]


@pytest.mark.identity
def test_richardson_number_is_gr_over_re_squared():
    # Identity: Gr_L/Re_L^2 = (g beta dT L^3/nu^2) / (V L/nu)^2 = g beta dT L / V^2, with
    # beta = 1/T_film for an ideal gas (common practice, no source).
    excess, film, length = 30.0, 320.0, 0.12
    velocity_at_limit = (STANDARD_GRAVITY * excess / film * length / RICHARDSON_LIMIT) ** 0.5
    assert buoyancy_warnings(excess, film, length, 1.01 * velocity_at_limit) == ()
    (text,) = buoyancy_warnings(excess, film, length, 0.99 * velocity_at_limit)
    assert text.startswith("mixed convection: Richardson number Gr_L/Re_L^2 = 0.1")


def test_a_very_low_flow_warns_that_buoyancy_matters(pin_case):
    low = copy.deepcopy(pin_case)
    low["air"]["flow"] = {"volume_flow": "1 CFM"}
    low["source"]["power"] = "10 W"
    warnings = run_case(load_case(low)).warnings
    assert any(w.startswith("mixed convection: Richardson number") for w in warnings)
    normal = run_case(load_case(pin_case)).warnings
    assert not any(w.startswith("mixed convection") for w in normal)


def test_a_gap_too_small_to_carry_air_is_refused_in_one_line(pin_case):
    from finkit.case import CaseError

    tiny = copy.deepcopy(pin_case)
    tiny["air"]["bypass"] = {"side_gap": "0.01 mm", "top_gap": "0 mm"}
    with pytest.raises(CaseError) as info:
        load_case(tiny)
    message = str(info.value)
    assert message.startswith("air.bypass.side_gap: 0.01 mm is too small to carry air")
    assert "\n" not in message


@pytest.mark.identity
def test_the_gap_model_tends_to_lees_balance_and_to_the_free_stream_as_the_gaps_widen():
    # The duct-with-gaps network counts the fins' channel velocity head as Lee's (1995) balance
    # does (finkit.physics.airflow.sink_flow_free_stream_lee with a finite bypass area); the
    # difference left is the gaps' own friction, which fades as they widen, and with very wide
    # gaps the sink behaves as in a free stream. At 1 mm the friction pushes more air through
    # the fins than Lee's frictionless gap would.
    from finkit.physics.airflow import sink_flow_free_stream_lee
    from finkit.physics.geometry import PlateFinSink
    from finkit.physics.properties.air import air_properties
    from finkit.physics.sink.airflow import sink_pressure_drop, solve_airflow
    from finkit.physics.sink.inputs import Air, Bypass, FreeStream, GivenVelocity

    sink = PlateFinSink(
        base_width=0.04,
        base_length=0.04,
        base_thickness=0.003,
        fin_count=9,
        fin_thickness=0.001,
        fin_height=0.015,
    )
    air = Air(inlet_temperature=318.15)
    props = air_properties(318.15, 101325.0)

    def dp(q):
        return sink_pressure_drop(
            sink, q, props.density, props.dynamic_viscosity, is_shrouded=False
        )

    ratios = []
    for gap in (0.001, 0.05, 0.2, 0.5):
        network = solve_airflow(sink, GivenVelocity(2.5), air, Bypass(side_gap=gap, top_gap=gap))
        lee = sink_flow_free_stream_lee(
            2.5,
            0.04 * 0.015,
            (0.04 - 9 * 0.001) * 0.015,
            dp,
            props.density,
            bypass_area=2 * gap * 0.015 + gap * (0.04 + 2 * gap),
        )
        ratios.append(float(network.sink_volume_flow / lee.sink_volume_flow))
    assert ratios[0] > 1.05
    assert ratios[1] == pytest.approx(1.0, abs=0.05)
    assert ratios[2] == pytest.approx(1.0, abs=0.015)
    assert ratios[3] == pytest.approx(1.0, abs=0.006)
    assert ratios == sorted(ratios, reverse=True)
    free = solve_airflow(sink, GivenVelocity(2.5), air, FreeStream())
    wide = solve_airflow(sink, GivenVelocity(2.5), air, Bypass(side_gap=0.5, top_gap=0.5))
    assert float(wide.sink_volume_flow) == pytest.approx(float(free.sink_volume_flow), rel=0.01)
