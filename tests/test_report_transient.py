"""Tests of the transient section of the note (finkit.report_transient) and the check line.

Presentation: the section appears only with a ``transient:`` block; the figures label their
axes with units and mark the limit and the event; the numbers shown are those of the result.
"""

from __future__ import annotations

import html
import json
import re
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

from finkit.case import load_case
from finkit.model import run_case
from finkit.report import transient as rt

DEMO = Path(__file__).resolve().parents[1] / "demo_cases" / "nb200-plate-fan.yaml"


def case_dict(limit="99 degC", **block):
    data = yaml.safe_load(DEMO.read_text(encoding="utf-8"))
    for key in ("tolerances", "monte_carlo", "measurements", "calibration"):
        data.pop(key, None)
    data["limit"]["temperature"] = limit
    data["transient"] = {
        "start_condition": "hot-day",
        "event": {"at": "60 s", "condition": "hot-day-one-fan"},
        "duration": "20 min",
        "required_response_time": "120 s",
        **block,
    }
    return data


@pytest.fixture(scope="module")
def result():
    return run_case(load_case(case_dict()))


def text_of(fragment) -> str:
    return html.unescape(re.sub(r"<[^>]+>", " ", re.sub(r"<img[^>]*>", "", str(fragment))))


def test_section_shows_the_verdict_and_numbers(result):
    t = result.transient
    body = text_of(rt.transient_section(result))
    assert "Transient: time to the limit after 'hot-day-one-fan'" in body
    assert f"{t.time_to_limit:.0f}\u00a0s" in body
    assert "required" in body.lower() and "PASS" in body
    assert "Foster R [K/W]" in body and "Cauer C to ambient [J/K]" in body
    assert "Heat capacity [J/K]" in body
    assert "safety standard" in body and "licensed" in body
    assert str(rt.transient_section(result)).count("<img") == 2


def test_no_block_no_section():
    data = case_dict()
    data.pop("transient")
    r = run_case(load_case(data))
    assert str(rt.transient_section(r)) == ""
    assert str(rt.figure_transient_history(r)) == "" and str(rt.impedance_table(r)) == ""


def test_history_plot_marks_limit_event_and_units(result):
    fig = rt.plot_transient_history(result)
    ax = fig.axes[0]
    assert ax.get_ylabel() == "Temperature [°C]" and ax.get_xlabel() == "Time [s]"
    labels = [line.get_label() for line in ax.get_lines()]
    assert any(label.startswith("Limit 99.0") for label in labels)
    assert "Event: hot-day-one-fan" in labels
    assert any(label.startswith("Limit reached") for label in labels)


def test_impedance_plot_units(result):
    fig = rt.plot_thermal_impedance(result)
    ax = fig.axes[0]
    assert ax.get_xscale() == "log"
    assert "[K/W]" in ax.get_ylabel() and "[s]" in ax.get_xlabel()


def test_pulse_history_has_a_power_axis():
    pulses = {"pulses": {"high": "45 W", "low": "30 W", "period": "60 s", "duty_cycle": 0.5}}
    r = run_case(load_case(case_dict(limit="110 degC", power=pulses)))
    fig = rt.plot_transient_history(r)
    assert any(ax.get_ylabel() == "Power [W]" for ax in fig.axes)
    assert r.transient.status == "pass" and not r.transient.is_limit_reached


def test_check_prints_the_time_to_limit(tmp_path):
    path = tmp_path / "case.yaml"
    path.write_text(yaml.safe_dump(case_dict()), encoding="utf-8")
    out = subprocess.run(
        [sys.executable, "-m", "finkit.cli", "check", str(path)],
        capture_output=True,
        text=True,
        check=False,
    )
    line = [x for x in out.stdout.splitlines() if x.startswith("time to limit after")]
    assert len(line) == 1, out.stdout + out.stderr
    assert re.fullmatch(
        r"time to limit after hot-day-one-fan at 60 s: \d+ s \(required response 120 s\): pass",
        line[0],
    )


def test_batch_overview_reason_carries_the_time_to_limit(result):
    from types import SimpleNamespace

    from finkit.batch.overview import _transient_text

    payload = json.loads(json.dumps(result.to_json_dict()))
    text = _transient_text(SimpleNamespace(results=payload))
    assert text == result.transient.check_line()
