"""Natural convection in other orientations (issue 18): horizontal base with the fins up.

What could be checked, and against what (docs/methods.md g5, g6):

* Jones & Smith (1970), plate fins on a horizontal base facing up. The original paper could not
  be read here and no printed data point of it was available, so no test holds the correlation
  to a Jones & Smith table or figure. The tests check what can be checked: its large-Ra_S limit
  against the published upward-facing heated-plate law ``Nu = 0.54 Ra^(1/4)`` (Incropera et al.
  6th ed. Eq. 9.30; ht's ``Nu_horizontal_plate_McAdams``), its small-Ra_S limit, that the sink
  model applies it, and its validity warning.
* Fins down, horizontal fins on a vertical base and pin fins in still air: no correlation could
  be confirmed, so the tests check the one-line refusals.
* The vertical-fin result is unchanged: ``tests/test_results_frozen.py`` holds nb100-natural's
  results.json byte for byte; here the default orientation of the solver is checked too.
"""

from __future__ import annotations

import subprocess
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
import yaml

from finkit.case import CaseError, load_case
from finkit.case.heat_sink import Natural
from finkit.errors import NotSupportedError
from finkit.model import run_case, sink_inputs, solve
from finkit.model.review.spread import correlation_spread
from finkit.physics.correlations import natural
from finkit.physics.properties.air import air_properties
from finkit.physics.sink.inputs import NaturalConvection
from finkit.physics.sink.natural import _natural_heat_rate

ROOT = Path(__file__).resolve().parents[1]
UP = "nb110-natural-horizontal"


def _raw(stem: str) -> dict:
    return yaml.safe_load((ROOT / "demo_cases" / f"{stem}.yaml").read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def up_result():
    case = load_case(ROOT / "demo_cases" / f"{UP}.yaml")
    return case, run_case(case)


# --------------------------------------------------------------------------------------------
# The correlation


@pytest.mark.published
def test_jones_smith_1970_large_ra_limit_is_the_upward_plate_coefficient():
    # Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Eq. 9.30:
    # upper surface of a hot horizontal plate, Nu_L = 0.54 Ra_L^(1/4) (printed to 2 figures,
    # so rtol 1e-2). For large Ra_S Jones & Smith's bracket tends to (7640/Ra_S)^(0.44*1.7),
    # so Nu_S -> 6.7e-4 * 7640^0.748 * Ra_S^0.252; the coefficient must be 0.54.
    coefficient = 6.7e-4 * 7640.0**0.748
    assert coefficient == pytest.approx(0.54, rel=1e-2)
    ra = 1e12  # far out, where 1 - exp(-y) = y to 0.03 %
    nu = natural.nusselt_horizontal_fin_array_jones_smith(ra)
    assert float(nu) == pytest.approx(coefficient * ra**0.252, rel=1e-3)


def test_jones_smith_1970_tends_to_mcadams_plate_at_wide_spacing():
    # Cross-check: ht 1.2 Nu_horizontal_plate_McAdams (0.54 Ra^(1/4), upward-facing hot plate,
    # as Incropera Eq. 9.30). Jones & Smith is a fit of arrays; at Ra_S = 1e7 (wide spacing,
    # beyond its range) it is within 1 % of the plate law, at 1e6 within 8 % below it.
    from ht.conv_free_immersed import Nu_horizontal_plate_McAdams

    pr = 0.71
    for ra, rel in ((1e7, 0.01), (1e6, 0.08)):
        plate = Nu_horizontal_plate_McAdams(pr, ra / pr, buoyancy=True)
        array = float(natural.nusselt_horizontal_fin_array_jones_smith(ra))
        assert array == pytest.approx(plate, rel=rel)
        assert array <= plate  # the array's channels only take away


@pytest.mark.identity
def test_jones_smith_small_ra_limit():
    # Small Ra_S: the bracket tends to 1, Nu_S -> 6.7e-4 Ra_S (the correlation's own form).
    ra = np.array([1e-2, 1.0])
    assert natural.nusselt_horizontal_fin_array_jones_smith(ra) == pytest.approx(
        6.7e-4 * ra, rel=1e-6
    )
    assert float(natural.nusselt_horizontal_fin_array_jones_smith(0.0)) == 0.0


@pytest.mark.shape
def test_horizontal_fin_array_natural_broadcasts():
    args = dict(
        fin_spacing=0.01,
        surface_temperature=353.15,
        ambient_temperature=313.15,
        density=1.09,
        dynamic_viscosity=1.96e-5,
        thermal_conductivity=0.0281,
        prandtl=0.707,
    )
    single = natural.horizontal_fin_array_natural(**args)
    spacings = np.array([0.006, 0.01, 0.015])
    row = natural.horizontal_fin_array_natural(**{**args, "fin_spacing": spacings})
    grid = natural.horizontal_fin_array_natural(
        **{
            **args,
            "fin_spacing": spacings[None, :],
            "surface_temperature": np.array([[333.15], [353.15]]),
        }
    )
    assert np.shape(row.heat_transfer_coefficient) == (3,)
    assert np.shape(grid.heat_transfer_coefficient) == (2, 3)
    assert row.heat_transfer_coefficient[1] == pytest.approx(single.heat_transfer_coefficient)
    assert grid.heat_transfer_coefficient[1, 1] == pytest.approx(single.heat_transfer_coefficient)
    assert np.all(np.diff(row.heat_transfer_coefficient) > 0)  # wider gaps breathe better


# --------------------------------------------------------------------------------------------
# The sink model


@pytest.mark.identity
def test_sink_uses_jones_smith_on_every_surface(up_result):
    case, result = up_result
    inputs = sink_inputs(case)
    sol = solve(inputs)
    t_in = float(inputs.air.inlet_temperature)
    t_b = float(sol.base_temperature)
    film = air_properties(t_in + 0.5 * (t_b - t_in), inputs.air.pressure)
    expected = natural.horizontal_fin_array_natural(
        inputs.geometry.fin_spacing,
        t_b,
        t_in,
        film.density,
        film.dynamic_viscosity,
        film.thermal_conductivity,
        film.prandtl,
    )
    assert float(sol.heat_transfer_coefficient) == pytest.approx(
        float(expected.heat_transfer_coefficient), rel=1e-9
    )
    # energy balance: convection plus radiation carry the stated power
    assert float(sol.convection_heat_rate + sol.radiation_heat_rate) == pytest.approx(
        float(case.source.power), rel=1e-6
    )
    assert 0.0 < float(sol.radiation_heat_rate) < float(case.source.power)


@pytest.mark.identity
def test_vertical_fins_is_the_default_and_unchanged(demo_case_file):
    # The frozen results.json of nb100-natural (tests/test_results_frozen.py) guards the whole
    # vertical result; here: the solver's default orientation is the vertical one.
    inputs = sink_inputs(load_case(demo_case_file("nb100-natural")))
    args = (inputs.geometry, inputs.material, inputs.air, 25.0, inputs.options)
    default = _natural_heat_rate(*args)
    vertical = _natural_heat_rate(*args, "vertical-fins")
    up = _natural_heat_rate(*args, "horizontal-base-fins-up")
    assert float(default.power) == float(vertical.power)
    assert np.isfinite(default.elenbaas) and np.isnan(up.elenbaas)
    assert float(up.power) != pytest.approx(float(vertical.power), rel=1e-3)


@pytest.mark.identity
def test_mixed_convection_credit_fins_up_tends_to_the_fins_up_model(up_result):
    # A weak horizontal stream over a fins-up sink with the free-convection credit: as the flow
    # stops the combination tends to the natural-convection model of that orientation (Jones &
    # Smith), not to the vertical one (Churchill's rule, tests/test_mixed_convection.py).
    from finkit.physics.sink import GivenVelocity
    from finkit.physics.sink.inputs import FreeConvectionCredit

    case, _ = up_result
    inputs = sink_inputs(case)
    credit = FreeConvectionCredit(
        orientation="horizontal-base-fins-up", forced_flow="horizontal", radiation=True
    )
    mixed = solve(
        replace(
            inputs,
            flow=GivenVelocity(0.005),
            options=replace(inputs.options, free_convection=credit),
        )
    )
    up = solve(inputs)
    vertical = solve(replace(inputs, flow=NaturalConvection("vertical-fins")))
    assert float(mixed.sink_resistance) == pytest.approx(float(up.sink_resistance), rel=5e-3)
    assert float(up.sink_resistance) != pytest.approx(float(vertical.sink_resistance), rel=0.02)


def test_horizontal_case_has_one_correlation_no_spread(up_result):
    case, _ = up_result
    spread = correlation_spread(sink_inputs(case))
    assert spread.axes == {}
    assert "one accepted correlation" in spread.statement


# --------------------------------------------------------------------------------------------
# Validity warnings


def test_jones_smith_warning_outside_its_range():
    # 29 fins of 2 mm on 120 mm leave 2.2 mm gaps: Ra_S far below 200.
    raw = _raw(UP)
    raw["sink"]["fins"]["count"] = 29
    result = run_case(load_case(raw))
    text = " ".join(result.warnings)
    assert "Jones & Smith (1970) horizontal-base fin array: Ra_S =" in text
    assert "outside its range 200 to 6e+05" in text


def test_demo_case_inside_the_range_has_no_range_warning(up_result):
    _, result = up_result
    assert not any("Jones & Smith" in w for w in result.warnings)
    assert not any("Bar-Cohen" in w for w in result.warnings)


# --------------------------------------------------------------------------------------------
# Orientations and sinks that are refused


def test_case_orientations_are_the_supported_ones():
    field = Natural.model_fields["orientation"].annotation
    assert tuple(field.__args__) == natural.SUPPORTED_ORIENTATIONS


@pytest.mark.parametrize("orientation", [*natural.UNSUPPORTED_ORIENTATIONS, "sideways"])
def test_unsupported_orientation_is_one_line_naming_the_supported(orientation):
    raw = _raw(UP)
    raw["air"]["flow"]["natural"]["orientation"] = orientation
    with pytest.raises(CaseError) as info:
        load_case(raw)
    assert info.value.errors == [
        f"air.flow.natural.orientation: not allowed (got '{orientation}'; allowed: "
        "vertical-fins, horizontal-base-fins-up)"
    ]


@pytest.mark.parametrize("orientation", natural.UNSUPPORTED_ORIENTATIONS)
def test_physics_refuses_unconfirmed_orientations(orientation):
    inputs = sink_inputs(load_case(ROOT / "demo_cases" / f"{UP}.yaml"))
    with pytest.raises(NotSupportedError) as info:
        solve(replace(inputs, flow=NaturalConvection(orientation)))
    message = str(info.value)
    assert "\n" not in message
    assert "no published correlation for it could be confirmed" in message
    assert "supported: 'vertical-fins', 'horizontal-base-fins-up'" in message


def test_pin_fins_in_still_air_are_refused_in_one_line():
    raw = _raw("nb300-pin-ducted")
    raw["air"]["flow"] = {"natural": {"orientation": "horizontal-base-fins-up"}}
    raw["air"].pop("bypass", None)
    raw.pop("sweeps", None)
    raw.pop("tolerances", None)
    raw.pop("scenarios", None)
    with pytest.raises(CaseError) as info:
        load_case(raw)
    (message,) = [e for e in info.value.errors if e.startswith("air.flow.natural")]
    assert "not supported for sink.type 'pin-fin'" in message
    assert "could be confirmed" in message


# --------------------------------------------------------------------------------------------
# What the engineer reads: finkit check and the note's method section


def test_check_names_the_correlation_source_and_range():
    out = subprocess.run(
        [sys.executable, "-m", "finkit.cli", "check", str(ROOT / "demo_cases" / f"{UP}.yaml")],
        capture_output=True,
        text=True,
        check=False,
        cwd=ROOT,
    )
    assert out.returncode == 0, out.stderr
    assert (
        "natural convection (horizontal-base-fins-up): horizontal base, fins up: Jones & Smith "
        "(1970)" in out.stdout
    )
    assert "Ra_S 200 to 6e5; constants recalled" in out.stdout


def test_method_section_names_jones_smith(up_result):
    import finkit.report as report

    _, result = up_result
    html = str(report.method_section(result))
    assert "fins on a horizontal base, fins up" in html
    assert "Jones, C.D., Smith, L.F." in html
    assert "200 ≤ Ra_S ≤ 6×10^5" in html
    assert "recalled" in html
    assert "Bar-Cohen" not in html and "Churchill" not in html
