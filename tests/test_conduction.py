"""Tests of finkit.physics.conduction: the finite-volume conduction model of a plate-fin heat sink.

The conduction solution is checked against things outside it: the closed-form fin of
Incropera Table 3.4 (case A), the exact spreading series of Yovanovich, Muzychka & Culham
(finkit.physics.spreading, itself checked against half-space limits in tests/test_spreading.py),
mesh convergence, the energy balance and linearity. Meshes are kept coarse so the file runs in
a few seconds.
"""

import numpy as np
import pytest

from finkit.errors import GeometryError, InputError
from finkit.physics.conduction import (
    CONDUCTION_SOLVERS,
    compare_with_chain,
    refine_study,
    solve_plate_fin_conduction,
)
from finkit.physics.conduction.solve import _richardson
from finkit.physics.fins.analytic import uniform_fin
from finkit.physics.spreading import (
    spreading_resistance_rectangular_series,
    spreading_resistance_song_lee_au,
)

AIR = 300.0

# A small plate-fin sink used in several tests: 50 x 50 mm base, 3 mm thick, 6 aluminium fins
# 1.5 mm x 20 mm, h = 40 W/m²K, a 20 x 20 mm source (invented design, not published data).
SMALL = dict(
    base_width=0.05,
    base_length=0.05,
    base_thickness=0.003,
    fin_count=6,
    fin_thickness=0.0015,
    fin_height=0.02,
    thermal_conductivity=200.0,
    heat_transfer_coefficient=40.0,
    source_length=0.02,
    source_width=0.02,
)


def _solve(power=10.0, **kw):
    args = dict(SMALL)
    args.update(kw)
    return solve_plate_fin_conduction(power=power, air_temperature=AIR, **args)


# ---------------------------------------------------------------- Richardson extrapolation


@pytest.mark.identity
def test_richardson_recovers_order_and_limit_of_a_known_sequence():
    # Identity: f(h) = 1 + 0.3 h^2 on h = 1, 1/2, 1/4 has order exactly 2 and limit 1
    # (Richardson 1911; Roache 1994, GCI = 1.25 |e|/(r^p - 1)).
    levels = (1, 2, 4)
    values = np.array([1.0 + 0.3 / lv**2 for lv in levels])
    r, p, ext, gci = _richardson(levels, values)
    assert r == 2.0
    assert p == pytest.approx(2.0, rel=1e-12)
    assert ext == pytest.approx(1.0, rel=1e-12)
    assert gci == pytest.approx(1.25 * abs((values[2] - values[1]) / values[2]) / 3.0)


@pytest.mark.identity
def test_richardson_oscillating_sequence_gives_no_order():
    # Identity: differences of opposite sign have no observed order; the finest value is kept.
    r, p, ext, gci = _richardson((1, 2, 4), np.array([1.0, 0.9, 0.95]))
    assert np.isnan(p) and np.isnan(gci) and ext == 0.95


# ---------------------------------------------------------------- mesh convergence


@pytest.mark.identity
def test_bare_plate_converges_at_second_order_to_exact_series():
    # Identity: a 2nd-order finite-volume scheme; the flux jump at the source edge costs a little
    # (observed ~1.9). The extrapolated value must agree with the exact series.
    # Source: Yovanovich, Muzychka & Culham, J. Thermophys. Heat Transfer 13 (1999) 495-500,
    # via finkit.physics.spreading.spreading_resistance_rectangular_series (400 terms: 4 figures).
    W = L = 0.1
    t, k, h, s = 0.005, 200.0, 500.0, 0.03
    study = refine_study(W, L, t, 0, 0.0, 0.0, k, h, s, s, mesh_cell_size=0.01)
    diffs = np.abs(np.diff(study.resistances))
    assert diffs[1] < 0.5 * diffs[0]  # differences shrink
    assert 1.6 < study.observed_order < 2.3
    r = spreading_resistance_rectangular_series(s, s, L, W, t, k, h, terms=400)
    exact = float(r.average + r.one_dimensional + 1.0 / (h * W * L))
    assert study.extrapolated_resistance == pytest.approx(exact, rel=2e-3)
    assert study.grid_convergence_index < 0.01


@pytest.mark.identity
def test_finned_sink_converges_and_extrapolates_consistently():
    # Identity: with fins the fin roots are re-entrant corners (singular gradient), so the
    # observed order is below 2 (about 1.6 here); two studies on different level-1 meshes must
    # extrapolate to the same value within their grid convergence indices.
    a = refine_study(**SMALL, mesh_cell_size=0.005)
    b = refine_study(**SMALL, mesh_cell_size=0.004)
    for st in (a, b):
        diffs = np.abs(np.diff(st.resistances))
        assert diffs[1] < 0.6 * diffs[0]
        assert 1.2 < st.observed_order < 2.3
    assert a.extrapolated_resistance == pytest.approx(b.extrapolated_resistance, rel=5e-4)
    assert a.cell_counts[-1] == 64 * a.cell_counts[0]  # nested meshes, factor 2 per direction


# ---------------------------------------------------------------- closed-form single fin


def _incropera_case_a(theta_b, k, h, t, length, height):
    """Fin heat rate and tip excess temperature, convective tip.

    Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., 2007, Table 3.4,
    case A, with P = 2 L (fin ends adiabatic), A_c = t L.
    """
    p, ac = 2.0 * length, t * length
    m = np.sqrt(h * p / (k * ac))
    big_m = np.sqrt(h * p * k * ac) * theta_b
    a = h / (m * k)
    ch, sh = np.cosh(m * height), np.sinh(m * height)
    q = big_m * (sh + a * ch) / (ch + a * sh)
    tip = theta_b / (ch + a * sh)
    return q, tip


@pytest.mark.identity
def test_single_fin_matches_incropera_case_a():
    # Two fins on a very conductive base (k_b = 1e5) heated over its whole back face, exposed base
    # adiabatic: the power leaves through the two fins, each at the fin-root temperature.
    # Closed form: Incropera Table 3.4 case A (convective tip), m H = 2.5, transverse Bi = 0.0025.
    L, t, H, k, h, power = 0.05, 0.002, 0.05, 40.0, 100.0, 10.0
    errors = []
    for level in (1, 2, 4):
        s = solve_plate_fin_conduction(
            0.02, L, 0.002, 2, t, H, k, h, L, 0.02, power, AIR,
            base_heat_transfer_coefficient=0.0,
            base_thermal_conductivity=1e5,
            mesh_cell_size=0.01,
            mesh_refinement=level,
        )  # fmt: skip
        theta_b = s.base_mean_temperature - AIR
        q, tip = _incropera_case_a(theta_b, k, h, t, L, H)
        errors.append(abs(2.0 * q / power - 1.0))
        tip_error = abs((s.fin_tip_mean_temperature - AIR) / tip - 1.0)
    assert errors[2] < errors[1] < errors[0]  # converges to the closed form
    assert errors[2] < 0.01  # within 1 % at the finest mesh (about 0.25 %)
    assert tip_error < 0.01
    # the library's closed form is the same (finkit.physics.fins.analytic.uniform_fin,
    # tip="convective")
    ref = uniform_fin(H, 2 * L, t * L, k, h, theta_b, tip="convective")
    assert float(ref.heat_rate) == pytest.approx(q, rel=1e-12)


# ---------------------------------------------------------------- spreading resistance


BARE_PLATES = [
    # W, L, t, h, source_length, source_width, mesh_cell_size
    pytest.param(0.1, 0.1, 0.002, 200.0, 0.02, 0.02, None, id="thin_eps0.2"),
    pytest.param(0.1, 0.1, 0.005, 500.0, 0.03, 0.03, None, id="mid_eps0.3"),
    pytest.param(0.08, 0.12, 0.004, 300.0, 0.03, 0.015, None, id="rectangular"),
]


@pytest.mark.published
@pytest.mark.parametrize("W,L,t,h,sl,sw,cs", BARE_PLATES)
def test_bare_plate_matches_exact_spreading_series(W, L, t, h, sl, sw, cs):
    # Source: Yovanovich, Muzychka & Culham, J. Thermophys. Heat Transfer 13 (1999) 495-500,
    # exact series via finkit.physics.spreading.spreading_resistance_rectangular_series (checked
    # against
    # the half-space limits in tests/test_spreading.py). Isoflux centred source, uniform h on the
    # opposite face, adiabatic edges: the same problem as the bare plate here.
    k = 200.0
    fv = solve_plate_fin_conduction(
        W, L, t, 0, 0.0, 0.0, k, h, sl, sw, 1.0, AIR, mesh_cell_size=cs, mesh_refinement=2
    )
    r = spreading_resistance_rectangular_series(sl, sw, L, W, t, k, h, terms=400)
    film = 1.0 / (h * W * L)
    exact = float(r.average + r.one_dimensional + film)
    assert fv.thermal_resistance_source_mean == pytest.approx(exact, rel=5e-3)
    fv_spreading = fv.thermal_resistance_source_mean - float(r.one_dimensional) - film
    assert fv_spreading == pytest.approx(float(r.average), rel=0.02)
    # Song-Lee-Au closed form: within its -8 ... +8 % band against the exact solution
    # (band from the comparison in finkit.physics.spreading, docs/methods.md i1).
    closed = spreading_resistance_song_lee_au(sl * sw, W * L, t, k, film)
    assert -0.08 <= float(closed.average) / fv_spreading - 1.0 <= 0.08


@pytest.mark.published
def test_bare_plate_small_source_thick_plate():
    # Source: as above (exact series, eps = 0.1, t/W = 0.1); a small source on a coarse mesh,
    # held to 1 % on the total.
    W = L = 0.1
    k, t, h, s = 200.0, 0.01, 100.0, 0.01
    fv = solve_plate_fin_conduction(
        W, L, t, 0, 0.0, 0.0, k, h, s, s, 1.0, AIR, mesh_cell_size=0.0025, mesh_refinement=2
    )
    r = spreading_resistance_rectangular_series(s, s, L, W, t, k, h, terms=400)
    exact = float(r.average + r.one_dimensional + 1.0 / (h * W * L))
    assert fv.thermal_resistance_source_mean == pytest.approx(exact, rel=0.01)


# ---------------------------------------------------------------- balance, linearity, field


@pytest.mark.identity
@pytest.mark.parametrize("solver", ["direct", "cg"])
def test_energy_balance_closes(solver):
    # Identity: steady state, all power leaves by convection (to solver precision).
    s = _solve(power=25.0, solver=solver)
    tol = 1e-10 if solver == "direct" else 1e-7
    assert abs(s.heat_rate_balance) < tol
    assert s.convective_heat_rate == pytest.approx(25.0, rel=tol)


@pytest.mark.identity
def test_iterative_and_direct_solvers_agree():
    # Identity: both solvers solve the same linear system.
    a = _solve(solver="direct")
    b = _solve(solver="cg")
    assert b.thermal_resistance_source_mean == pytest.approx(
        a.thermal_resistance_source_mean, rel=1e-8
    )
    assert "auto" in CONDUCTION_SOLVERS


@pytest.mark.identity
def test_linear_in_power_and_offset_by_air_temperature():
    # Identity: a linear problem; the rise scales with power, the air temperature only shifts it.
    a = solve_plate_fin_conduction(**SMALL, power=5.0, air_temperature=300.0)
    b = solve_plate_fin_conduction(**SMALL, power=20.0, air_temperature=320.0)
    assert (b.source_mean_temperature - 320.0) == pytest.approx(
        4.0 * (a.source_mean_temperature - 300.0), rel=1e-9
    )
    assert b.thermal_resistance_source_mean == pytest.approx(a.thermal_resistance_source_mean)


@pytest.mark.shape
def test_field_shape_symmetry_and_ordering():
    s = _solve()
    T = s.temperature
    assert T.shape == (s.x.size, s.y.size, s.z.size)
    assert np.all(np.diff(s.x) > 0) and np.all(np.diff(s.y) > 0) and np.all(np.diff(s.z) > 0)
    assert s.x[0] > 0 and s.x[-1] < SMALL["base_width"]
    # mirrored quarter: symmetric about both mid-planes, NaN only above the base in the gaps
    np.testing.assert_array_equal(np.isnan(T), np.isnan(T[::-1, ::-1, :]))
    np.testing.assert_allclose(T[::-1], T, equal_nan=True)
    base = s.z < SMALL["base_thickness"]
    assert not np.any(np.isnan(T[:, :, base]))
    assert np.any(np.isnan(T[:, :, ~base]))
    # Common practice, no source: heat flows from the source through the base to the fin tips.
    assert s.source_max_temperature >= s.source_mean_temperature
    assert s.source_mean_temperature > s.base_mean_temperature > s.fin_tip_mean_temperature > AIR
    assert np.nanmax(T) == pytest.approx(s.source_max_temperature, abs=0.5)
    assert s.cell_count == np.count_nonzero(~np.isnan(T)) // 4


# ---------------------------------------------------------------- chain comparison


@pytest.mark.identity
def test_chain_pieces_follow_their_definitions():
    # Identity: the chain adds R_sp + t_b/(k W L) + R_0 with R_0 = 1/(N eta_f h A_f + h A_b)
    # (docs/methods.md c and i; Incropera 6th ed. section 3.6.5, overall surface efficiency).
    c = compare_with_chain(**SMALL, tip="convective")
    W, L, tb = SMALL["base_width"], SMALL["base_length"], SMALL["base_thickness"]
    N, t, H = SMALL["fin_count"], SMALL["fin_thickness"], SMALL["fin_height"]
    k, h = SMALL["thermal_conductivity"], SMALL["heat_transfer_coefficient"]
    gap = (W - N * t) / (N - 1)
    fin = uniform_fin(H, 2 * L, t * L, k, h, tip="convective")
    area_f = 2 * L * H + t * L
    r0 = 1.0 / (N * float(fin.efficiency) * h * area_f + h * (N - 1) * gap * L)
    assert c.array_resistance == pytest.approx(r0, rel=1e-12)
    assert c.base_resistance == pytest.approx(tb / (k * W * L), rel=1e-12)
    assert c.chain_resistance_series == pytest.approx(
        c.spreading_resistance_series + c.base_resistance + r0, rel=1e-12
    )
    assert c.relative_difference_series == pytest.approx(
        c.chain_resistance_series / c.conduction_resistance - 1.0, rel=1e-12
    )
    assert 0.0 < c.fin_efficiency < c.surface_efficiency < 1.0
    assert f"{100 * abs(c.relative_difference_series):.1f} %" in c.verdict


@pytest.mark.identity
def test_chain_tip_models_agree_for_thin_fins():
    # Source: Incropera 6th ed. eq. 3.89: the corrected length is accurate when h t/(2k) << 1
    # (here 1.5e-4); the two fin models give nearly the same chain.
    a = compare_with_chain(**SMALL, tip="corrected")
    b = compare_with_chain(**SMALL, tip="convective")
    assert a.chain_resistance_series == pytest.approx(b.chain_resistance_series, rel=1e-3)


@pytest.mark.identity
def test_chain_equals_conduction_for_bare_plate():
    # Identity: without fins the chain with the exact series is the exact solution of the
    # same problem, so only the mesh error remains.
    c = compare_with_chain(
        0.1, 0.1, 0.005, 0, 0.0, 0.0, 200.0, 500.0, 0.03, 0.03, refinement_levels=(1, 2, 4),
        mesh_cell_size=0.01,
    )  # fmt: skip
    assert abs(c.relative_difference_series) < 2e-3
    assert "extrapolated" in c.verdict


@pytest.mark.identity
def test_chain_good_for_thick_base_large_source_poor_for_thin_base_small_source():
    # Common practice, no source: the chain's uniform h_eff on the base ignores the fins that
    # also spread heat along the flow above a small source on a thin base; a thick base under a
    # large source makes this irrelevant.
    geometry = dict(
        base_width=0.1,
        base_length=0.1,
        fin_count=15,
        fin_thickness=0.0015,
        fin_height=0.03,
        thermal_conductivity=200.0,
        heat_transfer_coefficient=40.0,
    )
    good = compare_with_chain(
        **geometry, base_thickness=0.01, source_length=0.06, source_width=0.06
    )
    poor = compare_with_chain(
        **geometry, base_thickness=0.002, source_length=0.01, source_width=0.01
    )
    assert abs(good.relative_difference_series) < 0.03
    assert abs(poor.relative_difference_series) > 0.10
    assert abs(poor.relative_difference_series) > 3 * abs(good.relative_difference_series)
    assert abs(poor.relative_difference_song_lee_au) > abs(good.relative_difference_song_lee_au)


# ---------------------------------------------------------------- input errors


@pytest.mark.parametrize(
    "change, error",
    [
        (dict(fin_count=1), GeometryError),
        (dict(fin_count=40), GeometryError),  # 40 x 1.5 mm > 50 mm
        (dict(source_length=0.06), GeometryError),
        (dict(base_thickness=-0.001), InputError),
        (dict(heat_transfer_coefficient=np.array([10.0, 20.0])), InputError),
        (dict(solver="lu"), InputError),
        (dict(mesh_refinement=0), InputError),
        (dict(mesh_refinement=1.5), InputError),
    ],
)
def test_impossible_input_raises(change, error):
    with pytest.raises(error):
        _solve(**change)


def test_refine_study_needs_constant_ratio():
    with pytest.raises(InputError):
        refine_study(**SMALL, levels=(1, 2, 3))
    with pytest.raises(InputError):
        refine_study(**SMALL, levels=(1, 2))


def test_chain_rejects_unknown_tip_model():
    with pytest.raises(InputError):
        compare_with_chain(**SMALL, tip="insulated")
