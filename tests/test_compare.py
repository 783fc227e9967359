"""finkit compare: what changed between two revisions and what it did to the verdict.

Identities of finkit's own model (software behaviour): a case compared with itself has no
change; one changed input is reported alone, with a margin change equal to the difference of
the two solves; the attribution terms and the stated remainder sum to the total change; a
results.json edited by hand is flagged. The physics of each number is tested where it is made.
"""

from __future__ import annotations

import copy
import json
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

from finkit.case import load_case
from finkit.errors import InputError
from finkit.model import run_case
from finkit.report.compare import compare, load_revision

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_cases"


def lean(name: str) -> dict:
    data = yaml.safe_load((DEMO / f"{name}.yaml").read_text(encoding="utf-8"))
    for key in ("tolerances", "monte_carlo", "measurements", "calibration", "previous_revision"):
        data.pop(key, None)
    return data


def write(tmp_path: Path, name: str, data: dict) -> Path:
    path = tmp_path / f"{name}.yaml"
    path.write_text(yaml.safe_dump(data, sort_keys=False), encoding="utf-8")
    return path


def test_a_case_compared_with_itself_has_no_change(tmp_path):
    path = write(tmp_path, "same", lean("nb200-plate-fan"))
    comparison = compare(path, path)
    assert comparison.is_unchanged
    assert comparison.inputs == () and comparison.margin_change == 0.0
    assert comparison.attribution is None
    assert comparison.summary_line().startswith("no input that changes the result")


def test_one_changed_input_is_reported_alone_with_the_margin_change_of_the_two_solves(tmp_path):
    old = lean("nb200-plate-fan")
    new = copy.deepcopy(old)
    new["sink"]["fins"]["height"] = "34 mm"
    comparison = compare(write(tmp_path, "old", old), write(tmp_path, "new", new))
    assert [c.name for c in comparison.inputs] == ["sink.fins.height"]
    change = comparison.inputs[0]
    assert (change.old, change.new) == ("30 mm", "34 mm")
    assert change.new_si == pytest.approx(0.034)
    solved = [run_case(load_case(d)).results["temperature_margin"] for d in (old, new)]
    assert comparison.margin_change == pytest.approx(solved[1] - solved[0], rel=1e-12)
    # One change: its term is the whole change and nothing is left for interactions.
    assert comparison.attribution[0][0] == "sink.fins.height"
    assert comparison.attribution[0][1] == pytest.approx(comparison.margin_change, rel=1e-9)
    assert comparison.remainder == pytest.approx(0.0, abs=1e-9)


def test_attribution_terms_and_remainder_sum_to_the_total(tmp_path):
    comparison = compare(
        DEMO / "nb200-plate-fan-rev-a.yaml", DEMO / "nb200-plate-fan.yaml", attribute=True
    )
    names = [name for name, _ in comparison.attribution]
    assert names == ["source.power", "sink.fins.count", "sink.fins.height"]
    total = sum(d for _, d in comparison.attribution) + comparison.remainder
    assert total == pytest.approx(comparison.attribution_total, abs=1e-12)
    assert comparison.attribution_total == pytest.approx(comparison.margin_change, rel=1e-9)
    powered = dict(comparison.attribution)
    assert powered["source.power"] < 0 < powered["sink.fins.count"]  # more power, more fins


def test_a_hand_edited_results_json_is_flagged(tmp_path):
    payload = run_case(load_case(lean("nb200-plate-fan"))).to_json_dict()
    good = tmp_path / "good.json"
    good.write_text(json.dumps(payload), encoding="utf-8")
    assert load_revision(good).is_hash_ok is True
    payload["inputs"]["source"]["power"] = "30 W"  # inputs edited, results and hash kept
    bad = tmp_path / "bad.json"
    bad.write_text(json.dumps(payload), encoding="utf-8")
    assert load_revision(bad).is_hash_ok is False
    comparison = compare(bad, good)
    assert any("do not give its recorded inputs SHA-256" in n for n in comparison.notes)


def test_a_path_that_is_no_revision_is_one_line(tmp_path):
    with pytest.raises(InputError, match=r"compare: got .*give a case file"):
        compare(tmp_path / "x.txt", tmp_path / "y.txt")


def test_cli_text_json_and_html(tmp_path):
    run = [sys.executable, "-m", "finkit.cli", "compare"]
    old, new = str(DEMO / "nb200-plate-fan-rev-a.yaml"), str(DEMO / "nb200-plate-fan.yaml")
    text = subprocess.run([*run, old, new], capture_output=True, text=True, check=True).stdout
    assert "governing margin:" in text and "sink.fins.count: 12 -> 16" in text
    page = tmp_path / "compare.html"
    data = subprocess.run(
        [*run, old, new, "--json", "--html", str(page)], capture_output=True, text=True, check=True
    ).stdout
    payload = json.loads(data)
    governing = payload["governing"]
    # The revision (16 fins) improves on rev A (12 fins, 28 mm): rev A fails its margin on the
    # governing condition, the revision passes it.
    assert governing["old_status"] == "fail" and governing["new_status"] == "pass"
    assert governing["new_margin"] > governing["old_margin"] + 2.0
    assert governing["new_allowable"] > governing["old_allowable"]
    assert {i["path"] for i in payload["inputs"]} >= {"source.power", "sink.fins.count"}
    assert payload["attribution"]["unit"] == "K"
    assert page.read_text(encoding="utf-8").startswith("<!DOCTYPE html>")


@pytest.mark.slow
def test_compare_page_renders_offline_without_script(tmp_path):
    import browser

    from finkit.notes import check_note_html

    comparison = compare(DEMO / "nb200-plate-fan-rev-a.yaml", DEMO / "nb200-plate-fan.yaml")
    html = comparison.html()
    assert check_note_html(html) == []
    page = tmp_path / "compare.html"
    page.write_text(html, encoding="utf-8")
    if not browser.chromium_available():
        pytest.fail(f"{browser.CHROMIUM} is missing: run .ci/ensure_chromium.sh")
    png = tmp_path / "compare.png"
    run = browser.screenshot(page, png)
    assert run.returncode == 0 and run.console == []
    assert browser.non_white_fraction(png, threshold=128) > 0.005


@pytest.mark.slow
def test_batch_marks_variants_changed_since_an_earlier_batch(tmp_path):
    import csv

    from finkit.batch import run_batch

    base = lean("nb200-plate-fan")
    before = [{"variant": "a", "source.power": "40 W"}, {"variant": "b", "source.power": "44 W"}]
    after = [{"variant": "a", "source.power": "40 W"}, {"variant": "b", "source.power": "46 W"}]
    first = run_batch(base, before, tmp_path / "rev1", jobs=1)
    second = run_batch(base, after, tmp_path / "rev2", jobs=1, compare_to=tmp_path / "rev1")
    margins = {
        o.variant: o.margin()[0] for result in (first, second) for o in result.outcomes
    }  # second run overwrites: the new margins
    old_b = next(o for o in first.outcomes if o.variant == "b").margin()[0]
    with open(tmp_path / "rev2" / "summary.csv", newline="", encoding="utf-8") as handle:
        rows = {r["variant"]: r for r in csv.DictReader(handle)}
    assert rows["a"]["since earlier batch"] == ""  # unchanged
    assert rows["b"]["since earlier batch"] == f"governing margin {margins['b'] - old_b:+.3g} K"
    page = (tmp_path / "rev2" / "index.html").read_text(encoding="utf-8")
    assert "since rev1: governing margin" in page
