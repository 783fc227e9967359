"""Tests of finkit.physics.fins.analytic: closed-form single fins."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from finkit.errors import InputError
from finkit.physics.fins import (
    ONE_DIMENSIONAL_FIN_RANGE,
    TIP_CONDITIONS,
    annular_fin,
    annular_fin_efficiency,
    annular_fin_efficiency_schmidt,
    corrected_length,
    infinite_fin_length,
    one_dimensional_fin_warnings,
    pin_fin_concave_parabolic,
    pin_fin_conical,
    pin_fin_section,
    rectangular_fin_section,
    straight_fin_concave_parabolic,
    straight_fin_triangular,
    transverse_biot_number,
    uniform_fin,
    uniform_fin_efficiency_corrected_length,
    uniform_fin_temperature_difference,
)
from finkit.validity import check_range

FAST = settings(max_examples=60, deadline=None)

lengths = st.floats(1e-3, 0.3)
thicknesses = st.floats(2e-4, 5e-3)
conductivities = st.floats(5.0, 400.0)
coefficients = st.floats(2.0, 500.0)


# --------------------------------------------------------------------------------------------
# published values
# --------------------------------------------------------------------------------------------

# Source: Incropera, DeWitt, Bergman, Lavine, Fundamentals of Heat and Mass Transfer, 6th ed.,
# Wiley 2007, Example 3.9: very long rods, D = 5 mm, one end at 100 °C, air at 25 °C,
# h = 100 W/m²K; pure copper k = 398, 2024 aluminium k = 180, AISI 316 stainless k = 14 W/mK.
# From memory: the printed heat losses are 8.3, 5.6 and 1.6 W and the lengths needed for the
# infinite-fin approximation (mL >= 2.65) are 0.19, 0.13 and 0.04 m. Tolerances: half a unit
# of the last printed digit.
EXAMPLE_3_9 = [
    pytest.param(398.0, 8.3, 0.19, id="incropera_2007_ex3.9_copper"),
    pytest.param(180.0, 5.6, 0.13, id="incropera_2007_ex3.9_aluminium_2024"),
    pytest.param(14.0, 1.6, 0.04, id="incropera_2007_ex3.9_stainless_316"),
]


@pytest.mark.published
@pytest.mark.parametrize(("conductivity", "heat_rate", "needed_length"), EXAMPLE_3_9)
def test_long_pins_incropera_example_3_9(conductivity, heat_rate, needed_length):
    s = pin_fin_section(0.005)
    r = uniform_fin(
        np.inf, s.perimeter, s.cross_section_area, conductivity, 100.0, 75.0, tip="infinite"
    )
    assert abs(float(r.heat_rate) - heat_rate) <= 0.05  # From memory (printed to 0.1 W)
    length = infinite_fin_length(s.perimeter, s.cross_section_area, conductivity, 100.0)
    assert abs(float(length) - needed_length) <= 0.005  # From memory (printed to 0.01 m)
    # and a fin of that length with an adiabatic tip indeed carries 99 % of the infinite fin
    finite = uniform_fin(
        length, s.perimeter, s.cross_section_area, conductivity, 100.0, 75.0, tip="adiabatic"
    )
    assert float(finite.heat_rate / r.heat_rate) == pytest.approx(0.99, rel=1e-12)


@pytest.mark.published
@pytest.mark.parametrize(
    ("fin_parameter_length", "expected"),
    [
        # Source: engdatabase.com, "Fin Efficiency: annular#rectangular#r2r1_1.5" table
        # (annular fin of rectangular profile, r2/r1 = 1.5, insulated tip at r2,
        # mL = m (r2 - r1)); values printed to 4 decimals -> abs tolerance 5e-5.
        pytest.param(0.2, 0.9839, id="engdatabase_annular_r2r1_1.5_mL0.2"),
        pytest.param(0.4, 0.9391, id="engdatabase_annular_r2r1_1.5_mL0.4"),
    ],
)
def test_annular_efficiency_against_published_table(fin_parameter_length, expected):
    r1, r2, t, k = 0.01, 0.015, 1e-3, 200.0
    m = fin_parameter_length / (r2 - r1)
    h = m * m * k * t / 2.0
    eta = annular_fin_efficiency(r1, r2, t, k, h, tip="adiabatic")
    assert abs(float(eta) - expected) <= 5e-5


@pytest.mark.published
def test_annular_fins_incropera_example_3_10_chart_reading():
    # Source: Incropera et al., 6th ed., Example 3.10: five annular fins of 2024-T6 aluminium
    # (k = 186 W/mK) on a cylinder of outer diameter 50 mm, t = 6 mm, L = 20 mm, h = 50 W/m²K.
    # From memory: r2c/r1 = 1.92, Lc^1.5 (h/(k Ap))^0.5 = 0.15 and eta_f ≈ 0.95 read off
    # Fig. 3.19. Chart reading; the exact Bessel value is 0.979, so the tolerance is ±4 %.
    r = annular_fin(0.025, 0.045, 0.006, 186.0, 50.0, 200.0)
    r2c = 0.045 + 0.003
    assert r2c / 0.025 == pytest.approx(1.92, abs=0.005)  # From memory
    lc, ap = r2c - 0.025, (r2c - 0.025) * 0.006
    assert lc**1.5 * np.sqrt(50.0 / (186.0 * ap)) == pytest.approx(0.15, abs=0.005)
    assert float(r.efficiency) == pytest.approx(0.95, rel=0.04)


@pytest.mark.published
@FAST
@given(
    r1=st.floats(2e-3, 0.05),
    ratio=st.floats(1.05, 5.0),
    t=thicknesses,
    k=conductivities,
    h=coefficients,
)
def test_annular_efficiency_matches_ht_kern_kraus(r1, ratio, t, k, h):
    ht = pytest.importorskip("ht")
    eta = annular_fin_efficiency(r1, r1 * ratio, t, k, h, tip="convective")
    r2c = r1 * ratio + t / 2.0
    # Cross-check: ht 1.2 fin_efficiency_Kern_Kraus (takes the corrected diameter 2 r2c and h
    # in W/m²K, although its docstring says W/K)
    expected = ht.fin_efficiency_Kern_Kraus(2 * r1, 2 * r2c, t, k, h)
    assert float(eta) == pytest.approx(expected, rel=1e-9)


# --------------------------------------------------------------------------------------------
# identities and limits
# --------------------------------------------------------------------------------------------


@pytest.mark.identity
@pytest.mark.parametrize("tip", TIP_CONDITIONS)
def test_profile_satisfies_fin_equation_and_gives_the_heat_rate(tip):
    # d²θ/dx² = m² θ inside, θ(0) = θ_b, the tip condition, and -k A θ'(0) = heat_rate.
    s = pin_fin_section(0.004)
    length, k, h, theta_b, theta_l = 0.04, 150.0, 80.0, 40.0, 12.0
    args = (length, s.perimeter, s.cross_section_area, k, h, theta_b, tip, theta_l)
    m = float(np.sqrt(h * s.perimeter / (k * s.cross_section_area)))
    x = np.linspace(0.002, 0.038, 19)
    dx = 1e-4
    th = uniform_fin_temperature_difference(x, *args)
    d2 = (
        uniform_fin_temperature_difference(x + dx, *args)
        - 2 * th
        + uniform_fin_temperature_difference(x - dx, *args)
    ) / dx**2
    np.testing.assert_allclose(d2, m * m * th, rtol=1e-5)
    assert float(uniform_fin_temperature_difference(0.0, *args)) == pytest.approx(theta_b)
    # fourth-order one-sided difference for the base gradient
    step = 1e-5
    f = [float(uniform_fin_temperature_difference(i * step, *args)) for i in range(5)]
    grad0 = (-25 * f[0] + 48 * f[1] - 36 * f[2] + 16 * f[3] - 3 * f[4]) / (12 * step)
    q = uniform_fin(*args[:6], tip=tip, tip_temperature_difference=theta_l).heat_rate
    assert -k * float(s.cross_section_area) * grad0 == pytest.approx(float(q), rel=1e-6)
    fl = [float(uniform_fin_temperature_difference(length - i * step, *args)) for i in range(5)]
    grad_l = -(-25 * fl[0] + 48 * fl[1] - 36 * fl[2] + 16 * fl[3] - 3 * fl[4]) / (12 * step)
    if tip == "adiabatic":
        assert abs(grad_l) < 1e-6 * abs(grad0)
    elif tip == "convective":
        assert -k * grad_l == pytest.approx(h * fl[0], rel=1e-6)
    elif tip == "prescribed":
        assert fl[0] == pytest.approx(theta_l, rel=1e-12)


@pytest.mark.identity
def test_no_overflow_for_very_long_fins():
    # mL = 1000: hyperbolic forms would overflow; the results must be finite and equal the
    # infinite fin.
    s = pin_fin_section(0.002)
    k, h = 10.0, 100.0
    m = float(np.sqrt(h * s.perimeter / (k * s.cross_section_area)))
    length = 1000.0 / m
    x = np.linspace(0.0, length, 11)
    with np.errstate(over="raise", invalid="raise", divide="raise"):
        for tip in TIP_CONDITIONS:
            r = uniform_fin(length, s.perimeter, s.cross_section_area, k, h, 10.0, tip=tip)
            inf = uniform_fin(length, s.perimeter, s.cross_section_area, k, h, 10.0, tip="infinite")
            assert float(r.heat_rate) == pytest.approx(float(inf.heat_rate), rel=1e-12)
            th = uniform_fin_temperature_difference(
                x, length, s.perimeter, s.cross_section_area, k, h, 10.0, tip=tip
            )
            assert np.all(np.isfinite(th))
            np.testing.assert_allclose(th[:3], 10.0 * np.exp(-m * x[:3]), rtol=1e-12, atol=1e-300)
        eta = annular_fin_efficiency(0.01, 0.05, 1e-4, 1.0, 1e4)  # m r2c ≈ 700
        assert np.isfinite(eta) and 0.0 < eta < 0.01
        eta = annular_fin_efficiency(0.01, 0.05, 1e-4, 1.0, 2e4)  # m r2c ≈ 1000
        assert np.isfinite(eta) and 0.0 < eta < 0.01


@pytest.mark.identity
def test_annular_large_argument_limit():
    # For m (r2c - r1) >> 1 the exact form tends to 2 r1 K1(m r1) / (m (r2c² - r1²) K0(m r1)).
    from scipy.special import k0e, k1e

    r1, r2, t, k, h = 0.01, 0.05, 1e-4, 1.0, 2e4
    r2c = r2 + t / 2
    m = np.sqrt(2 * h / (k * t))
    limit = 2 * r1 / (m * (r2c**2 - r1**2)) * k1e(m * r1) / k0e(m * r1)
    assert float(annular_fin_efficiency(r1, r2, t, k, h)) == pytest.approx(limit, rel=1e-12)


@pytest.mark.identity
@FAST
@given(length=lengths, t=thicknesses, k=conductivities, h=coefficients)
def test_efficiency_in_unit_interval_and_non_increasing_with_length(length, t, k, h):
    s = rectangular_fin_section(t, 0.05)
    lengths_ = length * np.array([1.0, 1.1, 1.5, 3.0])
    for tip in ("convective", "adiabatic"):
        eta = uniform_fin(lengths_, s.perimeter, s.cross_section_area, k, h, tip=tip).efficiency
        assert np.all((eta > 0.0) & (eta <= 1.0))
        assert np.all(np.diff(eta) <= 1e-15)
    eta_c = uniform_fin_efficiency_corrected_length(
        lengths_, s.perimeter, s.cross_section_area, k, h
    )
    assert np.all((eta_c > 0.0) & (eta_c <= 1.0)) and np.all(np.diff(eta_c) <= 1e-15)
    for fn in (straight_fin_triangular, straight_fin_concave_parabolic):
        eta_p = fn(lengths_, t, k, h).efficiency
        assert np.all((eta_p > 0.0) & (eta_p <= 1.0)) and np.all(np.diff(eta_p) <= 1e-15)
    for fn in (pin_fin_conical, pin_fin_concave_parabolic):
        eta_p = fn(lengths_, 2 * t, k, h).efficiency
        assert np.all((eta_p > 0.0) & (eta_p <= 1.0)) and np.all(np.diff(eta_p) <= 1e-15)
    eta_a = annular_fin_efficiency(0.01, 0.01 + lengths_, t, k, h)
    assert np.all((eta_a > 0.0) & (eta_a <= 1.0)) and np.all(np.diff(eta_a) <= 1e-15)


@pytest.mark.identity
@FAST
@given(length=lengths, d=st.floats(1e-3, 2e-2), k=st.floats(0.2, 400.0), h=coefficients)
def test_tip_condition_ordering(length, d, k, h):
    # Derivation (same L, m, M = k A m θ_b, a = h/(mk) = sqrt(h A/(k P)), T = tanh mL):
    #   adiabatic   M T
    #   convective  M (T + a)/(1 + a T)      - adiabatic = M a (1 - T²)/(1 + a T) >= 0
    #   infinite    M                        >= adiabatic since T <= 1
    #   prescribed θ_L = 0: M / T            >= all: (T + a)/(1 + a T) <= 1/T  <=>  T² <= 1
    #   convective <= infinite  <=>  (1 - T)(1 - a) >= 0  <=>  a <= 1 (the fin helps at all).
    # So a cold prescribed tip gives the LARGEST base heat rate (heat also leaves through it).
    s = pin_fin_section(d)
    q = {
        tip: float(uniform_fin(length, s.perimeter, s.cross_section_area, k, h, tip=tip).heat_rate)
        for tip in TIP_CONDITIONS
    }
    rtol = 1e-12
    assert q["adiabatic"] <= q["convective"] * (1 + rtol)
    assert q["adiabatic"] <= q["infinite"] * (1 + rtol)
    assert q["convective"] <= q["prescribed"] * (1 + rtol)
    assert q["infinite"] <= q["prescribed"] * (1 + rtol)
    a = h / (float(np.sqrt(h * s.perimeter / (k * s.cross_section_area))) * k)
    if a <= 1.0:
        assert q["convective"] <= q["infinite"] * (1 + rtol)
    else:
        assert q["convective"] >= q["infinite"] * (1 - rtol)


@pytest.mark.identity
def test_infinite_conductivity_gives_unit_efficiency():
    k = 1e12
    s = rectangular_fin_section(1e-3, 0.05)
    for tip in ("convective", "adiabatic"):
        r = uniform_fin(0.03, s.perimeter, s.cross_section_area, k, 50.0, tip=tip)
        assert float(r.efficiency) == pytest.approx(1.0, abs=1e-8)
    assert float(annular_fin_efficiency(0.01, 0.03, 1e-3, k, 50.0)) == pytest.approx(1.0, abs=1e-8)
    for fn in (
        straight_fin_triangular,
        straight_fin_concave_parabolic,
        pin_fin_conical,
        pin_fin_concave_parabolic,
    ):
        assert float(fn(0.03, 2e-3, k, 50.0).efficiency) == pytest.approx(1.0, abs=1e-8)
    assert float(annular_fin_efficiency_schmidt(0.01, 0.03, 1e-3, k, 50.0)) == pytest.approx(
        1.0, abs=1e-8
    )


@pytest.mark.identity
def test_prescribed_tip_surface_loss_and_efficiency():
    # Surface loss = base heat - heat conducted out at the tip = h P ∫θ dx (quadrature of the
    # profile), and efficiency = mean θ / θ_b.
    s = pin_fin_section(0.003)
    length, k, h, tb, tl = 0.05, 60.0, 40.0, 30.0, 10.0
    args = (length, s.perimeter, s.cross_section_area, k, h, tb, "prescribed", tl)
    integral = quad(
        lambda x: float(uniform_fin_temperature_difference(x, *args)),
        0,
        length,
        epsabs=0,
        epsrel=1e-12,
    )[0]
    r = uniform_fin(*args[:6], tip="prescribed", tip_temperature_difference=tl)
    assert float(r.efficiency) == pytest.approx(integral / (length * tb), rel=1e-10)


@pytest.mark.identity
@pytest.mark.parametrize(
    ("fn", "size", "exact_area"),
    [
        (
            straight_fin_triangular,
            3e-3,
            lambda L, t: 2 * quad(lambda x: np.sqrt(1 + (t / (2 * L)) ** 2), 0, L)[0],
        ),
        (
            straight_fin_concave_parabolic,
            3e-3,
            lambda L, t: 2 * quad(lambda x: np.sqrt(1 + (t * x / L**2) ** 2), 0, L)[0],
        ),
        (
            pin_fin_conical,
            4e-3,
            lambda L, D: quad(lambda x: np.pi * D * x / L * np.sqrt(1 + (D / (2 * L)) ** 2), 0, L)[
                0
            ],
        ),
        (
            pin_fin_concave_parabolic,
            4e-3,
            lambda L, D: quad(
                lambda x: np.pi * D * (x / L) ** 2 * np.sqrt(1 + (D * x / L**2) ** 2),
                0,
                L,
                epsrel=1e-13,
            )[0],
        ),
    ],
)
def test_profile_surface_areas_by_quadrature(fn, size, exact_area):
    # Surface of the profile from its arc length (x from the tip; per metre of width for the
    # straight fins), against the tabulated closed forms of Incropera Table 3.5.
    for length in (0.005, 0.02, 0.08):
        area = float(fn(length, size, 200.0, 50.0).fin_surface_area)
        assert area == pytest.approx(exact_area(length, size), rel=1e-10)


@pytest.mark.identity
def test_schmidt_close_to_exact_for_moderate_fins():
    # Schmidt (1949) approximation; docs/methods.md b2 states (computed there) an error within about
    # -1.5 % for r2c/r1 <= 4 and m (r2c - r1) <= 1. Checked here with a 2 % bound.
    r1, t, k = 0.01, 1e-3, 200.0
    ratio = np.linspace(1.1, 4.0, 30)[:, None]
    r2c = r1 * ratio
    mlen = np.linspace(0.05, 1.0, 20)[None, :]
    m = mlen / (r2c - r1)
    h = m * m * k * t / 2
    exact = annular_fin_efficiency(r1, r2c, t, k, h, tip="adiabatic")
    approx = annular_fin_efficiency_schmidt(r1, r2c, t, k, h, tip="adiabatic")
    assert np.max(np.abs(approx / exact - 1)) < 0.02


# --------------------------------------------------------------------------------------------
# facts of the trade
# --------------------------------------------------------------------------------------------


@pytest.mark.identity
def test_typical_heat_sink_fin_efficiencies():
    # Common practice, no source: plate fins of heat sinks in air cooling (1-2 mm thick,
    # 20-40 mm tall, h = 15-60 W/m²K) are typically 0.8-0.99 efficient in aluminium and
    # copper; steel fins of the same kind are about 0.6-0.8 (tall fins, forced air).
    height = np.array([20e-3, 30e-3, 40e-3])[:, None]
    h = np.array([15.0, 30.0, 60.0])[None, :]
    for k, t in ((200.0, 1.5e-3), (390.0, 1.0e-3)):  # aluminium alloy, copper
        eta = uniform_fin_efficiency_corrected_length(height, 2 * 0.05, t * 0.05, k, h)
        assert np.all((eta >= 0.8) & (eta <= 0.99))
    eta = uniform_fin_efficiency_corrected_length(  # steel, k = 50 W/mK, 2 mm thick
        np.array([35e-3, 40e-3])[:, None], 2 * 0.05, 2e-3 * 0.05, 50.0, np.array([45.0, 60.0])
    )
    assert np.all((eta >= 0.6) & (eta <= 0.8))


@pytest.mark.identity
@FAST
@given(
    length=st.floats(5e-3, 0.05),
    t=st.floats(3e-4, 2.5e-3),
    k=st.floats(100.0, 400.0),
    h=st.floats(5.0, 100.0),
)
def test_corrected_length_close_to_convective_tip_for_thin_fins(length, t, k, h):
    # Common practice, no source: for thin fins (small transverse Biot number) the adiabatic
    # tip at L_c = L + t/2 gives nearly the convective-tip heat rate (within 1-2 %).
    s = rectangular_fin_section(t, 0.05, include_edges=False)
    exact = uniform_fin(length, s.perimeter, s.cross_section_area, k, h, tip="convective")
    lc = corrected_length(length, s.perimeter, s.cross_section_area)
    approx = uniform_fin(lc, s.perimeter, s.cross_section_area, k, h, tip="adiabatic")
    assert float(lc) == pytest.approx(length + t / 2, rel=1e-12)
    assert float(exact.transverse_biot_number) < 2e-3  # thin: Bi = h t / (2 k) << 0.1
    assert abs(float(approx.heat_rate / exact.heat_rate) - 1.0) < 0.01


# --------------------------------------------------------------------------------------------
# sections, validity, errors
# --------------------------------------------------------------------------------------------


@pytest.mark.identity
def test_sections_and_biot_number():
    s = rectangular_fin_section(2e-3, 0.05)
    assert float(s.perimeter) == pytest.approx(2 * (0.05 + 2e-3))
    assert float(s.cross_section_area) == pytest.approx(1e-4)
    thin = rectangular_fin_section(2e-3, 0.05, include_edges=False)
    assert float(thin.perimeter) == pytest.approx(0.1)
    # thin form: m = sqrt(2h/(kt)), Bi = h (t/2)/k
    bi = transverse_biot_number(thin.perimeter, thin.cross_section_area, 200.0, 50.0)
    assert float(bi) == pytest.approx(50.0 * 1e-3 / 200.0)
    pin = pin_fin_section(4e-3)
    assert float(pin.cross_section_area / pin.perimeter) == pytest.approx(1e-3)  # D/4


@pytest.mark.identity
def test_one_dimensional_warnings():
    assert one_dimensional_fin_warnings([0.001, 0.05]) == []
    msgs = one_dimensional_fin_warnings([0.01, 0.3, np.nan])
    assert len(msgs) == 1 and "0.3" in msgs[0] and "0.1" in msgs[0] and "\n" not in msgs[0]
    assert one_dimensional_fin_warnings(0.3, threshold=0.5) == []
    assert check_range(ONE_DIMENSIONAL_FIN_RANGE, 0.05) == []
    assert len(check_range(ONE_DIMENSIONAL_FIN_RANGE, 0.2)) == 1


def test_invalid_input_raises_one_line_input_error():
    s = pin_fin_section(4e-3)
    with pytest.raises(InputError, match="tip = 'insulated'.*convective, adiabatic, prescribed"):
        uniform_fin(0.02, s.perimeter, s.cross_section_area, 200.0, 50.0, tip="insulated")
    with pytest.raises(InputError, match="thermal_conductivity = -1.0"):
        uniform_fin(0.02, s.perimeter, s.cross_section_area, [200.0, -1.0], 50.0)
    with pytest.raises(InputError, match="fin_length = 0.0"):
        uniform_fin(0.0, s.perimeter, s.cross_section_area, 200.0, 50.0)
    with pytest.raises(InputError, match="tip_radius"):
        annular_fin_efficiency(0.02, 0.01, 1e-3, 200.0, 50.0)
    with pytest.raises(InputError, match="tip = 'infinite'"):
        annular_fin(0.01, 0.02, 1e-3, 200.0, 50.0, tip="infinite")
    with pytest.raises(InputError, match="x = "):
        uniform_fin_temperature_difference(0.05, 0.02, s.perimeter, s.cross_section_area, 200, 50)
    with pytest.raises(InputError) as err:
        pin_fin_section(-1.0)
    assert "\n" not in str(err.value)


# --------------------------------------------------------------------------------------------
# shapes
# --------------------------------------------------------------------------------------------


@pytest.mark.shape
@pytest.mark.parametrize("tip", TIP_CONDITIONS)
def test_uniform_fin_scalar_1d_2d_agree(tip):
    lengths_ = np.array([0.01, 0.02, 0.05])
    hs = np.array([10.0, 50.0])
    grid = uniform_fin(lengths_[None, :], 0.1, 1e-4, 200.0, hs[:, None], 30.0, tip, 5.0)
    assert grid.heat_rate.shape == (2, 3)
    for i, h in enumerate(hs):
        row = uniform_fin(lengths_, 0.1, 1e-4, 200.0, h, 30.0, tip, 5.0)
        for j, length in enumerate(lengths_):
            one = uniform_fin(float(length), 0.1, 1e-4, 200.0, float(h), 30.0, tip, 5.0)
            for field in one._fields:
                assert getattr(grid, field)[i, j] == pytest.approx(float(getattr(one, field)))
                assert getattr(row, field)[j] == pytest.approx(float(getattr(one, field)))
    x = np.linspace(0, 0.01, 4)
    prof = uniform_fin_temperature_difference(
        x[:, None], 0.01, 0.1, 1e-4, 200.0, hs[None, :], 30.0, tip, 5.0
    )
    assert prof.shape == (4, 2)
    assert prof[2, 1] == pytest.approx(
        float(
            uniform_fin_temperature_difference(x[2], 0.01, 0.1, 1e-4, 200.0, hs[1], 30.0, tip, 5.0)
        )
    )


@pytest.mark.shape
def test_annular_and_profile_fins_scalar_1d_2d_agree():
    hs = np.array([10.0, 50.0, 200.0])
    ts = np.array([5e-4, 2e-3])
    grid = annular_fin(0.01, 0.03, ts[:, None], 180.0, hs[None, :], 40.0)
    assert grid.heat_rate.shape == (2, 3)
    for i, t in enumerate(ts):
        for j, h in enumerate(hs):
            one = annular_fin(0.01, 0.03, float(t), 180.0, float(h), 40.0)
            for field in one._fields:
                assert getattr(grid, field)[i, j] == pytest.approx(float(getattr(one, field)))
    for fn in (
        straight_fin_triangular,
        straight_fin_concave_parabolic,
        pin_fin_conical,
        pin_fin_concave_parabolic,
    ):
        grid = fn(0.02, ts[:, None], 180.0, hs[None, :])
        assert grid.efficiency.shape == (2, 3)
        row = fn(0.02, ts[1], 180.0, hs)
        one = fn(0.02, float(ts[1]), 180.0, float(hs[2]))
        assert grid.efficiency[1, 2] == pytest.approx(float(one.efficiency))
        assert row.heat_rate[2] == pytest.approx(float(one.heat_rate))
