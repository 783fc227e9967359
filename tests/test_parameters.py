"""Note templates take their case the ways papermill users expect (software behaviour, no physics).

* ``-p case mine.yaml``: a path; ``-f mine.yaml``: the case's own top-level keys; nothing: the
  template's demo case; quick overrides (``-p power "80 W"``);
* a name papermill injects that the template does not know is an error, not a silent demo note.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import nbformat
import pytest
import yaml

from finkit.case.parameters import CASE_KEYS, OVERRIDES, case_from_parameters
from finkit.errors import InputError

ROOT = Path(__file__).resolve().parent.parent
PIN = ROOT / "demo_cases" / "nb300-pin-ducted.yaml"
DEMO = yaml.safe_load((ROOT / "demo_cases" / "nb200-plate-fan.yaml").read_text(encoding="utf-8"))


def _none() -> dict:
    return {key: None for key in (*CASE_KEYS, *OVERRIDES)}


def test_no_case_given_is_the_demo_case():
    assert case_from_parameters(None, demo=DEMO, **_none()) == DEMO


def test_a_path_is_read_as_entered():
    case = case_from_parameters(str(PIN), demo=DEMO, **_none())
    assert case == yaml.safe_load(PIN.read_text(encoding="utf-8"))


def test_top_level_keys_replace_the_demo_case():
    given = _none() | yaml.safe_load(PIN.read_text(encoding="utf-8"))
    case = case_from_parameters(None, demo=DEMO, **given)
    assert case["case_id"] == "nb300-pin-ducted"
    assert "scenarios" not in case  # nothing of the demo case leaks in


def test_overrides_set_their_fields_and_leave_the_demo_alone():
    given = _none() | {"power": "80 W", "fin_count": 18, "altitude": "2000 m"}
    case = case_from_parameters(None, demo=DEMO, **given)
    assert case["source"]["power"] == "80 W"
    assert case["sink"]["fins"]["count"] == 18
    assert case["air"]["altitude"] == "2000 m"
    assert DEMO["source"]["power"] == "40 W"


def test_an_unknown_injected_parameter_is_an_error_naming_it():
    with pytest.raises(InputError, match=r"unknown parameter\(s\) sinks; allowed: case"):
        case_from_parameters(None, demo=DEMO, names=["case", "sinks", "_i3", "In", "open"])


@pytest.mark.slow
def test_papermill_with_the_case_file_as_parameters_renders_that_case(tmp_path):
    template = ROOT / "templates" / "heat_sink_note.ipynb"
    out = tmp_path / "out.ipynb"
    run = subprocess.run(
        [
            sys.executable,
            "-m",
            "papermill",
            str(template),
            str(out),
            "-f",
            str(PIN),
            "-p",
            "power",
            "70 W",
            "--log-level",
            "ERROR",
        ],
        capture_output=True,
        text=True,
        check=False,
        cwd=tmp_path,
    )
    assert run.returncode == 0, run.stderr[-2000:]
    html = "".join(
        str(o.get("data", {}).get("text/html", ""))
        for c in nbformat.read(out, as_version=4).cells
        for o in c.get("outputs", [])
    )
    assert "NB-300 converter module heat sink" in html
    assert "NB-200" not in html.split("fk-page1")[1][:4000]
    assert "70.0\u00a0W" in html


@pytest.mark.slow
def test_papermill_with_an_unknown_parameter_fails(tmp_path):
    run = subprocess.run(
        [
            sys.executable,
            "-m",
            "papermill",
            str(ROOT / "templates" / "heat_sink_note.ipynb"),
            str(tmp_path / "out.ipynb"),
            "-p",
            "powr",
            "70 W",
            "--log-level",
            "ERROR",
        ],
        capture_output=True,
        text=True,
        check=False,
        cwd=tmp_path,
    )
    assert run.returncode != 0
    assert "unknown parameter(s) powr" in run.stderr + run.stdout
