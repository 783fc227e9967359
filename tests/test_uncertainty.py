"""Monte Carlo and tornado sensitivity (finkit.model.uncertainty) and the ``tolerances:`` schema.

The checks are identities of probability: zero tolerances give the deterministic result
exactly; where the junction temperature is exactly linear in an input (the junction-to-case
and interface resistances enter only as ``T_j = T_case_side + P (R_int + R_jc)``), the sample
variance, percentiles and exceedance probability must match the analytic distribution within
sampling error; the distributions themselves are cross-checked against scipy.stats.
"""

from dataclasses import replace

import numpy as np
import pytest
from scipy import stats

from finkit.case.explore_blocks import (
    ExploreError,
    load_monte_carlo,
    load_tolerances,
    to_tolerances,
)
from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.model import SinkInputs, solve
from finkit.model.uncertainty import (
    TOLERANCE_INPUTS,
    Tolerance,
    monte_carlo,
    nominal_value,
    sensitivity,
)
from finkit.physics.airflow import FanCurve
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.sink import (
    Air,
    Bypass,
    FanDriven,
    GivenVolumeFlow,
    HeatSource,
    NaturalConvection,
    SinkMaterial,
)

# Invented test cases (not demo data, no product's values).
ALU = SinkMaterial(thermal_conductivity=190.0, emissivity=0.0, density=2700.0)
SOURCE = HeatSource(
    power=35.0,
    footprint_length=0.02,
    footprint_width=0.03,
    junction_to_case_resistance=0.4,
    interface_resistance=0.06,
)
FAN = FanCurve(
    volume_flow=np.array([0.0, 2.5, 5.0, 7.5, 10.0]) * 1e-3,
    static_pressure=np.array([90.0, 78.0, 60.0, 34.0, 0.0]),
    rating_density=1.2,
)
PLATE_FAN = SinkInputs(
    geometry=PlateFinSink(0.07, 0.05, 0.004, 12, 0.001, 0.025),
    material=ALU,
    source=SOURCE,
    air=Air(ZERO_CELSIUS + 40.0, 101325.0),
    flow=FanDriven(FAN),
    bypass=Bypass(side_gap=0.003, top_gap=0.002),
    limit_node="junction",
    limit_temperature=ZERO_CELSIUS + 100.0,
    required_margin=5.0,
)
PIN_FLOW = SinkInputs(
    geometry=PinFinSink(0.05, 0.05, 0.004, 0.0025, 0.02, 0.006, 0.006, "inline"),
    material=ALU,
    source=SOURCE,
    air=Air(ZERO_CELSIUS + 35.0, 101325.0),
    flow=GivenVolumeFlow(6e-3),
    bypass=None,
    limit_node="case",
    limit_temperature=ZERO_CELSIUS + 95.0,
    required_margin=5.0,
)
NATURAL = SinkInputs(
    geometry=PlateFinSink(0.12, 0.12, 0.005, 9, 0.0018, 0.03),
    material=replace(ALU, emissivity=0.85),
    source=replace(SOURCE, power=12.0),
    air=Air(ZERO_CELSIUS + 35.0, 101325.0, ZERO_CELSIUS + 35.0),
    flow=NaturalConvection(),
    bypass=None,
    limit_node="junction",
    limit_temperature=ZERO_CELSIUS + 110.0,
    required_margin=5.0,
)
PLATE_FLOW = replace(PLATE_FAN, flow=GivenVolumeFlow(5e-3), bypass=None)


def _zero(case):
    tol = {
        "heat_transfer": Tolerance("normal", relative=0.0),
        "power": Tolerance("uniform", relative=0.0),
        "interface_resistance": Tolerance("triangular", absolute=0.0),
        "junction_to_case": Tolerance("normal", absolute=0.0),
        "inlet_temperature": Tolerance("normal", absolute=0.0),
        "thermal_conductivity": Tolerance("uniform", relative=0.0),
    }
    if isinstance(case.flow, FanDriven):
        tol["fan_pressure"] = Tolerance("uniform", relative=0.0)
    if isinstance(case.flow, GivenVolumeFlow):
        tol["airflow"] = Tolerance("normal", relative=0.0)
    if not isinstance(case.flow, NaturalConvection):
        tol["pressure_drop"] = Tolerance("normal", relative=0.0)
    return tol


# --------------------------------------------------------------------------------------
# Exactness with zero tolerances
# --------------------------------------------------------------------------------------


@pytest.mark.identity
@pytest.mark.parametrize("case", [PLATE_FAN, PIN_FLOW, NATURAL], ids=["fan", "pins", "natural"])
def test_zero_tolerances_give_the_deterministic_result_exactly(case):
    # Identity: with every tolerance of zero width the Monte Carlo is the deterministic solve.
    result = monte_carlo(case, _zero(case), samples=500, seed=3)
    sol = solve(case)
    assert result.count == 500
    for name in ("junction_temperature", "case_temperature", "base_temperature"):
        assert np.array_equal(getattr(result, name), np.full(500, getattr(sol, name)))
    node = float(sol.node_temperature(case.limit_node))
    assert np.array_equal(result.limit_node_temperature, np.full(500, node))
    assert result.mean() == node
    assert result.std() == 0.0
    assert all(v == node for v in result.percentiles().values())
    assert result.samples == {}


@pytest.mark.identity
def test_no_tolerances_at_all_is_the_deterministic_result():
    # Identity: an empty tolerance mapping is the deterministic case.
    result = monte_carlo(PLATE_FLOW, {}, samples=10)
    assert np.array_equal(
        result.junction_temperature, np.full(10, solve(PLATE_FLOW).junction_temperature)
    )


# --------------------------------------------------------------------------------------
# Linear cases: analytic variance, percentiles, exceedance
# --------------------------------------------------------------------------------------

N = 100_000


@pytest.mark.identity
def test_variance_of_linear_input_matches_truncated_normal():
    # T_j = T_case + P R_jc exactly, so var(T_j) = P^2 var(R_jc).
    # Cross-check: scipy.stats.truncnorm(-4, 4).var() for the +/-4 sigma truncation.
    sigma = 0.05
    tol = {"junction_to_case": Tolerance("normal", absolute=sigma)}
    result = monte_carlo(PLATE_FAN, tol, samples=N, seed=11)
    expected = (SOURCE.power * sigma) ** 2 * stats.truncnorm(-4, 4).var()
    s2 = result.std() ** 2
    # Sample variance of n normal values: (n-1) s^2 / sigma^2 ~ chi2(n-1); 99.9 % interval.
    lo, hi = stats.chi2.ppf([0.0005, 0.9995], N - 1) / (N - 1)
    assert lo * expected < s2 < hi * expected
    assert result.mean() == pytest.approx(float(solve(PLATE_FAN).junction_temperature), abs=0.01)


@pytest.mark.identity
def test_variance_of_two_independent_linear_inputs_adds():
    # T_j - nominal = P (dR_int + dR_jc): var = P^2 (var_uniform + var_triangular).
    # Cross-check: scipy.stats.uniform / scipy.stats.triang variances.
    tol = {
        "interface_resistance": Tolerance("uniform", low=0.03, high=0.09),
        "junction_to_case": Tolerance("triangular", absolute=0.1),
    }
    result = monte_carlo(PIN_FLOW, tol, samples=N, seed=5, method="latin-hypercube")
    var_u = stats.uniform(loc=0.03, scale=0.06).var()
    var_t = stats.triang(c=0.5, loc=0.3, scale=0.2).var()
    expected = SOURCE.power**2 * (var_u + var_t)
    # Standard error of a sample variance ~ sigma^2 sqrt((kurtosis - 1)/n) < 0.3 %; 2 % is
    # about seven standard errors.
    assert result.std("junction_temperature") ** 2 == pytest.approx(expected, rel=0.02)
    # The case node (limit node here) does not see R_jc but does see R_int.
    assert result.std() ** 2 == pytest.approx(SOURCE.power**2 * var_u, rel=0.02)


@pytest.mark.identity
def test_exceedance_probability_and_percentiles_match_the_normal_distribution():
    # T_j normal (4-sigma truncated) with sigma_T = P sigma_R; set the limit 1.5 sigma_T above.
    # Cross-check: scipy.stats.truncnorm survival function and quantiles.
    sigma = 0.04
    nominal = float(solve(PLATE_FAN).junction_temperature)
    sigma_t = SOURCE.power * sigma
    case = replace(PLATE_FAN, limit_temperature=nominal + 1.5 * sigma_t, required_margin=0.0)
    result = monte_carlo(case, {"junction_to_case": Tolerance("normal", absolute=sigma)}, N, 2)
    dist = stats.truncnorm(-4, 4, loc=nominal, scale=sigma_t)
    p = dist.sf(case.limit_temperature)
    assert abs(result.probability_exceeding_limit - p) < 4 * np.sqrt(p * (1 - p) / N)
    for q, value in result.percentiles().items():
        if q < 99.9:
            assert value == pytest.approx(dist.ppf(q / 100), abs=0.02 * sigma_t)
    # The Clopper-Pearson bound lies above the estimate.
    assert result.exceedance_upper_bound(case.limit_temperature) > p


@pytest.mark.identity
def test_power_tolerance_follows_the_delta_method():
    # Nearly linear: std(T_j) ~ |dT_j/dP| sigma_P (film-property feedback makes it slightly
    # non-linear); derivative by a central difference of the deterministic solve.
    sigma = 0.03 * SOURCE.power
    result = monte_carlo(PLATE_FLOW, {"power": Tolerance("normal", relative=0.03)}, N, 9)
    dp = 0.01

    def tj(p):
        return float(solve(PLATE_FLOW, source=replace(SOURCE, power=p)).junction_temperature)

    slope = (tj(SOURCE.power + dp) - tj(SOURCE.power - dp)) / (2 * dp)
    assert result.std() == pytest.approx(
        slope * sigma * np.sqrt(stats.truncnorm(-4, 4).var()), rel=0.01
    )


@pytest.mark.identity
def test_inlet_temperature_shifts_the_junction_almost_one_for_one():
    # T_j - T_in depends on T_in only through the air properties (< 1 % per 10 K).
    tol = {"inlet_temperature": Tolerance("uniform", absolute=5.0)}
    result = monte_carlo(PLATE_FLOW, tol, samples=20_000, seed=1)
    assert result.std() == pytest.approx(10.0 / np.sqrt(12.0), rel=0.03)


# --------------------------------------------------------------------------------------
# Sampling
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_seed_reproduces_and_order_of_the_mapping_does_not_matter():
    a = {
        "power": Tolerance("normal", relative=0.05),
        "heat_transfer": Tolerance("uniform", relative=0.2),
    }
    b = dict(reversed(list(a.items())))
    r1 = monte_carlo(PIN_FLOW, a, samples=2000, seed=42)
    r2 = monte_carlo(PIN_FLOW, b, samples=2000, seed=42)
    r3 = monte_carlo(PIN_FLOW, a, samples=2000, seed=43)
    assert np.array_equal(r1.junction_temperature, r2.junction_temperature)
    assert not np.array_equal(r1.junction_temperature, r3.junction_temperature)


@pytest.mark.identity
def test_latin_hypercube_fills_every_stratum_once():
    # Latin hypercube (McKay, Beckman & Conover, Technometrics 21(2), 1979): each of the n
    # equal-probability strata of every input holds exactly one sample.
    n = 1000
    result = monte_carlo(
        PIN_FLOW, {"power": Tolerance("uniform", absolute=2.0)}, n, 4, "latin-hypercube"
    )
    u = (result.samples["power"] - (SOURCE.power - 2.0)) / 4.0
    assert np.array_equal(np.sort(np.floor(u * n)), np.arange(n))


@pytest.mark.identity
@pytest.mark.parametrize(
    ("tol", "dist"),
    [
        (Tolerance("normal", relative=0.2, sigmas=2), stats.truncnorm(-4, 4, loc=2.0, scale=0.2)),
        (
            Tolerance("normal", low=1.0, high=3.0, sigmas=2),
            stats.truncnorm(-4, 4, loc=2.0, scale=0.5),
        ),
        (Tolerance("uniform", absolute=0.5), stats.uniform(loc=1.5, scale=1.0)),
        (Tolerance("triangular", relative=0.25), stats.triang(c=0.5, loc=1.5, scale=1.0)),
        (Tolerance("triangular", low=1.0, high=4.0), stats.triang(c=1 / 3, loc=1.0, scale=3.0)),
    ],
)
def test_tolerance_distributions_match_scipy(tol, dist):
    # Cross-check: scipy.stats distributions (variance, mean, quantiles), nominal value 2.0.
    p = np.array([0.001, 0.1, 0.3, 0.5, 0.77, 0.999])
    assert tol.quantile(p, 2.0) == pytest.approx(dist.ppf(p), rel=1e-9)
    assert tol.variance(2.0) == pytest.approx(dist.var(), rel=1e-9)
    assert tol.mean(2.0) == pytest.approx(dist.mean(), rel=1e-12)


# --------------------------------------------------------------------------------------
# Tornado
# --------------------------------------------------------------------------------------


@pytest.mark.identity
def test_tornado_swings_and_order():
    tol = {
        "junction_to_case": Tolerance("normal", relative=0.2),
        "thermal_conductivity": Tolerance("uniform", relative=0.02),
        "inlet_temperature": Tolerance("normal", absolute=2.0),
        "heat_transfer": Tolerance("normal", relative=0.1),
    }
    tornado = sensitivity(PLATE_FAN, tol, coverage=0.95)
    bars = {b.name: b for b in tornado.bars}
    swings = [b.swing for b in tornado.bars]
    assert swings == sorted(swings, reverse=True)
    # Exactly linear: swing = P (R_hi - R_lo); ends at the 2.5 % and 97.5 % quantiles
    # (Cross-check: scipy.stats.truncnorm.ppf).
    ends = stats.truncnorm(-4, 4, loc=0.4, scale=0.08).ppf([0.025, 0.975])
    jc = bars["junction_to_case"]
    assert [jc.low_value, jc.high_value] == pytest.approx(ends, rel=1e-9)
    assert jc.swing == pytest.approx(SOURCE.power * (ends[1] - ends[0]), rel=1e-9)
    # Inlet temperature moves T_j almost one for one; conductivity +/-2 % is the smallest bar.
    inlet = bars["inlet_temperature"]
    assert inlet.swing == pytest.approx(inlet.high_value - inlet.low_value, rel=0.03)
    assert tornado.names[-1] == "thermal_conductivity"
    # More heat transfer -> cooler.
    assert bars["heat_transfer"].high_temperature < bars["heat_transfer"].low_temperature
    nominal = float(solve(PLATE_FAN).junction_temperature)
    assert tornado.nominal_temperature == nominal


# --------------------------------------------------------------------------------------
# Errors
# --------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("case", "tol", "words"),
    [
        (PLATE_FAN, {"inlet_temperature": Tolerance("normal", relative=0.01)}, "relative"),
        (PLATE_FAN, {"heat_transfer": Tolerance("normal", absolute=0.1)}, "only a relative"),
        (PIN_FLOW, {"fan_pressure": Tolerance("uniform", relative=0.1)}, "fan-driven"),
        (PLATE_FAN, {"airflow": Tolerance("uniform", relative=0.1)}, "fan_pressure"),
        (NATURAL, {"pressure_drop": Tolerance("uniform", relative=0.1)}, "natural"),
        (PLATE_FAN, {"power": Tolerance("normal", relative=0.1, truncation=None)}, "below"),
        (PLATE_FAN, {"heat_transfer": Tolerance("uniform", relative=1.2)}, "below"),
        (
            PLATE_FAN,
            {"interface_resistance": Tolerance("triangular", low=0.07, high=0.1)},
            "bracket",
        ),
        (PLATE_FAN, {"powr": Tolerance("normal", relative=0.1)}, "unknown"),
    ],
)
def test_bad_tolerances_give_one_line_errors(case, tol, words):
    with pytest.raises(InputError) as err:
        monte_carlo(case, tol, samples=10)
    assert words in str(err.value)
    assert "\n" not in str(err.value)


@pytest.mark.parametrize(
    "kwargs",
    [
        {"distribution": "lognormal", "relative": 0.1},
        {"distribution": "normal"},
        {"distribution": "normal", "relative": 0.1, "absolute": 1.0},
        {"distribution": "uniform", "low": 1.0},
        {"distribution": "uniform", "low": 2.0, "high": 1.0},
        {"distribution": "uniform", "relative": 0.1, "sigmas": 2.0},
        {"distribution": "normal", "relative": -0.1},
    ],
)
def test_tolerance_rejects_impossible_forms(kwargs):
    with pytest.raises(InputError):
        Tolerance(**kwargs)


def test_every_input_has_a_nominal_value():
    for name in TOLERANCE_INPUTS:
        assert np.isfinite(nominal_value(PLATE_FLOW, name))


# --------------------------------------------------------------------------------------
# The tolerances: and monte_carlo: blocks
# --------------------------------------------------------------------------------------


def test_tolerances_block_loads_and_converts_to_si():
    block = load_tolerances(
        {
            "heat_transfer": {"distribution": "normal", "relative": "20 %", "sigmas": 2},
            "interface_resistance": {
                "distribution": "uniform",
                "low": "0.03 K/W",
                "high": "0.08 K/W",
            },
            "inlet_temperature": {"distribution": "triangular", "absolute": "5.4 delta_degF"},
            "thermal_conductivity": {
                "distribution": "normal",
                "absolute": "5 W/m/K",
                "source": "mill cert",
            },
        }
    )
    tol = to_tolerances(block)
    assert tol["heat_transfer"].relative == pytest.approx(0.2)
    assert tol["heat_transfer"].standard_deviation(1.0) == pytest.approx(0.1)
    assert (tol["interface_resistance"].low, tol["interface_resistance"].high) == pytest.approx(
        (0.03, 0.08)
    )
    assert tol["inlet_temperature"].absolute == pytest.approx(3.0)  # 5.4 degF difference = 3 K
    assert tol["thermal_conductivity"].source == "mill cert"
    result = monte_carlo(PLATE_FAN, tol, samples=200)
    assert result.count == 200


@pytest.mark.parametrize(
    ("data", "field"),
    [
        ({"heat_transfer": {"distribution": "normal"}}, "tolerances.heat_transfer:"),
        ({"power": {"distribution": "gauss", "relative": 0.1}}, "tolerances.power.distribution:"),
        ({"powr": {"distribution": "normal", "relative": 0.1}}, "tolerances.powr:"),
        (
            {"inlet_temperature": {"distribution": "normal", "absolute": "3 degC"}},
            "tolerances.inlet_temperature.absolute:",
        ),
        (
            {"inlet_temperature": {"distribution": "normal", "relative": "1 %"}},
            "tolerances.inlet_temperature.relative:",
        ),
        ({"power": {"distribution": "normal", "absolute": "3 K"}}, "tolerances.power.absolute:"),
        (
            {"power": {"distribution": "uniform", "relative": 0.1, "sigmas": 2}},
            "tolerances.power.sigmas:",
        ),
        (
            {"interface_resistance": {"distribution": "uniform", "low": "0.03 K/W"}},
            "tolerances.interface_resistance.high:",
        ),
        ({"fan_pressure": {"distribution": "normal", "absolute": 0.1}}, "tolerances.fan_pressure:"),
    ],
)
def test_bad_tolerances_block_names_the_field(data, field):
    with pytest.raises(ExploreError) as err:
        load_tolerances(data)
    lines = err.value.errors
    assert len(lines) == 1
    assert lines[0].startswith(field)


def test_monte_carlo_block():
    block = load_monte_carlo(
        {"samples": 5000, "seed": 7, "sampling": "latin-hypercube", "tornado_coverage": "90 %"}
    )
    assert (block.samples, block.seed, block.tornado_coverage) == (5000, 7, pytest.approx(0.9))
    with pytest.raises(ExploreError, match="monte_carlo.samples"):
        load_monte_carlo({"samples": 0})
    with pytest.raises(ExploreError, match="monte_carlo.tornado_coverage"):
        load_monte_carlo({"tornado_coverage": "120 %"})
