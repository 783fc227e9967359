"""Several heat sources on one base: the case boundary, the model and the outputs.

The base field itself (superposition, reciprocity, finite-volume cross-check, the centred
series) is checked in tests/test_base_field.py; here the cases built on it.
"""

from __future__ import annotations

import copy
import json
import subprocess
import sys

import numpy as np
import pytest
import yaml

from finkit.case import CaseError, load_case
from finkit.constants import ZERO_CELSIUS
from finkit.model import run_case
from finkit.model.design import airflow_of, allowable, sink_inputs, solve, solve_condition

pytestmark = pytest.mark.identity


@pytest.fixture(scope="module")
def board(demo_case_file):
    """The three-source demo board as entered (a mapping)."""
    return yaml.safe_load(demo_case_file("nb400-board-sources").read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def board_result(demo_case_file):
    case = load_case(demo_case_file("nb400-board-sources"))
    return case, run_case(case)


def _one_source_pair(board):
    """The board with one source: once as ``source`` (centred), once as a one-item ``sources``."""
    single = copy.deepcopy(board)
    del single["sources"]
    single["scenarios"] = [s for s in single["scenarios"] if s["name"] == "hot-cabinet"]
    single.pop("sweeps", None)
    processor = board["sources"][0]
    single["source"] = {
        k: processor[k]
        for k in (
            "power",
            "footprint_length",
            "footprint_width",
            "junction_to_case",
            "junction_to_case_basis",
            "interface",
        )
    }
    single["limit"] = dict(processor["limit"])
    listed = copy.deepcopy(single)
    del listed["source"]
    base = board["sink"]["base"]
    listed["sources"] = [
        {
            **single["source"],
            "name": "processor",
            "centre_along": f"{float(base['length'].split()[0]) / 2} mm",
            "centre_across": f"{float(base['width'].split()[0]) / 2} mm",
        }
    ]
    return single, listed


def test_one_listed_centred_source_equals_the_single_source_case(board):
    # Issue check: one source listed equals the single-source case (to 1e-9). The listed form
    # goes through the several-source path (layout, per-source limits, the common power scale
    # at the limit); for one centred source on a solid base its field is the centred series.
    single, listed = _one_source_pair(board)
    a, b = run_case(load_case(single)), run_case(load_case(listed))
    assert b.sources and b.sources[0]["name"] == "processor"
    for name, value in a.results.items():
        other = b.results[name]
        if name == "total_resistance":
            assert other is None  # no single chain is claimed with a list of sources
            continue
        if value is None:
            assert other is None, name
            continue
        assert other == pytest.approx(value, rel=1e-9, abs=1e-9), name
    assert a.status == b.status
    assert [r.name for r in a.conditions.rows] == [r.name for r in b.conditions.rows]
    row = b.sources[0]
    assert row["junction"] == pytest.approx(a.results["junction_temperature"], rel=1e-12)
    assert row["base_peak"] == pytest.approx(a.results["source_base_centre_temperature"], rel=1e-12)
    assert row["air_offset"] == 0.0


def _two_same_sources(board, along_a, across_a, along_b, across_b):
    case = copy.deepcopy(board)
    case.pop("scenarios", None)
    case.pop("sweeps", None)
    one = {
        "power": "15 W",
        "footprint_length": "20 mm",
        "footprint_width": "20 mm",
        "junction_to_case": "0.5 K/W",
        "interface": {"area_resistance": "0.5 K*cm^2/W"},
    }
    case["sources"] = [
        {**one, "name": "a", "centre_along": f"{along_a} mm", "centre_across": f"{across_a} mm"},
        {**one, "name": "b", "centre_along": f"{along_b} mm", "centre_across": f"{across_b} mm"},
    ]
    return {r["name"]: r for r in run_case(load_case(case)).sources}


def test_two_identical_sources_placed_symmetrically_have_equal_temperatures(board):
    # Issue check: symmetry about the base's centreline along the flow (the base is 120 mm
    # wide): equal temperatures (derivation: the problem is symmetric).
    rows = _two_same_sources(board, 60, 30, 60, 90)
    for key in ("base_mean", "base_peak", "case", "junction"):
        assert rows["a"][key] == pytest.approx(rows["b"][key], abs=1e-9), key


def test_a_source_moved_toward_the_outlet_runs_hotter(board):
    # Issue check: moving one source toward the outlet makes it hotter (it sees warmer air).
    # Mirror positions along the flow (115 mm base): the base field alone is symmetric, so
    # the difference is the air placement term, (T_out - T_in)(x/L - 1/2) downstream.
    rows = _two_same_sources(board, 30, 30, 85, 90)
    assert rows["b"]["junction"] > rows["a"]["junction"] + 0.1
    assert rows["a"]["air_offset"] == 0.0  # no credit upstream (conservative)
    assert rows["b"]["junction"] - rows["a"]["junction"] == pytest.approx(
        rows["b"]["air_offset"], abs=1e-6
    )


def test_effective_conductivity_equal_to_the_metal_reproduces_the_solid_base(board):
    # Issue check: a spreader whose effective conductivities equal the plate's gives the
    # solid base exactly.
    solid = run_case(load_case(board))
    k = sink_inputs(load_case(board)).material.thermal_conductivity
    same = copy.deepcopy(board)
    same["sink"]["base"]["spreader"] = {
        "kind": "vapour-chamber",
        "in_plane_conductivity": f"{k} W/m/K",
        "through_conductivity": f"{k} W/m/K",
        "source": "test: equal to the metal",
    }
    other = run_case(load_case(same))
    for a, b in zip(solid.sources, other.sources, strict=True):
        for key in ("base_mean", "base_peak", "case", "junction", "margin"):
            assert b[key] == pytest.approx(a[key], rel=1e-12), key


def test_a_vapour_chamber_lowers_the_small_hot_source(board):
    # Common practice, no source: a base that spreads better in its plane lowers the peak
    # under a small, concentrated source (here the regulator, 12 x 10 mm).
    vc = copy.deepcopy(board)
    vc["sink"]["base"]["spreader"] = {
        "kind": "vapour-chamber",
        "in_plane_conductivity": "2500 W/m/K",
        "through_conductivity": "40 W/m/K",
        "source": "invented test values",
    }
    solid = {r["name"]: r for r in run_case(load_case(board)).sources}
    better = {r["name"]: r for r in run_case(load_case(vc)).sources}
    assert better["regulator"]["base_peak"] < solid["regulator"]["base_peak"] - 0.5


def test_every_source_against_its_own_limit_and_the_governing_one_named(board_result):
    case, result = board_result
    rows = result.sources
    assert [r["name"] for r in rows][0] == "regulator"  # the demo's story: not the biggest
    surplus = [r["margin"] - r["required_margin"] for r in rows]
    assert surplus == sorted(surplus)
    by_name = {s.name: s for s in case.sources}
    for r in rows:
        limit = by_name[r["name"]].limit
        assert r["limit_node"] == limit.node
        assert r["limit_temperature"] == pytest.approx(limit.temperature - ZERO_CELSIUS)
        node = {"junction": "junction", "case": "case", "base": "base_peak"}[r["limit_node"]]
        assert r["node_temperature"] == r[node]
    gov = rows[0]
    assert result.results["limit_node_temperature"] == gov["node_temperature"]
    assert result.results["temperature_margin"] == gov["margin"]
    assert result.results["required_margin"] == gov["required_margin"]
    assert result.conditions.governing_row.governing_source == "regulator"


def test_allowable_power_scales_every_source_until_the_governing_one_reaches_its_limit(
    board_result,
):
    # Identity: at the allowable power (total) the governing source sits at its limit less its
    # required margin and no source is above its own.
    case, result = board_result
    inputs = result.conditions.governing_row.inputs
    state = solve_condition(inputs)
    at = state.allowable
    t = at.sources
    usable = np.array([lim - req for _, lim, req in inputs.limits])
    nodes = np.array([t.node(node)[k] for k, (node, _, _) in enumerate(inputs.limits)])
    assert np.max(nodes - usable) == pytest.approx(0.0, abs=1e-6)
    assert float(at.power) == pytest.approx(state.results["allowable_power"])
    stated = np.array([s.power for s in case.sources])
    assert np.asarray(t.power) == pytest.approx(stated * float(at.power) / stated.sum())


@pytest.mark.identity
def test_the_allowable_power_search_started_from_the_stated_state_is_unchanged(board):
    # Identity: the search starts from the state at the stated powers; handing over that state,
    # already solved, in place of solving it again gives the same numbers to the last digit.
    inputs = sink_inputs(load_case(board))
    airflow = airflow_of(inputs)
    stated = solve(inputs, airflow=airflow)
    for margin in (None, 0.0):
        fresh = allowable(inputs, margin, airflow=airflow)
        handed = allowable(inputs, margin, airflow=airflow, stated=stated)
        assert float(handed.power) == float(fresh.power)
        np.testing.assert_array_equal(handed.sources.junction, fresh.sources.junction)


def test_power_of_one_source_with_the_others_held(board):
    # The per-source allowable power is a linear estimate about the stated state: re-solved
    # with that power the source lands on its limit less its margin within the film-property
    # change (a few hundredths of a kelvin).
    case = load_case(board)
    result = run_case(case)
    nominal = result.conditions.rows[0]
    row = next(r for r in nominal.sources if r["name"] == "regulator")
    changed = copy.deepcopy(board)
    changed.pop("scenarios", None)
    next(s for s in changed["sources"] if s["name"] == "regulator")["power"] = (
        f"{row['allowable_power_alone']} W"
    )
    again = {r["name"]: r for r in run_case(load_case(changed)).sources}
    assert again["regulator"]["margin"] == pytest.approx(row["required_margin"], abs=0.05)


def test_a_power_scenario_scales_every_source(board):
    case = copy.deepcopy(board)
    case["scenarios"] = [{"name": "more", "power_factor": 1.2}]
    result = run_case(load_case(case))
    nominal, more = result.conditions.rows
    for a, b in zip(
        sorted(nominal.sources, key=lambda r: r["name"]),
        sorted(more.sources, key=lambda r: r["name"]),
        strict=True,
    ):
        assert b["power"] == pytest.approx(1.2 * a["power"])


def test_sweeps_over_designs_give_the_single_design_answers(board):
    # The vectorised several-source solve (the rises interpolated in log h over the designs)
    # against one solve per design.
    inputs = sink_inputs(load_case(board))
    from dataclasses import replace

    powers = np.linspace(20.0, 80.0, 40)
    many = solve(inputs, source=replace(inputs.source, power=powers))
    for k in (0, 17, 39):
        one = solve(inputs, source=replace(inputs.source, power=powers[k]))
        assert np.asarray(many.junction_temperature)[k] == pytest.approx(
            float(one.junction_temperature), abs=1e-6
        )
        assert many.sources.base_peak[k] == pytest.approx(one.sources.base_peak, abs=1e-6)


def test_results_json_lists_each_source(board_result):
    _, result = board_result
    payload = result.to_json_dict()
    assert payload["governing_source"] == "regulator"
    names = [s["name"] for s in payload["sources"]]
    assert sorted(names) == ["processor", "regulator", "switch"]
    first = payload["sources"][0]
    assert first["junction"]["unit"] == "degC"
    assert first["allowable_power_alone"]["unit"] == "W"
    assert first["margin"]["unit"] == "K"
    json.dumps(payload, allow_nan=False)
    for condition in payload["conditions"]:
        assert len(condition["sources"]) == 3


def test_check_lists_each_source(demo_case_file):
    out = subprocess.run(
        [sys.executable, "-m", "finkit.cli", "check", str(demo_case_file("nb400-board-sources"))],
        capture_output=True,
        text=True,
        check=False,
    )
    assert out.returncode == 0, out.stderr
    assert "governing source: regulator (junction)" in out.stdout
    for name in ("processor", "regulator", "switch"):
        assert f"  {name} " in out.stdout


@pytest.mark.parametrize(
    ("change", "field", "allowed"),
    [
        (
            lambda c: c.update(
                source={
                    k: c["sources"][0][k]
                    for k in ("power", "footprint_length", "footprint_width", "interface")
                }
            ),
            "source",
            "not both",
        ),
        (lambda c: c.pop("sources"), "sources", "not neither"),
        (
            lambda c: c["sources"][1].update(name="processor"),
            "sources",
            "each name may appear once",
        ),
        (
            lambda c: c["sources"][1].update(centre_along="112 mm"),
            "sources[1].centre_along",
            "must lie within 6 mm…109 mm",
        ),
        (
            lambda c: c.update(
                measurements=[
                    {
                        "name": "lab",
                        "node": "case",
                        "measured_temperature": "60 degC",
                        "power": "30 W",
                        "inlet_temperature": "25 degC",
                    }
                ]
            ),  # fmt: skip
            "measurements",
            "not yet available with several sources",
        ),
    ],
)
def test_bad_source_input_gets_a_one_line_error(board, change, field, allowed):
    case = copy.deepcopy(board)
    change(case)
    with pytest.raises(CaseError) as info:
        load_case(case)
    message = str(info.value)
    assert field in message and allowed in message


def test_a_batch_column_sets_a_named_source(board):
    from finkit.batch.variants import apply_overrides

    merged = apply_overrides(board, {"sources.regulator.power": "14 W"})
    assert [s["power"] for s in merged["sources"]] == ["28 W", "14 W", "6 W"]
    with pytest.raises(KeyError) as info:
        apply_overrides(board, {"sources.fan.power": "1 W"})
    assert "no item named 'fan'" in str(info.value)


def test_the_explorer_has_a_power_control_per_source(board):
    from finkit.explorer import explore

    explorer = explore(board)
    assert {"power_processor", "power_regulator", "power_switch"} <= set(explorer.controls)
    result = explorer.set(power_regulator=14.0)
    changed = copy.deepcopy(board)
    for block in ("scenarios", "touch", "sweeps"):
        changed.pop(block, None)
    next(s for s in changed["sources"] if s["name"] == "regulator")["power"] = "14 W"
    expected = run_case(load_case(changed))
    assert result.results["junction_temperature"] == pytest.approx(
        expected.results["junction_temperature"], rel=1e-9
    )
    assert ("sources.regulator.power", "9 W", "14 W") in explorer.changes()


def test_the_quick_power_override_is_refused_with_several_sources(board):
    from finkit.case.parameters import case_from_parameters
    from finkit.errors import InputError

    with pytest.raises(InputError) as info:
        case_from_parameters(board, power="50 W")
    assert "parameters.power" in str(info.value) and "several sources" in str(info.value)


def test_monte_carlo_with_several_sources_checks_each_against_its_own_limit(board):
    # Identity: with zero-width tolerances the samples are the deterministic state; with
    # scatter, the share above the limit is counted per source and for any source.
    case = copy.deepcopy(board)
    case["tolerances"] = {
        "heat_transfer": {"distribution": "normal", "relative": "15 %", "source": "test"},
        "power": {"distribution": "normal", "relative": "10 %", "source": "test"},
    }
    case["monte_carlo"] = {"samples": 4000, "seed": 3}
    result = run_case(load_case(case))
    mc = result.uncertainty.monte_carlo
    gov = result.conditions.governing_row
    assert mc.nominal_limit_node_temperature == pytest.approx(
        gov.results["limit_node_temperature"] + ZERO_CELSIUS, abs=1e-9
    )
    shares = mc.source_exceedance
    assert set(shares) == {"processor", "regulator", "switch", "any source"}
    assert max(v for k, v in shares.items() if k != "any source") <= shares["any source"]
    assert shares["any source"] <= sum(v for k, v in shares.items() if k != "any source")
    # The governing source's share is the headline probability of exceeding the limit.
    assert shares[gov.governing_source] == pytest.approx(mc.probability_exceeding_limit)
    payload = result.to_json_dict()["uncertainty"]
    assert payload["probability_exceeding_limit_any_source"]["unit"] == "1"


@pytest.mark.identity
def test_the_studies_take_the_governing_state_instead_of_solving_it_again(board_result):
    # Identity: the Monte Carlo and the tornado start from solve(inputs) of the governing
    # condition, which the scenario table has already solved with the same inputs; handing it
    # over gives the same numbers to the last digit.
    from finkit.case.explore_blocks import to_tolerances
    from finkit.model.uncertainty import monte_carlo, sensitivity

    case, result = board_result
    gov = result.conditions.governing_row
    again = solve(gov.inputs)
    for name in ("junction_temperature", "base_temperature", "volume_flow", "sink_resistance"):
        assert float(getattr(again, name)) == float(getattr(gov.solution, name))
    np.testing.assert_array_equal(again.sources.junction, gov.solution.sources.junction)
    tolerances = to_tolerances(case.tolerances)
    fresh = monte_carlo(gov.inputs, tolerances, 500, 4)
    handed = monte_carlo(gov.inputs, tolerances, 500, 4, nominal=gov.solution)
    assert handed.summary() == fresh.summary()
    np.testing.assert_array_equal(handed.junction_temperature, fresh.junction_temperature)
    bars = sensitivity(gov.inputs, tolerances, nominal=gov.solution)
    assert bars == sensitivity(gov.inputs, tolerances)


def test_one_source_tolerances_are_refused_with_several_sources(board):
    case = copy.deepcopy(board)
    case["tolerances"] = {
        "interface_resistance": {
            "distribution": "uniform",
            "low": "0.02 K/W",
            "high": "0.06 K/W",
            "source": "test",
        }
    }
    with pytest.raises(CaseError) as info:
        load_case(case)
    assert "tolerances.interface_resistance" in str(info.value)
    assert "not yet available with several sources" in str(info.value)
