"""Tests of finkit.physics.airflow: fan curves, the vectorised operating point, and flow bypass.

The fan tables below are invented shapes (a falling curve, and one with a stall dip); no
published fan is needed because every check is an identity (closed-form intersection, fan
laws, branch balance) or a cross-check against scipy.optimize.brentq or the ``fluids``
library.
"""

import fluids
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from finkit.errors import InputError, NotSupportedError, SolverError
from finkit.physics.airflow import (
    STANDARD_AIR_DENSITY,
    FanCurve,
    bracketed_root,
    bypass_gap_pressure_drop,
    operating_point,
    operating_point_with_bypass,
    power_law_pressure_drop,
    split_bypass,
    split_bypass_at_approach_velocity,
)

FLOWS = [0.0, 0.004, 0.008, 0.011, 0.014, 0.018, 0.022, 0.026]
# falling everywhere (no stall)
FAN = FanCurve(FLOWS, [80.0, 70.0, 58.0, 52.0, 47.0, 38.0, 20.0, 0.0], name="falling")
# a dip: pressure rises from 0.008 to 0.011 m³/s (stall region)
STALL_FAN = FanCurve(FLOWS, [80.0, 70.0, 50.0, 52.0, 50.0, 38.0, 20.0, 0.0], name="dip")

RHO, MU = 1.16, 1.86e-5  # air near 30 °C [kg/m³], [Pa s]


def linear_fan_root(p0, q_max, k):
    """Closed-form root of p0 (1 - Q/q_max) = k Q² (positive branch of the quadratic)."""
    b = p0 / q_max
    return (-b + np.sqrt(b * b + 4.0 * k * p0)) / (2.0 * k)


def random_systems(n, seed):
    rng = np.random.default_rng(seed)
    return rng.uniform(100.0, 3000.0, n), rng.uniform(1.0e4, 5.0e5, n)


# --------------------------------------------------------------------------------------
# Fan curve
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_table_points_are_reproduced_and_outside_is_nan():
    # Identity: an interpolant passes through its data; no extrapolation beyond the table.
    assert np.allclose(FAN.pressure(np.array(FLOWS)), FAN.static_pressure, rtol=0, atol=1e-12)
    assert np.isnan(FAN.pressure(-1e-6)) and np.isnan(FAN.pressure(0.0261))
    assert FAN.free_delivery == 0.026 and FAN.shut_off_pressure == 80.0
    assert FAN.rating_density == STANDARD_AIR_DENSITY == 1.2


@pytest.mark.identity
def test_pchip_is_monotone_between_points():
    # Identity (Fritsch & Carlson 1980): PCHIP keeps the monotonicity of each data interval.
    q = np.linspace(0.0, FAN.free_delivery, 2001)
    assert np.all(np.diff(FAN.pressure(q)) <= 1e-12)
    assert np.all(FAN.slope(q[1:-1]) <= 0)


@pytest.mark.identity
def test_stall_region_detected_from_table():
    assert FAN.stall_ranges == () and not FAN.has_stall_region
    assert STALL_FAN.stall_ranges == ((0.008, 0.011),) and STALL_FAN.has_stall_region
    assert STALL_FAN.is_in_stall_region(0.0095)
    assert not STALL_FAN.is_in_stall_region(0.015)
    assert not STALL_FAN.is_in_stall_region(0.005)


@pytest.mark.identity
def test_density_scaling_follows_fan_laws():
    # Common practice, no source consulted: catalogue curves are for standard air,
    # 1.2 kg/m³ (AMCA 210 / ISO 5801); at constant speed dp ∝ rho at equal volume flow
    # (fan laws, AMCA Publication 99; docs/methods.md h).
    q = np.linspace(0.0, FAN.free_delivery, 9)
    assert np.allclose(FAN.pressure(q, density=1.0), FAN.pressure(q) * 1.0 / 1.2, rtol=1e-14)
    # a purely quadratic (turbulent) system scales with rho too: the volumetric operating
    # point is then independent of density and the pressure scales with rho.
    c = 4.0e5 / 1.2

    def system(rho):
        return lambda flow: c * rho * flow**2

    ref = operating_point(FAN, system(1.2))
    rho = np.array([0.8, 1.0, 1.2, 1.3])
    thin = operating_point(FAN, system(rho), density=rho)
    assert np.allclose(thin.volume_flow, ref.volume_flow, rtol=1e-9)
    assert np.allclose(thin.pressure_drop, ref.pressure_drop * rho / 1.2, rtol=1e-9)


@pytest.mark.identity
def test_speed_scaling_follows_fan_laws():
    # Fan laws (AMCA Publication 99): Q ∝ N, dp ∝ N². Against a quadratic system the
    # operating flow is then proportional to speed (common practice, no source).
    s = 0.7
    slow = FAN.at_speed(s)
    q = np.linspace(0.0, FAN.free_delivery, 50)
    assert np.allclose(slow.pressure(s * q), s**2 * FAN.pressure(q), rtol=1e-12, atol=1e-12)

    def system(flow):
        return 2.0e5 * flow**2

    assert np.isclose(
        operating_point(slow, system).volume_flow,
        s * operating_point(FAN, system).volume_flow,
        rtol=1e-9,
    )


@pytest.mark.identity
@pytest.mark.parametrize("k", [2.0e4, 1.5e5, 1.0e6])
def test_linear_fan_against_quadratic_system_closed_form(k):
    # Identity: dp_fan = p0 (1 - Q/Qmax) (2-point PCHIP is the straight line) crossed with
    # dp_sys = k Q² has the root of k Q² + (p0/Qmax) Q - p0 = 0.
    p0, q_max = 60.0, 0.02
    point = operating_point(FanCurve([0.0, q_max], [p0, 0.0]), lambda q: k * q**2)
    assert np.isclose(point.volume_flow, linear_fan_root(p0, q_max, k), rtol=1e-10)
    assert np.isclose(point.pressure_drop, k * point.volume_flow**2, rtol=1e-9)
    assert point.is_converged and not point.is_in_stall_region


@pytest.mark.identity
@settings(max_examples=60, deadline=None)
@given(
    p0=st.floats(5.0, 2000.0),
    q_max=st.floats(1e-3, 1.0),
    k_scale=st.floats(-2.0, 2.0),
)
def test_linear_fan_closed_form_property(p0, q_max, k_scale):
    # Identity: as above, over random fans and systems (k from 1/100 to 100 times the
    # system that crosses at half free delivery).
    k = 10.0**k_scale * (p0 / 2) / (q_max / 2) ** 2
    point = operating_point(FanCurve([0.0, q_max], [p0, 0.0]), lambda q: k * q**2)
    assert np.isclose(point.volume_flow, linear_fan_root(p0, q_max, k), rtol=1e-9)


@pytest.mark.identity
def test_parallel_and_series_against_hand_computed_points():
    # Hand-computed: two linear fans p0 (1 - Q/Qmax) in parallel give p0 (1 - Q/(2 Qmax));
    # in series 2 p0 (1 - Q/Qmax); each crossed with k Q² has a closed-form root.
    p0, q_max, k = 60.0, 0.02, 2.0e5
    fan = FanCurve([0.0, q_max], [p0, 0.0])

    def system(q):
        return k * q**2

    parallel = operating_point(fan.combined(2, "parallel"), system)
    series = operating_point(fan.combined(2, "series"), system)
    assert np.isclose(parallel.volume_flow, linear_fan_root(p0, 2 * q_max, k), rtol=1e-10)
    assert np.isclose(series.volume_flow, linear_fan_root(2 * p0, q_max, k), rtol=1e-10)
    # with a curved table: parallel flow at equal pressure is n times, series pressure n times
    q = np.linspace(0.0, FAN.free_delivery, 37)
    assert np.allclose(FAN.combined(3, "parallel").pressure(3 * q), FAN.pressure(q), atol=1e-12)
    assert np.allclose(FAN.combined(3, "series").pressure(q), 3 * FAN.pressure(q), atol=1e-12)


@pytest.mark.identity
def test_failed_fan_without_leak_is_the_running_fans():
    assert FAN.with_failed(3, 1).volume_flow == FAN.combined(2).volume_flow
    assert (
        FAN.with_failed(3, 1, "series").static_pressure == FAN.combined(2, "series").static_pressure
    )
    assert FAN.with_failed(2, 0).static_pressure == FAN.combined(2).static_pressure


@pytest.mark.identity
def test_failed_fan_leak_path_parallel_against_direct_solution():
    # Identity: 2 running + 1 stopped fan in parallel, the stopped one passing air back with
    # dp = R Q_back². At the operating point with a system k Q_net², each running fan
    # delivers q at p(q) and Q_net = 2 q - sqrt(p(q)/R) = sqrt(p(q)/k). Solved directly
    # with brentq on q and compared; tolerance covers the resampled table.
    r, k = 2.0e5, 3.0e4
    net = FAN.with_failed(3, 1, "parallel", stopped_fan_resistance=r)
    point = operating_point(net, lambda q: k * q**2)

    def residual(q):
        p = max(float(FAN.pressure(q)), 0.0)  # PCHIP may round to -1e-16 at free delivery
        return 2 * q - np.sqrt(p / r) - np.sqrt(p / k)

    q_fan = brentq(residual, 1e-9, FAN.free_delivery)
    q_net = np.sqrt(float(FAN.pressure(q_fan)) / k)
    assert np.isclose(point.volume_flow, q_net, rtol=1e-4)
    # the leak lowers the flow below the sealed case
    assert point.volume_flow < operating_point(FAN.combined(2), lambda q: k * q**2).volume_flow


@pytest.mark.identity
def test_failed_fan_leak_path_series_against_direct_solution():
    # Identity: 1 running + 1 stopped fan in series: p_net = p(Q) - R Q².
    r, k = 1.0e4, 5.0e4
    net = FAN.with_failed(2, 1, "series", stopped_fan_resistance=r)
    point = operating_point(net, lambda q: k * q**2)
    q_direct = brentq(lambda q: float(FAN.pressure(q)) - r * q * q - k * q * q, 0.0, 0.026)
    assert np.isclose(point.volume_flow, q_direct, rtol=1e-4)


@pytest.mark.parametrize(
    ("kwargs", "pattern"),
    [
        ({"volume_flow": [0.0, 0.01], "static_pressure": [50.0, 20.0, 0.0]}, "static_pressure"),
        ({"volume_flow": [0.001, 0.01], "static_pressure": [50.0, 0.0]}, r"volume_flow\[0\]"),
        ({"volume_flow": [0.0, 0.01, 0.01], "static_pressure": [5, 2, 0]}, r"volume_flow\[2\]"),
        ({"volume_flow": [0.0, 0.02, 0.01], "static_pressure": [5, 2, 0]}, r"volume_flow\[2\]"),
        ({"volume_flow": [0.0, 0.01, 0.02], "static_pressure": [5, 2, 1]}, r"static_pressure\[2\]"),
        ({"volume_flow": [0.0, 0.01, 0.02], "static_pressure": [5, 0, 0]}, r"static_pressure\[1\]"),
        ({"volume_flow": [0.0, np.nan, 0.02], "static_pressure": [5, 2, 0]}, r"volume_flow\[1\]"),
        ({"volume_flow": [0.0], "static_pressure": [0.0]}, "at least 2"),
        (
            {"volume_flow": [0.0, 0.01], "static_pressure": [5, 0], "rating_density": 0},
            "rating_density",
        ),
    ],
)
def test_bad_tables_name_the_field_and_index(kwargs, pattern):
    with pytest.raises(InputError, match=pattern) as err:
        FanCurve(**kwargs)
    assert "\n" not in str(err.value)


def test_fan_table_problems_are_data_one_per_rule():
    from finkit.physics.airflow import fan_table_problems

    assert fan_table_problems([0.0, 0.01, 0.02], [50.0, 20.0, 0.0]) == ()
    problems = fan_table_problems([0.001, 0.01, 0.005], [50.0, 0.0, 3.0, 1.0])
    assert [(p.argument, p.index, p.rule) for p in problems] == [
        ("static_pressure", None, "lengths"),
        ("volume_flow", 0, "not_shut_off"),
        ("volume_flow", 2, "not_increasing"),
        ("static_pressure", 1, "not_positive"),
        ("static_pressure", 3, "not_free_delivery"),
    ]
    assert problems[1].text("FanCurve.").startswith("FanCurve.volume_flow[0] = 0.001 m³/s;")


def test_bad_combinations_raise():
    with pytest.raises(InputError, match="arrangement"):
        FAN.combined(2, "stacked")
    with pytest.raises(InputError, match="count"):
        FAN.combined(0)
    with pytest.raises(InputError, match="count_failed"):
        FAN.with_failed(2, 2)
    with pytest.raises(InputError, match="pressure_factor"):
        FAN.scaled(pressure_factor=-1.0)
    with pytest.raises(InputError, match="density"):
        FAN.pressure(0.01, density=0.0)


def test_leak_model_refuses_non_monotone_net_curve():
    # A steep stall rise (30 -> 60 Pa over 1 L/s) makes the leak grow faster than the fans'
    # flow, so net flow falls with flow there: no single-valued curve exists.
    steep = FanCurve(
        [0.0, 0.004, 0.008, 0.009, 0.014, 0.018, 0.022, 0.026],
        [80.0, 60.0, 30.0, 60.0, 50.0, 38.0, 20.0, 0.0],
    )
    with pytest.raises(NotSupportedError, match="stopped_fan_resistance"):
        steep.with_failed(2, 1, "parallel", stopped_fan_resistance=2.0e6)


# --------------------------------------------------------------------------------------
# Operating point, vectorised
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_operating_point_lies_on_both_curves():
    # Identity: at the solution the fan pressure equals the system pressure drop
    # (relative residual <= 1e-6, as the task asks; the solver reaches ~1e-11).
    a, b = random_systems(5000, seed=3)
    point = operating_point(FAN, lambda q: a * q + b * q**2)
    q = point.volume_flow
    assert point.volume_flow.shape == (5000,) and np.all(point.is_converged)
    system = a * q + b * q**2
    assert np.max(np.abs(FAN.pressure(q) - system) / system) <= 1e-6
    assert np.max(np.abs(point.pressure_drop - system) / system) <= 1e-6


@pytest.mark.identity
def test_operating_point_matches_brentq_per_design():
    # Cross-check: scipy.optimize.brentq (scipy 1.17) on each design's scalar residual.
    a, b = random_systems(200, seed=7)
    point = operating_point(FAN, lambda q: a * q + b * q**2)
    for i in range(a.size):
        q_i = brentq(
            lambda q, i=i: float(FAN.pressure(q)) - a[i] * q - b[i] * q * q,
            0.0,
            FAN.free_delivery,
            xtol=1e-15,
            rtol=1e-13,
        )
        assert point.volume_flow[i] == pytest.approx(q_i, rel=1e-9)


@pytest.mark.identity
def test_stall_fan_takes_highest_flow_crossing_and_flags_stall():
    # Cross-check against brentq on the last sign change found on a fine grid: the solver
    # returns the highest-flow crossing where the fan falls below the system.
    rng = np.random.default_rng(11)
    k = rng.uniform(1.0e5, 1.2e6, 300)
    point = operating_point(STALL_FAN, lambda q: k * q**2)
    assert np.all(point.is_converged)
    grid = np.linspace(0.0, STALL_FAN.free_delivery, 4001)
    for i in range(k.size):
        g = STALL_FAN.pressure(grid) - k[i] * grid**2
        j = np.flatnonzero((g[:-1] >= 0) & (g[1:] < 0))[-1]
        q_i = brentq(
            lambda q, i=i: float(STALL_FAN.pressure(q)) - k[i] * q * q, grid[j], grid[j + 1]
        )
        assert point.volume_flow[i] == pytest.approx(q_i, rel=1e-9)
        assert point.is_in_stall_region[i] == (0.008 < q_i < 0.011)
    assert np.any(point.is_in_stall_region) and not np.all(point.is_in_stall_region)


@pytest.mark.identity
def test_point_in_stall_region_is_flagged():
    # A steep system that meets the dip fan only on its rising part (50 -> 52 Pa between
    # 0.008 and 0.011 m³/s): the root from brentq there, flagged as stall.
    k = 5.65e5
    point = operating_point(STALL_FAN, lambda q: k * q**2)
    q_ref = brentq(lambda q: float(STALL_FAN.pressure(q)) - k * q * q, 0.008, 0.011)
    assert point.volume_flow == pytest.approx(q_ref, rel=1e-9)
    assert point.is_in_stall_region


def test_no_operating_point_gives_nan_and_flag_or_raises():
    # A fouled system needing 100 Pa at zero flow against an 80 Pa shut-off: no crossing.
    offset = np.array([0.0, 100.0, 10.0])
    point = operating_point(FAN, lambda q: offset + 1.0e5 * q**2)
    assert np.isnan(point.volume_flow[1]) and not point.is_converged[1]
    assert np.all(np.isfinite(point.volume_flow[[0, 2]])) and np.all(point.is_converged[[0, 2]])
    with pytest.raises(SolverError, match="1 of 3 design") as err:
        operating_point(FAN, lambda q: offset + 1.0e5 * q**2, raise_on_failure=True)
    assert "\n" not in str(err.value)
    with pytest.raises(SolverError):
        operating_point(FAN, lambda q: 100.0 + 1.0e5 * q**2, raise_on_failure=True)


@pytest.mark.identity
def test_open_system_runs_at_free_delivery():
    # Identity: no resistance at all -> the fan runs at free delivery.
    point = operating_point(FAN, lambda q: 0.0 * q)
    assert point.volume_flow == pytest.approx(FAN.free_delivery, rel=1e-12)


@pytest.mark.shape
def test_scalar_1d_and_broadcast_2d_agree():
    k = np.array([5.0e4, 2.0e5, 8.0e5])
    rho = np.array([[1.0], [1.2]])
    grid = operating_point(FAN, lambda q: k * q**2, density=rho)
    assert grid.volume_flow.shape == (2, 3) and grid.is_converged.shape == (2, 3)
    for i in range(2):
        row = operating_point(FAN, lambda q: k * q**2, density=rho[i, 0])
        assert np.allclose(grid.volume_flow[i], row.volume_flow, rtol=1e-12)
        for j in range(3):
            one = operating_point(FAN, lambda q, j=j: k[j] * q**2, density=float(rho[i, 0]))
            assert np.ndim(one.volume_flow) == 0
            assert grid.volume_flow[i, j] == pytest.approx(float(one.volume_flow), rel=1e-12)


@pytest.mark.identity
def test_bracketed_root_matches_brentq_and_flags_bad_brackets():
    # Cross-check: scipy.optimize.brentq on x³ - 2x - c = 0 over [0, 3].
    c = np.array([0.5, 3.0, 4.0, 5.0, 30.0])  # the last has no root in [0, 3]
    res = bracketed_root(lambda x: x**3 - 2 * x - c, 0.0, 3.0, xrtol=1e-14)
    for i in range(4):
        ref = brentq(lambda x, i=i: x**3 - 2 * x - c[i], 0.0, 3.0, xtol=1e-15)
        assert res.x[i] == pytest.approx(ref, rel=1e-12)
    assert np.all(res.is_converged[:4]) and not res.is_converged[4] and np.isnan(res.x[4])


@pytest.mark.identity
def test_power_law_component():
    # Identity: dp = dp_ref (Q/Q_ref)^n passes through its rated point.
    assert power_law_pressure_drop(0.01, 0.01, 25.0) == pytest.approx(25.0)
    assert power_law_pressure_drop(0.02, 0.01, 25.0, 2.0) == pytest.approx(100.0)
    assert power_law_pressure_drop(0.02, 0.01, 25.0, 1.0) == pytest.approx(50.0)


# --------------------------------------------------------------------------------------
# Bypass gap pressure drop against fluids and closed forms
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_gap_friction_reduces_to_churchill_for_long_round_duct():
    # Cross-check: fluids 1.3 fluids.friction.Churchill_1977(Re, 0) (Darcy) / 4 = Fanning.
    # With the round-duct laminar value f Re = 16 and a very long duct (developing term
    # negligible, L* >= 1), the blend is Churchill's equation itself.
    diameter = 0.01
    area = np.pi * diameter**2 / 4
    reynolds = np.logspace(1, 7, 61)
    speed = reynolds * MU / (RHO * diameter)
    length = 1.0e5
    dp = bypass_gap_pressure_drop(
        speed * area,
        area,
        diameter,
        length,
        RHO,
        MU,
        loss_coefficient=0.0,
        friction_reynolds_product=16.0,
    )
    fanning = dp / (4 * length / diameter * 0.5 * RHO * speed**2)
    ref = np.array([fluids.friction.Churchill_1977(r, 0.0) / 4 for r in reynolds])
    assert np.allclose(fanning, ref, rtol=1e-3)


@pytest.mark.identity
def test_gap_laminar_limit_is_plane_poiseuille():
    # Source: plane Poiseuille flow between parallel plates, dp = 12 mu L Q / (w s³)
    # (e.g. White, Viscous Fluid Flow, 3rd ed., 2006, Sec. 3-3.2), i.e. f Re_Dh = 24 with
    # D_h = 2 s. Long slot, low Re: L* >= 80, developing term <= 0.013 %.
    s, w, length = 2.0e-3, 0.2, 20.0
    q = np.array([1e-5, 5e-5, 1e-4])  # Re_Dh = 2.5 to 25
    dp = bypass_gap_pressure_drop(q, w * s, 2 * s, length, RHO, MU, loss_coefficient=0.0)
    assert np.allclose(dp, 12 * MU * length * q / (w * s**3), rtol=3e-4)


@pytest.mark.published
def test_gap_developing_laminar_against_shah_correlation():
    # Source: Shah, R.K., "A correlation for laminar hydrodynamic entry length solutions for
    # circular and noncircular ducts", J. Fluids Eng. 100(2), 177-179, 1978, parallel plates:
    # f_app Re = 3.44/sqrt(x+) + [K(inf)/(4 x+) + 24 - 3.44/sqrt(x+)] / [1 + C x+^-2],
    # K(inf) = 0.674, C = 2.9e-5 (From memory, as quoted in docs/methods.md e3 and in independent
    # public implementations). The composite used here agrees within 8 % for x+ = 1e-4..0.1
    # (docs/methods.md e3 reports ~7 %).
    s, w = 2.0e-3, 0.3
    diameter = 2 * s
    reynolds = 1500.0
    speed = reynolds * MU / (RHO * diameter)
    x_plus = np.logspace(-4, -1, 31)
    length = x_plus * diameter * reynolds
    dp = bypass_gap_pressure_drop(speed * w * s, w * s, diameter, length, RHO, MU, 0.0)
    f_app_re = dp / (4 * length / diameter * 0.5 * RHO * speed**2) * reynolds
    shah = 3.44 / np.sqrt(x_plus) + (0.674 / (4 * x_plus) + 24 - 3.44 / np.sqrt(x_plus)) / (
        1 + 2.9e-5 / x_plus**2
    )
    assert np.all(np.abs(f_app_re / shah - 1) < 0.08)


@pytest.mark.identity
def test_gap_dynamic_head_matches_fluids_loss_coefficients():
    # Cross-check: fluids 1.3 fluids.core.dP_from_K with fluids.fittings.entrance_sharp
    # (Crane: 0.5) + fluids.fittings.exit_normal (1.0); zero-length gap = pure K loss.
    k = fluids.fittings.entrance_sharp(method="Crane") + fluids.fittings.exit_normal()
    area, q = 5.0e-4, np.array([0.001, 0.004])
    dp = bypass_gap_pressure_drop(q, area, 0.004, 0.0, RHO, MU, loss_coefficient=k)
    ref = [fluids.core.dP_from_K(k, RHO, v) for v in q / area]
    assert np.allclose(dp, ref, rtol=1e-12)
    # the default K = 1 is one velocity head (exit_normal)
    dp1 = bypass_gap_pressure_drop(q, area, 0.004, 0.0, RHO, MU)
    assert np.allclose(
        dp1, [fluids.core.dP_from_K(fluids.fittings.exit_normal(), RHO, v) for v in q / area]
    )


@pytest.mark.identity
def test_gap_pressure_drop_is_continuous_and_rising():
    # Needed by the split solver: rising with flow through the laminar-turbulent blend.
    q = np.linspace(0.0, 0.05, 20001)
    dp = bypass_gap_pressure_drop(q, 1.0e-3, 0.008, 0.1, RHO, MU)
    assert dp[0] == 0.0 and np.all(np.diff(dp) > 0)
    step = np.diff(dp)
    assert np.max(np.abs(step[1:] / step[:-1] - 1)) < 0.02  # no jump or kink anywhere


def test_gap_closed_branch_and_bad_input():
    assert bypass_gap_pressure_drop(0.0, 0.0, 0.0, 0.1, RHO, MU) == 0.0
    assert np.isinf(bypass_gap_pressure_drop(1e-3, 0.0, 0.0, 0.1, RHO, MU))
    with pytest.raises(InputError, match="gap_hydraulic_diameter"):
        bypass_gap_pressure_drop(1e-3, 1e-3, 0.0, 0.1, RHO, MU)
    with pytest.raises(InputError, match="gap_area"):
        bypass_gap_pressure_drop(1e-3, -1e-3, 0.01, 0.1, RHO, MU)


# --------------------------------------------------------------------------------------
# Flow split and fan with bypass
# --------------------------------------------------------------------------------------


def sink_curve(a=800.0, b=2.0e5):
    return lambda q: a * q + b * q**2


def gap_curve(area, diameter=0.006, length=0.1):
    return lambda q: bypass_gap_pressure_drop(q, area, diameter, length, RHO, MU)


@pytest.mark.identity
def test_split_has_equal_pressure_in_both_branches():
    # Identity: parallel branches between the same static pressures (docs/methods.md h).
    total = np.linspace(0.0, 0.03, 31)
    area = np.linspace(1e-4, 2e-3, 31)
    sink, gap = sink_curve(), gap_curve(area)
    split = split_bypass(total, sink, gap)
    assert np.all(split.is_converged)
    assert np.allclose(split.sink_volume_flow + split.bypass_volume_flow, total, rtol=1e-14)
    assert np.allclose(
        sink(split.sink_volume_flow), gap(split.bypass_volume_flow), rtol=1e-9, atol=1e-12
    )
    assert np.allclose(split.pressure_drop, sink(split.sink_volume_flow), rtol=1e-12)


@pytest.mark.identity
def test_split_matches_brentq():
    # Cross-check: scipy.optimize.brentq on dp_sink(Q_hs) - dp_gap(Q - Q_hs) per design.
    sink, total = sink_curve(), 0.02
    for area in (2e-4, 8e-4, 3e-3):
        gap = gap_curve(area)
        q_ref = brentq(lambda x, gap=gap: sink(x) - float(gap(total - x)), 0.0, total, xtol=1e-16)
        assert split_bypass(total, sink, gap).sink_volume_flow == pytest.approx(q_ref, rel=1e-9)


@pytest.mark.identity
def test_more_bypass_gap_means_less_flow_through_fins():
    area = np.linspace(1e-4, 4e-3, 40)
    given = split_bypass(0.02, sink_curve(), gap_curve(area))
    assert np.all(np.diff(given.sink_volume_flow) < 0)
    with_fan = operating_point_with_bypass(FAN, sink_curve(), gap_curve(area))
    assert np.all(with_fan.is_converged)
    assert np.all(np.diff(with_fan.sink_volume_flow) < 0)
    assert np.all(np.diff(with_fan.volume_flow) > 0)  # a leakier duct passes more air overall


@pytest.mark.identity
def test_split_closed_gap_and_zero_flow():
    split = split_bypass(np.array([0.0, 0.01]), sink_curve(), gap_curve(0.0, diameter=0.0))
    assert np.allclose(split.sink_volume_flow, [0.0, 0.01]) and np.all(
        split.bypass_volume_flow == 0
    )
    assert np.allclose(split.pressure_drop, sink_curve()(np.array([0.0, 0.01])))


@pytest.mark.identity
def test_split_at_approach_velocity_is_split_at_volume_flow():
    velocity, duct = np.array([0.5, 1.0, 2.5]), 0.004
    a = split_bypass_at_approach_velocity(velocity, duct, sink_curve(), gap_curve(6e-4))
    b = split_bypass(velocity * duct, sink_curve(), gap_curve(6e-4))
    assert np.allclose(a.sink_volume_flow, b.sink_volume_flow, rtol=1e-14)


@pytest.mark.identity
def test_fan_with_bypass_and_extra_loss_balances():
    # Identity: fan pressure = branch pressure drop + series loss; flows add up; the
    # branch balance holds at the operating point.
    area = np.array([2e-4, 6e-4, 1.5e-3])

    def extra(q):
        return power_law_pressure_drop(q, 0.02, 15.0, 1.8)

    point = operating_point_with_bypass(FAN, sink_curve(), gap_curve(area), extra, density=1.1)
    assert np.all(point.is_converged)
    q = point.volume_flow
    assert np.allclose(point.sink_volume_flow + point.bypass_volume_flow, q, rtol=1e-14)
    assert np.allclose(point.pressure_drop, point.sink_pressure_drop + extra(q), rtol=1e-9)
    assert np.allclose(point.pressure_drop, FAN.pressure(q, density=1.1), rtol=1e-12)
    assert np.allclose(
        sink_curve()(point.sink_volume_flow), gap_curve(area)(point.bypass_volume_flow), rtol=1e-9
    )


@pytest.mark.identity
def test_fan_with_closed_bypass_equals_plain_operating_point():
    point = operating_point_with_bypass(FAN, sink_curve(), gap_curve(0.0, diameter=0.0))
    plain = operating_point(FAN, sink_curve())
    assert point.volume_flow == pytest.approx(float(plain.volume_flow), rel=1e-10)
    assert point.bypass_volume_flow == 0.0


def test_fan_with_bypass_no_point_flags_or_raises():
    offset = np.array([0.0, 200.0])

    def extra(q):
        return offset + 0.0 * q

    point = operating_point_with_bypass(FAN, sink_curve(), gap_curve(5e-4), extra)
    assert point.is_converged[0] and not point.is_converged[1]
    assert np.isnan(point.sink_volume_flow[1])
    with pytest.raises(SolverError, match="operating_point_with_bypass"):
        operating_point_with_bypass(
            FAN, sink_curve(), gap_curve(5e-4), extra, raise_on_failure=True
        )


@pytest.mark.identity
def test_newton_fast_path_with_bypass_equals_the_nested_solve():
    # Identity: the two-variable Newton fast path of operating_point_with_bypass reaches the
    # same balance as the nested bracketed solve (operating_point over split_bypass).
    rng = np.random.default_rng(11)
    n = 400
    fan = FanCurve([0.0, 0.003, 0.006, 0.009, 0.012], [90.0, 75.0, 55.0, 30.0, 0.0])
    a = rng.uniform(500.0, 8000.0, n)
    b = rng.uniform(1.0e5, 3.0e6, n)
    gap = rng.uniform(2.0e-5, 6.0e-4, n)
    factor = rng.uniform(0.8, 1.1, n)

    def sink(q):
        return a * q + b * q * q

    def gaps(q):
        return bypass_gap_pressure_drop(q, gap, 0.004, 0.05, 1.16, 1.86e-5)

    fast = operating_point_with_bypass(fan, sink, gaps, density=1.16, pressure_factor=factor)

    def system(q):
        return split_bypass(q, sink, gaps).pressure_drop / factor

    nested = operating_point(fan, system, density=1.16)
    assert np.all(fast.is_converged)
    np.testing.assert_allclose(fast.volume_flow, nested.volume_flow, rtol=1e-7)
    np.testing.assert_allclose(fast.pressure_drop, fan.pressure(fast.volume_flow, 1.16) * factor)
    np.testing.assert_allclose(
        sink(fast.sink_volume_flow), gaps(fast.bypass_volume_flow), rtol=1e-7
    )
