"""The unducted sink: a heat sink standing unshrouded in an approach stream (free-stream bypass).

Model: Lee's (1995) bypass balance as Simons & Schmidt (1997) applied it, with an unbounded
bypass region (finkit.physics.airflow.free_stream, docs/methods.md h "Free stream").

No published worked example or figure of the free-stream limit could be obtained (Lee 1995 and
Simons & Schmidt 1997 were not available in the searched sources), so the model is checked
against: Lee's closed form for a constant loss coefficient (recalled, and derived from Bernoulli
plus continuity in the docstring), the quadratic of an independent public implementation of the
same balance (``evalHSIncomingAir`` of a heat-sink evaluation script), and its limits (fully
ducted as the bypass area closes; channel velocity = approach velocity as the sink's pressure drop
vanishes).
"""

from __future__ import annotations

import copy

import numpy as np
import pytest
import yaml

from finkit.case import load_case
from finkit.errors import InputError
from finkit.model import run_case
from finkit.model.sweeps import is_fin_tip_exposed
from finkit.physics.airflow import sink_flow_free_stream_lee
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink.airflow import sink_pressure_drop, solve_airflow
from finkit.physics.sink.inputs import Air, FanDriven, FreeStream, GivenVelocity, GivenVolumeFlow

RHO, MU = 1.2, 1.85e-5


def constant_loss(k, area):
    """dp = K rho V_ch²/2 on the channel velocity Q/area [Pa]."""
    return lambda q: k * 0.5 * RHO * (np.asarray(q) / area) ** 2


@pytest.fixture(scope="module")
def stream_case(demo_case_file):
    return yaml.safe_load(demo_case_file("nb210-board-stream").read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def plate():
    # A 40 x 40 mm sink with nine 1 mm fins 15 mm high (the nb210 demo's sink).
    return PlateFinSink(
        base_width=0.04,
        base_length=0.04,
        base_thickness=0.003,
        fin_count=9,
        fin_thickness=0.001,
        fin_height=0.015,
    )


# --------------------------------------------------------------------------------------
# The balance against closed forms and an independent implementation
# --------------------------------------------------------------------------------------


@pytest.mark.identity
@pytest.mark.parametrize("k", [0.0, 0.5, 3.0, 15.0, 120.0])
@pytest.mark.parametrize("velocity", [0.5, 2.0, 7.0])
def test_free_stream_with_a_constant_loss_takes_v_over_sqrt_one_plus_k(k, velocity):
    # Identity (derived in the docstring): rho V_app²/2 = (1 + K) rho V_ch²/2 for an unbounded
    # bypass region and A_ch = A_fr, so V_ch = V_app / sqrt(1 + K).
    area = 1.5e-3
    split = sink_flow_free_stream_lee(velocity, area, area, constant_loss(k, area), RHO)
    assert split.channel_velocity == pytest.approx(velocity / np.sqrt(1.0 + k), rel=1e-9)
    assert split.bypass_fraction == pytest.approx(1.0 - 1.0 / np.sqrt(1.0 + k), abs=1e-9)
    assert split.bypass_velocity == velocity


@pytest.mark.identity
@pytest.mark.parametrize("area_ratio", [0.1, 0.5, 1.0, 3.0, 20.0])
@pytest.mark.parametrize("k", [1.0, 8.0])
def test_finite_bypass_area_follows_lees_closed_form(area_ratio, k):
    # From memory: Lee (1995) V_ch/V_app = (1 + A_b/A)/(1 + (A_b/A) sqrt(1 + K)) for a loss-free
    # bypass; also derived in the docstring from Bernoulli along each stream and continuity.
    area, velocity = 1e-3, 3.0
    split = sink_flow_free_stream_lee(
        velocity, area, area, constant_loss(k, area), RHO, bypass_area=area_ratio * area
    )
    expected = velocity * (1 + area_ratio) / (1 + area_ratio * np.sqrt(1 + k))
    assert split.channel_velocity == pytest.approx(expected, rel=1e-9)
    # continuity over the approach section and Bernoulli along both streams
    q_total = velocity * (area + area_ratio * area)
    assert split.sink_volume_flow + split.bypass_velocity * area_ratio * area == pytest.approx(
        q_total, rel=1e-9
    )
    assert split.bypass_velocity == pytest.approx(split.channel_velocity * np.sqrt(1 + k))


def _evalhs_incoming_velocity(fin_velocity, pressure_drop, duct_area, fin_area, bypass_area):
    """The duct velocity a public heat-sink evaluation script (``evalHSIncomingAir``) needs to
    supply a fin velocity against a sink pressure drop: the positive root of
    ``A_d² V_d² - 2 A_d A_f V_f V_d + V_f² (A_f² - A_b²) - 2 dp A_b²/rho = 0``."""
    a = duct_area**2
    b = -2.0 * duct_area * fin_area * fin_velocity
    c = (
        fin_velocity**2 * (fin_area**2 - bypass_area**2)
        - 2.0 * pressure_drop * bypass_area**2 / RHO
    )
    return (-b + np.sqrt(b * b - 4 * a * c)) / (2 * a)


@pytest.mark.parametrize("gap_area_ratio", [0.3, 1.0, 4.0])
@pytest.mark.parametrize("velocity", [1.0, 3.0, 6.0])
def test_same_balance_as_an_independent_public_implementation(plate, gap_area_ratio, velocity):
    # Cross-check: evalHSIncomingAir (a public heat-sink evaluation script, found by code search;
    # repository not identified) solves the same Lee-type balance for a duct, in the other
    # direction (fin velocity -> duct velocity). Fed finkit's fin velocity and pressure drop, it
    # must return the approach velocity finkit started from.
    frontal, channel = plate.frontal_area, plate.open_frontal_area
    bypass = gap_area_ratio * frontal

    def dp(q):
        return sink_pressure_drop(plate, q, RHO, MU, is_shrouded=False)

    split = sink_flow_free_stream_lee(velocity, frontal, channel, dp, RHO, bypass_area=bypass)
    back = _evalhs_incoming_velocity(
        split.channel_velocity, split.pressure_drop, frontal + bypass, channel, bypass
    )
    assert back == pytest.approx(velocity, rel=1e-9)


# --------------------------------------------------------------------------------------
# Limits
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_fully_ducted_is_the_limit_as_the_bypass_area_closes(plate):
    # Identity: A_b -> 0 forces the whole approach flow V_app A_fr through the fins.
    frontal, channel = plate.frontal_area, plate.open_frontal_area

    def dp(q):
        return sink_pressure_drop(plate, q, RHO, MU, is_shrouded=False)

    areas = frontal * np.array([1e-6, 1e-4, 1e-2, 1.0, 1e2])
    split = sink_flow_free_stream_lee(2.5, frontal, channel, dp, RHO, bypass_area=areas)
    ducted = 2.5 * frontal
    assert split.sink_volume_flow[0] == pytest.approx(ducted, rel=1e-4)
    assert np.all(np.diff(split.sink_volume_flow) < 0)  # more room round the sink, less through
    closed = sink_flow_free_stream_lee(2.5, frontal, channel, dp, RHO, bypass_area=0.0)
    assert closed.sink_volume_flow == ducted and closed.bypass_fraction == 0.0
    free = sink_flow_free_stream_lee(2.5, frontal, channel, dp, RHO)
    assert free.sink_volume_flow < split.sink_volume_flow[-1]
    assert free.sink_volume_flow == pytest.approx(split.sink_volume_flow[-1], rel=0.02)


@pytest.mark.identity
def test_channel_velocity_tends_to_the_approach_velocity_as_the_pressure_drop_vanishes():
    # Identity: dp_hs -> 0 leaves rho V_app²/2 = rho V_ch²/2 (a sink that does not resist the
    # stream takes its share of it unchanged).
    area = 2e-3
    for k in (1e-2, 1e-4, 1e-8):
        split = sink_flow_free_stream_lee(4.0, area, area, constant_loss(k, area), RHO)
        assert split.channel_velocity == pytest.approx(4.0, rel=k)
    none = sink_flow_free_stream_lee(4.0, area, area, lambda q: 0.0 * q, RHO)
    assert none.channel_velocity == pytest.approx(4.0, rel=1e-12)
    assert none.bypass_fraction == pytest.approx(0.0, abs=1e-12)


def test_free_stream_is_more_conservative_than_very_wide_duct_gaps(plate):
    # With gaps far wider than the sink the duct-with-gaps network (the fin branch with its
    # channel head, as Lee's balance) tends to the free stream from above: the gaps' friction
    # still holds back a little bypass air.
    from finkit.physics.sink.inputs import Bypass

    air = Air(inlet_temperature=318.15)
    free = solve_airflow(plate, GivenVelocity(2.5), air, FreeStream())
    wide = solve_airflow(plate, GivenVelocity(2.5), air, Bypass(side_gap=0.5, top_gap=0.5))
    assert free.sink_volume_flow < wide.sink_volume_flow


# --------------------------------------------------------------------------------------
# Shapes and bad input
# --------------------------------------------------------------------------------------


@pytest.mark.shape
def test_arrays_of_designs_broadcast_and_match_scalar_solves():
    velocity = np.array([1.0, 2.0, 5.0])
    k = np.array([[0.5], [4.0]])
    area = 1e-3
    split = sink_flow_free_stream_lee(velocity, area, 0.8 * area, constant_loss(k, 0.8 * area), RHO)
    assert split.sink_volume_flow.shape == (2, 3)
    for i in range(2):
        for j in range(3):
            one = sink_flow_free_stream_lee(
                velocity[j], area, 0.8 * area, constant_loss(k[i, 0], 0.8 * area), RHO
            )
            assert split.sink_volume_flow[i, j] == pytest.approx(one.sink_volume_flow, rel=1e-12)
            assert np.ndim(one.sink_volume_flow) == 0
    zero = sink_flow_free_stream_lee(
        np.array([0.0, 1.0]), area, area, constant_loss(1.0, area), RHO
    )
    assert zero.sink_volume_flow[0] == 0.0 and zero.bypass_fraction[0] == 0.0


@pytest.mark.shape
def test_a_sweep_of_designs_solves_in_one_call():
    widths = np.linspace(0.03, 0.08, 6)
    sweep = PlateFinSink(
        base_width=widths,
        base_length=0.05,
        base_thickness=0.003,
        fin_count=10,
        fin_thickness=0.001,
        fin_height=0.02,
    )
    flow = solve_airflow(sweep, GivenVelocity(2.0), Air(inlet_temperature=300.0), FreeStream())
    assert flow.sink_volume_flow.shape == (6,)
    # wider channels resist less, so a smaller share goes round the sink
    share = flow.bypass_volume_flow / flow.volume_flow
    assert np.all(np.diff(share) < 0) and np.all((share > 0) & (share < 1))


@pytest.mark.parametrize(
    ("kwargs", "text"),
    [
        ({"approach_velocity": -1.0}, "approach_velocity = -1.0 m/s; must be finite and >= 0"),
        ({"frontal_area": 0.0}, "frontal_area = 0.0 m²; must be finite and > 0"),
        ({"exit_flow_area": 2e-3}, "exit_flow_area = 0.002 m²; must be > 0 and not above"),
        ({"density": 0.0}, "density = 0.0 kg/m³; must be > 0"),
        ({"bypass_area": -1.0}, "bypass_area = -1.0 m²; must be >= 0 (inf: free stream)"),
    ],
)
def test_bad_physics_input_is_refused_in_one_line(kwargs, text):
    args = {
        "approach_velocity": 2.0,
        "frontal_area": 1e-3,
        "exit_flow_area": 8e-4,
        "sink_pressure_drop": constant_loss(1.0, 8e-4),
        "density": RHO,
    } | kwargs
    with pytest.raises(InputError) as info:
        sink_flow_free_stream_lee(**args)
    assert str(info.value).startswith(text) and "\n" not in str(info.value)


def test_a_fan_against_a_free_stream_is_refused_in_the_physics(plate):
    with pytest.raises(InputError, match="^air.flow.fan: a fan against an unshrouded sink"):
        solve_airflow(plate, FanDriven(fan=None), Air(inlet_temperature=300.0), FreeStream())


def _error_of(data) -> str:
    with pytest.raises(InputError) as info:
        load_case(data)
    return str(info.value)


def test_case_errors_name_the_field_the_value_and_what_is_allowed(stream_case):
    gaps = copy.deepcopy(stream_case)
    gaps["air"]["bypass"] = {"free_stream": True, "top_gap": "5 mm"}
    text = _error_of(gaps)
    assert "air.bypass.free_stream: true means no duct round the sink, so top_gap do not" in text

    fan = copy.deepcopy(stream_case)
    fan["air"]["flow"] = {
        "fan": {
            "volume_flow": ["0 CFM", "5 CFM", "10 CFM"],
            "pressure": ["0.1 inH2O", "0.05 inH2O", "0 inH2O"],
        }
    }
    text = _error_of(fan)
    assert (
        "air.bypass.free_stream: true needs air.flow approach_velocity or volume_flow (got fan)"
        in text
    )

    natural = copy.deepcopy(stream_case)
    natural["air"]["flow"] = {"natural": {"orientation": "vertical-fins"}}
    assert "(got natural): natural convection has no approach stream" in _error_of(natural)

    word = copy.deepcopy(stream_case)
    word["air"]["bypass"] = {"free_stream": "sometimes"}
    assert "air.bypass.free_stream" in _error_of(word)


# --------------------------------------------------------------------------------------
# The whole case
# --------------------------------------------------------------------------------------


def test_the_demo_sink_in_a_free_stream_against_the_same_sink_ducted(stream_case):
    free = run_case(load_case(stream_case))
    ducted_data = copy.deepcopy(stream_case)
    ducted_data["air"].pop("bypass")
    ducted = run_case(load_case(ducted_data))
    share = free.results["bypass_fraction"]
    assert 0.2 < share < 0.9
    assert free.results["sink_volume_flow"] == pytest.approx(
        (1 - share) * free.results["volume_flow"], rel=1e-12
    )
    assert free.results["volume_flow"] == pytest.approx(2.5 * 0.04 * 0.015, rel=1e-12)
    assert float(free.solution.channel_velocity) < 2.5 < float(ducted.solution.channel_velocity)
    # less air through the fins: a higher sink resistance than the fully ducted sink
    assert free.results["sink_resistance"] > 1.1 * ducted.results["sink_resistance"]
    assert is_fin_tip_exposed(free.inputs) and not is_fin_tip_exposed(ducted.inputs)


def test_a_given_volume_flow_is_the_streams_flow_through_the_frontal_area(stream_case):
    by_volume = copy.deepcopy(stream_case)
    by_volume["air"]["flow"] = {"volume_flow": f"{2.5 * 0.04 * 0.015} m^3/s"}
    a = run_case(load_case(stream_case)).results
    b = run_case(load_case(by_volume)).results
    for name in ("sink_resistance", "bypass_fraction", "approach_velocity", "junction_temperature"):
        assert b[name] == pytest.approx(a[name], rel=1e-9)
    inputs = run_case(load_case(by_volume)).inputs
    flow = solve_airflow(inputs.geometry, GivenVolumeFlow(1e-3), inputs.air, inputs.bypass)
    assert flow.approach_velocity == pytest.approx(1e-3 / (0.04 * 0.015))


def test_a_slow_stream_is_warned_about(stream_case):
    slow = copy.deepcopy(stream_case)
    slow["air"]["flow"] = {"approach_velocity": "0.6 m/s"}
    warnings = run_case(load_case(slow)).warnings
    assert any(w.startswith("Lee (1995) bypass balance, sink in a free stream") for w in warnings)
    assert not any("Lee (1995)" in w for w in run_case(load_case(stream_case)).warnings)


def test_check_prints_the_bypass_share_and_channel_velocity(demo_case_file, capsys):
    from finkit.cli import main

    main(["check", str(demo_case_file("nb210-board-stream"))])
    out = capsys.readouterr().out
    line = next(x for x in out.splitlines() if x.startswith("air (nominal condition)"))
    assert "free stream, no duct (Lee 1995" in line and "of the approach flow goes round" in line
    assert "bypass_fraction" in out


def test_the_note_method_names_the_model_its_sources_and_assumptions(stream_case):
    from finkit.report import method

    result = run_case(load_case(stream_case))
    text = str(method.method_section(result)) + str(method.assumptions(result))
    text = text.replace("&#x27;", "'")
    assert "Lee's bypass balance" in text and "Simons &amp; Schmidt" in text
    assert "unbounded" in text and "1-20 m/s" in text
    refs = str(method.references(result))
    assert "Electronics Cooling 3(2)" in refs and "IEEE Trans. CPMT-A 18(4)" in refs


def test_a_free_stream_case_flags_its_model_on_page_one(stream_case):
    from finkit.model.review.flags import sanity_flags

    flags = sanity_flags(load_case(stream_case))
    (flag,) = [f for f in flags if f.startswith("air.bypass.free_stream:")]
    assert "Lee 1995 bypass balance" in flag and "Simons & Schmidt 1997" in flag
    assert not any("no air.bypass is stated" in f for f in flags)


@pytest.mark.slow
def test_the_trade_study_and_the_explorer_take_a_free_stream_case(stream_case):
    from finkit.explorer import explore
    from finkit.model.trade.case_study import run_trade_study
    from finkit.report.trade.text import cautions

    data = copy.deepcopy(stream_case)
    data["trade_study"] = {
        "fin_count": {"low": 5, "high": 12},
        "fin_height": {"low": "8 mm", "high": "25 mm", "points": 4},
        "fin_thickness": {"low": "0.8 mm", "high": "1.5 mm", "points": 2},
        "max_height": "30 mm",
    }
    note = run_trade_study(load_case(data))
    assert note.chosen is not None and note.chosen.meets_limit
    assert "re-solved for each design (Lee" in str(cautions(note)).replace("&#x27;", "'")
    explorer = explore(stream_case)
    assert explorer.error in (None, "")
    share = explorer.result.results["bypass_fraction"]
    explorer.set(fin_count=12)  # denser fins resist more: more of the stream goes round
    assert explorer.result.results["bypass_fraction"] > share
    assert len(explorer.png()) > 10_000


def test_a_pin_fin_sink_in_a_free_stream(demo_case_file):
    data = yaml.safe_load(demo_case_file("nb300-pin-ducted").read_text(encoding="utf-8"))
    data["air"]["flow"] = {"approach_velocity": "3 m/s"}
    data["air"]["bypass"] = {"free_stream": True}
    free = run_case(load_case(data))
    data["air"].pop("bypass")
    ducted = run_case(load_case(data))
    g = free.inputs.geometry
    # the channel velocity is that of the narrowest section between the pins of a row
    narrowest = g.frontal_area * g.min_free_flow_ratio
    assert float(free.solution.channel_velocity) == pytest.approx(
        float(free.solution.sink_volume_flow) / narrowest, rel=1e-12
    )
    assert 0.0 < free.results["bypass_fraction"] < 1.0
    assert free.results["sink_resistance"] > ducted.results["sink_resistance"]
    assert is_fin_tip_exposed(free.inputs)
