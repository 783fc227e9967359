"""Tests of finkit.physics.correlations.natural: published values, reference libraries, limits."""

import numpy as np
import pytest
from scipy.integrate import solve_bvp
from scipy.optimize import minimize_scalar

from finkit.errors import GeometryError, InputError, NotSupportedError
from finkit.physics.correlations import natural
from finkit.physics.correlations.natural import (
    BAR_COHEN_ROHSENOW_CONSTANTS,
    nusselt_vertical_channel_bar_cohen_rohsenow,
    nusselt_vertical_channel_elenbaas,
    nusselt_vertical_plate_churchill_chu,
    optimum_fin_spacing_bar_cohen_rohsenow,
    plate_fin_array_natural,
    rayleigh_number,
)

ht = pytest.importorskip("ht")
CP = pytest.importorskip("CoolProp.CoolProp")


def air(T):
    """Dry air at 1 atm from CoolProp (reference library): rho, mu, k, Pr."""
    return tuple(CP.PropsSI(q, "T", T, "P", 101325.0, "Air") for q in ("D", "V", "L", "Prandtl"))


# ---------------------------------------------------------------- Churchill & Chu


@pytest.mark.published
def test_churchill_chu_incropera_example_9_2():
    # From memory: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Example 9.2
    # (glass fireplace screen, L = 0.71 m, Ts = 232 °C, T_inf = 23 °C, air at T_f = 400 K:
    # nu = 26.41e-6 m²/s, alpha = 38.3e-6 m²/s, k = 0.0338 W/m K, Pr = 0.690):
    # Ra_L = 1.813e9, Nu_L = 147, h = 7.0 W/m² K. The same example (Pr = 0.69, Gr = 2.63e9,
    # Nu = 147.16) is the doctest of ht.conv_free_immersed.Nu_vertical_plate_Churchill (ht 1.2).
    Ra = rayleigh_number(0.71, 232.0 - 23.0, 400.0, 26.41e-6, 38.3e-6)
    assert Ra == pytest.approx(1.813e9, rel=5e-3)
    Nu = nusselt_vertical_plate_churchill_chu(Ra, 0.690, form="all")
    assert Nu == pytest.approx(147.0, rel=5e-3)
    assert Nu * 0.0338 / 0.71 == pytest.approx(7.0, rel=1e-2)


@pytest.mark.published
@pytest.mark.parametrize("Ra", [1e2, 1e5, 1e8, 1e11])
@pytest.mark.parametrize("Pr", [0.7, 1.0, 7.0])
def test_churchill_chu_all_matches_ht(Ra, Pr):
    # Cross-check: ht 1.2 Nu_vertical_plate_Churchill(Pr, Gr) with Gr = Ra/Pr
    expected = ht.conv_free_immersed.Nu_vertical_plate_Churchill(Pr, Ra / Pr)
    assert nusselt_vertical_plate_churchill_chu(Ra, Pr, form="all") == pytest.approx(
        expected, rel=1e-9
    )


def _similarity_isothermal_plate(Pr):
    """-theta'(0) of the laminar similarity solution (Ostrach 1953), solved here with solve_bvp.

    f''' + 3 f f'' - 2 f'^2 + theta = 0, theta'' + 3 Pr f theta' = 0,
    f(0) = f'(0) = 0, theta(0) = 1, f'(inf) = theta(inf) = 0. Nu_x = -theta'(0) (Gr_x/4)^(1/4).
    """

    def rhs(eta, y):
        f, f1, f2, th, th1 = y
        return np.vstack([f1, f2, -(3 * f * f2 - 2 * f1**2 + th), th1, -3 * Pr * f * th1])

    def bc(ya, yb):
        return np.array([ya[0], ya[1], ya[3] - 1.0, yb[1], yb[3]])

    # eta_max = 8: the far field is reached; a much longer domain makes this shooting-like
    # problem ill-conditioned with solve_bvp.
    eta = np.linspace(0.0, 8.0, 400)
    y = np.zeros((5, eta.size))
    y[3] = np.exp(-eta)
    y[4] = -np.exp(-eta)
    y[1] = 0.3 * eta * np.exp(-eta)
    sol = solve_bvp(rhs, bc, eta, y, tol=1e-7, max_nodes=50000)
    assert sol.status == 0
    return -sol.sol(0.0)[4]


@pytest.mark.published
@pytest.mark.parametrize("Pr", [0.71, 1.0])
def test_similarity_solution_matches_lefevre_interpolation(Pr):
    # From memory: Incropera et al. 6th ed. Eq. 9.20 (LeFevre interpolation of the similarity
    # solution), g(Pr) = 0.75 Pr^0.5 / (0.609 + 1.221 Pr^0.5 + 1.238 Pr)^0.25, 0.5 % agreement.
    # This checks the solver used as the reference in the next test.
    g_interp = 0.75 * Pr**0.5 / (0.609 + 1.221 * Pr**0.5 + 1.238 * Pr) ** 0.25
    assert _similarity_isothermal_plate(Pr) == pytest.approx(g_interp, rel=5e-3)


@pytest.mark.identity
@pytest.mark.parametrize("Ra", [1e7, 1e8, 1e9])
def test_churchill_chu_laminar_vs_boundary_layer_theory(Ra):
    # Derivation: laminar boundary-layer similarity solution for an isothermal vertical plate
    # (Ostrach 1953, solved above), average Nu_L = (4/3) (-theta'(0)) (Gr_L/4)^(1/4); the laminar
    # Churchill-Chu form follows it within 3 % where boundary-layer theory holds (Ra >= 1e7; at
    # lower Ra the thick boundary layer makes theory low, and the 0.68 term accounts for that).
    Pr = 0.71
    g = _similarity_isothermal_plate(Pr)
    Nu_theory = 4.0 / 3.0 * g * (Ra / Pr / 4.0) ** 0.25
    assert nusselt_vertical_plate_churchill_chu(Ra, Pr, form="laminar") == pytest.approx(
        Nu_theory, rel=0.03
    )


@pytest.mark.identity
def test_churchill_chu_all_higher_than_laminar_at_1e8():
    # docs/methods.md g1 (computed there): the all-Ra form is about 17 % above the laminar form at
    # Ra = 1e8, Pr = 0.71.
    ratio = nusselt_vertical_plate_churchill_chu(1e8, 0.71, "all") / (
        nusselt_vertical_plate_churchill_chu(1e8, 0.71, "laminar")
    )
    assert ratio == pytest.approx(1.17, abs=0.01)


def test_churchill_chu_unknown_form():
    with pytest.raises(InputError, match="form"):
        nusselt_vertical_plate_churchill_chu(1e6, 0.7, form="turbulent")


# ---------------------------------------------------------------- channels


@pytest.mark.published
def test_composite_within_5_percent_of_elenbaas():
    # Source: Bar-Cohen & Rohsenow (1984) built the composite on Elenbaas' (1942) data;
    # docs/methods.md g2 [V-num]: they agree within about 5 % for El = 1…1000 (largest deviation
    # computed here: -5.1 % near El = 10).
    El = np.logspace(0, 3, 61)
    ratio = nusselt_vertical_channel_bar_cohen_rohsenow(El) / nusselt_vertical_channel_elenbaas(El)
    assert np.all(np.abs(ratio - 1.0) < 0.055)


@pytest.mark.identity
def test_composite_fully_developed_limits():
    # Derivation: buoyancy-driven plane Poiseuille flow leaving at wall temperature gives
    # Nu_S = El/24 with both walls heated and El/12 with one wall heated.
    El = 1e-3
    assert nusselt_vertical_channel_bar_cohen_rohsenow(El) == pytest.approx(El / 24.0, rel=1e-3)
    assert nusselt_vertical_channel_bar_cohen_rohsenow(
        El, wall="isothermal-asymmetric"
    ) == pytest.approx(El / 12.0, rel=1e-3)
    assert nusselt_vertical_channel_elenbaas(El) == pytest.approx(El / 24.0, rel=1e-6)


@pytest.mark.published
@pytest.mark.parametrize("Ra_L", [1e5, 1e7, 1e9])
def test_composite_isolated_plate_limit_matches_mcadams(Ra_L):
    # Cross-check: ht 1.2 Nu_vertical_cylinder_McAdams_Weiss_Saunders (laminar Nu_L = 0.59 Ra^0.25,
    # McAdams, Heat Transmission). With a wide spacing the channel becomes an isolated plate:
    # Nu_S L/S -> Nu_L.
    Pr = 0.71
    S_over_L = 0.5
    El = Ra_L * S_over_L**4
    Nu_L = nusselt_vertical_channel_bar_cohen_rohsenow(El) / S_over_L
    expected = ht.conv_free_immersed.Nu_vertical_cylinder_McAdams_Weiss_Saunders(
        Pr, Ra_L / Pr, turbulent=False
    )
    assert Nu_L == pytest.approx(expected, rel=0.01)


@pytest.mark.published
@pytest.mark.parametrize(
    ("wall", "published", "rtol"),
    [
        # Source: Bar-Cohen & Rohsenow (1984); Incropera 6th ed. Table 9.3 (S_opt constants).
        # 2.714 is printed to 4 figures; 2.15 to 3 figures, while the analytic optimum of the
        # composite is (2 C1/C2)^(1/6) = 2.1553 (docs/methods.md g2 [V-num]), hence 0.3 %.
        ("isothermal-symmetric", 2.714, 1e-3),
        ("isothermal-asymmetric", 2.15, 3e-3),
    ],
)
def test_optimum_spacing_constant_maximises_nu_over_s2(wall, published, rtol):
    C1, C2 = BAR_COHEN_ROHSENOW_CONSTANTS[wall]

    # With P = g beta dT/(nu alpha L) = 1, El = S^4 and heat per unit volume ~ Nu_S(S^4)/S^2.
    def minus_q(S):
        return -nusselt_vertical_channel_bar_cohen_rohsenow(S**4, wall=wall) / S**2

    best = minimize_scalar(minus_q, bounds=(0.5, 6.0), method="bounded", options={"xatol": 1e-8})
    assert best.x == pytest.approx(published, rel=rtol)
    assert best.x == pytest.approx((2 * C1 / C2) ** (1 / 6), rel=1e-5)
    # the function uses the published constant
    S = optimum_fin_spacing_bar_cohen_rohsenow(1.0, 300.0, 300.0, 1.0, 1.0, wall=wall)
    g = 9.80665
    assert S == pytest.approx(published * g**-0.25, rel=1e-12)


@pytest.mark.identity
def test_optimum_spacing_equivalent_form():
    # Source: docs/methods.md g2 / Bar-Cohen & Rohsenow (1984): S_opt = 2.714 L Ra_L^(-1/4).
    L, dT, Tf = 0.12, 35.0, 315.0
    rho, mu, k, Pr = air(Tf)
    nu = mu / rho
    alpha = nu / Pr
    Ra_L = rayleigh_number(L, dT, Tf, nu, alpha)
    S = optimum_fin_spacing_bar_cohen_rohsenow(L, dT, Tf, nu, alpha)
    assert S == pytest.approx(2.714 * L * Ra_L**-0.25, rel=1e-12)
    # at S_opt the symmetric composite gives Nu_S about 1.31 (docs/methods.md g2)
    El = rayleigh_number(S, dT, Tf, nu, alpha) * S / L
    assert nusselt_vertical_channel_bar_cohen_rohsenow(El) == pytest.approx(1.31, abs=0.01)


def test_optimum_spacing_typical_sink():
    # Common practice, no source: a 100 mm tall natural-convection sink at 30-60 K rise has an
    # optimum gap of roughly 5-10 mm.
    for dT in (30.0, 60.0):
        Tf = 298.15 + dT / 2
        rho, mu, k, Pr = air(Tf)
        nu = mu / rho
        S = optimum_fin_spacing_bar_cohen_rohsenow(0.1, dT, Tf, nu, nu / Pr)
        assert 5e-3 < S < 10e-3


def test_isoflux_walls_not_supported_and_unknown_wall():
    with pytest.raises(NotSupportedError, match="isoflux-symmetric"):
        nusselt_vertical_channel_bar_cohen_rohsenow(10.0, wall="isoflux-symmetric")
    with pytest.raises(NotSupportedError, match="isoflux-asymmetric"):
        optimum_fin_spacing_bar_cohen_rohsenow(0.1, 30, 310, 1.7e-5, 2.4e-5, "isoflux-asymmetric")
    with pytest.raises(InputError, match="wall"):
        nusselt_vertical_channel_bar_cohen_rohsenow(10.0, wall="symmetric")


# ---------------------------------------------------------------- array function


def _typical(**over):
    Ts, Ta = 298.15 + 40.0, 298.15
    rho, mu, k, Pr = air(0.5 * (Ts + Ta))
    args = dict(
        fin_spacing=7e-3,
        fin_height=30e-3,
        fin_length_vertical=0.1,
        fin_thickness=2e-3,
        fin_count=12,
        base_width=0.11,
        surface_temperature=Ts,
        ambient_temperature=Ta,
        density=rho,
        dynamic_viscosity=mu,
        thermal_conductivity=k,
        prandtl=Pr,
    )
    args.update(over)
    return args


@pytest.mark.parametrize("rise", [30.0, 45.0, 60.0])
def test_plate_fin_array_natural_h_a_few_w_per_m2k(rise):
    # Common practice, no source: natural-convection coefficients of ordinary vertical fin arrays
    # at 30-60 K rise are a few W/m² K (about 3-8).
    Ts = 298.15 + rise
    rho, mu, k, Pr = air(0.5 * (Ts + 298.15))
    r = plate_fin_array_natural(
        **_typical(
            surface_temperature=Ts,
            density=rho,
            dynamic_viscosity=mu,
            thermal_conductivity=k,
            prandtl=Pr,
        )
    )
    assert 3.0 < r.heat_transfer_coefficient < 8.0
    assert 3.0 < r.outer_face_heat_transfer_coefficient < 8.0


@pytest.mark.identity
def test_plate_fin_array_natural_consistent_with_parts():
    args = _typical()
    r = plate_fin_array_natural(**args)
    nu = args["dynamic_viscosity"] / args["density"]
    alpha = nu / args["prandtl"]
    Tf = 0.5 * (args["surface_temperature"] + args["ambient_temperature"])
    dT = args["surface_temperature"] - args["ambient_temperature"]
    Ra_S = rayleigh_number(7e-3, dT, Tf, nu, alpha)
    assert r.rayleigh_spacing == pytest.approx(Ra_S, rel=1e-12)
    assert r.elenbaas == pytest.approx(Ra_S * 7e-3 / 0.1, rel=1e-12)
    assert r.heat_transfer_coefficient == pytest.approx(
        nusselt_vertical_channel_bar_cohen_rohsenow(r.elenbaas)
        * args["thermal_conductivity"]
        / 7e-3
    )
    assert r.channel_area == pytest.approx(11 * (2 * 30e-3 + 7e-3) * 0.1)
    assert r.outer_face_area == pytest.approx(2 * 30e-3 * 0.1)


@pytest.mark.shape
def test_plate_fin_array_natural_broadcasts():
    spacing = np.array([5e-3, 7e-3, 9e-3])
    rise = np.array([[30.0], [60.0]])
    r = plate_fin_array_natural(
        **_typical(fin_spacing=spacing, fin_count=8, surface_temperature=298.15 + rise)
    )
    assert r.heat_transfer_coefficient.shape == (2, 3)
    single = plate_fin_array_natural(
        **_typical(fin_spacing=7e-3, fin_count=8, surface_temperature=298.15 + 60.0)
    )
    assert r.heat_transfer_coefficient[1, 1] == pytest.approx(single.heat_transfer_coefficient)


def test_plate_fin_array_natural_geometry_errors():
    with pytest.raises(GeometryError, match="fins do not fit"):
        plate_fin_array_natural(**_typical(fin_count=20))
    with pytest.raises(GeometryError, match="fin_spacing"):
        plate_fin_array_natural(**_typical(fin_spacing=0.0))
    with pytest.raises(GeometryError, match="fin_count"):
        plate_fin_array_natural(**_typical(fin_count=1))


def test_orientation_check():
    assert natural.natural_orientation_check("vertical-fins") == "vertical-fins"
    assert natural.natural_orientation_check("horizontal-base-fins-up") == "horizontal-base-fins-up"
    with pytest.raises(NotSupportedError) as info:
        natural.natural_orientation_check("horizontal-base-fins-down")
    msg = str(info.value)
    assert "'horizontal-base-fins-down'" in msg and "'vertical-fins'" in msg and "\n" not in msg
    assert "'horizontal-base-fins-up'" in msg


def test_plate_fin_natural_warnings():
    r = plate_fin_array_natural(**_typical())
    assert natural.plate_fin_natural_warnings(r.elenbaas, rayleigh_length=r.rayleigh_length) == []
    msgs = natural.plate_fin_natural_warnings(np.array([1e-3, 10.0]), rayleigh_length=5e9)
    assert len(msgs) == 2 and "El" in msgs[0] and "Ra_L" in msgs[1]
    assert (
        natural.plate_fin_natural_warnings(10.0, rayleigh_length=5e9, outer_face_form="all") == []
    )
