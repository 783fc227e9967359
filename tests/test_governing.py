"""The governing condition leads every output, scenarios follow the variant, and the
uncertainty and the calibration are judged at the governing condition.

These are identities of finkit's own model (a condition solved inside a case equals the same
conditions written as a case of their own; zero tolerances give the deterministic answer), not
comparisons with published values; the physics behind them is checked elsewhere against its
sources.
"""

from __future__ import annotations

import copy
import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
import yaml

from finkit.case import CaseError, load_case
from finkit.errors import InputError
from finkit.model import RESULTS_SCHEMA_VERSION, run_case, sink_inputs, solve_condition
from finkit.model.review import apply_calibration

DEMO = Path(__file__).resolve().parents[1] / "demo_cases"
PLATE_FAN = DEMO / "nb200-plate-fan.yaml"


def raw(path: Path = PLATE_FAN) -> dict:
    return yaml.safe_load(path.read_text(encoding="utf-8"))


def lean(data: dict) -> dict:
    """A case without the slow blocks (Monte Carlo, measurements) and without the transient
    (its event names scenarios that these tests replace)."""
    data = copy.deepcopy(data)
    for key in ("tolerances", "monte_carlo", "measurements", "calibration", "transient"):
        data.pop(key, None)
    return data


def expressible() -> dict:
    """The demo case with scenarios that a plain case file can also state as its nominal."""
    data = lean(raw())
    data["scenarios"] = [
        {"name": "hot-day", "inlet_temperature_rise": "5 K"},
        {"name": "high-site", "altitude": "2500 m"},
        {"name": "more-power", "power_factor": 1.1},
        {"name": "hot-high", "combines": ["hot-day", "high-site", "more-power"]},
    ]
    return data


# --------------------------------------------------------------------------------------------
# One result model: the governing condition is the headline everywhere


@pytest.fixture(scope="module")
def combined():
    return run_case(load_case(expressible()))


def test_governing_condition_is_the_least_margin_one(combined):
    rows = combined.conditions.rows
    assert combined.governing.name == "hot-high"
    assert combined.governing.margin == min(r.margin for r in rows)
    assert combined.status == combined.governing.status


def test_headline_results_are_the_governing_conditions(combined):
    gov = combined.governing
    assert combined.results == gov.results
    assert combined.results["temperature_margin"] == pytest.approx(gov.margin, rel=1e-12)
    assert combined.results["allowable_power"] == pytest.approx(gov.allowable_power, rel=1e-12)
    assert combined.nominal.name == "nominal"
    assert combined.nominal.results != gov.results


def test_governing_equals_the_same_conditions_as_a_case_of_their_own(combined):
    data = expressible()
    data.pop("scenarios")
    data["air"]["inlet_temperature"] = "55 degC"
    data["air"]["altitude"] = "2500 m"
    data["source"]["power"] = "44 W"
    alone = run_case(load_case(data))
    for name, value in combined.results.items():
        if value is None:
            assert alone.results[name] is None, name
        else:
            assert alone.results[name] == pytest.approx(value, rel=1e-9, abs=1e-12), name


def test_results_json_leads_with_the_governing_block(combined):
    payload = combined.to_json_dict()
    assert payload["schema_version"] == RESULTS_SCHEMA_VERSION
    gov = payload["governing"]
    assert gov["condition"] == "hot-high"
    assert gov["temperature_margin"]["value"] == payload["results"]["temperature_margin"]["value"]
    assert gov["allowable_power"]["value"] == payload["results"]["allowable_power"]["value"]
    assert payload["nominal"]["limit_node_temperature"]["value"] == pytest.approx(
        combined.nominal.results["limit_node_temperature"]
    )
    names = [c["name"] for c in payload["conditions"]]
    assert names == ["nominal", "hot-day", "high-site", "more-power", "hot-high"]
    assert [c["name"] for c in payload["conditions"] if c["is_governing"]] == ["hot-high"]
    json.dumps(payload, allow_nan=False)  # strict JSON


def test_check_json_and_text_lead_with_the_governing_condition(tmp_path):
    path = tmp_path / "case.yaml"
    path.write_text(yaml.safe_dump(expressible()), encoding="utf-8")
    run = [sys.executable, "-m", "finkit.cli", "check", str(path)]
    as_json = subprocess.run([*run, "--json"], capture_output=True, text=True, check=False)
    payload = json.loads(as_json.stdout)
    direct = run_case(load_case(expressible())).to_json_dict()
    assert payload["governing"]["condition"] == "hot-high"
    for name in ("limit_node_temperature", "temperature_margin", "allowable_power"):
        assert payload["results"][name]["value"] == pytest.approx(
            direct["results"][name]["value"], rel=1e-12
        )
    text = subprocess.run(run, capture_output=True, text=True, check=False).stdout.splitlines()
    assert text[0].startswith("case nb200-plate-fan: status")
    assert text[1].startswith("governing condition: hot-high")
    margin = payload["governing"]["temperature_margin"]["value"]
    assert any(f"margin {margin:.3g} K" in line for line in text[:5])


def test_least_allowable_power_condition_is_named_separately():
    data = expressible()
    # A power corner has the least margin but not the least allowable power.
    data["scenarios"] = [
        {"name": "hot-day", "inlet_temperature_rise": "3 K"},
        {"name": "power-corner", "power_factor": 1.3},
    ]
    result = run_case(load_case(data))
    summary = result.conditions.governing_summary()
    assert summary["condition"] == "power-corner"
    assert summary["least_allowable_power_condition"] == "hot-day"


def test_a_case_without_scenarios_governs_itself_and_says_so():
    data = lean(raw())
    data.pop("scenarios")
    result = run_case(load_case(data))
    assert result.governing.name == "nominal" and len(result.conditions.rows) == 1
    assert result.results == result.nominal.results
    assert any(w.startswith("scenarios: none given") for w in result.warnings)


# --------------------------------------------------------------------------------------------
# Scenarios that follow the variant


def test_absolute_scenario_milder_than_the_variant_is_warned():
    data = lean(raw())
    data["air"]["altitude"] = "3000 m"  # the variant sits higher than the "high-site" scenario
    result = run_case(load_case(data))
    assert any(
        w.startswith("scenario high-site: altitude 2500 m is not above this variant's nominal")
        for w in result.warnings
    )
    data = lean(raw())
    data["air"]["inlet_temperature"] = "60 degC"
    data["scenarios"] = [{"name": "hot-day", "inlet_temperature": "60 degC"}]
    warnings = run_case(load_case(data)).warnings
    assert any("scenario hot-day: inlet air 60.0 degC is not above" in w for w in warnings)


def test_relative_scenario_follows_the_variant():
    for altitude, inlet in (("0 m", "50 degC"), ("3000 m", "45 degC")):
        data = lean(raw())
        data["air"]["altitude"], data["air"]["inlet_temperature"] = altitude, inlet
        data["scenarios"] = [
            {"name": "higher", "altitude_increase": "1000 m", "inlet_temperature_rise": "5 K"}
        ]
        result = run_case(load_case(data))
        row = result.conditions.row("higher")
        assert row.altitude == pytest.approx(float(altitude.split()[0]) + 1000.0)
        assert row.inlet_temperature == pytest.approx(float(inlet.split()[0]) + 5.0 + 273.15)
        alone = lean(raw())
        alone.pop("scenarios")
        alone["air"]["altitude"] = f"{float(altitude.split()[0]) + 1000.0} m"
        alone["air"]["inlet_temperature"] = f"{float(inlet.split()[0]) + 5.0} degC"
        expected = solve_condition(sink_inputs(load_case(alone))).results
        assert row.results["limit_node_temperature"] == pytest.approx(
            expected["limit_node_temperature"], rel=1e-9
        )
        assert not any("not above this variant" in w for w in result.warnings)


def test_combined_scenario_merges_its_parts_and_refuses_conflicts():
    data = lean(raw())
    result = run_case(load_case(data))
    both = result.conditions.row("hot-day-one-fan")
    fan = result.conditions.row("one-fan-failed")
    hot = result.conditions.row("hot-day")
    assert both.inlet_temperature == pytest.approx(hot.inlet_temperature)
    assert both.volume_flow < hot.volume_flow  # a fan is stopped
    assert both.node_temperature > max(fan.node_temperature, hot.node_temperature)
    assert both.combines == ("hot-day", "one-fan-failed")

    data["scenarios"].append({"name": "clash", "combines": ["hot-day", "high-site"]})
    data["scenarios"].append({"name": "cool", "inlet_temperature": "40 degC"})
    data["scenarios"].append({"name": "bad", "combines": ["cool", "warm"]})
    data["scenarios"].append({"name": "warm", "inlet_temperature": "60 degC"})
    with pytest.raises(InputError, match=r"scenarios\[bad\]\.combines: 'cool' and 'warm' both"):
        run_case(load_case(data))


@pytest.mark.parametrize(
    ("scenario", "message"),
    [
        ({"name": "x", "combines": ["nope"]}, r"combines: no scenario named 'nope'"),
        (
            {"name": "x", "inlet_temperature": "60 degC", "inlet_temperature_rise": "5 K"},
            r"inlet_temperature_rise: give inlet_temperature \(absolute\) or",
        ),
        ({"name": "x", "combines": ["x"]}, r"a scenario cannot combine itself"),
    ],
)
def test_bad_scenario_fields_get_one_line_naming_the_field(scenario, message):
    data = lean(raw())
    data["scenarios"].append(scenario)
    with pytest.raises(CaseError, match=message):
        load_case(data)


# --------------------------------------------------------------------------------------------
# Uncertainty and calibration at the governing condition


def test_monte_carlo_with_zero_tolerances_equals_the_governing_result():
    data = expressible()
    data["tolerances"] = {
        "power": {"distribution": "normal", "relative": "0 %"},
        "inlet_temperature": {"distribution": "uniform", "absolute": "0 K"},
    }
    data["monte_carlo"] = {"samples": 200, "seed": 3}
    result = run_case(load_case(data))
    u = result.uncertainty
    assert u.condition == result.governing.name == "hot-high"
    samples = u.monte_carlo.limit_node_temperature
    assert np.allclose(samples, result.governing.node_temperature, rtol=1e-9, atol=1e-9)


def test_calibration_that_reads_low_is_a_warning_with_the_calibrated_headline():
    data = raw()
    data.pop("tolerances")
    data.pop("monte_carlo")
    # The demo's (invented) test points, 4 K hotter: the model then reads low against them.
    for m in data["measurements"]:
        value, unit = m["measured_temperature"].split()
        m["measured_temperature"] = f"{float(value) + 4.0} {unit}"
    result = run_case(load_case(data))
    fit = result.review.calibration
    assert fit.reads_low and fit.mean_underprediction > fit.measurement_uncertainty
    assert result.warnings[0].startswith("calibration: the model reads")
    # The calibrated governing result equals the governing condition solved with the multiplier.
    expected = solve_condition(apply_calibration(result.governing.inputs, fit)).results
    other = result.review.calibrated_governing
    assert other["limit_node_temperature"] == pytest.approx(expected["limit_node_temperature"])
    assert other["limit_node_temperature"] > result.results["limit_node_temperature"]
    # Applying the multiplier makes the calibrated result the headline and the other one the
    # uncalibrated result.
    data["calibration"]["apply"] = True
    applied = run_case(load_case(data))
    assert applied.results["limit_node_temperature"] == pytest.approx(
        other["limit_node_temperature"], rel=1e-9
    )
    assert applied.review.calibrated_governing["limit_node_temperature"] == pytest.approx(
        result.results["limit_node_temperature"], rel=1e-6
    )


def test_calibration_within_the_measurement_noise_is_not_a_warning():
    data = raw()
    for key in ("tolerances", "monte_carlo"):
        data.pop(key)
    data["calibration"]["measurement_uncertainty"] = "3 K"
    result = run_case(load_case(data))
    assert not result.review.calibration.reads_low
    assert not any(w.startswith("calibration:") for w in result.warnings)


# --------------------------------------------------------------------------------------------
# Page 1 is the verdict (rendered note printed in headless Chromium: slow)


@pytest.fixture(scope="module")
def printed_demo_note(tmp_path_factory):
    import browser
    from pypdf import PdfReader

    from finkit.notes import render_note

    if not browser.chromium_available():
        pytest.fail(f"{browser.CHROMIUM} is missing: run .ci/ensure_chromium.sh")
    out = tmp_path_factory.mktemp("note")
    output = render_note(PLATE_FAN, out)
    pdf = out / "note.pdf"
    run = browser.print_to_pdf(output.html, pdf)
    assert run.returncode == 0, run.stderr[-2000:]
    pages = [" ".join(page.extract_text().split()) for page in PdfReader(pdf).pages]
    return output, pages


@pytest.mark.slow
def test_printed_plate_fin_note_has_the_verdict_on_page_one(printed_demo_note):
    output, pages = printed_demo_note
    payload = json.loads(output.results_json.read_text(encoding="utf-8"))
    gov = payload["governing"]
    first = pages[0]
    verb = "Passes" if payload["status"] == "pass" else "Fails"
    assert f"{verb} on the governing condition '{gov['condition']}'" in first
    assert gov["condition"] == "hot-day-one-fan"
    assert "Why it governs: least margin" in first
    margin = gov["temperature_margin"]["value"]
    allowed = gov["allowable_power"]["value"]
    node = payload["results"]["limit_node_temperature"]["value"]
    # Every headline number on page 1 is the governing condition's (as results.json says).
    assert f"margin {margin:.3g} K" in first
    assert f"{allowed:.1f} W" in first
    assert f"{node:.1f} °C" in first
    assert "Prepared by" in first and "Approved by" in first  # the sign-off block
    # The previous signed revision: what changed and what it did to the governing margin.
    assert "Changes since revision A:" in first and "governing margin" in first
    assert "SHA-256" not in first  # software details are in the provenance footer
    assert "SHA-256" in pages[-1]


@pytest.mark.slow
def test_printed_plate_fin_note_fits_in_fifteen_pages(printed_demo_note):
    # The steady note of this case printed on 12 A4 pages; its transient section (a fan fails
    # on a hot day: verdict, node table, history, impedance and ladders, cautions) adds about
    # a page and a half, and the page breaks around its figures the rest.
    _, pages = printed_demo_note
    assert len(pages) <= 15, f"{len(pages)} A4 pages"


def test_requirement_ids_reach_results_json():
    data = expressible()
    data["limit"]["requirement_id"] = "REQ-TH-012"
    data["scenarios"][3]["requirement_id"] = "REQ-TH-014"
    payload = run_case(load_case(data)).to_json_dict()
    assert payload["limit"]["requirement_id"] == "REQ-TH-012"
    assert payload["governing"]["requirement_id"] == "REQ-TH-014"
    by_name = {c["name"]: c for c in payload["conditions"]}
    assert by_name["hot-high"]["requirement_id"] == "REQ-TH-014"
    assert by_name["hot-day"]["requirement_id"] is None


# --------------------------------------------------------------------------------------------
# The same governing numbers in check --json, results.json, the note and the batch overview


@pytest.mark.slow
def test_governing_numbers_agree_in_check_note_and_batch_overview(tmp_path):
    import csv
    import html as html_module

    from finkit.batch import prepare_variants, run_batch

    base = lean(raw())
    table = [
        {"variant": "std", "source.power": "40 W"},
        {"variant": "plus", "source.power": "44 W"},
    ]
    out = tmp_path / "batch"
    result = run_batch(base, table, out, jobs=1)
    page = (out / "index.html").read_text(encoding="utf-8")
    with open(out / "summary.csv", newline="", encoding="utf-8") as handle:
        rows = {r["variant"]: r for r in csv.DictReader(handle)}
    variants = {v.variant: v for v in prepare_variants(base, table)}
    for o in result.outcomes:
        payload = json.loads((out / o.variant / "results.json").read_text(encoding="utf-8"))
        gov = payload["governing"]
        # check --json of the same case (a separate solve)
        path = tmp_path / f"{o.variant}.yaml"
        path.write_text(yaml.safe_dump(variants[o.variant].case), encoding="utf-8")
        run = subprocess.run(
            [sys.executable, "-m", "finkit.cli", "check", str(path), "--json"],
            capture_output=True,
            text=True,
            check=False,
        )
        checked = json.loads(run.stdout)["governing"]
        margin, allowed = gov["temperature_margin"]["value"], gov["allowable_power"]["value"]
        assert checked["condition"] == gov["condition"] == o.margin()[1]
        assert checked["temperature_margin"]["value"] == pytest.approx(margin, rel=1e-9)
        assert checked["allowable_power"]["value"] == pytest.approx(allowed, rel=1e-9)
        # summary.csv and the overview page show the same governing values
        assert float(rows[o.variant]["governing margin [K]"]) == pytest.approx(margin, rel=1e-12)
        assert float(rows[o.variant]["governing allowable power [W]"]) == pytest.approx(allowed)
        assert rows[o.variant]["governing condition"] == gov["condition"]
        assert f">{margin:.3g}<" in page and f">{allowed:.3g}<" in page
        # and the note's page 1
        note = html_module.unescape(
            (out / o.variant / "note.html").read_text(encoding="utf-8")
        ).replace("\u00a0", " ")
        assert f"'{gov['condition']}'" in note and f"margin {margin:.3g} K" in note
    assert "Fail (1)" in page and "Pass (1)" in page and "Not computed (0)" in page
