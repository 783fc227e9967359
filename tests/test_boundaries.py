"""Physics at correlation boundaries and at the edges of the input space (issue 12).

Sweeps across the Reynolds numbers where a published correlation changes branch, the second
pin-bank correlation, the plate-channel models near transition, the end-fin faces and the
separate bypass branches. Each check names its source beside it.
"""

from __future__ import annotations

import ht
import numpy as np
import pytest
from scipy.optimize import brentq

from finkit.constants import CUBIC_FOOT_PER_MINUTE as CFM
from finkit.constants import ZERO_CELSIUS
from finkit.physics.airflow import bypass_gap_pressure_drop
from finkit.physics.correlations import forced
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink import (
    Air,
    Bypass,
    GivenVolumeFlow,
    HeatSource,
    ModelOptions,
    SinkMaterial,
    sink_pressure_drop,
    solve_airflow,
    solve_temperatures,
)

PR = 0.71
#: Largest change of h between neighbouring points of a 200-point logarithmic sweep from
#: Re_D,max = 50 to 3000 (points 2.1 % apart): the joined Zukauskas curve has a local slope
#: d ln h / d ln Re of at most 1.48 (in-line band above 1000), so at most
#: exp(1.48 x 0.0206) - 1 = 3.1 %; the published table steps by up to 29 % there.
NEIGHBOUR_STEP = 0.035


# --------------------------------------------------------------------------------------
# Pin banks: Zukauskas branches joined, the warning carries the real step
# --------------------------------------------------------------------------------------
@pytest.mark.identity
@pytest.mark.parametrize("arrangement", ["inline", "staggered"])
@pytest.mark.parametrize("pitches", [(0.007, 0.007), (0.014, 0.005)], ids=["square", "wide"])
def test_zukauskas_sweep_across_100_500_1000_has_no_step(arrangement, pitches):
    # Table F1 of docs/methods.md (Zukauskas 1987 as tabulated by Bejan 2013): the published
    # branches step at 100 (in-line, -8 %), 500 (staggered, +27 %) and 1000 (in-line +27 %).
    st, sl = pitches
    re = np.geomspace(50.0, 3000.0, 200)
    joined = forced.nusselt_pin_bank_zukauskas(re, PR, 25, arrangement, st, sl)
    table = forced.nusselt_pin_bank_zukauskas(re, PR, 25, arrangement, st, sl, join_branches=False)
    assert np.max(np.abs(np.diff(np.log(table)))) > 0.08  # the published table does step
    assert np.max(np.abs(joined[1:] / joined[:-1] - 1.0)) <= NEIGHBOUR_STEP
    assert np.all(joined <= table * (1 + 1e-12))  # never above the published table
    # equal to the table outside the bands (a factor 1.4 on one side of each boundary)
    far = np.ones_like(re, bool)
    for b in forced.ZUKAUSKAS_BRANCHES[arrangement]:
        far &= (re < b / 1.4) | (re >= b * 1.4)
    np.testing.assert_allclose(joined[far], table[far], rtol=1e-12)
    # and continuous on a fine grid: the local slope stays below the documented 1.5
    fine = np.geomspace(50.0, 3000.0, 100_000)
    nu = forced.nusselt_pin_bank_zukauskas(fine, PR, 25, arrangement, st, sl)
    assert np.max(np.diff(np.log(nu)) / np.diff(np.log(fine))) < 1.5


PIN_FLOW = dict(
    base_width=0.07,
    pin_diameter=0.003,
    pin_height=0.025,
    transverse_pitch=0.007,
    longitudinal_pitch=0.007,
    row_count=10,
    density=1.1,
    dynamic_viscosity=1.9e-5,
    thermal_conductivity=0.027,
    prandtl=PR,
)


@pytest.mark.identity
@pytest.mark.parametrize("method", forced.PIN_BANK_METHODS)
def test_pin_flow_sweep_has_no_step_in_h(method):
    # Airflow sweep of a pin array through Re_D,max = 100...1500 (200 points): h changes
    # smoothly whichever model is chosen (the issue saw 100 -> 130 W/m2K between neighbours).
    q = np.geomspace(0.0015, 0.02, 200)
    flow = forced.pin_fin_bank_flow(q, **PIN_FLOW, arrangement="staggered", method=method)
    assert flow.reynolds_max[0] < 500 < flow.reynolds_max[-1]
    h = flow.heat_transfer_coefficient
    assert np.max(np.abs(h[1:] / h[:-1] - 1.0)) <= NEIGHBOUR_STEP


@pytest.mark.identity
def test_join_warning_states_the_real_step():
    # Staggered, square pitch: the published table steps by +27 % at Re_D,max = 500
    # (1.04 Re^0.4 -> 0.71 Re^0.5). Just above it the warning gives that number and how far the
    # joined value lies below the table.
    q = np.array([0.0032])
    flow = forced.pin_fin_bank_flow(q, **PIN_FLOW, arrangement="staggered", method="zukauskas")
    assert 500 < float(flow.reynolds_max[0]) < 700
    messages = [m for m in forced.pin_fin_flow_warnings(flow) if m.startswith("Zukauskas")]
    assert len(messages) == 1
    assert "steps by +27 %" in messages[0] and "500 to 700" in messages[0]
    table = forced.nusselt_pin_bank_zukauskas(
        flow.reynolds_max, PR, 10, "staggered", 0.007, 0.007, join_branches=False
    )
    below = 1 - float(flow.nusselt_zukauskas[0] / table[0])
    assert f"{100 * below:.0f} % below the table" in messages[0]
    far = forced.pin_fin_bank_flow(0.02, **PIN_FLOW, arrangement="staggered", method="zukauskas")
    assert not any(m.startswith("Zukauskas") for m in forced.pin_fin_flow_warnings(far))


@pytest.mark.published
def test_staggered_wide_transverse_pitch_branch():
    # Incropera et al. 6th ed. Table 7.5 (Zukauskas 1972), from memory [R in docs/methods.md f1]:
    # staggered, 1e3 < Re < 2e5: C = 0.35 (S_T/S_L)^(1/5) for S_T/S_L < 2 and C = 0.40 for
    # S_T/S_L > 2, m = 0.60. Confirmed by derivation: 0.35 x 2^0.2 = 0.402, so the two agree
    # (within rounding) where they meet.
    re = 5000.0
    wide = forced.nusselt_pin_bank_zukauskas(re, PR, 25, "staggered", 0.03, 0.01)
    assert float(wide) == pytest.approx(0.40 * re**0.6 * PR**0.36, rel=1e-12)
    at_two = forced.nusselt_pin_bank_zukauskas(re, PR, 25, "staggered", 0.02, 0.01)
    assert float(at_two) == pytest.approx(float(wide), rel=0.006)


# --------------------------------------------------------------------------------------
# Pin banks: the second correlation (Gnielinski, VDI Heat Atlas)
# --------------------------------------------------------------------------------------
@pytest.mark.published
@pytest.mark.parametrize(
    "arrangement,pitches", [("inline", (0.007, 0.007)), ("staggered", (0.007, 0.006))]
)
@pytest.mark.parametrize("velocity", [0.5, 2.0, 5.0, 20.0])
@pytest.mark.parametrize("rows", [3, 8, 12])
def test_gnielinski_bank_against_ht(arrangement, pitches, velocity, rows):
    # Cross-check: ht 1.2 Nu_HEDH_tube_bank (the same Gnielinski method from Schluender (ed.),
    # Heat Exchanger Design Handbook, 1983). Called with the Reynolds number on the streamed
    # length l = pi D / 2 (VDI Heat Atlas ch. G7; the FluidDissipation library uses the same
    # l), it returns Nu on l; ht infers "staggered" from S_T != S_L, so the pitches are chosen
    # accordingly.
    st, sl = pitches
    d, rho, mu = 0.003, 1.0, 1.9e-5
    nu_d, _ = forced.nusselt_pin_bank_gnielinski(
        velocity, d, st, sl, rows, arrangement, rho, mu, PR
    )
    length = np.pi * d / 2
    theirs = ht.Nu_HEDH_tube_bank(
        Re=velocity * length * rho / mu,
        Pr=PR,
        Do=d,
        tube_rows=rows,
        pitch_parallel=sl,
        pitch_normal=st,
    )
    assert float(nu_d) * np.pi / 2 == pytest.approx(theirs, rel=1e-12)


@pytest.mark.published
def test_gnielinski_bank_worked_example():
    # Baehr & Stephan, Heat and Mass Transfer, Springer 2013, Example 3.11 as quoted in the ht
    # 1.2 documentation of Nu_HEDH_tube_bank: in-line, 11 rows, S_T = S_L = 50 mm, D = 25 mm,
    # Re = 10263.37 (on l, upstream velocity), Pr = 0.708 -> Nu = 149.19 (on l).
    d = 0.025
    length = np.pi * d / 2
    velocity = 10263.37 * 1.5e-5 / length
    nu_d, _ = forced.nusselt_pin_bank_gnielinski(
        velocity, d, 0.05, 0.05, 11, "inline", 1.0, 1.5e-5, 0.708
    )
    assert float(nu_d) * np.pi / 2 == pytest.approx(149.187, rel=1e-4)


@pytest.mark.identity
def test_short_pins_and_pitch_outside_the_data_are_flagged():
    # Tube-bank data come from long tubes (H/D >= 4 is finkit's threshold, common practice, no
    # source) and pitch ratios of about 1.25-3 (from memory: Zukauskas 1972, VDI ch. G7).
    short = forced.pin_fin_bank_flow(
        0.004, **{**PIN_FLOW, "pin_height": 0.009}, arrangement="inline"
    )
    assert any("H/D" in m for m in forced.pin_fin_flow_warnings(short))
    wide = forced.pin_fin_bank_flow(
        0.004, **{**PIN_FLOW, "transverse_pitch": 0.012}, arrangement="inline"
    )
    assert any("S_T/D" in m and "Zukauskas" in m for m in forced.pin_fin_flow_warnings(wide))
    demo_like = forced.pin_fin_bank_flow(0.004, **PIN_FLOW, arrangement="staggered")
    assert not any("H/D" in m or "S_T/D" in m for m in forced.pin_fin_flow_warnings(demo_like))


# --------------------------------------------------------------------------------------
# Plate channels near transition
# --------------------------------------------------------------------------------------
PLATE = PlateFinSink(
    base_width=0.08,
    base_length=0.06,
    base_thickness=0.005,
    fin_count=14,
    fin_thickness=0.0012,
    fin_height=0.03,
)
ALUMINIUM = SinkMaterial(thermal_conductivity=200.0, emissivity=0.0)
SOURCE = HeatSource(40.0, 0.025, 0.025, 0.35, 0.05)
AIR = Air(inlet_temperature=ZERO_CELSIUS + 45.0)


@pytest.fixture(scope="module")
def transition_sweep():
    """200 flows taking the demo-like plate sink through Re_2b = 2300 (and Re_Dh = 2300)."""
    q = np.geomspace(8.0, 40.0, 200) * CFM
    return {
        method: solve_temperatures(
            PLATE,
            ALUMINIUM,
            SOURCE,
            AIR,
            GivenVolumeFlow(q),
            options=ModelOptions(plate_channel_method=method),
        )
        for method in ("lower", "teertstra", "vdi")
    }


@pytest.mark.identity
def test_plate_sweep_across_transition_has_no_step(transition_sweep):
    # The old model switched from Teertstra to the VDI transition value at Re_2b = 2300 and
    # stepped there; each model is now continuous and the default takes, design by design,
    # the higher sink resistance of the two. Neighbouring points are 0.8 % apart in flow; the
    # sink resistance (about proportional to flow^-0.5) may change 1 % between them.
    base = transition_sweep["lower"]
    for sol in transition_sweep.values():
        r = sol.sink_resistance
        assert np.all(np.diff(r) < 0)  # more flow, less resistance
        assert np.max(np.abs(r[1:] / r[:-1] - 1.0)) < 0.01
    np.testing.assert_allclose(
        base.sink_resistance,
        np.maximum(
            transition_sweep["teertstra"].sink_resistance, transition_sweep["vdi"].sink_resistance
        ),
        rtol=1e-6,
    )


@pytest.mark.identity
def test_plate_sweep_really_crosses_transition():
    q = np.array([8.0, 40.0]) * CFM
    film = air_properties(AIR.inlet_temperature + 20.0, AIR.pressure)
    flow = forced.plate_fin_channel_flow(
        q,
        PLATE.base_width,
        PLATE.fin_count,
        PLATE.fin_thickness,
        PLATE.fin_height,
        PLATE.base_length,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
    )
    re_2b = 2 * flow.reynolds_spacing
    assert re_2b[0] < 2300 < re_2b[1]
    assert flow.reynolds_hydraulic[0] < 2300 < flow.reynolds_hydraulic[1]
    # the transition message is length-aware: a 60 mm channel is far shorter than the laminar
    # entry length 0.05 Re_Dh D_h (Incropera et al. 6th ed., Eq. 8.3)
    message = forced.plate_channel_transition_warnings(flow)
    assert len(message) == 1 and "shorter than the laminar entry length" in message[0]


@pytest.mark.identity
def test_plate_spread_rows_differ_near_transition(transition_sweep):
    # Above transition the two plate-channel models differ (the old "teertstra" option fell
    # back to VDI there, so its spread rows were identical).
    above = slice(150, None)
    t = transition_sweep["teertstra"].sink_resistance[above]
    v = transition_sweep["vdi"].sink_resistance[above]
    assert np.min(np.abs(t / v - 1.0)) > 0.02


# --------------------------------------------------------------------------------------
# Edges: end-fin faces, separate bypass branches
# --------------------------------------------------------------------------------------
@pytest.mark.identity
def test_end_fin_outer_faces_are_not_wetted():
    # With a hand-given h, a near-ideal conductor (fin efficiency -> 1) and the inlet-referenced
    # model, R_sink = 1/(h A_wet) with A_wet = 2 (N - 1) H L + (N - 1) b L: the channels' faces
    # and floors only (common practice, no source: the shrouded channel model sends no air to
    # the outer faces of the end fins).
    h = 40.0
    options = ModelOptions(plate_channel_method="teertstra", heat_transfer_coefficient_override=h)
    metal = SinkMaterial(thermal_conductivity=1e9)
    sol = solve_temperatures(PLATE, metal, SOURCE, AIR, GivenVolumeFlow(20 * CFM), options=options)
    n, hf, length = PLATE.fin_count, PLATE.fin_height, PLATE.base_length
    spacing = (PLATE.base_width - n * PLATE.fin_thickness) / (n - 1)
    wetted = 2 * (n - 1) * hf * length + (n - 1) * spacing * length
    assert float(sol.sink_resistance) == pytest.approx(1.0 / (h * wetted), rel=1e-6)


@pytest.mark.identity
@pytest.mark.parametrize("gaps", [(0.001, 0.006), (0.006, 0.001), (0.004, 0.003)])
def test_side_and_top_gaps_are_separate_branches(gaps):
    # Three parallel branches between the same pressures (docs/methods.md h): the fins, the two side
    # gaps and the top gap, each gap with its own width in its friction. The fin branch spends
    # the sink's pressure drop plus its channel velocity head, as in Lee's (1995) balance (the
    # gaps their one dynamic head). Solved here independently with brentq on the common
    # pressure drop.
    side, top = gaps
    bypass = Bypass(side_gap=side, top_gap=top)
    total = 20 * CFM
    air = air_properties(AIR.inlet_temperature, AIR.pressure)
    rho, mu = air.density, air.dynamic_viscosity
    flow = solve_airflow(PLATE, GivenVolumeFlow(total), AIR, bypass)
    shrouded = top <= 0

    channel = (PLATE.base_width - PLATE.fin_count * PLATE.fin_thickness) * PLATE.fin_height

    def sink(q):
        head = 0.5 * rho * (q / channel) ** 2
        return float(sink_pressure_drop(PLATE, q, rho, mu, is_shrouded=shrouded)) + head

    def gap(area, width):
        return lambda q: float(
            bypass_gap_pressure_drop(q, area, 2 * width, PLATE.base_length, rho, mu)
        )

    side_dp = gap(2 * side * PLATE.fin_height, side)
    top_dp = gap(top * (PLATE.base_width + 2 * side), top)

    def flow_at(dp_fun, dp):
        return brentq(lambda q: dp_fun(q) - dp, 0.0, total, xtol=1e-14)

    dp = brentq(
        lambda p: flow_at(sink, p) + flow_at(side_dp, p) + flow_at(top_dp, p) - total,
        1e-6,
        sink(total),
        xtol=1e-12,
    )
    assert float(flow.sink_volume_flow) == pytest.approx(flow_at(sink, dp), rel=1e-6)
    assert float(flow.pressure_drop) == pytest.approx(dp, rel=1e-6)


@pytest.mark.identity
def test_fan_with_two_bypass_branches_one_system_or_nested():
    # The fan solver takes the side and top gaps as separate unknowns (one Newton system with
    # an arrow-shaped Jacobian); combining them first into one branch by a nested split must
    # give the same operating point.
    from finkit.physics.airflow import FanCurve, operating_point_with_bypass, parallel_pressure_drop

    air = air_properties(AIR.inlet_temperature, AIR.pressure)
    rho, mu = air.density, air.dynamic_viscosity
    fan = FanCurve(
        volume_flow=np.array([0.0, 10.0, 20.0, 30.0, 40.0]) * CFM,
        static_pressure=np.array([0.40, 0.33, 0.22, 0.10, 0.0]) * 249.0889,
    )
    side, top = np.array([0.001, 0.004, 0.006]), np.array([0.006, 0.003, 0.0])

    def sink(q):
        return sink_pressure_drop(PLATE, q, rho, mu, is_shrouded=False)

    branches = (
        lambda q: bypass_gap_pressure_drop(
            q, 2 * side * PLATE.fin_height, 2 * side, PLATE.base_length, rho, mu
        ),
        lambda q: bypass_gap_pressure_drop(
            q, top * (PLATE.base_width + 2 * side), 2 * top, PLATE.base_length, rho, mu
        ),
    )
    joint = operating_point_with_bypass(fan, sink, branches, density=rho)
    nested = operating_point_with_bypass(fan, sink, parallel_pressure_drop(branches), density=rho)
    assert np.all(joint.is_converged) and np.all(nested.is_converged)
    np.testing.assert_allclose(joint.sink_volume_flow, nested.sink_volume_flow, rtol=1e-6)
    np.testing.assert_allclose(joint.volume_flow, nested.volume_flow, rtol=1e-6)


@pytest.mark.identity
def test_given_flow_split_among_branches_is_the_nested_split():
    # The given-flow split solves the fins, the side gaps and the top gap as one Newton system
    # (issue 15); the nested split of parallel_pressure_drop stays the reference and must give
    # the same flows, for several flows at once, a zero flow and a closed top gap (top = 0).
    from finkit.physics.airflow import parallel_pressure_drop, split_among_branches, split_bypass
    from finkit.physics.airflow.bypass import _split_newton

    air = air_properties(AIR.inlet_temperature, AIR.pressure)
    rho, mu = air.density, air.dynamic_viscosity
    total = np.array([0.0, 2.0, 10.0, 20.0, 40.0]) * CFM
    for side, top in [(0.001, 0.006), (0.004, 0.003), (0.006, 0.0)]:

        def sink(q, top=top):
            return sink_pressure_drop(PLATE, q, rho, mu, is_shrouded=top <= 0)

        def side_dp(q, side=side):
            return bypass_gap_pressure_drop(
                q, 2 * side * PLATE.fin_height, 2 * side, PLATE.base_length, rho, mu
            )

        def top_dp(q, side=side, top=top):
            if top <= 0:
                return np.where(np.asarray(q) > 0, np.inf, 0.0)
            return bypass_gap_pressure_drop(
                q, top * (PLATE.base_width + 2 * side), 2 * top, PLATE.base_length, rho, mu
            )

        joint = split_among_branches(total, sink, (side_dp, top_dp))
        assert np.all(_split_newton(total, sink, (side_dp, top_dp))[2])  # Newton, no fallback
        nested = split_bypass(total, sink, parallel_pressure_drop((side_dp, top_dp)))
        assert np.all(joint.is_converged)
        np.testing.assert_allclose(joint.sink_volume_flow, nested.sink_volume_flow, rtol=1e-7)
        np.testing.assert_allclose(joint.bypass_volume_flow, nested.bypass_volume_flow, atol=1e-12)
        np.testing.assert_allclose(joint.pressure_drop, nested.pressure_drop, rtol=1e-7)
        assert joint.sink_volume_flow[0] == 0.0 and joint.pressure_drop[0] == 0.0
