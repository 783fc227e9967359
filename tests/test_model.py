"""Case -> result layer: sweeps (mode c) and the single-fin limit."""

from pathlib import Path

import numpy as np
import pytest
import yaml

from finkit.case import SWEEP_NAMES, load_case
from finkit.constants import ZERO_CELSIUS
from finkit.model import SWEEPABLE, run_case, sink_inputs, solve, sweep, swept_inputs

DEMO = Path(__file__).resolve().parent.parent / "demo_cases"


def test_case_and_model_agree_on_the_sweep_names():
    assert set(SWEEP_NAMES) == set(SWEEPABLE)


@pytest.mark.shape
@pytest.mark.parametrize("case_id", ["nb200-plate-fan", "nb300-pin-ducted", "nb100-natural"])
@pytest.mark.parametrize("name", SWEEPABLE)
def test_every_sweep_matches_single_point_solves(case_id, name):
    inputs = sink_inputs(load_case(DEMO / f"{case_id}.yaml"))
    natural = case_id == "nb100-natural"
    plate = case_id != "nb300-pin-ducted"
    if (name == "airflow" and natural) or (name in ("fin_count", "fin_thickness") and not plate):
        pytest.skip("does not apply to this sink")
    base = {
        "inlet_temperature": np.array([25.0, 40.0]) + ZERO_CELSIUS,
        "airflow": np.array([0.004, 0.008]),
        "heat_transfer_coefficient": np.array([20.0, 60.0]),
        "fin_count": np.array([10.0, 12.0]),
        "fin_height": np.array([0.02, 0.03]),
        "fin_thickness": np.array([0.001, 0.0015]),
        "altitude": np.array([0.0, 2000.0]),
        "power": np.array([10.0, 20.0]),
    }[name]
    many = sweep(inputs, name, base)
    for i, value in enumerate(base):
        one = solve(swept_inputs(inputs, name, np.array(value)))
        assert many["junction_temperature"][i] == pytest.approx(float(one.junction_temperature))
    assert np.all(many["allowable_power"] >= 0)


@pytest.mark.identity
def test_inlet_sweep_moves_the_radiation_surroundings_with_the_inlet():
    # A natural-convection sink: the surroundings keep their offset from the inlet air.
    inputs = sink_inputs(load_case(DEMO / "nb100-natural.yaml"))
    values = np.array([20.0, 35.0, 50.0]) + ZERO_CELSIUS
    swept = swept_inputs(inputs, "inlet_temperature", values)
    offset = inputs.air.surroundings_temperature - inputs.air.inlet_temperature
    np.testing.assert_allclose(swept.air.surroundings_temperature, values + offset)
    s = sweep(inputs, "inlet_temperature", values)
    assert np.all(np.diff(s["allowable_power"]) < 0)


def test_single_fin_limit_is_checked_against_the_base():
    data = yaml.safe_load((DEMO / "nb-fin-study.yaml").read_text(encoding="utf-8"))
    base_c = float(str(data["conditions"]["base_temperature"]).split()[0])
    data["limit"] = {"node": "base", "temperature": f"{base_c + 3} degC", "required_margin": "5 K"}
    result = run_case(load_case(data))
    assert result.results["temperature_margin"] == pytest.approx(3.0)
    assert result.status == "fail"
    data["limit"]["required_margin"] = "2 K"
    assert run_case(load_case(data)).status == "pass"


def test_a_bad_fan_table_is_reported_on_the_case_fields():
    from finkit.errors import InputError

    data = yaml.safe_load((DEMO / "nb200-plate-fan.yaml").read_text(encoding="utf-8"))
    data["air"]["flow"]["fan"]["pressure"][-1] = "0.01 inH2O"  # does not reach free delivery
    with pytest.raises(InputError, match=r"^air\.flow\.fan\.pressure\[7\]"):
        run_case(load_case(data))


@pytest.mark.parametrize("design", ["plate_fin_demo", "pin_fin_demo"])
def test_every_number_of_results_json_carries_its_unit(design, request):
    # Common practice, no source: a number in results.json without its unit is unreadable.
    # Every headline result is {"value", "unit"} with the unit of RESULT_UNITS, in the headline,
    # the nominal condition and every condition.
    from finkit.model import RESULT_UNITS

    _, result = request.getfixturevalue(design)
    data = result.to_json_dict()
    tables = [data["results"], data["nominal"]] + [c["results"] for c in data["conditions"]]
    for table in tables:
        assert set(table) == set(RESULT_UNITS)
        for name, entry in table.items():
            assert set(entry) == {"value", "unit"}, name
            assert entry["unit"] == RESULT_UNITS[name], name
            assert entry["value"] is None or isinstance(entry["value"], int | float), name
