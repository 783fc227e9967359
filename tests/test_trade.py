"""Trade studies, Pareto fronts and optimisers (finkit.model.trade) and the ``trade_study:`` schema.

Checks: the Pareto filter against a brute-force dominance test; manufacturing flags on
hand-made designs; the optimisers against a brute-force grid (the optimum must be at least as
good as every feasible grid point and no further from the grid's best than one grid step
changes the objective); the natural-convection fin-count optimum against Bar-Cohen & Rohsenow's
optimum spacing with air properties from CoolProp.
"""

from dataclasses import replace

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.case.explore_blocks import (
    ExploreError,
    load_trade_study,
    to_bounds,
    to_envelope,
    to_trade_axes,
)
from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError, NotSupportedError
from finkit.model import SinkInputs, solve
from finkit.model.trade import (
    minimise_junction_temperature,
    minimise_mass_meeting_limit,
    optimum_fin_count_natural,
    pareto_front,
    pin_fin_grid,
    plate_fin_designs,
    plate_fin_grid,
    plate_fin_sample,
)
from finkit.physics.airflow import FanCurve
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.sink import (
    Air,
    FanDriven,
    GivenVolumeFlow,
    HeatSource,
    NaturalConvection,
    SinkMaterial,
)

# Invented test cases (not demo data, no product's values).
ALU = SinkMaterial(thermal_conductivity=200.0, emissivity=0.0, density=2700.0)
SOURCE = HeatSource(
    power=40.0,
    footprint_length=0.025,
    footprint_width=0.025,
    junction_to_case_resistance=0.3,
    interface_resistance=0.04,
)
FAN = FanCurve(
    volume_flow=np.array([0.0, 2.5, 5.0, 7.5, 10.0]) * 1e-3,
    static_pressure=np.array([90.0, 78.0, 60.0, 34.0, 0.0]),
    rating_density=1.2,
)
PLATE_FAN = SinkInputs(
    geometry=PlateFinSink(0.07, 0.06, 0.004, 12, 0.0012, 0.025),
    material=ALU,
    source=SOURCE,
    air=Air(ZERO_CELSIUS + 40.0, 101325.0),
    flow=FanDriven(FAN),
    bypass=None,
    limit_node="junction",
    limit_temperature=ZERO_CELSIUS + 100.0,
    required_margin=5.0,
)
ENVELOPE = Envelope(0.07, 0.06, 0.004, 0.004 + 0.03)
BOUNDS = ManufacturingBounds(min_fin_gap=1.5e-3, min_fin_thickness=0.8e-3, max_fin_aspect_ratio=12)


# --------------------------------------------------------------------------------------
# Pareto front
# --------------------------------------------------------------------------------------


def _brute_force_front(points):
    """Reference: a row is on the front if no row is <= everywhere and < somewhere."""
    p = np.asarray(points, float)
    ok = np.all(np.isfinite(p), axis=1)
    out = np.zeros(len(p), bool)
    for i in np.flatnonzero(ok):
        q = p[ok]
        dominated = np.any(np.all(q <= p[i], axis=1) & np.any(q < p[i], axis=1))
        out[i] = not dominated
    return out


@pytest.mark.identity
def test_pareto_front_on_a_hand_made_set():
    # By inspection: (3, 4) is dominated by (2, 3); (5, 5) by everything; (2, 3) appears twice
    # and both copies stay; the NaN row never takes part.
    pts = [[1, 5], [2, 3], [3, 4], [4, 1], [2, 3], [5, 5], [np.nan, 0], [4, 2]]
    assert pareto_front(pts).tolist() == [True, True, False, True, True, False, False, False]
    pts3 = [[1, 1, 9], [1, 1, 9], [2, 2, 2], [3, 3, 3], [0, 5, 5], [2, 2, 1]]
    assert pareto_front(pts3).tolist() == [True, True, False, False, True, True]


@pytest.mark.identity
@pytest.mark.parametrize("dims", [2, 3, 4])
def test_pareto_front_matches_brute_force_dominance(dims):
    rng = np.random.default_rng(dims)
    pts = np.round(rng.random((600, dims)), 2)  # rounding makes ties and duplicates
    pts[::50, 0] = np.nan
    assert np.array_equal(pareto_front(pts), _brute_force_front(pts))


# --------------------------------------------------------------------------------------
# Grids and flags
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_infeasible_designs_are_flagged_with_reasons():
    # W = 70 mm. N = 40, t = 1 mm: fins fill 40 mm, gap 30/39 = 0.77 mm < 1.5 mm, and
    # 20 mm / 0.77 mm = 26 > 12.
    # N = 60, t = 1.2 mm: 72 mm of metal > 70 mm, do not fit. N = 10, t = 0.5 mm: too thin.
    # N = 20, t = 1 mm: gap 50/19 = 2.63 mm, 40 mm height / 2.63 mm = 15.2 > 12 and taller
    # than the 30 mm envelope.
    n = [40, 60, 10, 20, 10]
    t = [1e-3, 1.2e-3, 0.5e-3, 1e-3, 1e-3]
    h = [0.02, 0.02, 0.02, 0.04, 0.02]
    study = plate_fin_designs(PLATE_FAN, n, h, t, BOUNDS, ENVELOPE)
    reasons = study.reasons
    assert reasons[0] == "fin gap below minimum; fin height/gap above maximum"
    assert "fins do not fit across the base" in reasons[1]
    assert reasons[2] == "fin thickness below minimum"
    assert reasons[3] == "fin height/gap above maximum; taller than the envelope"
    assert reasons[4] == ""
    assert np.all(np.isnan(study.junction_temperature[:4]))
    assert np.isfinite(study.junction_temperature[4])


@pytest.mark.shape
def test_grid_results_equal_single_design_solves():
    study = plate_fin_grid(PLATE_FAN, [8, 12, 16], [0.015, 0.025], [1e-3, 1.5e-3], BOUNDS, ENVELOPE)
    assert len(study) == 12
    assert study.design["fin_count"].tolist()[:4] == [8, 8, 8, 8]  # count varies slowest
    # The batch and the single solve stop the fan-operating-point root at slightly different
    # points (bracket tolerance), hence 1e-8 rather than round-off.
    for i in (0, 5, 11):
        sol = solve(study.inputs_for(i))
        assert study.junction_temperature[i] == pytest.approx(
            float(sol.junction_temperature), rel=1e-8
        )
        assert study.pressure_drop[i] == pytest.approx(float(sol.pressure_drop), rel=1e-8)
    g = study.inputs_for(3).geometry
    assert study.mass[3] == pytest.approx(float(g.mass(2700.0)), rel=1e-12)
    # Allowable power puts the limit node at limit - margin (definition; the two solves stop
    # the film-temperature fixed point after the same few passes, so they agree to ~1e-5 K).
    assert np.all(study.allowable_power > 0)
    at = solve(study.inputs_for(5), source=replace(SOURCE, power=study.allowable_power[5]))
    assert float(at.junction_temperature) == pytest.approx(
        PLATE_FAN.limit_temperature - 5.0, abs=1e-3
    )


@pytest.mark.identity
def test_pareto_of_a_study_holds_the_single_objective_optima():
    study = plate_fin_grid(
        PLATE_FAN,
        np.arange(4, 30, 2),
        np.linspace(0.01, 0.03, 5),
        [0.8e-3, 1.2e-3, 2e-3],
        BOUNDS,
        ENVELOPE,
    )
    front = set(study.pareto(("sink_resistance", "pressure_drop", "mass")).tolist())
    for name in ("sink_resistance", "pressure_drop", "mass"):
        values = np.where(study.is_feasible, study.column(name), np.nan)
        best = np.flatnonzero(values == np.nanmin(values))
        assert front & set(best.tolist())
    assert all(study.is_feasible[i] for i in front)


@pytest.mark.shape
def test_latin_hypercube_sample_stays_in_its_box():
    study = plate_fin_sample(
        PLATE_FAN, 400, (6, 20), (0.01, 0.03), (0.8e-3, 2e-3), BOUNDS, ENVELOPE, seed=1
    )
    n = study.design["fin_count"]
    assert len(study) == 400
    assert n.min() == 6 and n.max() == 20 and np.all(n == np.round(n))
    assert np.all((study.design["fin_height"] >= 0.01) & (study.design["fin_height"] <= 0.03))
    assert study.is_feasible.sum() > 100


@pytest.mark.identity
def test_pin_grid_flags_overlap_and_gap():
    pins = replace(
        PLATE_FAN,
        geometry=PinFinSink(0.06, 0.06, 0.004, 0.003, 0.02, 0.007, 0.007, "inline"),
        flow=GivenVolumeFlow(6e-3),
    )
    study = pin_fin_grid(
        pins, [2e-3, 3e-3], [0.02], [2.5e-3, 4e-3, 7e-3], envelope=Envelope.of(pins, 0.03)
    )
    d, st = study.design["pin_diameter"], study.design["transverse_pitch"]
    # Pitch 2.5 mm < 3 mm diameter: overlap; gap 4 - 3 = 1 mm < 1.5 mm: gap; 7 - 2 = 5 mm: fine.
    assert "pins overlap or do not fit" in study.reasons[(d == 3e-3) & (st == 2.5e-3)][0]
    assert study.reasons[(d == 3e-3) & (st == 4e-3)][0] == "pin gap below minimum"
    ok = (d == 2e-3) & (st == 7e-3)
    assert study.is_feasible[ok][0] and study.design["pin_count"][ok][0] == 81  # 9 x 9 pins


# --------------------------------------------------------------------------------------
# Optimisers against a brute-force grid
# --------------------------------------------------------------------------------------


def _grid(inputs):
    counts = np.arange(4, 30)
    heights = np.linspace(0.005, 0.030, 26)  # 1 mm steps
    thicknesses = np.linspace(0.8e-3, 4e-3, 33)  # 0.1 mm steps
    return plate_fin_grid(
        inputs, counts, heights, thicknesses, BOUNDS, ENVELOPE, with_allowable=False
    )


@pytest.mark.identity
def test_coolest_design_matches_brute_force_grid():
    opt = minimise_junction_temperature(PLATE_FAN, BOUNDS, ENVELOPE)
    grid = _grid(PLATE_FAN)
    best = grid.best("junction_temperature")
    # Every grid point is a feasible design: the optimum must be at least as cool ...
    assert opt.junction_temperature <= grid.junction_temperature[best] + 1e-6
    # ... and the grid's best within what one grid step (1 mm, 0.1 mm) changes at the optimum.
    step = []
    for dh, dt in ((-1e-3, 0), (0, 1e-4), (0, -1e-4)):
        g = replace(
            opt.inputs.geometry,
            fin_height=opt.fin_height + dh,
            fin_thickness=max(opt.fin_thickness + dt, 0.8e-3),
        )
        step.append(
            abs(
                float(solve(opt.inputs, geometry=g).junction_temperature) - opt.junction_temperature
            )
        )
    assert grid.junction_temperature[best] - opt.junction_temperature <= max(step) + 1e-9
    assert abs(grid.design["fin_count"][best] - opt.fin_count) <= 1
    assert abs(grid.design["fin_thickness"][best] - opt.fin_thickness) <= 1e-4 + 1e-12
    assert opt.fin_spacing >= BOUNDS.min_fin_gap * (1 - 1e-9)
    assert opt.fin_height <= BOUNDS.max_fin_aspect_ratio * opt.fin_spacing * (1 + 1e-9)
    assert opt.fin_height <= ENVELOPE.max_fin_height * (1 + 1e-12)


@pytest.mark.identity
def test_lightest_design_meeting_the_limit_matches_brute_force_grid():
    case = replace(PLATE_FAN, limit_temperature=ZERO_CELSIUS + 95.0)
    opt = minimise_mass_meeting_limit(case, BOUNDS, ENVELOPE)
    usable = case.limit_temperature - case.required_margin
    assert opt.meets_limit
    assert opt.limit_node_temperature <= usable + 1e-6
    grid = _grid(case)
    ok = grid.is_feasible & (grid.limit_node_temperature <= usable)
    best = np.flatnonzero(ok)[np.argmin(grid.mass[ok])]
    assert opt.mass <= grid.mass[best] + 1e-9
    # Within one grid step of metal: a 1 mm taller or 0.1 mm thicker fin set of N fins.
    step = 2700.0 * opt.fin_count * 0.06 * max(1e-3 * opt.fin_thickness, 1e-4 * opt.fin_height)
    assert grid.mass[best] - opt.mass <= step


def test_optimiser_rejects_pin_fins():
    pins = replace(PLATE_FAN, geometry=PinFinSink(0.06, 0.06, 0.004, 0.003, 0.02, 0.007, 0.007))
    with pytest.raises(NotSupportedError):
        minimise_junction_temperature(pins)


# --------------------------------------------------------------------------------------
# Natural convection: Bar-Cohen & Rohsenow optimum spacing
# --------------------------------------------------------------------------------------


def _bar_cohen_rohsenow_spacing(length, excess, ambient):
    # Source: Bar-Cohen, A., Rohsenow, W.M., "Thermally optimum spacing of vertical, natural
    # convection cooled, parallel plates", J. Heat Transfer 106(1), 116-123, 1984:
    # S_opt = 2.714 (g beta dT / (nu alpha L))^(-1/4), isothermal symmetric plates.
    # Air properties at the film temperature: Cross-check: CoolProp (dry air, 1 atm).
    film = ambient + excess / 2
    rho = PropsSI("D", "T", film, "P", 101325.0, "Air")
    nu = PropsSI("V", "T", film, "P", 101325.0, "Air") / rho
    alpha = PropsSI("L", "T", film, "P", 101325.0, "Air") / (
        rho * PropsSI("C", "T", film, "P", 101325.0, "Air")
    )
    return 2.714 * (9.80665 * excess / film / (nu * alpha * length)) ** -0.25


NATURAL = SinkInputs(
    geometry=PlateFinSink(0.30, 0.15, 0.004, 10, 0.1e-3, 0.04),
    material=SinkMaterial(thermal_conductivity=1e5, emissivity=0.0, density=2700.0),
    source=replace(SOURCE, power=20.0),
    air=Air(300.0, 101325.0, 300.0),
    flow=NaturalConvection(),
    bypass=None,
    limit_node="junction",
    limit_temperature=400.0,
    required_margin=0.0,
)


@pytest.mark.published
@pytest.mark.parametrize("excess", [10.0, 40.0, 80.0])
def test_natural_fin_count_optimum_agrees_with_bar_cohen_rohsenow_for_thin_isothermal_fins(excess):
    # Thin (0.1 mm), nearly isothermal (k huge) fins, no radiation: the array heat is then
    # (N-1) h 2 H L ~ W/S * Nu_S k/S * 2 H L, which is B&R's objective Nu_S/S^2, so the best
    # whole count's gap must lie within one count step of S_opt; the residual (~3 %) comes
    # from the end fins' outer faces, the base between fins and the (N-1)/N channel count.
    s_opt = _bar_cohen_rohsenow_spacing(0.15, excess, 300.0)
    res = optimum_fin_count_natural(
        NATURAL, base_temperature_difference=excess, bounds=ManufacturingBounds(min_fin_gap=1e-3)
    )
    assert res.optimum_spacing_bar_cohen_rohsenow == pytest.approx(s_opt, rel=0.01)
    assert res.fin_spacing == pytest.approx(s_opt, rel=0.05)
    k = int(np.flatnonzero(res.fin_counts == res.fin_count)[0])
    assert res.fin_spacings[k + 1] * 0.97 <= s_opt <= res.fin_spacings[k - 1]
    # The heat has an interior maximum over the count.
    assert res.values[k] > res.values[0] and res.values[k] > res.values[-1]


@pytest.mark.published
@pytest.mark.parametrize("thickness", [1e-3, 2e-3])
def test_natural_fin_count_optimum_with_real_fins_is_near_bar_cohen_rohsenow(thickness):
    # Aluminium fins 1-2 mm thick, 25 mm tall: thickness costs channels and fin efficiency is
    # below one, so the best gap is somewhat wider than S_opt; within 20 % is the agreement
    # expected of the zero-thickness isothermal optimum (stated tolerance, see
    # optimum_fin_count_natural Notes).
    case = replace(
        NATURAL,
        geometry=replace(NATURAL.geometry, fin_thickness=thickness, fin_height=0.025),
        material=ALU,
    )
    s_opt = _bar_cohen_rohsenow_spacing(0.15, 40.0, 300.0)
    res = optimum_fin_count_natural(case, base_temperature_difference=40.0)
    assert res.fin_spacing == pytest.approx(s_opt, rel=0.20)
    assert res.fin_spacing >= s_opt  # thick fins push the optimum to wider gaps


@pytest.mark.identity
def test_natural_junction_objective_agrees_with_heat_objective():
    # The coolest count at the power P has base excess theta*; no other count can carry more
    # than P at theta* (it would then run cooler at P), so the heat objective at theta* picks
    # the same count, up to the small change of the spreading resistance with the count.
    case = replace(
        NATURAL,
        geometry=replace(NATURAL.geometry, fin_thickness=1.5e-3, fin_height=0.03),
        material=ALU,
    )
    by_t = optimum_fin_count_natural(case, objective="junction_temperature")
    geometry = replace(case.geometry, fin_count=by_t.fin_count)
    theta = float(solve(case, geometry=geometry).base_temperature) - 300.0
    by_q = optimum_fin_count_natural(case, objective="heat_rate", base_temperature_difference=theta)
    assert abs(by_t.fin_count - by_q.fin_count) <= 1
    assert by_t.optimum_spacing_bar_cohen_rohsenow == pytest.approx(
        by_q.optimum_spacing_bar_cohen_rohsenow, rel=1e-9
    )


# --------------------------------------------------------------------------------------
# The trade_study: block
# --------------------------------------------------------------------------------------


def test_trade_study_block_runs_a_grid():
    block = load_trade_study(
        {
            "fin_count": {"low": 6, "high": 12},
            "fin_height": {"low": "10 mm", "high": "30 mm", "points": 3},
            "fin_thickness": {"values": ["0.8 mm", "1.2 mm"]},
            "max_height": "34 mm",
            "bounds": {"min_fin_gap": "2 mm", "max_fin_aspect_ratio": 12},
        }
    )
    axes = to_trade_axes(block)
    assert axes["fin_count"].tolist() == list(range(6, 13))
    assert axes["fin_height"] == pytest.approx([0.01, 0.02, 0.03])
    bounds, envelope = to_bounds(block), to_envelope(block, PLATE_FAN)
    assert bounds.min_fin_gap == pytest.approx(2e-3)
    assert envelope.max_height == pytest.approx(0.034)
    study = plate_fin_grid(
        PLATE_FAN, axes["fin_count"], axes["fin_height"], axes["fin_thickness"], bounds, envelope
    )
    assert len(study) == 7 * 3 * 2


@pytest.mark.parametrize(
    ("data", "field"),
    [
        ({"fin_count": {"low": 6, "high": 12}}, "trade_study.fin_height:"),
        (
            {
                "fin_count": {"low": 6},
                "fin_height": {"values": [0.01]},
                "fin_thickness": {"values": [0.001]},
            },
            "trade_study.fin_count.high:",
        ),
        (
            {
                "fin_count": {"low": 6, "high": 8},
                "fin_height": {"values": [0.01]},
                "fin_thickness": {"values": [0.001]},
                "bounds": {"min_fin_gap": "2 W"},
            },
            "trade_study.bounds.min_fin_gap:",
        ),
        (
            {
                "fin_count": {"low": 6, "high": 8},
                "fin_height": {"values": [0.01]},
                "fin_thickness": {"values": [0.001]},
                "sampling": "sobol",
            },
            "trade_study.samples:",
        ),
        (
            {
                "fin_count": {"low": 6, "high": 8},
                "fin_height": {"values": [0.01]},
                "fin_thickness": {"values": [0.001]},
                "objective": "best",
            },
            "trade_study.objective:",
        ),
        (
            {
                "fin_count": {"low": 6, "high": 8},
                "fin_height": {"values": [0.01]},
                "fin_thickness": {"values": [0.001]},
                "max_hight": "3 mm",
            },
            "trade_study.max_hight:",
        ),
    ],
)
def test_bad_trade_study_block_names_the_field(data, field):
    with pytest.raises(ExploreError) as err:
        load_trade_study(data)
    assert err.value.errors[0].startswith(field)


def test_bounds_reject_nonsense():
    with pytest.raises(InputError):
        ManufacturingBounds(min_fin_gap=-1.0)
    with pytest.raises(InputError):
        Envelope(0.07, 0.06, 0.004, 0.003)


@pytest.mark.shape
def test_very_hot_designs_are_extrapolated_not_fatal():
    # Two short fins at 250 W would put the air film far beyond the property table (500 K);
    # the batch still solves, the hot design is flagged and lies far above the limit.
    case = replace(PLATE_FAN, source=replace(SOURCE, power=250.0))
    study = plate_fin_designs(case, [2, 20], [0.005, 0.03], [2e-3, 1e-3], BOUNDS, ENVELOPE)
    assert study.is_extrapolated.tolist() == [True, False]
    assert study.junction_temperature[0] > case.limit_temperature + 100.0
    assert np.isfinite(study.allowable_power).all()
    assert not study.meets_limit[0]
