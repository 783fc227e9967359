"""Tests of finkit.physics.radiation: published values, enclosure identities, a radiosity solve."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from finkit.constants import STEFAN_BOLTZMANN as SIGMA
from finkit.errors import GeometryError, InputError
from finkit.physics.correlations.natural import plate_fin_array_natural
from finkit.physics.radiation import (
    channel_effective_emissivity,
    envelope_radiation,
    pin_fin_radiation,
    plate_fin_radiation,
    radiation_coefficient_linearised,
)

CP = pytest.importorskip("CoolProp.CoolProp")


# ---------------------------------------------------------------- linearised coefficient


@pytest.mark.published
def test_pipe_radiation_incropera_example_1_2():
    # From memory: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Example 1.2
    # (uninsulated steam pipe, D = 70 mm, eps = 0.8, Ts = 200 °C, Tsur = 25 °C): radiation loss
    # per unit length q'_rad = 421 W/m (3 significant figures).
    D, Ts, Tsur = 0.070, 473.15, 298.15
    h_r = radiation_coefficient_linearised(0.8, Ts, Tsur)
    assert h_r * np.pi * D * (Ts - Tsur) == pytest.approx(421.0, rel=5e-3)


@pytest.mark.identity
def test_linearised_equals_exact_exchange():
    # Identity: h_r (Ts - Tsur) = eps sigma (Ts^4 - Tsur^4) (Incropera 6th ed. Eq. 1.9).
    Ts = np.array([310.0, 350.0, 400.0])
    h_r = radiation_coefficient_linearised(0.85, Ts, 295.0)
    assert h_r * (Ts - 295.0) == pytest.approx(0.85 * SIGMA * (Ts**4 - 295.0**4), rel=1e-12)


def test_black_coefficient_near_room_temperature():
    # Common practice, no source: a black surface near room temperature has h_r = 4 sigma T^3,
    # about 6 W/m² K.
    assert radiation_coefficient_linearised(1.0, 300.0, 300.0) == pytest.approx(
        4 * SIGMA * 300.0**3, rel=1e-12
    )
    assert 5.5 < radiation_coefficient_linearised(1.0, 300.0, 300.0) < 6.5


def test_bad_emissivity_and_temperature():
    with pytest.raises(InputError, match="emissivity"):
        radiation_coefficient_linearised(1.2, 300.0, 290.0)
    with pytest.raises(InputError, match="surface_temperature"):
        radiation_coefficient_linearised(0.5, -10.0, 290.0)


# ---------------------------------------------------------------- channel emissivity


@pytest.mark.identity
def test_effective_emissivity_limits():
    # Derivation (two-surface enclosure, Incropera 6th ed. Eq. 13.23): black walls are black;
    # opening = wall (flat plate) gives eps; a deep cavity (A_o/A_w -> 0) tends to black.
    eps = np.array([0.05, 0.3, 0.85])
    assert channel_effective_emissivity(1.0, 0.3, 1.0) == pytest.approx(1.0)
    assert channel_effective_emissivity(eps, 1.0, 1.0) == pytest.approx(eps)
    assert channel_effective_emissivity(eps, 1e-9, 1.0) == pytest.approx(1.0, abs=1e-7)
    assert channel_effective_emissivity(0.0, 0.3, 1.0) == 0.0


@pytest.mark.identity
@settings(max_examples=80, deadline=None)
@given(
    eps=st.floats(0.0, 1.0),
    ratio=st.floats(1e-4, 1.0),
)
def test_effective_emissivity_bounded(eps, ratio):
    # Derivation: a cavity is never less emissive than its walls, and never more than black.
    e = channel_effective_emissivity(eps, ratio, 1.0)
    assert eps - 1e-12 <= e <= 1.0 + 1e-12


def _radiosity_u_channel(S, H, eps, n=40):
    """Apparent emissivity of an infinitely long U-channel by discretised radiosity.

    Walls (two fins of height H, base of width S) split into n strips each, diffuse-gray at
    emissive power 1; the opening (width S) black at 0. View factors by Hottel's crossed strings.
    """
    pts = []
    y = np.linspace(H, 0.0, n + 1)
    pts += [((0.0, y[i]), (0.0, y[i + 1])) for i in range(n)]
    x = np.linspace(0.0, S, n + 1)
    pts += [((x[i], 0.0), (x[i + 1], 0.0)) for i in range(n)]
    y = np.linspace(0.0, H, n + 1)
    pts += [((S, y[i]), (S, y[i + 1])) for i in range(n)]
    pts.append(((S, H), (0.0, H)))
    P = np.array(pts)  # (m, 2 ends, 2 coords)
    a, b = P[:, 0], P[:, 1]
    length = np.linalg.norm(b - a, axis=1)

    def dist(p, q):
        return np.linalg.norm(p[:, None, :] - q[None, :, :], axis=2)

    crossed = dist(a, a) + dist(b, b)
    uncrossed = dist(a, b) + dist(b, a)
    F = np.abs(crossed - uncrossed) / (2.0 * length[:, None])
    np.fill_diagonal(F, 0.0)
    m = len(P)
    emiss = np.r_[np.full(m - 1, eps), 1.0]
    Eb = np.r_[np.ones(m - 1), 0.0]
    J = np.linalg.solve(np.eye(m) - (1.0 - emiss)[:, None] * F, emiss * Eb)
    irradiation_opening = F[-1] @ J
    return irradiation_opening  # opening is black at 0: net gain per area = eps_eff


@pytest.mark.identity
@pytest.mark.parametrize("depth_ratio", [2.0, 5.0, 10.0])
@pytest.mark.parametrize("eps", [0.1, 0.5, 0.8, 0.9])
def test_effective_emissivity_vs_discretised_radiosity(depth_ratio, eps):
    # Independent numeric check: N-surface radiosity with Hottel's crossed-string view factors
    # (Incropera 6th ed. Sections 13.1.4 and 13.3). The two-surface formula assumes uniform wall
    # radiosity, so it is an upper bound; it is within 4 % for eps >= 0.8 (anodised / painted)
    # up to depth/spacing = 10 (computed: +1.3, +2.9, +3.8 % at depth ratios 2, 5, 10).
    S = 5e-3
    H = depth_ratio * S
    numeric = _radiosity_u_channel(S, H, eps)
    formula = channel_effective_emissivity(eps, S, 2 * H + S)
    assert formula >= numeric * (1 - 1e-3)
    if eps >= 0.8:
        assert formula == pytest.approx(numeric, rel=0.04)


@pytest.mark.identity
def test_radiosity_helper_converged():
    # the reference solution itself: a black channel is black (view factors from the opening sum
    # to 1), and doubling the strips changes it by < 0.5 %
    assert _radiosity_u_channel(5e-3, 25e-3, 1.0) == pytest.approx(1.0, rel=1e-9)
    assert _radiosity_u_channel(5e-3, 25e-3, 0.5, n=40) == pytest.approx(
        _radiosity_u_channel(5e-3, 25e-3, 0.5, n=80), rel=5e-3
    )


# ---------------------------------------------------------------- sinks


def _sink(**over):
    args = dict(
        fin_spacing=6e-3,
        fin_height=30e-3,
        fin_length=0.1,
        fin_thickness=2e-3,
        fin_count=11,
        base_width=11 * 2e-3 + 10 * 6e-3,
        base_length=0.1,
        base_thickness=5e-3,
        emissivity=0.85,
        surface_temperature=338.15,
        surroundings_temperature=298.15,
    )
    args.update(over)
    return args


@pytest.mark.identity
def test_black_plate_fin_sink_radiates_through_its_box():
    # Derivation: a black isothermal body exchanges with large black surroundings as its convex
    # envelope does; with fins covering the base the envelope is the box W x L x (t_b + H) less
    # the mounted back.
    a = _sink(emissivity=1.0)
    r = plate_fin_radiation(**a)
    W, L, H, tb = a["base_width"], a["base_length"], a["fin_height"], a["base_thickness"]
    box = W * L + 2 * (H + tb) * (W + L)
    dT4 = a["surface_temperature"] ** 4 - a["surroundings_temperature"] ** 4
    assert r.heat_rate == pytest.approx(SIGMA * box * dT4, rel=1e-12)
    # same answer from the pin-fin (box-envelope) function for a black body
    p = pin_fin_radiation(r.radiating_area, W, L, H, tb, 1.0, 338.15, 298.15)
    assert p.heat_rate == pytest.approx(r.heat_rate, rel=1e-12)


@pytest.mark.identity
def test_envelope_convex_body_and_sparse_cap():
    # Derivation: a convex body (surface = envelope) radiates eps sigma A (Ts^4 - Tsur^4); an
    # envelope larger than the surface is capped at the same unshaded value.
    dT4 = 350.0**4 - 300.0**4
    for env in (0.2, 0.5):
        r = envelope_radiation(0.3, 0.2, env, 350.0, 300.0)
        assert r.heat_rate == pytest.approx(0.3 * SIGMA * 0.2 * dT4, rel=1e-12)
    assert envelope_radiation(0.3, 0.4, 0.2, 350.0, 300.0).heat_rate > 0.3 * SIGMA * 0.2 * dT4


@pytest.mark.identity
def test_plate_fin_conductance_and_equivalent_h():
    r = plate_fin_radiation(**_sink())
    assert r.conductance * 40.0 == pytest.approx(r.heat_rate, rel=1e-12)
    assert r.equivalent_heat_transfer_coefficient * r.radiating_area == pytest.approx(
        r.conductance, rel=1e-12
    )
    assert r.opening_area == pytest.approx(10 * (6e-3 * 0.1 + 2 * 6e-3 * 30e-3))
    assert r.wall_area == pytest.approx(10 * (2 * 30e-3 + 6e-3) * 0.1)
    # at zero difference: no heat, finite conductance
    z = plate_fin_radiation(**_sink(surface_temperature=298.15))
    assert z.heat_rate == 0.0 and z.conductance > 0.0


def test_radiation_share_in_natural_convection():
    # Common practice, no source (docs/methods.md g3 [CP]): radiation is often 20-40 % of the total
    # for black-anodised natural-convection sinks. Isothermal sink at 40 K rise, eps = 0.85.
    a = _sink()
    Ts, Ta = a["surface_temperature"], a["surroundings_temperature"]
    props = [
        CP.PropsSI(q, "T", 0.5 * (Ts + Ta), "P", 101325.0, "Air") for q in "D V L Prandtl".split()
    ]
    c = plate_fin_array_natural(
        a["fin_spacing"],
        a["fin_height"],
        a["fin_length"],
        a["fin_thickness"],
        a["fin_count"],
        a["base_width"],
        Ts,
        Ta,
        *props,
    )
    q_conv = (Ts - Ta) * (
        c.heat_transfer_coefficient * c.channel_area
        + c.outer_face_heat_transfer_coefficient * c.outer_face_area
    )
    q_rad = plate_fin_radiation(**a).heat_rate
    share = q_rad / (q_rad + q_conv)
    assert 0.15 < share < 0.45
    # a bare (polished, eps = 0.05) sink radiates little (common practice: below ~10 %)
    q_bare = plate_fin_radiation(**_sink(emissivity=0.05)).heat_rate
    assert q_bare / (q_bare + q_conv) < 0.10


@pytest.mark.shape
def test_plate_fin_radiation_broadcasts():
    eps = np.array([0.1, 0.5, 0.9])
    Ts = np.array([[320.0], [360.0]])
    r = plate_fin_radiation(**_sink(emissivity=eps, surface_temperature=Ts))
    assert r.heat_rate.shape == (2, 3)
    single = plate_fin_radiation(**_sink(emissivity=0.5, surface_temperature=360.0))
    assert r.heat_rate[1, 1] == pytest.approx(single.heat_rate, rel=1e-12)


def test_plate_fin_radiation_geometry_errors():
    with pytest.raises(GeometryError, match="fins do not fit"):
        plate_fin_radiation(**_sink(fin_count=12))
    with pytest.raises(GeometryError, match="fin_length"):
        plate_fin_radiation(**_sink(fin_length=0.2))
