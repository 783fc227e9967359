"""Tests of finkit.physics.fins.numeric.solve_fin: closed forms, first integrals and balances."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import finkit.physics.fins.numeric as numeric
from finkit.constants import STEFAN_BOLTZMANN
from finkit.errors import InputError, SolverError
from finkit.physics.fins import (
    annular_fin_efficiency,
    pin_fin_concave_parabolic,
    pin_fin_conical,
    pin_fin_section,
    solve_fin,
    straight_fin_concave_parabolic,
    straight_fin_triangular,
    uniform_fin,
)

FAST = settings(max_examples=25, deadline=None)
T_AIR = 298.15


@pytest.mark.identity
@FAST
@given(
    length=st.floats(2e-3, 0.3),
    d=st.floats(1e-3, 1e-2),
    k=st.floats(5.0, 400.0),
    h=st.floats(2.0, 300.0),
    theta_b=st.floats(-60.0, 120.0).filter(lambda v: abs(v) > 0.5),
    tip=st.sampled_from(["convective", "adiabatic", "prescribed"]),
)
def test_constant_properties_equal_closed_form(length, d, k, h, theta_b, tip):
    # Incropera Table 3.4 cases A, B, C (finkit.physics.fins.analytic) against the BVP solution.
    s = pin_fin_section(d)
    p, a = float(s.perimeter), float(s.cross_section_area)
    theta_l = 0.3 * theta_b
    num = solve_fin(
        length, p, a, k, T_AIR + theta_b, T_AIR, h, tip=tip, tip_temperature=T_AIR + theta_l
    )
    ana = uniform_fin(length, p, a, k, h, theta_b, tip=tip, tip_temperature_difference=theta_l)
    assert num.converged
    assert num.heat_rate == pytest.approx(float(ana.heat_rate), rel=1e-6)
    assert num.efficiency == pytest.approx(float(ana.efficiency), rel=1e-6)
    assert num.fin_surface_area == pytest.approx(float(ana.fin_surface_area), rel=1e-10)


@pytest.mark.identity
@pytest.mark.parametrize(
    ("r1", "r2", "t", "k", "h"),
    [
        (0.01, 0.03, 1e-3, 200.0, 60.0),
        (0.005, 0.04, 5e-4, 150.0, 150.0),
        (0.02, 0.025, 2e-3, 15.0, 30.0),
    ],
)
def test_annular_fin_equals_bessel_solution(r1, r2, t, k, h):
    # Radial fin written as a variable-section fin: x = r - r1, P = 2·2πr, A_c = 2πr t,
    # adiabatic at r2 (the Bessel form with tip="adiabatic").
    num = solve_fin(
        r2 - r1,
        lambda x: 4 * np.pi * (r1 + x),
        lambda x: 2 * np.pi * (r1 + x) * t,
        k,
        350.0,
        300.0,
        h,
        tip="adiabatic",
    )
    exact = float(annular_fin_efficiency(r1, r2, t, k, h, tip="adiabatic"))
    assert num.efficiency == pytest.approx(exact, rel=1e-6)
    assert num.fin_surface_area == pytest.approx(2 * np.pi * (r2**2 - r1**2), rel=1e-10)


@pytest.mark.identity
@pytest.mark.parametrize("ml", [0.3, 1.0, 2.5])
def test_tapered_profiles_equal_closed_forms(ml):
    # Incropera Table 3.5 tapered fins (slender-fin efficiencies) against the BVP with the
    # corresponding A_c(x), P(x); x from the base, pointed tip at x = L.
    k, h, length = 200.0, 50.0, 0.03
    t = 2 * h * length**2 / (k * ml**2)  # m L = ml for the straight fins, m = sqrt(2h/(kt))
    d = 4 * h * length**2 / (k * ml**2)  # m L = ml for the pins, m = sqrt(4h/(kD))
    cases = [
        (straight_fin_triangular(length, t, k, h), 2.0, lambda x: t * (1 - x / length)),
        (straight_fin_concave_parabolic(length, t, k, h), 2.0, lambda x: t * (1 - x / length) ** 2),
        (
            pin_fin_conical(length, d, k, h),
            lambda x: np.pi * d * (1 - x / length),
            lambda x: np.pi * d**2 / 4 * (1 - x / length) ** 2,
        ),
        (
            pin_fin_concave_parabolic(length, d, k, h),
            lambda x: np.pi * d * (1 - x / length) ** 2,
            lambda x: np.pi * d**2 / 4 * (1 - x / length) ** 4,
        ),
    ]
    for closed, perimeter, area in cases:
        num = solve_fin(length, perimeter, area, k, 350.0, 300.0, h, tip="adiabatic")
        assert num.efficiency == pytest.approx(float(closed.efficiency), rel=1e-5)


@pytest.mark.identity
@pytest.mark.parametrize("beta", [-1.5e-3, 2e-3, 5e-3])
def test_long_fin_with_linear_conductivity_first_integral(beta):
    # First integral of the infinitely long fin, k = k0 (1 + beta θ), constant h (methods d):
    # q_b = M sqrt(1 + 2 beta θ_b / 3).
    s = pin_fin_section(0.005)
    p, a = float(s.perimeter), float(s.cross_section_area)
    k0, h, theta_b = 50.0, 20.0, 80.0
    num = solve_fin(
        2.0,
        p,
        a,
        lambda temp: k0 * (1 + beta * (temp - T_AIR)),
        T_AIR + theta_b,
        T_AIR,
        h,
        tip="adiabatic",
    )
    expected = np.sqrt(h * p * k0 * a) * theta_b * np.sqrt(1 + 2 * beta * theta_b / 3)
    assert num.temperature[-1] - T_AIR < 1e-6 * theta_b  # the fin is effectively infinite
    assert num.heat_rate == pytest.approx(expected, rel=1e-6)


@pytest.mark.identity
@pytest.mark.parametrize("theta_b", [20.0, 60.0])
def test_long_fin_with_natural_convection_power_law_first_integral(theta_b):
    # h = C θ^(1/4), constant k: q_b = sqrt((8/9) k A_c P C) θ_b^(9/8) (methods d). The
    # excess temperature decays algebraically (~x^-8), so the fin must be long.
    s = pin_fin_section(0.005)
    p, a = float(s.perimeter), float(s.cross_section_area)
    k, c = 50.0, 1.5
    num = solve_fin(
        4.0, p, a, k, T_AIR + theta_b, T_AIR, lambda th: c * np.abs(th) ** 0.25, tip="adiabatic"
    )
    expected = np.sqrt(8.0 / 9.0 * k * a * p * c) * theta_b ** (9.0 / 8.0)
    assert num.heat_rate == pytest.approx(expected, rel=1e-5)


@pytest.mark.identity
@FAST
@given(
    length=st.floats(5e-3, 0.1),
    k=st.floats(10.0, 400.0),
    c=st.floats(1.0, 3.0),
    emissivity=st.floats(0.0, 1.0),
    base=st.floats(310.0, 450.0),
    tip=st.sampled_from(["convective", "adiabatic", "prescribed"]),
)
def test_energy_balance_with_radiation_and_variable_h(length, k, c, emissivity, base, tip):
    # Base heat = convected + radiated (+ conducted through a prescribed tip); the surface
    # terms are integrated from the temperature profile, independently of the base gradient.
    s = pin_fin_section(0.004)
    num = solve_fin(
        length,
        float(s.perimeter),
        float(s.cross_section_area),
        lambda temp: k * (1 + 1e-3 * (temp - 300.0)),
        base,
        T_AIR,
        lambda th: c * np.abs(th) ** 0.25 + 5.0,
        emissivity=emissivity,
        surroundings_temperature=290.0,
        tip=tip,
        tip_temperature=0.5 * (base + T_AIR),
    )
    total = num.convected_heat_rate + num.radiated_heat_rate + num.tip_conducted_heat_rate
    assert num.converged
    assert num.heat_rate == pytest.approx(total, rel=1e-6, abs=1e-9)
    assert 0.0 < num.efficiency <= 1.0 + 1e-9
    if emissivity == 0.0:
        assert num.radiated_heat_rate == 0.0


@pytest.mark.identity
def test_radiation_only_short_fin_is_nearly_isothermal():
    # k -> large: the fin sits at the base temperature and radiates eps σ A_f (T_b^4 - T_sur^4).
    s = pin_fin_section(0.004)
    p, a = float(s.perimeter), float(s.cross_section_area)
    num = solve_fin(
        0.02,
        p,
        a,
        1e7,
        400.0,
        300.0,
        0.0,
        emissivity=0.8,
        surroundings_temperature=280.0,
        tip="convective",
    )
    area = p * 0.02 + a
    expected = 0.8 * STEFAN_BOLTZMANN * area * (400.0**4 - 280.0**4)
    assert num.heat_rate == pytest.approx(expected, rel=1e-5)
    assert num.efficiency == pytest.approx(1.0, abs=1e-5)
    assert num.convected_heat_rate == 0.0


@pytest.mark.identity
def test_strong_radiation_uses_continuation(monkeypatch):
    # A poorly conducting, very hot radiating pin: the direct solve fails and the emissivity
    # ramp (continuation) must find the solution; check it with the energy balance.
    calls = []
    original = numeric.solve_bvp

    def counting(*args, **kwargs):
        calls.append(1)
        return original(*args, **kwargs)

    monkeypatch.setattr(numeric, "solve_bvp", counting)
    s = pin_fin_section(0.002)
    num = solve_fin(
        1.0,
        float(s.perimeter),
        float(s.cross_section_area),
        0.5,
        1500.0,
        300.0,
        1.0,
        emissivity=1.0,
        tip="convective",
    )
    assert len(calls) > 1
    assert num.converged
    total = num.convected_heat_rate + num.radiated_heat_rate
    assert num.heat_rate == pytest.approx(total, rel=1e-6)


def test_solver_failure_raises_one_line_solver_error():
    s = pin_fin_section(0.002)
    args = (1.0, float(s.perimeter), float(s.cross_section_area), 0.5, 1500.0, 300.0, 1.0)
    with pytest.raises(SolverError) as err:
        solve_fin(*args, emissivity=1.0, max_nodes=60)
    assert "\n" not in str(err.value) and "solve_bvp" in str(err.value)
    out = solve_fin(*args, emissivity=1.0, max_nodes=60, raise_on_failure=False)
    assert out.converged is False


def test_invalid_input_raises_input_error():
    with pytest.raises(InputError, match="tip = 'infinite'.*convective, adiabatic, prescribed"):
        solve_fin(0.02, 0.01, 1e-5, 200.0, 350.0, 300.0, 10.0, tip="infinite")
    with pytest.raises(InputError, match="tip_temperature is missing"):
        solve_fin(0.02, 0.01, 1e-5, 200.0, 350.0, 300.0, 10.0, tip="prescribed")
    with pytest.raises(InputError, match="one fin per call"):
        solve_fin([0.02, 0.03], 0.01, 1e-5, 200.0, 350.0, 300.0, 10.0)
    with pytest.raises(InputError, match="emissivity = 1.5"):
        solve_fin(0.02, 0.01, 1e-5, 200.0, 350.0, 300.0, 10.0, emissivity=1.5)
    with pytest.raises(InputError, match="cross_section_area at the base"):
        solve_fin(0.02, 0.01, lambda x: 0.0 * x, 200.0, 350.0, 300.0, 10.0)
